"""Incremental builds: only what an edit touches is drawn again, and the result equals a
full build byte for byte; the cache stays outside the site."""
from __future__ import annotations

import os
import shutil
import subprocess
import sys

import pytest

from generator import cache as C
from generator.build import build

from .conftest import DEMO_SPECS, ROOT

PANEL = """\
spec: 1
id: {id}
title: Panel {id}
white:
  target: D65
  tolerance: {{delta_uv: 0.004}}
primaries:
  red:   {{x: 0.640, y: 0.330}}
  green: {{x: 0.300, y: 0.600}}
  blue:  {{x: 0.150, y: 0.060}}
gamut:
  - {{reference: {ref}, metric: coverage, diagram: xy, min: 90}}
"""
CHILD = "spec: 1\nid: {id}\nextends: {parent}\ntitle: Child {id}\n"


def files_of(site):
    return {p.relative_to(site).as_posix(): p.read_bytes() for p in sorted(site.rglob("*")) if p.is_file()}


@pytest.fixture
def library(spec_dir, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    spec_dir("a.yaml", PANEL.format(id="a", ref="srgb"))
    spec_dir("b.yaml", PANEL.format(id="b", ref="a"))      # uses spec a as its reference gamut
    spec_dir("c.yaml", CHILD.format(id="c", parent="a"))   # inherits from a
    spec_dir("d.yaml", PANEL.format(id="d", ref="bt2020"))
    return spec_dir


def test_second_build_reuses_every_page_and_changes_nothing(library, tmp_path):
    out = tmp_path / "site"
    first = build(library.dir, out)
    before = files_of(out)
    second = build(library.dir, out)
    assert (first.reused, second.reused) == (0, 4)
    assert files_of(out) == before


def test_an_edit_redraws_that_spec_and_what_depends_on_it_and_equals_a_full_build(library, tmp_path):
    out, full = tmp_path / "site", tmp_path / "full"
    build(library.dir, out)
    p = library.dir / "a.yaml"
    p.write_text(p.read_text().replace("delta_uv: 0.004", "delta_uv: 0.005"))
    inc = build(library.dir, out)
    assert inc.reused == 1  # a, b (reference) and c (child) are drawn again; d is reused
    build(library.dir, full, incremental=False)
    assert files_of(out) == files_of(full)


def test_an_edit_of_a_leaf_redraws_only_the_leaf(library, tmp_path):
    out = tmp_path / "site"
    build(library.dir, out)
    p = library.dir / "d.yaml"
    p.write_text(p.read_text().replace("min: 90", "min: 91"))
    assert build(library.dir, out).reused == 3


def test_the_cache_is_a_hidden_folder_beside_the_site_and_never_inside_it(library, tmp_path):
    out = tmp_path / "site"
    evaluated = build(library.dir, out).evaluated
    by_id = {e.spec.id: e.spec for e in evaluated}
    assert C.cache_dir_for(out) == tmp_path / ".site.cache"
    assert sorted(p.name for p in (tmp_path / ".site.cache").iterdir()) == sorted(
        [C.spec_key(e.spec, by_id) for e in evaluated] + ["evaluated"])    # pages, and the memo
    assert not any("cache" in rel or "manifest" in rel for rel in files_of(out))


def test_clean_empties_the_cache_first(library, tmp_path):
    out = tmp_path / "site"
    build(library.dir, out)
    assert build(library.dir, out, clean=True).reused == 0
    assert build(library.dir, out).reused == 4


def test_entries_no_build_uses_are_pruned(library, tmp_path):
    out = tmp_path / "site"
    build(library.dir, out)
    (C.cache_dir_for(out) / "stale-entry").mkdir()
    (library.dir / "d.yaml").unlink()
    build(library.dir, out)
    names = sorted(p.name for p in C.cache_dir_for(out).iterdir() if p.name not in C.KEEP)
    assert len(names) == 3 and "stale-entry" not in names
    kept = [p for p in (C.cache_dir_for(out) / "evaluated").iterdir() if not p.name.startswith("parsed-")]
    assert len(kept) == 3                                                  # the memo is pruned too


def test_a_damaged_entry_is_drawn_again(library, tmp_path):
    out = tmp_path / "site"
    build(library.dir, out)
    before = files_of(out)
    for entry in C.cache_dir_for(out).iterdir():
        if entry.name not in C.KEEP:
            (entry / "manifest.json").write_text("{not json")
    assert build(library.dir, out).reused == 0
    assert files_of(out) == before


def test_the_key_changes_with_the_tool_the_file_name_and_every_dependency(library, monkeypatch):
    from generator.spec.load import load_specs

    specs, _ = load_specs(library.dir)
    by_id = {s.id: s for s in specs}
    assert C.dependencies(by_id["b"], by_id) == ["a", "b"]
    assert C.dependencies(by_id["c"], by_id) == ["a", "c"]
    assert C.dependencies(by_id["d"], by_id) == ["d"]
    key = C.spec_key(by_id["c"], by_id)
    by_id["a"].digest = "0" * 64
    assert C.spec_key(by_id["c"], by_id) != key
    k2 = C.spec_key(by_id["c"], by_id)
    monkeypatch.setattr(C, "tool_digest", lambda: "another version")
    assert C.spec_key(by_id["c"], by_id) != k2


def test_tool_digest_covers_templates_and_source(tmp_path):
    a = C._tree_digest(DEMO_SPECS.parent / "templates")
    shutil.copytree(DEMO_SPECS.parent / "templates", tmp_path / "t")
    assert C._tree_digest(tmp_path / "t") == a
    with open(tmp_path / "t" / "spec.html", "a", encoding="utf-8") as f:
        f.write(" ")
    assert C._tree_digest(tmp_path / "t") != a


def test_incremental_demo_build_equals_a_full_build(tmp_path):
    """The demo library, edited in its inherited parent: incremental == full, byte for byte."""
    specs = tmp_path / "specs"
    shutil.copytree(DEMO_SPECS, specs)
    cwd = os.getcwd()
    os.chdir(tmp_path)
    try:
        build(specs, tmp_path / "site")
        p = specs / "corvinta-brisk-14-office.yaml"
        p.write_text(p.read_text(encoding="utf-8").replace("min: 95}", "min: 94}"), encoding="utf-8")
        inc = build(specs, tmp_path / "site")
        build(specs, tmp_path / "full", incremental=False)
    finally:
        os.chdir(cwd)
    # brisk-14 and brisk-16 (its child) are drawn again, every other demo spec is reused
    assert inc.reused == len(inc.evaluated) - 2
    assert files_of(tmp_path / "site") == files_of(tmp_path / "full")


SPECTRAL = """\
spec: 1
id: s
title: Spectral panel
white:
  target: D65
  tolerance: {delta_uv: 0.004}
primaries:
  red:   {spectrum: {file: spectra/s.csv, channel: red}}
  green: {x: 0.300, y: 0.600}
  blue:  {x: 0.150, y: 0.060}
"""


def _red_band(peak: int) -> str:
    rows = "\n".join(f"{wl},{1.0 if abs(wl - peak) <= 10 else 0.0}" for wl in range(380, 781, 5))
    return "wavelength,red\n" + rows + "\n"


def test_an_edit_of_a_spectra_file_redraws_the_spec_that_reads_it(spec_dir, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    spec_dir("s.yaml", SPECTRAL)
    spec_dir("d.yaml", PANEL.format(id="d", ref="srgb"))
    (spec_dir.dir / "spectra").mkdir()
    csv = spec_dir.dir / "spectra" / "s.csv"
    csv.write_text(_red_band(630))
    out, full = tmp_path / "site", tmp_path / "full"
    build(spec_dir.dir, out)
    page = (out / "s" / "index.html").read_bytes()
    assert build(spec_dir.dir, out).reused == 2
    csv.write_text(_red_band(620))
    inc = build(spec_dir.dir, out)
    assert inc.reused == 1  # only the spec reading the file is drawn again
    assert (out / "s" / "index.html").read_bytes() != page
    build(spec_dir.dir, full, incremental=False)
    assert files_of(out) == files_of(full)


def test_the_key_names_the_spectra_files_a_spec_reads(spec_dir, tmp_path, monkeypatch):
    from generator.spec.load import load_specs

    monkeypatch.chdir(tmp_path)
    spec_dir("s.yaml", SPECTRAL)
    (spec_dir.dir / "spectra").mkdir()
    (spec_dir.dir / "spectra" / "s.csv").write_text(_red_band(630))
    (spec,), _ = load_specs(spec_dir.dir)
    assert list(spec.input_files) == ["spectra/s.csv"]
    before = C.spec_key(spec, {"s": spec})
    (spec_dir.dir / "spectra" / "s.csv").write_text(_red_band(625))
    (spec,), _ = load_specs(spec_dir.dir)
    assert C.spec_key(spec, {"s": spec}) != before


MEASURED = """\
spec: 1
id: m
title: Panel m, measured lot
white:
  target: D65
  tolerance: {delta_uv: 0.004}
primaries:
  red:   {x: 0.640, y: 0.330}
  green: {x: 0.300, y: 0.600}
  blue:  {x: 0.150, y: 0.060}
measurements:
  - lots/lot-7.csv
"""


def _lot_csv(white_x: float = 0.3127) -> str:
    lines = ["serial,lot,supplier,channel,x,y,Y"]
    for k in range(12):   # enough units for the lot page's diagrams and histograms
        x = white_x if k == 0 else 0.3127 + 0.0001 * (k % 3)
        lines.append(f"M{k:02d},L7,Acme Panels,white,{x:.4f},0.3290,{300 + k}")
        lines.append(f"M{k:02d},L7,Acme Panels,red,0.6400,0.3300,")
    return "\n".join(lines) + "\n"


@pytest.fixture
def measured(library):
    library("m.yaml", MEASURED)
    (library.dir / "lots").mkdir()
    (library.dir / "lots" / "lot-7.csv").write_text(_lot_csv(), encoding="utf-8")
    return library


def test_lot_and_supplier_pages_come_from_the_cache_and_equal_a_full_build(measured, tmp_path):
    out, full = tmp_path / "site", tmp_path / "full"
    build(measured.dir, out)
    second = build(measured.dir, out)
    assert second.reused == 5
    build(measured.dir, full, incremental=False)
    files = files_of(out)
    assert {"m/lots/L7.html", "m/suppliers/Acme-Panels.html"} <= set(files)
    assert any(name.startswith("m/lots/") and name.endswith(".svg") for name in files)
    assert files == files_of(full)


def test_editing_a_measurement_file_redraws_that_spec_with_its_lot_pages(measured, tmp_path):
    out, full = tmp_path / "site", tmp_path / "full"
    build(measured.dir, out)
    before = files_of(out)
    (measured.dir / "lots" / "lot-7.csv").write_text(_lot_csv(white_x=0.3300), encoding="utf-8")
    inc = build(measured.dir, out)
    assert inc.reused == 4   # a, b, c and d are unchanged; only m is drawn again
    after = files_of(out)
    for name in ("m/index.html", "m/xy.svg", "m/white.svg", "m/lots/L7.html", "m/suppliers/Acme-Panels.html"):
        assert after[name] != before[name], name
    assert all(after[n] == before[n] for n in before if n.startswith(("a/", "d/")))
    build(measured.dir, full, incremental=False)
    assert after == files_of(full)


def test_the_key_changes_with_the_bytes_of_a_measurement_file(measured):
    from generator.spec.load import load_specs

    specs, _ = load_specs(measured.dir)
    by_id = {s.id: s for s in specs}
    m = by_id["m"]
    assert m.measurements == [f"{m.file.rsplit('/', 1)[0]}/lots/lot-7.csv"]
    key = C.spec_key(m, by_id)
    m.measurement_digests = ["0" * 64]
    assert C.spec_key(m, by_id) != key


def test_a_cached_spec_brings_back_each_diagram_with_its_numbers_and_the_page(library, tmp_path):
    out = tmp_path / "site"
    evaluated = build(library.dir, out).evaluated
    by_id = {e.spec.id: e.spec for e in evaluated}
    files = C.Cache(C.cache_dir_for(out)).get(C.spec_key(by_id["a"], by_id))
    assert sorted(files) == [".entry-in-results", "index.html", "results.json"] + [
        f"{k}.{ext}" for k in ("uv", "white", "xy") for ext in ("csv", "json", "svg")]
    site = files_of(out)
    assert all(files[name] == site[f"a/{name}"] for name in files if name != ".entry-in-results")
    # the entry as the site's results.json holds it: the spec's own file, indented by four more spaces
    assert files[".entry-in-results"] in site["results.json"]
    assert files[".entry-in-results"] == files["results.json"].rstrip(b"\n").replace(b"\n", b"\n    ")


def test_site_url_and_the_reload_script_are_part_of_the_key(library, tmp_path):
    out, url = tmp_path / "site", "https://specs.example.org/colour/"
    build(library.dir, out)
    assert build(library.dir, out, site_url=url).reused == 0
    page = (out / "a" / "index.html").read_text(encoding="utf-8")
    assert f'<link rel="canonical" href="{url}a/index.html">' in page
    assert build(library.dir, out, site_url=url).reused == 4
    assert build(library.dir, out, reload=True).reused == 0
    assert '<script src="../static/reload.js"></script>' in (out / "a" / "index.html").read_text(encoding="utf-8")
    assert build(library.dir, out, reload=True).reused == 4
    build(library.dir, tmp_path / "full", incremental=False, reload=True)
    assert files_of(out) == files_of(tmp_path / "full")


def test_a_build_that_reuses_every_page_does_not_import_the_figure_code(library, tmp_path):
    out = tmp_path / "site"
    build(library.dir, out)
    code = ("import sys; from pathlib import Path; from generator.build import build; "
            "s = build(Path(sys.argv[1]), Path(sys.argv[2])); "
            "print('generator.render.svgplot' in sys.modules or 'matplotlib' in sys.modules, s.reused)")
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    r = subprocess.run([sys.executable, "-c", code, "specs", "site"], cwd=tmp_path, env=env,
                       capture_output=True, text=True, timeout=120)
    assert r.stdout.split() == ["False", "4"], r.stderr


def test_a_cached_spec_brings_back_its_spectra_and_volume_figures_with_their_numbers(spec_dir, tmp_path,
                                                                                        monkeypatch):
    monkeypatch.chdir(tmp_path)
    spec_dir("s.yaml", SPECTRAL + "gamut:\n  - {reference: srgb, metric: volume, min: 50}\n")
    (spec_dir.dir / "spectra").mkdir()
    (spec_dir.dir / "spectra" / "s.csv").write_text(_red_band(630))
    out = tmp_path / "site"
    evaluated = build(spec_dir.dir, out).evaluated
    by_id = {e.spec.id: e.spec for e in evaluated}
    files = C.Cache(C.cache_dir_for(out)).get(C.spec_key(by_id["s"], by_id))
    assert sorted(files) == [".entry-in-results", "index.html", "results.json"] + [
        f"{k}.{ext}" for k in ("spectra", "uv", "volume", "white", "xy") for ext in ("csv", "json", "svg")]
    site = files_of(out)
    assert all(files[name] == site[f"s/{name}"] for name in files if name != ".entry-in-results")
    assert build(spec_dir.dir, out).reused == 1
    assert files_of(out) == site


def test_unchanged_entries_of_the_sites_results_are_copied_from_the_cache(library, tmp_path):
    """The site's results.json takes each spec's entry, indented as it stands there, from
    the spec's cache entry (publish.Span, copied by the kernel), the entry just drawn
    included; the result is the clean build's file."""
    from generator.publish import Span
    from generator.render import site as site_mod

    out, ref = tmp_path / "site", tmp_path / "clean"
    build(library.dir, out)
    spans = []
    real_parts = site_mod.Parts
    site_mod.Parts = lambda parts: spans.extend(p for p in parts if isinstance(p, Span)) or real_parts(parts)
    try:
        (library.dir / "d.yaml").write_text((library.dir / "d.yaml").read_text().replace("title: ", "title: New "))
        build(library.dir, out)
    finally:
        site_mod.Parts = real_parts
    cache = C.cache_dir_for(out)
    assert len(spans) == 4 and all(s.path.is_relative_to(cache) and s.offset == 0 for s in spans)
    build(library.dir, ref, incremental=False)
    assert files_of(out) == files_of(ref)
    assert not any(".entry" in rel for rel in files_of(out))
