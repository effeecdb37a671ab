"""Coverage and area ratio of many triangles at once against the one-polygon functions
and hand-computed areas."""
from __future__ import annotations

import numpy as np
import pytest

from generator.colour.gamut import area_ratio, convex_hull, coverage
from generator.colour.gamut_batch import area_ratio_many, clip_area, coverage_many
from generator.data import REFERENCE_SPACES


@pytest.mark.parametrize("key", ["srgb", "dci-p3", "bt2020"])
def test_batch_equals_the_one_polygon_functions(key):
    ref = convex_hull(np.array(REFERENCE_SPACES[key].primaries))
    rng = np.random.default_rng(3)
    tris = np.array(REFERENCE_SPACES[key].primaries) + rng.normal(0, 0.05, (3000, 3, 2))
    tris[::7] = tris[::7, ::-1]          # clockwise ones too
    assert np.allclose(coverage_many(tris, ref), [coverage(t, ref) for t in tris], atol=1e-10)
    assert np.allclose(area_ratio_many(tris, ref), [area_ratio(t, ref) for t in tris], atol=1e-10)


def test_disjoint_identical_and_nan_triangles():
    ref = np.array([[0.0, 0.0], [1.0, 0.0], [0.0, 1.0]])
    tris = np.array([ref, ref + 5.0, [[np.nan, 0], [1, 0], [0, 1]]])
    cov = coverage_many(tris, ref)
    assert cov[0] == pytest.approx(100.0) and cov[1] == 0.0 and np.isnan(cov[2])


def test_clip_area_of_a_unit_square_by_a_half_plane_triangle():
    square = np.array([[0, 0], [1, 0], [1, 1], [0, 1]], float)
    tri = np.array([[[0, 0], [2, 0], [0, 2]]], float)   # cuts the square along x + y = 2: all inside
    assert clip_area(square, tri)[0] == pytest.approx(1.0)
    tri = np.array([[[0, 0], [1, 0], [0, 1]]], float)   # half the square
    assert clip_area(square, tri)[0] == pytest.approx(0.5)
