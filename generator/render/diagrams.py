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
from math import isfinite

import numpy as np

from ..assess.rules import SYMBOL
from ..colour.convert import xy_to_uv_prime
from ..colour.lamp_tolerance import ellipse_outline_xy
from ..colour.macadam import macadam_metric, metric_axes
from ..data.lamp_standards import standard_name as lamp_name
from ..colour.npm import npm_from_primaries
from ..colour.volume import lightness_slice
from .results import dumps_one_per_line
from ..data import OBSERVERS
from . import charts as C
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
    if getattr(tol, "macadam_steps", None) is not None:
        a, b, ang = (float(v) for v in metric_axes(macadam_metric(np.array(centre_xy))))
        n = tol.macadam_steps
        shapes.append((f"{label}: {n:g}-step MacAdam ellipse", F.ellipse_xy(centre_xy, n * a, n * b, ang)))
    e = getattr(tol, "ellipse_of", None)
    if e is not None:   # fixed figures: centred on the standard's centre, not on the target
        shapes.append((f"{label}: {lamp_name(e.standard)} {e.colour} {e.steps:g}-step ellipse {e.confidence}",
                       ellipse_outline_xy(e.centre, e.a, e.b, e.angle, steps=e.steps)))
    q = getattr(tol, "quadrangle_of", None)
    if q is not None:
        shapes.append((f"{label}: {lamp_name(q.standard)} {q.nominal_cct} K quadrangle {q.confidence}",
                       np.array(q.outline)))
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


def _unit_points(e, channels, idx, after=()):
    """(serial and channel, (x, y), verdict) of each measured channel of the units ``idx``,
    inline or from measurement files; the unit's measured colours (inline ``units[].colours`` and
    ``colours.NAME`` records of measurement files) come after ``channels``, then the channels in
    ``after``."""
    a, t = e.assessment, e.assessment.table
    colours = e.spec.unit_colours if (after or channels != ["white"]) else {}
    idx = np.asarray(idx, dtype=np.intp)
    verdicts = [("pass", "indeterminate", "fail")[k] for k in a.unit_codes[idx].tolist()]
    serials = [t.serial[i] for i in idx.tolist()]
    before = [(c, t.channels[c][idx, :2].tolist()) for c in channels]
    later = [(c, t.channels[c][idx, :2].tolist()) for c in after]
    out = []
    for k, (serial, v) in enumerate(zip(serials, verdicts, strict=True)):
        for c, pts in before:
            x, y = pts[k]
            if isfinite(x):
                out.append((f"{serial} {c}", (x, y), v))
        for name, m in colours.get(serial, {}).items():
            out.append((f"{serial} {name}", tuple(m.xy), v))
        for c, pts in later:
            x, y = pts[k]
            if isfinite(x):
                out.append((f"{serial} {c}", (x, y), v))
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
    for c in spec.colours:
        tol += tolerance_shapes(c.tolerance, c.xy, c.name)
    units = _unit_points(e, [p.name for p in spec.primaries], idx, after=["white"])
    gamut = e.derived.gamut.hull_xy if e.derived.gamut is not None else None
    title = "CIE 1931 xy chromaticity diagram" if which == "xy" else "CIE 1976 u'v' chromaticity diagram"
    return F.Layer(title + title_suffix, gamut,
                   [(p.name, p.xy) for p in spec.primaries] + [(c.name, c.xy) for c in spec.colours],
                   spec.white.xy if spec.white else None, refs, tol, units, spec.observer)


AXES = {"xy": ("x", "y"), "uv": ("u'", "v'"), "white": ("u'", "v'")}
_KEYS = {"xy": ("x", "y"), "uv": ("u_prime", "v_prime"), "white": ("u_prime", "v_prime")}


def plotted_points(layer: F.Layer, which: str) -> list[dict]:
    """Every marked point of a diagram in its own coordinates: targets, units, reference
    corners and each tolerance outline's centre of its drawn vertices (outlines in JSON)."""
    def co(xy):      # (a, b) as Python floats: the tables, CSV and JSON read them point by point
        xy = np.asarray(xy, dtype=float)
        return tuple((xy if which == "xy" else xy_to_uv_prime(xy)).tolist())

    rows = []
    for name, xy in layer.primaries:
        rows.append({"kind": "target", "name": name, "at": co(xy), "verdict": ""})
    if layer.white_xy is not None:
        rows.append({"kind": "target", "name": "white", "at": co(layer.white_xy), "verdict": ""})
    if layer.units:      # all units converted at once (a lot diagram draws up to 1500)
        xy = np.array([xy for _, xy, _ in layer.units], dtype=float).reshape(-1, 2)
        at = (xy if which == "xy" else xy_to_uv_prime(xy)).tolist()
        rows += [{"kind": "unit", "name": label, "at": tuple(at[k]), "verdict": verdict}
                 for k, (label, _, verdict) in enumerate(layer.units)]
    for title, hull in layer.references:
        for k, xy in enumerate(np.asarray(hull)):
            rows.append({"kind": "reference", "name": f"{title} corner {k + 1}", "at": co(xy), "verdict": ""})
    return rows


TABLE_UNIT_POINTS = 200   # unit points listed in the table beside a diagram; the CSV and JSON have all


def table_rows(rows: list[dict]) -> list[dict]:
    """The points listed beside a diagram: every target and reference corner, and up to
    TABLE_UNIT_POINTS unit points, those that do not pass first."""
    units = [r for r in rows if r["kind"] == "unit"]
    if len(units) <= TABLE_UNIT_POINTS:
        return rows
    keep = sorted(units, key=lambda r: r["verdict"] == "pass")[:TABLE_UNIT_POINTS]   # stable: in order
    return [r for r in rows if r["kind"] != "unit"] + keep


def _float_text(v: float) -> str:
    # json.dumps(v, allow_nan=True): a finite float's repr, else NaN / Infinity / -Infinity
    return float.__repr__(v) if isfinite(v) else ("NaN" if v != v else ("Infinity" if v > 0 else "-Infinity"))


def point_texts(rows, a: str, b: str) -> list[str]:
    """The JSON text of each point, as ``json.dumps(point, ensure_ascii=False,
    allow_nan=True)`` of {"kind", "name", a, b[, "verdict"]} gives it (tested), without a
    dict per point: a lot diagram has thousands."""
    enc = json.encoder.encode_basestring          # the str encoder json.dumps(ensure_ascii=False) uses
    ka, kb = f", {enc(a)}: ", f", {enc(b)}: "
    kinds: dict[str, str] = {}
    out = []
    for r in rows:
        kind = kinds.get(r["kind"]) or kinds.setdefault(r["kind"], '{"kind": ' + enc(r["kind"]) + ', "name": ')
        x, y = r["at"]
        v = r["verdict"]
        out.append(kind + enc(r["name"]) + ka + _float_text(x) + kb + _float_text(y)
                   + (', "verdict": ' + enc(v) + "}" if v else "}"))
    return out


def _data_json(which, layer, rows) -> str:
    a, b = _KEYS[which]
    doc = {
        "figure": which, "title": layer.title, "coordinates": [a, b], "observer": layer.observer,
        "points": [],                                               # one a line, from point_texts
        "tolerances": [{"label": label, "outline": (np.asarray(poly, dtype=float) if which == "xy"
                                                     else xy_to_uv_prime(np.asarray(poly, dtype=float))).tolist()}
                       for label, poly in layer.tolerances],
    }
    return dumps_one_per_line(doc, ("points", "tolerances"), indent=1, allow_nan=True,
                              encoded={"points": point_texts(rows, a, b)})


_CSV_QUOTED = re.compile(r'[,"\r\n]')      # a cell with one of these is quoted by csv.writer


def _data_csv(which, rows) -> str:
    """The points as csv.writer writes them; when no cell needs quoting (serials and channel
    names rarely do), written by one f-string a row, twice as fast (tested equal)."""
    a, b = _KEYS[which]
    if _CSV_QUOTED.search("".join(r["kind"] + r["name"] + r["verdict"] for r in rows)):
        buf = io.StringIO()
        w = csv.writer(buf, lineterminator="\n")
        w.writerow(["kind", "name", a, b, "verdict"])
        for r in rows:
            w.writerow([r["kind"], r["name"], f"{r['at'][0]:.6f}", f"{r['at'][1]:.6f}", r["verdict"]])
        return buf.getvalue()
    return f"kind,name,{a},{b},verdict\n" + "".join(
        [f'{r["kind"]},{r["name"]},{r["at"][0]:.6f},{r["at"][1]:.6f},{r["verdict"]}\n' for r in rows])


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
    colours = f"colour targets {', '.join(c.name for c in spec.colours)}; " if spec.colours else ""
    refs = ", ".join(dict.fromkeys(spec.references[g.reference].title for g in spec.gamut)) or "none"
    d = "CIE 1931 xy" if which == "xy" else "CIE 1976 u'v'"
    return (f"{d} diagram with the spectral locus (filled with approximate colours) and the Planckian locus; "
            f"spec primaries {names}; {colours}reference gamuts: {refs}; tolerance regions to scale; "
            f"{_n_units(e)} measured units marked by verdict. The numbers are in the table beside it.")


SHOWN_WIDTH = 504  # CSS pixels on the page


def _shown_height(svg: str) -> int:
    w, h = (float(v) for v in re.search(r'viewBox="0 0 ([\d.]+) ([\d.]+)"', svg).groups())
    return round(SHOWN_WIDTH * h / w)


TITLES = {"xy": "CIE 1931 xy diagram", "uv": "CIE 1976 u'v' diagram", "white": "White point close-up",
          "spectra": "Spectra", "volume": "CIELAB gamut by lightness"}


_SVG_MEMO: OrderedDict[bytes, str] = OrderedDict()
_MEMO_SIZE = 128


def _draw(which: str, layer, title: str, desc: str) -> str:
    """The SVG of one figure, remembered by the digest of everything it is drawn from, so
    that a long-running process (``colourspec serve``) redraws only what changed. ``layer``
    is a Layer for the chromaticity diagrams, the drawing arguments for the others."""
    key = hashlib.sha256(pickle.dumps((which, layer, title, desc), protocol=5)).digest()
    if key in _SVG_MEMO:
        _SVG_MEMO.move_to_end(key)
        return _SVG_MEMO[key]
    if which == "white":
        fig, _ = F.white_closeup(layer)
    elif which == "spectra":
        fig, _ = C.spectra_plot(*layer)
    elif which == "volume":
        fig, _ = C.volume_slices(*layer)
    else:
        fig, _ = F.chromaticity_diagram(layer, which)
    svg = F.save_svg(fig, title, desc)
    _SVG_MEMO[key] = svg
    if len(_SVG_MEMO) > _MEMO_SIZE:
        _SVG_MEMO.popitem(last=False)
    return svg


def _csv(header, rows) -> str:
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(header)
    w.writerows(rows)
    return buf.getvalue()


def _figure(which, spec, svg, alt, axes, rows, data_csv, data_json, tolerances=()) -> dict:
    return {"key": which, "file": f"{which}.svg", "csv": f"{which}.csv", "json": f"{which}.json",
            "title": TITLES[which], "alt": alt, "svg": svg, "width": SHOWN_WIDTH, "height": _shown_height(svg),
            "data_csv": data_csv, "data_json": data_json, "axes": list(axes), "rows": rows,
            "tolerances": list(tolerances)}


def _spectra_figure(e) -> dict:
    """Every spectrum normalised to its own peak; the table gives each one's peak and
    FWHM, the CSV and JSON every drawn value."""
    spec = e.spec
    series = [(sd.label, sd.wavelengths, sd.values, sd.sample is not None) for sd in spec.spectra]
    n_units = sum(sd.sample is not None for sd in spec.spectra)
    alt = ("Spectra of " + (", ".join(sd.label for sd in spec.spectra if sd.sample is None) or "no design target")
           + f", each normalised to its own peak, 360-830 nm; {n_units} measured unit spectra dashed. "
           "The numbers are in the table beside it.")
    svg = _draw("spectra", (series, OBSERVERS[spec.observer][1]), f"{TITLES['spectra']}: {spec.title}", alt)
    derived = {f["label"]: f for f in e.derived.spectra.values()}
    rows, lines, doc = [], [], []
    for sd in spec.spectra:
        v = np.asarray(sd.values, dtype=float)
        peak = float(np.nanmax(v)) if len(v) else float("nan")
        rel = v / peak if peak > 0 else np.full(v.shape, np.nan)
        f = derived.get(sd.label, {})
        rows.append({"kind": "unit spectrum" if sd.sample is not None else "spectrum", "name": sd.label,
                     "a": fmt(f.get("peak_wavelength_nm"), 1), "b": fmt(f.get("fwhm_nm"), 1), "verdict": "",
                     "symbol": ""})
        lines += [[sd.label, sd.sample or "", int(wl), repr(float(x)), f"{r:.6f}"]
                  for wl, x, r in zip(sd.wavelengths, v, rel, strict=True)]
        doc.append({"label": sd.label, **({"sample": sd.sample} if sd.sample else {}), "scale": sd.scale,
                    "source": sd.source, "wavelengths_nm": [int(w) for w in sd.wavelengths],
                    "values": [float(x) for x in v], "relative": [None if np.isnan(r) else float(r) for r in rel]})
    data_json = json.dumps({"figure": "spectra", "title": "Spectra", "observer": spec.observer,
                            "series": doc}, indent=1, ensure_ascii=False) + "\n"
    data_csv = _csv(["spectrum", "unit", "wavelength_nm", "value", "relative_to_peak"], lines)
    return _figure("spectra", spec, svg, alt, ("peak λ (nm)", "FWHM (nm)"), rows, data_csv, data_json)


VOLUME_STEP = 2.0  # a*b* grid step of the drawn slices


def _volume_figure(e) -> dict | None:
    """Slices of the spec's and the first volume reference's CIELAB solids at fixed L*,
    both with the reference's white; the table and data give each slice's a*b* area."""
    spec = e.spec
    vol = [g for g in spec.gamut if g.metric.startswith("volume")]
    if not vol or e.derived.npm is None:
        return None
    ref = spec.references[vol[0].reference]
    R = npm_from_primaries(list(ref.primaries), ref.white)
    M = np.array(e.derived.npm)
    white = R @ np.ones(3)
    slices, rows, lines = [], [], []
    for L in C.VOLUME_LIGHTNESS:
        A, B, spec_in = lightness_slice(M, L, white, step=VOLUME_STEP)
        _, _, ref_in = lightness_slice(R, L, white, step=VOLUME_STEP)
        slices.append((L, A, B, spec_in, ref_in))
        spec_area, ref_area = (float(m.sum()) * VOLUME_STEP ** 2 for m in (spec_in, ref_in))
        both = float((spec_in & ref_in).sum()) * VOLUME_STEP ** 2
        rows.append({"kind": "slice", "name": f"L* = {L:g}", "a": fmt(spec_area, 0), "b": fmt(ref_area, 0),
                     "verdict": "", "symbol": ""})
        lines.append([f"{L:g}", f"{spec_area:.0f}", f"{ref_area:.0f}", f"{both:.0f}"])
    alt = (f"a*b* outlines of the spec's CIELAB gamut and of {ref.title} at L* "
           + ", ".join(f"{L:g}" for L in C.VOLUME_LIGHTNESS) + f", both with {ref.title}'s white. "
           "The slice areas are in the table beside it.")
    svg = _draw("volume", (slices, "spec gamut", ref.title), f"{TITLES['volume']}: {spec.title}", alt)
    header = ["L", "spec_area", "reference_area", "common_area"]
    data_json = json.dumps({"figure": "volume", "title": TITLES["volume"], "reference": ref.title,
                            "white": "the reference's", "grid_step": VOLUME_STEP, "area_unit": "ΔE*ab²",
                            "slices": [dict(zip(header, (float(x) for x in r), strict=True)) for r in lines]},
                           indent=1, ensure_ascii=False) + "\n"
    return _figure("volume", spec, svg, alt, ("spec area (ΔE*ab²)", f"{ref.title} area (ΔE*ab²)"), rows,
                   _csv(header, lines), data_json)


def spec_figures(e) -> list[dict]:
    spec = e.spec
    kinds = []
    if spec.primaries or spec.white or spec.colours:
        kinds += ["xy", "uv"]
    if spec.white is not None:
        kinds.append("white")
    out = []
    if spec.spectra:
        out.append(_spectra_figure(e))
    vol = _volume_figure(e)
    if vol is not None:
        out.append(vol)
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
                     for r in table_rows(rows)],
            "units_drawn": sum(r["kind"] == "unit" for r in rows),
            "units_listed": sum(r["kind"] == "unit" for r in table_rows(rows)),
            "tolerances": [label for label, _ in layer.tolerances],
        })
    order = ["xy", "uv", "spectra", "volume", "white"]
    return sorted(out, key=lambda f: order.index(f["key"]))
