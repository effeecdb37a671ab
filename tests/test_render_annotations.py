"""CI annotations: escaping round-trips, the per-kind cap and its summary line."""
from __future__ import annotations

from hypothesis import given
from hypothesis import strategies as st

from generator.render import annotations as A
from generator.spec.problems import Problem


def test_message_escapes_percent_cr_and_lf_only():
    a = A.Annotation("error", "50% off\r\nnext: a, b", "specs/a.yaml", 3, 4, "t")
    assert a.format() == "::error file=specs/a.yaml,line=3,col=4,title=t::50%25 off%0D%0Anext: a, b"


def test_properties_also_escape_colon_and_comma():
    a = A.Annotation("warning", "m", "dir,x/a:b.yaml", 1, 2, "colourspec: white, red")
    assert a.format() == ("::warning file=dir%2Cx/a%3Ab.yaml,line=1,col=2,"
                          "title=colourspec%3A white%2C red::m")


def test_escaping_is_applied_to_percent_first_so_text_that_looks_escaped_survives():
    a = A.Annotation("error", "literal %0A stays", "f%3A.yaml", 1, 1, "%2C")
    line = a.format()
    assert "%250A" in line and "f%253A.yaml" in line
    assert A.parse(line) == a


@given(msg=st.text(), file=st.text(min_size=1),
       title=st.text(), line=st.integers(1, 10**6), col=st.integers(1, 1000))
def test_any_text_round_trips_through_one_line(msg, file, title, line, col):
    a = A.Annotation("error", msg, file, line, col, title)
    out = a.format()
    assert "\n" not in out and "\r" not in out
    back = A.parse(out)
    assert back == a


def test_a_problem_becomes_an_error_with_its_position_and_hint():
    p = Problem("specs/a.yaml", 12, 7, "white.tolerance.cct", "expected low <= high", "swap them")
    a = A.from_problem(p)
    assert (a.severity, a.file, a.line, a.col, a.title) == ("error", "specs/a.yaml", 12, 7,
                                                            "colourspec white.tolerance.cct")
    assert a.message == "expected low <= high\nhint: swap them"
    assert A.from_problem(Problem("f", 1, 1, "", "w", severity="warning")).severity == "warning"


def test_cap_is_per_kind_and_a_notice_counts_what_was_left_out():
    items = [A.Annotation("error", f"e{i}") for i in range(5)] + [A.Annotation("warning", "w")]
    lines = A.render(items, limit=3).splitlines()
    assert [ln.split("::")[1] for ln in lines] == ["error"] * 3 + ["warning", "notice title=colourspec%3A "
                                                                      "annotations truncated"]
    assert lines[-1].endswith("::2 more errors not shown as annotations (limit 3 per kind; 5 errors, "
                              "1 warning in all); the step log and the JUnit report list every one")


def test_no_summary_line_when_nothing_is_left_out():
    items = [A.Annotation("error", "e")] * 3
    assert A.render(items, limit=3).count("\n") == 3
    assert "notice" not in A.render(items, limit=3)


class _Spec:
    id = "tiny-panel"
    file = "specs/tiny.yaml"


def _row(verdict, sample=None):
    return {"id": "white.cct", "label": "CCT", "subject": "white", "sample": sample, "quantity": "cct",
            "value": 6271.4, "unit": "K", "limit": {"min": 6300.0, "max": 6800.0}, "margin": -28.6,
            "verdict": verdict}


def test_a_failing_row_is_an_error_at_its_mark_and_says_by_how_much():
    from generator.spec.yamlnodes import Mark

    a = A.from_row(_Spec, _row("fail", "U1"), Mark("specs/base.yaml", 7, 15))
    assert (a.severity, a.file, a.line, a.col, a.title) == ("error", "specs/base.yaml", 7, 15,
                                                            "colourspec white.cct")
    assert a.message == "tiny-panel: unit U1: CCT is fail: 6271 K against 6300 to 6800 K, outside by 28.6 K"


def test_an_indeterminate_row_is_a_warning_and_without_a_mark_names_the_spec_file():
    a = A.from_row(_Spec, _row("indeterminate"), None)
    assert (a.severity, a.file, a.line) == ("warning", "specs/tiny.yaml", 0)
    assert a.format().startswith("::warning file=specs/tiny.yaml,title=colourspec white.cct::tiny-panel: CCT is")
