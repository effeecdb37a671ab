/* Live preview for `colourspec serve`: reload when a new build is published; show the
   build's errors over the page while a spec is broken. Only included in served builds. */
(function () {
  "use strict";
  var me = document.currentScript && document.currentScript.src;
  if (!me || location.protocol === "file:") { return; }
  var statusUrl = me.replace(/static\/reload\.js(\?.*)?$/, "__colourspec/status.json");
  var seen = null;
  var box = null;

  function show(errors) {
    if (!errors.length) {
      if (box) { box.remove(); box = null; }
      return;
    }
    if (!box) {
      box = document.createElement("section");
      box.className = "build-error";
      box.setAttribute("role", "alert");
      box.id = "build-error";
      document.body.insertBefore(box, document.body.firstChild);
    }
    box.textContent = "";
    var h = document.createElement("h2");
    h.textContent = "The last edit does not build; this page shows the last good build.";
    var pre = document.createElement("pre");
    pre.textContent = errors.join("\n");
    box.appendChild(h);
    box.appendChild(pre);
  }

  function poll() {
    fetch(statusUrl, {cache: "no-store"}).then(function (r) { return r.json(); }).then(function (s) {
      if (seen !== null && s.build !== seen && !s.errors.length) { location.reload(); return; }
      seen = s.build;
      show(s.errors);
    }).catch(function () { /* server stopped: keep the page as it is */ }).then(function () {
      setTimeout(poll, 250);
    });
  }
  poll();
}());
