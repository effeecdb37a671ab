"""Interpolation of spectral data to a finer interval, as CIE 167:2005 recommends:
Sprague (1880) fifth-order interpolation for uniformly spaced data, a cubic spline for
irregularly spaced data.

Sprague coefficients and the two extrapolated points at each end: CIE 167:2005 §4
(as tabulated by Westland, Ripamonti & Cheung, Computational Colour Science, 2nd ed., §3.5).
Arrays in, arrays out: the last axis of ``values`` runs along the wavelengths.
"""
from __future__ import annotations

import numpy as np

# CIE 167:2005: two points before the start and after the end, from the first / last six
_BEFORE = np.array([[884, -1960, 3033, -2648, 1080, -180],
                    [508, -540, 488, -367, 144, -24]], dtype=float) / 209.0
_AFTER = np.array([[-24, 144, -367, 488, -540, 508],
                   [-180, 1080, -2648, 3033, -1960, 884]], dtype=float) / 209.0
# Sprague (1880): polynomial coefficients a1..a5 from r[i-2] .. r[i+3], each over 24
_SPRAGUE = np.array([[2, -16, 0, 16, -2, 0],
                     [-1, 16, -30, 16, -1, 0],
                     [-9, 39, -70, 66, -33, 7],
                     [13, -64, 126, -124, 61, -12],
                     [-5, 25, -50, 50, -25, 5]], dtype=float) / 24.0

SPRAGUE_MIN_POINTS = 6


def sprague(x, values, x_new):
    """Sprague (1880) interpolation of uniformly spaced samples ``values`` at ``x`` (at least
    six points) to ``x_new`` inside [x[0], x[-1]]; NaN outside."""
    x = np.asarray(x, dtype=float)
    v = np.asarray(values, dtype=float)
    x_new = np.asarray(x_new, dtype=float)
    if x.ndim != 1 or len(x) < SPRAGUE_MIN_POINTS or v.shape[-1] != len(x):
        raise ValueError(f"Sprague interpolation needs at least {SPRAGUE_MIN_POINTS} samples along the last axis")
    step = x[1] - x[0]
    # CIE 167:2005: extend by two extrapolated points at each end
    before = v[..., :6] @ _BEFORE.T            # r[-2], r[-1]
    after = v[..., -6:] @ _AFTER.T             # r[n+1], r[n+2]
    r = np.concatenate([before, v, after], axis=-1)  # index shift of 2
    t = (x_new - x[0]) / step
    i = np.clip(np.floor(t).astype(int), 0, len(x) - 2)
    X = t - i
    idx = i[:, None] + np.arange(6)[None, :]    # r[i-2] .. r[i+3] in shifted indices
    window = r[..., idx]                       # (..., m, 6)
    a = window @ _SPRAGUE.T                    # (..., m, 5)
    a0 = r[..., i + 2]
    # Sprague (1880): r(X) = a0 + a1 X + a2 X^2 + a3 X^3 + a4 X^4 + a5 X^5
    out = a0 + sum(a[..., k] * X ** (k + 1) for k in range(5))
    inside = (x_new >= x[0] - 1e-9) & (x_new <= x[-1] + 1e-9)
    return np.where(inside, out, np.nan)


def cubic_spline(x, values, x_new):
    """Natural cubic spline through (x, values) for irregular spacing (at least 3 points,
    x strictly increasing), evaluated at ``x_new`` inside [x[0], x[-1]]; NaN outside."""
    x = np.asarray(x, dtype=float)
    v = np.asarray(values, dtype=float)
    x_new = np.asarray(x_new, dtype=float)
    n = len(x)
    if n < 3 or v.shape[-1] != n or np.any(np.diff(x) <= 0):
        raise ValueError("cubic spline needs three or more strictly increasing samples")
    h = np.diff(x)
    # natural spline: second derivatives M with M0 = Mn = 0 from the tridiagonal system
    A = np.zeros((n, n))
    A[0, 0] = A[-1, -1] = 1.0
    k = np.arange(1, n - 1)
    A[k, k - 1], A[k, k], A[k, k + 1] = h[:-1], 2 * (h[:-1] + h[1:]), h[1:]
    d = np.diff(v, axis=-1) / h
    rhs = np.zeros(v.shape)
    rhs[..., 1:-1] = 6 * (d[..., 1:] - d[..., :-1])
    M = np.linalg.solve(A, rhs[..., None] if rhs.ndim == 1 else np.moveaxis(rhs, -1, 0).reshape(n, -1))
    M = M[:, 0] if rhs.ndim == 1 else np.moveaxis(M.reshape((n,) + rhs.shape[:-1]), 0, -1)
    j = np.clip(np.searchsorted(x, x_new, side="right") - 1, 0, n - 2)
    t0, t1 = x_new - x[j], x[j + 1] - x_new
    hj = h[j]
    # cubic spline on [x_j, x_j+1] from the second derivatives M_j, M_j+1
    out = (M[..., j] * t1 ** 3 + M[..., j + 1] * t0 ** 3) / (6 * hj) \
        + (v[..., j] / hj - M[..., j] * hj / 6) * t1 + (v[..., j + 1] / hj - M[..., j + 1] * hj / 6) * t0
    inside = (x_new >= x[0] - 1e-9) & (x_new <= x[-1] + 1e-9)
    return np.where(inside, out, np.nan)
