"""Lot statistics against numpy and the statistics module, computed here independently."""
from __future__ import annotations

import statistics

import numpy as np
import pytest

from generator.assess.stats import capability, describe, lot_statistics
from generator.assess.units import Column
from generator.model import UnitTable


def test_describe_matches_the_statistics_module():
    rng = np.random.default_rng(7)
    v = rng.normal(6500, 80, 257)
    d = describe(v, 6200.0, 6700.0)
    assert d["n"] == 257
    assert d["mean"] == pytest.approx(statistics.fmean(v.tolist()), rel=1e-12)
    assert d["sd"] == pytest.approx(statistics.stdev(v.tolist()), rel=1e-12)
    assert (d["min"], d["max"]) == (min(v), max(v))
    outside = sum(1 for x in v if x < 6200 or x > 6700)
    assert d["out_of_tolerance_percent"] == pytest.approx(100 * outside / 257)
    s = statistics.stdev(v.tolist())
    m = statistics.fmean(v.tolist())
    assert d["cp"] == pytest.approx((6700 - 6200) / (6 * s))
    assert d["cpk"] == pytest.approx(min(6700 - m, m - 6200) / (3 * s))


def test_one_sided_limits_give_cpk_only():
    v = np.array([0.001, 0.002, 0.003, 0.004])
    d = describe(v, None, 0.005)
    s = np.std(v, ddof=1)
    assert d["cp"] is None and d["cpk"] == pytest.approx((0.005 - v.mean()) / (3 * s))
    d = describe(v, 0.0015, None)
    assert d["cpk"] == pytest.approx((v.mean() - 0.0015) / (3 * s))
    assert d["out_of_tolerance_percent"] == 25.0


def test_degenerate_samples():
    assert describe(np.array([1.0]), 0.0, 2.0)["sd"] is None
    assert describe(np.array([np.nan]), 0.0, 2.0)["n"] == 0
    assert capability(1.0, 0.0, 0.0, 2.0) == (None, None)


def test_lot_statistics_per_column_with_worst_units_and_box_axes():
    n = 6
    table = UnitTable([f"S{i}" for i in range(n)], ["L"] * n, [""] * n, [""] * n, {})
    value = np.array([0.001, 0.004, 0.002, 0.006, np.nan, 0.003])
    code = np.array([0, 0, 0, 2, -1, 0], np.int8)
    c = Column("white.delta_uv", "white", "delta_uv", "Δu'v'", {"max": 0.005}, value, code, 0.005 - value,
               hi=0.005, stat_form="upper")
    dx = np.array([0.001, -0.002, 0.0, 0.003, 0.0, 0.0])
    box = Column("white.box", "white", "box", "box", {"dx": 0.0025, "dy": 0.01}, dx, code, dx,
                 parts={"dx": dx, "dy": dx * 0}, stat_form="two-sided per axis")
    (st, sx, sy) = lot_statistics([c, box], table, np.arange(n))
    assert st["n"] == 5 and st["mean"] == pytest.approx(np.mean([0.001, 0.004, 0.002, 0.006, 0.003]))
    assert [w["serial"] for w in st["worst"]] == ["S3", "S1", "S5"]
    assert st["worst"][0]["verdict"] == "fail"
    assert sx["id"] == "white.box.dx" and sx["limit"] == {"min": -0.0025, "max": 0.0025}
    assert sx["out_of_tolerance_percent"] == pytest.approx(20.0)
    assert sy["sd"] == 0.0 and sy["cpk"] is None


def test_smallest_is_the_head_of_a_stable_argsort_with_ties_and_nan():
    from generator.assess.stats import _smallest

    rng = np.random.default_rng(4)
    for n in (1, 5, 12, 13, 200, 5000):
        v = rng.integers(0, 6, n).astype(float)      # many ties
        v[rng.random(n) < 0.2] = np.nan
        for k in (1, 3):
            assert _smallest(v, k).tolist() == np.argsort(v, kind="stable")[:k].tolist(), (n, k)
    v = np.full(100, np.nan)
    v[[7, 90]] = 1.0                                 # fewer finite values than k: NaN fill the rest
    assert _smallest(v, 3).tolist() == [7, 90, 0]


def _summary_reference(cols, table, codes):
    """The lots and suppliers written out unit by unit (the former implementation)."""
    lots, sups = [], []
    for lot in sorted({x for x in table.lot if x}):
        members = [i for i, x in enumerate(table.lot) if x == lot]
        k = codes[members]
        lots.append({"lot": lot, "n": len(members), "n_fail": int(np.sum(k == 2)),
                     "suppliers": sorted({table.supplier[i] for i in members if table.supplier[i]}),
                     "verdict": ("pass", "indeterminate", "fail")[int(k.max())], "n_pass": int(np.sum(k == 0)),
                     "n_indeterminate": int(np.sum(k == 1)), "fail_percent": 100.0 * float(np.mean(k == 2)),
                     "statistics": lot_statistics(cols, table, np.array(members))})
    for sup in sorted({x for x in table.supplier if x}):
        members = [i for i, x in enumerate(table.supplier) if x == sup]
        k = codes[members]
        sups.append({"supplier": sup, "n": len(members), "n_fail": int(np.sum(k == 2)),
                     "n_indeterminate": int(np.sum(k == 1)), "n_pass": int(np.sum(k == 0)),
                     "lots": sorted({table.lot[i] for i in members if table.lot[i]}),
                     "verdict": ("pass", "indeterminate", "fail")[int(k.max())]})
    return lots, sups


def test_grouped_lots_and_suppliers_equal_the_unit_by_unit_reference():
    from generator.assess.requirements import summarise, unit_entries

    rng = np.random.default_rng(9)
    n = 3000
    lot = [rng.choice(["L-b", "L-a", "", "L-c10", "L-c2"]) for _ in range(n)]
    sup = [rng.choice(["Umbrin", "", "Tessaly", "Arvo"]) for _ in range(n)]
    table = UnitTable([f"S{i:05d}" for i in range(n)], lot, sup, ["f:1"] * n, {})
    value = rng.normal(0.003, 0.001, n)
    code = np.where(value > 0.005, 2, np.where(value > 0.0045, 1, 0)).astype(np.int8)
    code[rng.random(n) < 0.05] = -1
    cols = [Column("white.delta_uv", "white", "delta_uv", "Δu'v'", {"max": 0.005}, value, code, 0.005 - value,
                   hi=0.005, stat_form="upper"),
            Column("red.delta_uv", "red", "delta_uv", "Δu'v'", {"max": 0.004}, value * 1.1,
                   np.where(value * 1.1 > 0.004, 2, 0).astype(np.int8), 0.004 - value * 1.1, hi=0.004)]
    codes = np.maximum(np.max(np.stack([c.code for c in cols]), axis=0), 0).astype(np.int8)
    assert summarise(cols, table, codes) == _summary_reference(cols, table, codes)
    units = unit_entries(cols, table, codes)
    for i in (0, 17, 2999):
        failing = [c.id for c in cols if c.code[i] == 2]
        assert units[i] == {"serial": f"S{i:05d}", "lot": lot[i], "supplier": sup[i],
                            "verdict": ("pass", "indeterminate", "fail")[codes[i]],
                            "rows": sum(int(c.code[i] >= 0) for c in cols), "failing": failing, "source": "f:1"}
