/* Index filter: text, status and verdict. Plain script, no modules, so it works from file://. */
(function () {
  "use strict";
  var form = document.getElementById("filter");
  if (!form) { return; }
  var text = document.getElementById("filter-text");
  var status = document.getElementById("filter-status");
  var verdict = document.getElementById("filter-verdict");
  var count = document.getElementById("filter-count");
  var none = document.getElementById("filter-none");
  var rows = Array.prototype.slice.call(document.querySelectorAll("tr.spec-row"));
  var groups = Array.prototype.slice.call(document.querySelectorAll("tbody.family"));

  function apply() {
    var words = text.value.toLowerCase().split(/\s+/).filter(Boolean);
    var shown = 0;
    rows.forEach(function (r) {
      var hay = r.getAttribute("data-search");
      var ok = (!status.value || r.getAttribute("data-status") === status.value) &&
               (!verdict.value || r.getAttribute("data-verdict") === verdict.value) &&
               words.every(function (w) { return hay.indexOf(w) !== -1; });
      r.hidden = !ok;
      if (ok) { shown += 1; }
    });
    groups.forEach(function (g) {
      g.hidden = !g.querySelector("tr.spec-row:not([hidden])");
    });
    count.textContent = shown + " of " + rows.length + " specs shown";
    none.hidden = shown !== 0;
  }

  form.hidden = false;
  form.addEventListener("submit", function (e) { e.preventDefault(); });
  [text, status, verdict].forEach(function (el) {
    el.addEventListener("input", apply);
    el.addEventListener("change", apply);
  });
  apply();
}());
