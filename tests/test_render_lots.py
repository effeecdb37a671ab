"""Lot and supplier pages of the demo site: verdicts, the rule, statistics, histograms."""
from __future__ import annotations

import json

from generator.render.lots import slug

VELA = "corvinta-vela-24-monitor"


def test_each_demo_lot_has_the_verdict_it_was_made_for(demo_site):
    s = json.loads((demo_site / VELA / "results.json").read_text())
    verdicts = {lot["lot"]: lot["verdict"] for lot in s["lots"]}
    assert verdicts == {"TPW-2611A": "pass", "UO-0611": "fail", "TPW-2612B": "indeterminate"}
    assert s["decision"]["name"] == "guard-banded"
    assert {x["supplier"] for x in s["suppliers"]} == {"Tessaly Panel Works", "Umbrin Optoelectronics"}


def test_lot_page_shows_rule_statistics_histograms_and_units(demo_site):
    html = (demo_site / VELA / "lots" / "TPW-2612B.html").read_text()
    assert "? INDETERMINATE" in html and "guard-banded acceptance, w = U" in html
    assert "Statistics per requirement" in html and "white.uniformity.luminance" not in html  # no grid points
    assert 'src="TPW-2612B-white.delta_uv.svg"' in html
    svg = (demo_site / VELA / "lots" / "TPW-2612B-white.delta_uv.svg").read_text()
    assert "upper limit" in svg and "acceptance limit (limit − U)" in svg
    assert "VL24-00204" in html                  # an indeterminate unit is listed


def test_lot_with_grid_points_has_uniformity_statistics(demo_site):
    html = (demo_site / VELA / "lots" / "TPW-2611A.html").read_text()
    assert "white.uniformity.luminance" in html and "white.uniformity.colour" in html


def test_supplier_page_lists_its_lots_with_links(demo_site):
    html = (demo_site / VELA / "suppliers" / "Tessaly-Panel-Works.html").read_text()
    assert 'href="../lots/TPW-2611A.html"' in html and 'href="../lots/TPW-2612B.html"' in html
    assert "UO-0611" not in html


def test_spec_page_prints_the_rule_and_links_lots_and_suppliers(demo_site):
    html = (demo_site / VELA / "index.html").read_text()
    assert "Decision rule: guard-banded acceptance" in html and "delta_uv 0.0015" in html
    assert 'href="lots/UO-0611.html"' in html and 'href="suppliers/Umbrin-Optoelectronics.html"' in html


def test_slugs_are_unique_and_safe():
    taken: set = set()
    assert [slug(s, taken) for s in ("L 1/2", "L-1-2", "..", "l 1/2")] == ["L-1-2", "L-1-2-2", "item", "l-1-2-3"]
