"""bench/kernels.py: its own references and the rows it returns (no timing is asserted)."""
from __future__ import annotations

import importlib.util
from pathlib import Path

import numpy as np
import pytest

from generator.colour.gamut_batch import coverage_many

_PATH = Path(__file__).resolve().parent.parent / "bench" / "kernels.py"
_spec = importlib.util.spec_from_file_location("bench_kernels", _PATH)
kernels = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(kernels)


def test_plain_python_clipping_reference_on_hand_computed_areas():
    ref = [(0.0, 0.0), (1.0, 0.0), (0.0, 1.0)]                       # area 0.5
    assert kernels._area(ref) == 0.5
    # the square's lower-left half: a triangle of area 0.5 inside the unit square (independent computation)
    square = [(0.0, 0.0), (1.0, 0.0), (1.0, 1.0), (0.0, 1.0)]
    assert kernels._area(kernels._clip_polygon(square, ref)) == pytest.approx(0.5)
    assert kernels._coverage_reference(np.array(ref), np.array(ref)) == pytest.approx(100.0)
    assert kernels._coverage_reference(np.array(ref)[::-1], np.array(ref)) == pytest.approx(100.0)
    half = np.array([(0.0, 0.0), (0.5, 0.0), (0.0, 0.5)])            # a quarter of the area: 25 %
    assert kernels._coverage_reference(half, np.array(ref)) == pytest.approx(25.0)
    assert kernels._coverage_reference(np.array(ref) + 5.0, np.array(ref)) == 0.0


def test_reference_and_batch_coverage_agree_on_random_triangles():
    ref = np.array([(0.64, 0.33), (0.30, 0.60), (0.15, 0.06)])
    tris = ref + np.random.default_rng(1).normal(0, 0.05, (200, 3, 2))
    got = coverage_many(tris, ref)
    want = [kernels._coverage_reference(t, ref) for t in tris]
    np.testing.assert_allclose(got, want, rtol=0, atol=1e-9)


def test_cct_points_sit_at_their_stated_temperature_and_duv():
    from generator.colour.cct import cct_duv_from_uv_exact

    uv, T, D = kernels._cct_points(50)
    cct, duv = cct_duv_from_uv_exact(uv)
    np.testing.assert_allclose(cct, T, rtol=1e-9)
    np.testing.assert_allclose(duv, D, rtol=0, atol=1e-12)


def test_run_kernels_rows_carry_the_interface_and_meet_the_accuracy_targets():
    rows = kernels.run_kernels(quick=True)
    names = [r["name"] for r in rows]
    assert any(n.startswith("CCT") for n in names) and any(n.startswith("CIEDE2000") for n in names)
    assert any(n.startswith("spectral integration vs plain matmul") for n in names)
    assert any(n.startswith("coverage") for n in names)
    for r in rows:
        assert set(kernels.COLUMNS) <= set(r), r["name"]
        assert r["ours_s"] > 0 and r["per_item_us"] == pytest.approx(r["ours_s"] / r["n"] * 1e6)
        assert isinstance(r["met"], bool) and r["target"]
    # accuracy (not speed): deterministic, so asserted
    by = {r["name"].split(" ")[0]: r for r in rows}
    assert by["CCT/Duv"]["max_diff"] <= 0.01 and by["CCT/Duv"]["max_diff_duv"] <= 1e-6
    assert by["coverage"]["max_diff"] <= 1e-9
