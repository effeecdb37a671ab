"""Normalized primary matrix (RGB to XYZ) per SMPTE RP 177-1993 §3.3."""
from __future__ import annotations

import numpy as np

from .convert import xy_to_XYZ

# |det P| = twice the xy area of the primaries' triangle; below this they are collinear
_MIN_DET = 1e-12


def npm_from_primaries(primaries_xy, white_xy):
    """NPM for three primaries (shape (..., 3, 2), x and y of R, G, B) and whites (..., 2).

    SMPTE RP 177 eq. 3.3-3.5: P = columns (x, y, z) of the primaries; W = XYZ of the
    white with Y = 1; C = P⁻¹ W; NPM = P · diag(C). White RGB (1, 1, 1) maps to W.
    Returns shape (..., 3, 3). Collinear primaries have no NPM, and non-finite inputs
    give none either: those matrices are all NaN.
    """
    p = np.asarray(primaries_xy, dtype=float)
    if p.shape[-2:] != (3, 2):
        raise ValueError(f"expected three (x, y) primaries, got shape {p.shape}")
    w = np.asarray(white_xy, dtype=float)
    if w.shape[-1:] != (2,):
        raise ValueError(f"expected a white (x, y), got shape {w.shape}")
    shape = np.broadcast_shapes(p.shape[:-2], w.shape[:-1])
    p = np.broadcast_to(p, shape + (3, 2))
    w = np.broadcast_to(w, shape + (2,))
    # rows x, y, z; columns R, G, B
    P = np.stack([p[..., 0], p[..., 1], 1 - p[..., 0] - p[..., 1]], axis=-2)
    W = xy_to_XYZ(w)
    good = np.all(np.isfinite(P), axis=(-2, -1)) & np.all(np.isfinite(W), axis=-1)
    P_safe = np.where(good[..., None, None], P, np.eye(3))
    good &= np.abs(np.linalg.det(P_safe)) > _MIN_DET
    P_safe = np.where(good[..., None, None], P_safe, np.eye(3))
    W_safe = np.where(good[..., None], W, 1.0)
    C = np.linalg.solve(P_safe, W_safe[..., None])[..., 0]
    return np.where(good[..., None, None], P_safe * C[..., None, :], np.nan)


def inverse_npm(npm):
    """XYZ to RGB: the exact matrix inverse of the NPM (SMPTE RP 177 §3.4), shape (..., 3, 3).

    Singular or non-finite matrices give all NaN.
    """
    m = np.asarray(npm, dtype=float)
    if m.shape[-2:] != (3, 3):
        raise ValueError(f"expected a 3 x 3 matrix, got shape {m.shape}")
    good = np.all(np.isfinite(m), axis=(-2, -1))
    m_safe = np.where(good[..., None, None], m, np.eye(3))
    # singular when the determinant vanishes relative to the size of the entries
    scale = np.max(np.abs(m_safe), axis=(-2, -1)) ** 3
    good &= np.abs(np.linalg.det(m_safe)) > 1e-12 * np.where(scale > 0, scale, 1.0)
    m_safe = np.where(good[..., None, None], m_safe, np.eye(3))
    return np.where(good[..., None, None], np.linalg.inv(m_safe), np.nan)
