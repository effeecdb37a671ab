"""CIELAB, ΔE*ab and CIEDE2000 in generator/colour/difference.py."""
from __future__ import annotations

import itertools

import colour
import numpy as np
import pytest

from generator.colour import difference as de

# Sharma, Wu & Dalal (2005) tabulate ΔE00 to 4 decimals; the issue asks for 1e-4
SHARMA_TOL = 1e-4
# the same formulas as colour-science: agree to float precision
LIBRARY_TOL = 1e-9

# Sharma, G., Wu, W., Dalal, E. N. (2005), Color Res. Appl. 30(1):21-30, Table 1:
# (L1, a1, b1), (L2, a2, b2), ΔE00 with kL = kC = kH = 1
SHARMA_PAIRS = [
    ((50.0, 2.6772, -79.7751), (50.0, 0.0, -82.7485), 2.0425),  # pair 1
    ((50.0, 3.1571, -77.2803), (50.0, 0.0, -82.7485), 2.8615),  # pair 2
    ((50.0, 2.8361, -74.02), (50.0, 0.0, -82.7485), 3.4412),  # pair 3
    ((50.0, -1.3802, -84.2814), (50.0, 0.0, -82.7485), 1.0000),  # pair 4
    ((50.0, -1.1848, -84.8006), (50.0, 0.0, -82.7485), 1.0000),  # pair 5
    ((50.0, -0.9009, -85.5211), (50.0, 0.0, -82.7485), 1.0000),  # pair 6
    ((50.0, 0.0, 0.0), (50.0, -1.0, 2.0), 2.3669),  # pair 7
    ((50.0, -1.0, 2.0), (50.0, 0.0, 0.0), 2.3669),  # pair 8
    ((50.0, 2.49, -0.001), (50.0, -2.49, 0.0009), 7.1792),  # pair 9
    ((50.0, 2.49, -0.001), (50.0, -2.49, 0.001), 7.1792),  # pair 10
    ((50.0, 2.49, -0.001), (50.0, -2.49, 0.0011), 7.2195),  # pair 11
    ((50.0, 2.49, -0.001), (50.0, -2.49, 0.0012), 7.2195),  # pair 12
    ((50.0, -0.001, 2.49), (50.0, 0.0009, -2.49), 4.8045),  # pair 13
    ((50.0, -0.001, 2.49), (50.0, 0.001, -2.49), 4.8045),  # pair 14
    ((50.0, -0.001, 2.49), (50.0, 0.0011, -2.49), 4.7461),  # pair 15
    ((50.0, 2.5, 0.0), (50.0, 0.0, -2.5), 4.3065),  # pair 16
    ((50.0, 2.5, 0.0), (73.0, 25.0, -18.0), 27.1492),  # pair 17
    ((50.0, 2.5, 0.0), (61.0, -5.0, 29.0), 22.8977),  # pair 18
    ((50.0, 2.5, 0.0), (56.0, -27.0, -3.0), 31.9030),  # pair 19
    ((50.0, 2.5, 0.0), (58.0, 24.0, 15.0), 19.4535),  # pair 20
    ((50.0, 2.5, 0.0), (50.0, 3.1736, 0.5854), 1.0000),  # pair 21
    ((50.0, 2.5, 0.0), (50.0, 3.2972, 0.0), 1.0000),  # pair 22
    ((50.0, 2.5, 0.0), (50.0, 1.8634, 0.5757), 1.0000),  # pair 23
    ((50.0, 2.5, 0.0), (50.0, 3.2592, 0.335), 1.0000),  # pair 24
    ((60.2574, -34.0099, 36.2677), (60.4626, -34.1751, 39.4387), 1.2644),  # pair 25
    ((63.0109, -31.0961, -5.8663), (62.8187, -29.7946, -4.0864), 1.2630),  # pair 26
    ((61.2901, 3.7196, -5.3901), (61.4292, 2.248, -4.962), 1.8731),  # pair 27
    ((35.0831, -44.1164, 3.7933), (35.0232, -40.0716, 1.5901), 1.8645),  # pair 28
    ((22.7233, 20.0904, -46.694), (23.0331, 14.973, -42.5619), 2.0373),  # pair 29
    ((36.4612, 47.858, 18.3852), (36.2715, 50.5065, 21.2231), 1.4146),  # pair 30
    ((90.8027, -2.0831, 1.441), (91.1528, -1.6435, 0.0447), 1.4441),  # pair 31
    ((90.9257, -0.5406, -0.9208), (88.6381, -0.8985, -0.7239), 1.5381),  # pair 32
    ((6.7747, -0.2908, -2.4247), (5.8714, -0.0985, -2.2286), 0.6377),  # pair 33
    ((2.0776, 0.0795, -1.135), (0.9033, -0.0636, -0.5514), 0.9082),  # pair 34
]


@pytest.mark.parametrize(("lab1", "lab2", "expected"), SHARMA_PAIRS)
def test_delta_e_2000_matches_the_34_published_pairs(lab1, lab2, expected):
    assert abs(float(de.delta_e_2000(lab1, lab2)) - expected) <= SHARMA_TOL


def test_delta_e_2000_all_pairs_as_one_array():
    a = np.array([p[0] for p in SHARMA_PAIRS])
    b = np.array([p[1] for p in SHARMA_PAIRS])
    e = np.array([p[2] for p in SHARMA_PAIRS])
    got = de.delta_e_2000(a, b)
    assert got.shape == (34,)
    assert np.max(np.abs(got - e)) <= SHARMA_TOL


def test_delta_e_2000_is_symmetric_on_the_published_pairs():
    a = np.array([p[0] for p in SHARMA_PAIRS])
    b = np.array([p[1] for p in SHARMA_PAIRS])
    assert np.allclose(de.delta_e_2000(a, b), de.delta_e_2000(b, a), atol=1e-12)


def test_delta_e_2000_kL_2_agrees_with_colour_science_textiles():
    # colour-science 0.4.7 offers kL = 2 (textiles) with kC = kH = 1 [L]
    a = np.array([p[0] for p in SHARMA_PAIRS])
    b = np.array([p[1] for p in SHARMA_PAIRS])
    ref = colour.difference.delta_E_CIE2000(a, b, textiles=True)
    assert np.allclose(de.delta_e_2000(a, b, kL=2.0), ref, atol=LIBRARY_TOL)


def test_delta_e_2000_chroma_only_difference_scales_with_kC():
    # same hue angle and lightness: ΔH' = 0, so ΔE00 = |ΔC'| / (kC S_C) (Sharma eqs. 16-21)
    d1 = float(de.delta_e_2000((50, 20, 10), (50, 24, 12), kC=1.0))
    d2 = float(de.delta_e_2000((50, 20, 10), (50, 24, 12), kC=1.5))
    assert d2 == pytest.approx(d1 / 1.5, rel=1e-12)
    assert d1 > 0


def test_delta_e_2000_hue_only_difference_scales_with_kH():
    # mirror images about the a* axis have equal C' (a' scales a* alike), so ΔC' = 0 and
    # ΔE00 = |ΔH'| / (kH S_H) (Sharma eqs. 16-21)
    lab1 = (50, 20.0, 3.0)
    lab2 = (50, 20.0, -3.0)
    d1 = float(de.delta_e_2000(lab1, lab2, kH=1.0))
    d2 = float(de.delta_e_2000(lab1, lab2, kH=0.5))
    assert d2 == pytest.approx(2 * d1, rel=1e-9)
    assert d1 > 0


def test_delta_e_2000_lightness_only_difference_scales_with_kL():
    # with equal a*, b*: ΔE00 = |ΔL| / (kL S_L) exactly (Sharma eqs. 16-21)
    got1 = float(de.delta_e_2000((50, 10, 10), (52, 10, 10), kL=1))
    got2 = float(de.delta_e_2000((50, 10, 10), (52, 10, 10), kL=2))
    SL = 1 + 0.015 * 1 / np.sqrt(20 + 1)
    assert got1 == pytest.approx(2 / SL, abs=1e-12)
    assert got2 == pytest.approx(1 / SL, abs=1e-12)


def test_delta_e_2000_random_colours_agree_with_colour_science():
    rng = np.random.default_rng(7)
    a = np.column_stack([rng.uniform(0, 100, 500), rng.uniform(-120, 120, 500), rng.uniform(-120, 120, 500)])
    b = a + rng.normal(0, 8, a.shape)
    assert np.allclose(de.delta_e_2000(a, b), colour.difference.delta_E_CIE2000(a, b), atol=LIBRARY_TOL)


def test_delta_e_76_is_euclidean_distance():
    # CIE 15:2004 eq. 8.10; 3-4-12 gives exactly 13
    assert float(de.delta_e_76((50, 0, 0), (53, 4, 12))) == 13.0


def test_delta_e_keeps_leading_shape():
    a = np.zeros((2, 3, 3)) + (50, 2.5, 0)
    b = np.zeros((2, 3, 3)) + (50, 0, -2.5)
    assert de.delta_e_2000(a, b).shape == (2, 3)
    assert de.delta_e_76(a, b).shape == (2, 3)
    assert np.allclose(de.delta_e_2000(a, b), 4.3065, atol=SHARMA_TOL)  # Sharma pair 16


def test_delta_e_nan_in_gives_nan_out_without_warnings():
    import warnings

    with warnings.catch_warnings():
        warnings.simplefilter("error")
        got = de.delta_e_2000([[np.nan, 0, 0], [50, 0, 0]], [[50, 0, 0], [50, np.inf, 0]])
        assert np.isnan(got[0])
        assert not np.isfinite(got[1])
        assert np.isnan(de.delta_e_76([np.nan, 0, 0], [50, 0, 0]))


def test_delta_e_2000_identical_colours_give_zero_including_grey():
    assert float(de.delta_e_2000((50, 0, 0), (50, 0, 0))) == 0.0
    assert float(de.delta_e_2000((40, -20, 30), (40, -20, 30))) == 0.0


def test_delta_e_refuses_a_wrong_last_axis():
    with pytest.raises(ValueError, match="last axis must have length 3"):
        de.delta_e_2000([50, 0], [50, 0])


# D65 white of ISO 11664-4 / CIE 15:2004 Table T.3, XYZ with Y = 100 [L colour-science]
D65_XYZ = (95.047, 100.0, 108.883)


def test_XYZ_to_Lab_of_the_white_is_100_0_0():
    assert np.allclose(de.XYZ_to_Lab(D65_XYZ, D65_XYZ), (100, 0, 0), atol=1e-12)


def test_XYZ_to_Lab_agrees_with_colour_science_on_both_branches():
    rng = np.random.default_rng(3)
    XYZ = rng.uniform(0, 1.1, (400, 3))
    XYZ[:50] *= 0.005   # below (6/29)^3: the linear branch
    w = np.array(D65_XYZ) / 100
    ref = colour.XYZ_to_Lab(XYZ, colour.XYZ_to_xy(w))
    assert np.allclose(de.XYZ_to_Lab(XYZ, w), ref, atol=1e-9)


def test_XYZ_to_Lab_known_value():
    # independent computation (CIE 15:2004 eq. 8.4): XYZ (0.2, 0.3, 0.4) under D65 (Y = 1)
    got = de.XYZ_to_Lab((0.2, 0.3, 0.4), np.array(D65_XYZ) / 100)
    fx, fy, fz = np.cbrt(0.2 / 0.95047), np.cbrt(0.3), np.cbrt(0.4 / 1.08883)
    assert np.allclose(got, (116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)), atol=1e-12)


def test_Lab_to_XYZ_inverts_XYZ_to_Lab_with_shape():
    rng = np.random.default_rng(5)
    XYZ = rng.uniform(0, 1, (4, 5, 3))
    w = np.array(D65_XYZ) / 100
    back = de.Lab_to_XYZ(de.XYZ_to_Lab(XYZ, w), w)
    assert back.shape == (4, 5, 3)
    assert np.allclose(back, XYZ, atol=1e-12)


def test_XYZ_to_Lab_nan_and_zero_white_give_nan():
    import warnings

    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert np.isnan(de.XYZ_to_Lab((np.nan, 0.3, 0.3), D65_XYZ)[1])  # a* needs X; L* and b* do not
        assert np.all(np.isnan(de.XYZ_to_Lab((0.2, 0.3, 0.3), (0.0, 0.0, 0.0))))


def test_delta_e_2000_on_hue_branch_edges_agrees_with_colour_science():
    # hues exactly 0°, 90°, 180°, 270° apart and zero chroma: the branches of Sharma eq. 10 and 14
    axis = [(50.0, 0.0, 0.0), (50.0, 10.0, 0.0), (50.0, -10.0, 0.0), (50.0, 0.0, 10.0), (50.0, 0.0, -10.0),
            (60.0, 3.0, -3.0), (40.0, -3.0, 3.0), (50.0, 1e-9, 0.0), (50.0, -1e-9, -0.0)]
    lab1, lab2 = (np.array(p) for p in zip(*itertools.product(axis, axis), strict=True))
    ref = colour.delta_E(lab1, lab2, method="CIE 2000")     # [L] the same formulas in degrees
    np.testing.assert_allclose(de.delta_e_2000(lab1, lab2), ref, rtol=0, atol=LIBRARY_TOL)
