"""Conversions between CIE XYZ, xyY, CIE 1976 u'v' and CIE 1960 uv.

All functions take array-likes whose last axis holds the coordinates and return arrays
of the same leading shape. NaN in gives NaN out; no function raises on bad values.
Source for every formula: CIE 15:2004 §7.1 (xy), §8.1 (u'v') and Annex (1960 uv).
"""
from __future__ import annotations

import numpy as np


def _split(a, n):
    a = np.asarray(a, dtype=float)
    if a.shape[-1:] != (n,):
        raise ValueError(f"last axis must have length {n}, got shape {a.shape}")
    return a


def _div(num, den):
    with np.errstate(divide="ignore", invalid="ignore"):
        out = np.true_divide(num, den)
    return np.where(den == 0, np.nan, out)


def XYZ_to_xy(XYZ):
    # CIE 15:2004 eq. 7.3: x = X/(X+Y+Z), y = Y/(X+Y+Z)
    XYZ = _split(XYZ, 3)
    s = XYZ.sum(axis=-1)
    return np.stack([_div(XYZ[..., 0], s), _div(XYZ[..., 1], s)], axis=-1)


def xyY_to_XYZ(xyY):
    # CIE 15:2004 eq. 7.3 inverted: X = xY/y, Z = (1-x-y)Y/y
    xyY = _split(xyY, 3)
    x, y, Y = xyY[..., 0], xyY[..., 1], xyY[..., 2]
    return np.stack([_div(x * Y, y), Y, _div((1 - x - y) * Y, y)], axis=-1)


def xy_to_XYZ(xy, Y=1.0):
    xy = _split(xy, 2)
    Y = np.broadcast_to(np.asarray(Y, dtype=float), xy.shape[:-1])
    return xyY_to_XYZ(np.concatenate([xy, Y[..., None]], axis=-1))


def xy_to_uv_prime(xy):
    # CIE 15:2004 eq. 8.2: u' = 4x/(-2x+12y+3), v' = 9y/(-2x+12y+3)
    xy = _split(xy, 2)
    x, y = xy[..., 0], xy[..., 1]
    d = -2 * x + 12 * y + 3
    return np.stack([_div(4 * x, d), _div(9 * y, d)], axis=-1)


def uv_prime_to_xy(uv):
    # CIE 15:2004 eq. 8.2 inverted: x = 9u'/(6u'-16v'+12), y = 4v'/(6u'-16v'+12)
    uv = _split(uv, 2)
    u, v = uv[..., 0], uv[..., 1]
    d = 6 * u - 16 * v + 12
    return np.stack([_div(9 * u, d), _div(4 * v, d)], axis=-1)


def XYZ_to_uv_prime(XYZ):
    # CIE 15:2004 eq. 8.1: u' = 4X/(X+15Y+3Z), v' = 9Y/(X+15Y+3Z)
    XYZ = _split(XYZ, 3)
    d = XYZ[..., 0] + 15 * XYZ[..., 1] + 3 * XYZ[..., 2]
    return np.stack([_div(4 * XYZ[..., 0], d), _div(9 * XYZ[..., 1], d)], axis=-1)


def uv_prime_to_uv1960(uv_prime):
    # CIE 15:2004 §8.1 note: CIE 1960 UCS u = u', v = (2/3) v'
    uv = _split(uv_prime, 2)
    return np.stack([uv[..., 0], uv[..., 1] * (2.0 / 3.0)], axis=-1)


def uv1960_to_uv_prime(uv):
    uv = _split(uv, 2)
    return np.stack([uv[..., 0], uv[..., 1] * 1.5], axis=-1)


def xy_to_uv1960(xy):
    return uv_prime_to_uv1960(xy_to_uv_prime(xy))


def uv1960_to_xy(uv):
    return uv_prime_to_xy(uv1960_to_uv_prime(uv))


def delta_uv_prime(a, b):
    """Euclidean distance Δu'v' between two sets of u'v' points (CIE 15:2004 §8.1)."""
    a = _split(a, 2)
    b = _split(b, 2)
    return np.hypot(a[..., 0] - b[..., 0], a[..., 1] - b[..., 1])
