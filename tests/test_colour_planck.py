"""The Planckian locus in generator/colour/planck.py."""
from __future__ import annotations

import colour
import numpy as np
import pytest

from generator.colour.planck import C2, planck_uv, planck_xy

# locus check points are quoted to 5 decimals
ROUNDING_5DP = 5e-6 + 1e-12
# the same sum done with colour-science's Planck law and CMF copy (tables agree to 5e-7)
LIBRARY_TOL = 1e-7
# central differences, h = 1e-4 T for the first derivative (truncation ~1e-8 relative)
DERIVATIVE_RTOL = 1e-5
# second differences with h = 1e-3 T: truncation and cancellation both stay below ~1e-5
SECOND_DERIVATIVE_TOL = 5e-5


@pytest.mark.parametrize(
    ("T", "xy", "uv"),
    [
        # independent computation (c2 = 1.4388e-2, CIE 1931 at 1 nm, 360-830 nm)
        (1000, (0.65275, 0.34446), (0.44801, 0.35462)),
        (2000, (0.52668, 0.41330), (0.30505, 0.35907)),
        (2700, (0.45986, 0.41060), (0.26250, 0.35157)),
        (3000, (0.43693, 0.40408), (0.25057, 0.34759)),
        (4000, (0.38044, 0.37675), (0.22511, 0.33439)),
        (5000, (0.34510, 0.35161), (0.21142, 0.32312)),
        (6500, (0.31353, 0.32363), (0.20045, 0.31036)),
        (10000, (0.28063, 0.28829), (0.19032, 0.29326)),
        (20000, (0.25646, 0.25763), (0.18388, 0.27709)),
    ],
)
def test_planckian_locus_check_points(T, xy, uv):
    np.testing.assert_allclose(planck_xy(T), xy, rtol=0, atol=ROUNDING_5DP)
    np.testing.assert_allclose(planck_uv(T), uv, rtol=0, atol=ROUNDING_5DP)


def test_second_radiation_constant():
    # CIE 15:2004 / ITS-90: c2 = 1.4388e-2 m·K
    assert C2 == 1.4388e-2


def test_illuminant_a_is_planck_at_2848_k_with_the_old_c2():
    # Illuminant A: Planckian radiator at 2848 K with c2 = 1.435e-2 (from memory, not
    # confirmed), i.e. T = 2848 × 1.4388/1.435 with today's c2; its xy, 0.44757, 0.40745,
    # is the published 5-dp form; 2e-5 allows for the summation scheme (check values §1b)
    T = 2848 * 1.4388e-2 / 1.435e-2
    np.testing.assert_allclose(planck_xy(T), (0.44757, 0.40745), rtol=0, atol=2e-5)


def test_against_colour_science_planck_law():
    cmfs = colour.MSDS_CMFS["CIE 1931 2 Degree Standard Observer"]
    lam = cmfs.wavelengths * 1e-9
    T = np.geomspace(600, 5e5, 40)
    M = np.array([colour.colorimetry.planck_law(lam, t, c2=C2) for t in T])
    X, Y, Z = (M @ cmfs.values).T
    D = X + 15 * Y + 3 * Z
    np.testing.assert_allclose(planck_uv(T), np.stack([4 * X / D, 6 * Y / D], -1), rtol=0, atol=LIBRARY_TOL)


def test_derivatives_match_central_differences():
    T = np.geomspace(600, 5e5, 30)
    uv, d1, d2 = planck_uv(T, derivatives=True)
    np.testing.assert_array_equal(uv, planck_uv(T))
    h = 1e-4 * T
    up, um = planck_uv(T + h), planck_uv(T - h)
    fd1 = (up - um) / (2 * h[:, None])
    h2 = 1e-3 * T
    fd2 = (planck_uv(T + h2) - 2 * uv + planck_uv(T - h2)) / (h2[:, None] ** 2)
    np.testing.assert_allclose(d1, fd1, rtol=DERIVATIVE_RTOL, atol=0)
    # a component of d² can cross zero: compare each row relative to its larger component
    scale = np.abs(d2).max(axis=-1, keepdims=True)
    assert np.all(np.abs(d2 - fd2) <= SECOND_DERIVATIVE_TOL * scale)
    # u falls as T rises everywhere on this range
    assert np.all(d1[:, 0] < 0)


def test_n_dimensional_temperatures():
    T = np.array([[1000.0, 2000.0, 3000.0], [4000.0, 6500.0, 20000.0]])
    uv = planck_uv(T)
    assert uv.shape == (2, 3, 2)
    np.testing.assert_allclose(uv.reshape(-1, 2), np.array([planck_uv(t) for t in T.ravel()]), rtol=1e-14)
    uv, d1, d2 = planck_uv(T, derivatives=True)
    assert d1.shape == d2.shape == (2, 3, 2)
    assert planck_uv(6500.0).shape == (2,)
    assert planck_xy(T).shape == (2, 3, 2)


def test_non_physical_temperatures_give_nan_without_warnings():
    T = np.array([0.0, -100.0, np.nan, np.inf, -np.inf, 1.0, 6500.0])
    uv = planck_uv(T)
    assert np.all(np.isnan(uv[:6]))
    assert np.all(np.isfinite(uv[6]))
    uv, d1, d2 = planck_uv(T, derivatives=True)
    assert np.all(np.isnan(d1[:6])) and np.all(np.isnan(d2[:6]))
    assert np.all(np.isfinite(d1[6])) and np.all(np.isfinite(d2[6]))
    assert np.all(np.isnan(planck_xy([0.0, np.nan])))


def test_very_high_temperature_tends_to_the_rayleigh_jeans_limit():
    # as T -> inf, M ∝ λ⁻⁴: the locus ends at the chromaticity of Σ λ⁻⁴ · CMF
    cmfs = colour.MSDS_CMFS["CIE 1931 2 Degree Standard Observer"]
    X, Y, Z = (cmfs.wavelengths ** -4.0) @ cmfs.values
    limit = (4 * X / (X + 15 * Y + 3 * Z), 6 * Y / (X + 15 * Y + 3 * Z))
    np.testing.assert_allclose(planck_uv(1e9), limit, rtol=0, atol=1e-6)
