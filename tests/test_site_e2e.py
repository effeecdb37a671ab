"""End to end: the demo specs built into a site; pages, diagrams and results.json."""
from __future__ import annotations

import os
import re
import subprocess
import sys
from pathlib import Path
from xml.etree import ElementTree as ET

from generator.build import build

from .conftest import DEMO_SPECS, ROOT

CONTRACT_REFS = ("srgb", "bt709", "dci-p3", "display-p3", "bt2020", "adobe-rgb-1998", "ntsc-1953")


def test_index_lists_every_demo_spec_with_its_verdict(demo_site, demo_results):
    html = (demo_site / "index.html").read_text(encoding="utf-8")
    assert len(demo_results["specs"]) == len(list(DEMO_SPECS.glob("*.yaml")))
    for s in demo_results["specs"]:
        assert f'href="{s["id"]}/index.html"' in html
        row = html[html.index(f'href="{s["id"]}/index.html"'):]
        row = row[: row.index("</tr>")]
        symbol = {"pass": "✓", "fail": "✗", "indeterminate": "?"}[s["verdict"]]
        assert f"{symbol} {s['verdict']}" in row


def test_demo_shows_both_verdicts(demo_results):
    verdicts = {s["verdict"] for s in demo_results["specs"]}
    assert {"pass", "fail"} <= verdicts
    unit_verdicts = {u["verdict"] for s in demo_results["specs"] for u in s["units"]}
    assert {"pass", "fail"} <= unit_verdicts


def test_spec_page_sections_follow_the_reading_order(demo_site):
    page = (demo_site / "corvinta-atlas-27-studio" / "index.html").read_text(encoding="utf-8")
    imgs = re.findall(r'<img src="([^"]+)" alt="([^"]+)"', page)
    assert [i[0] for i in imgs] == ["xy.svg", "uv.svg", "white.svg"]
    assert all(alt.strip() for _, alt in imgs)
    order = ["verdict", "diagrams", "compliance", "derived", "units", "notes", "methods", "downloads"]
    positions = [page.index(f'<section id="{s}"') for s in order]
    assert positions == sorted(positions)
    assert page.index("<img") < page.index('<section id="compliance"')
    assert "✗ fail" in page and "✓ pass" in page


def test_every_diagram_is_well_formed_svg_with_the_expected_layers(demo_site):
    svgs = sorted(demo_site.glob("*/*.svg"))
    assert len(svgs) == 3 * len(list(DEMO_SPECS.glob("*.yaml")))
    for p in svgs:
        root = ET.fromstring(p.read_text(encoding="utf-8"))
        assert root.tag.endswith("svg")
    xy = (demo_site / "corvinta-atlas-27-studio" / "xy.svg").read_text(encoding="utf-8")
    for text in ("spectral locus", "Planckian locus", "DCI-P3", "ITU-R BT.2020", "spec gamut", "unit: fail", "520"):
        assert text in xy, text


def test_results_json_follows_the_documented_contract(demo_results):
    assert demo_results["format"] == "colourspec-results/1"
    for s in demo_results["specs"]:
        for k in ("id", "file", "revision", "status", "verdict", "derived", "requirements"):
            assert k in s
        w = s["derived"]["white"]
        assert all(isinstance(w[k], float) for k in ("x", "y", "u_prime", "v_prime", "cct_K", "duv"))
        g = s["derived"]["gamut"]
        for ref in CONTRACT_REFS:
            for k in ("coverage_xy", "coverage_uv", "area_ratio_xy", "area_ratio_uv"):
                assert isinstance(g["vs"][ref][k], float)
            assert 0 <= g["vs"][ref]["coverage_xy"] <= 100
        if len(s["derived"]["primaries"]) == 3:
            assert len(s["derived"]["npm"]) == 3 and all(len(r) == 3 for r in s["derived"]["npm"])
        else:
            assert "npm" not in s["derived"]
        for r in s["requirements"]:
            assert r["verdict"] in ("pass", "fail", "indeterminate")
            assert isinstance(r["limit"], dict)
            if r["subject"] == "gamut":
                assert r["reference"] and r["diagram"] in ("xy", "uv")
        if any(r["verdict"] == "fail" for r in s["requirements"]):
            assert s["verdict"] == "fail"


def test_inherited_spec_takes_parent_values_and_overrides_its_own(demo_results):
    specs = {s["id"]: s for s in demo_results["specs"]}
    child, parent = specs["corvinta-brisk-16-office"], specs["corvinta-brisk-14-office"]
    assert child["derived"]["primaries"] == parent["derived"]["primaries"]
    lum = [r for r in child["requirements"] if r["id"] == "white.luminance" and r["sample"] is None]
    assert lum[0]["value"] == 400.0 and lum[0]["limit"] == {"min": 360.0}


def test_two_builds_in_different_folders_are_byte_identical(tmp_path):
    # the second build runs in a fresh process: no diagram is reused from the first one's memory
    outs = [tmp_path / "a" / "site", tmp_path / "b" / "site"]
    cwd = os.getcwd()
    os.chdir(ROOT)
    try:
        build(DEMO_SPECS, outs[0])
    finally:
        os.chdir(cwd)
    code = ("import sys; from pathlib import Path; from generator.build import build; "
            "build(Path('specs'), Path(sys.argv[1]))")
    subprocess.run([sys.executable, "-c", code, str(outs[1])], cwd=ROOT, check=True)
    files_a = sorted(p.relative_to(outs[0]) for p in outs[0].rglob("*") if p.is_file())
    files_b = sorted(p.relative_to(outs[1]) for p in outs[1].rglob("*") if p.is_file())
    assert files_a == files_b
    for rel in files_a:
        assert (outs[0] / rel).read_bytes() == (outs[1] / rel).read_bytes(), rel


def test_pages_link_only_relative_paths_that_exist(demo_site):
    for page in demo_site.rglob("*.html"):
        html = page.read_text(encoding="utf-8")
        for ref in re.findall(r'(?:href|src)="([^"#]+)"', html):
            assert not ref.startswith(("/", "file:")), ref
            if ref.startswith(("http:", "https:", "mailto:", "data:")):
                continue
            assert (page.parent / ref).resolve().exists(), f"{page.name}: {ref}"


def test_lighting_spec_carries_the_safety_caution_and_displays_do_not(demo_site):
    lighting = (demo_site / "corvinta-halo-rgbw-module" / "index.html").read_text(encoding="utf-8")
    display = (demo_site / "corvinta-atlas-27-studio" / "index.html").read_text(encoding="utf-8")
    assert "accredited laboratory" in lighting
    assert "accredited laboratory" not in display


def test_site_contains_no_absolute_path_of_the_build_machine(demo_site):
    root = str(Path(ROOT))
    for p in demo_site.rglob("*"):
        if p.is_file() and p.suffix in (".html", ".json", ".svg", ".csv", ".js", ".css"):
            assert root not in p.read_text(encoding="utf-8"), p


def test_the_page_of_an_inheriting_spec_lists_each_inherited_value_and_its_source(demo_site):
    page = (demo_site / "corvinta-brisk-16-office" / "index.html").read_text(encoding="utf-8")
    section = page.split('<section id="inherited" class="inherited"', 1)[1].split("</section>", 1)[0]
    link = '<a href="../corvinta-brisk-14-office/index.html">corvinta-brisk-14-office</a>'
    for key in ("white.target", "white.tolerance", "primaries", "gamut"):
        assert f"<tr><td><code>{key}</code></td><td>{link}</td></tr>" in section
    assert "<code>white</code>" not in section and "white.luminance" not in section
    assert "inherited" not in (demo_site / "corvinta-brisk-14-office" / "index.html").read_text(encoding="utf-8")
