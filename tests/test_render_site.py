"""Page contexts and what the pages show (render/site.py, templates)."""
from __future__ import annotations

import os
import re

import pytest

from generator.build import build, evaluate
from generator.cli import main
from generator.render.site import canonical, index_context

from .conftest import DEMO_SPECS, ROOT


def test_index_groups_specs_by_product_family_in_name_order(demo_site):
    evaluated, _ = evaluate(DEMO_SPECS)
    ctx = index_context(evaluated)
    families = [g["family"] for g in ctx["groups"]]
    assert families == sorted(families, key=str.lower) and len(families) == len(set(families))
    assert sum(len(g["specs"]) for g in ctx["groups"]) == len(evaluated)
    html = (demo_site / "index.html").read_text(encoding="utf-8")
    for g in ctx["groups"]:
        assert f'<tbody class="family" id="{g["anchor"]}">' in html
        assert f'<a href="#{g["anchor"]}">' in html


def test_index_rows_carry_what_the_filter_matches(demo_site, demo_results):
    html = (demo_site / "index.html").read_text(encoding="utf-8")
    rows = re.findall(r'<tr class="spec-row" data-verdict="(\w+)" data-status="(\w+)" data-search="([^"]*)"', html)
    assert len(rows) == len(demo_results["specs"])
    by_id = {s["id"]: s for s in demo_results["specs"]}
    for verdict, status, search in rows:
        sid = next(i for i in by_id if i in search)
        assert (verdict, status) == (by_id[sid]["verdict"], by_id[sid]["status"])
        assert search == search.lower()
    assert '<script src="static/filter.js"></script>' in html
    assert '<form class="filter" id="filter" role="search" aria-label="Filter the specs" hidden>' in html


def test_index_names_each_gamut_requirements_key_figure(demo_site):
    html = (demo_site / "index.html").read_text(encoding="utf-8")
    row = html[html.index('href="corvinta-atlas-27-studio/index.html"'):]
    row = row[: row.index("</tr>")]
    assert "DCI-P3 coverage (u&#39;v&#39;): 100.0 %" in row  # autoescaped
    assert "sRGB area ratio (xy): 135.7 %" in row


def test_canonical_address_joins_site_url_and_page_path():
    url = "https://specs.example.org/colour/"
    assert canonical(url, "a/index.html") == "https://specs.example.org/colour/a/index.html"
    assert canonical("https://specs.example.org/colour/", "index.html") == "https://specs.example.org/colour/"
    assert canonical(None, "a/index.html") == ""


def test_site_url_adds_canonical_links_and_keeps_page_links_relative(tmp_path):
    cwd = os.getcwd()
    os.chdir(ROOT)
    try:
        build(DEMO_SPECS, tmp_path / "site", site_url="https://specs.example.org/colour/")
        build(DEMO_SPECS, tmp_path / "plain")
    finally:
        os.chdir(cwd)
    page = (tmp_path / "site" / "corvinta-atlas-27-studio" / "index.html").read_text(encoding="utf-8")
    assert '<link rel="canonical" href="https://specs.example.org/colour/corvinta-atlas-27-studio/index.html">' in page
    assert 'href="../static/site.css"' in page and 'href="../index.html"' in page
    plain = (tmp_path / "plain" / "corvinta-atlas-27-studio" / "index.html").read_text(encoding="utf-8")
    assert "canonical" not in plain


def test_build_refuses_a_site_url_that_is_not_an_address(tmp_path, capsys):
    with pytest.raises(SystemExit) as exc:
        main(["build", str(DEMO_SPECS), "-o", str(tmp_path / "s"), "--site-url", "specs.example.org"])
    assert exc.value.code == 2
    assert "expected an address starting with https:// or http://, found 'specs.example.org'" in capsys.readouterr().err
    assert not (tmp_path / "s").exists()


def test_spec_page_verdict_box_says_what_fails_and_by_how_much(demo_site):
    page = (demo_site / "corvinta-atlas-27-studio" / "index.html").read_text(encoding="utf-8")
    box = page[page.index('<section id="verdict"'): page.index("</section>")]
    assert "✗ FAIL" in box and "What fails, and by how much:" in box
    assert ("coverage of DCI-P3 (CIE 1976 u&#39;v&#39;) — unit AT27-0002: 93.2% against ≥ 95.0%, "
            "<strong>outside by 1.8 points</strong>") in box


def test_passing_spec_page_says_that_everything_passes(demo_site):
    page = (demo_site / "corvinta-brisk-14-office" / "index.html").read_text(encoding="utf-8")
    box = page[page.index('<section id="verdict"'): page.index("</section>")]
    assert "✓ PASS" in box and "Every requirement passes" in box


def test_every_verdict_on_a_page_is_given_by_word_and_symbol(demo_site):
    for page in demo_site.rglob("*.html"):
        html = page.read_text(encoding="utf-8")
        for m in re.finditer(r'<span class="verdict (pass|fail|indeterminate)">([^<]*)</span>', html):
            verdict, text = m.groups()
            symbol = {"pass": "✓", "fail": "✗", "indeterminate": "?"}[verdict]
            assert text.startswith(symbol) and verdict in text.lower(), (page.name, text)


def test_method_section_names_observer_methods_and_editions(demo_site):
    page = (demo_site / "corvinta-atlas-27-studio" / "index.html").read_text(encoding="utf-8")
    methods = page[page.index('<section id="methods"'):]
    methods = methods[: methods.index("</section>")]
    for text in ("CIE 1931 2° standard observer", "CIE 018:2019", "CIE 15:2004", "SMPTE RP 177-1993",
                 "ILAC-G8:09/2019", "IEC 61966-2-1:1999"):
        assert text in methods, text


def test_swatches_are_approximate_previews_with_fixed_colours(demo_site):
    page = (demo_site / "corvinta-atlas-27-studio" / "index.html").read_text(encoding="utf-8")
    swatches = re.findall(r'<span class="swatch" style="background-color: (#[0-9a-f]{6})" '
                          r'title="approximate sRGB preview">', page)
    assert len(swatches) == 4  # white and three primaries
    assert "approximate sRGB renderings" in page


def test_served_build_includes_the_reload_script_and_a_plain_build_does_not(tmp_path):
    cwd = os.getcwd()
    os.chdir(ROOT)
    try:
        build(DEMO_SPECS, tmp_path / "served", reload=True)
    finally:
        os.chdir(cwd)
    assert '<script src="../static/reload.js"></script>' in (
        tmp_path / "served" / "corvinta-atlas-27-studio" / "index.html").read_text(encoding="utf-8")
    index = (tmp_path / "served" / "index.html").read_text(encoding="utf-8")
    assert '<script src="static/reload.js"></script>' in index


def test_plain_build_has_no_reload_script(demo_site):
    for page in demo_site.rglob("*.html"):
        assert "reload.js" not in page.read_text(encoding="utf-8")


def test_failing_rows_in_the_verdict_box_name_their_subject(demo_site):
    page = (demo_site / "corvinta-pocket-6-phone" / "index.html").read_text(encoding="utf-8")
    box = page[page.index('<section id="verdict"'): page.index("</section>")]
    assert "blue: Δu&#39;v&#39; from target — unit PK6-20003: 0.0121 against ≤ 0.0060" in box
    assert "white: white luminance" not in box and "white luminance — unit PK6-20003" in box
