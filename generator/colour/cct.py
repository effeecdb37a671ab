"""Correlated colour temperature and Duv by the CIE 15 definition.

CIE 15:2004 §9.5: the CCT of a stimulus is the temperature of the Planckian radiator
whose chromaticity is nearest to it in the CIE 1960 UCS diagram; Duv (ANSI C78.377,
Ohno 2014, LEUKOS 10(1):47-55) is that distance, positive above the locus.

Method ("exact-newton"): a table of the Planckian locus at 1-mired steps from 500 K
to 10⁶ K gives the nearest node; Newton's method on d/dT |uv(T) − uv|² = 0, with the
exact first and second derivatives of Planck's law, then converges to the foot of the
perpendicular. The result equals a brute-force search to well under 0.01 K.
"""
from __future__ import annotations

from functools import lru_cache

import numpy as np

from .convert import uv1960_to_xy, xy_to_uv1960
from .planck import planck_uv

METHOD = "nearest Planckian point in CIE 1960 uv (CIE 15:2004 §9.5), Newton-refined"
T_MIN, T_MAX = 500.0, 1.0e6
_NEWTON_STEPS = 6
_CHUNK = 1024


@lru_cache(maxsize=1)
def _table():
    mired = np.arange(1e6 / T_MIN, 1e6 / T_MAX - 1e-9, -1.0)
    T = 1e6 / mired
    uv = planck_uv(T)
    return T, uv


def cct_duv_from_uv(uv):
    """CCT (K) and Duv for CIE 1960 uv points, shape (..., 2) -> two arrays of shape (...).

    Points whose nearest Planckian point lies outside 500 K to 10⁶ K, or that are NaN,
    give NaN. CIE 15 holds CCT meaningful only for |Duv| <= 0.05; callers report that.
    """
    uv = np.asarray(uv, dtype=float)
    shape = uv.shape[:-1]
    flat = uv.reshape(-1, 2)
    cct = np.full(flat.shape[0], np.nan)
    duv = np.full(flat.shape[0], np.nan)
    T_tab, uv_tab = _table()
    ok = np.all(np.isfinite(flat), axis=1)
    idx_ok = np.nonzero(ok)[0]
    # points far outside the diagram overflow the squared distances: they end as NaN
    with np.errstate(over="ignore", invalid="ignore"):
        _nearest_planckian(flat, idx_ok, T_tab, uv_tab, cct, duv)
    return cct.reshape(shape), duv.reshape(shape)


_COARSE = 16


def _nearest_node(p, uv_tab):
    """Index of the table node nearest to each point: a search on every 16th node, then on
    the nodes around the coarse winner (the same node as a full search wherever the
    distance along the locus has one minimum within 32 nodes, i.e. near the locus)."""
    coarse = uv_tab[::_COARSE]
    i0 = np.argmin(((p[:, None, :] - coarse[None, :, :]) ** 2).sum(axis=-1), axis=1) * _COARSE
    win = np.clip(i0[:, None] + np.arange(-2 * _COARSE, 2 * _COARSE + 1)[None, :], 0, len(uv_tab) - 1)
    d2 = ((p[:, None, :] - uv_tab[win]) ** 2).sum(axis=-1)
    return win[np.arange(len(p)), np.argmin(d2, axis=1)]


def _nearest_planckian(flat, idx_ok, T_tab, uv_tab, cct, duv):
    """Fill cct/duv at the rows idx_ok of flat (n, 2) in place, in chunks."""
    for start in range(0, idx_ok.size, _CHUNK):
        sel = idx_ok[start:start + _CHUNK]
        p = flat[sel]
        T = T_tab[_nearest_node(p, uv_tab)]
        for _ in range(_NEWTON_STEPS):
            q, dq, d2q = planck_uv(T, derivatives=True)
            r = q - p
            f = (r * dq).sum(axis=-1)
            fp = (dq * dq).sum(axis=-1) + (r * d2q).sum(axis=-1)
            step = np.where(fp > 0, f / fp, 0.0)
            T = np.clip(T - step, T_MIN * 0.999, T_MAX * 1.001)
            if np.all(np.abs(step) <= 1e-10 * T):   # converged (quadratically) for every point
                break
        q = planck_uv(T)
        dist = np.hypot(*(p - q).T)
        sign = np.where(p[:, 1] >= q[:, 1], 1.0, -1.0)
        inside = (T >= T_MIN) & (T <= T_MAX)
        cct[sel] = np.where(inside, T, np.nan)
        duv[sel] = np.where(inside, sign * dist, np.nan)


def cct_duv_from_xy(xy):
    return cct_duv_from_uv(xy_to_uv1960(xy))


def uv_from_cct_duv(cct, duv=0.0):
    """CIE 1960 uv at distance Duv from the Planckian point at CCT, along the normal.

    Inverse of ``cct_duv_from_uv``: uv = uv_P(T) + Duv · n, with n the unit normal to the
    locus pointing to larger v (Ohno 2014, LEUKOS 10(1), eq. 12-13 in that sense).
    """
    cct, duv = np.broadcast_arrays(np.asarray(cct, dtype=float), np.asarray(duv, dtype=float))
    q, dq, _ = planck_uv(cct, derivatives=True)
    n = np.stack([dq[..., 1], -dq[..., 0]], axis=-1)
    with np.errstate(divide="ignore", invalid="ignore"):
        n = n / np.linalg.norm(n, axis=-1, keepdims=True)
    return q + duv[..., None] * n


def xy_from_cct_duv(cct, duv=0.0):
    return uv1960_to_xy(uv_from_cct_duv(cct, duv))
