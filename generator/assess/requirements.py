"""One row per assessed limit: design targets first, then each measured unit."""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..colour.convert import delta_uv_prime, xy_to_uv_prime
from ..colour.region import distance_to_polygon_edges, ellipse_radius, in_polygon
from ..derive import Derived
from ..model import Spec, Tolerance
from .rules import FAIL, SIMPLE, DecisionRule, combine, decide, margin

UNITS = {"delta_uv": "", "cct": "K", "duv": "", "box": "", "ellipse": "", "region": "",
         "luminance": "cd/m2", "coverage": "%", "area-ratio": "%"}


@dataclass
class Assessment:
    rows: list[dict]
    verdict: str
    rule: DecisionRule
    units: list[dict] = field(default_factory=list)   # serial, lot, supplier, verdict, failing
    lots: list[dict] = field(default_factory=list)


def _row(rid, subject, sample, quantity, value, limit, verdict, marg, label, **extra):
    r = {"id": rid, "subject": subject, "sample": sample, "quantity": quantity, "value": value,
         "unit": UNITS.get(quantity, ""), "limit": limit, "verdict": verdict, "margin": marg,
         "label": label}
    r.update(extra)
    return r


def _range_rows(prefix, subject, sample, quantity, value, rng, label, rule):
    lo, hi = rng
    limit = {k: v for k, v in (("min", lo), ("max", hi)) if v is not None}
    return _row(f"{prefix}.{quantity}", subject, sample, quantity, value, limit,
                decide(value, lo, hi, rule=rule), margin(value, lo, hi), label)


def tolerance_rows(prefix, subject, sample, tol: Tolerance, target_xy, xy, rule, design=False,
                   white=None):
    """Rows for a measured chromaticity ``xy`` against ``tol`` around ``target_xy``.

    For design targets (``design``) only limits that do not trivially hold at the
    target are assessed: CCT and Duv ranges and regions.
    """
    rows = []
    if not design:
        if tol.delta_uv is not None:
            d = float(delta_uv_prime(xy_to_uv_prime(np.array(xy)), xy_to_uv_prime(np.array(target_xy))))
            rows.append(_row(f"{prefix}.delta_uv", subject, sample, "delta_uv", d, {"max": tol.delta_uv},
                             decide(d, None, tol.delta_uv, rule=rule), margin(d, None, tol.delta_uv),
                             "Δu'v' from target"))
        if tol.box is not None:
            dx, dy = xy[0] - target_xy[0], xy[1] - target_xy[1]
            vx = decide(abs(dx), None, tol.box[0], rule=rule)
            vy = decide(abs(dy), None, tol.box[1], rule=rule)
            rows.append(_row(f"{prefix}.box", subject, sample, "box", {"dx": dx, "dy": dy},
                             {"dx": tol.box[0], "dy": tol.box[1]}, combine([vx, vy]),
                             min(tol.box[0] - abs(dx), tol.box[1] - abs(dy)), "xy box around target"))
        if tol.ellipse is not None:
            a, b, ang = tol.ellipse
            th = np.deg2rad(ang)
            px, py = xy[0] - target_xy[0], xy[1] - target_xy[1]
            u = px * np.cos(th) + py * np.sin(th)
            v = -px * np.sin(th) + py * np.cos(th)
            rr = float(ellipse_radius(u, v, a, b))
            rows.append(_row(f"{prefix}.ellipse", subject, sample, "ellipse", rr,
                             {"max": 1.0, "a": a, "b": b, "angle": ang}, decide(rr, None, 1.0, rule=rule),
                             margin(rr, None, 1.0), "xy ellipse around target (1 = on the ellipse)"))
    if tol.region is not None:
        poly = np.array(tol.region)
        inside = bool(in_polygon(np.array(xy), poly))
        d = 0.0 if inside else float(distance_to_polygon_edges(np.array(xy), poly))
        rows.append(_row(f"{prefix}.region", subject, sample, "region", d,
                         {"max": 0.0, "polygon": [list(p) for p in tol.region]},
                         "pass" if inside else FAIL, -d, "distance outside the xy region"))
    if white is not None:
        if tol.cct is not None:
            rows.append(_range_rows(prefix, subject, sample, "cct", white["cct_K"], tol.cct, "CCT", rule))
        if tol.duv is not None:
            rows.append(_range_rows(prefix, subject, sample, "duv", white["duv"], tol.duv, "Duv", rule))
    return rows


def gamut_rows(spec: Spec, figures, sample, rule):
    rows = []
    for g in spec.gamut:
        key = f"{'coverage' if g.metric == 'coverage' else 'area_ratio'}_{g.diagram}"
        value = figures.vs[g.reference][key] if figures is not None else None
        limit = {k: v for k, v in (("min", g.min), ("max", g.max)) if v is not None}
        diagram = "CIE 1931 xy" if g.diagram == "xy" else "CIE 1976 u'v'"
        rows.append(_row(f"gamut.{g.reference}.{g.metric}.{g.diagram}", "gamut", sample, g.metric, value,
                         limit, decide(value, g.min, g.max, rule=rule), margin(value, g.min, g.max),
                         f"{g.metric} of {spec.references[g.reference].title} ({diagram})",
                         reference=g.reference, diagram=g.diagram))
    return rows


def luminance_row(spec: Spec, Y, sample, rule):
    lum = spec.white.luminance if spec.white else {}
    if "min" not in lum and "max" not in lum:
        return []
    if Y is None:
        return []
    return [_range_rows("white", "white", sample, "luminance", Y, (lum.get("min"), lum.get("max")),
                        "white luminance", rule)]


def assess(spec: Spec, derived: Derived, rule: DecisionRule = SIMPLE) -> Assessment:
    rows: list[dict] = []
    if spec.white is not None:
        rows += tolerance_rows("white", "white", None, spec.white.tolerance, spec.white.xy, spec.white.xy,
                               rule, design=True, white=derived.white)
        rows += luminance_row(spec, spec.white.luminance.get("target"), None, rule)
    for p in spec.primaries:
        rows += tolerance_rows(f"primaries.{p.name}", p.name, None, p.tolerance, p.xy, p.xy, rule, design=True)
    rows += gamut_rows(spec, derived.gamut, None, rule) if spec.gamut else []

    units = []
    targets = {p.name: p for p in spec.primaries}
    for u, uf in zip(spec.units, derived.units, strict=True):
        urows: list[dict] = []
        if u.white is not None and spec.white is not None:
            urows += tolerance_rows("white", "white", u.serial, spec.white.tolerance, spec.white.xy,
                                    u.white.xy, rule, white=uf.white)
            urows += luminance_row(spec, u.white.Y, u.serial, rule)
        for name, m in u.primaries.items():
            p = targets[name]
            urows += tolerance_rows(f"primaries.{name}", name, u.serial, p.tolerance, p.xy, m.xy, rule)
        if uf.gamut is not None:
            urows += gamut_rows(spec, uf.gamut, u.serial, rule)
        for r in urows:
            r["lot"] = u.lot
        verdict = combine(r["verdict"] for r in urows) if urows else "pass"
        units.append({"serial": u.serial, "lot": u.lot, "supplier": u.supplier, "verdict": verdict,
                      "rows": len(urows), "failing": [r["id"] for r in urows if r["verdict"] == FAIL]})
        rows += urows
    lots = []
    for lot in sorted({u["lot"] for u in units if u["lot"]}):
        members = [u for u in units if u["lot"] == lot]
        lots.append({"lot": lot, "n": len(members),
                     "n_fail": sum(u["verdict"] == FAIL for u in members),
                     "suppliers": sorted({u["supplier"] for u in members if u["supplier"]}),
                     "verdict": combine(u["verdict"] for u in members)})
    verdict = combine(r["verdict"] for r in rows) if rows else "pass"
    return Assessment(rows, verdict, rule, units, lots)
