"""Point-in-region tests in generator/colour/region.py."""
from __future__ import annotations

import numpy as np
import pytest
from matplotlib.path import Path

from generator.colour.region import distance_to_polygon_edges, ellipse_radius, in_ellipse, in_polygon

FLOAT_TOL = 1e-12

# UNECE Regulation 48 §2.29 corner points (CIE 1931 xy), check values §8a
R48_WHITE = np.array([(0.310, 0.348), (0.453, 0.440), (0.500, 0.440), (0.500, 0.382),
                      (0.443, 0.382), (0.310, 0.283)])
R48_AMBER = np.array([(0.545, 0.425), (0.560, 0.440), (0.609, 0.390), (0.597, 0.390)])
R48_RED = np.array([(0.645, 0.335), (0.665, 0.335), (0.735, 0.265), (0.721, 0.259)])


def test_r48_white_is_not_convex_and_the_notch_point_is_inside():
    # check values §8a: (0.480, 0.390) is inside the polygon although it fails the
    # purple half-plane y >= 0.050 + 0.750 x; the vertex (0.443, 0.382) is reflex
    p = np.array([0.480, 0.390])
    assert p[1] < 0.050 + 0.750 * p[0]
    assert bool(in_polygon(p, R48_WHITE))


@pytest.mark.parametrize(
    ("xy", "white", "amber", "red"),
    [
        # check values §8a test points: D65, A and E are white
        ((0.3127, 0.3290), True, False, False),
        ((0.44757, 0.40745), True, False, False),
        ((1 / 3, 1 / 3), True, False, False),
        # amber
        ((0.575, 0.420), False, True, False),
        ((0.570, 0.428), False, True, False),
        # red
        ((0.700, 0.295), False, False, True),
        # below the notch: fails y >= 0.382 and the purple line
        ((0.470, 0.370), False, False, False),
        # left of the blue boundary x = 0.310
        ((0.300, 0.320), False, False, False),
    ],
)
def test_r48_test_points(xy, white, amber, red):
    assert bool(in_polygon(xy, R48_WHITE)) is white
    assert bool(in_polygon(xy, R48_AMBER)) is amber
    assert bool(in_polygon(xy, R48_RED)) is red


def test_corners_and_edges_count_as_inside():
    assert np.all(in_polygon(R48_WHITE, R48_WHITE))
    mids = (R48_WHITE + np.roll(R48_WHITE, -1, axis=0)) / 2
    assert np.all(in_polygon(mids, R48_WHITE))
    # just outside the x = 0.500 edge, by more than eps
    assert not bool(in_polygon((0.500 + 1e-9, 0.41), R48_WHITE))
    assert bool(in_polygon((0.500 + 1e-9, 0.41), R48_WHITE, eps=1e-8))


def test_matches_matplotlib_path_on_random_points_in_a_non_convex_polygon():
    rng = np.random.default_rng(48)
    ang = np.sort(rng.uniform(0, 2 * np.pi, 12))
    rad = rng.uniform(0.05, 0.2, 12)
    star = np.array([0.35, 0.35]) + rad[:, None] * np.stack([np.cos(ang), np.sin(ang)], axis=-1)
    pts = rng.uniform(0.1, 0.6, (4000, 2))
    pts = pts[distance_to_polygon_edges(pts, star) > 1e-6]
    for poly in (star, R48_WHITE):
        expected = Path(poly).contains_points(pts)
        np.testing.assert_array_equal(in_polygon(pts, poly), expected)
    assert 0 < in_polygon(pts, star).sum() < len(pts)


def test_distance_to_polygon_edges_by_hand():
    square = np.array([[0, 0], [1, 0], [1, 1], [0, 1]], dtype=float)
    d = distance_to_polygon_edges([[0.5, 0.5], [2.0, 0.5], [2.0, 2.0], [0.5, 0.0], [0.25, 0.5]], square)
    np.testing.assert_allclose(d, [0.5, 1.0, np.sqrt(2), 0.0, 0.25], rtol=0, atol=FLOAT_TOL)
    # a polygon with a repeated closing vertex (zero-length edge) still works
    closed = np.vstack([square, square[:1]])
    np.testing.assert_allclose(distance_to_polygon_edges([2.0, 0.5], closed), 1.0, atol=FLOAT_TOL)
    assert bool(in_polygon([0.5, 0.5], closed)) and not bool(in_polygon([1.5, 0.5], closed))


def test_n_dimensional_points():
    pts = np.array([[[0.3127, 0.3290], [0.575, 0.420]], [[0.480, 0.390], [0.9, 0.9]]])
    inside = in_polygon(pts, R48_WHITE)
    assert inside.shape == (2, 2)
    np.testing.assert_array_equal(inside, [[True, False], [True, False]])
    assert distance_to_polygon_edges(pts, R48_WHITE).shape == (2, 2)
    assert in_polygon(pts[0, 0], R48_WHITE).shape == ()
    assert in_ellipse(pts, (0.3127, 0.3290), 0.01, 0.005, 30.0).shape == (2, 2)


def test_nan_and_inf_points_are_not_inside():
    pts = np.array([[np.nan, 0.39], [0.48, np.nan], [np.inf, 0.39], [0.48, -np.inf], [0.48, 0.39]])
    expected = [False, False, False, False, True]
    np.testing.assert_array_equal(in_polygon(pts, R48_WHITE), expected)
    d = distance_to_polygon_edges(pts, R48_WHITE)
    assert np.isnan(d[0]) and np.isnan(d[1]) and not np.isfinite(d[2]) and np.isfinite(d[4])
    np.testing.assert_array_equal(in_ellipse(pts, (0.48, 0.39), 0.01, 0.01, 0.0), expected)
    np.testing.assert_array_equal(in_ellipse(pts, (0.48, 0.39), 0.01, 0.005, 30.0), expected)


def test_ellipse_axes_follow_the_angle_of_the_major_axis_from_x():
    c = np.array([0.3, 0.3])
    a, b = 0.02, 0.01
    for deg in (0.0, 30.0, 90.0, 135.0):
        th = np.deg2rad(deg)
        major = np.array([np.cos(th), np.sin(th)])
        minor = np.array([-np.sin(th), np.cos(th)])
        assert bool(in_ellipse(c + 0.99 * a * major, c, a, b, deg))
        assert not bool(in_ellipse(c + 1.01 * a * major, c, a, b, deg))
        assert bool(in_ellipse(c + 0.99 * b * minor, c, a, b, deg))
        assert not bool(in_ellipse(c + 1.01 * b * minor, c, a, b, deg))
        # on the ellipse itself counts as inside
        assert bool(in_ellipse(c - a * major, c, a, b, deg))


def test_macadam_ellipse_as_published():
    # MacAdam (1942) ellipse at (0.305, 0.323): a = 2.30e-3, b = 0.90e-3, θ = 58° (observed,
    # Wyszecki & Stiles Table 2(5.4.1) as stored by colour-science)
    c, a, b, th = np.array([0.305, 0.323]), 2.30e-3, 0.90e-3, 58.0
    t = np.deg2rad(th)
    assert bool(in_ellipse(c + 2.2e-3 * np.array([np.cos(t), np.sin(t)]), c, a, b, th))
    # the same distance along the minor axis is well outside
    assert not bool(in_ellipse(c + 2.2e-3 * np.array([-np.sin(t), np.cos(t)]), c, a, b, th))


def test_ellipse_radius():
    np.testing.assert_allclose(ellipse_radius([2.0, 0.0, 1.0], [0.0, 1.0, 0.5], 2.0, 1.0),
                               [1.0, 1.0, np.sqrt(0.5)], rtol=0, atol=FLOAT_TOL)
