"""Normalized primary matrix (RGB to XYZ) per SMPTE RP 177-1993 §3.3."""
from __future__ import annotations

import numpy as np

from .convert import xy_to_XYZ


def npm_from_primaries(primaries_xy, white_xy):
    """NPM for three primaries (shape (3, 2), x and y of R, G, B) and a white (x, y).

    SMPTE RP 177 eq. 3.3-3.5: P = columns (x, y, z) of the primaries; W = XYZ of the
    white with Y = 1; C = P⁻¹ W; NPM = P · diag(C). White RGB (1, 1, 1) maps to W.
    Collinear primaries have no NPM: the result is all NaN.
    """
    p = np.asarray(primaries_xy, dtype=float)
    if p.shape != (3, 2):
        raise ValueError(f"expected three (x, y) primaries, got shape {p.shape}")
    P = np.column_stack([p[:, 0], p[:, 1], 1 - p[:, 0] - p[:, 1]])  # rows x, y, z
    P = P.T
    W = xy_to_XYZ(np.asarray(white_xy, dtype=float))
    try:
        C = np.linalg.solve(P, W)
    except np.linalg.LinAlgError:
        return np.full((3, 3), np.nan)
    return P * C[None, :]


def inverse_npm(npm):
    """XYZ to RGB: the exact matrix inverse of the NPM (SMPTE RP 177 §3.4)."""
    npm = np.asarray(npm, dtype=float)
    try:
        return np.linalg.inv(npm)
    except np.linalg.LinAlgError:
        return np.full_like(npm, np.nan)
