"""MacAdam steps: colour differences in units of the MacAdam (1942) ellipses.

A 1-step ellipse is the set of xy offsets d with dᵀ G d = 1, where the metric
G = R(θ) diag(1/a², 1/b²) R(θ)ᵀ (Brown & MacAdam 1949; Wyszecki & Stiles 1982 §5.4);
n steps is dᵀ G d = n². The 25 ellipses are measured at fixed centres only, so G at a
target between them is interpolated: the inverse-distance-squared weighted mean of the
metrics G of the four nearest centres (Shepard 1968), a method of this tool (no standard
prescribes one). A target at a centre takes that ellipse exactly.
"""
from __future__ import annotations

import numpy as np

from ..data.macadam1942 import CALCULATED, CENTRES

METHOD = ("MacAdam (1942) ellipses (calculated axes, Wyszecki & Stiles Table 2(5.4.1)), metric "
          "G = R diag(1/a², 1/b²) Rᵀ interpolated at the target by inverse-distance-squared weighting "
          "of the 4 nearest ellipses (Shepard 1968); n steps: dᵀ G d ≤ n²")
NEAREST = 4


def ellipse_metric(a, b, angle_deg):
    """The metric G (..., 2, 2) of ellipses with semi-axes a, b and major-axis angle (degrees)."""
    a, b, th = np.broadcast_arrays(*(np.asarray(v, dtype=float) for v in (a, b, np.deg2rad(angle_deg))))
    c, s = np.cos(th), np.sin(th)
    # G = R diag(1/a², 1/b²) Rᵀ with R the rotation by θ (Wyszecki & Stiles §5.4)
    g11 = c * c / a**2 + s * s / b**2
    g22 = s * s / a**2 + c * c / b**2
    g12 = c * s * (1 / a**2 - 1 / b**2)
    return np.stack([np.stack([g11, g12], -1), np.stack([g12, g22], -1)], -2)


_METRICS = ellipse_metric(CALCULATED[:, 0], CALCULATED[:, 1], CALCULATED[:, 2])


def macadam_metric(xy):
    """The interpolated MacAdam metric G at chromaticities xy (..., 2) -> (..., 2, 2)."""
    p = np.asarray(xy, dtype=float)
    d2 = np.sum((p[..., None, :] - CENTRES) ** 2, axis=-1)          # (..., 25)
    order = np.argsort(np.where(np.isnan(d2), np.inf, d2), axis=-1)[..., :NEAREST]
    dn = np.take_along_axis(d2, order, axis=-1)
    with np.errstate(divide="ignore", invalid="ignore"):
        # Shepard (1968) weights 1/d²; a target on a centre takes that centre alone
        w = np.where(dn[..., :1] == 0, (dn == 0).astype(float), 1.0 / dn)
        w = w / w.sum(axis=-1, keepdims=True)
    G = np.sum(w[..., None, None] * _METRICS[order], axis=-3)
    return np.where(np.isfinite(p).all(axis=-1)[..., None, None], G, np.nan)


def macadam_steps(xy, target_xy):
    """Distance from target to xy in MacAdam steps, sqrt(dᵀ G d) with G at the target."""
    p = np.asarray(xy, dtype=float)
    t = np.asarray(target_xy, dtype=float)
    d = p - t
    G = macadam_metric(t)
    q = np.einsum("...i,...ij,...j->...", d, G, d)
    return np.sqrt(q)


def metric_axes(G):
    """Semi-axes a >= b and major-axis angle (degrees, in [0, 180)) of the 1-step ellipse of G."""
    G = np.asarray(G, dtype=float)
    vals, vecs = np.linalg.eigh(G)                 # ascending: the smallest eigenvalue is the major axis
    a = 1 / np.sqrt(vals[..., 0])
    b = 1 / np.sqrt(vals[..., 1])
    ang = np.degrees(np.arctan2(vecs[..., 1, 0], vecs[..., 0, 0])) % 180.0
    return a, b, ang
