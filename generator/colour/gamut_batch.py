"""Coverage and area ratio of many triangular gamuts at once (one per measured unit).

Same definitions as ``gamut.coverage`` / ``gamut.area_ratio``. The area of the
intersection of two convex polygons P and Q comes from Green's theorem,
A = ½ ∮ (x dy − y dx), over the boundary of P ∩ Q, which is the part of P's boundary
inside Q plus the part of Q's boundary inside P. Each edge is clipped to the other
polygon parametrically (Cyrus & Beck, "Generalized two- and three-dimensional clipping",
Computers & Graphics 3(1), 1978), so every unit costs a fixed number of array operations.
Where an edge of Q runs along an edge of P in the same direction it is counted once (as
P's); along an edge in the opposite direction the two cancel, as they must.
"""
from __future__ import annotations

import numpy as np


def _shoelace(p):
    """Signed area of polygons (..., k, 2) (shoelace formula), positive counter-clockwise."""
    x, y = p[..., 0], p[..., 1]
    return 0.5 * np.sum(x * np.roll(y, -1, axis=-1) - y * np.roll(x, -1, axis=-1), axis=-1)


def _inside_contribution(ax, ay, bx, by, px, py, strict_same_direction: bool):
    """½ Σ (x dy − y dx) over the parts of segments a→b (coordinates (m, n): segment, row)
    inside the convex counter-clockwise polygons with vertices (px, py) (k, n), one polygon
    per row n. Rows run along the last axis, so every reduction is over a short first axis."""
    dx, dy = bx - ax, by - ay                                      # (m, n)
    ex, ey = np.roll(px, -1, axis=0) - px, np.roll(py, -1, axis=0) - py   # (k, n) edge vectors
    # side of each edge line, s(t) = s0 + t·ds, inside where s >= 0 (counter-clockwise polygon)
    s0 = ex[:, None] * (ay[None] - py[:, None]) - ey[:, None] * (ax[None] - px[:, None])   # (k, m, n)
    ds = ex[:, None] * dy[None] - ey[:, None] * dx[None]
    with np.errstate(divide="ignore", invalid="ignore"):
        t = -s0 / ds
    t0 = np.maximum(0.0, np.where(ds > 0, t, -np.inf).max(axis=0))     # enters across this edge
    t1 = np.minimum(1.0, np.where(ds < 0, t, np.inf).min(axis=0))      # leaves across this one
    # parallel to an edge line: wholly outside when on its outer side
    parallel = ds == 0
    out = np.any(parallel & (s0 < 0), axis=0)
    if strict_same_direction:
        # on an edge line and running the same way as that edge: already counted as P's edge
        same = ex[:, None] * dx[None] + ey[:, None] * dy[None] > 0
        out |= np.any(parallel & (s0 == 0) & same, axis=0)
    keep = ~out & (t1 > t0)
    x0, y0 = ax + t0 * dx, ay + t0 * dy
    x1, y1 = ax + t1 * dx, ay + t1 * dy
    # Green's theorem on a straight piece p→q: ½ (p_x q_y − p_y q_x)
    return np.where(keep, 0.5 * (x0 * y1 - y0 * x1), 0.0).sum(axis=0)


_BLOCK = 8192   # rows per block: the (k, m, rows) temporaries then stay in cache


def clip_area(subject, clips):
    """Area of ``subject`` (m, 2), convex counter-clockwise, inside each convex
    polygon ``clips`` (n, k, 2); the clips may run either way round."""
    clips = np.asarray(clips, dtype=float)
    if len(clips) > _BLOCK:
        return np.concatenate([_clip_area(subject, clips[i:i + _BLOCK]) for i in range(0, len(clips), _BLOCK)])
    return _clip_area(subject, clips)


def _clip_area(subject, clips):
    signed = _shoelace(clips)
    clips = np.where((signed >= 0)[:, None, None], clips, clips[:, ::-1])
    P = np.asarray(subject, dtype=float)
    Px, Py = P[:, 0:1], P[:, 1:2]                                  # (m, 1): the same for every row
    Qx, Qy = np.ascontiguousarray(clips[..., 0].T), np.ascontiguousarray(clips[..., 1].T)   # (k, n)
    Pxb, Pyb = np.broadcast_to(Px, (len(P), len(clips))), np.broadcast_to(Py, (len(P), len(clips)))
    # a degenerate clip (zero area) has no inside: its area of intersection is 0
    area = (_inside_contribution(Px, Py, np.roll(Px, -1, axis=0), np.roll(Py, -1, axis=0), Qx, Qy, False)
            + _inside_contribution(Qx, Qy, np.roll(Qx, -1, axis=0), np.roll(Qy, -1, axis=0), Pxb, Pyb, True))
    return np.where(signed != 0, np.maximum(area, 0.0), 0.0)


def coverage_many(gamuts, reference_hull):
    """Percent of the reference hull's area inside each triangle of ``gamuts`` (n, 3, 2)."""
    g = np.asarray(gamuts, dtype=float)
    ref = np.asarray(reference_hull, dtype=float)
    ref_area = _shoelace(ref)
    finite = np.all(np.isfinite(g), axis=(1, 2))
    area = clip_area(ref, np.where(finite[:, None, None], g, 0.0))
    with np.errstate(divide="ignore", invalid="ignore"):
        cov = np.minimum(100.0, 100.0 * area / ref_area) if ref_area > 0 else np.full(len(g), np.nan)
    return np.where(finite, cov, np.nan)


def area_ratio_many(gamuts, reference_hull):
    """Percent: each triangle's area over the reference hull's area."""
    g = np.asarray(gamuts, dtype=float)
    ref_area = _shoelace(np.asarray(reference_hull, dtype=float))
    if ref_area <= 0:
        return np.full(len(g), np.nan)
    return 100.0 * np.abs(_shoelace(g)) / ref_area
