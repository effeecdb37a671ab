"""One row per assessed limit: design targets first, then each measured unit."""
from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property

import numpy as np

from ..colour.convert import delta_uv_prime, xy_to_uv_prime
from ..colour.region import distance_to_polygon_edges, ellipse_radius, in_polygon
from ..derive import Derived
from ..model import Spec, Tolerance
from .rules import CODES, FAIL, DecisionRule, combine, decide, margin
from .stats import lot_statistics
from .units import unit_columns, unit_rows, unit_verdicts

UNITS = {"delta_uv": "", "cct": "K", "duv": "", "box": "", "ellipse": "", "region": "",
         "luminance": "cd/m2", "coverage": "%", "area-ratio": "%"}


@dataclass
class Assessment:
    design_rows: list[dict]
    verdict: str
    rule: DecisionRule
    units: list[dict] = field(default_factory=list)   # serial, lot, supplier, verdict, failing
    lots: list[dict] = field(default_factory=list)
    columns: list = field(default_factory=list)        # units.Column per requirement on units
    table: object = None                               # model.UnitTable
    unit_codes: object = None                          # np.ndarray of verdict codes per unit
    suppliers: list[dict] = field(default_factory=list)

    @cached_property
    def rows(self) -> list[dict]:
        """Design rows, then every unit's rows (built from the columns on first use)."""
        if self.table is None:
            return list(self.design_rows)
        return self.design_rows + list(unit_rows(self.columns, self.table,
                                                 self.rule.uncertainty is not None))


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


def assess(spec: Spec, derived: Derived, rule: DecisionRule | None = None) -> Assessment:
    if rule is None:
        rule = DecisionRule(spec.decision_rule, spec.uncertainty)
    rows: list[dict] = []
    if spec.white is not None:
        rows += tolerance_rows("white", "white", None, spec.white.tolerance, spec.white.xy, spec.white.xy,
                               rule, design=True, white=derived.white)
        rows += luminance_row(spec, spec.white.luminance.get("target"), None, rule)
    for p in spec.primaries:
        rows += tolerance_rows(f"primaries.{p.name}", p.name, None, p.tolerance, p.xy, p.xy, rule, design=True)
    rows += gamut_rows(spec, derived.gamut, None, rule) if spec.gamut else []

    table = spec.table
    cols = unit_columns(spec, table, derived.ref_hulls, rule) if table is not None and len(table) else []
    n = len(table) if table is not None else 0
    codes = unit_verdicts(cols, n)
    units, lots, suppliers = summarise(cols, table, codes) if n else ([], [], [])
    verdicts = [r["verdict"] for r in rows] + [CODES[k] for k in np.unique(codes)]
    verdict = combine(verdicts) if verdicts else "pass"
    return Assessment(rows, verdict, rule, units, lots, cols, table, codes, suppliers)


def summarise(cols, table, codes):
    """Unit entries, lots with statistics, and suppliers, from the columns."""
    failing = [[] for _ in range(len(table))]
    n_rows = np.zeros(len(table), int)
    for c in cols:
        n_rows += c.code >= 0
        for i in np.flatnonzero(c.code == 2):
            failing[i].append(c.id)
    units = [{"serial": s, "lot": lot, "supplier": sup, "verdict": CODES[k], "rows": int(nr), "failing": f,
              "source": src}
             for s, lot, sup, k, nr, f, src in zip(table.serial, table.lot, table.supplier, codes.tolist(),
                                                    n_rows.tolist(), failing, table.source)]
    lot_arr = np.array(table.lot, dtype=object)
    sup_arr = np.array(table.supplier, dtype=object)
    lots = []
    for lot in sorted({x for x in table.lot if x}):
        members = np.flatnonzero(lot_arr == lot)
        k = codes[members]
        lots.append({"lot": lot, "n": int(members.size), "n_fail": int(np.sum(k == 2)),
                     "suppliers": sorted({sup_arr[i] for i in members if sup_arr[i]}),
                     "verdict": CODES[int(k.max())], "n_pass": int(np.sum(k == 0)),
                     "n_indeterminate": int(np.sum(k == 1)),
                     "fail_percent": 100.0 * float(np.mean(k == 2)),
                     "statistics": lot_statistics(cols, table, members)})
    suppliers = []
    for sup in sorted({x for x in table.supplier if x}):
        members = np.flatnonzero(sup_arr == sup)
        k = codes[members]
        suppliers.append({"supplier": sup, "n": int(members.size), "n_fail": int(np.sum(k == 2)),
                          "n_indeterminate": int(np.sum(k == 1)), "n_pass": int(np.sum(k == 0)),
                          "lots": sorted({table.lot[i] for i in members if table.lot[i]}),
                          "verdict": CODES[int(k.max())]})
    return units, lots, suppliers

