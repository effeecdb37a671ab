"""Sprague and cubic-spline interpolation in generator/colour/interpolation.py."""
from __future__ import annotations

import colour
import numpy as np
import pytest
from scipy.interpolate import CubicSpline

from generator.colour.interpolation import cubic_spline, sprague

# the same arithmetic as the independent implementations: agree to float precision
LIBRARY_TOL = 1e-12

X5 = np.arange(380.0, 781.0, 5.0)
X1 = np.arange(380.0, 781.0, 1.0)


def _smooth(x):
    return np.exp(-(((x - 550) / 40) ** 2)) + 0.3 * np.sin(x / 17)


def test_sprague_agrees_with_colour_science():
    v = _smooth(X5)
    ref = colour.SpragueInterpolator(X5, v)(X1)   # [L] CIE 167:2005 Sprague
    assert np.max(np.abs(sprague(X5, v, X1) - ref)) <= LIBRARY_TOL


def test_sprague_passes_through_the_samples_and_reproduces_a_quintic():
    v = _smooth(X5)
    assert np.allclose(sprague(X5, v, X5), v, atol=1e-12)
    t = (X5 - 580) / 200
    poly = lambda t: 1 + t - 2 * t**2 + 0.5 * t**3  # noqa: E731  (inside the interior, Sprague is exact to 5th order)
    got = sprague(X5, poly(t), X1)
    inner = (X1 > 400) & (X1 < 760)
    assert np.allclose(got[inner], poly((X1[inner] - 580) / 200), atol=1e-9)


def test_sprague_keeps_leading_shape_and_gives_nan_outside():
    v = np.stack([_smooth(X5), 2 * _smooth(X5)])[None]   # (1, 2, n)
    got = sprague(X5, v, np.array([379.0, 500.0, 781.0]))
    assert got.shape == (1, 2, 3)
    assert np.isnan(got[..., 0]).all() and np.isnan(got[..., 2]).all()
    assert got[0, 1, 1] == pytest.approx(2 * got[0, 0, 1])


def test_sprague_nan_sample_spreads_only_nearby():
    v = _smooth(X5)
    v[40] = np.nan                       # 580 nm
    got = sprague(X5, v, X1)
    assert np.isnan(got[(X1 > 565) & (X1 < 595)]).all()
    assert np.isfinite(got[X1 < 560]).all()


def test_sprague_needs_six_samples():
    with pytest.raises(ValueError, match="at least 6 samples"):
        sprague([1, 2, 3, 4, 5], [1, 2, 3, 4, 5], [2.5])


XI = np.array([380, 384, 391, 400, 412, 430, 455, 470, 500, 530, 545, 600, 650, 700, 780.0])


def test_cubic_spline_agrees_with_scipy_natural_spline():
    v = np.exp(-(((XI - 550) / 60) ** 2))
    ref = CubicSpline(XI, v, bc_type="natural")(X1)   # scipy, test-only reference
    assert np.max(np.abs(cubic_spline(XI, v, X1) - ref)) <= LIBRARY_TOL


def test_cubic_spline_keeps_leading_shape_and_gives_nan_outside():
    v = np.exp(-(((XI - 550) / 60) ** 2))
    got = cubic_spline(XI, np.stack([v, 3 * v]), np.array([300.0, 500.0]))
    assert got.shape == (2, 2)
    assert np.isnan(got[:, 0]).all()
    assert got[1, 1] == pytest.approx(3 * got[0, 1])


def test_cubic_spline_refuses_unsorted_wavelengths():
    with pytest.raises(ValueError, match="strictly increasing"):
        cubic_spline([1, 3, 2], [0, 1, 2], [1.5])
