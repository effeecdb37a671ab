"""results.json, format colourspec-results/1 (see docs/results-format.md)."""
from __future__ import annotations

import json

FORMAT = "colourspec-results/1"


def spec_result(spec, derived, assessment) -> dict:
    rows = [{k: v for k, v in r.items() if k != "label"} for r in assessment.rows]
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


def results_document(entries: list[dict]) -> dict:
    verdicts = [e["verdict"] for e in entries]
    return {
        "format": FORMAT,
        "summary": {"specs": len(entries), "pass": verdicts.count("pass"), "fail": verdicts.count("fail"),
                    "indeterminate": verdicts.count("indeterminate")},
        "specs": entries,
    }


def dumps(doc: dict) -> str:
    """Stable JSON: sorted keys are not used (order is meaningful), floats as repr, NaN refused."""
    return json.dumps(doc, indent=2, ensure_ascii=False, allow_nan=False) + "\n"


def dumps_entry(entry: dict) -> str:
    """One spec's entry as its own results.json (the same text as inside the whole document)."""
    return json.dumps(entry, indent=2, ensure_ascii=False, allow_nan=False) + "\n"


def dumps_from_entries(doc: dict, entry_texts: list[str]) -> str:
    """``dumps(doc)`` for a document whose "specs" entries are already encoded by
    ``dumps_entry`` (so an incremental build encodes only the specs that changed)."""
    head = dumps({**doc, "specs": []})
    if not entry_texts:
        return head
    body = ",\n".join("    " + t.rstrip("\n").replace("\n", "\n    ") for t in entry_texts)
    return head[: -len("[]\n}\n")] + "[\n" + body + "\n  ]\n}\n"
