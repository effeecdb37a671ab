"""The Planckian locus from Planck's law, with its derivatives in temperature.

Planck's law for spectral radiant exitance, CIE 15:2004 §3.1 / eq. E.1:
    M(λ, T) = c1 λ⁻⁵ / (exp(c2 / (λT)) − 1),  c2 = 1.4388e-2 m·K (ITS-90, CIE 15:2004).
Chromaticities are sums against the CIE 1931 2° CMFs at 1 nm over 360-830 nm. The
constant c1 cancels in every chromaticity and is left out.
"""
from __future__ import annotations

import numpy as np

from ..data import cmfs

# CIE 15:2004 §3.1: second radiation constant, m·K
C2 = 1.4388e-2


def _planck_terms(T):
    """Relative M, dM/dT and d²M/dT² at 1 nm over 360-830 nm for temperatures T.

    With x = c2/(λT) and g = x eˣ/(eˣ − 1) (differentiating Planck's law):
    dM/dT = M g / T, d²M/dT² = M (g² − g − x g′) / T², g′ = eˣ(eˣ − 1 − x)/(eˣ − 1)².
    """
    wl, cmf = cmfs("cie1931-2")
    lam = wl * 1e-9
    T = np.asarray(T, dtype=float)
    # Planck's law needs 0 < T < inf: other temperatures become NaN, without warnings
    T = np.where(np.isfinite(T) & (T > 0), T, np.nan)[..., None]
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        x = C2 / (lam * T)
        em1 = np.expm1(x)
        M = lam**-5 / em1 * 1e-30  # scaled to keep sums near unity
        ex = em1 + 1.0
        g = x * ex / em1
        gp = ex * (em1 - x) / (em1 * em1)
    valid = np.isfinite(T)
    g = np.where(np.isfinite(g) | ~valid, g, x)
    gp = np.where(np.isfinite(gp) | ~valid, gp, 1.0)
    M = np.where(np.isfinite(M) | ~valid, M, 0.0)
    with np.errstate(over="ignore", invalid="ignore"):
        dM = M * g / T
        d2M = M * (g * g - g - x * gp) / (T * T)
    return cmf, M, dM, d2M


def planck_uv(T, derivatives: bool = False):
    """CIE 1960 (u, v) of a Planckian radiator at temperature T (kelvin), any shape.

    With ``derivatives`` also returns d(u, v)/dT and d²(u, v)/dT², each of shape (..., 2).
    CIE 1960 UCS: u = 4X/(X + 15Y + 3Z), v = 6Y/(X + 15Y + 3Z) (CIE 15:2004 Annex).
    """
    cmf, M, dM, d2M = _planck_terms(T)
    X, Y, Z = np.moveaxis(M @ cmf, -1, 0)
    D = X + 15 * Y + 3 * Z
    N = np.stack([4 * X, 6 * Y], axis=-1)
    with np.errstate(divide="ignore", invalid="ignore"):
        # D is 0 only where every exponential overflowed (T far below 1 K): no chromaticity
        uv = np.where(D[..., None] > 0, N / D[..., None], np.nan)
    if not derivatives:
        return uv
    dX, dY, dZ = np.moveaxis(dM @ cmf, -1, 0)
    d2X, d2Y, d2Z = np.moveaxis(d2M @ cmf, -1, 0)
    dD = dX + 15 * dY + 3 * dZ
    d2D = d2X + 15 * d2Y + 3 * d2Z
    dN = np.stack([4 * dX, 6 * dY], axis=-1)
    d2N = np.stack([4 * d2X, 6 * d2Y], axis=-1)
    Dk = D[..., None]
    dDk = dD[..., None]
    # quotient rule, first and second derivative of N/D
    with np.errstate(divide="ignore", invalid="ignore"):
        duv = (dN - uv * dDk) / Dk
        d2uv = (d2N - 2 * duv * dDk - uv * d2D[..., None]) / Dk
    return uv, duv, d2uv


def planck_xy(T):
    """CIE 1931 (x, y) of a Planckian radiator at temperature T (kelvin)."""
    from .convert import uv1960_to_xy

    return uv1960_to_xy(planck_uv(T))
