"""Every measured unit against every limit at once: one column of values and verdict
codes per requirement, rows for results.json built from the columns on demand.

The limits, values and verdicts are those of ``requirements.tolerance_rows`` /
``gamut_rows`` / ``luminance_row`` for one unit (tests check the two agree), computed on
arrays so that a lot of 100,000 units takes seconds.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..colour.cct import cct_duv_from_xy
from ..colour.convert import xy_to_uv_prime
from ..colour.macadam import macadam_metric, macadam_steps, metric_axes
from ..colour.gamut_batch import area_ratio_many, coverage_many
from ..colour.region import distance_to_polygon_edges, ellipse_radius, in_polygon
from ..model import Spec, UnitTable
from .rules import CODES, DecisionRule, decide_many

UNITS = {"delta_uv": "", "cct": "K", "duv": "", "box": "", "ellipse": "", "region": "",
         "luminance": "cd/m2", "coverage": "%", "area-ratio": "%", "luminance_uniformity": "%",
         "colour_uniformity": "", "volume": "%", "volume-coverage": "%", "delta_e2000": "", "delta_e76": "",
         "dominant_wavelength": "nm", "excitation_purity": "", "macadam_steps": "steps",
         "ellipse_of": "steps", "quadrangle_of": ""}


@dataclass
class Column:
    """One requirement over all units. ``code`` is -1 where the unit was not assessed."""
    id: str
    subject: str
    quantity: str
    label: str
    limit: dict
    value: np.ndarray                   # (n,) the row's value; for box, |Δ| is in parts
    code: np.ndarray                    # (n,) int8
    margin: np.ndarray                  # (n,)
    U: object = 0.0                     # expanded uncertainty, scalar or (n,)
    extra: dict = field(default_factory=dict)
    parts: dict = field(default_factory=dict)   # box: {"dx": (n,), "dy": (n,)} signed offsets
    lo: float | None = None             # scalar limits of ``value`` for statistics
    hi: float | None = None
    stat_form: str = ""                 # how Cpk is formed for this limit
    rows: list | None = None            # per unit, the row itself where built row by row (else None)


def _col(cid, subject, quantity, label, limit, value, code, marg, mask, U=0.0, **kw):
    code = np.where(mask, code, np.int8(-1)).astype(np.int8)
    return Column(cid, subject, quantity, label, limit, value, code, marg, U, **kw)


def _range(cid, subject, quantity, label, value, lo, hi, mask, rule):
    U = rule.U(quantity, value)
    limit = {k: v for k, v in (("min", lo), ("max", hi)) if v is not None}
    m = np.minimum(value - lo if lo is not None else np.inf, hi - value if hi is not None else np.inf)
    form = "two-sided" if lo is not None and hi is not None else ("upper" if hi is not None else "lower")
    return _col(cid, subject, quantity, label, limit, value,
                decide_many(value, lo, hi, U, rule), m, mask, U, lo=lo, hi=hi, stat_form=form)


def tolerance_columns(prefix, subject, tol, target_xy, xy, mask, rule, white=None) -> list[Column]:
    """Columns for measured chromaticities ``xy`` (n, 2) against ``tol`` around the target."""
    cols = []
    n = len(xy)
    Uxy = rule.U("xy")
    if tol.delta_uv is not None:
        d = np.hypot(*(xy_to_uv_prime(xy) - xy_to_uv_prime(np.array(target_xy))).T) if n else np.zeros(0)
        c = _range(f"{prefix}.delta_uv", subject, "delta_uv", "Δu'v' from target", d, None, tol.delta_uv,
                   mask, rule)
        c.stat_form = "upper, radial (Δu'v' >= 0): Cpk = (r − mean) / 3s"
        cols.append(c)
    if tol.box is not None:
        dx, dy = xy[:, 0] - target_xy[0], xy[:, 1] - target_xy[1]
        code = np.maximum(decide_many(np.abs(dx), None, tol.box[0], Uxy, rule),
                          decide_many(np.abs(dy), None, tol.box[1], Uxy, rule))
        m = np.minimum(tol.box[0] - np.abs(dx), tol.box[1] - np.abs(dy))
        cols.append(_col(f"{prefix}.box", subject, "box", "xy box around target",
                         {"dx": tol.box[0], "dy": tol.box[1]}, m, code, m, mask, Uxy,
                         parts={"dx": dx, "dy": dy}, stat_form="two-sided per axis"))
    if tol.ellipse is not None:
        a, b, ang = tol.ellipse
        th = np.deg2rad(ang)
        px, py = xy[:, 0] - target_xy[0], xy[:, 1] - target_xy[1]
        u = px * np.cos(th) + py * np.sin(th)
        v = -px * np.sin(th) + py * np.cos(th)
        rr = ellipse_radius(u, v, a, b) if n else np.zeros(0)
        Ur = Uxy / min(a, b)
        code = decide_many(rr, None, 1.0, Ur, rule)
        c = _col(f"{prefix}.ellipse", subject, "ellipse", "xy ellipse around target (1 = on the ellipse)",
                 {"max": 1.0, "a": a, "b": b, "angle": ang}, rr, code, 1.0 - rr, mask, Ur, hi=1.0,
                 stat_form="upper, radial (normalised radius >= 0)")
        cols.append(c)
    if tol.macadam_steps is not None:
        ns = tol.macadam_steps
        t = np.array(target_xy)
        steps = macadam_steps(np.where(mask[:, None], xy, t), t) if n else np.zeros(0)
        a, b, ang = (float(v) for v in metric_axes(macadam_metric(t)))
        cols.append(_range(f"{prefix}.macadam_steps", subject, "macadam_steps",
                           "MacAdam steps from target (MacAdam 1942, interpolated)", steps, None, ns, mask, rule))
        cols[-1].limit = {"max": ns, "a1": a, "b1": b, "angle1": ang}
        cols[-1].stat_form = "upper, radial (MacAdam steps >= 0)"
    if tol.region is not None:
        poly = np.array(tol.region)
        inside = in_polygon(xy, poly) if n else np.zeros(0, bool)
        edge = distance_to_polygon_edges(xy, poly) if n else np.zeros(0)
        d = np.where(inside, 0.0, edge)
        if rule.name == "guard-banded" and Uxy > 0:
            code = decide_many(np.where(inside, -edge, edge), None, 0.0, Uxy, rule)
        else:
            code = np.where(inside, 0, 2).astype(np.int8)
        cols.append(_col(f"{prefix}.region", subject, "region", "distance outside the xy region",
                         {"max": 0.0, "polygon": [list(p) for p in tol.region]}, d, code, -d, mask, Uxy,
                         hi=0.0, stat_form="upper (distance outside, 0 inside)"))
    if white is not None:
        cct, duv = white
        if tol.cct is not None:
            cols.append(_range(f"{prefix}.cct", subject, "cct", "CCT", cct, *tol.cct, mask, rule))
        if tol.duv is not None:
            cols.append(_range(f"{prefix}.duv", subject, "duv", "Duv", duv, *tol.duv, mask, rule))
    return cols


def uniformity_columns(spec: Spec, table: UnitTable, rule) -> list[Column]:
    uni = spec.uniformity
    if uni is None or table.points is None:
        return []
    pts = table.points                               # (n, P, 3)
    n_pts = np.sum(np.isfinite(pts[:, :, 0]), axis=1)
    mask = n_pts >= 2
    cols = []
    if uni.luminance_min is not None:
        Y = pts[:, :, 2]
        lo = np.where(np.isnan(Y), np.inf, Y).min(axis=1)
        hi = np.where(np.isnan(Y), -np.inf, Y).max(axis=1)
        with np.errstate(invalid="ignore", divide="ignore"):
            # luminance uniformity = lowest / highest point luminance x 100 (min/max ratio)
            lu = np.where(mask & (hi > 0) & np.isfinite(lo), 100.0 * lo / hi, np.nan)
        cols.append(_range("white.uniformity.luminance", "white", "luminance_uniformity",
                           "luminance uniformity (lowest / highest point)", lu, uni.luminance_min, None,
                           mask & np.isfinite(lu), rule))
    if uni.colour_max is not None:
        uv = xy_to_uv_prime(pts[:, :, :2])           # (n, P, 2), NaN where no point
        if uni.colour_between == "centre":
            c = xy_to_uv_prime(table.channels["white"][:, :2])[:, None, :]
            d = np.hypot(*(uv - c).transpose(2, 0, 1))
            label = "colour uniformity (largest Δu'v' from the centre point)"
        else:
            d = np.hypot(*(uv[:, :, None, :] - uv[:, None, :, :]).transpose(3, 0, 1, 2)).reshape(len(uv), -1)
            label = "colour uniformity (largest Δu'v' between two points)"
        d = np.where(np.isnan(d), -np.inf, d).max(axis=1)
        d = np.where(np.isfinite(d), d, np.nan)
        c = _range("white.uniformity.colour", "white", "colour_uniformity", label, d, None, uni.colour_max,
                   mask, rule)
        c.stat_form = "upper (largest Δu'v' >= 0)"
        cols.append(c)
    return cols


def gamut_columns(spec: Spec, table: UnitTable, ref_hulls, rule) -> list[Column]:
    names = [p.name for p in spec.primaries]
    if not spec.gamut or not names:
        return []
    xy = np.stack([table.channels[nm][:, :2] for nm in names], axis=1)     # (n, k, 2)
    mask = np.all(np.isfinite(xy[:, :, 0]), axis=1)
    cols = []
    for g in spec.gamut:
        if g.metric.startswith("volume"):       # CIELAB volume: built row by row (requirements.row_columns)
            continue
        pts = xy if g.diagram == "xy" else xy_to_uv_prime(xy)
        hull = ref_hulls[g.reference][0 if g.diagram == "xy" else 1]
        if len(names) == 3:
            value = (coverage_many if g.metric == "coverage" else area_ratio_many)(np.where(mask[:, None, None], pts, 0), hull)
        else:
            from ..colour.gamut import area_ratio, coverage

            f = coverage if g.metric == "coverage" else area_ratio
            value = np.array([f(p, hull) if m else np.nan for p, m in zip(pts, mask)])
        diagram = "CIE 1931 xy" if g.diagram == "xy" else "CIE 1976 u'v'"
        c = _range(f"gamut.{g.reference}.{g.metric}.{g.diagram}", "gamut", g.metric,
                   f"{g.metric} of {spec.references[g.reference].title} ({diagram})", value, g.min, g.max,
                   mask, rule)
        c.U = rule.U("coverage")
        c.code = np.where(mask, decide_many(value, g.min, g.max, c.U, rule), np.int8(-1)).astype(np.int8)
        c.extra = {"reference": g.reference, "diagram": g.diagram}
        cols.append(c)
    return cols


def unit_columns(spec: Spec, table: UnitTable, ref_hulls, rule: DecisionRule) -> list[Column]:
    """Columns in the row order of one unit: white, its luminance, uniformity, each primary, gamut."""
    cols: list[Column] = []
    if spec.white is not None:
        W = table.channels["white"]
        mw = np.isfinite(W[:, 0])
        if len(W):
            cct, duv = cct_duv_from_xy(np.where(mw[:, None], W[:, :2], np.array(spec.white.xy)), spec.observer)
        else:
            cct, duv = np.zeros(0), np.zeros(0)
        cols += tolerance_columns("white", "white", spec.white.tolerance, spec.white.xy, W[:, :2], mw, rule,
                                  white=(cct, duv))
        lum = spec.white.luminance
        if "min" in lum or "max" in lum:
            Y = W[:, 2]
            cols.append(_range("white.luminance", "white", "luminance", "white luminance", Y, lum.get("min"),
                               lum.get("max"), mw & np.isfinite(Y), rule))
        cols += uniformity_columns(spec, table, rule)
    for p in spec.primaries:
        P = table.channels[p.name]
        cols += tolerance_columns(f"primaries.{p.name}", p.name, p.tolerance, p.xy, P[:, :2],
                                  np.isfinite(P[:, 0]), rule)
    cols += gamut_columns(spec, table, ref_hulls, rule)
    return cols


def unit_verdicts(cols: list[Column], n: int) -> np.ndarray:
    """Per unit: fail if any assessed row fails, else indeterminate if any is, else pass (codes)."""
    if not cols:
        return np.zeros(n, np.int8)
    return np.maximum(np.max(np.stack([c.code for c in cols]), axis=0), 0).astype(np.int8)


def _num(v):
    return v if v == v and v not in (np.inf, -np.inf) else None


def unit_rows(cols: list[Column], table: UnitTable, with_uncertainty: bool, units=None):
    """results.json rows of every unit (or of the unit indices ``units``, ascending), unit
    by unit, in column order (a generator)."""
    lists = [(c, c.code.tolist(), c.value.tolist(), c.margin.tolist(),
              np.broadcast_to(c.U, c.code.shape).tolist() if with_uncertainty else None,
              {k: v.tolist() for k, v in c.parts.items()}) for c in cols]
    serials = table.serial
    for i in (range(len(serials)) if units is None else units):
        serial, lot = serials[i], table.lot[i]
        for c, code, value, marg, U, parts in lists:
            k = code[i]
            if k < 0:
                continue
            if c.rows is not None:
                r = dict(c.rows[i])
                if U is not None:
                    r["uncertainty"] = U[i]
                r["lot"] = lot
                yield r
                continue
            v = {"dx": parts["dx"][i], "dy": parts["dy"][i]} if parts else _num(value[i])
            r = {"id": c.id, "subject": c.subject, "sample": serial, "quantity": c.quantity, "value": v,
                 "unit": UNITS.get(c.quantity, ""), "limit": c.limit, "verdict": CODES[k],
                 "margin": _num(marg[i]), "label": c.label}
            r.update(c.extra)
            if U is not None:
                r["uncertainty"] = U[i]
            r["lot"] = lot
            yield r
