"""Correlated colour temperature and Duv by the CIE 15 definition.

CIE 15:2004 §9.5 (and CIE e-ILV 17-23-068): the CCT of a stimulus is the temperature of
the Planckian radiator whose chromaticity is nearest to it in the CIE 1960 UCS diagram
(u, v) = (u', 2/3 v'); Duv (ANSI C78.377; Ohno 2014, LEUKOS 10(1):47-55) is that distance,
positive above the locus (larger v). The CIE definition is stated for the CIE 1931
observer (CIE S 017:2011 term 17-258: "(CIE 1931 standard observer based) u', 2/3 v'";
wording recalled from memory, not confirmed against the text). ``observer="cie1964-10"``
computes the same construction entirely in the 10° observer (10° chromaticity against
the 10° Planckian locus): the 10° counterpart, not the CIE-defined CCT. A 10°
chromaticity cannot be turned into a 2° one without its spectrum, so a 10° spec gets its
CCT and Duv this way, consistently with its tolerances and targets.

Method: the locus is tabulated from Planck's law every 0.5 mired from 0.5 to 2010 mired
(2·10⁶ K to 497.5 K), each node with its exact chromaticity and exact derivative
d(u, v)/d(mired) (``planck.planck_uv_tangent``). Between nodes the locus is the piecewise
cubic Hermite interpolant of those values. A grid over the uv plane around the locus
(every 0.004 in u and v) holds the foot of the perpendicular of each grid node; a point's
start value is the bilinear interpolation of its cell, and three Newton steps on
d/dm |uv(m) − p|² = 0 on the interpolant converge to the foot. Points in a cell farther
than 0.07 from the locus (0.7 × its smallest radius of curvature, 0.10 at about 5200 K,
so that nearer points have a single nearest point), near the ends of the table, or where
Newton has not converged take the slow path: the nearest node of the table (a search on
every 16th node, then on the 65 nodes around the winner), then Newton steps until they
converge.

Interpolation error, the only approximation. The cubic Hermite interpolant errs by
h⁴/384 · max|uv⁗| in position and by O(h³) in its tangent (de Boor, A Practical Guide to
Splines, 2001, ch. IV). Measured against Planck's law at the midpoints between nodes,
where the position error peaks: at most 1.3e-12 in uv over the table and 4.3e-14 over
1000-25000 K, i.e. at most 7.5e-8 K in CCT on the locus over 1000-25000 K (2.1e-4 K at
10⁶ K). Off the locus the tangent error tilts the isotherms slightly, in proportion to Duv:
against ``cct_duv_from_uv_exact`` (Newton's method on Planck's law itself, kept for this
purpose) CCT differs by at most 2.3e-5 K and Duv by at most 4e-14 over 1000-25000 K and
|Duv| <= 0.05 (tests/test_colour_cct.py checks a dense grid against 5e-5 K and 1e-12).
Beyond 25000 K the error in kelvin grows as T² (up to 5e-8 of T, about 0.01 K at 6·10⁵ K).
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from .convert import uv1960_to_xy, xy_to_uv1960
from .planck import planck_uv, planck_uv_tangent

METHOD = ("nearest Planckian point in CIE 1960 uv (CIE 15:2004 §9.5), with the spec's observer: Newton's "
          "method on a cubic Hermite interpolant of Planck's law tabulated every 0.5 mired (interpolation "
          "error below 1e-4 K over 1000-25000 K, |Duv| <= 0.05)")
T_MIN, T_MAX = 500.0, 1.0e6
MIRED_STEP = 0.5
MIRED_LO, MIRED_HI = 0.5, 2010.0       # table ends, just beyond 1e6/T_MAX and 1e6/T_MIN
GRID_STEP = 0.004                      # start-value grid over the uv plane
TUBE = 0.07                            # fast path only this near the locus (radius of curvature >= 0.10)
_NEWTON_FAST = 3
_NEWTON_MAX = 12
_CONVERGED = 1e-7                      # last Newton step (table steps) counted as converged: error ~ its square
_CHUNK = 1024                          # slow path and exact method: points per block
_BLOCK = 8192                          # fast path: points per block
_COARSE = 16


@dataclass(frozen=True)
class LocusTable:
    """The Planckian locus of one observer at equal mired steps, with its Hermite cubics."""
    observer: str
    mired: np.ndarray          # (N,) nodes
    uv: np.ndarray             # (N, 2) CIE 1960 uv at the nodes, from Planck's law
    duv_dmired: np.ndarray     # (N, 2) exact d(u, v)/d(mired) at the nodes
    coef: np.ndarray           # (N − 1, 8): u then v, c0 + c1 s + c2 s² + c3 s³ for s in [0, 1]
    grid_origin: tuple[float, float]
    grid_mired: np.ndarray     # (nu, nv) foot of the perpendicular of each grid node (mired)
    grid_fast: np.ndarray      # (nu − 1, nv − 1) bool: the cell may take the fast path
    tube: float                # fast path within this distance: 0.7 × the smallest radius of curvature, ≤ TUBE


def _hermite_coefficients(uv, d):
    """Power-form cubics of the Hermite interpolant on each interval, in s = (m − m_i)/h."""
    p0, p1 = uv[:-1], uv[1:]
    d0, d1 = d[:-1] * MIRED_STEP, d[1:] * MIRED_STEP
    # cubic Hermite: H(s) = p0 + d0 s + (3Δ − 2d0 − d1) s² + (d0 + d1 − 2Δ) s³, Δ = p1 − p0
    delta = p1 - p0
    c = np.stack([p0, d0, 3 * delta - 2 * d0 - d1, d0 + d1 - 2 * delta], axis=-1)   # (N-1, 2, 4)
    return np.ascontiguousarray(c.reshape(len(p0), 8))


_TABLE_ARRAYS = ("mired", "uv", "duv_dmired", "coef", "grid_mired", "grid_fast")


@lru_cache(maxsize=4)
def locus_table(observer: str = "cie1931-2") -> LocusTable:
    """The Planckian locus table of ``observer``: built once per process, or read from the
    table cache (generator/tablecache.py) where an earlier process stored it."""
    from ..tablecache import stored_arrays

    def arrays():
        t = build_locus_table(observer)
        return {**{k: getattr(t, k) for k in _TABLE_ARRAYS},
                "grid_origin": np.array(t.grid_origin), "tube": np.array(t.tube)}

    a = stored_arrays("planck-locus", f"{observer} {MIRED_LO} {MIRED_HI} {MIRED_STEP} {GRID_STEP} {TUBE}", arrays)
    for k in _TABLE_ARRAYS:
        a[k].setflags(write=False)
    return LocusTable(observer, a["mired"], a["uv"], a["duv_dmired"], a["coef"],
                      (float(a["grid_origin"][0]), float(a["grid_origin"][1])), a["grid_mired"], a["grid_fast"],
                      float(a["tube"]))


def build_locus_table(observer: str = "cie1931-2") -> LocusTable:
    """The Planckian locus table of ``observer``, computed from Planck's law and the CMFs."""
    mired = np.arange(MIRED_LO, MIRED_HI + MIRED_STEP / 2, MIRED_STEP)
    T = 1e6 / mired
    # in blocks: the (nodes x wavelengths) temporaries then stay in cache
    parts = [planck_uv_tangent(T[i:i + 256], observer) for i in range(0, len(T), 256)]
    uv = np.concatenate([a for a, _ in parts])
    duv_dT = np.concatenate([b for _, b in parts])
    # chain rule: T = 10⁶/m, so d/dm = −(T²/10⁶) d/dT
    d = duv_dT * (-(T * T) / 1e6)[:, None]
    coef = _hermite_coefficients(uv, d)
    for a in (mired, uv, d, coef):
        a.setflags(write=False)
    # curvature of the interpolant at the nodes, κ = |u'v'' − v'u''| / |q'|³ (s = 0: q' = c1, q'' = 2 c2)
    kappa = np.abs(coef[:, 1] * 2 * coef[:, 6] - coef[:, 5] * 2 * coef[:, 2]) / np.hypot(coef[:, 1], coef[:, 5]) ** 3
    tube = min(TUBE, 0.7 / float(kappa.max()))
    partial = LocusTable(observer, mired, uv, d, coef, (0.0, 0.0), np.zeros((0, 0)), np.zeros((0, 0), bool), tube)
    lo = uv.min(axis=0) - tube - 2 * GRID_STEP
    hi = uv.max(axis=0) + tube + 2 * GRID_STEP
    gu = lo[0] + GRID_STEP * np.arange(int(np.ceil((hi[0] - lo[0]) / GRID_STEP)) + 1)
    gv = lo[1] + GRID_STEP * np.arange(int(np.ceil((hi[1] - lo[1]) / GRID_STEP)) + 1)
    nodes = np.stack(np.meshgrid(gu, gv, indexing="ij"), axis=-1).reshape(-1, 2)
    m, dist, ok = _slow(partial, nodes)
    m = m.reshape(len(gu), len(gv))
    near = (ok & (dist <= tube)).reshape(len(gu), len(gv))
    # a cell is fast when its four corners are near the locus with feet inside the table
    inner = near & (m > MIRED_LO + 4 * MIRED_STEP) & (m < MIRED_HI - 4 * MIRED_STEP)
    fast = inner[:-1, :-1] & inner[1:, :-1] & inner[:-1, 1:] & inner[1:, 1:]
    m.setflags(write=False)
    fast.setflags(write=False)
    return LocusTable(observer, mired, uv, d, coef, (float(lo[0]), float(lo[1])), m, fast, tube)


def _evaluate(table: LocusTable, m):
    """Interpolated u, v and their first and second derivatives in s (table steps) at mired m."""
    n_int = len(table.coef)
    t = (m - MIRED_LO) / MIRED_STEP
    i = np.clip(t.astype(np.intp), 0, n_int - 1)
    s = t - i
    c = table.coef[i]
    u = ((c[:, 3] * s + c[:, 2]) * s + c[:, 1]) * s + c[:, 0]
    v = ((c[:, 7] * s + c[:, 6]) * s + c[:, 5]) * s + c[:, 4]
    du = (3 * c[:, 3] * s + 2 * c[:, 2]) * s + c[:, 1]
    dv = (3 * c[:, 7] * s + 2 * c[:, 6]) * s + c[:, 5]
    d2u = 6 * c[:, 3] * s + 2 * c[:, 2]
    d2v = 6 * c[:, 7] * s + 2 * c[:, 6]
    return u, v, du, dv, d2u, d2v


def _newton(table: LocusTable, pu, pv, m, steps: int, until_converged: bool = False):
    """Newton's method on F(m) = (q(m) − p)·q'(m) = 0 on the interpolant; returns m and the last step."""
    step = np.full(m.shape, np.inf)
    for _ in range(steps):
        if until_converged and np.all(np.abs(step) <= _CONVERGED):
            break
        u, v, du, dv, d2u, d2v = _evaluate(table, m)
        ru, rv = u - pu, v - pv
        f = ru * du + rv * dv
        fp = du * du + dv * dv + ru * d2u + rv * d2v
        with np.errstate(divide="ignore", invalid="ignore"):
            step = np.where(fp > 0, f / fp, 0.0)           # in table steps (s units)
        m = np.clip(m - step * MIRED_STEP, MIRED_LO, MIRED_HI)
    return m, step


def _slow(table: LocusTable, p):
    """Feet (mired), distances and a finite-flag for points p (n, 2): nearest node, then Newton."""
    n = len(p)
    m = np.full(n, np.nan)
    dist = np.full(n, np.nan)
    ok = np.zeros(n, bool)
    uv_tab = table.uv
    coarse = uv_tab[::_COARSE]
    window = np.arange(-2 * _COARSE, 2 * _COARSE + 1)
    with np.errstate(over="ignore", invalid="ignore"):
        for start in range(0, n, _CHUNK):
            q = p[start:start + _CHUNK]
            d2c = ((q[:, None, :] - coarse[None, :, :]) ** 2).sum(axis=-1)
            i0 = np.argmin(d2c, axis=1) * _COARSE
            win = np.clip(i0[:, None] + window[None, :], 0, len(uv_tab) - 1)
            d2 = ((q[:, None, :] - uv_tab[win]) ** 2).sum(axis=-1)
            k = np.argmin(d2, axis=1)
            finite = np.isfinite(d2[np.arange(len(q)), k])
            m0 = table.mired[win[np.arange(len(q)), k]]
            mm, _ = _newton(table, q[:, 0], q[:, 1], m0, _NEWTON_MAX, until_converged=True)
            u, v, *_ = _evaluate(table, mm)
            m[start:start + len(q)] = mm
            dist[start:start + len(q)] = np.hypot(u - q[:, 0], v - q[:, 1])
            ok[start:start + len(q)] = finite & np.isfinite(mm)
    return m, dist, ok


def _start_values(table: LocusTable, pu, pv):
    """Bilinear start values from the grid, and whether each point may take the fast path."""
    gu = (pu - table.grid_origin[0]) / GRID_STEP
    gv = (pv - table.grid_origin[1]) / GRID_STEP
    nu, nv = table.grid_fast.shape
    inside = (gu >= 0) & (gu < nu) & (gv >= 0) & (gv < nv)
    iu = np.where(inside, gu, 0).astype(np.intp)
    iv = np.where(inside, gv, 0).astype(np.intp)
    fast = inside & table.grid_fast[iu, iv]
    a, b = gu - iu, gv - iv
    g = table.grid_mired
    m0 = ((1 - a) * ((1 - b) * g[iu, iv] + b * g[iu, iv + 1])
          + a * ((1 - b) * g[iu + 1, iv] + b * g[iu + 1, iv + 1]))
    return np.where(fast, m0, MIRED_LO), fast


def cct_duv_from_uv(uv, observer: str = "cie1931-2"):
    """CCT (K) and Duv for CIE 1960 uv points, shape (..., 2) -> two arrays of shape (...).

    Points whose nearest Planckian point lies outside 500 K to 10⁶ K, or that are NaN,
    give NaN. CIE 15 holds CCT meaningful only for |Duv| <= 0.05; callers report that.
    """
    uv = np.asarray(uv, dtype=float)
    shape = uv.shape[:-1]
    flat = uv.reshape(-1, 2)
    table = locus_table(observer)
    if len(flat) <= _BLOCK:
        cct, duv = _cct_duv_flat(table, flat)
    else:   # in blocks, so that the temporaries stay in cache
        parts = [_cct_duv_flat(table, flat[i:i + _BLOCK]) for i in range(0, len(flat), _BLOCK)]
        cct, duv = np.concatenate([c for c, _ in parts]), np.concatenate([d for _, d in parts])
    return cct.reshape(shape), duv.reshape(shape)


def _cct_duv_flat(table: LocusTable, flat):
    pu, pv = flat[:, 0], flat[:, 1]
    # NaN, inf and points far outside the diagram end as NaN below: no warnings on the way
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        m0, fast = _start_values(table, pu, pv)
        m, step = _newton(table, pu, pv, m0, _NEWTON_FAST)
    slow = ~fast | ~(np.abs(step) <= _CONVERGED)
    ok = np.ones(len(flat), bool)
    if slow.any():
        idx = np.nonzero(slow)[0]
        fin = np.all(np.isfinite(flat[idx]), axis=1)
        ok[idx[~fin]] = False
        idx = idx[fin]
        if idx.size:
            ms, _, oks = _slow(table, flat[idx])
            m[idx] = ms
            ok[idx] = oks
    u, v, *_ = _evaluate(table, m)
    with np.errstate(over="ignore", invalid="ignore"):
        dist = np.hypot(pu - u, pv - v)
        T = 1e6 / m
    sign = np.where(pv >= v, 1.0, -1.0)
    good = ok & (T >= T_MIN) & (T <= T_MAX) & np.isfinite(dist)
    return np.where(good, T, np.nan), np.where(good, sign * dist, np.nan)


def cct_duv_from_xy(xy, observer: str = "cie1931-2"):
    return cct_duv_from_uv(xy_to_uv1960(xy), observer)


def cct_duv_from_uv_exact(uv, observer: str = "cie1931-2"):
    """The same quantity by Newton's method on Planck's law itself (no interpolation): the
    nearest node of the table, then Newton on d/dT |uv(T) − p|² = 0 with the exact first and
    second derivatives of Planck's law. Slow (about 30 µs a point); kept as the reference
    against which the interpolated method is checked."""
    uv = np.asarray(uv, dtype=float)
    shape = uv.shape[:-1]
    flat = uv.reshape(-1, 2)
    cct = np.full(flat.shape[0], np.nan)
    duv = np.full(flat.shape[0], np.nan)
    table = locus_table(observer)
    T_tab = 1e6 / table.mired
    idx_ok = np.nonzero(np.all(np.isfinite(flat), axis=1))[0]
    coarse = table.uv[::_COARSE]
    window = np.arange(-2 * _COARSE, 2 * _COARSE + 1)
    # points far outside the diagram overflow the squared distances: they end as NaN
    with np.errstate(over="ignore", invalid="ignore"):
        for start in range(0, idx_ok.size, _CHUNK):
            sel = idx_ok[start:start + _CHUNK]
            p = flat[sel]
            i0 = np.argmin(((p[:, None, :] - coarse[None, :, :]) ** 2).sum(axis=-1), axis=1) * _COARSE
            win = np.clip(i0[:, None] + window[None, :], 0, len(T_tab) - 1)
            d2 = ((p[:, None, :] - table.uv[win]) ** 2).sum(axis=-1)
            T = T_tab[win[np.arange(len(p)), np.argmin(d2, axis=1)]]
            for _ in range(_NEWTON_MAX):
                q, dq, d2q = planck_uv(T, derivatives=True, observer=observer)
                r = q - p
                f = (r * dq).sum(axis=-1)
                fp = (dq * dq).sum(axis=-1) + (r * d2q).sum(axis=-1)
                step = np.where(fp > 0, f / fp, 0.0)
                T = np.clip(T - step, T_MIN * 0.995, T_MAX * 1.005)
                if np.all(np.abs(step) <= 1e-10 * T):   # converged (quadratically) for every point
                    break
            q = planck_uv(T, observer=observer)
            dist = np.hypot(*(p - q).T)
            sign = np.where(p[:, 1] >= q[:, 1], 1.0, -1.0)
            inside = (T >= T_MIN) & (T <= T_MAX) & np.isfinite(dist)
            cct[sel] = np.where(inside, T, np.nan)
            duv[sel] = np.where(inside, sign * dist, np.nan)
    return cct.reshape(shape), duv.reshape(shape)


def planck_uv_interpolated(T, observer: str = "cie1931-2"):
    """CIE 1960 uv of the Planckian radiator at T and d(u, v)/dT, from the table's Hermite
    interpolant inside it (1e6/T in 0.5-2010 mired) and from Planck's law outside."""
    T = np.asarray(T, dtype=float)
    flat = T.reshape(-1)
    table = locus_table(observer)
    with np.errstate(divide="ignore", invalid="ignore"):
        m = 1e6 / flat
    inside = np.isfinite(m) & (m >= MIRED_LO) & (m <= MIRED_HI) & (flat > 0)
    uv = np.empty(flat.shape + (2,))
    duv_dT = np.empty(flat.shape + (2,))
    if inside.any():
        mi = m[inside]
        u, v, du, dv, _, _ = _evaluate(table, mi)
        # chain rule: d/dT = d/ds · ds/dm · dm/dT, ds/dm = 1/h, dm/dT = −10⁶/T²
        k = -(mi * mi) / 1e6 / MIRED_STEP
        uv[inside] = np.stack([u, v], axis=-1)
        duv_dT[inside] = np.stack([du * k, dv * k], axis=-1)
    if (~inside).any():
        q, dq = planck_uv_tangent(flat[~inside], observer)
        uv[~inside] = q
        duv_dT[~inside] = dq
    return uv.reshape(T.shape + (2,)), duv_dT.reshape(T.shape + (2,))


def uv_from_cct_duv(cct, duv=0.0, observer: str = "cie1931-2"):
    """CIE 1960 uv at distance Duv from the Planckian point at CCT, along the normal.

    Inverse of ``cct_duv_from_uv`` (on the same interpolated locus): uv = uv_P(T) + Duv · n,
    with n the unit normal to the locus pointing to larger v (Ohno 2014, LEUKOS 10(1),
    eq. 12-13 in that sense).
    """
    cct, duv = np.broadcast_arrays(np.asarray(cct, dtype=float), np.asarray(duv, dtype=float))
    q, dq = planck_uv_interpolated(cct, observer)
    n = np.stack([dq[..., 1], -dq[..., 0]], axis=-1)
    with np.errstate(divide="ignore", invalid="ignore"):
        n = n / np.linalg.norm(n, axis=-1, keepdims=True)
    return q + duv[..., None] * n


def xy_from_cct_duv(cct, duv=0.0, observer: str = "cie1931-2"):
    return uv1960_to_xy(uv_from_cct_duv(cct, duv, observer))
