"""Page helpers in generator/render/pages.py: the method notes and row formatting."""
from __future__ import annotations

from generator.build import evaluate
from generator.render.pages import limit_text, methods, value_text

TEN_DEGREE = """\
spec: 1
id: ten
observer: cie1964-10
white:
  target: D65
  tolerance: {macadam_steps: 3}
colours:
  reference_white: D65
  amber:
    target: {x: 0.575, y: 0.42, Y: 40}
    tolerance: {delta_e2000: {max: 2, kL: 2}}
"""


def _spec(spec_dir, text):
    spec_dir("s.yaml", text)
    (e,), _ = evaluate(spec_dir.dir)
    return e


def test_a_ten_degree_spec_states_its_observer_and_the_cct_observer(spec_dir):
    names = dict(methods(_spec(spec_dir, TEN_DEGREE).spec))
    assert names["Observer"].startswith("CIE 1964 10° standard observer")
    assert "and so do CCT / Duv" in names["Observer and CCT"]
    assert "not the CIE-defined CCT" in names["Observer and CCT"]
    assert "MacAdam (1942)" in names["MacAdam steps"]
    assert "CIEDE2000 per CIE 142-2001" in names["Colour differences"]


def test_a_two_degree_spec_has_no_observer_caveat(spec_dir):
    names = dict(methods(_spec(spec_dir, TEN_DEGREE.replace("cie1964-10", "cie1931-2")).spec))
    assert "Observer and CCT" not in names


def test_colour_and_steps_limits_read_as_words():
    row = {"quantity": "delta_e2000", "unit": "", "value": 1.234,
           "limit": {"max": 2.0, "kL": 2.0, "kC": 1.0, "kH": 1.0}}
    assert limit_text(row) == "≤ 2.00 (kL 2, kC 1, kH 1)"
    assert value_text(row) == "1.23"
    row = {"quantity": "delta_e2000", "unit": "", "value": 1.0, "limit": {"max": 2.0, "kL": 1.0, "kC": 1.0, "kH": 1.0}}
    assert limit_text(row) == "≤ 2.00"
    row = {"quantity": "macadam_steps", "unit": "steps", "value": 2.5, "limit": {"max": 3.0}}
    assert (limit_text(row), value_text(row)) == ("≤ 3.00 steps", "2.50 steps")
    row = {"quantity": "dominant_wavelength", "unit": "nm", "value": 590.04, "limit": {"min": 587.0, "max": 593.0}}
    assert (limit_text(row), value_text(row)) == ("587.0 to 593.0 nm", "590.0 nm")
