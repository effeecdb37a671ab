"""Gamut polygons in a chromaticity diagram: convex hull, area, coverage, area ratio.

A gamut of three or more additive primaries is the convex hull of their chromaticities
(Grassmann's law of additive mixture, CIE 15:2004 §7). Coverage is the share of the
reference gamut's area that lies inside the spec's gamut; area ratio is spec area over
reference area; both in percent and in the diagram they are computed in (the u'v'
hull is the hull of the transformed points: the projective map keeps lines straight).
"""
from __future__ import annotations

import numpy as np


def convex_hull(points):
    """Counter-clockwise convex hull of 2-D points (Andrew's monotone chain, 1979).

    Collinear points on an edge are dropped. Returns shape (k, 2); k < 3 means the
    points do not span an area.
    """
    pts = np.asarray(points, dtype=float).reshape(-1, 2)
    pts = pts[np.all(np.isfinite(pts), axis=1)]
    order = np.lexsort((pts[:, 1], pts[:, 0]))
    pts = pts[order]
    if len(pts) < 3:
        return pts

    def cross(o, a, b):
        return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0])

    lower: list = []
    for p in pts:
        while len(lower) >= 2 and cross(lower[-2], lower[-1], p) <= 1e-15:
            lower.pop()
        lower.append(p)
    upper: list = []
    for p in pts[::-1]:
        while len(upper) >= 2 and cross(upper[-2], upper[-1], p) <= 1e-15:
            upper.pop()
        upper.append(p)
    return np.array(lower[:-1] + upper[:-1])


def polygon_area(poly):
    """Signed area of a polygon, positive when counter-clockwise (shoelace formula)."""
    poly = np.asarray(poly, dtype=float)
    if len(poly) < 3:
        return 0.0
    x, y = poly[:, 0], poly[:, 1]
    return 0.5 * float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))


def clip_convex(subject, clip):
    """Intersection of a polygon with a convex counter-clockwise polygon.

    Sutherland & Hodgman, "Reentrant polygon clipping", CACM 17(1), 1974.
    """
    out = [np.asarray(p, dtype=float) for p in np.asarray(subject, dtype=float)]
    clip = np.asarray(clip, dtype=float)
    n = len(clip)
    for i in range(n):
        a, b = clip[i], clip[(i + 1) % n]
        edge = b - a
        inp, out = out, []
        if not inp:
            break

        def side(p, a=a, edge=edge):
            return edge[0] * (p[1] - a[1]) - edge[1] * (p[0] - a[0])

        prev = inp[-1]
        sp = side(prev)
        for cur in inp:
            sc = side(cur)
            if sc >= 0:
                if sp < 0:
                    out.append(prev + (cur - prev) * (sp / (sp - sc)))
                out.append(cur)
            elif sp >= 0:
                out.append(prev + (cur - prev) * (sp / (sp - sc)))
            prev, sp = cur, sc
    return np.array(out).reshape(-1, 2)


def _hull_or_none(points):
    """Convex hull of finite 2-D points, or None when any point is NaN or infinite."""
    pts = np.asarray(points, dtype=float).reshape(-1, 2)
    if not np.all(np.isfinite(pts)):
        return None
    return convex_hull(pts)


def coverage(gamut, reference):
    """Percent of the reference gamut's area inside the spec's gamut, in 0..100.

    Both are taken as the convex hulls of their points, so the order and orientation of
    the points do not matter. A gamut that spans no area covers 0 %; a reference that
    spans no area, or any non-finite point, gives NaN.
    """
    g, r = _hull_or_none(gamut), _hull_or_none(reference)
    if g is None or r is None:
        return float("nan")
    ref_area = polygon_area(r)
    if ref_area <= 0:
        return float("nan")
    if len(g) < 3:
        return 0.0
    inter = clip_convex(r, g)
    return min(100.0, 100.0 * max(polygon_area(inter), 0.0) / ref_area)


def area_ratio(gamut, reference):
    """Percent: area of the gamut's convex hull over the area of the reference's hull.

    A reference that spans no area, or any non-finite point, gives NaN.
    """
    g, r = _hull_or_none(gamut), _hull_or_none(reference)
    if g is None or r is None:
        return float("nan")
    ref_area = polygon_area(r)
    if ref_area <= 0:
        return float("nan")
    return 100.0 * polygon_area(g) / ref_area
