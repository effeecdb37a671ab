"""Lot and supplier pages: the units of one lot (or supplier) on the diagrams, a
histogram per quantity with its limits, the statistics table and the lot's verdict."""
from __future__ import annotations

import re

import numpy as np

from ..assess.stats import _series
from .pages import SYMBOL, fmt

HISTOGRAM_MIN_UNITS = 10      # smaller lots get the table, not a histogram
MAX_TABLE_UNITS = 500

_DIGITS = {"cct": 1, "duv": 5, "delta_uv": 5, "box": 5, "ellipse": 3, "region": 5, "luminance": 1,
           "coverage": 2, "area-ratio": 2, "luminance_uniformity": 2, "colour_uniformity": 5}


def slug(text: str, taken: set) -> str:
    base = re.sub(r"[^A-Za-z0-9._-]+", "-", text).strip("-.") or "item"
    s, k = base, 2
    while s.lower() in taken:
        s, k = f"{base}-{k}", k + 1
    taken.add(s.lower())
    return s


def page_names(a) -> tuple[dict, dict]:
    taken: set = set()
    lots = {lot["lot"]: slug(lot["lot"], taken) for lot in a.lots}
    taken = set()
    sups = {s["supplier"]: slug(s["supplier"], taken) for s in a.suppliers}
    return lots, sups


def _stat_view(st) -> dict:
    d = _DIGITS.get(st["quantity"], 4)
    lim = st["limit"]
    limit = " to ".join(fmt(lim[k], d) for k in ("min", "max") if k in lim) if len(lim) == 2 else (
        f"≥ {fmt(lim['min'], d)}" if "min" in lim else f"≤ {fmt(lim['max'], d)}")
    return {"id": st["id"], "n": st["n"], "mean": fmt(st["mean"], d), "sd": fmt(st["sd"], d),
            "min": fmt(st["min"], d), "max": fmt(st["max"], d), "limit": limit,
            "out": fmt(st["out_of_tolerance_percent"], 1), "cp": fmt(st["cp"], 2), "cpk": fmt(st["cpk"], 2),
            "form": st["capability_form"],
            "worst": ", ".join(f"{w['serial']} ({w['verdict']})" for w in st["worst"])}


def _histograms(e, members, prefix: str) -> list[dict]:
    from . import charts as C  # imported only when a figure is drawn
    from . import figures as F

    a = e.assessment
    rule = a.rule
    out = []
    for c in a.columns:
        idx = members[c.code[members] >= 0]
        if idx.size < HISTOGRAM_MIN_UNITS:
            continue
        for suffix, values, lo, hi, _ in _series(c):
            ref = hi if hi is not None else lo
            # the column's own U; a relative U is taken at the limit
            guard = 0.0 if rule.name != "guard-banded" else (
                float(c.U) if np.ndim(c.U) == 0 else float(rule.U(c.quantity, ref)))
            xlabel = f"{c.quantity}{suffix}" + (f" (guard band w = U = {guard:.4g} at the limit)" if guard else "")
            fig, _ = C.histogram(values[idx], lo, hi, guard, f"{c.label}{suffix} — {c.subject}", xlabel)
            name = f"{prefix}-{c.id}{suffix}.svg"
            out.append({"file": name, "svg": F.save_svg(fig), "title": f"{c.id}{suffix}",
                        "alt": f"Histogram of {c.label}{suffix} for {c.subject} over {idx.size} units, with the "
                               "limits as vertical lines"})
    return out


def _diagrams(e, members, prefix: str, what: str, full: bool = True) -> list[dict]:
    """A lot's diagrams; none for lots smaller than HISTOGRAM_MIN_UNITS, whose units the
    spec page's diagrams already show legibly."""
    from . import figures as F  # imported only when a figure is drawn
    from .diagrams import layer_for

    out = []
    spec = e.spec
    if members.size < HISTOGRAM_MIN_UNITS:
        return out
    if spec.white is not None:
        fig, _ = F.white_closeup(layer_for(e, "white", members, f" — {what}"))
        out.append({"file": f"{prefix}-white.svg", "svg": F.save_svg(fig), "title": f"White point, {what}",
                    "alt": f"White target with the tolerance and the white of each unit of {what}"})
    if spec.primaries and (full or spec.white is None):
        fig, _ = F.chromaticity_diagram(layer_for(e, "uv", members, f" — {what}"), "uv")
        out.append({"file": f"{prefix}-uv.svg", "svg": F.save_svg(fig), "title": f"CIE 1976 u'v', {what}",
                    "alt": f"Spec gamut and tolerances with the primaries and white of each unit of {what}"})
    return out


def _units_view(a, members):
    shown = members if members.size <= MAX_TABLE_UNITS else \
        members[np.argsort(-a.unit_codes[members], kind="stable")][:MAX_TABLE_UNITS]
    return [dict(a.units[i], failing=", ".join(a.units[i]["failing"]), symbol=SYMBOL[a.units[i]["verdict"]])
            for i in shown.tolist()]


def lot_pages(e, env, decision: str, site_url: str | None = None, reload: bool = False):
    """[(path, bytes)] of every lot page and supplier page of a spec, figures included."""
    from .site import canonical

    a = e.assessment
    if a.table is None or not len(a.table):
        return []
    lot_names, sup_names = page_names(a)
    lot_arr = np.array(a.table.lot, dtype=object)
    sup_arr = np.array(a.table.supplier, dtype=object)
    files = []
    for lot in a.lots:
        members = np.flatnonzero(lot_arr == lot["lot"])
        name = lot_names[lot["lot"]]
        figs = _diagrams(e, members, name, f"lot {lot['lot']}")
        hists = _histograms(e, members, name)
        ctx = {"spec": e.spec, "what": f"Lot {lot['lot']}", "kind": "lot", "entry": lot, "decision": decision,
               "verdict": lot["verdict"], "symbol": SYMBOL[lot["verdict"]],
               "suppliers": [(s, sup_names.get(s)) for s in lot["suppliers"]],
               "stats": [_stat_view(s) for s in lot["statistics"]], "figures": figs, "histograms": hists,
               "units": _units_view(a, members), "n_units": int(members.size), "root": "../../",
               "lots": [], "canonical": canonical(site_url, f"{e.spec.id}/lots/{name}.html"), "reload": reload}
        files.append((f"lots/{name}.html", env.get_template("lot.html").render(**ctx)))
        files += [(f"lots/{f['file']}", f["svg"]) for f in figs + hists]
    for sup in a.suppliers:
        members = np.flatnonzero(sup_arr == sup["supplier"])
        name = sup_names[sup["supplier"]]
        figs = _diagrams(e, members, name, sup["supplier"], full=False)
        lots = [dict(lot, page=lot_names[lot["lot"]], symbol=SYMBOL[lot["verdict"]])
                for lot in a.lots if lot["lot"] in sup["lots"]]
        ctx = {"spec": e.spec, "what": sup["supplier"], "kind": "supplier", "entry": sup, "decision": decision,
               "verdict": sup["verdict"], "symbol": SYMBOL[sup["verdict"]], "suppliers": [],
               "stats": [], "figures": figs, "histograms": [], "units": _units_view(a, members),
               "n_units": int(members.size), "root": "../../", "lots": lots,
               "canonical": canonical(site_url, f"{e.spec.id}/suppliers/{name}.html"), "reload": reload}
        files.append((f"suppliers/{name}.html", env.get_template("lot.html").render(**ctx)))
        files += [(f"suppliers/{f['file']}", f["svg"]) for f in figs]
    return files
