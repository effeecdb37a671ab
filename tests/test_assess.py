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


COLOURS_SPEC = """\
spec: 1
id: lamps
category: indicator
colours:
  reference_white: D65
  tolerance: {delta_e2000: 3.0}
  green:
    target: {x: 0.1700, y: 0.7000, Y: 60}
    tolerance:
      delta_e2000: {max: 3.0, kL: 2}
      delta_e76: 5.0
      dominant_wavelength: [520, 530]
      excitation_purity: {min: 0.7}
      delta_uv: 0.01
  teal:
    target: {L: 55, a: -32, b: -8}
  magenta:
    target: {x: 0.40, y: 0.20, Y: 20}
    tolerance: {dominant_wavelength: [380, 700]}
units:
  - serial: U1
    colours:
      green: {x: 0.1800, y: 0.6850, Y: 57}
      teal: {L: 56, a: -30, b: -10}
  - serial: U2
    colours:
      teal: {L: 55, a: -32, b: -8}
"""


def _colour_rows(spec_dir):
    spec_dir("lamps.yaml", COLOURS_SPEC)
    (e,), _ = evaluate(spec_dir.dir)
    return {(r["id"], r["sample"]): r for r in e.assessment.rows}, e


def test_colour_rows_carry_the_colour_name_as_subject(spec_dir):
    rows, e = _colour_rows(spec_dir)
    assert {r["subject"] for r in e.assessment.rows} == {"green", "teal", "magenta"}
    assert sorted(k for k in rows if k[1] == "U1") == [
        ("colours.green.delta_e2000", "U1"), ("colours.green.delta_e76", "U1"),
        ("colours.green.delta_uv", "U1"), ("colours.green.dominant_wavelength", "U1"),
        ("colours.green.excitation_purity", "U1"), ("colours.teal.delta_e2000", "U1")]


def test_colour_design_rows_are_dominant_wavelength_and_purity_only(spec_dir):
    rows, _ = _colour_rows(spec_dir)
    assert sorted(k[0] for k in rows if k[1] is None) == [
        "colours.green.dominant_wavelength", "colours.green.excitation_purity",
        "colours.magenta.dominant_wavelength"]


def test_colour_delta_e_values_agree_with_colour_science(spec_dir):
    import colour
    import numpy as np

    rows, _ = _colour_rows(spec_dir)
    w = colour.xy_to_XYZ([0.3127, 0.3290])
    t = colour.XYZ_to_Lab(colour.xyY_to_XYZ([0.17, 0.70, 0.60]), [0.3127, 0.3290])
    s = colour.XYZ_to_Lab(colour.xyY_to_XYZ([0.18, 0.685, 0.57]), [0.3127, 0.3290])
    assert w[1] == 1.0
    de00 = colour.difference.delta_E_CIE2000(s, t, textiles=True)   # kL = 2 [L]
    assert rows[("colours.green.delta_e2000", "U1")]["value"] == pytest.approx(float(de00), abs=1e-9)
    assert rows[("colours.green.delta_e2000", "U1")]["limit"] == {"max": 3.0, "kL": 2.0, "kC": 1.0, "kH": 1.0}
    assert rows[("colours.green.delta_e76", "U1")]["value"] == pytest.approx(float(np.linalg.norm(s - t)), abs=1e-9)
    # a CIELAB target and sample: ΔE00 of (56, -30, -10) from (55, -32, -8) against colour-science
    de_teal = colour.difference.delta_E_CIE2000([56, -30, -10], [55, -32, -8])
    assert rows[("colours.teal.delta_e2000", "U1")]["value"] == pytest.approx(float(de_teal), abs=1e-6)
    assert rows[("colours.teal.delta_e2000", "U2")]["value"] == pytest.approx(0.0, abs=1e-6)


def test_colour_dominant_wavelength_and_purity_rows(spec_dir):
    rows, _ = _colour_rows(spec_dir)
    dw = rows[("colours.green.dominant_wavelength", None)]
    assert dw["unit"] == "nm" and dw["limit"]["white"] == {"x": 0.3127, "y": 0.329}
    assert 520 < dw["value"] < 530 and dw["verdict"] == "pass"
    assert rows[("colours.green.excitation_purity", None)]["verdict"] == "pass"
    # U1 green at (0.18, 0.685) lies further from the locus: purity below 0.74 but above 0.7
    assert 0.7 < rows[("colours.green.excitation_purity", "U1")]["value"] < 0.75


def test_a_purple_colour_fails_a_dominant_wavelength_range(spec_dir):
    rows, e = _colour_rows(spec_dir)
    r = rows[("colours.magenta.dominant_wavelength", None)]
    assert r["value"] is None and r["verdict"] == "fail"
    assert e.derived.colours["magenta"]["complementary_wavelength_nm"] > 490


def test_macadam_steps_row_for_a_unit(spec_dir):
    import numpy as np

    # target at the centre of MacAdam's ellipse 13 (0.305, 0.323): 10³a 2.55, θ 57.2° (W&S Table 2(5.4.1))
    th = np.deg2rad(57.2)
    x, y = 0.305 + 2 * 2.55e-3 * np.cos(th), 0.323 + 2 * 2.55e-3 * np.sin(th)
    spec_dir("m.yaml", f"""\
spec: 1
id: steps
white:
  target: {{x: 0.305, y: 0.323}}
  tolerance: {{macadam_steps: 1.5}}
units:
  - serial: S1
    white: {{x: {x!r}, y: {y!r}}}
""")
    (e,), _ = evaluate(spec_dir.dir)
    (row,) = [r for r in e.assessment.rows if r["quantity"] == "macadam_steps"]
    assert row["value"] == pytest.approx(2.0, abs=1e-9)
    assert row["verdict"] == "fail" and row["unit"] == "steps"
    assert row["limit"]["max"] == 1.5 and row["limit"]["a1"] == pytest.approx(2.55e-3)


def test_measured_colours_of_units_are_assessed_and_drawn_with_the_unit_table(spec_dir):
    from generator.render.diagrams import layer_for

    rows, e = _colour_rows(spec_dir)
    t = e.assessment.table
    assert t.serial == ["U1", "U2"]          # units that measured only colours are units too
    assert {u["serial"]: u["rows"] for u in e.assessment.units} == {
        "U1": sum(1 for k in rows if k[1] == "U1"), "U2": sum(1 for k in rows if k[1] == "U2")}
    assert ("colours.teal.delta_e2000", "U2") in rows
    drawn = [label for label, _, _ in layer_for(e, "xy").units]
    assert drawn == ["U1 green", "U1 teal", "U2 teal"]
