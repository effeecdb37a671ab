"""The Planckian locus from Planck's law, with its derivatives in temperature.

Planck's law for spectral radiant exitance, CIE 15:2004 §3.1 / eq. E.1:
    M(λ, T) = c1 λ⁻⁵ / (exp(c2 / (λT)) − 1),  c2 = 1.4388e-2 m·K (ITS-90, CIE 15:2004).
Chromaticities are sums against the colour-matching functions of the chosen observer
(CIE 1931 2° by default, or CIE 1964 10°) at 1 nm over 360-830 nm. The constant c1
cancels in every chromaticity and is left out.
"""
from __future__ import annotations

import numpy as np

from ..data import cmfs

# CIE 15:2004 §3.1: second radiation constant, m·K
C2 = 1.4388e-2


def _planck_terms(T, observer: str, order: int):
    """Relative M, dM/dT and (order 2) d²M/dT² at 1 nm over 360-830 nm for temperatures T.

    With x = c2/(λT) and g = x eˣ/(eˣ − 1) (differentiating Planck's law):
    dM/dT = M g / T, d²M/dT² = M (g² − g − x g′) / T², g′ = eˣ(eˣ − 1 − x)/(eˣ − 1)².
    """
    wl, cmf = cmfs(observer)
    lam = wl * 1e-9
    T = np.asarray(T, dtype=float)
    # Planck's law needs 0 < T < inf: other temperatures become NaN, without warnings
    T = np.where(np.isfinite(T) & (T > 0), T, np.nan)[..., None]
    valid = np.isfinite(T)
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        x = C2 / (lam * T)
        em1 = np.expm1(x)
        r = 1.0 / em1
        M = (lam**-5 * 1e-30) * r  # scaled to keep sums near unity
    guard = not np.all(np.isfinite(M) | ~valid)   # exponentials overflowed (T below about 60 K)
    if guard:
        M = np.where(np.isfinite(M) | ~valid, M, 0.0)
    if order == 0:
        return cmf, (M,)
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        g = x * (1.0 + r)                   # x eˣ/(eˣ − 1) = x (1 + 1/(eˣ − 1))
    if guard:
        g = np.where(np.isfinite(g) | ~valid, g, x)
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        dM = M * g * (1.0 / T)
    if order == 1:
        return cmf, (M, dM)
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        gp = (em1 + 1.0) * (em1 - x) / (em1 * em1)
    gp = np.where(np.isfinite(gp) | ~valid, gp, 1.0)
    with np.errstate(over="ignore", invalid="ignore"):
        d2M = M * (g * g - g - x * gp) / (T * T)
    return cmf, (M, dM, d2M)


def _uv_and_derivatives(T, observer: str, order: int):
    cmf, terms = _planck_terms(T, observer, order)
    X, Y, Z = np.moveaxis(terms[0] @ cmf, -1, 0)
    D = X + 15 * Y + 3 * Z
    N = np.stack([4 * X, 6 * Y], axis=-1)
    with np.errstate(divide="ignore", invalid="ignore"):
        # D is 0 only where every exponential overflowed (T far below 1 K): no chromaticity
        uv = np.where(D[..., None] > 0, N / D[..., None], np.nan)
    if order == 0:
        return (uv,)
    Dk = D[..., None]
    dX, dY, dZ = np.moveaxis(terms[1] @ cmf, -1, 0)
    dD = (dX + 15 * dY + 3 * dZ)[..., None]
    dN = np.stack([4 * dX, 6 * dY], axis=-1)
    # quotient rule: d(N/D) = (dN − (N/D) dD) / D
    with np.errstate(divide="ignore", invalid="ignore"):
        duv = (dN - uv * dD) / Dk
    if order == 1:
        return uv, duv
    d2X, d2Y, d2Z = np.moveaxis(terms[2] @ cmf, -1, 0)
    d2D = (d2X + 15 * d2Y + 3 * d2Z)[..., None]
    d2N = np.stack([4 * d2X, 6 * d2Y], axis=-1)
    # quotient rule again: d²(N/D) = (d²N − 2 d(N/D) dD − (N/D) d²D) / D
    with np.errstate(divide="ignore", invalid="ignore"):
        d2uv = (d2N - 2 * duv * dD - uv * d2D) / Dk
    return uv, duv, d2uv


def planck_uv(T, derivatives: bool = False, observer: str = "cie1931-2"):
    """CIE 1960 (u, v) of a Planckian radiator at temperature T (kelvin), any shape.

    With ``derivatives`` also returns d(u, v)/dT and d²(u, v)/dT², each of shape (..., 2).
    CIE 1960 UCS: u = 4X/(X + 15Y + 3Z), v = 6Y/(X + 15Y + 3Z) (CIE 15:2004 Annex), with
    X, Y, Z those of ``observer`` (``"cie1931-2"`` or ``"cie1964-10"``).
    """
    out = _uv_and_derivatives(T, observer, 2 if derivatives else 0)
    return out if derivatives else out[0]


def planck_uv_tangent(T, observer: str = "cie1931-2"):
    """CIE 1960 (u, v) of a Planckian radiator and d(u, v)/dT, each of shape (..., 2)."""
    return _uv_and_derivatives(T, observer, 1)


def planck_xy(T, observer: str = "cie1931-2"):
    """CIE 1931 (x, y) (or x10, y10 for the 10° observer) of a Planckian radiator at T (kelvin)."""
    from .convert import uv1960_to_xy

    return uv1960_to_xy(planck_uv(T, observer=observer))
