"""XYZ / xy / u'v' / CIE 1960 uv conversions in generator/colour/convert.py."""
from __future__ import annotations

import colour
import numpy as np
import pytest

from generator.colour import convert as cv

# check values are quoted to 5 decimals: half a unit in the 5th decimal
ROUNDING_5DP = 5e-6 + 1e-12
# xy recomputed from 5-decimal u'v' carries the rounding times the map's gain (up to
# about 3.5 near the green corner of BT.2020)
XY_FROM_ROUNDED_UV_TOL = 2e-5
# against colour-science the formulas are the same algebra: agree to float precision
LIBRARY_TOL = 1e-12

D65 = (0.3127, 0.3290)


@pytest.mark.parametrize(
    ("xy", "uv_prime"),
    [
        # independent computation (CIE 15 eq. 8.2): D65 4-dp
        (D65, (0.19783, 0.46832)),
        # independent computation: D50 5-dp
        ((0.34567, 0.35850), (0.20916, 0.48808)),
        # independent computation: illuminant A
        ((0.44757, 0.40745), (0.25596, 0.52429)),
        # independent computation: DCI white
        ((0.314, 0.351), (0.19077, 0.47980)),
        # equal-energy white: exactly 4/19, 9/19
        ((1 / 3, 1 / 3), (4 / 19, 9 / 19)),
        # independent computation: BT.709 R, G, B
        ((0.640, 0.330), (0.45070, 0.52289)),
        ((0.300, 0.600), (0.12500, 0.56250)),
        ((0.150, 0.060), (0.17544, 0.15789)),
        # independent computation: BT.2020 R, G, B
        ((0.708, 0.292), (0.55660, 0.51651)),
        ((0.170, 0.797), (0.05563, 0.58680)),
        ((0.131, 0.046), (0.15927, 0.12584)),
        # independent computation: Adobe RGB G; NTSC R and B
        ((0.21, 0.71), (0.07568, 0.57568)),
        ((0.67, 0.33), (0.47687, 0.52847)),
        ((0.14, 0.08), (0.15217, 0.19565)),
    ],
)
def test_xy_to_uv_prime_check_values(xy, uv_prime):
    np.testing.assert_allclose(cv.xy_to_uv_prime(xy), uv_prime, rtol=0, atol=ROUNDING_5DP)
    np.testing.assert_allclose(cv.uv_prime_to_xy(uv_prime), xy, rtol=0, atol=XY_FROM_ROUNDED_UV_TOL)


def test_d65_cie1960_uv():
    # independent computation: D65 4-dp in CIE 1960 UCS, v = 2/3 v'
    np.testing.assert_allclose(cv.xy_to_uv1960(D65), (0.19783, 0.31221), rtol=0, atol=ROUNDING_5DP)


def test_d65_4dp_xy_gives_z_108_906_not_108_883():
    # trap (check values §12.1): the 4-dp xy gives Z = 108.906 (independent computation);
    # 108.883 belongs to the spectral D65
    XYZ = cv.xy_to_XYZ(D65, 100.0)
    np.testing.assert_allclose(XYZ, (95.046, 100.0, 108.906), rtol=0, atol=5e-4)
    assert abs(XYZ[2] - 108.883) > 0.02


def test_xyz_to_xy_and_uv_prime_by_hand():
    XYZ = np.array([2.0, 3.0, 5.0])
    np.testing.assert_allclose(cv.XYZ_to_xy(XYZ), (0.2, 0.3), rtol=0, atol=1e-15)
    # u' = 4X/(X+15Y+3Z) = 8/62, v' = 9Y/(X+15Y+3Z) = 27/62
    np.testing.assert_allclose(cv.XYZ_to_uv_prime(XYZ), (8 / 62, 27 / 62), rtol=0, atol=1e-15)


def test_delta_uv_prime_is_euclidean():
    assert cv.delta_uv_prime([0.1, 0.2], [0.13, 0.24]) == pytest.approx(0.05, abs=1e-15)


@pytest.fixture(scope="module")
def random_xy():
    rng = np.random.default_rng(1931)
    x = rng.uniform(0.05, 0.7, (4, 5))
    y = rng.uniform(0.05, 0.8, (4, 5)) * (1 - x)
    return np.stack([x, y], axis=-1)


def test_against_colour_science(random_xy):
    xy = random_xy
    Y = np.linspace(0.1, 100, 20).reshape(4, 5)
    XYZ = cv.xy_to_XYZ(xy, Y)
    xyY = np.concatenate([xy, Y[..., None]], axis=-1)
    np.testing.assert_allclose(XYZ, colour.xyY_to_XYZ(xyY), rtol=LIBRARY_TOL, atol=LIBRARY_TOL)
    np.testing.assert_allclose(cv.XYZ_to_xy(XYZ), colour.XYZ_to_xy(XYZ), rtol=0, atol=LIBRARY_TOL)
    np.testing.assert_allclose(cv.xy_to_uv_prime(xy), colour.xy_to_Luv_uv(xy), rtol=0, atol=LIBRARY_TOL)
    np.testing.assert_allclose(cv.XYZ_to_uv_prime(XYZ), colour.xy_to_Luv_uv(xy), rtol=0, atol=LIBRARY_TOL)
    np.testing.assert_allclose(cv.xy_to_uv1960(xy), colour.xy_to_UCS_uv(xy), rtol=0, atol=LIBRARY_TOL)
    uvp = colour.xy_to_Luv_uv(xy)
    np.testing.assert_allclose(cv.uv_prime_to_xy(uvp), colour.Luv_uv_to_xy(uvp), rtol=0, atol=LIBRARY_TOL)
    uv = colour.xy_to_UCS_uv(xy)
    np.testing.assert_allclose(cv.uv1960_to_xy(uv), colour.UCS_uv_to_xy(uv), rtol=0, atol=LIBRARY_TOL)


def test_round_trips(random_xy):
    xy = random_xy
    np.testing.assert_allclose(cv.uv_prime_to_xy(cv.xy_to_uv_prime(xy)), xy, rtol=0, atol=1e-14)
    np.testing.assert_allclose(cv.uv1960_to_xy(cv.xy_to_uv1960(xy)), xy, rtol=0, atol=1e-14)
    uv = cv.xy_to_uv1960(xy)
    np.testing.assert_allclose(cv.uv_prime_to_uv1960(cv.uv1960_to_uv_prime(uv)), uv, rtol=0, atol=1e-15)
    np.testing.assert_allclose(cv.XYZ_to_xy(cv.xy_to_XYZ(xy, 7.0)), xy, rtol=0, atol=1e-14)


@pytest.mark.parametrize(
    ("func", "n_in", "n_out"),
    [
        (cv.XYZ_to_xy, 3, 2), (cv.xyY_to_XYZ, 3, 3), (cv.xy_to_XYZ, 2, 3),
        (cv.xy_to_uv_prime, 2, 2), (cv.uv_prime_to_xy, 2, 2), (cv.XYZ_to_uv_prime, 3, 2),
        (cv.uv_prime_to_uv1960, 2, 2), (cv.uv1960_to_uv_prime, 2, 2),
        (cv.xy_to_uv1960, 2, 2), (cv.uv1960_to_xy, 2, 2),
    ],
)
def test_n_dimensional_input_keeps_leading_shape_and_matches_row_by_row(func, n_in, n_out):
    rng = np.random.default_rng(7)
    a = rng.uniform(0.1, 0.4, (2, 3, 4, n_in))
    out = func(a)
    assert out.shape == (2, 3, 4, n_out)
    flat = np.array([func(row) for row in a.reshape(-1, n_in)])
    np.testing.assert_array_equal(out.reshape(-1, n_out), flat)
    assert func(a[0, 0, 0]).shape == (n_out,)


@pytest.mark.parametrize(
    ("func", "n_in"),
    [(cv.XYZ_to_xy, 3), (cv.xy_to_uv_prime, 2), (cv.uv_prime_to_xy, 2), (cv.XYZ_to_uv_prime, 3),
     (cv.xy_to_XYZ, 2), (cv.xy_to_uv1960, 2), (cv.uv1960_to_xy, 2)],
)
def test_nan_row_gives_nan_and_leaves_other_rows_alone(func, n_in):
    good = np.full(n_in, 0.3)
    a = np.stack([good, np.full(n_in, np.nan), good])
    out = func(a)
    if func is cv.xy_to_XYZ:
        # Y is an input of its own and passes through; X and Z need the chromaticity
        assert np.isnan(out[1, 0]) and np.isnan(out[1, 2]) and out[1, 1] == 1.0
    else:
        assert np.all(np.isnan(out[1]))
    np.testing.assert_array_equal(out[0], func(good))
    np.testing.assert_array_equal(out[2], func(good))


def test_zero_denominators_give_nan_not_inf():
    # black has no chromaticity; y = 0 has no XYZ; the u'v' denominators can vanish
    assert np.all(np.isnan(cv.XYZ_to_xy([0.0, 0.0, 0.0])))
    assert np.all(np.isnan(cv.XYZ_to_xy([1.0, -1.0, 0.0])))
    out = cv.xy_to_XYZ([0.3, 0.0])
    assert np.isnan(out[0]) and np.isnan(out[2])
    assert np.all(np.isnan(cv.xy_to_uv_prime([1.5, 0.0])))      # -2x + 12y + 3 = 0
    assert np.all(np.isnan(cv.uv_prime_to_xy([0.0, 0.75])))     # 6u' - 16v' + 12 = 0
    assert np.all(np.isnan(cv.XYZ_to_uv_prime([0.0, 0.0, 0.0])))


def test_infinite_input_does_not_raise():
    out = cv.XYZ_to_xy([np.inf, 1.0, 1.0])
    assert np.isnan(out[0])
    out = cv.xy_to_uv_prime([np.inf, 0.3])
    assert np.isnan(out[0])


@pytest.mark.parametrize(
    ("func", "arg", "message"),
    [
        (cv.XYZ_to_xy, [0.3, 0.3], "last axis must have length 3, got shape (2,)"),
        (cv.xy_to_uv_prime, [[0.3, 0.3, 0.3]], "last axis must have length 2, got shape (1, 3)"),
        (cv.delta_uv_prime, [0.1], "last axis must have length 2, got shape (1,)"),
    ],
)
def test_wrong_last_axis_is_an_error(func, arg, message):
    args = (arg, [0.1, 0.2]) if func is cv.delta_uv_prime else (arg,)
    with pytest.raises(ValueError) as err:
        func(*args)
    assert str(err.value) == message
