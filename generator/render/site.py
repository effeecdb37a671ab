"""Render the whole site in memory: figures, spec pages, index, results.json, assets."""
from __future__ import annotations

import json

import numpy as np

from ..publish import SiteFiles
from .lots import _units_view, lot_pages, page_names
from .pages import (CAUTION, CAUTION_CATEGORIES, SYMBOL, decision_text, environment, fmt, methods,
                    render_markdown, row_view, templates_dir)
from .results import dumps

MAX_UNIT_ROWS = 3000   # unit rows listed on a spec page; results.json has all


def _tolerance_shapes(tol, centre_xy, label):
    from . import figures as F  # imported only when a figure is drawn (matplotlib is slow to load)

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
    a, t = e.assessment, e.assessment.table
    out = []
    for i in idx.tolist():
        v = ("pass", "indeterminate", "fail")[a.unit_codes[i]]
        for c in channels:
            m = t.channels[c][i]
            if np.isfinite(m[0]):
                out.append((t.serial[i], (float(m[0]), float(m[1])), v))
    return out


def layer_for(e, which: str, members=None, title_suffix: str = ""):
    from . import figures as F  # imported only when a figure is drawn (matplotlib is slow to load)

    spec = e.spec
    idx = plotted_units(e, members)
    refs = []
    shown = []
    for g in spec.gamut:
        if g.reference not in shown:
            shown.append(g.reference)
    for key in shown:
        refs.append((spec.references[key].title, e.derived.ref_hulls[key][0]))
    if which == "white":
        tol = _tolerance_shapes(spec.white.tolerance, spec.white.xy, "white")
        units = _unit_points(e, ["white"], idx)
        return F.Layer("White point, CIE 1976 u'v'" + title_suffix, None, [], spec.white.xy, [], tol, units,
                       spec.observer)
    tol = []
    for p in spec.primaries:
        tol += _tolerance_shapes(p.tolerance, p.xy, p.name)
    if spec.white is not None:
        tol += [t for t in _tolerance_shapes(spec.white.tolerance, spec.white.xy, "white")
                if "CCT" not in t[0]]
    units = _unit_points(e, [p.name for p in spec.primaries] + ["white"], idx)
    gamut = e.derived.gamut.hull_xy if e.derived.gamut is not None else None
    title = "CIE 1931 xy chromaticity diagram" if which == "xy" else "CIE 1976 u'v' chromaticity diagram"
    return F.Layer(title + title_suffix, gamut, [(p.name, p.xy) for p in spec.primaries],
                   spec.white.xy if spec.white else None, refs, tol, units, spec.observer)


def _figures(e) -> list[dict]:
    from . import figures as F  # imported only when a figure is drawn (matplotlib is slow to load)

    out = []
    spec = e.spec
    if spec.primaries or spec.white:
        for diag, name in (("xy", "xy.svg"), ("uv", "uv.svg")):
            fig, _ = F.chromaticity_diagram(layer_for(e, diag), diag)
            out.append({"file": name, "svg": F.save_svg(fig),
                        "title": "CIE 1931 xy diagram" if diag == "xy" else "CIE 1976 u'v' diagram",
                        "alt": _alt(e, diag)})
    if spec.white is not None:
        fig, _ = F.white_closeup(layer_for(e, "white"))
        out.append({"file": "white.svg", "svg": F.save_svg(fig), "title": "White point close-up",
                    "alt": f"White target at x {spec.white.xy[0]:.4f}, y {spec.white.xy[1]:.4f} on the "
                           "Planckian locus with isotherms, lines of constant Duv and the tolerance"})
    return out


def _alt(e, diag) -> str:
    spec = e.spec
    names = ", ".join(p.name for p in spec.primaries)
    refs = ", ".join(spec.references[g.reference].title for g in spec.gamut) or "none"
    d = "CIE 1931 xy" if diag == "xy" else "CIE 1976 u'v'"
    return (f"{d} diagram with the spectral locus and Planckian locus, the spec gamut of {names}, "
            f"reference gamuts: {refs}; {n_units(e)} measured units marked by verdict")


def n_units(e) -> int:
    return len(e.assessment.table) if e.assessment.table is not None else 0


def spec_context(e, figs) -> dict:
    spec, d, a = e.spec, e.derived, e.assessment
    rows = [row_view(r) for r in a.rows]
    design = [r for r in rows if r["sample"] is None]
    unit_rows = [r for r in rows if r["sample"] is not None]
    lot_names, sup_names = page_names(a)
    failing = [r for r in rows if r["verdict"] != "pass"]
    white = None
    if d.white:
        w = d.white
        white = {"written": spec.white.written, "x": fmt(w["x"]), "y": fmt(w["y"]),
                 "u": fmt(w["u_prime"]), "v": fmt(w["v_prime"]), "cct": fmt(w["cct_K"], 1),
                 "duv": fmt(w["duv"], 4)}
    prims = [{"name": n, "x": fmt(p["x"]), "y": fmt(p["y"]), "u": fmt(p["u_prime"]), "v": fmt(p["v_prime"]),
              "dominant": fmt(p["dominant_wavelength_nm"], 1),
              "complementary": fmt(p["complementary_wavelength_nm"], 1),
              "purity": fmt(p["excitation_purity"], 3)} for n, p in d.primaries.items()]
    gamut = None
    if d.gamut is not None:
        gamut = {"area_xy": fmt(d.gamut.area_xy, 5), "area_uv": fmt(d.gamut.area_uv, 5),
                 "vs": [{"key": k, "title": spec.references[k].title,
                         "cov_xy": fmt(v["coverage_xy"], 1), "cov_uv": fmt(v["coverage_uv"], 1),
                         "ratio_xy": fmt(v["area_ratio_xy"], 1), "ratio_uv": fmt(v["area_ratio_uv"], 1)}
                        for k, v in sorted(d.gamut.vs.items())]}
    npm = [[fmt(x, 6) for x in row] for row in d.npm] if d.npm else None
    npm_inv = [[fmt(x, 6) for x in row] for row in d.npm_inverse] if d.npm_inverse else None
    return {
        "spec": {"id": spec.id, "title": spec.title, "product": spec.product, "revision": spec.revision,
                 "status": spec.status, "file": spec.file, "observer": spec.observer,
                 "extends": spec.extends, "family": spec.family, "owner": spec.owner,
                 "inherited": sorted(spec.inherited.items())},
        "verdict": a.verdict, "verdict_symbol": {"pass": "✓", "fail": "✗", "indeterminate": "?"}[a.verdict],
        "counts": {"rows": len(rows), "fail": sum(r["verdict"] == "fail" for r in rows),
                   "indeterminate": sum(r["verdict"] == "indeterminate" for r in rows)},
        "failing": failing[:12], "failing_more": max(0, len(failing) - 12),
        "figures": [{k: f[k] for k in ("file", "title", "alt")} for f in figs],
        "design_rows": design,
        "units": _units_view(a, np.arange(n_units(e))) if n_units(e) else [],
        "n_units": n_units(e),
        "unit_rows": unit_rows[:MAX_UNIT_ROWS], "n_unit_rows": len(unit_rows),
        "lots": [dict(lot, page=lot_names[lot["lot"]], symbol=SYMBOL[lot["verdict"]]) for lot in a.lots],
        "suppliers": [dict(s, page=sup_names[s["supplier"]], symbol=SYMBOL[s["verdict"]]) for s in a.suppliers],
        "measurements": spec.measurements,
        "decision": decision_text(spec),
        "white": white, "primaries": prims, "gamut": gamut, "npm": npm, "npm_inverse": npm_inv,
        "notes_html": render_markdown(spec.notes) if spec.notes else "",
        "methods": methods(spec),
        "caution": CAUTION if spec.category in CAUTION_CATEGORIES else "",
        "warnings": [w.format() for w in spec.warnings],
        "root": "../",
    }


def index_context(evaluated) -> dict:
    items = []
    for e in evaluated:
        s, d, a = e.spec, e.derived, e.assessment
        key = ""
        if s.gamut and d.gamut is not None:
            g = s.gamut[0]
            k = f"{'coverage' if g.metric == 'coverage' else 'area_ratio'}_{g.diagram}"
            key = f"{g.metric} {s.references[g.reference].title} ({g.diagram}): {fmt(d.gamut.vs[g.reference][k], 1)} %"
        items.append({"id": s.id, "title": s.title, "product": s.product, "revision": s.revision,
                      "status": s.status, "family": s.family or s.product, "verdict": a.verdict,
                      "symbol": {"pass": "✓", "fail": "✗", "indeterminate": "?"}[a.verdict],
                      "key_gamut": key,
                      "cct": fmt(d.white["cct_K"], 0) + " K" if d.white else "—",
                      "duv": fmt(d.white["duv"], 4) if d.white else "—",
                      "n_units": n_units(e),
                      "n_fail": sum(u["verdict"] == "fail" for u in a.units)})
    counts = {v: sum(i["verdict"] == v for i in items) for v in ("pass", "fail", "indeterminate")}
    return {"items": items, "counts": counts, "root": ""}


def spec_files(e, env, history=None) -> dict[str, bytes]:
    """The costly part of a spec's output (name -> bytes): its diagrams, its page, and its
    lot and supplier pages with their diagrams and histograms."""
    figs = _figures(e)
    files = {f["file"]: f["svg"].encode("utf-8") for f in figs}
    ctx = spec_context(e, figs)
    ctx["history"] = [h.as_json() for h in history] if history is not None else None
    files["index.html"] = env.get_template("spec.html").render(**ctx).encode("utf-8")
    for path, content in lot_pages(e, env, decision_text(e.spec)):
        files[path] = content.encode("utf-8") if isinstance(content, str) else content
    return files


def render_site(evaluated, results: dict, cache=None, histories=None):
    """The whole site in memory; with a cache (generator/cache.py), a spec whose inputs are
    unchanged takes its diagrams and page from it instead of drawing them again.
    ``histories`` (file -> history entries, generator/history.py) adds a history section."""
    from ..cache import spec_key

    env = environment()
    site = SiteFiles()
    n_fig = 0
    by_id = {e.spec.id: e.spec for e in evaluated}
    for e in evaluated:
        history = histories.get(e.spec.file, []) if histories is not None else None
        extra = json.dumps([h.as_json() for h in history]) if history is not None else ""
        key = spec_key(e.spec, by_id, extra) if cache is not None else ""
        files = cache.get(key) if cache is not None else None
        if files is None:
            files = spec_files(e, env, history)
            if cache is not None:
                cache.put(key, files)
        n_fig += sum(name.endswith(".svg") for name in files)
        for name in sorted(files):
            site.add(f"{e.spec.id}/{name}", files[name])
        entry = next(s for s in results["specs"] if s["id"] == e.spec.id)
        site.add(f"{e.spec.id}/results.json", json.dumps(entry, indent=2, ensure_ascii=False) + "\n")
    site.add("index.html", env.get_template("index.html").render(**index_context(evaluated)))
    site.add("results.json", dumps(results))
    static = templates_dir() / "static"
    for p in sorted(static.rglob("*")):
        if p.is_file():
            site.add(f"static/{p.relative_to(static).as_posix()}", p.read_bytes())
    return site, len(evaluated) + 1, n_fig
