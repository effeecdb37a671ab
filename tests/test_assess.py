"""Decision rules and requirement rows."""
from __future__ import annotations

import math

import pytest

from generator.assess.rules import DecisionRule, combine, decide, margin
from generator.build import evaluate


@pytest.mark.parametrize("value,lo,hi,expected", [
    (5.0, 1.0, 5.0, "pass"),          # limits are inclusive
    (1.0, 1.0, 5.0, "pass"),
    (5.0 + 1e-12, 1.0, 5.0, "pass"),  # floating noise on a limit counts as on it
    (5.0 + 1e-6, 1.0, 5.0, "fail"),
    (0.5, 1.0, None, "fail"),
    (0.005, None, 0.005, "pass"),
    (0.0050001, None, 0.005, "fail"),
    (math.nan, 0.0, 1.0, "indeterminate"),
    (None, 0.0, 1.0, "indeterminate"),
])
def test_simple_acceptance(value, lo, hi, expected):
    assert decide(value, lo, hi) == expected


def test_guard_banded_rule_has_an_indeterminate_zone_of_width_U_each_side():
    rule = DecisionRule("guard-banded")
    assert decide(4.0, None, 5.0, U=0.5, rule=rule) == "pass"
    assert decide(4.7, None, 5.0, U=0.5, rule=rule) == "indeterminate"
    assert decide(5.3, None, 5.0, U=0.5, rule=rule) == "indeterminate"
    assert decide(5.6, None, 5.0, U=0.5, rule=rule) == "fail"


def test_margin_is_positive_inside_and_negative_outside():
    assert margin(3.0, 1.0, 5.0) == 2.0
    assert margin(6.0, 1.0, 5.0) == -1.0
    assert margin(3.0) is None


def test_combine():
    assert combine(["pass", "pass"]) == "pass"
    assert combine(["pass", "indeterminate"]) == "indeterminate"
    assert combine(["indeterminate", "fail", "pass"]) == "fail"


SPEC = """\
spec: 1
id: boxed
white:
  target: {x: 0.3127, y: 0.3290}
  tolerance:
    box: {dx: 0.002, dy: 0.003}
    delta_uv: 0.004
    ellipse: {a: 0.004, b: 0.002, angle: 0}
    region: [[0.30, 0.31], [0.33, 0.31], [0.33, 0.35], [0.30, 0.35]]
  luminance: {min: 100, max: 200}
primaries:
  red:   {x: 0.640, y: 0.330}
  green: {x: 0.300, y: 0.600}
  blue:  {x: 0.150, y: 0.060}
  tolerance: {box: {dx: 0.01, dy: 0.01}}
units:
  - serial: "0001"
    lot: A
    white: {x: 0.3146, y: 0.3290, Y: 150}
    red: {x: 0.651, y: 0.330}
  - serial: "0002"
    lot: A
    white: {x: 0.3127, y: 0.3330, Y: 250}
"""


def _rows(spec_dir):
    spec_dir("boxed.yaml", SPEC)
    (e,), _ = evaluate(spec_dir.dir)
    return {(r["id"], r["sample"]): r for r in e.assessment.rows}, e


def test_box_ellipse_region_and_luminance_rows_for_units(spec_dir):
    rows, e = _rows(spec_dir)
    box = rows[("white.box", "0001")]
    assert box["verdict"] == "pass"
    assert box["value"]["dx"] == pytest.approx(0.0019) and box["value"]["dy"] == pytest.approx(0.0)
    # 0.0019 along the 0.004 major axis: normalised radius 0.475
    assert rows[("white.ellipse", "0001")]["value"] == pytest.approx(0.475)
    assert rows[("white.ellipse", "0002")]["verdict"] == "fail"  # 0.004 along the 0.002 minor axis
    assert rows[("white.box", "0002")]["verdict"] == "fail"      # dy 0.004 > 0.003
    assert rows[("white.region", "0001")]["verdict"] == "pass"
    assert rows[("white.luminance", "0002")]["verdict"] == "fail"
    assert rows[("white.luminance", "0001")]["verdict"] == "pass"
    red = rows[("primaries.red.box", "0001")]
    assert red["verdict"] == "fail" and red["value"]["dx"] == pytest.approx(0.011)
    assert e.assessment.verdict == "fail"
    assert [u["verdict"] for u in e.assessment.units] == ["fail", "fail"]
    (lot,) = e.assessment.lots
    assert {k: lot[k] for k in ("lot", "n", "n_fail", "suppliers", "verdict")} == \
        {"lot": "A", "n": 2, "n_fail": 2, "suppliers": [], "verdict": "fail"}


def test_quoted_serials_keep_their_leading_zeros(spec_dir):
    rows, e = _rows(spec_dir)
    assert [u.serial for u in e.spec.units] == ["0001", "0002"]


def test_design_targets_are_not_assessed_against_trivial_limits(spec_dir):
    rows, _ = _rows(spec_dir)
    design = sorted(k[0] for k in rows if k[1] is None)
    assert design == ["white.region"]  # region may exclude the target; box / circle / ellipse cannot
