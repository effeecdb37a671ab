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
