"""Histograms, spectra and CIELAB slices as SVG (render/charts.py)."""
from __future__ import annotations

import re
from xml.etree import ElementTree as ET

import numpy as np

from generator.render import charts as C
from generator.render import figures as F

SVG_NS = "{http://www.w3.org/2000/svg}"


def _texts(root):
    return [t.text for t in root.iter(f"{SVG_NS}text")]


def test_histogram_bars_have_the_heights_of_the_counts_and_the_limits_their_places():
    values = [0.001] * 3 + [0.002] * 5 + [0.0045]
    fig, ax = C.histogram(values, None, 0.005, 0.0015, "Δu'v' — white", "delta_uv")
    root = ET.fromstring(F.save_svg(fig))
    bars = next(p for p in root.iter(f"{SVG_NS}path") if p.get("fill") == "#9bb7e6").get("d")
    tops = sorted({round(float(t), 2) for t in re.findall(r"V([-\d.]+)H", bars)})
    assert tops == sorted({round(float(ax.y(c)), 2) for c in (1, 3, 5)})
    assert bars.count("M") == 3
    verticals = {}
    for p in root.iter(f"{SVG_NS}path"):
        m = re.fullmatch(r"M([-\d.]+),[-\d.]+L([-\d.]+),[-\d.]+", p.get("d"))
        if m and m.group(1) == m.group(2) and p.get("stroke") == F.PALETTE["tolerance"]:
            verticals[round(float(m.group(1)), 2)] = p.get("stroke-dasharray")
    assert verticals == {round(float(ax.x(0.005)), 2): None, round(float(ax.x(0.0035)), 2): "3.33,1.44"}
    texts = _texts(root)
    assert {"units (n = 9)", "upper limit", "acceptance limit (limit − U)", "delta_uv", "units"} <= set(texts)
    assert "Δu'v' — white" in texts


def test_histogram_legend_sits_below_the_axes():
    fig, ax = C.histogram(np.linspace(6300, 6700, 30), 6200, 6900, 30.0, "CCT — white", "cct")
    root = ET.fromstring(F.save_svg(fig))
    legend = root.find(f".//{SVG_NS}g[@class='legend']")
    assert min(float(t.get("y")) for t in legend.iter(f"{SVG_NS}text")) > ax.bottom + 20
    assert max(float(t.get("y")) for t in legend.iter(f"{SVG_NS}text")) < fig.height
    assert "lower limit" in _texts(legend) and "acceptance limit (limit + U)" in _texts(legend)


def test_histogram_without_finite_values_still_draws_its_limits():
    fig, _ = C.histogram([np.nan, np.inf], 1.0, 2.0, 0, "t", "x")
    root = ET.fromstring(F.save_svg(fig))
    assert "units (n = 0)" in _texts(root) and "lower limit" in _texts(root)


def test_spectra_are_normalised_to_their_peaks_with_units_dashed_in_their_target_colour():
    wl = np.arange(380, 781, 5.0)
    g = np.exp(-0.5 * ((wl - 530) / 15) ** 2)
    series = [("green", wl, 4 * g, False), ("U1 green", wl, 2 * g, True), ("dark", wl, 0 * g, False)]
    fig, ax = C.spectra_plot(series, "CIE 1931 2° standard observer")
    root = ET.fromstring(F.save_svg(fig))
    lines = [p for p in root.iter(f"{SVG_NS}path") if p.get("stroke") == C.SPECTRUM_COLOURS[0]]
    design = [p for p in lines if p.get("stroke-width") == "1.5" and p.get("clip-path")]
    unit = [p for p in lines if p.get("stroke-dasharray")]
    assert len(design) == 1 and len(unit) == 1
    ys = [float(v) for v in re.findall(r",([-\d.]+)", design[0].get("d"))]
    assert min(ys) == round(float(ax.y(1.0)), 2)        # the peak at 1
    assert "green" in _texts(root) and "measured units" in _texts(root) and "dark" not in _texts(root)
    assert "Spectra (CIE 1931 2° standard observer used to integrate them)" in _texts(root)


def test_volume_slices_draw_six_panels_with_both_outlines():
    a = np.arange(-200, 201, 20.0)
    A, B = np.meshgrid(a, a, indexing="ij")
    spec = (np.abs(A) < 90) & (np.abs(B) < 70)
    ref = np.hypot(A, B) < 110
    slices = [(L, A, B, spec, ref) for L in C.VOLUME_LIGHTNESS]
    fig, axes = C.volume_slices(slices, "spec gamut", "ITU-R BT.2020")
    root = ET.fromstring(F.save_svg(fig))
    assert len(axes) == 6
    assert [t for t in _texts(root) if t.startswith("L* = ")] == [f"L* = {L:g}" for L in C.VOLUME_LIGHTNESS]
    spec_lines = [p for p in root.iter(f"{SVG_NS}path") if p.get("stroke") == F.PALETTE["gamut"] and p.get("clip-path")]
    ref_lines = [p for p in root.iter(f"{SVG_NS}path") if p.get("stroke") == "#6b6b6b" and p.get("clip-path")]
    assert len(spec_lines) == len(ref_lines) == 6
    # the spec's outline lies between the inside and outside grid points: |a*| from 80 to 100 at b* = 0
    ax = axes[0]
    xs = [float(v) for v in re.findall(r"([-\d.]+),", spec_lines[0].get("d"))]
    assert float(ax.x(-100)) < min(xs) < float(ax.x(-80)) and float(ax.x(80)) < max(xs) < float(ax.x(100))
    assert "spec gamut" in _texts(root) and "ITU-R BT.2020" in _texts(root)
