"""Fixed tolerance figures of the lighting standards: n-step ellipses and CCT × Duv quadrangles.

- An n-step ellipse around a centre c with 1-step semi-axes a, b and major-axis angle θ
  (IEC 60081 Annex D) is the set of xy with dᵀ G d <= n², d = xy − c, G = R(θ) diag(1/a²,
  1/b²) R(θ)ᵀ (the metric of ``macadam.ellipse_metric``): its semi-axes are n·a and n·b.
  The distance of a point in steps is sqrt(dᵀ G d).
- A quadrangle (ANSI C78.377) is the set of chromaticities with CCT in [T0, T1] and Duv in
  [D0, D1]. Its edges are the isotherms at T0 and T1 (straight in CIE 1960 uv, and so in xy,
  which is a projective image of uv) and the lines of constant Duv D0 and D1 (curves
  parallel to the Planckian locus in uv); its corners are xy(T, D) for the four pairs.
"""
from __future__ import annotations

import numpy as np

from .cct import xy_from_cct_duv
from .macadam import ellipse_metric

QUADRANGLE_EDGE_POINTS = 64   # points along each constant-Duv edge of a quadrangle's outline


def ellipse_steps(xy, centre, a, b, angle_deg):
    """Distance from ``centre`` to ``xy`` (..., 2) in steps of the ellipse (a, b, θ): sqrt(dᵀ G d)."""
    d = np.asarray(xy, dtype=float) - np.asarray(centre, dtype=float)
    G = ellipse_metric(a, b, angle_deg)
    with np.errstate(invalid="ignore", over="ignore"):
        return np.sqrt(np.einsum("...i,...ij,...j->...", d, G, d))


def ellipse_outline_xy(centre, a, b, angle_deg, steps=1.0, n: int = 72):
    """``n`` points on the ``steps``-step ellipse, the first at +steps·a along the major axis."""
    t = np.linspace(0.0, 2.0 * np.pi, n, endpoint=False)
    th = np.deg2rad(angle_deg)
    u, v = steps * a * np.cos(t), steps * b * np.sin(t)
    return np.stack([centre[0] + u * np.cos(th) - v * np.sin(th),
                     centre[1] + u * np.sin(th) + v * np.cos(th)], axis=-1)


def quadrangle_corners_xy(cct_range, duv_range):
    """The corners xy(T0, D0), xy(T1, D0), xy(T1, D1), xy(T0, D1) as a (4, 2) array."""
    (t0, t1), (d0, d1) = cct_range, duv_range
    return xy_from_cct_duv(np.array([t0, t1, t1, t0]), np.array([d0, d0, d1, d1]))


def quadrangle_outline_xy(cct_range, duv_range, n: int = QUADRANGLE_EDGE_POINTS):
    """The quadrangle's outline in xy from corner (T0, D0): the Duv = D0 edge
    sampled at ``n`` points evenly in mired from T0 to T1, the isotherm T1 (straight), the
    Duv = D1 edge back to T0, and the isotherm T0 closing it. Its corners are exact."""
    (t0, t1), (d0, d1) = cct_range, duv_range
    T = 1e6 / np.linspace(1e6 / t0, 1e6 / t1, n)
    T[0], T[-1] = t0, t1
    lower = xy_from_cct_duv(T, np.full(n, d0))
    upper = xy_from_cct_duv(T[::-1], np.full(n, d1))
    return np.vstack([lower, upper])
