"""One row per assessed limit: design targets first, then each measured unit."""
from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property
from itertools import islice

import numpy as np

from ..colour.convert import delta_uv_prime, xy_to_uv_prime
from ..colour.difference import delta_e_76, delta_e_2000
from ..colour.macadam import macadam_metric, macadam_steps, metric_axes
from ..colour.region import distance_to_polygon_edges, ellipse_radius, in_polygon
from ..colour.npm import npm_from_primaries
from ..derive import Derived, volume_figures
from ..model import Spec, Tolerance
from .lamp import lamp_columns
from .lamp import one_sample_rows as lamp_rows
from .rules import CODES, FAIL, DecisionRule, combine, decide, margin
from .stats import lot_statistics
from .units import Column, unit_columns, unit_rows, unit_verdicts

UNITS = {"delta_uv": "", "cct": "K", "duv": "", "box": "", "ellipse": "", "region": "",
         "luminance": "cd/m2", "coverage": "%", "area-ratio": "%", "volume": "%", "volume-coverage": "%",
         "delta_e2000": "", "delta_e76": "",
         "dominant_wavelength": "nm", "excitation_purity": "", "macadam_steps": "steps",
         "ellipse_of": "steps", "quadrangle_of": ""}


@dataclass
class Assessment:
    design_rows: list[dict]
    verdict: str
    rule: DecisionRule
    lots: list[dict] = field(default_factory=list)
    columns: list = field(default_factory=list)        # units.Column per requirement on units
    table: object = None                               # model.UnitTable
    unit_codes: object = None                          # np.ndarray of verdict codes per unit
    suppliers: list[dict] = field(default_factory=list)

    @cached_property
    def units(self) -> list[dict]:
        """Per unit: serial, lot, supplier, verdict, rows, failing, source (built on first use)."""
        if self.table is None or not len(self.table):
            return []
        return unit_entries(self.columns, self.table, self.unit_codes)

    @cached_property
    def rows(self) -> list[dict]:
        """Design rows, then every unit's rows (built from the columns on first use)."""
        if self.table is None:
            return list(self.design_rows)
        return self.design_rows + list(unit_rows(self.columns, self.table,
                                                 self.rule.uncertainty is not None))

    def unit_count(self, verdict: str | None = None) -> int:
        """Units assessed, or those with ``verdict`` (from the codes, without the entries)."""
        if self.table is None or not len(self.table):
            return 0
        if verdict is None:
            return len(self.table)
        return int(np.count_nonzero(np.asarray(self.unit_codes) == CODES.index(verdict)))

    def _unit_rows(self, units=None):
        if self.table is None or not self.columns:
            return iter(())
        return unit_rows(self.columns, self.table, self.rule.uncertainty is not None, units)

    def row_counts(self) -> dict[str, int]:
        """Rows in ``rows`` by verdict, and in all (from the codes, without building the rows)."""
        n = {v: sum(r["verdict"] == v for r in self.design_rows) for v in CODES}
        for c in self.columns:
            counts = np.bincount(c.code[c.code >= 0].astype(np.intp), minlength=len(CODES))
            for k, v in enumerate(CODES):
                n[v] += int(counts[k])
        n["rows"] = sum(n[v] for v in CODES)
        return n

    def unit_rows_shown(self, limit: int) -> list[dict]:
        """The unit rows of ``rows`` when there are at most ``limit``, else ``limit`` of them:
        those that do not pass first, then passing ones, each kind in order."""
        n = sum(int(np.count_nonzero(c.code >= 0)) for c in self.columns)
        if n <= limit:
            return list(self._unit_rows())
        shown = self._not_passing_unit_rows(limit)
        passing = (r for r in self._unit_rows() if r["verdict"] == "pass")
        return shown + list(islice(passing, limit - len(shown)))

    def not_passing_rows(self, limit: int) -> list[dict]:
        """The first ``limit`` rows of ``rows`` whose verdict is not pass."""
        out = [r for r in self.design_rows if r["verdict"] != "pass"][:limit]
        return out + self._not_passing_unit_rows(limit - len(out))

    def _not_passing_unit_rows(self, limit: int) -> list[dict]:
        """The first ``limit`` unit rows that do not pass, built only for the units that have one."""
        if limit <= 0 or not self.columns or self.table is None:
            return []
        bad = np.flatnonzero(np.any(np.stack([c.code > 0 for c in self.columns]), axis=0))
        return list(islice((r for r in self._unit_rows(bad.tolist()) if r["verdict"] != "pass"), limit))


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
        if tol.macadam_steps is not None:
            n = tol.macadam_steps
            s = float(macadam_steps(np.array(xy), np.array(target_xy)))
            a, b, ang = (float(v) for v in metric_axes(macadam_metric(np.array(target_xy))))
            rows.append(_row(f"{prefix}.macadam_steps", subject, sample, "macadam_steps", s,
                             {"max": n, "a1": a, "b1": b, "angle1": ang}, decide(s, None, n, rule=rule),
                             margin(s, None, n), "MacAdam steps from target (MacAdam 1942, interpolated)"))
    if tol.region is not None:
        poly = np.array(tol.region)
        inside = bool(in_polygon(np.array(xy), poly))
        d = 0.0 if inside else float(distance_to_polygon_edges(np.array(xy), poly))
        rows.append(_row(f"{prefix}.region", subject, sample, "region", d,
                         {"max": 0.0, "polygon": [list(p) for p in tol.region]},
                         "pass" if inside else FAIL, -d, "distance outside the xy region"))
    rows += lamp_rows(prefix, subject, sample, tol, xy, rule, design, _row)
    if white is not None:
        if tol.cct is not None:
            rows.append(_range_rows(prefix, subject, sample, "cct", white["cct_K"], tol.cct, "CCT", rule))
        if tol.duv is not None:
            rows.append(_range_rows(prefix, subject, sample, "duv", white["duv"], tol.duv, "Duv", rule))
    return rows


def _lab(fig):
    return None if fig["L"] is None or fig["a"] is None or fig["b"] is None else (fig["L"], fig["a"], fig["b"])


def colour_rows(colour, target_fig, fig, sample, rule, design=False):
    """Rows for a colour (an indicator, signal or brand colour) against its limits.

    ``target_fig`` and ``fig`` are colour_figures() of the target and of the sample (the
    target itself for the design row). Differences are assessed for samples only;
    region, dominant wavelength and excitation purity also for the design target.
    """
    tol = colour.tolerance
    prefix, name = f"colours.{colour.name}", colour.name
    xy = (fig["x"], fig["y"])
    rows = tolerance_rows(prefix, name, sample, tol, colour.xy, xy, rule, design=design)
    if not design:
        lab_t, lab_s = _lab(target_fig), _lab(fig)
        if tol.delta_e2000 is not None:
            mx, kL, kC, kH = tol.delta_e2000
            d = None if lab_t is None or lab_s is None else float(delta_e_2000(lab_s, lab_t, kL, kC, kH))
            rows.append(_row(f"{prefix}.delta_e2000", name, sample, "delta_e2000", d,
                             {"max": mx, "kL": kL, "kC": kC, "kH": kH}, decide(d, None, mx, rule=rule),
                             margin(d, None, mx), "CIEDE2000 ΔE00 from target"))
        if tol.delta_e76 is not None:
            d = None if lab_t is None or lab_s is None else float(delta_e_76(lab_s, lab_t))
            rows.append(_row(f"{prefix}.delta_e76", name, sample, "delta_e76", d, {"max": tol.delta_e76},
                             decide(d, None, tol.delta_e76, rule=rule), margin(d, None, tol.delta_e76),
                             "CIE 1976 ΔE*ab from target"))
    white = fig["reference_white"]
    if tol.dominant_wavelength is not None:
        lo, hi = tol.dominant_wavelength
        d = fig["dominant_wavelength_nm"]
        # a colour on the purple side has no dominant wavelength, so no range of it can hold
        verdict = FAIL if d is None and fig["complementary_wavelength_nm"] is not None else decide(d, lo, hi, rule=rule)
        rows.append(_row(f"{prefix}.dominant_wavelength", name, sample, "dominant_wavelength", d,
                         dict({k: v for k, v in (("min", lo), ("max", hi)) if v is not None}, white=white),
                         verdict, margin(d, lo, hi), "dominant wavelength"))
    if tol.excitation_purity is not None:
        lo, hi = tol.excitation_purity
        e = fig["excitation_purity"]
        rows.append(_row(f"{prefix}.excitation_purity", name, sample, "excitation_purity", e,
                         dict({k: v for k, v in (("min", lo), ("max", hi)) if v is not None}, white=white),
                         decide(e, lo, hi, rule=rule), margin(e, lo, hi), "excitation purity"))
    return rows


def gamut_rows(spec: Spec, figures, sample, rule, volume=None, only_volume=False):
    rows = []
    for g in spec.gamut:
        if only_volume and not g.metric.startswith("volume"):
            continue
        if g.metric.startswith("volume"):
            key = "volume_coverage" if g.metric == "volume-coverage" else "volume_ratio"
            vol = volume if volume is not None else (figures.volume if figures is not None else None)
            value = (vol or {}).get("vs", {}).get(g.reference, {}).get(key)
        else:
            key = f"{'coverage' if g.metric == 'coverage' else 'area_ratio'}_{g.diagram}"
            value = figures.vs[g.reference][key] if figures is not None else None
        limit = {k: v for k, v in (("min", g.min), ("max", g.max)) if v is not None}
        diagram = {"xy": "CIE 1931 xy", "uv": "CIE 1976 u'v'", "lab": "CIELAB"}[g.diagram]
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
        # the design white's luminance: the stated target, else that of a radiance spectrum
        rows += luminance_row(spec, spec.white.luminance.get("target", spec.white.Y), None, rule)
    for p in spec.primaries:
        rows += tolerance_rows(f"primaries.{p.name}", p.name, None, p.tolerance, p.xy, p.xy, rule, design=True)
    rows += gamut_rows(spec, derived.gamut, None, rule) if spec.gamut else []
    for c in spec.colours:
        fig = derived.colours[c.name]
        rows += colour_rows(c, fig, fig, None, rule, design=True)

    table = spec.table
    cols = unit_columns(spec, table, derived.ref_hulls, rule) if table is not None and len(table) else []
    if table is not None and len(table):
        cols = _with_lamp_columns(spec, table, cols, rule)
        cols += row_columns(spec, derived, table, rule)
    n = len(table) if table is not None else 0
    codes = unit_verdicts(cols, n)
    lots, suppliers = summarise(cols, table, codes) if n else ([], [])
    verdicts = [r["verdict"] for r in rows] + [CODES[k] for k in np.unique(codes)]
    verdict = combine(verdicts) if verdicts else "pass"
    return Assessment(rows, verdict, rule, lots, cols, table, codes, suppliers)


def _with_lamp_columns(spec: Spec, table, cols, rule):
    """The white's lighting-standard columns (``ellipse_of``, ``quadrangle_of``) placed after its
    other columns, so that a unit's rows keep the order of the one-unit builder."""
    if spec.white is None:
        return cols
    W = table.channels["white"]
    extra = lamp_columns("white", "white", spec.white.tolerance, W[:, :2], np.isfinite(W[:, 0]), rule)
    if not extra:
        return cols
    at = max((i + 1 for i, c in enumerate(cols) if c.subject == "white" and c.id.split(".")[1]
              not in ("cct", "duv", "luminance", "uniformity")), default=0)
    return cols[:at] + extra + cols[at:]


def _unit_volume(spec: Spec, table, i, names, volume_refs):
    """CIELAB volume figures of unit ``i`` of the table from its measured primaries, with its
    own white where measured, else the white target."""
    xy = [tuple(table.channels[nm][i, :2]) for nm in names]
    if not all(np.isfinite(v).all() for v in xy) or spec.white is None:
        return None
    W = table.channels.get("white")
    wxy = tuple(W[i, :2]) if W is not None and np.isfinite(W[i, 0]) else spec.white.xy
    m = npm_from_primaries(xy, wxy)
    return volume_figures(m, spec, volume_refs)


def row_columns(spec: Spec, derived: Derived, table, rule) -> list:
    """Columns for the unit requirements built row by row: CIELAB volume and measured
    indicator colours (inline ``units[].colours``), from the same builders as the design rows."""
    n = len(table)
    per_id: dict[str, list] = {}
    order: list[str] = []

    def add(i, r):
        if r["id"] not in per_id:
            per_id[r["id"]] = [None] * n
            order.append(r["id"])
        per_id[r["id"]][i] = r

    names = [p.name for p in spec.primaries]
    vol_gamut = [g for g in spec.gamut if g.metric.startswith("volume")]
    if vol_gamut and len(names) == 3:
        volume_refs = {g.reference for g in vol_gamut if g.metric == "volume-coverage"}
        for i in range(n):
            vol = _unit_volume(spec, table, i, names, volume_refs)
            if vol is None:
                continue
            for r in gamut_rows(spec, None, table.serial[i], rule, volume=vol, only_volume=True):
                add(i, r)
    if derived.unit_colours:
        by_name = {c.name: c for c in spec.colours}
        index = {}
        for i, s in enumerate(table.serial):
            index.setdefault(s, i)
        for serial, figs in derived.unit_colours.items():
            i = index.get(serial)
            if i is None:
                continue
            for name, fig in figs.items():
                for r in colour_rows(by_name[name], derived.colours[name], fig, serial, rule):
                    add(i, r)
    cols = []
    for rid in order:
        rs = per_id[rid]
        first = next(r for r in rs if r is not None)
        code = np.array([-1 if r is None else CODES.index(r["verdict"]) for r in rs], np.int8)
        value = np.array([r["value"] if r is not None and isinstance(r["value"], (int, float))
                          and r["value"] is not None else np.nan for r in rs], float)
        marg = np.array([r["margin"] if r is not None and r["margin"] is not None else np.nan for r in rs],
                        float)
        lo, hi = first["limit"].get("min"), first["limit"].get("max")
        form = "two-sided" if lo is not None and hi is not None else ("upper" if hi is not None else "lower")
        cols.append(Column(rid, first["subject"], first["quantity"], first["label"], first["limit"], value,
                           code, marg, rule.U(first["quantity"]), lo=lo, hi=hi, stat_form=form, rows=rs))
    return cols
def unit_entries(cols, table, codes) -> list[dict]:
    """One entry per unit: serial, lot, supplier, verdict, number of rows, failing row ids, source."""
    n = len(table)
    n_rows = np.zeros(n, int)
    for c in cols:
        n_rows += c.code >= 0
    fail = np.stack([c.code == 2 for c in cols], axis=1) if cols else np.zeros((n, 0), bool)
    ids = [c.id for c in cols]
    failing = [[] for _ in range(n)]
    for i, j in zip(*np.nonzero(fail), strict=True):        # row-major: each unit's ids in column order
        failing[i].append(ids[j])
    return [{"serial": s, "lot": lot, "supplier": sup, "verdict": CODES[k], "rows": nr, "failing": f,
             "source": src}
            for s, lot, sup, k, nr, f, src in zip(table.serial, table.lot, table.supplier, codes.tolist(),
                                                   n_rows.tolist(), failing, table.source)]


def _groups(names):
    """(sorted distinct non-empty names, index of each unit's name in them or -1)."""
    arr = np.array(names, dtype=str) if len(names) else np.zeros(0, str)
    keys, inverse = np.unique(arr, return_inverse=True)
    keep = keys != ""
    remap = np.where(keep, np.cumsum(keep) - 1, -1)
    return [str(k) for k in keys[keep]], remap[inverse.reshape(-1)]


def summarise(cols, table, codes):
    """Lots with statistics and suppliers, from the columns (units are grouped by sorting,
    not visited one by one)."""
    lot_names, lot_of = _groups(table.lot)
    sup_names, sup_of = _groups(table.supplier)
    order = np.argsort(lot_of, kind="stable")
    bounds = np.searchsorted(lot_of[order], np.arange(len(lot_names) + 1))
    n_lots = len(lot_names)
    # supplier sets per lot and lot sets per supplier, from the distinct (lot, supplier) pairs
    both = (lot_of >= 0) & (sup_of >= 0)
    seen = np.bincount(lot_of[both] * len(sup_names) + sup_of[both], minlength=n_lots * len(sup_names)) > 0
    pairs = np.stack(np.divmod(np.flatnonzero(seen), max(len(sup_names), 1)), axis=1)   # (lot, supplier)
    lots = []
    for g in range(n_lots):
        members = order[bounds[g]:bounds[g + 1]]          # ascending unit indices (stable sort)
        k = codes[members]
        lots.append({"lot": lot_names[g], "n": int(members.size), "n_fail": int(np.sum(k == 2)),
                     "suppliers": [sup_names[j] for j in pairs[pairs[:, 0] == g, 1]],
                     "verdict": CODES[int(k.max())], "n_pass": int(np.sum(k == 0)),
                     "n_indeterminate": int(np.sum(k == 1)),
                     "fail_percent": 100.0 * float(np.mean(k == 2)),
                     "statistics": lot_statistics(cols, table, members)})
    suppliers = []
    for g, sup in enumerate(sup_names):
        k = codes[sup_of == g]
        suppliers.append({"supplier": sup, "n": int(k.size), "n_fail": int(np.sum(k == 2)),
                          "n_indeterminate": int(np.sum(k == 1)), "n_pass": int(np.sum(k == 0)),
                          "lots": [lot_names[j] for j in pairs[pairs[:, 1] == g, 0]],
                          "verdict": CODES[int(k.max())]})
    return lots, suppliers
