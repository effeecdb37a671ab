"""results.json, format colourspec-results/1 (see docs/results-format.md)."""
from __future__ import annotations

import json

FORMAT = "colourspec-results/1"


def spec_result(spec, derived, assessment, unit_rows: bool = True) -> dict:
    """The spec's entry; without ``unit_rows`` its requirements are the design rows only
    (``entry_text`` writes the unit rows straight from the assessment's columns)."""
    source = assessment.rows if unit_rows else assessment.design_rows
    rows = [{k: v for k, v in r.items() if k != "label"} for r in source]
    return {
        "id": spec.id,
        "file": spec.file,
        "title": spec.title,
        "product": spec.product,
        "revision": spec.revision,
        "status": spec.status,
        "observer": spec.observer,
        "extends": spec.extends or None,
        "verdict": assessment.verdict,
        "decision_rule": assessment.rule.name,
        "decision": assessment.rule.as_json(),
        "measurements": list(spec.measurements),
        "derived": derived.as_json(),
        "requirements": rows,
        "units": assessment.units,
        "lots": assessment.lots,
        "suppliers": assessment.suppliers,
        "warnings": [w.as_json() for w in spec.warnings],
    }


def results_document(entries: list[dict], verdicts: list[str] | None = None) -> dict:
    """The whole document; ``verdicts`` (one per spec) give the summary when ``entries``
    is left empty because the entries are encoded separately (``dumps_from_entries``)."""
    verdicts = [e["verdict"] for e in entries] if verdicts is None else verdicts
    return {
        "format": FORMAT,
        "summary": {"specs": len(verdicts), "pass": verdicts.count("pass"), "fail": verdicts.count("fail"),
                    "indeterminate": verdicts.count("indeterminate")},
        "specs": entries,
    }


ONE_PER_LINE = ("requirements", "units")     # long lists of flat records: one record a line


def dumps(doc: dict) -> str:
    """Stable JSON: keys in meaningful order (not sorted), floats as repr, NaN refused;
    indented by two spaces, except that each requirement row and each unit entry is one
    line (a 100,000-unit lot has close to a million rows: one a line keeps the file
    greppable and diffable and encodes several times faster)."""
    return dumps_from_entries(doc, [dumps_entry(e) for e in doc.get("specs", [])])


def dumps_one_per_line(doc: dict, keys, indent: int = 2, allow_nan: bool = False,
                       encoded: dict | None = None) -> str:
    """JSON of ``doc`` indented by ``indent``, the entries of the lists under ``keys`` (top
    level) one a line (encoded by the C encoder: several times faster than indenting them).
    ``encoded`` (key -> list of JSON texts) gives a list's entries already encoded."""
    encoded = encoded or {}
    marks = {k: f"\x00{k}\x00" for k in keys if doc.get(k) or encoded.get(k)}
    text = json.dumps({k: marks.get(k, v) for k, v in doc.items()}, indent=indent, ensure_ascii=False,
                      allow_nan=allow_nan) + "\n"
    if any(text.count(json.dumps(mark)) != 1 for mark in marks.values()):   # a value spelling a mark
        full = {k: (v if k not in encoded else [json.loads(t) for t in encoded[k]]) for k, v in doc.items()}
        return json.dumps(full, indent=indent, ensure_ascii=False, allow_nan=allow_nan) + "\n"
    pad, sep = " " * indent, ",\n" + " " * (2 * indent)
    pieces = []
    for k, mark in sorted(marks.items(), key=lambda km: text.index(json.dumps(km[1]))):
        before, text = text.split(json.dumps(mark), 1)
        texts = encoded[k] if k in encoded else [json.dumps(r, ensure_ascii=False, allow_nan=allow_nan)
                                                  for r in doc[k]]
        pieces += [before, "[\n", pad * 2 if texts else "", sep.join(texts), "\n", pad, "]"]
    pieces.append(text)
    return "".join(pieces)      # the long lists are copied once, never re-scanned


def dumps_entry(entry: dict) -> str:
    """One spec's entry as its own results.json (the same text as inside the whole document)."""
    return dumps_one_per_line(entry, ONE_PER_LINE)


def dumps_from_entries(doc: dict, entry_texts: list[str]) -> str:
    """``dumps(doc)`` for a document whose "specs" entries are already encoded by
    ``dumps_entry`` (the build writes the same text from UTF-8 pieces: ``document_parts``)."""
    head = json.dumps({**doc, "specs": []}, indent=2, ensure_ascii=False, allow_nan=False) + "\n"
    if not entry_texts:
        return head
    body = ",\n".join("    " + t.rstrip("\n").replace("\n", "\n    ") for t in entry_texts)
    return head[: -len("[]\n}\n")] + "[\n" + body + "\n  ]\n}\n"


def document_parts(doc: dict, entry_texts: list[bytes]) -> list:
    """``dumps_from_entries`` of UTF-8 entries as a list of pieces to write one after the
    other (a lot library's document is hundreds of MB: each entry is copied once, to indent
    it, and never joined). An entry that is not bytes is a piece already indented (a
    memoryview from ``indented_entry``, or a ``publish.Span`` of a cached copy) and is
    passed through."""
    head = (json.dumps({**doc, "specs": []}, indent=2, ensure_ascii=False, allow_nan=False) + "\n").encode("utf-8")
    if not entry_texts:
        return [head]
    parts = [head[: -len("[]\n}\n")], b"[\n"]
    for k, t in enumerate(entry_texts):
        parts += [b",\n    " if k else b"    ", indented_entry(t) if isinstance(t, bytes) else t]
    parts.append(b"\n  ]\n}\n")
    return parts


def indented_entry(t: bytes) -> memoryview:
    """An entry's text as it stands in the whole document: every line after the first
    indented by four more spaces, the final newlines cut (one copy)."""
    trailing = 0
    while trailing < len(t) and t[len(t) - 1 - trailing] == 0x0A:     # as t.rstrip(b"\n"), without a copy
        trailing += 1
    indented = t.replace(b"\n", b"\n    ")                           # each newline gains the 4-space pad
    return memoryview(indented)[: len(indented) - 5 * trailing]


def entry_text(spec, derived, assessment) -> str:
    """``dumps_entry(spec_result(...))`` without building a dict per unit row: the unit rows
    are written from the assessment's columns (a 100,000-unit lot has ~10⁶ of them)."""
    from .unit_rows import unit_entry_texts, unit_rows_json

    entry = spec_result(spec, derived, assessment, unit_rows=False)
    texts = [json.dumps(r, ensure_ascii=False, allow_nan=False) for r in entry["requirements"]]
    if assessment.table is not None:
        texts += unit_rows_json(assessment.columns, assessment.table, assessment.rule.uncertainty is not None)
    return dumps_one_per_line(entry, ONE_PER_LINE,
                              encoded={"requirements": texts, "units": unit_entry_texts(entry["units"])})
