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
    solid and of its part inside the solid of ``npm``, both with the reference's white."""
    M, R = np.asarray(npm, dtype=float), np.asarray(reference_npm, dtype=float)
    if not (np.all(np.isfinite(M)) and np.all(np.isfinite(R))):
        return float("nan"), float("nan")
    XYZ = _reference_grid(tuple(R.ravel()), float(step))
    in_m = _inside(XYZ, np.linalg.inv(M))
    cell = step ** 3
    return int(np.count_nonzero(in_m)) * cell, len(XYZ) * cell


@lru_cache(maxsize=8)
def _reference_grid(reference: tuple, step: float) -> np.ndarray:
    """XYZ (k, 3) of the regular CIELAB grid points inside the reference's solid, with the
    reference's white; computed once per reference and step."""
    R = np.array(reference, dtype=float).reshape(3, 3)
    white = R @ np.ones(3)
    verts, _ = _cube_surface(8)
    lab = XYZ_to_Lab(verts @ R.T, white)
    lo, hi = lab.min(axis=0) - step, lab.max(axis=0) + step
    L = np.arange(max(lo[0], 0.0) + step / 2, min(hi[0], 100.0), step)
    a = np.arange(lo[1] + step / 2, hi[1], step)
    b = np.arange(lo[2] + step / 2, hi[2], step)
    Rinv = np.linalg.inv(R)
    inside = []
    for Lk in L:
        # on a lightness slice X depends on a* alone and Z on b* alone (CIE 15:2004 eq. 8.5
        # inverted per channel), so each RGB channel is an outer sum of two 1-D terms
        X = Lab_to_XYZ(np.stack([np.full(a.shape, Lk), a, np.zeros(a.shape)], -1), white)
        Z = Lab_to_XYZ(np.stack([np.full(b.shape, Lk), np.zeros(b.shape), b], -1), white)
        Xa, Yk, Zb = X[:, 0], X[0, 1], Z[:, 2]
        ok = np.ones((len(a), len(b)), dtype=bool)
        for row in Rinv:
            c = (row[0] * Xa)[:, None] + (row[1] * Yk + row[2] * Zb)[None, :]
            ok &= (c >= -1e-12) & (c <= 1 + 1e-12)
        ia, ib = np.nonzero(ok)
        inside.append(np.stack([Xa[ia], np.full(len(ia), Yk), Zb[ib]], -1))
    out = np.concatenate(inside) if inside else np.zeros((0, 3))
    out.setflags(write=False)
    return out


def _inside(XYZ, inverse_npm, eps: float = 1e-12):
    """Mask of the XYZ rows (k, 3) whose RGB (inverse NPM times XYZ) lies in [0, 1]³; one
    channel at a time, which is several times faster than a (k, 3) @ (3, 3) product."""
    X, Y, Z = XYZ[:, 0], XYZ[:, 1], XYZ[:, 2]
    ok = np.ones(len(XYZ), dtype=bool)
    for row in np.asarray(inverse_npm, dtype=float):
        c = row[0] * X + row[1] * Y + row[2] * Z
        ok &= (c >= -eps) & (c <= 1 + eps)
    return ok


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
