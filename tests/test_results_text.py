"""results.json text: indented, each requirement row and unit entry on one line, the same
document whether written whole (check --json) or from per-spec entries (build)."""
from __future__ import annotations

import json

from generator.render.results import dumps, dumps_entry, dumps_from_entries, results_document

ENTRY = {"id": "a", "verdict": "pass", "title": "A \"quoted\" title\nwith a break",
         "requirements": [{"id": "white.cct", "value": 6504.5, "limit": {"min": 6000.0}, "sample": None},
                          {"id": "white.box", "value": {"dx": 0.001, "dy": -0.002}, "sample": "S-1"}],
         "units": [{"serial": "S-1", "failing": ["white.box"]}], "lots": [{"lot": "L1", "n": 1}],
         "warnings": []}


def test_rows_and_units_are_one_line_each_and_the_text_parses_back():
    text = dumps_entry(ENTRY)
    assert json.loads(text) == ENTRY
    lines = text.splitlines()
    assert '    {"id": "white.cct", "value": 6504.5, "limit": {"min": 6000.0}, "sample": null},' in lines
    assert '    {"serial": "S-1", "failing": ["white.box"]}' in lines
    assert '  "lots": [' in lines          # other lists stay indented as usual
    assert '      "lot": "L1",' in lines


def test_the_whole_document_equals_the_one_made_from_encoded_entries():
    other = dict(ENTRY, id="b", verdict="fail", requirements=[], units=[])
    doc = results_document([ENTRY, other])
    whole = dumps(doc)
    assert json.loads(whole) == doc
    assert whole == dumps_from_entries(results_document([], ["pass", "fail"]) | {"summary": doc["summary"]},
                                       [dumps_entry(ENTRY), dumps_entry(other)])


def test_a_value_that_spells_the_placeholder_falls_back_to_plain_indentation():
    tricky = dict(ENTRY, title="\x00requirements\x00")
    text = dumps_entry(tricky)
    assert json.loads(text) == tricky


def test_check_json_equals_the_built_sites_results(tmp_path, monkeypatch):
    from generator.build import build, check

    from .conftest import copy_demo

    monkeypatch.chdir(tmp_path)
    specs = copy_demo(tmp_path)
    build(specs, tmp_path / "site")
    assert dumps(check(specs).results) == (tmp_path / "site" / "results.json").read_text(encoding="utf-8")


def test_unit_rows_written_from_the_columns_equal_the_encoded_row_dicts(tmp_path, monkeypatch):
    """entry_text (unit rows straight from the assessment's columns, as the build writes
    them) gives the text of encoding spec_result's dicts, for every demo spec."""
    from generator.build import evaluate
    from generator.render.results import entry_text, spec_result

    from .conftest import copy_demo

    monkeypatch.chdir(tmp_path)
    evaluated, _ = evaluate(copy_demo(tmp_path))
    assert any(e.assessment.table is not None and len(e.assessment.table) >= 50 for e in evaluated)
    for e in evaluated:
        assert entry_text(e.spec, e.derived, e.assessment) == dumps_entry(
            spec_result(e.spec, e.derived, e.assessment)), e.spec.id


def test_numbers_cut_from_one_encoded_list_equal_each_number_encoded_alone():
    import numpy as np

    from generator.assess.units import _num
    from generator.render.unit_rows import _num_texts, _texts

    vals = np.array([0.1, -0.0, 1e-300, 5e-324, 1e22, 123456.789, float("nan"), float("inf"), -float("inf"), 2.0])
    assert _num_texts(vals) == [json.dumps(_num(v)) for v in vals.tolist()]
    ints = np.array([0, -3, 7])
    assert _num_texts(ints) == ["0", "-3", "7"]
    assert _num_texts(np.array([])) == []
    assert _texts([0.0008, 5.2, 1e-05], ", u: ") == [", u: 0.0008", ", u: 5.2", ", u: 1e-05"]


def test_the_document_written_in_parts_is_the_document_joined():
    from generator.publish import Parts
    from generator.render.results import document_parts

    other = dict(ENTRY, id="b", verdict="fail", requirements=[], units=[])
    doc = results_document([], ["pass", "fail"])
    texts = [dumps_entry(ENTRY), dumps_entry(other)]
    joined = dumps_from_entries(doc, texts)
    assert Parts(document_parts(doc, [t.encode("utf-8") for t in texts])).read() == joined.encode("utf-8")
    # entries with no final newline, or several, are cut as rstrip("\n") cuts them
    odd = [texts[0].rstrip("\n"), texts[1] + "\n\n"]
    assert (Parts(document_parts(doc, [t.encode() for t in odd])).read()
            == dumps_from_entries(doc, odd).encode("utf-8"))
    assert b"".join(document_parts(doc, [])) == dumps_from_entries(doc, []).encode("utf-8")


def test_unit_entries_written_by_template_equal_their_json():
    from generator.render.unit_rows import unit_entry_texts

    units = [{"serial": s, "lot": "L\u00e9 1", "supplier": 'Sup "Q"', "verdict": v, "rows": n,
              "failing": f, "source": "specs/m.csv:2"}
             for s, v, n, f in [("S-1", "pass", 8, []), ("S\\2\t", "fail", 3, ["white.cct", "gamut.x.coverage.uv"]),
                                ("Ω-3", "indeterminate", 0, ["a"])]]
    odd = [{"serial": "x", "lot": "y"}, dict(units[0], rows=True), dict(units[0], extra=1)]
    for u, t in zip(units + odd, unit_entry_texts(units + odd), strict=True):
        assert t == json.dumps(u, ensure_ascii=False, allow_nan=False)
