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


def test_shared_edges_count_once_and_opposite_edges_cancel():
    ref = np.array([[0.0, 0.0], [1.0, 0.0], [0.0, 1.0]])
    tris = np.array([
        ref,                                   # identical: every edge shared in the same direction
        ref[::-1],                             # identical, clockwise
        [[0.0, 0.0], [1.0, 0.0], [0.0, -1.0]],  # shares the edge y = 0, lies below it: touching only
        [[0.0, 0.0], [1.0, 0.0], [0.2, 0.2]],  # shares the edge y = 0, inside: its own area, 0.1
        [[0.0, 0.0], [0.5, 0.0], [0.0, 0.5]],  # corner triangle on two shared edge lines: 0.125
    ])
    np.testing.assert_allclose(clip_area(ref, tris), [0.5, 0.5, 0.0, 0.1, 0.125], rtol=0, atol=1e-15)


def test_degenerate_triangles_cover_nothing():
    ref = np.array([[0.0, 0.0], [1.0, 0.0], [0.0, 1.0]])
    tris = np.array([[[0.1, 0.1], [0.2, 0.2], [0.3, 0.3]], np.zeros((3, 2)), [[0.2, 0.2]] * 3])
    np.testing.assert_array_equal(clip_area(ref, tris), [0.0, 0.0, 0.0])
    np.testing.assert_array_equal(coverage_many(tris, ref), [0.0, 0.0, 0.0])


def test_more_triangles_than_one_block_give_the_same_areas():
    ref = convex_hull(np.array(REFERENCE_SPACES["srgb"].primaries))
    rng = np.random.default_rng(5)
    tris = np.array(REFERENCE_SPACES["srgb"].primaries) + rng.normal(0, 0.05, (9000, 3, 2))
    whole = clip_area(ref, tris)
    np.testing.assert_array_equal(whole[4000:4200], clip_area(ref, tris[4000:4200]))
    np.testing.assert_allclose(coverage_many(tris, ref)[::250], [coverage(t, ref) for t in tris[::250]],
                               rtol=0, atol=1e-10)
