"""Render the whole site in memory: figures, spec pages, index, results.json, assets.

The templates compute nothing: everything they show is formatted here. The contexts are
documented in ``render/contexts.py``.
"""
from __future__ import annotations

import json
import os

import numpy as np

from ..publish import FileRef, Parts, SiteFiles, Span
from .contexts import IndexContext, SpecContext
from .lots import _units_view, lot_pages, page_names
from .pages import (CAUTION, CAUTION_CATEGORIES, decision_text, environment, fmt, methods, render_markdown,
                    row_view, templates_dir)
from .results import document_parts, dumps_entry, entry_text, indented_entry
from .swatch import swatch_hex

SYMBOLS = {"pass": "✓", "fail": "✗", "indeterminate": "?"}
MAX_UNIT_ROWS = 1000   # unit rows listed on a spec page, those that do not pass first; results.json has all
INDENTED_ENTRY = ".entry-in-results"   # a spec's entry as the site's results.json holds it (cached, not published)


def n_units(e) -> int:
    """Every measured unit of a spec: inline and from its measurement files."""
    return len(e.assessment.table) if e.assessment.table is not None else 0


def canonical(site_url: str | None, path: str) -> str:
    """The page's absolute address when the site's public URL is known, else ''."""
    if not site_url:
        return ""
    return site_url.rstrip("/") + "/" + ("" if path == "index.html" else path)


def _sections(ctx) -> list[tuple[str, str]]:
    """The page's table of contents: (anchor, heading) of each section present."""
    out = [("verdict", "Verdict")]
    if ctx["figures"]:
        out.append(("diagrams", "Diagrams"))
    out += [("compliance", "Compliance"), ("derived", "Derived figures")]
    if ctx["colours"]:
        out.append(("colours", "Colours"))
    if ctx["spectra"]:
        out.append(("spectra", "Spectra"))
    if ctx["gamut"] and ctx["gamut"]["volume"]:
        out.append(("volume", "CIELAB gamut volume"))
    if ctx["units"]:
        out.append(("units", "Measured units"))
    if ctx["notes_html"]:
        out.append(("notes", "Notes"))
    if ctx["spec"]["inherited"]:
        out.append(("inherited", "Inherited values"))
    if ctx["history"] is not None:
        out.append(("history", "History"))
    out += [("methods", "How this was computed"), ("downloads", "Downloads")]
    return out


def _what(row) -> str:
    """A failing row named with its subject, unless the label already says it ('blue: Δu'v' from target')."""
    subject, label = row["subject"] or "", row["label"]
    if not subject or subject == "gamut" or label.lower().startswith(subject.lower()):
        return label
    return f"{subject}: {label}"


def spec_context(e, figs, site_url: str | None = None, history=None) -> SpecContext:
    """``history``: the spec file's history entries (generator/history.py), or None for
    no history section."""
    spec, d, a = e.spec, e.derived, e.assessment
    # rows are built and formatted for the page only where shown (a lot can give a million)
    counts = a.row_counts()
    design = [row_view(r) for r in a.design_rows]
    unit_rows = [row_view(r) for r in a.unit_rows_shown(MAX_UNIT_ROWS)]
    lot_names, sup_names = page_names(a)
    failing = [dict(v, what=_what(v)) for v in map(row_view, a.not_passing_rows(12))]
    n_failing = counts["rows"] - counts["pass"]
    white = None
    if d.white:
        w = d.white
        white = {"written": spec.white.written, "x": fmt(w["x"]), "y": fmt(w["y"]),
                 "u": fmt(w["u_prime"]), "v": fmt(w["v_prime"]), "cct": fmt(w["cct_K"], 1),
                 "duv": fmt(w["duv"], 4), "swatch": swatch_hex((w["x"], w["y"]))}
    prims = [{"name": n, "x": fmt(p["x"]), "y": fmt(p["y"]), "u": fmt(p["u_prime"]), "v": fmt(p["v_prime"]),
              "dominant": fmt(p["dominant_wavelength_nm"], 1),
              "complementary": fmt(p["complementary_wavelength_nm"], 1),
              "purity": fmt(p["excitation_purity"], 3), "swatch": swatch_hex((p["x"], p["y"]))}
             for n, p in d.primaries.items()]
    gamut = None
    if d.gamut is not None:
        gamut = {"area_xy": fmt(d.gamut.area_xy, 5), "area_uv": fmt(d.gamut.area_uv, 5),
                 "vs": [{"key": k, "title": spec.references[k].title,
                         "cov_xy": fmt(v["coverage_xy"], 1), "cov_uv": fmt(v["coverage_uv"], 1),
                         "ratio_xy": fmt(v["area_ratio_xy"], 1), "ratio_uv": fmt(v["area_ratio_uv"], 1)}
                        for k, v in sorted(d.gamut.vs.items())]}
        if d.gamut.volume is not None:
            gamut["volume"] = fmt(d.gamut.volume["cielab"], 0)
            gamut["volume_vs"] = [{"key": k, "title": spec.references[k].title, "volume": fmt(v["volume"], 0),
                                   "ratio": fmt(v["volume_ratio"], 1), "coverage": fmt(v.get("volume_coverage"), 1)}
                                  for k, v in d.gamut.volume["vs"].items()]
        else:
            gamut["volume"], gamut["volume_vs"] = None, []
        gamut["volume_figure"] = any(f["key"] == "volume" for f in figs)
    colours = []
    for c in spec.colours:
        f = d.colours[c.name]
        colours.append({"name": c.name, "written": c.written, "note": c.note, "x": fmt(f["x"]), "y": fmt(f["y"]),
                        "Y": fmt(f["Y"], 2), "L": fmt(f["L"], 2), "a": fmt(f["a"], 2), "b": fmt(f["b"], 2),
                        "dominant": fmt(f["dominant_wavelength_nm"], 1),
                        "complementary": fmt(f["complementary_wavelength_nm"], 1),
                        "purity": fmt(f["excitation_purity"], 3), "swatch": swatch_hex((f["x"], f["y"])),
                        "white": c.reference_white_written or "E (dominant wavelength only)",
                        "limits": ", ".join(c.tolerance.kinds()) + ("" if c.tolerance_from == "own"
                                                                    else " (section default)")})
    spectra = [{"label": f["label"], "sample": f["sample"] or "", "source": f["source"],
                "sampling": f["sampling"], "interpolation": {"none": "none (1 nm)", "sprague": "Sprague",
                                                             "cubic-spline": "cubic spline"}[f["interpolation"]],
                "x": fmt(f["x"]), "y": fmt(f["y"]), "luminance": fmt(f["luminance_cd_m2"], 1),
                "peak": fmt(f["peak_wavelength_nm"], 1), "centroid": fmt(f["centroid_wavelength_nm"], 1),
                "fwhm": fmt(f["fwhm_nm"], 1), "cct": fmt(f.get("cct_K"), 0), "duv": fmt(f.get("duv"), 4)}
               for f in d.spectra.values()]
    npm = [[fmt(x, 6) for x in row] for row in d.npm] if d.npm else None
    npm_inv = [[fmt(x, 6) for x in row] for row in d.npm_inverse] if d.npm_inverse else None
    n_fail_units = a.unit_count("fail")
    ctx = {
        "spec": {"id": spec.id, "title": spec.title, "product": spec.product, "revision": spec.revision,
                 "status": spec.status, "file": spec.file, "observer": spec.observer,
                 "extends": spec.extends, "family": spec.family, "owner": spec.owner,
                 "inherited": sorted(spec.inherited.items())},
        "verdict": a.verdict, "verdict_symbol": SYMBOLS[a.verdict],
        "counts": {"rows": counts["rows"], "fail": counts["fail"], "indeterminate": counts["indeterminate"],
                   "units": a.unit_count(), "units_fail": n_fail_units},
        "failing": failing, "failing_more": max(0, n_failing - 12),
        "figures": [{**{k: f[k] for k in ("key", "file", "csv", "json", "title", "alt", "axes", "rows", "tolerances",
                                             "width", "height")},
                     "units_listed": f.get("units_listed", 0), "units_drawn": f.get("units_drawn", 0)}
                    for f in figs],
        "design_rows": design,
        "units": _units_view(a, np.arange(n_units(e))) if n_units(e) else [],
        "n_units": n_units(e),
        "unit_rows": unit_rows, "n_unit_rows": counts["rows"] - len(a.design_rows),
        "lots": [dict(lot, page=lot_names[lot["lot"]], symbol=SYMBOLS[lot["verdict"]]) for lot in a.lots],
        "suppliers": [dict(s, page=sup_names[s["supplier"]], symbol=SYMBOLS[s["verdict"]]) for s in a.suppliers],
        "measurements": spec.measurements,
        "decision": decision_text(spec),
        "white": white, "primaries": prims, "colours": colours, "spectra": spectra, "gamut": gamut,
        "npm": npm, "npm_inverse": npm_inv,
        "notes_html": render_markdown(spec.notes) if spec.notes else "",
        "methods": methods(spec),
        "caution": CAUTION if spec.category in CAUTION_CATEGORIES else "",
        "warnings": [w.format() for w in spec.warnings],
        "root": "../",
        "canonical": canonical(site_url, f"{spec.id}/index.html"),
        "reload": False,
        "history": [h.as_json() for h in history] if history is not None else None,
    }
    ctx["sections"] = _sections(ctx)
    return ctx


def _key_figures(s, d) -> list[str]:
    """Each gamut requirement's figure, as the spec names it ('DCI-P3 coverage (u'v') 100.0 %')."""
    out = []
    if d.gamut is None:
        return out
    for g in s.gamut:
        title = s.references[g.reference].title
        if g.metric.startswith("volume"):
            k = "volume_coverage" if g.metric == "volume-coverage" else "volume_ratio"
            v = ((d.gamut.volume or {}).get("vs", {}).get(g.reference) or {}).get(k)
            name = "volume coverage" if g.metric == "volume-coverage" else "volume ratio"
            out.append(f"{title} {name} (CIELAB): {fmt(v, 1)} %")
            continue
        k = f"{'coverage' if g.metric == 'coverage' else 'area_ratio'}_{g.diagram}"
        name = "coverage" if g.metric == "coverage" else "area ratio"
        diag = "xy" if g.diagram == "xy" else "u'v'"
        out.append(f"{title} {name} ({diag}): {fmt(d.gamut.vs[g.reference][k], 1)} %")
    return list(dict.fromkeys(out))


def index_context(evaluated, site_url: str | None = None) -> IndexContext:
    items = []
    for e in evaluated:
        s, d, a = e.spec, e.derived, e.assessment
        keys = _key_figures(s, d)
        family = s.family or s.product or "Other"
        item = {"id": s.id, "title": s.title, "product": s.product, "revision": s.revision,
                "status": s.status, "family": family, "verdict": a.verdict,
                "symbol": SYMBOLS[a.verdict], "key_figures": keys,
                "cct": fmt(d.white["cct_K"], 0) + " K" if d.white else "—",
                "duv": fmt(d.white["duv"], 4) if d.white else "—",
                "n_units": n_units(e),
                "n_fail": a.unit_count("fail")}
        item["search"] = " ".join([s.id, s.title, s.product, family, s.revision, s.status, a.verdict, *keys]).lower()
        items.append(item)
    groups = []
    for fam in sorted({i["family"] for i in items}, key=str.lower):
        members = sorted((i for i in items if i["family"] == fam), key=lambda i: i["id"])
        groups.append({"family": fam, "specs": members,
                       "anchor": "family-" + "".join(c if c.isalnum() else "-" for c in fam.lower())})
    counts = {v: sum(i["verdict"] == v for i in items) for v in ("pass", "fail", "indeterminate")}
    return {"items": items, "groups": groups, "counts": counts,
            "statuses": sorted({i["status"] for i in items}),
            "verdicts": [v for v in ("pass", "fail", "indeterminate") if counts[v]],
            "root": "", "canonical": canonical(site_url, "index.html"), "reload": False}


def spec_files(e, env, history=None, site_url: str | None = None, reload: bool = False,
               entry: dict | None = None) -> dict[str, bytes]:
    """The costly part of a spec's output (name -> bytes): each diagram's SVG with its
    numbers as CSV and JSON, the page, its lot and supplier pages with their diagrams
    and histograms, and its ``entry`` of results.json encoded."""
    from .diagrams import spec_figures  # imported only when a figure is drawn (check never needs it)

    figs = spec_figures(e)
    files = {}
    for f in figs:
        files[f["file"]] = f["svg"].encode("utf-8")
        files[f["csv"]] = f["data_csv"].encode("utf-8")
        files[f["json"]] = f["data_json"].encode("utf-8")
    ctx = spec_context(e, figs, site_url, history)
    ctx["reload"] = reload
    files["index.html"] = env.get_template("spec.html").render(**ctx).encode("utf-8")
    for path, content in lot_pages(e, env, decision_text(e.spec), site_url, reload):
        files[path] = content.encode("utf-8") if isinstance(content, str) else content
    text = dumps_entry(entry) if entry is not None else entry_text(e.spec, e.derived, e.assessment)
    files["results.json"] = text.encode("utf-8")
    files[INDENTED_ENTRY] = bytes(indented_entry(files["results.json"]))
    return files


def _key_extra(history, site_url: str | None, reload: bool) -> str:
    """What a spec's files depend on besides the specs and the tool: its history, the
    site's public address (canonical links) and the live-reload script."""
    parts = [json.dumps([h.as_json() for h in history]) if history is not None else ""]
    if site_url:
        parts.append(f"site_url={site_url}")
    if reload:
        parts.append("reload")
    return "\0".join(parts)


def render_site(evaluated, results: dict, cache=None, histories=None, *, site_url: str | None = None,
                reload: bool = False, jobs: int = 1):
    """The whole site as SiteFiles. With a cache (generator/cache.py), a spec whose inputs
    are unchanged takes its diagrams, their data files and its page from it instead of
    drawing them again. ``histories`` (file -> history entries, generator/history.py) adds
    a history section; ``site_url`` adds canonical links; ``reload`` adds the
    live-preview script (``serve``). ``jobs`` > 1 draws the specs not in the cache in that
    many worker processes (generator/parallel.py); the bytes are the same."""
    from ..cache import spec_key
    from ..parallel import map_indexed

    env = environment()
    site = SiteFiles()
    n_fig = 0
    by_id = {e.spec.id: e.spec for e in evaluated}
    entries = {s["id"]: s for s in results.get("specs", [])}   # else each is made where it is drawn
    history_of = {e.spec.id: histories.get(e.spec.file, []) if histories is not None else None for e in evaluated}
    keys, files_of = {}, {}
    for e in evaluated:
        if cache is not None:
            keys[e.spec.id] = spec_key(e.spec, by_id, _key_extra(history_of[e.spec.id], site_url, reload))
            got = cache.get(keys[e.spec.id], refs=True)
            if got is not None and INDENTED_ENTRY in got:
                files_of[e.spec.id] = got
    todo = [e for e in evaluated if e.spec.id not in files_of]
    if len(todo) > 1 and jobs > 1:      # imported and loaded once here, before the workers fork
        from . import diagrams  # noqa: F401

        for name in ("spec.html", "lot.html"):
            env.get_template(name)

    def draw(i: int) -> dict:
        """The spec's files; with a cache, stored there by the worker that drew them and
        passed back as FileRefs (published as hard links: the bytes are written once)."""
        e = todo[i]
        files = spec_files(e, env, history_of[e.spec.id], site_url, reload, entries.get(e.spec.id))
        refs = cache.put(keys[e.spec.id], files) if cache is not None else None
        return refs if refs is not None else files

    for e, files in zip(todo, map_indexed(draw, len(todo), jobs, cost=[n_units(e) for e in todo]), strict=True):
        files_of[e.spec.id] = files
        if cache is not None:
            cache.used.add(keys[e.spec.id])       # put in a worker marks its own copy
    pieces = {}
    for e in evaluated:
        sid = e.spec.id
        files = files_of[sid]
        n_fig += sum(name.endswith(".svg") for name in files)
        for name in sorted(files):
            if name != INDENTED_ENTRY:
                site.add(f"{sid}/{name}", files[name])
        entry = files[INDENTED_ENTRY]
        # from the cache: copied by the kernel from the cached file into the site's results.json
        pieces[sid] = Span(entry.path, 0, os.path.getsize(entry.path)) if isinstance(entry, FileRef) \
            else memoryview(entry)                                   # not bytes: indented already
    ictx = index_context(evaluated, site_url)
    ictx["reload"] = reload
    site.add("index.html", env.get_template("index.html").render(**ictx))
    site.add("results.json", Parts(document_parts(results, [pieces[e.spec.id] for e in evaluated])))
    static = templates_dir() / "static"
    for p in sorted(static.rglob("*")):
        if p.is_file():
            site.add(f"static/{p.relative_to(static).as_posix()}", p.read_bytes())
    return site, len(evaluated) + 1, n_fig
