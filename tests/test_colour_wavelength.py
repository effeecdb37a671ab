"""Dominant / complementary wavelength, purity and the locus boundary in
generator/colour/wavelength.py."""
from __future__ import annotations

import colour
import numpy as np
import pytest

from generator.colour.gamut import polygon_area
from generator.colour.wavelength import dominant_wavelength, locus_boundary, outside_locus_distance

D65 = np.array([0.3127, 0.3290])
# locus points are quoted to 5 decimals; near 480-620 nm the locus moves >= 1e-3 per nm,
# so the rounding shifts the wavelength by < 0.01 nm
LOCUS_POINT_NM_TOL = 0.01
# colour-science returns the wavelength of the nearest 1 nm sample
LIBRARY_NM_TOL = 0.5 + 1e-9
# colour-science's purity: same definition, hit point found on its own locus segments
LIBRARY_PURITY_TOL = 1e-6
ROUNDING_5DP = 5e-6 + 1e-12
_CMFS = colour.MSDS_CMFS["CIE 1931 2 Degree Standard Observer"]


@pytest.mark.parametrize(
    ("nm", "xy"),
    [
        # independent computation: spectral locus, CIE 1931 1 nm table (check values §6)
        (480, (0.09129, 0.13270)),
        (500, (0.00817, 0.53842)),
        (520, (0.07430, 0.83380)),
        (555, (0.33736, 0.65885)),
        (580, (0.51249, 0.48659)),
        (600, (0.62704, 0.37249)),
        (620, (0.69150, 0.30834)),
    ],
)
def test_points_on_and_inside_the_locus(nm, xy):
    xy = np.array(xy)
    dom, comp, purity = dominant_wavelength(np.stack([xy, (xy + D65) / 2]), D65)
    np.testing.assert_allclose(dom, nm, rtol=0, atol=LOCUS_POINT_NM_TOL)
    assert np.all(np.isnan(comp))
    # purity 1 on the locus, 1/2 half-way from the white (rounding of xy: ~1e-4 relative)
    np.testing.assert_allclose(purity, [1.0, 0.5], rtol=2e-4)


@pytest.mark.parametrize("nm", [480, 500, 520, 555, 580, 600, 620])
def test_inverse_ray_of_a_purple_gives_the_complementary(nm):
    # a point on the far side of the white from a locus point: its ray meets the purple
    # line only when the locus point is a green (500-570 nm); otherwise it is a spectral hue
    p = D65 - 0.3 * (colour.XYZ_to_xy(_CMFS[nm]) - D65)
    dom, comp, purity = dominant_wavelength(p, D65)
    if 495 <= nm <= 565:
        assert np.isnan(dom)
        assert comp == pytest.approx(nm, abs=LOCUS_POINT_NM_TOL)
        assert 0 < purity < 1
    else:
        assert np.isnan(comp) and np.isfinite(dom)


def test_against_colour_science():
    pts = np.array([[0.64, 0.33], [0.30, 0.60], [0.15, 0.06], [0.708, 0.292], [0.17, 0.797],
                    [0.131, 0.046], [0.5, 0.4], [0.25, 0.3], [0.6, 0.3], [0.4, 0.2], [0.35, 0.15],
                    [0.73, 0.265], [0.2, 0.5], [0.45, 0.41]])
    dom, comp, purity = dominant_wavelength(pts, D65)
    for p, d, c, e in zip(pts, dom, comp, purity, strict=True):
        ref_wl, _, _ = colour.dominant_wavelength(p, D65, _CMFS)
        if ref_wl < 0:   # colour-science marks a complementary wavelength with a minus sign
            assert np.isnan(d)
            assert c == pytest.approx(-ref_wl, abs=LIBRARY_NM_TOL)
        else:
            assert np.isnan(c)
            assert d == pytest.approx(ref_wl, abs=LIBRARY_NM_TOL)
        assert e == pytest.approx(colour.excitation_purity(p, D65, _CMFS), abs=LIBRARY_PURITY_TOL)


def test_other_white_and_10_degree_observer():
    # a saturated red relative to illuminant A and to D65 differs; 10° uses its own locus
    red = np.array([0.64, 0.33])
    d_a = dominant_wavelength(red, (0.44757, 0.40745))[0]
    d_65 = dominant_wavelength(red, D65)[0]
    assert d_a != pytest.approx(d_65, abs=1.0)
    ref = colour.dominant_wavelength(red, np.array([0.44757, 0.40745]), _CMFS)[0]
    assert d_a == pytest.approx(ref, abs=LIBRARY_NM_TOL)
    cmfs10 = colour.MSDS_CMFS["CIE 1964 10 Degree Standard Observer"]
    d10 = dominant_wavelength(red, D65, "cie1964-10")[0]
    assert d10 == pytest.approx(colour.dominant_wavelength(red, D65, cmfs10)[0], abs=LIBRARY_NM_TOL)


def test_locus_boundary_is_the_hull_of_the_locus():
    hull, wl, xy = locus_boundary()
    # independent computation: hull of the CIE 1931 1 nm locus has area 0.334348
    assert polygon_area(hull) == pytest.approx(0.334348, abs=5e-7)
    assert wl[0] == 360 and wl[-1] == 830 and np.all(np.diff(wl) > 0)
    assert xy.shape == (wl.size, 2)


def test_outside_locus_distance():
    # check values §8a: R48 red corner (0.735, 0.265) sits up to about 1e-3 outside the hull
    d = outside_locus_distance([[0.735, 0.265], [0.3127, 0.3290], [0.8, 0.8]])
    assert 0 < d[0] < 1e-3
    assert d[1] == 0.0
    # (0.8, 0.8) lies beyond x + y = 1, at least that line's distance from it
    assert d[2] >= 0.6 / np.sqrt(2) - 1e-12
    assert outside_locus_distance([0.3127, 0.3290]).shape == ()


def test_n_dimensional_points():
    pts = np.array([[[0.64, 0.33], [0.30, 0.60], [0.15, 0.06]], [[0.4, 0.2], [0.5, 0.4], [0.25, 0.3]]])
    dom, comp, purity = dominant_wavelength(pts, D65)
    assert dom.shape == comp.shape == purity.shape == (2, 3)
    flat = [dominant_wavelength(p, D65) for p in pts.reshape(-1, 2)]
    np.testing.assert_array_equal(dom.ravel(), [f[0] for f in flat])
    np.testing.assert_array_equal(comp.ravel(), [f[1] for f in flat])
    assert dominant_wavelength(pts[0, 0], D65)[0].shape == ()
    assert outside_locus_distance(pts).shape == (2, 3)


def test_white_nan_and_inf_points_give_nan():
    pts = np.array([D65, [np.nan, 0.3], [0.3, np.inf], [0.64, 0.33]])
    dom, comp, purity = dominant_wavelength(pts, D65)
    assert np.all(np.isnan(dom[:3])) and np.all(np.isnan(comp[:3])) and np.all(np.isnan(purity[:3]))
    assert np.isfinite(dom[3]) and np.isfinite(purity[3])
    dom, comp, purity = dominant_wavelength([0.64, 0.33], (np.nan, np.nan))
    assert np.isnan(dom) and np.isnan(comp) and np.isnan(purity)
    assert np.isnan(outside_locus_distance([np.nan, 0.3]))


def test_points_outside_the_locus_have_purity_above_1():
    # BT.2020 green (0.170, 0.797) lies just outside the 1 nm locus
    _, _, purity = dominant_wavelength([0.170, 0.797], D65)
    assert purity > 1.0
    assert outside_locus_distance([0.170, 0.797]) > 0
