"""The SVG drawing primitives (render/svgplot.py): well-formed output, escaping, ticks,
the data-to-figure mapping, clip ids, markers, legends and determinism."""
from __future__ import annotations

import re
from xml.etree import ElementTree as ET

import numpy as np
import pytest

from generator.render import svgplot as S

SVG_NS = "{http://www.w3.org/2000/svg}"


def _figure(label="a label") -> S.Figure:
    fig = S.Figure(400, 300)
    ax = S.Axes((50, 20, 300, 200), (0, 1), (0, 2))
    clip = fig.clip_rect(ax)
    xt, xd = S.nice_ticks(0, 1, 6)
    yt, yd = S.nice_ticks(0, 2, 6)
    fig.add(S.grid(ax, xt, yt, "#dddddd"))
    fig.add(S.line(ax.px([(0, 0), (0.5, 1), (1, 2)]), "#0b57d0", 1.2, (0, (4, 2)), clip=clip))
    fig.add(S.markers(ax.px([(0.2, 0.2), (0.8, 1.5)]), "X", 5, "#b3261e", "#b3261e", clip=clip))
    fig.add(S.frame(ax, xt, yt, "x", "y", xd, yd))
    fig.add(S.text(200, 10, label, 10, anchor="middle", va="top"))
    keys = [S.Key(label, "#0b57d0", 1.2, (0, (4, 2))), S.Key("unit: fail", marker="X", marker_fill="#b3261e",
                                                            marker_stroke="#b3261e")]
    w, h = S.legend_size(keys)
    fig.add(S.legend(keys, S.LegendBox(ax.right - w - 4, ax.top + 4, w, h)))
    return fig


def test_a_figure_is_well_formed_svg_with_a_viewbox_title_and_description():
    svg = _figure().to_svg("A <title>", "a & description")
    root = ET.fromstring(svg)
    assert root.tag == f"{SVG_NS}svg"
    assert root.get("viewBox") == "0 0 400 300" and root.get("width") == "400pt"
    assert root.find(f"{SVG_NS}title").text == "A <title>"
    assert root.find(f"{SVG_NS}desc").text == "a & description"
    assert root.get("role") == "img" and root.get("aria-labelledby") == "fig-title fig-desc"
    assert not [el for el in root.iter() if el.tag in (f"{SVG_NS}script", f"{SVG_NS}foreignObject")]
    assert not [a for el in root.iter() for a in el.attrib if a.startswith("on")]


def test_without_title_or_description_the_svg_has_neither_nor_a_role():
    root = ET.fromstring(_figure().to_svg())
    assert root.find(f"{SVG_NS}title") is None and root.get("role") is None


@pytest.mark.parametrize("text", [
    "</text><script>window.__pwned=1</script>", 'a "quoted" & <b>bold</b> ]]>', "$\\frac{a}{$", "_hidden",
    "漢字 é ß €", "\u202etxt.exe",
])
def test_text_is_escaped_and_reads_back_exactly_as_written(text):
    root = ET.fromstring(_figure(text).to_svg(text, text))
    texts = [el.text for el in root.iter(f"{SVG_NS}text")]
    assert texts.count(text) == 2  # the title and the legend entry
    assert root.find(f"{SVG_NS}title").text == text
    assert root.find(f".//{SVG_NS}script") is None


def test_characters_xml_cannot_carry_become_replacement_characters():
    text = "bell\x07 nul\x00 esc\x1b lone\ud800 end"
    root = ET.fromstring(_figure(text).to_svg(text, ""))
    assert root.find(f"{SVG_NS}title").text == "bell\ufffd nul\ufffd esc\ufffd lone\ufffd end"


def test_escaping_covers_markup_and_attribute_quotes():
    assert S.esc('<a href="x">&</a>') == "&lt;a href=&quot;x&quot;&gt;&amp;&lt;/a&gt;"


def test_numbers_have_at_most_two_decimals_no_trailing_zeros_and_no_negative_zero():
    assert [S.num(v) for v in (403.2, 3.0, 1.23456, -0.001, 0.005, 12.5, -7.255)] == \
        ["403.2", "3", "1.23", "0", "0.01", "12.5", "-7.25"]  # -7.255 is -7.25499... in binary


def test_nice_ticks_choose_1_2_2_5_5_steps_and_the_decimals_their_labels_need():
    t, d = S.nice_ticks(-0.04, 0.8, 10)
    assert np.allclose(t, np.arange(0, 0.81, 0.1)) and d == 1
    t, d = S.nice_ticks(-0.02, 0.9, 10)
    assert np.allclose(t, [0, 0.2, 0.4, 0.6, 0.8]) and d == 1
    t, d = S.nice_ticks(-200, 200, 5)
    assert t.tolist() == [-200, -100, 0, 100, 200] and d == 0
    t, d = S.nice_ticks(0.1765, 0.2265, 7)
    assert np.allclose(t, [0.18, 0.19, 0.20, 0.21, 0.22]) and d == 2
    t, d = S.nice_ticks(0, 1, 5)
    assert np.allclose(t, [0, 0.25, 0.5, 0.75, 1.0]) and d == 2
    t, d = S.nice_ticks(0, 5.25, 7, integer=True)
    assert t.tolist() == [0, 1, 2, 3, 4, 5] and d == 0
    t, d = S.nice_ticks(0, 1.05, 7, integer=True)  # counts never get fractional ticks
    assert t.tolist() == [0, 1] and d == 0
    assert S.nice_ticks(3, 3)[0].tolist() == [3]


def test_tick_labels_use_a_true_minus_and_never_show_negative_zero():
    assert [S.tick_label(v, 1) for v in (-0.5, -1e-17, 0.25, 2)] == ["−0.5", "0.0", "0.2", "2.0"]


def test_axes_map_a_known_data_point_to_the_expected_figure_point():
    ax = S.Axes((50, 20, 300, 200), (0, 1), (0, 2))
    assert ax.px((0.5, 1)).tolist() == [200, 120]
    assert ax.px([(0, 0), (1, 2)]).tolist() == [[50, 220], [350, 20]]   # y points down
    assert (ax.right, ax.bottom) == (350, 220)


def test_equal_axes_shrink_about_the_centre_so_both_units_are_equally_long():
    ax = S.Axes((0, 0, 400, 200), (0, 1), (0, 1), equal=True)
    assert (ax.left, ax.top, ax.width, ax.height) == (100, 0, 200, 200)
    ax = S.Axes((10, 10, 100, 300), (0, 2), (0, 1), equal=True)
    assert (ax.left, ax.top, ax.width, ax.height) == (10, 135, 100, 50)
    assert ax.sx == ax.sy == 50


def test_clip_ids_are_unique_numbered_in_order_and_each_is_used():
    fig = S.Figure(100, 100)
    ax = S.Axes((10, 10, 80, 80), (0, 1), (0, 1))
    ids = [fig.clip_rect(ax), fig.clip_path([(0, 0), (50, 0), (0, 50)]), fig.clip_rect(ax)]
    for i in ids:
        fig.add(S.line([(0, 0), (90, 90)], "#000000", clip=i))
    assert ids == ["clip1", "clip2", "clip3"]
    copy = fig.copy()
    assert copy.clip_rect(ax) == "clip4" and fig.clip_rect(ax) == "clip4"  # a copy numbers on, apart
    svg = copy.to_svg()
    defined = re.findall(r'<clipPath id="([^"]+)"', svg)
    assert len(defined) == len(set(defined)) == 4
    assert all(f"url(#{i})" in svg for i in ids)


def test_a_line_breaks_at_a_missing_point_and_a_closed_one_ends_with_z():
    assert S.path_d([(0, 0), (1, 1), (np.nan, 2), (3, 3), (4, 4)]) == "M0,0L1,1M3,3L4,4"
    assert S.path_d([(0, 0), (1, 0), (1, 1)], closed=True) == "M0,0L1,0 1,1Z"
    assert S.line([(np.nan, 0)], "#000000") == "" and S.line(np.zeros((0, 2)), "#000000") == ""
    assert S.path_d([]) == ""


def test_markers_are_drawn_by_shape_around_each_point():
    assert 'd="M8,10a2,2 0 1,0 4,0a2,2 0 1,0 -4,0z"' in S.markers([(10, 10)], "o", 4, "none", "#000")
    x = S.markers([(10, 10), (20, 20)], "X", 5, "#f00", "#f00")
    d = re.search(r' d="([^"]+)"', x).group(1)
    assert d.count("M") == 2 and d.count("z") == 2
    corners = re.search(r' d="([^"]+)"', S.markers([(0, 0)], "D", 5, "#f00", "#f00")).group(1)
    assert corners == "M0,-3l3,3 -3,3 -3,-3z"
    assert S.markers([(np.nan, 1)], "o", 4, "none", "#000") == ""


def test_dash_patterns_are_scaled_by_the_line_width():
    assert S.dasharray((0, (5, 2)), 1.1) == "5.5,2.2"
    assert S.dasharray("--", 1.0) == "3.7,1.6"
    assert S.dasharray("-", 2.0) is None and S.dasharray(None, 1) is None


def test_text_widths_follow_the_font_so_wide_letters_take_more_room():
    assert S.text_width("WW", 10) > S.text_width("ii", 10) * 3
    assert S.text_width("0.5", 10) == pytest.approx(10 * (1303 + 651 + 1303) / 2048)
    assert S.text_width("漢字", 10) == 20


def test_vertical_alignment_moves_the_baseline():
    def y(**kw):
        return float(re.search(r' y="([^"]+)"', S.text(0, 100, "t", 10, **kw)).group(1))

    assert y(va="top") > y(va="center") > y() > y(va="bottom")


def test_a_legend_goes_to_the_first_candidate_that_hides_no_data():
    points = [(20, 20), (380, 20)]
    box = S.place_legend([(0, 0), (350, 0), (0, 250), (350, 250)], (50, 50), points)
    assert (box.x, box.y) == (0, 250)
    assert not box.covers(points).any()
    box = S.place_legend([(0, 0), (350, 0)], (50, 50), points, weights=[1, 5])
    assert (box.x, box.y) == (0, 0)  # the lighter point is the one covered


def test_legend_entries_fill_columns_and_fit_their_box():
    keys = [S.Key(f"entry {i}", "#000000") for i in range(5)]
    w1, h1 = S.legend_size(keys, 7)
    w2, h2 = S.legend_size(keys, 7, ncols=2)
    assert h2 < h1 and w2 > w1
    root = ET.fromstring(f'<svg xmlns="http://www.w3.org/2000/svg">{S.legend(keys, S.LegendBox(0, 0, w2, h2), 7, 2)}'
                         "</svg>")
    ys = [float(t.get("y")) for t in root.iter(f"{SVG_NS}text")]
    xs = [float(t.get("x")) for t in root.iter(f"{SVG_NS}text")]
    assert len(set(xs)) == 2 and all(0 < y < h2 for y in ys)


def test_long_labels_are_shortened_for_the_legend_only():
    assert S.shorten("x" * 200) == "x" * 119 + "…"
    assert S.shorten("short") == "short"


def test_the_same_figure_gives_the_same_bytes():
    assert _figure().to_svg("t", "d") == _figure().to_svg("t", "d")


def test_labels_too_wide_for_the_legend_are_narrowed_whole_to_fit():
    long = "Reference " * 12
    keys = [S.Key("short", "#000000"), S.Key(long, "#000000")]
    natural = S.legend_size(keys, 7)[0]
    w, h = S.legend_size(keys, 7, max_width=300)
    assert natural > 300 and w == pytest.approx(300)
    root = ET.fromstring(f'<svg xmlns="http://www.w3.org/2000/svg">{S.legend(keys, S.LegendBox(0, 0, w, h), 7)}</svg>')
    texts = {t.text: t for t in root.iter(f"{SVG_NS}text")}
    assert long in texts                                     # the whole text, narrowed
    assert float(texts[long].get("textLength")) + float(texts[long].get("x")) <= 300
    assert texts[long].get("lengthAdjust") == "spacingAndGlyphs" and texts["short"].get("textLength") is None


def test_a_narrow_column_keeps_its_width_when_a_wide_one_is_narrowed():
    keys = [S.Key("a", "#000"), S.Key("b", "#000"), S.Key("w" * 80, "#000"), S.Key("x", "#000")]
    w, _ = S.legend_size(keys, 7, ncols=2, max_width=250)
    assert w == pytest.approx(250)
    svg = S.legend(keys, S.LegendBox(0, 0, w, 30), 7, ncols=2)
    assert svg.count("textLength") == 1


def test_a_text_box_follows_anchor_and_alignment():
    w = S.text_width("abc", 10)
    assert S.text_box(100, 50, "abc", 10) == pytest.approx((100, 50 - 7.6, 100 + w, 52.4))
    assert S.text_box(100, 50, "abc", 10, "end")[2] == pytest.approx(100)
    left, top, right, bottom = S.text_box(100, 50, "abc", 10, "middle", "top", pad=1)
    assert (left + right) / 2 == pytest.approx(100) and top == pytest.approx(49)


def test_free_place_skips_taken_boxes_then_covered_points_then_leaves_the_bounds():
    cands = [(0, 10, "start", "baseline"), (0, 30, "start", "baseline"), (0, 50, "start", "baseline")]
    first = S.text_box(0, 10, "t", 10)
    assert S.free_place(cands, "t", 10, [])[0] == cands[0]
    assert S.free_place(cands, "t", 10, [first])[0] == cands[1]
    assert S.free_place(cands, "t", 10, [first], points=[(2, 28)])[0] == cands[2]
    # every free place covers a point: the first that meets no box
    assert S.free_place(cands, "t", 10, [first], points=[(2, 28), (2, 48)])[0] == cands[1]
    assert S.free_place(cands, "t", 10, [], bounds=(0, 40, 100, 100))[0] == cands[2]
    assert S.free_place(cands, "t", 10, [], bounds=(0, 100, 100, 200)) is None
