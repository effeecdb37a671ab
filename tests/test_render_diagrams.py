"""What the diagrams draw and the numbers published beside them (render/figures.py, render/diagrams.py)."""
from __future__ import annotations

import csv
import io
import json
import re
from xml.etree import ElementTree as ET

import numpy as np
import pytest

from generator.render import figures as F
from generator.render.swatch import swatch_hex, xy_to_preview_rgb

SVG_NS = "{http://www.w3.org/2000/svg}"


def _layer(units=()):
    prim = [("red", (0.64, 0.33)), ("green", (0.30, 0.60)), ("blue", (0.15, 0.06))]
    return F.Layer("test diagram", np.array([p for _, p in prim]), prim, (0.3127, 0.3290),
                   [("sRGB", np.array([p for _, p in prim]))], [("red: box", F.box_xy((0.64, 0.33), 0.01, 0.01))],
                   list(units))


def test_full_diagram_embeds_the_approximate_colour_fill_clipped_to_the_locus_and_says_so():
    fig, _ = F.chromaticity_diagram(_layer(), "xy")
    svg = F.save_svg(fig)
    root = ET.fromstring(svg)
    images = root.findall(f".//{SVG_NS}image")
    assert len(images) == 1
    clip = [g for g in root.iter() if g.find(f"{SVG_NS}image") is not None][0]
    assert "clip-path" in clip.attrib
    assert "approximate colours (sRGB preview)" in svg


def test_neutral_diagram_by_choice_has_no_colour_fill():
    fig, _ = F.chromaticity_diagram(_layer(), "uv", fill=False)
    svg = F.save_svg(fig)
    assert "<image" not in svg and "sRGB preview" not in svg


def test_overlay_layers_are_removed_after_saving_so_the_next_diagram_starts_clean():
    fig, _ = F.chromaticity_diagram(_layer([("U1 red", (0.63, 0.33), "fail")]), "xy")
    first = F.save_svg(fig)
    fig, _ = F.chromaticity_diagram(_layer(), "xy")
    second = F.save_svg(fig)
    assert "unit: fail" in first and "unit: fail" not in second
    assert second.count("<svg") == 1 and ET.fromstring(second) is not None


def test_composed_svg_ids_are_unique():
    fig, _ = F.chromaticity_diagram(_layer([("U1 red", (0.63, 0.33), "pass")]), "uv")
    svg = F.save_svg(fig, "t", "d")
    ids = re.findall(r'\bid="([^"]+)"', svg)
    assert len(ids) == len(set(ids))


def test_saved_svg_carries_title_and_description_for_screen_readers():
    fig, _ = F.chromaticity_diagram(_layer(), "xy")
    svg = F.save_svg(fig, "CIE 1931 xy <diagram>", "three primaries & a white")
    root = ET.fromstring(svg)
    assert root.find(f"{SVG_NS}title").text == "CIE 1931 xy <diagram>"
    assert root.find(f"{SVG_NS}desc").text == "three primaries & a white"
    assert root.attrib["role"] == "img"


def _marker_steps(d: str) -> str:
    """The shape of one marker in a marker path: its commands after the first move-to."""
    return re.split(r"M[-\d.]+,[-\d.]+", d)[1]


def test_units_differ_by_marker_shape_as_well_as_colour():
    fig, _ = F.chromaticity_diagram(_layer([("A", (0.64, 0.33), "pass"), ("B", (0.3, 0.6), "fail"),
                                            ("C", (0.15, 0.06), "indeterminate")]), "xy")
    root = ET.fromstring(F.save_svg(fig))
    marks = {el.get("class"): el for el in root.iter(f"{SVG_NS}path") if (el.get("class") or "").startswith("unit-")}
    assert set(marks) == {"unit-pass", "unit-fail", "unit-indeterminate"}
    shapes = {k: _marker_steps(el.get("d")) for k, el in marks.items()}
    assert shapes["unit-pass"].startswith("a") and shapes["unit-pass"].count("a") == 2   # a circle
    assert shapes["unit-fail"].count(" ") == 10                                           # an X: 12 corners
    assert shapes["unit-indeterminate"].count(" ") == 2                                   # a diamond: 4 corners
    assert marks["unit-pass"].get("fill") == "none"                                       # open circle
    assert len({el.get("stroke") for el in marks.values()}) == 3
    legend = [t.text for t in root.iter(f"{SVG_NS}text")]
    assert {"unit: pass", "unit: fail", "unit: indeterminate"} <= set(legend)


def _clip_rect(root, clip_id):
    r = root.find(f".//{SVG_NS}clipPath[@id='{clip_id}']/{SVG_NS}rect")
    x, y, w, h = (float(r.get(k)) for k in ("x", "y", "width", "height"))
    return x, y, x + w, y + h


def test_white_closeup_labels_isotherms_and_constant_duv_lines_inside_its_frame():
    layer = F.Layer("w", None, [], (0.3127, 0.3290), [], [("white: circle", F.uv_circle_xy((0.3127, 0.3290), 0.004))],
                    [("U1 white", (0.3131, 0.3288), "pass")])
    fig, ax = F.white_closeup(layer)
    svg = F.save_svg(fig)
    root = ET.fromstring(svg)
    x0, y0, x1, y1 = _clip_rect(root, "clip1")
    assert (x0, y0, x1, y1) == pytest.approx((ax.left, ax.top, ax.right, ax.bottom), abs=0.01)
    texts = {t.text: (float(t.get("x")), float(t.get("y"))) for t in root.iter(f"{SVG_NS}text")}
    line_labels = {k: v for k, v in texts.items() if k.endswith(" K") or k.startswith("Duv ")}
    assert "6500 K" in line_labels and "Duv +0.005" in line_labels
    assert all(x0 <= x <= x1 and y0 <= y <= y1 for x, y in line_labels.values())
    legend = root.find(f".//{SVG_NS}g[@class='legend']")
    entries = [float(t.get("y")) for t in legend.iter(f"{SVG_NS}text")]
    assert entries and min(entries) > y1  # the legend sits below the frame, covering nothing
    assert "white: circle (to scale)" in svg and "unit: pass" in svg


def test_white_closeup_line_labels_do_not_overlap_each_other():
    layer = F.Layer("w", None, [], (0.3127, 0.3290), [], [], [("U1 white", (0.33, 0.35), "fail")])
    fig, _ = F.white_closeup(layer, span=0.03)
    root = ET.fromstring(F.save_svg(fig))
    boxes = [tuple(float(r.get(k)) for k in ("x", "y", "width", "height")) for r in root.iter(f"{SVG_NS}rect")
             if r.get("fill-opacity") == "0.85"]
    assert len(boxes) >= 6
    for i, (xa, ya, wa, ha) in enumerate(boxes):
        for xb, yb, wb, hb in boxes[i + 1:]:
            assert not (xa < xb + wb and xb < xa + wa and ya < yb + hb and yb < ya + ha)


def test_white_closeup_reuses_its_figure_without_keeping_the_last_specs_layers():
    def layer(verdict):
        return F.Layer("w", None, [], (0.3127, 0.3290), [], [], [("U1 white", (0.3131, 0.3288), verdict)])

    first = F.save_svg(F.white_closeup(layer("fail"))[0])
    second = F.save_svg(F.white_closeup(layer("pass"))[0])
    assert "unit: fail" in first and "unit: fail" not in second and "unit: pass" in second


def test_locus_fill_is_computed_once_and_neutral_at_d65():
    a = F.locus_fill("xy")
    assert F.locus_fill("xy") is a
    assert a.dtype == np.uint8 and a.shape[2] == 3
    r, g, b = xy_to_preview_rgb((0.3127, 0.3290))
    assert max(r, g, b) - min(r, g, b) < 0.01


def test_swatches_show_d65_as_white_and_srgb_red_as_red():
    assert swatch_hex((0.3127, 0.3290)) == "#ffffff"
    assert swatch_hex((0.64, 0.33)) == "#ff0000"
    assert swatch_hex((float("nan"), 0.3)) == "#000000"


def test_each_figure_publishes_the_points_it_drew_as_csv_and_json(demo_site, demo_results):
    spec = next(s for s in demo_results["specs"] if s["id"] == "corvinta-atlas-27-studio")
    folder = demo_site / spec["id"]
    for which, (a, b) in (("xy", ("x", "y")), ("uv", ("u_prime", "v_prime")), ("white", ("u_prime", "v_prime"))):
        rows = list(csv.DictReader(io.StringIO((folder / f"{which}.csv").read_text(encoding="utf-8"))))
        doc = json.loads((folder / f"{which}.json").read_text(encoding="utf-8"))
        assert doc["coordinates"] == [a, b]
        assert [r["name"] for r in rows] == [p["name"] for p in doc["points"]]
        for r, p in zip(rows, doc["points"], strict=True):
            assert abs(float(r[a]) - p[a]) < 1e-6 and abs(float(r[b]) - p[b]) < 1e-6
        units = {r["name"].split()[0]: r["verdict"] for r in rows if r["kind"] == "unit"}
        assert units == {u["serial"]: u["verdict"] for u in spec["units"]}
        assert doc["tolerances"] and all(len(t["outline"]) >= 4 for t in doc["tolerances"])
    xy = json.loads((folder / "xy.json").read_text(encoding="utf-8"))
    red = next(p for p in xy["points"] if p["kind"] == "target" and p["name"] == "red")
    assert (red["x"], red["y"]) == (0.68, 0.32)


def test_spec_page_shows_each_figures_numbers_in_a_table_beside_it(demo_site):
    page = (demo_site / "corvinta-atlas-27-studio" / "index.html").read_text(encoding="utf-8")
    for which in ("xy", "uv", "white"):
        block = page[page.index(f'id="fig-{which}"'):]
        block = block[: block.index('<div class="figure-pair"') if '<div class="figure-pair"' in block else None]
        assert f'<img src="{which}.svg"' in block and "<table" in block
        assert f'href="{which}.csv"' in block and f'href="{which}.json"' in block
    assert "unit: AT27-0002 white" in page


def test_an_unchanged_diagram_is_not_redrawn_and_a_changed_one_is(monkeypatch):
    from generator.render import diagrams as D

    calls = []
    real = F.chromaticity_diagram
    monkeypatch.setattr(F, "chromaticity_diagram", lambda *a, **k: calls.append(a) or real(*a, **k))
    a = D._draw("xy", _layer([("U1 red", (0.63, 0.33), "pass")]), "memo test", "d")
    b = D._draw("xy", _layer([("U1 red", (0.63, 0.33), "pass")]), "memo test", "d")
    c = D._draw("xy", _layer([("U1 red", (0.63, 0.33), "fail")]), "memo test", "d")
    assert a == b and a != c
    assert len(calls) == 2


def test_clip_path_ids_do_not_depend_on_where_objects_live_in_memory():
    fig, _ = F.chromaticity_diagram(_layer(), "xy")
    svg = F.save_svg(fig)
    clip_ids = re.findall(r'<clipPath id="([^"]+)"', svg)
    assert clip_ids == [f"clip{n}" for n in range(1, len(clip_ids) + 1)]
    assert all(f"url(#{i})" in svg for i in clip_ids)


def test_a_diagram_drawn_after_another_is_byte_identical_to_one_drawn_before_it():
    a = _layer([("U1 red", (0.63, 0.33), "fail")])
    b = _layer([("U2 green", (0.31, 0.59), "pass"), ("U3 blue", (0.16, 0.07), "indeterminate")])
    first = F.save_svg(F.chromaticity_diagram(a, "uv")[0], "t", "d")
    F.save_svg(F.chromaticity_diagram(b, "uv")[0], "t", "d")
    assert F.save_svg(F.chromaticity_diagram(a, "uv")[0], "t", "d") == first


def test_the_static_frame_is_drawn_once_per_diagram_observer_and_fill():
    assert F._static("xy", "cie1931-2", True) is F._static("xy", "cie1931-2", True)
    two, ten = F._static("xy", "cie1931-2", False), F._static("xy", "cie1964-10", False)
    assert two.fig.body != ten.fig.body  # the 10° locus differs
    layer = _layer()
    layer.observer = "cie1964-10"
    svg = F.save_svg(F.chromaticity_diagram(layer, "xy", fill=False)[0])
    assert "".join(ten.fig.body) in svg


def test_a_point_of_the_layer_lands_where_the_axes_map_it():
    fig, ax = F.chromaticity_diagram(_layer([("U1", (0.3, 0.6), "fail")]), "xy")
    root = ET.fromstring(F.save_svg(fig))
    d = next(p for p in root.iter(f"{SVG_NS}path") if p.get("class") == "unit-fail").get("d")
    x, y = (float(v) for v in re.match(r"M([-\d.]+),([-\d.]+)", d).groups())
    cx, cy = ax.px((0.3, 0.6))
    first = F.S._SHAPES["X"][0] * 5           # the marker path starts at its first corner
    assert (x, y) == pytest.approx((cx + first[0], cy + first[1]), abs=0.02)
    # the axes frame: x from -0.04 to 0.8 and y from -0.02 to 0.9 at one scale
    assert ax.sx == pytest.approx(ax.sy) and ax.px((-0.04, -0.02)).tolist() == pytest.approx([ax.left, ax.bottom])


def test_the_legend_of_a_full_diagram_moves_off_units_drawn_where_it_would_go():
    from generator.colour.convert import uv_prime_to_xy

    # units in the corner each diagram's legend prefers (upper right in xy, lower right in u'v')
    corner = {"xy": [(0.70 + 0.02 * i, 0.80) for i in range(3)],
              "uv": [tuple(uv_prime_to_xy(np.array([0.55 + 0.02 * i, 0.06]))) for i in range(3)]}
    for which, xys in corner.items():
        units = [(f"U{i}", xy, "fail") for i, xy in enumerate(xys)]
        fig, ax = F.chromaticity_diagram(_layer(units), which)
        root = ET.fromstring(F.save_svg(fig))
        r = root.find(f".//{SVG_NS}g[@class='legend']/{SVG_NS}rect")
        x, y, w, h = (float(r.get(k)) for k in ("x", "y", "width", "height"))
        pts = ax.px(F._to(which, np.array(xys + [(0.64, 0.33), (0.3, 0.6), (0.15, 0.06)])))
        assert not ((pts[:, 0] >= x) & (pts[:, 0] <= x + w) & (pts[:, 1] >= y) & (pts[:, 1] <= y + h)).any(), which
        assert "unit: fail" in [t.text for t in root.iter(f"{SVG_NS}text")]


def test_diagrams_without_units_tolerances_or_targets_still_draw_their_frame():
    bare = F.Layer("bare", None, [], (0.3127, 0.3290), [], [], [])
    for fig in (F.white_closeup(bare)[0], F.chromaticity_diagram(F.Layer("none", None, [], None, [], [], []), "uv")[0],
                F.white_closeup(F.Layer("nan", None, [], (0.3127, 0.3290), [], [], [("U", (np.nan, 0.3), "pass")]))[0]):
        root = ET.fromstring(F.save_svg(fig))
        texts = [t.text for t in root.iter(f"{SVG_NS}text")]
        assert "u'" in texts and "v'" in texts and not any(t.startswith("unit:") for t in texts)


def test_target_names_keep_off_each_other_and_the_wavelength_labels():
    prim = [("red", (0.69, 0.31)), ("status-red", (0.695, 0.305)), ("green", (0.19, 0.71)),
            ("status-green", (0.185, 0.705)), ("blue", (0.14, 0.07)), ("status-blue", (0.138, 0.075))]
    layer = F.Layer("labels", None, prim, None, [], [], [])
    for which in ("xy", "uv"):
        root = ET.fromstring(F.save_svg(F.chromaticity_diagram(layer, which)[0]))
        boxes = {}
        for t in root.iter(f"{SVG_NS}text"):
            if t.text in dict(prim) or t.text.isdigit() and len(t.text) == 3:
                boxes[t.text] = F.S.text_box(float(t.get("x")), float(t.get("y")), t.text, float(t.get("font-size")),
                                             t.get("text-anchor") or "start")
        names = [n for n, _ in prim]
        assert set(names) <= set(boxes)
        for n in names:
            others = [b for k, b in boxes.items() if k != n]
            assert not any(F.S._meets(boxes[n], b) for b in others), (which, n)


def test_the_observer_is_passed_to_planckian_functions_that_take_it_and_not_to_others():
    def with_observer(T, duv=0.0, observer="cie1931-2"):
        return observer

    def without(T, duv=0.0):
        return None

    assert F._kw(with_observer, "cie1964-10") == {"observer": "cie1964-10"}
    assert F._kw(without, "cie1964-10") == {}
    assert np.isfinite(F.planck_uv_prime(np.array([6500.0]), "cie1964-10")).all()


def test_the_table_beside_a_diagram_lists_every_target_and_at_most_the_cap_of_unit_points():
    from generator.render.diagrams import TABLE_UNIT_POINTS, table_rows

    rows = [{"kind": "target", "name": "white", "verdict": ""}]
    rows += [{"kind": "unit", "name": f"U{i}", "verdict": "fail" if i % 97 == 0 else "pass"} for i in range(1000)]
    rows += [{"kind": "reference", "name": "sRGB corner 1", "verdict": ""}]
    shown = table_rows(rows)
    units = [r for r in shown if r["kind"] == "unit"]
    assert len(units) == TABLE_UNIT_POINTS
    fails = [r["name"] for r in rows if r["verdict"] == "fail"]
    assert [r["name"] for r in units[:len(fails)]] == fails          # units that do not pass come first
    assert {r["kind"] for r in shown} == {"target", "unit", "reference"}
    assert table_rows(rows[:50]) == rows[:50]                       # under the cap: every point, in order


def test_point_texts_are_the_json_of_each_point_dict_for_awkward_names_and_numbers():
    from generator.render.diagrams import point_texts

    names = ['plain', 'quote " and back\\slash', "tab\tnew\nline", "Ünïcødé ΔE", "\x00ctl", "</script>"]
    nums = [0.3127, -0.0, 1e-17, 123456789.125, float("nan"), float("inf"), float("-inf"), 5e-324]
    rows = [{"kind": ("unit", "target")[k % 2], "name": names[k % len(names)],
             "at": np.array([nums[k % len(nums)], nums[(k * 3 + 1) % len(nums)]]),
             "verdict": ("", "pass", "fail")[k % 3]} for k in range(48)]
    texts = point_texts(rows, "u_prime", "v_prime")
    for r, t in zip(rows, texts, strict=True):
        d = {"kind": r["kind"], "name": r["name"], "u_prime": float(r["at"][0]), "v_prime": float(r["at"][1])}
        if r["verdict"]:
            d["verdict"] = r["verdict"]
        assert t == json.dumps(d, ensure_ascii=False, allow_nan=True)


@pytest.mark.parametrize("closed", [False, True])
def test_densified_polylines_are_the_segment_by_segment_points(closed):
    """All segments at once give the points of the plain per-segment loop, bit for bit."""
    rng = np.random.default_rng(7)
    px = rng.uniform(0, 500, (40, 2))
    px[5] = px[4]                                   # a zero-length segment: one point
    ref = np.vstack([px, px[:1]]) if closed else px
    out = [ref[:1]]
    for a, b in zip(ref[:-1], ref[1:]):
        n = max(1, int(np.ceil(np.hypot(*(b - a)) / 4.0)))
        out.append(a + (b - a) * (np.arange(1, n + 1)[:, None] / n))
    assert np.array_equal(F._densify(px, closed), np.vstack(out))


@pytest.mark.parametrize("names", [["S-1 white", "Ω-7 red", " spaced ", ""],
                                   ["S-1 white", 'quote " in it', "comma, in it", "new\nline", "cr\rhere"]])
def test_diagram_csv_is_what_csv_writer_writes(names):
    from generator.render.diagrams import _data_csv

    rows = [{"kind": "unit", "name": n, "at": (0.1 * k + 1e-7, float("nan") if k == 1 else 0.33), "verdict": v}
            for k, (n, v) in enumerate(zip(names, ["pass", "", "fail", "indeterminate", ""]))]
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["kind", "name", "u_prime", "v_prime", "verdict"])
    for r in rows:
        w.writerow([r["kind"], r["name"], f"{r['at'][0]:.6f}", f"{r['at'][1]:.6f}", r["verdict"]])
    assert _data_csv("uv", rows) == buf.getvalue()
