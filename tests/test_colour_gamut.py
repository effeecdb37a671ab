"""Gamut hull, area, coverage and area ratio in generator/colour/gamut.py."""
from __future__ import annotations

import numpy as np
import pytest
from scipy.spatial import ConvexHull

from generator.colour.convert import xy_to_uv_prime
from generator.colour.gamut import area_ratio, clip_convex, convex_hull, coverage, polygon_area
from generator.colour.spectral import spectral_locus_uv, spectral_locus_xy
from generator.data import REFERENCE_SPACES

# areas quoted to 6 decimals; percentages quoted to 2 decimals
AREA_ROUNDING = 5e-7 + 1e-12
PERCENT_ROUNDING = 5e-3 + 1e-9
FLOAT_TOL = 1e-9


def _xy(key):
    return np.array(REFERENCE_SPACES[key].primaries)


def _uv(key):
    return xy_to_uv_prime(_xy(key))


@pytest.mark.parametrize(
    ("key", "area_xy", "area_uv"),
    [
        # independent computation (shoelace formula), check values §3
        ("srgb", 0.112050, 0.064892),
        ("bt2020", 0.211867, 0.111823),
        ("dci-p3", 0.152000, 0.081480),
        ("display-p3", 0.152000, 0.081480),
        ("adobe-rgb-1998", 0.151150, 0.075707),
        ("ntsc-1953", 0.158200, 0.074426),
        ("ebu-3213", 0.113400, 0.065537),
        ("smpte-c", 0.103762, 0.057297),
    ],
)
def test_triangle_areas(key, area_xy, area_uv):
    assert polygon_area(convex_hull(_xy(key))) == pytest.approx(area_xy, abs=AREA_ROUNDING)
    assert polygon_area(convex_hull(_uv(key))) == pytest.approx(area_uv, abs=AREA_ROUNDING)


def test_spectral_locus_area():
    # independent computation: hull of the CIE 1931 1 nm locus, 360-830 nm
    assert polygon_area(convex_hull(spectral_locus_xy()[1])) == pytest.approx(0.334348, abs=AREA_ROUNDING)
    assert polygon_area(convex_hull(spectral_locus_uv()[1])) == pytest.approx(0.195494, abs=AREA_ROUNDING)


@pytest.mark.parametrize(
    ("a", "ref", "ratio_xy", "cov_xy", "ratio_uv", "cov_uv"),
    [
        # independent computation (shapely intersections), check values §3
        ("srgb", "ntsc-1953", 70.83, 68.46, 87.19, 78.44),
        ("dci-p3", "ntsc-1953", 96.08, 86.41, 109.48, 90.07),
        ("adobe-rgb-1998", "ntsc-1953", 95.54, 93.13, 101.72, 92.76),
        ("bt2020", "ntsc-1953", 133.92, 99.99, 150.25, 99.98),
        ("srgb", "bt2020", 52.89, 52.89, 58.03, 58.03),
        # DCI-P3 is 71.74 % (xy) / 72.87 % (u'v') of BT.2020, not the folklore 86 %
        ("dci-p3", "bt2020", 71.74, 71.73, 72.87, 72.85),
        ("adobe-rgb-1998", "bt2020", 71.34, 71.34, 67.70, 67.70),
        ("ntsc-1953", "bt2020", 74.67, 74.66, 66.56, 66.55),
        ("dci-p3", "srgb", 135.65, 100.0, 125.56, 100.0),
        ("adobe-rgb-1998", "srgb", 134.90, 100.0, 116.67, 100.0),
        ("ntsc-1953", "srgb", 141.19, 96.65, 114.69, 89.96),
    ],
)
def test_coverage_and_area_ratio_check_values(a, ref, ratio_xy, cov_xy, ratio_uv, cov_uv):
    assert area_ratio(_xy(a), _xy(ref)) == pytest.approx(ratio_xy, abs=PERCENT_ROUNDING)
    assert coverage(_xy(a), _xy(ref)) == pytest.approx(cov_xy, abs=PERCENT_ROUNDING)
    assert area_ratio(_uv(a), _uv(ref)) == pytest.approx(ratio_uv, abs=PERCENT_ROUNDING)
    assert coverage(_uv(a), _uv(ref)) == pytest.approx(cov_uv, abs=PERCENT_ROUNDING)


@pytest.mark.parametrize(
    ("key", "share_xy", "share_uv"),
    [
        # independent computation: coverage of the 1 nm locus hull, check values §3
        ("srgb", 33.51, 33.19),
        ("dci-p3", 45.46, 41.68),
        ("adobe-rgb-1998", 45.21, 38.73),
        ("ntsc-1953", 47.32, 38.07),
        ("bt2020", 63.37, 57.20),
    ],
)
def test_share_of_the_spectral_locus(key, share_xy, share_uv):
    locus_xy = convex_hull(spectral_locus_xy()[1])
    locus_uv = convex_hull(spectral_locus_uv()[1])
    assert coverage(_xy(key), locus_xy) == pytest.approx(share_xy, abs=PERCENT_ROUNDING)
    assert coverage(_uv(key), locus_uv) == pytest.approx(share_uv, abs=PERCENT_ROUNDING)
    # the widely quoted 35.9 / 53.6 / 75.8 % are not area shares (check values §12.6)
    assert coverage(_xy("bt2020"), locus_xy) < 70


def _intersection_area(a, b):
    """Area of the intersection of two convex polygons, by a method of its own: the
    vertices of each inside the other plus all edge-edge crossings, then their hull."""
    def inside(p, poly):
        e = np.roll(poly, -1, axis=0) - poly
        c = e[:, 0] * (p[1] - poly[:, 1]) - e[:, 1] * (p[0] - poly[:, 0])
        return np.all(c >= -1e-14)

    pts = [p for p in a if inside(p, b)] + [p for p in b if inside(p, a)]
    for i in range(len(a)):
        p, r = a[i], a[(i + 1) % len(a)] - a[i]
        for j in range(len(b)):
            q, s = b[j], b[(j + 1) % len(b)] - b[j]
            den = r[0] * s[1] - r[1] * s[0]
            if den == 0:
                continue
            t = ((q - p)[0] * s[1] - (q - p)[1] * s[0]) / den
            u = ((q - p)[0] * r[1] - (q - p)[1] * r[0]) / den
            if 0 <= t <= 1 and 0 <= u <= 1:
                pts.append(p + t * r)
    if len(pts) < 3:
        return 0.0
    pts = np.array(pts)
    try:
        return ConvexHull(pts).volume
    except Exception:  # all points on a line
        return 0.0


def test_coverage_matches_an_independent_intersection_on_random_gamuts():
    rng = np.random.default_rng(2020)
    for _ in range(200):
        a = rng.uniform(0, 1, (rng.integers(3, 7), 2))
        b = rng.uniform(0, 1, (rng.integers(3, 7), 2))
        ha, hb = convex_hull(a), convex_hull(b)
        if len(ha) < 3 or len(hb) < 3:
            continue
        expected = 100 * _intersection_area(ha, hb) / ConvexHull(b).volume
        got = coverage(a, b)
        assert got == pytest.approx(expected, abs=1e-9)
        assert 0.0 <= got <= 100.0
        assert area_ratio(a, b) == pytest.approx(100 * ConvexHull(a).volume / ConvexHull(b).volume, rel=1e-12)


def test_convex_hull_matches_scipy_on_random_points():
    rng = np.random.default_rng(1979)
    for n in (3, 4, 6, 10, 50):
        pts = rng.uniform(0, 1, (n, 2))
        hull = convex_hull(pts)
        ref = ConvexHull(pts)
        assert {tuple(p) for p in hull} == {tuple(p) for p in pts[ref.vertices]}
        assert polygon_area(hull) == pytest.approx(ref.volume, rel=1e-12)
        assert polygon_area(hull) > 0  # counter-clockwise


def test_multi_primary_hexagon():
    # six primaries on a regular hexagon of radius r: area 3√3/2 r²
    r, c = 0.2, np.array([0.33, 0.33])
    ang = np.deg2rad(np.arange(0, 360, 60))
    hexagon = c + r * np.stack([np.cos(ang), np.sin(ang)], axis=-1)
    rng = np.random.default_rng(6)
    shuffled = rng.permutation(np.vstack([hexagon, c, c + [0.05, 0.0]]))  # two inner points
    hull = convex_hull(shuffled)
    assert len(hull) == 6
    assert polygon_area(hull) == pytest.approx(1.5 * np.sqrt(3) * r * r, rel=1e-12)
    # order of the primaries does not matter
    assert area_ratio(shuffled, _xy("srgb")) == pytest.approx(100 * polygon_area(hull) / 0.11205, rel=1e-9)
    small = c + 0.5 * r * np.array([[1, 0], [-0.5, 0.8], [-0.5, -0.8]])
    assert coverage(shuffled, small) == pytest.approx(100.0, abs=FLOAT_TOL)


def test_collinear_points_on_an_edge_are_dropped():
    square = np.array([[0, 0], [1, 0], [1, 1], [0, 1], [0.5, 0], [1, 0.5]], dtype=float)
    hull = convex_hull(square)
    assert len(hull) == 4 and polygon_area(hull) == pytest.approx(1.0)


def test_identical_gamuts_cover_100_percent():
    for key in REFERENCE_SPACES:
        assert coverage(_xy(key), _xy(key)) == pytest.approx(100.0, abs=FLOAT_TOL)
        assert area_ratio(_xy(key), _xy(key)) == pytest.approx(100.0, abs=FLOAT_TOL)


def test_disjoint_gamuts_cover_0_percent():
    a = np.array([[0.1, 0.1], [0.2, 0.1], [0.15, 0.2]])
    assert coverage(a, a + [0.5, 0.5]) == 0.0
    assert coverage(a, a + [0.1, 0.0]) == pytest.approx(0.0, abs=FLOAT_TOL)  # touching at a corner


def test_coverage_is_bounded_and_never_above_100():
    # a superset of the reference: exactly 100, never 100.00000000000001
    assert coverage(_xy("bt2020"), _xy("srgb")) == 100.0
    assert coverage(_xy("dci-p3"), _xy("srgb")) <= 100.0


def test_point_order_and_orientation_do_not_matter():
    ref = _xy("bt2020")
    a = _xy("dci-p3")
    expected_cov, expected_ratio = coverage(a, ref), area_ratio(a, ref)
    assert coverage(a[::-1], ref[::-1]) == pytest.approx(expected_cov, abs=FLOAT_TOL)
    assert area_ratio(a[::-1], ref[::-1]) == pytest.approx(expected_ratio, abs=FLOAT_TOL)
    # a four-primary gamut listed in a self-crossing order is still its convex hull
    quad = np.array([[0.7, 0.29], [0.17, 0.79], [0.3, 0.7], [0.13, 0.05]])
    bowtie = quad[[0, 1, 3, 2]]
    assert area_ratio(bowtie, ref) == pytest.approx(area_ratio(quad, ref), abs=FLOAT_TOL)
    assert coverage(ref, bowtie) == pytest.approx(coverage(ref, quad), abs=FLOAT_TOL)


def test_polygon_area_sign_and_degenerate_cases():
    tri = np.array([[0, 0], [1, 0], [0, 1]], dtype=float)
    assert polygon_area(tri) == 0.5
    assert polygon_area(tri[::-1]) == -0.5
    assert polygon_area(tri[:2]) == 0.0


def test_clip_convex_square_by_triangle():
    square = np.array([[0, 0], [1, 0], [1, 1], [0, 1]], dtype=float)
    tri = np.array([[0, 0], [2, 0], [0, 2]], dtype=float)  # cuts the square along x + y = 2
    assert polygon_area(clip_convex(square, tri)) == pytest.approx(1.0)
    tri = np.array([[0, 0], [1, 0], [0, 1]], dtype=float)
    assert polygon_area(clip_convex(square, tri)) == pytest.approx(0.5)
    assert clip_convex(square, tri + 5).shape == (0, 2)


def test_gamut_without_area_covers_nothing():
    ref = _xy("srgb")
    assert coverage(np.zeros((0, 2)), ref) == 0.0                 # before: 100.0
    assert coverage([[0.3, 0.3]], ref) == 0.0                      # before: 100.0
    assert coverage([[0.2, 0.2], [0.4, 0.4]], ref) == 0.0
    assert coverage([[0.2, 0.2], [0.3, 0.3], [0.4, 0.4]], ref) == 0.0
    assert area_ratio([[0.2, 0.2], [0.3, 0.3], [0.4, 0.4]], ref) == 0.0


def test_reference_without_area_or_non_finite_points_give_nan():
    good = _xy("srgb")
    assert np.isnan(coverage(good, [[0.2, 0.2], [0.3, 0.3], [0.4, 0.4]]))
    assert np.isnan(area_ratio(good, [[0.2, 0.2], [0.3, 0.3]]))
    with_nan = np.vstack([good, [np.nan, 0.3]])
    assert np.isnan(coverage(with_nan, good)) and np.isnan(coverage(good, with_nan))
    assert np.isnan(area_ratio(with_nan, good)) and np.isnan(area_ratio(good, with_nan))
    assert np.isnan(coverage(np.vstack([good, [np.inf, 0.3]]), good))


def test_convex_hull_drops_non_finite_points_and_accepts_any_leading_shape():
    pts = np.array([[[0, 0], [1, 0]], [[0, 1], [np.nan, 5]]], dtype=float)
    hull = convex_hull(pts)
    assert hull.shape == (3, 2) and polygon_area(hull) == 0.5
    assert convex_hull([[0.1, 0.1], [0.2, 0.3]]).shape == (2, 2)
