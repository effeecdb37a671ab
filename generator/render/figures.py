"""Chromaticity diagrams as deterministic SVG (matplotlib, Agg, no dates, fixed hash salt).

Each plotting function returns (Figure, Axes); ``save_svg`` applies the style and
returns the SVG text. The caller decides where it goes.
"""
from __future__ import annotations

import io
from dataclasses import dataclass

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402

from ..colour.cct import uv_from_cct_duv  # noqa: E402
from ..colour.convert import uv1960_to_uv_prime, uv1960_to_xy, uv_prime_to_xy, xy_to_uv_prime  # noqa: E402
from ..colour.planck import planck_uv  # noqa: E402
from ..colour.spectral import spectral_locus_xy  # noqa: E402

matplotlib.rcParams.update({
    "svg.hashsalt": "colourspec",
    "svg.fonttype": "none",
    "font.family": "DejaVu Sans",
    "font.size": 9,
    "axes.linewidth": 0.6,
})

# One palette for every figure; verdicts also differ by marker shape.
PALETTE = {
    "locus": "#222222", "planck": "#7a5c00", "gamut": "#0b57d0", "target": "#0b57d0",
    "tolerance": "#b3261e", "grid": "#d9d9d9", "pass": "#137333", "fail": "#b3261e",
    "indeterminate": "#8a5a00", "isotherm": "#9a9a9a",
}
REFERENCE_STYLES = [("#6b6b6b", (0, (5, 2))), ("#8e24aa", (0, (1, 1.5))), ("#00796b", (0, (6, 2, 1, 2))),
                    ("#ad5700", (0, (3, 3))), ("#5c6bc0", (0, (8, 2, 2, 2, 2, 2)))]
MARKERS = {"pass": "o", "fail": "X", "indeterminate": "D"}
LOCUS_LABELS = (380, 460, 470, 480, 490, 500, 510, 520, 540, 560, 580, 600, 620, 700)


@dataclass
class Layer:
    """What a diagram shows, already computed: every coordinate in CIE 1931 xy."""
    title: str
    gamut_xy: np.ndarray | None            # hull vertices
    primaries: list                        # (name, (x, y))
    white_xy: tuple | None
    references: list                       # (title, hull_xy)
    tolerances: list                       # (label, polygon_xy (k, 2))
    units: list                            # (serial, (x, y), verdict)
    observer: str = "cie1931-2"


def _to(diagram, xy):
    xy = np.asarray(xy, dtype=float)
    return xy if diagram == "xy" else xy_to_uv_prime(xy)


def _closed(p):
    p = np.asarray(p)
    return np.vstack([p, p[:1]])


def chromaticity_diagram(layer: Layer, diagram: str):
    """The full diagram in CIE 1931 xy (``diagram='xy'``) or CIE 1976 u'v' (``'uv'``)."""
    fig, ax = plt.subplots(figsize=(5.6, 5.6))
    wl, locus = spectral_locus_xy(layer.observer)
    loc = _to(diagram, locus)
    ax.fill(loc[:, 0], loc[:, 1], color="#f4f4f4", zorder=0)
    ax.plot(*_closed(loc).T, color=PALETTE["locus"], lw=0.9, zorder=2, label="spectral locus")
    for w in LOCUS_LABELS:
        i = int(np.argmin(np.abs(wl - w)))
        p = loc[i]
        c = loc.mean(axis=0)
        d = (p - c) / max(np.linalg.norm(p - c), 1e-9)
        ax.plot(*np.array([p, p + 0.012 * d]).T, color=PALETTE["locus"], lw=0.6)
        ax.text(*(p + 0.03 * d), f"{w}", ha="center", va="center", fontsize=7, color="#444444")
    T = np.geomspace(1000, 25000, 80)
    pl = uv1960_to_uv_prime(planck_uv(T))
    pl = pl if diagram == "uv" else uv_prime_to_xy(pl)
    ax.plot(*pl.T, color=PALETTE["planck"], lw=0.8, zorder=3, label="Planckian locus")
    for i, (title, hull) in enumerate(layer.references):
        colour, dash = REFERENCE_STYLES[i % len(REFERENCE_STYLES)]
        ax.plot(*_closed(_to(diagram, hull)).T, color=colour, ls=dash, lw=1.1, zorder=4, label=title)
    if layer.gamut_xy is not None:
        g = _to(diagram, layer.gamut_xy)
        ax.plot(*_closed(g).T, color=PALETTE["gamut"], lw=1.8, zorder=5, label="spec gamut")
    for label, poly in layer.tolerances:
        ax.plot(*_closed(_to(diagram, poly)).T, color=PALETTE["tolerance"], lw=0.8, zorder=6)
    for name, xy in layer.primaries:
        p = _to(diagram, xy)
        ax.plot(*p, marker="+", color=PALETTE["target"], ms=8, zorder=7)
        ax.annotate(name, p, xytext=(5, 5), textcoords="offset points", fontsize=8, zorder=8)
    if layer.white_xy is not None:
        ax.plot(*_to(diagram, layer.white_xy), marker="*", color=PALETTE["target"], ms=9, zorder=7,
                label="white target", ls="none")
    _units(ax, layer.units, lambda xy: _to(diagram, xy))
    if diagram == "xy":
        ax.set(xlim=(-0.04, 0.8), ylim=(-0.02, 0.9), xlabel="x", ylabel="y")
    else:
        ax.set(xlim=(-0.04, 0.66), ylim=(-0.02, 0.64), xlabel="u'", ylabel="v'")
    ax.set_aspect("equal")
    ax.grid(color=PALETTE["grid"], lw=0.4)
    ax.set_title(layer.title, fontsize=10)
    ax.legend(loc="upper right" if diagram == "xy" else "lower right", fontsize=7, frameon=True)
    return fig, ax


def _units(ax, units, tf):
    for verdict in ("pass", "indeterminate", "fail"):
        pts = [tf(xy) for _, xy, v in units if v == verdict]
        if pts:
            pts = np.array(pts)
            ax.plot(pts[:, 0], pts[:, 1], ls="none", marker=MARKERS[verdict], ms=5,
                    mfc="none" if verdict == "pass" else PALETTE[verdict], mec=PALETTE[verdict],
                    zorder=9, label=f"unit: {verdict}")


def white_closeup(layer: Layer, span: float = 0.02):
    """The white target in CIE 1976 u'v' with the Planckian locus, isotherms and lines of
    constant Duv (CIE 1960 uv distances, drawn in u'v')."""
    fig, ax = plt.subplots(figsize=(5.6, 4.6))
    w = xy_to_uv_prime(np.array(layer.white_xy))
    pts = [w] + [xy_to_uv_prime(np.array(xy)) for _, xy, _ in layer.units]
    for _, poly in layer.tolerances:
        pts += list(xy_to_uv_prime(np.asarray(poly)))
    pts = np.array(pts)
    half = max(span, float(np.max(np.abs(pts - w))) * 1.25)
    T = np.geomspace(1000, 100000, 400)
    for duv in (-0.02, -0.01, -0.005, 0.005, 0.01, 0.02):
        line = uv1960_to_uv_prime(uv_from_cct_duv(T, duv))
        ax.plot(*line.T, color=PALETTE["isotherm"], lw=0.5, ls=":", zorder=1)
        j = np.argmin(np.hypot(*(line - (w + [half * 0.8, 0])).T))
        ax.text(*line[j], f"Duv {duv:+.3f}", fontsize=6, color="#666666", zorder=1, clip_on=True)
    pl = uv1960_to_uv_prime(planck_uv(T))
    ax.plot(*pl.T, color=PALETTE["planck"], lw=1.0, label="Planckian locus", zorder=2)
    for t in (2000, 2500, 2700, 3000, 3500, 4000, 4500, 5000, 5700, 6500, 7500, 9300, 12000, 20000):
        iso = uv1960_to_uv_prime(uv_from_cct_duv(np.full(2, float(t)), np.array([-0.03, 0.03])))
        ax.plot(*iso.T, color=PALETTE["isotherm"], lw=0.6, zorder=1)
        ax.text(*iso[1], f"{t} K", fontsize=6, color="#555555", ha="center", va="bottom", clip_on=True)
    for label, poly in layer.tolerances:
        ax.plot(*_closed(xy_to_uv_prime(np.asarray(poly))).T, color=PALETTE["tolerance"], lw=1.0,
                zorder=3, label=label)
    ax.plot(*w, marker="*", color=PALETTE["target"], ms=11, ls="none", zorder=5, label="white target")
    _units(ax, layer.units, lambda xy: xy_to_uv_prime(np.array(xy)))
    ax.set(xlim=(w[0] - half, w[0] + half), ylim=(w[1] - half * 0.8, w[1] + half * 0.8),
           xlabel="u'", ylabel="v'")
    ax.set_aspect("equal")
    ax.grid(color=PALETTE["grid"], lw=0.4)
    ax.set_title(layer.title, fontsize=10)
    ax.legend(loc="upper left", fontsize=7, frameon=True)
    return fig, ax


def histogram(values, lo, hi, guard, title: str, xlabel: str, bins: int = 30):
    """Histogram of one quantity over a lot with its limits (solid) and, where a guard band
    applies, the acceptance limits narrowed by it (dashed)."""
    v = np.asarray(values, dtype=float)
    v = v[np.isfinite(v)]
    fig, ax = plt.subplots(figsize=(5.2, 2.8))
    edges = [x for x in (lo, hi) if x is not None]
    span = np.concatenate([v, edges]) if v.size or edges else np.zeros(1)
    a, b = float(span.min()), float(span.max())
    pad = (b - a) * 0.08 or max(abs(a) * 0.01, 1e-6)
    ax.hist(v, bins=np.linspace(a - pad, b + pad, bins + 1), color="#9bb7e6", edgecolor="#0b57d0", lw=0.5,
            label=f"units (n = {v.size})")
    for x, name in ((lo, "lower limit"), (hi, "upper limit")):
        if x is not None:
            ax.axvline(x, color=PALETTE["tolerance"], lw=1.4, label=name)
    if guard:
        for x, sign in ((lo, 1), (hi, -1)):
            if x is not None:
                ax.axvline(x + sign * guard, color=PALETTE["tolerance"], lw=0.9, ls="--",
                           label="acceptance limit (limit − U)" if sign < 0 else "acceptance limit (limit + U)")
    ax.set(xlabel=xlabel, ylabel="units")
    ax.set_title(title, fontsize=9)
    ax.grid(color=PALETTE["grid"], lw=0.4)
    ax.legend(fontsize=6.5, frameon=True, loc="best")
    return fig, ax


def save_svg(fig) -> str:
    buf = io.StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": None}, bbox_inches="tight")
    plt.close(fig)
    return buf.getvalue()


def uv_circle_xy(centre_xy, radius_uv, n: int = 72):
    """A circle of radius r in CIE 1976 u'v' around a point, returned in xy."""
    c = xy_to_uv_prime(np.asarray(centre_xy, dtype=float))
    t = np.linspace(0, 2 * np.pi, n, endpoint=False)
    return uv_prime_to_xy(np.stack([c[0] + radius_uv * np.cos(t), c[1] + radius_uv * np.sin(t)], axis=-1))


def ellipse_xy(centre_xy, a, b, angle_deg, n: int = 72):
    t = np.linspace(0, 2 * np.pi, n, endpoint=False)
    th = np.deg2rad(angle_deg)
    u, v = a * np.cos(t), b * np.sin(t)
    return np.stack([centre_xy[0] + u * np.cos(th) - v * np.sin(th),
                     centre_xy[1] + u * np.sin(th) + v * np.cos(th)], axis=-1)


def box_xy(centre_xy, dx, dy):
    x, y = centre_xy
    return np.array([[x - dx, y - dy], [x + dx, y - dy], [x + dx, y + dy], [x - dx, y + dy]])


def cct_duv_quad_xy(cct, duv, n: int = 24):
    """The CCT x Duv quadrangle: isotherm edges and constant-Duv edges, in xy."""
    (t0, t1), (d0, d1) = cct, duv
    t0 = t0 if t0 is not None else 1000.0
    t1 = t1 if t1 is not None else 25000.0
    d0 = d0 if d0 is not None else -0.02
    d1 = d1 if d1 is not None else 0.02
    T = np.geomspace(t0, t1, n)
    lower = uv_from_cct_duv(T, d0)
    upper = uv_from_cct_duv(T[::-1], d1)
    return uv1960_to_xy(np.vstack([lower, upper]))
