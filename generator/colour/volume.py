"""CIELAB gamut volume of an additive RGB display, and the share of a reference volume it
covers.

Method (the CIELAB gamut volume that ICDM IDMS §5.32 recommends):
the surface of the RGB unit cube, n × n quads per face and two triangles per quad, mapped
through the normalized primary matrix to XYZ and then to CIELAB (CIE 15:2004 §8.2.1) with
the display's own white as reference white (white Y = 1, so L* = 100 at white); the volume
is the sum of the signed tetrahedra from the origin (divergence theorem). The transfer
function does not change the solid. Coverage: the reference solid is sampled on a regular
CIELAB grid, and a grid point is in a solid when XYZ → RGB through the inverse NPM lies in
[0, 1]³ (both solids with the reference's white, no chromatic adaptation).
"""
from __future__ import annotations

from functools import lru_cache

import numpy as np

from .difference import Lab_to_XYZ, XYZ_to_Lab

MESH_N = 64          # quads per cube edge: n = 64 lies within 0.1 % of the fine-mesh limit
GRID_STEP = 1.0      # CIELAB units between coverage grid points


def cube_surface(n: int = MESH_N):
    """Vertices (k, 3) and outward-facing triangles (m, 3) of the RGB unit cube's surface."""
    verts, tris = _cube_surface(int(n))
    return verts.copy(), tris.copy()


@lru_cache(maxsize=4)
def _cube_surface(n: int):
    t = np.linspace(0.0, 1.0, n + 1)
    u, v = np.meshgrid(t, t, indexing="ij")
    u, v = u.ravel(), v.ravel()
    idx = np.arange((n + 1) ** 2).reshape(n + 1, n + 1)
    a, b, c, d = idx[:-1, :-1].ravel(), idx[1:, :-1].ravel(), idx[1:, 1:].ravel(), idx[:-1, 1:].ravel()
    quad = np.concatenate([np.stack([a, b, c], -1), np.stack([a, c, d], -1)])   # counter-clockwise in (u, v)
    verts, tris = [], []
    for axis in range(3):
        i, j = [k for k in range(3) if k != axis]
        for side in (0.0, 1.0):
            p = np.zeros((len(u), 3))
            p[:, axis], p[:, i], p[:, j] = side, u, v
            # (u, v) = (i, j) is right-handed about +axis when (axis, i, j) is a cyclic order
            cyclic = (axis, i, j) in ((0, 1, 2), (1, 2, 0), (2, 0, 1))
            outward = (side == 1.0) == cyclic
            tri = quad if outward else quad[:, ::-1]
            tris.append(tri + sum(len(x) for x in verts))
            verts.append(p)
    return np.concatenate(verts), np.concatenate(tris)


def mesh_volume(vertices, triangles) -> float:
    """Volume enclosed by a closed, outward-oriented triangle mesh."""
    p = vertices[triangles]                       # (m, 3, 3)
    # divergence theorem: V = Σ det[p0, p1, p2] / 6 over outward triangles
    return float(np.sum(np.einsum("ij,ij->i", p[:, 0], np.cross(p[:, 1], p[:, 2]))) / 6.0)


def lab_gamut_volume(npm, n: int = MESH_N) -> float:
    """CIELAB volume (ΔE*ab³) of the RGB cube of ``npm`` with its own white (NPM @ [1, 1, 1])."""
    M = np.asarray(npm, dtype=float)
    if not np.all(np.isfinite(M)):
        return float("nan")
    verts, tris = _cube_surface(int(n))
    white = M @ np.ones(3)
    lab = XYZ_to_Lab(verts @ M.T, white)
    return abs(mesh_volume(lab, tris))


def lab_volume_coverage(npm, reference_npm, step: float = GRID_STEP) -> tuple[float, float]:
    """(covered, reference) volumes on a CIELAB grid: the grid volume of the reference
    solid and of its part inside the solid of ``npm``, both with the reference's white.

    A grid point is inside a solid when its RGB (inverse NPM times XYZ) lies in [0, 1]³.
    On one lightness slice X depends on a* alone and Z on b* alone (CIE 15:2004 eq. 8.5
    inverted per channel), so along a row of constant a* each RGB channel is linear in Z,
    and Z falls monotonically with b*: the row's inside points are the grid b* whose Z lies
    in one interval, counted by binary search instead of testing every point."""
    M, R = np.asarray(npm, dtype=float), np.asarray(reference_npm, dtype=float)
    if not (np.all(np.isfinite(M)) and np.all(np.isfinite(R))):
        return float("nan"), float("nan")
    white = R @ np.ones(3)
    verts, _ = _cube_surface(8)
    lab = XYZ_to_Lab(verts @ R.T, white)
    lo, hi = lab.min(axis=0) - step, lab.max(axis=0) + step
    L = np.arange(max(lo[0], 0.0) + step / 2, min(hi[0], 100.0), step)
    a = np.arange(lo[1] + step / 2, hi[1], step)
    b = np.arange(lo[2] + step / 2, hi[2], step)
    Rinv, Minv = np.linalg.inv(R), np.linalg.inv(M)
    n_ref = n_both = 0
    for Lk in L:
        X = Lab_to_XYZ(np.stack([np.full(a.shape, Lk), a, np.zeros(a.shape)], -1), white)
        Z = Lab_to_XYZ(np.stack([np.full(b.shape, Lk), np.zeros(b.shape), b], -1), white)
        Xa, Yk, Z_sorted = X[:, 0], X[0, 1], np.sort(Z[:, 2])
        lo_r, hi_r = _z_interval(Rinv, Xa, Yk)
        lo_m, hi_m = _z_interval(Minv, Xa, Yk)
        n_ref += _count_between(Z_sorted, lo_r, hi_r)
        n_both += _count_between(Z_sorted, np.maximum(lo_r, lo_m), np.minimum(hi_r, hi_m))
    cell = step ** 3
    return n_both * cell, n_ref * cell


def _z_interval(inverse_npm, Xa, Yk, eps: float = 1e-12):
    """Per a* row, the interval of Z where every channel r0·X + r1·Y + r2·Z is in [0, 1]."""
    lo = np.full(Xa.shape, -np.inf)
    hi = np.full(Xa.shape, np.inf)
    for r0, r1, r2 in np.asarray(inverse_npm, dtype=float):
        base = r0 * Xa + r1 * Yk
        if r2 == 0.0:
            out = (base < -eps) | (base > 1 + eps)
            lo, hi = np.where(out, np.inf, lo), np.where(out, -np.inf, hi)
            continue
        z1, z2 = (-eps - base) / r2, (1 + eps - base) / r2
        lo, hi = np.maximum(lo, np.minimum(z1, z2)), np.minimum(hi, np.maximum(z1, z2))
    return lo, hi


def _count_between(sorted_values, lo, hi) -> int:
    n = np.searchsorted(sorted_values, hi, side="right") - np.searchsorted(sorted_values, lo, side="left")
    return int(np.sum(np.clip(n, 0, None)))


def _in_cube(rgb, eps: float = 1e-12):
    r, g, b = rgb[..., 0], rgb[..., 1], rgb[..., 2]
    return ((r >= -eps) & (r <= 1 + eps) & (g >= -eps) & (g <= 1 + eps) & (b >= -eps) & (b <= 1 + eps))


def lightness_slice(npm, L: float, white_XYZ, half_width: float = 200.0, step: float = 1.0):
    """a*, b* grids and the inside mask of the solid of ``npm`` at lightness L (for drawing)."""
    M = np.asarray(npm, dtype=float)
    a = np.arange(-half_width, half_width + step / 2, step)
    A, B = np.meshgrid(a, a, indexing="ij")
    XYZ = Lab_to_XYZ(np.stack([np.full(A.shape, float(L)), A, B], -1), np.asarray(white_XYZ, dtype=float))
    return A, B, _in_cube(XYZ @ np.linalg.inv(M).T)
