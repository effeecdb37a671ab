"""Each spec's diagrams and the numbers drawn on them.

``spec_figures(e)`` gives, per diagram: the SVG (with <title>/<desc>), alt text, and the
plotted points as rows, so that the page's table beside the figure, its CSV and its JSON
download all come from exactly what was drawn.
"""
from __future__ import annotations

import csv
import hashlib
import io
import json
import pickle
import re
from collections import OrderedDict

import numpy as np

from ..assess.rules import SYMBOL
from ..colour.convert import xy_to_uv_prime
from . import figures as F
from .pages import fmt


def tolerance_shapes(tol, centre_xy, label):
    shapes = []
    if tol.delta_uv is not None:
        shapes.append((f"{label}: Δu'v' ≤ {tol.delta_uv:g}", F.uv_circle_xy(centre_xy, tol.delta_uv)))
    if tol.box is not None:
        shapes.append((f"{label}: xy box", F.box_xy(centre_xy, *tol.box)))
    if tol.ellipse is not None:
        shapes.append((f"{label}: xy ellipse", F.ellipse_xy(centre_xy, *tol.ellipse)))
    if tol.region is not None:
        shapes.append((f"{label}: region", np.array(tol.region)))
    if tol.cct is not None or tol.duv is not None:
        shapes.append((f"{label}: CCT × Duv", F.cct_duv_quad_xy(tol.cct or (None, None), tol.duv or (None, None))))
    return shapes


MAX_PLOTTED = 1500   # units drawn per diagram: every unit that does not pass, then passing ones evenly


def plotted_units(e, members=None) -> np.ndarray:
    """Indices of the units a diagram shows (all of them up to MAX_PLOTTED)."""
    a = e.assessment
    n = len(a.table) if a.table is not None else 0
    idx = np.arange(n) if members is None else np.asarray(members)
    if idx.size <= MAX_PLOTTED:
        return idx
    codes = a.unit_codes[idx]
    bad, good = idx[codes > 0], idx[codes == 0]
    room = max(0, MAX_PLOTTED - bad.size)
    keep = good[np.linspace(0, good.size - 1, room).astype(int)] if room and good.size else good[:0]
    return np.sort(np.concatenate([bad[:MAX_PLOTTED], keep]))


def _unit_points(e, channels, idx):
    """(serial and channel, (x, y), verdict) of each measured channel of the units ``idx``,
    inline or from measurement files."""
    a, t = e.assessment, e.assessment.table
    out = []
    for i in idx.tolist():
        v = ("pass", "indeterminate", "fail")[a.unit_codes[i]]
        for c in channels:
            m = t.channels[c][i]
            if np.isfinite(m[0]):
                out.append((f"{t.serial[i]} {c}", (float(m[0]), float(m[1])), v))
    return out


def layer_for(e, which: str, members=None, title_suffix: str = "") -> F.Layer:
    """A diagram's layer; ``members`` limits the units to those indices (a lot's page)."""
    spec = e.spec
    idx = plotted_units(e, members)
    shown = []
    for g in spec.gamut:
        if g.reference not in shown:
            shown.append(g.reference)
    refs = [(spec.references[key].title, e.derived.ref_hulls[key][0]) for key in shown]
    if which == "white":
        tol = tolerance_shapes(spec.white.tolerance, spec.white.xy, "white")
        units = _unit_points(e, ["white"], idx)
        return F.Layer("White point, CIE 1976 u'v'" + title_suffix, None, [], spec.white.xy, [], tol, units,
                       spec.observer)
    tol = []
    for p in spec.primaries:
        tol += tolerance_shapes(p.tolerance, p.xy, p.name)
    if spec.white is not None:
        tol += [t for t in tolerance_shapes(spec.white.tolerance, spec.white.xy, "white") if "CCT" not in t[0]]
    units = _unit_points(e, [p.name for p in spec.primaries] + ["white"], idx)
    gamut = e.derived.gamut.hull_xy if e.derived.gamut is not None else None
    title = "CIE 1931 xy chromaticity diagram" if which == "xy" else "CIE 1976 u'v' chromaticity diagram"
    return F.Layer(title + title_suffix, gamut, [(p.name, p.xy) for p in spec.primaries],
                   spec.white.xy if spec.white else None, refs, tol, units, spec.observer)


AXES = {"xy": ("x", "y"), "uv": ("u'", "v'"), "white": ("u'", "v'")}
_KEYS = {"xy": ("x", "y"), "uv": ("u_prime", "v_prime"), "white": ("u_prime", "v_prime")}


def plotted_points(layer: F.Layer, which: str) -> list[dict]:
    """Every marked point of a diagram in its own coordinates: targets, units, reference
    corners and each tolerance outline's centre of its drawn vertices (outlines in JSON)."""
    def co(xy):
        xy = np.asarray(xy, dtype=float)
        return xy if which == "xy" else xy_to_uv_prime(xy)

    rows = []
    for name, xy in layer.primaries:
        rows.append({"kind": "target", "name": name, "at": co(xy), "verdict": ""})
    if layer.white_xy is not None:
        rows.append({"kind": "target", "name": "white", "at": co(layer.white_xy), "verdict": ""})
    for label, xy, verdict in layer.units:
        rows.append({"kind": "unit", "name": label, "at": co(xy), "verdict": verdict})
    for title, hull in layer.references:
        for k, xy in enumerate(np.asarray(hull)):
            rows.append({"kind": "reference", "name": f"{title} corner {k + 1}", "at": co(xy), "verdict": ""})
    return rows


def _data_json(which, layer, rows) -> str:
    a, b = _KEYS[which]
    doc = {
        "figure": which, "title": layer.title, "coordinates": [a, b], "observer": layer.observer,
        "points": [{"kind": r["kind"], "name": r["name"], a: float(r["at"][0]), b: float(r["at"][1]),
                    **({"verdict": r["verdict"]} if r["verdict"] else {})} for r in rows],
        "tolerances": [{"label": label, "outline": [[float(v) for v in p] for p in
                        (np.asarray(poly) if which == "xy" else xy_to_uv_prime(np.asarray(poly)))]}
                       for label, poly in layer.tolerances],
    }
    return json.dumps(doc, indent=1, ensure_ascii=False) + "\n"


def _data_csv(which, rows) -> str:
    a, b = _KEYS[which]
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["kind", "name", a, b, "verdict"])
    for r in rows:
        w.writerow([r["kind"], r["name"], f"{r['at'][0]:.6f}", f"{r['at'][1]:.6f}", r["verdict"]])
    return buf.getvalue()


def _n_units(e) -> int:
    return len(e.assessment.table) if e.assessment.table is not None else 0


def _alt(e, which) -> str:
    spec = e.spec
    if which == "white":
        t = e.assessment.table
        n = int(t.measured("white").sum()) if t is not None else 0
        return (f"White target at x {spec.white.xy[0]:.4f}, y {spec.white.xy[1]:.4f} in CIE 1976 u'v' with the "
                f"Planckian locus, isotherms, lines of constant Duv and the tolerance drawn to scale; "
                f"{n} measured unit whites marked by verdict. The numbers are in the table beside it.")
    names = ", ".join(p.name for p in spec.primaries) or "none"
    refs = ", ".join(dict.fromkeys(spec.references[g.reference].title for g in spec.gamut)) or "none"
    d = "CIE 1931 xy" if which == "xy" else "CIE 1976 u'v'"
    return (f"{d} diagram with the spectral locus (filled with approximate colours) and the Planckian locus; "
            f"spec primaries {names}; reference gamuts: {refs}; tolerance regions to scale; "
            f"{_n_units(e)} measured units marked by verdict. The numbers are in the table beside it.")


SHOWN_WIDTH = 504  # CSS pixels on the page


def _shown_height(svg: str) -> int:
    w, h = (float(v) for v in re.search(r'viewBox="0 0 ([\d.]+) ([\d.]+)"', svg).groups())
    return round(SHOWN_WIDTH * h / w)


TITLES = {"xy": "CIE 1931 xy diagram", "uv": "CIE 1976 u'v' diagram", "white": "White point close-up"}


_SVG_MEMO: OrderedDict[bytes, str] = OrderedDict()
_MEMO_SIZE = 128


def _draw(which: str, layer: F.Layer, title: str, desc: str) -> str:
    """The SVG of one diagram, remembered by the digest of everything it is drawn from, so
    that a long-running process (``colourspec serve``) redraws only what changed."""
    key = hashlib.sha256(pickle.dumps((which, layer, title, desc), protocol=5)).digest()
    if key in _SVG_MEMO:
        _SVG_MEMO.move_to_end(key)
        return _SVG_MEMO[key]
    fig, _ = F.white_closeup(layer) if which == "white" else F.chromaticity_diagram(layer, which)
    svg = F.save_svg(fig, title, desc)
    _SVG_MEMO[key] = svg
    if len(_SVG_MEMO) > _MEMO_SIZE:
        _SVG_MEMO.popitem(last=False)
    return svg


def spec_figures(e) -> list[dict]:
    spec = e.spec
    kinds = []
    if spec.primaries or spec.white:
        kinds += ["xy", "uv"]
    if spec.white is not None:
        kinds.append("white")
    out = []
    for which in kinds:
        layer = layer_for(e, which)
        alt = _alt(e, which)
        rows = plotted_points(layer, which)
        a, b = AXES[which]
        svg = _draw(which, layer, f"{TITLES[which]}: {spec.title}", alt)
        out.append({
            "key": which, "file": f"{which}.svg", "csv": f"{which}.csv", "json": f"{which}.json",
            "title": TITLES[which], "alt": alt,
            "svg": svg, "width": SHOWN_WIDTH, "height": _shown_height(svg),
            "data_csv": _data_csv(which, rows), "data_json": _data_json(which, layer, rows),
            "axes": [a, b],
            "rows": [{"kind": r["kind"], "name": r["name"], "a": fmt(float(r["at"][0])),
                      "b": fmt(float(r["at"][1])), "verdict": r["verdict"], "symbol": SYMBOL.get(r["verdict"], "")}
                     for r in rows],
            "tolerances": [label for label, _ in layer.tolerances],
        })
    return out
