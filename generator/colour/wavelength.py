"""Dominant and complementary wavelength, excitation purity, and the locus boundary.

CIE 15:2004 §9.1: the dominant wavelength of a stimulus S relative to a white W is the
wavelength where the ray from W through S meets the spectral locus; when the ray meets
the purple line instead, the complementary wavelength is where the opposite ray meets
the locus. Excitation purity is |WS| / |WB| with B the boundary point on the ray.
"""
from __future__ import annotations

from functools import cache

import numpy as np

from .gamut import convex_hull
from .spectral import spectral_locus_xy


@cache
def locus_boundary(observer: str = "cie1931-2"):
    """Closed boundary of real chromaticities in xy: the convex hull of the spectral
    locus with the purple line (CIE 15:2004 §7). Returns (hull (k,2), wl (n,), xy (n,2))."""
    wl, xy = spectral_locus_xy(observer)
    # drop the long-wavelength tail where the locus stands still (700-830 nm in 2°)
    step = np.r_[1.0, np.hypot(*np.diff(xy, axis=0).T)]
    keep = step > 1e-7
    wl, xy = wl[keep], xy[keep]
    return convex_hull(xy), wl, xy


def outside_locus_distance(points, observer: str = "cie1931-2"):
    """Distance in xy by which each point lies outside the locus hull; 0 inside."""
    from .region import distance_to_polygon_edges, in_polygon

    hull, _, _ = locus_boundary(observer)
    p = np.asarray(points, dtype=float)
    d = distance_to_polygon_edges(p, hull)
    return np.where(in_polygon(p, hull), 0.0, d)


def _ray_hits(white, points, seg_a, seg_b):
    """Ray W + t(S - W), t > 0, against segments a-b; returns (t, s, index) of nearest hit."""
    d = points - white  # (N, 2)
    e = seg_b - seg_a  # (M, 2)
    w = seg_a[None, :, :] - white  # (1, M, 2)
    den = d[:, None, 0] * e[None, :, 1] - d[:, None, 1] * e[None, :, 0]
    with np.errstate(divide="ignore", invalid="ignore"):
        t = (w[..., 0] * e[None, :, 1] - w[..., 1] * e[None, :, 0]) / den
        s = (w[..., 0] * d[:, None, 1] - w[..., 1] * d[:, None, 0]) / den
    ok = (t > 0) & (s >= 0) & (s <= 1) & np.isfinite(t)
    t = np.where(ok, t, np.inf)
    j = np.argmin(t, axis=1)
    rows = np.arange(len(points))
    return t[rows, j], s[rows, j], j


def dominant_wavelength(points_xy, white_xy, observer: str = "cie1931-2"):
    """Dominant wavelength (nm), complementary wavelength (nm) and excitation purity.

    Returns three arrays of shape (...): where the dominant is defined the complementary
    is NaN and vice versa. A point at the white gives NaN for all three.
    """
    _, wl, xy = locus_boundary(observer)
    p = np.asarray(points_xy, dtype=float)
    shape = p.shape[:-1]
    p = p.reshape(-1, 2)
    w = np.asarray(white_xy, dtype=float).reshape(2)
    a, b = xy[:-1], xy[1:]
    purple_a, purple_b = xy[-1:], xy[:1]
    seg_a = np.vstack([a, purple_a])
    seg_b = np.vstack([b, purple_b])
    t, s, j = _ray_hits(w, p, seg_a, seg_b)
    on_purple = j == len(a)
    lam = wl[np.minimum(j, len(a) - 1)] + s * (wl[np.minimum(j + 1, len(wl) - 1)] - wl[np.minimum(j, len(a) - 1)])
    purity = np.where(np.isfinite(t), 1.0 / t, np.nan)
    dominant = np.where(on_purple | ~np.isfinite(t), np.nan, lam)
    # complementary: the opposite ray, through 2W - S
    tc, sc, jc = _ray_hits(w, 2 * w - p, a, b)
    lamc = wl[jc] + sc * (wl[jc + 1] - wl[jc])
    comp = np.where(on_purple & np.isfinite(tc), lamc, np.nan)
    same = np.all(np.isclose(p, w, atol=1e-12), axis=1)
    dominant[same] = np.nan
    comp[same] = np.nan
    purity[same] = np.nan
    return dominant.reshape(shape), comp.reshape(shape), purity.reshape(shape)
