"""Point-in-region tests for tolerance shapes in the CIE 1931 xy diagram."""
from __future__ import annotations

import numpy as np


def in_polygon(points, polygon, eps: float = 1e-12):
    """True where a point lies inside or on the boundary of a simple polygon.

    Even-odd crossing rule (Shimrat, CACM 5(8), 1962), valid for non-convex polygons;
    points within ``eps`` of an edge count as inside. Shape (..., 2) -> (...).
    """
    p = np.asarray(points, dtype=float)
    poly = np.asarray(polygon, dtype=float)
    x, y = p[..., 0][..., None], p[..., 1][..., None]
    x1, y1 = poly[:, 0], poly[:, 1]
    x2, y2 = np.roll(x1, -1), np.roll(y1, -1)
    with np.errstate(divide="ignore", invalid="ignore"):
        crosses = ((y1 > y) != (y2 > y)) & (x < (x2 - x1) * (y - y1) / (y2 - y1) + x1)
    inside = (np.count_nonzero(crosses, axis=-1) % 2) == 1
    return inside | (distance_to_polygon_edges(p, poly) <= eps)


def distance_to_polygon_edges(points, polygon):
    """Shortest distance from each point to the polygon's boundary, shape (...)."""
    p = np.asarray(points, dtype=float)[..., None, :]
    a = np.asarray(polygon, dtype=float)
    b = np.roll(a, -1, axis=0)
    ab = b - a
    L2 = (ab * ab).sum(axis=-1)
    # infinite points give inf or NaN distances, never a warning
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        t = np.clip(((p - a) * ab).sum(axis=-1) / L2, 0.0, 1.0)
        t = np.where(L2 > 0, t, 0.0)
        foot = a + t[..., None] * ab
        return np.sqrt(((p - foot) ** 2).sum(axis=-1)).min(axis=-1)


def in_ellipse(points, centre, a, b, angle_deg):
    """True where a point lies in the ellipse with semi-axes a, b; major axis at angle_deg
    from the +x axis (the MacAdam 1942 convention, JOSA 32(5):247)."""
    p = np.asarray(points, dtype=float) - np.asarray(centre, dtype=float)
    th = np.deg2rad(angle_deg)
    c, s = np.cos(th), np.sin(th)
    # an infinite point can give inf·0 = NaN here: NaN compares False, i.e. outside
    with np.errstate(invalid="ignore", over="ignore"):
        u = p[..., 0] * c + p[..., 1] * s
        v = -p[..., 0] * s + p[..., 1] * c
        return ellipse_radius(u, v, a, b) <= 1.0 + 1e-12


def ellipse_radius(u, v, a, b):
    """Normalised radius (u/a)² + (v/b)², square-rooted: 1 on the ellipse."""
    return np.sqrt((np.asarray(u) / a) ** 2 + (np.asarray(v) / b) ** 2)
