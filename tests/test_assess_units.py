"""The column-wise assessment of units against the one-unit row builders, and uniformity."""
from __future__ import annotations

import itertools

import numpy as np
import pytest

from generator.assess.requirements import tolerance_rows
from generator.assess.rules import CODES, DecisionRule
from generator.assess.units import tolerance_columns, uniformity_columns, unit_rows
from generator.colour.cct import cct_duv_from_xy
from generator.colour.convert import xy_to_uv_prime
from generator.model import Tolerance, Uncertainty, Uniformity, UnitTable

TOL = Tolerance(delta_uv=0.004, box=(0.003, 0.004), ellipse=(0.005, 0.0025, 30.0),
                region=((0.30, 0.31), (0.33, 0.31), (0.335, 0.35), (0.30, 0.345)), cct=(6200.0, 6800.0),
                duv=(-0.003, 0.006))
TARGET = (0.3127, 0.3290)


@pytest.mark.parametrize("rule", [DecisionRule("simple"), DecisionRule("guard-banded")])
def test_columns_agree_with_the_one_unit_rows(rule):
    rng = np.random.default_rng(11)
    xy = np.array(TARGET) + rng.normal(0, 0.003, (400, 2))
    cct, duv = cct_duv_from_xy(xy)
    cols = tolerance_columns("white", "white", TOL, TARGET, xy, np.ones(len(xy), bool), rule, white=(cct, duv))
    for i in range(len(xy)):
        w = {"cct_K": float(cct[i]), "duv": float(duv[i])}
        rows = tolerance_rows("white", "white", "s", TOL, TARGET, tuple(xy[i]), rule, white=w)
        assert [r["id"] for r in rows] == [c.id for c in cols]
        for r, c in zip(rows, cols):
            assert r["verdict"] == CODES[c.code[i]], (r["id"], i)
            if isinstance(r["value"], dict):
                assert r["value"]["dx"] == pytest.approx(c.parts["dx"][i], abs=1e-15)
            else:
                assert r["value"] == pytest.approx(c.value[i], rel=1e-12, abs=1e-15)
            assert r["margin"] == pytest.approx(c.margin[i], rel=1e-12, abs=1e-15)


def test_guard_band_uses_the_stated_uncertainty_per_quantity():
    rule = DecisionRule("guard-banded", Uncertainty((("delta_uv", 0.0015, None),)))
    # a white 0.0045 from the target in u'v': inside the 0.004 + U band, so indeterminate
    uv = xy_to_uv_prime(np.array(TARGET)) + [0.0045, 0.0]
    from generator.colour.convert import uv_prime_to_xy
    xy = uv_prime_to_xy(uv)[None, :]
    (c,) = tolerance_columns("white", "white", Tolerance(delta_uv=0.004), TARGET, xy, np.ones(1, bool), rule)
    assert c.value[0] == pytest.approx(0.0045) and CODES[c.code[0]] == "indeterminate"
    (c,) = tolerance_columns("white", "white", Tolerance(delta_uv=0.004), TARGET, xy, np.ones(1, bool),
                             DecisionRule("simple"))
    assert CODES[c.code[0]] == "fail"


class _Spec:
    def __init__(self, uni):
        self.uniformity = uni


def _grid_table():
    pts = np.full((2, 3, 3), np.nan)
    pts[0] = [[0.3127, 0.3290, 300.0], [0.3140, 0.3300, 255.0], [0.3110, 0.3270, 280.0]]
    pts[1, 0] = [0.3127, 0.3290, 300.0]                     # one point only: not assessed
    return UnitTable(["A", "B"], ["L", "L"], ["", ""], ["", ""], {"white": pts[:, 0, :].copy()}, pts,
                     ("C", "E", "W"))


def test_uniformity_luminance_ratio_and_largest_pairwise_colour_difference():
    t = _grid_table()
    cols = uniformity_columns(_Spec(Uniformity("C", 90.0, 0.004, "pairs")), t, DecisionRule("simple"))
    lum, col = cols
    assert lum.value[0] == pytest.approx(100 * 255 / 300) and CODES[lum.code[0]] == "fail"
    assert lum.code[1] == -1 and col.code[1] == -1
    uv = xy_to_uv_prime(t.points[0, :, :2])
    pairs = [np.hypot(*(a - b)) for a, b in itertools.combinations(uv, 2)]
    assert col.value[0] == pytest.approx(max(pairs))
    assert CODES[col.code[0]] == ("pass" if max(pairs) <= 0.004 else "fail")


def test_uniformity_from_the_centre():
    t = _grid_table()
    (col,) = uniformity_columns(_Spec(Uniformity("C", None, 0.004, "centre")), t, DecisionRule("simple"))
    uv = xy_to_uv_prime(t.points[0, :, :2])
    assert col.value[0] == pytest.approx(max(np.hypot(*(uv[k] - uv[0])) for k in (1, 2)))


def test_unit_rows_carry_lot_and_uncertainty():
    t = _grid_table()
    cols = uniformity_columns(_Spec(Uniformity("C", 80.0, None)), t,
                              DecisionRule("guard-banded", Uncertainty((("luminance_uniformity", 2.0, None),))))
    (row,) = list(unit_rows(cols, t, True))
    assert row["sample"] == "A" and row["lot"] == "L" and row["uncertainty"] == 2.0
    assert row["quantity"] == "luminance_uniformity" and row["unit"] == "%"


@pytest.mark.parametrize("limit", [0, 7, 50, 10_000])
def test_the_rows_a_page_shows_are_those_of_the_full_list_not_passing_first(limit, tmp_path, monkeypatch):
    """Counts, the not-passing rows and the rows shown are built from the verdict codes and
    a few rows, and equal what the full row list gives, for every demo spec with units."""
    from generator.build import evaluate

    from .conftest import copy_demo

    monkeypatch.chdir(tmp_path)
    evaluated, _ = evaluate(copy_demo(tmp_path))
    seen = 0
    for e in evaluated:
        a = e.assessment
        rows = a.rows
        units = rows[len(a.design_rows):]
        counts = a.row_counts()
        assert counts["rows"] == len(rows)
        assert all(counts[v] == sum(r["verdict"] == v for r in rows) for v in CODES)
        assert a.not_passing_rows(limit) == [r for r in rows if r["verdict"] != "pass"][:limit]
        bad = [r for r in units if r["verdict"] != "pass"]
        good = [r for r in units if r["verdict"] == "pass"]
        expected = units if len(units) <= limit else (bad + good)[:limit]
        assert a.unit_rows_shown(limit) == expected
        seen += bool(units)
    assert seen >= 3
