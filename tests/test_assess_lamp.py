"""Rows and unit columns of the lighting-standard figures (ellipse_of, quadrangle_of)."""
from __future__ import annotations

import numpy as np
import pytest

from generator.assess.lamp import lamp_columns, one_sample_rows
from generator.assess.requirements import _row
from generator.assess.rules import CODES, DecisionRule
from generator.build import evaluate
from generator.colour.cct import xy_from_cct_duv
from generator.model import Tolerance, Uncertainty
from generator.render.pages import CAUTION, limit_text, methods
from generator.spec.resolve import _ellipse_of, _quadrangle_of

F4000 = _ellipse_of({"standard": "iec-60081", "colour": "F4000", "steps": 5.0})
ANSI4000 = _quadrangle_of({"standard": "ansi-c78.377-2008", "nominal_cct": 4000})
TOL = Tolerance(ellipse_of=F4000, quadrangle_of=ANSI4000)
GUARD = DecisionRule("guard-banded", Uncertainty((("xy", 0.0004, None),)))


def _along_major(steps):
    th = np.deg2rad(F4000.angle)
    return tuple(np.array(F4000.centre) + steps * F4000.a * np.array([np.cos(th), np.sin(th)]))


def _rows(xy, rule=DecisionRule("simple"), design=False):
    return {r["quantity"]: r for r in one_sample_rows("white", "white", "u1", TOL, xy, rule, design, _row)}


def test_ellipse_of_is_measured_in_steps_from_the_standard_centre_not_the_target():
    r = _rows(_along_major(3.0))["ellipse_of"]
    assert r["value"] == pytest.approx(3.0) and r["verdict"] == "pass" and r["margin"] == pytest.approx(2.0)
    assert r["unit"] == "steps"
    assert r["limit"]["max"] == 5.0 and r["limit"]["centre"] == [0.380, 0.380]
    assert (r["limit"]["a1"], r["limit"]["b1"], r["limit"]["angle1"]) == (0.00313, 0.00134, 54.0)
    assert r["limit"]["confidence"] == "[M]" and "IEC 60081" in r["limit"]["source"]
    assert _rows(_along_major(5.2))["ellipse_of"]["verdict"] == "fail"


def test_ellipse_of_under_the_guard_band_takes_U_over_b_steps():
    # U = 0.0004 in xy is 0.0004 / 0.00134 = 0.30 steps
    assert _rows(_along_major(4.6), GUARD)["ellipse_of"]["verdict"] == "pass"
    assert _rows(_along_major(4.8), GUARD)["ellipse_of"]["verdict"] == "indeterminate"
    assert _rows(_along_major(5.2), GUARD)["ellipse_of"]["verdict"] == "indeterminate"
    assert _rows(_along_major(5.4), GUARD)["ellipse_of"]["verdict"] == "fail"
    # design targets carry no measurement uncertainty
    assert _rows(_along_major(4.8), GUARD, design=True)["ellipse_of"]["verdict"] == "pass"


def test_quadrangle_of_passes_inside_and_fails_outside_by_cct_and_by_duv():
    inside = tuple(xy_from_cct_duv(4200.0, 0.006))
    r = _rows(inside)["quadrangle_of"]
    assert r["value"] == 0.0 and r["verdict"] == "pass" and r["margin"] > 0
    assert r["limit"]["cct"] == {"min": 3710.0, "max": 4260.0}
    assert r["limit"]["duv"] == pytest.approx({"min": -0.005, "max": 0.007})
    assert r["limit"]["nominal_cct"] == 4000 and r["limit"]["confidence"] == "[M+C]"
    for T, D in ((4300.0, 0.001), (3650.0, 0.001), (4000.0, 0.0075), (4000.0, -0.0056)):
        r = _rows(tuple(xy_from_cct_duv(T, D)))["quadrangle_of"]
        assert r["verdict"] == "fail" and r["value"] > 0 and r["margin"] == pytest.approx(-r["value"]), (T, D)


def test_quadrangle_of_is_indeterminate_within_U_of_its_outline():
    just_out = tuple(xy_from_cct_duv(4000.0, 0.0072))     # about 2e-4 outside the Duv = 0.007 edge
    just_in = tuple(xy_from_cct_duv(4000.0, 0.0068))
    assert _rows(just_out)["quadrangle_of"]["verdict"] == "fail"
    assert _rows(just_out, GUARD)["quadrangle_of"]["verdict"] == "indeterminate"
    assert _rows(just_in, GUARD)["quadrangle_of"]["verdict"] == "indeterminate"
    assert _rows(just_in)["quadrangle_of"]["verdict"] == "pass"
    assert _rows(tuple(xy_from_cct_duv(4000.0, 0.009)), GUARD)["quadrangle_of"]["verdict"] == "fail"


@pytest.mark.parametrize("rule", [DecisionRule("simple"), GUARD])
def test_columns_agree_with_the_one_sample_rows(rule):
    xy = np.array(F4000.centre) + np.random.default_rng(5).normal(0, 0.006, (300, 2))
    mask = np.ones(len(xy), bool)
    mask[7] = False
    cols = lamp_columns("white", "white", TOL, xy, mask, rule)
    assert [c.id for c in cols] == ["white.ellipse_of", "white.quadrangle_of"]
    seen = set()
    for i in range(len(xy)):
        rows = one_sample_rows("white", "white", "s", TOL, tuple(xy[i]), rule, False, _row)
        for r, c in zip(rows, cols, strict=True):
            if i == 7:
                assert c.code[i] == -1
                continue
            assert r["verdict"] == CODES[c.code[i]], (c.id, i)
            assert r["value"] == pytest.approx(c.value[i], rel=1e-12, abs=1e-15)
            assert r["margin"] == pytest.approx(c.margin[i], rel=1e-12, abs=1e-15)
            assert r["limit"] == c.limit
            seen.add((c.id, r["verdict"]))
    assert {v for _, v in seen} >= {"pass", "fail"}


SPEC = """\
spec: 1
id: lamp
white:
  target: {cct: 3985, duv: 0.001}
  tolerance:
    ellipse_of: {standard: iec-60081, colour: F4000, steps: 5}
    quadrangle_of: {standard: ansi-c78.377-2008, nominal_cct: 4000}
colours:
  warm:
    target: {x: 0.4400, y: 0.4030}
    tolerance:
      ellipse_of: {standard: iec-60081, colour: F3000, steps: 3}
      quadrangle_of: {standard: ansi-c78.377-2008, nominal_cct: 3000}
decision_rule: guard-banded
uncertainty: {xy: 0.0004}
units:
  - {serial: A, white: {x: 0.3795, y: 0.3812}, colours: {warm: {x: 0.4410, y: 0.4040}}}
  - {serial: B, white: {x: 0.3750, y: 0.3870}, colours: {warm: {x: 0.4520, y: 0.4080}}}
"""


def test_a_spec_with_lamp_figures_is_assessed_and_cautioned(spec_dir):
    spec_dir("lamp.yaml", SPEC)
    (e,), _ = evaluate(spec_dir.dir)
    rows = {(r["id"], r["sample"]): r for r in e.assessment.rows}
    # the design target is assessed: the fixed figure need not hold it
    assert rows[("white.ellipse_of", None)]["value"] == pytest.approx(1.24, abs=0.01)
    assert rows[("white.quadrangle_of", None)]["verdict"] == "pass"
    assert rows[("colours.warm.ellipse_of", None)]["value"] == pytest.approx(0.0, abs=1e-12)
    assert rows[("white.ellipse_of", "A")]["verdict"] == "pass"
    assert rows[("white.ellipse_of", "B")]["verdict"] == "fail"
    assert rows[("white.ellipse_of", "B")]["uncertainty"] == pytest.approx(0.0004 / 0.00134)
    assert rows[("white.quadrangle_of", "B")]["verdict"] == "pass"        # inside the wider quadrangle
    assert rows[("colours.warm.ellipse_of", "A")]["verdict"] == "pass"
    assert rows[("colours.warm.ellipse_of", "B")]["verdict"] == "fail"
    assert rows[("colours.warm.quadrangle_of", "B")]["verdict"] == "fail"
    ids = [r["id"] for r in e.assessment.rows if r["sample"] == "A"]
    assert ids.index("white.ellipse_of") < ids.index("colours.warm.ellipse_of")
    # no category written: a spec judged against a lighting standard is a lighting spec
    assert e.spec.category == "lighting"
    assert "accredited laboratory" in CAUTION
    text = dict(methods(e.spec))["Lighting-standard tolerances"]
    assert "IEC 60081" in text and "Annex D" in text and "ANSI C78.377-2008" in text
    assert "recalled from memory, not checked against the standard text" in text and "[M+C]" in text
    assert "accredited laboratory" in text
    assert limit_text(rows[("white.ellipse_of", "A")]) == "≤ 5 steps of the IEC 60081 F4000 ellipse [M]"
    assert limit_text(rows[("white.quadrangle_of", "A")]) == (
        "inside the ANSI C78.377-2008 4000 K quadrangle (3710-4260 K, Duv -0.0050 to +0.0070) [M+C]")


def test_a_stated_category_is_kept(spec_dir):
    spec_dir("lamp.yaml", SPEC.replace("id: lamp\n", "id: lamp\ncategory: indicator\n"))
    (e,), _ = evaluate(spec_dir.dir)
    assert e.spec.category == "indicator"
    # the methods text carries the caution whatever the category
    assert "accredited laboratory" in dict(methods(e.spec))["Lighting-standard tolerances"]


def test_the_close_up_draws_the_fixed_figures_where_the_standard_puts_them(spec_dir):
    from generator.colour.lamp_tolerance import ellipse_steps
    from generator.render.diagrams import tolerance_shapes

    spec_dir("lamp.yaml", SPEC)
    (e,), _ = evaluate(spec_dir.dir)
    shapes = dict(tolerance_shapes(e.spec.white.tolerance, e.spec.white.xy, "white"))
    ell = shapes["white: IEC 60081 F4000 5-step ellipse [M]"]
    assert ellipse_steps(ell, F4000.centre, F4000.a, F4000.b, F4000.angle) == pytest.approx(
        np.full(len(ell), 5.0), abs=1e-9)
    quad = shapes["white: ANSI C78.377-2008 4000 K quadrangle [M+C]"]
    assert quad == pytest.approx(np.array(ANSI4000.outline))
