"""Coverage and area ratio of many triangular gamuts at once (one per measured unit).

Same definitions as ``gamut.coverage`` / ``gamut.area_ratio``; the clipping is
Sutherland & Hodgman, "Reentrant polygon clipping", CACM 17(1), 1974, run on fixed-size
vertex buffers where a dropped vertex is replaced by its predecessor (a zero-length edge
adds nothing to the shoelace area).
"""
from __future__ import annotations

import numpy as np


def _shoelace(p):
    """Signed area of polygons (..., k, 2) (shoelace formula), positive counter-clockwise."""
    x, y = p[..., 0], p[..., 1]
    return 0.5 * np.sum(x * np.roll(y, -1, axis=-1) - y * np.roll(x, -1, axis=-1), axis=-1)


def _fill_dropped(pts, valid):
    """Replace dropped vertices by the nearest kept one before them (cyclically)."""
    n, k = valid.shape
    idx = np.where(valid, np.arange(k)[None, :], -1)
    last = idx.max(axis=1)
    ffill = np.maximum.accumulate(idx, axis=1)
    ffill = np.where(ffill < 0, last[:, None], ffill)
    empty = last < 0
    ffill = np.where(empty[:, None], 0, ffill)
    out = np.take_along_axis(pts, ffill[..., None], axis=1)
    out[empty] = 0.0
    return out


def clip_area(subject, clips):
    """Area of ``subject`` (m, 2), convex counter-clockwise, inside each convex
    polygon ``clips`` (n, k, 2); the clips may run either way round."""
    clips = np.asarray(clips, dtype=float)
    n, k, _ = clips.shape
    ccw = _shoelace(clips) >= 0
    clips = np.where(ccw[:, None, None], clips, clips[:, ::-1])
    poly = np.broadcast_to(np.asarray(subject, dtype=float), (n,) + np.shape(subject)).copy()
    for j in range(k):
        a, b = clips[:, j], clips[:, (j + 1) % k]
        e = b - a
        side = e[:, None, 0] * (poly[..., 1] - a[:, None, 1]) - e[:, None, 1] * (poly[..., 0] - a[:, None, 0])
        prev, sp = np.roll(poly, 1, axis=1), np.roll(side, 1, axis=1)
        cross = (side >= 0) != (sp >= 0)
        with np.errstate(divide="ignore", invalid="ignore"):
            t = np.where(cross, sp / (sp - side), 0.0)
        inter = prev + (poly - prev) * t[..., None]
        pts = np.stack([inter, poly], axis=2).reshape(n, -1, 2)
        valid = np.stack([cross, side >= 0], axis=2).reshape(n, -1)
        poly = _fill_dropped(pts, valid)
    return np.maximum(_shoelace(poly), 0.0)


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
