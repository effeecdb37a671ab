"""Chromaticity diagrams as deterministic SVG (matplotlib, Agg, no dates, fixed hash salt).

Each plotting function returns (Figure, Axes); ``save_svg`` applies the style and
returns the SVG text. The caller decides where it goes.
"""
from __future__ import annotations

import io
import re
import warnings
from dataclasses import dataclass
from functools import cache

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
from matplotlib.patches import Polygon  # noqa: E402

from ..colour.cct import uv_from_cct_duv  # noqa: E402
from ..colour.convert import uv1960_to_uv_prime, uv1960_to_xy, uv_prime_to_xy, xy_to_uv_prime  # noqa: E402
from ..colour.planck import planck_uv  # noqa: E402
from ..colour.spectral import spectral_locus_xy  # noqa: E402
from .swatch import xy_to_preview_rgb  # noqa: E402

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


LABEL_CHARS = 120


def plain_text(text: str) -> str:
    """Spec text as matplotlib draws it literally: '$' would start mathtext (a stray
    '$\\frac{' raises while saving) and a leading '_' hides a legend entry. The SVG
    writer escapes <, > and &; this only stops matplotlib from interpreting the text."""
    text = str(text)
    if len(text) > LABEL_CHARS:  # the page shows it whole; a legend entry stays readable
        text = text[: LABEL_CHARS - 1] + "…"
    text = text.replace("$", r"\$")
    return "\u200b" + text if text.startswith("_") else text


def _to(diagram, xy):
    xy = np.asarray(xy, dtype=float)
    return xy if diagram == "xy" else xy_to_uv_prime(xy)


def _closed(p):
    p = np.asarray(p)
    return np.vstack([p, p[:1]])


# Diagram frames, fixed so that figures need no "tight" layout pass (it draws everything twice).
_FRAME = {"xy": dict(xlim=(-0.04, 0.8), ylim=(-0.02, 0.9), xlabel="x", ylabel="y"),
          "uv": dict(xlim=(-0.04, 0.66), ylim=(-0.02, 0.64), xlabel="u'", ylabel="v'")}
FULL_SIZE, FULL_AXES = (5.6, 5.9), (0.11, 0.1, 0.86, 0.85)
FILL_NOTE = "Fill: approximate colours (sRGB preview), not measured values."


@cache
def locus_fill(diagram: str, n: int = 128) -> np.ndarray:
    """An (n, n, 3) sRGB preview of chromaticities over the diagram's frame (rows from the
    bottom): each point at equal luminance, converted to linear sRGB (IEC 61966-2-1 matrix),
    negative channels clipped (out of gamut), scaled to the brightest channel, encoded and
    lightened halfway to white so that lines on it stay legible. Only an impression of the
    colours: the diagram clips it to the spectral locus. Computed once per diagram."""
    f = _FRAME[diagram]
    xs = np.linspace(*f["xlim"], n)
    ys = np.linspace(*f["ylim"], n)
    gx, gy = np.meshgrid(xs, ys)
    pts = np.stack([gx, gy], axis=-1)
    xy = pts if diagram == "xy" else uv_prime_to_xy(pts)
    rgb = 0.5 * xy_to_preview_rgb(xy) + 0.5
    return np.round(rgb * 255).astype(np.uint8)


def _frame(diagram: str, observer: str, fill: bool):
    """The static layers of a full diagram: locus (filled or neutral), wavelength labels,
    Planckian locus, axes and grid."""
    fig = plt.figure(figsize=FULL_SIZE)
    ax = fig.add_axes(FULL_AXES)
    wl, locus = spectral_locus_xy(observer)
    loc = _to(diagram, locus)
    f = _FRAME[diagram]
    if fill:
        im = ax.imshow(locus_fill(diagram), origin="lower", interpolation="none",
                       extent=(*f["xlim"], *f["ylim"]), zorder=0)
        im.set_clip_path(Polygon(loc, closed=True, transform=ax.transData))
    else:
        ax.fill(loc[:, 0], loc[:, 1], color="#f4f4f4", zorder=0)
    ax.plot(*_closed(loc).T, color=PALETTE["locus"], lw=0.9, zorder=2, label="spectral locus")
    c = loc.mean(axis=0)
    for w in LOCUS_LABELS:
        i = int(np.argmin(np.abs(wl - w)))
        p = loc[i]
        d = (p - c) / max(np.linalg.norm(p - c), 1e-9)
        ax.plot(*np.array([p, p + 0.012 * d]).T, color=PALETTE["locus"], lw=0.6)
        ax.text(*(p + 0.03 * d), f"{w}", ha="center", va="center", fontsize=7, color="#444444")
    T = np.geomspace(1000, 25000, 80)
    pl = uv1960_to_uv_prime(planck_uv(T))
    pl = pl if diagram == "uv" else uv_prime_to_xy(pl)
    ax.plot(*pl.T, color=PALETTE["planck"], lw=0.8, zorder=3, label="Planckian locus")
    ax.set(**f)
    ax.set_aspect("equal")
    ax.grid(color=PALETTE["grid"], lw=0.4)
    if fill:
        fig.text(0.11, 0.012, FILL_NOTE, fontsize=7,
                 color="#444444")
    return fig, ax


@cache
def _static_svg(diagram: str, observer: str, fill: bool) -> str:
    """The static layers saved once per diagram, observer and fill: the text-heavy part
    (ticks, wavelength labels) that would otherwise be laid out again for every spec."""
    fig, _ = _frame(diagram, observer, fill)
    buf = io.StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": None})
    plt.close(fig)
    return buf.getvalue()


_OVERLAYS: dict = {}


def _overlay(diagram: str):
    """A transparent figure with the frame's geometry and no axis decorations, reused for
    every spec's own layers."""
    if diagram not in _OVERLAYS:
        fig = plt.figure(figsize=FULL_SIZE)
        fig.patch.set_alpha(0)
        ax = fig.add_axes(FULL_AXES)
        ax.set(**_FRAME[diagram])
        ax.set_aspect("equal")
        ax.set_axis_off()
        _OVERLAYS[diagram] = (fig, ax)
    return _OVERLAYS[diagram]


class _Drawn:
    """Artists added to a reused overlay for one spec; removed once its SVG is saved."""

    def __init__(self, fig, ax, base_svg: str):
        self.fig, self.ax, self.base_svg = fig, ax, base_svg
        self.base = (list(ax.lines), list(ax.texts), list(ax.patches), list(ax.collections))

    def clear(self):
        ax = self.ax
        for group, base in zip((ax.lines, ax.texts, ax.patches, ax.collections), self.base, strict=True):
            for a in [a for a in group if a not in base]:
                a.remove()
        if ax.get_legend() is not None:
            ax.get_legend().remove()
        for a in list(self.fig.legends) + list(self.fig.texts):
            a.remove()


_ID = re.compile(r'(id="|url\(#|xlink:href="#)([A-Za-z_][\w.-]*)')


def _compose(base: str, overlay: str) -> str:
    """Put the overlay's drawing on top of the base SVG (same size and axes geometry); the
    overlay's ids are prefixed so that none collides with the base's."""
    overlay = _ID.sub(lambda m: m.group(1) + "o-" + m.group(2), overlay)
    body = overlay[re.search(r"<svg\b[^>]*>", overlay).end(): overlay.rindex("</svg>")]
    body = re.sub(r"<metadata>.*?</metadata>", "", body, flags=re.S)
    return base[: base.rindex("</svg>")] + body.strip("\n") + "\n</svg>\n"


def chromaticity_diagram(layer: Layer, diagram: str, fill: bool = True):
    """The full diagram in CIE 1931 xy (``diagram='xy'``) or CIE 1976 u'v' (``'uv'``).

    The static layers (locus, its fill and wavelength labels, Planckian locus, axes) are
    drawn once (``_static_svg``); this draws the spec's layers on a transparent overlay
    of the same geometry, and ``save_svg`` composes the two. Call ``save_svg`` on the
    result before drawing the next diagram of the same kind."""
    fig, ax = _overlay(diagram)
    fig._colourspec_drawn = _Drawn(fig, ax, _static_svg(diagram, layer.observer, fill))
    for i, (title, hull) in enumerate(layer.references):
        colour, dash = REFERENCE_STYLES[i % len(REFERENCE_STYLES)]
        ax.plot(*_closed(_to(diagram, hull)).T, color=colour, ls=dash, lw=1.1, zorder=4, label=plain_text(title))
    if layer.gamut_xy is not None:
        g = _to(diagram, layer.gamut_xy)
        ax.plot(*_closed(g).T, color=PALETTE["gamut"], lw=1.8, zorder=5, label="spec gamut")
    for i, (_label, poly) in enumerate(layer.tolerances):
        ax.plot(*_closed(_to(diagram, poly)).T, color=PALETTE["tolerance"], lw=0.8, zorder=6,
                label="tolerance regions (to scale)" if i == 0 else "_nolegend_")
    for name, xy in layer.primaries:
        p = _to(diagram, xy)
        ax.plot(*p, marker="+", color=PALETTE["target"], ms=8, zorder=7)
        ax.annotate(plain_text(name), p, xytext=(5, 5), textcoords="offset points", fontsize=8, zorder=8)
    if layer.white_xy is not None:
        ax.plot(*_to(diagram, layer.white_xy), marker="*", color=PALETTE["target"], ms=9, zorder=7,
                label="white target", ls="none")
    _units(ax, layer.units, lambda xy: _to(diagram, xy))
    fig.text(FULL_AXES[0] + FULL_AXES[2] / 2, 0.975, plain_text(layer.title), fontsize=10, ha="center", va="top")
    ax.legend(handles=_static_handles() + ax.get_legend_handles_labels()[0],
              loc="upper right" if diagram == "xy" else "lower right", fontsize=7, frameon=True,
              framealpha=0.92)
    return fig, ax


def _static_handles():
    from matplotlib.lines import Line2D

    return [Line2D([], [], color=PALETTE["locus"], lw=0.9, label="spectral locus"),
            Line2D([], [], color=PALETTE["planck"], lw=0.8, label="Planckian locus")]


def _units(ax, units, tf):
    for verdict in ("pass", "indeterminate", "fail"):
        pts = [tf(xy) for _, xy, v in units if v == verdict]
        if pts:
            pts = np.array(pts)
            ax.plot(pts[:, 0], pts[:, 1], ls="none", marker=MARKERS[verdict], ms=5,
                    mfc="none" if verdict == "pass" else PALETTE[verdict], mec=PALETTE[verdict],
                    zorder=9, label=f"unit: {verdict}")


TOLERANCE_DASHES = ("-", (0, (4, 2)), (0, (1, 1.5)))
ISOTHERMS_K = (2000, 2500, 2700, 3000, 3500, 4000, 4500, 5000, 5700, 6500, 7500, 9300, 12000, 20000)
DUV_LINES = (-0.02, -0.01, -0.005, 0.005, 0.01, 0.02)
_LABEL_BOX = {"boxstyle": "round,pad=0.15", "fc": "white", "ec": "none", "alpha": 0.85}


@cache
def _white_lines():
    """Planckian locus, lines of constant Duv and isotherms in u'v': the same for every
    close-up, and costly (each point integrates Planck's law over the observer)."""
    T = np.geomspace(1000, 100000, 400)
    duv = {d: uv1960_to_uv_prime(uv_from_cct_duv(T, d)) for d in DUV_LINES}
    iso = {t: uv1960_to_uv_prime(uv_from_cct_duv(np.full(41, float(t)), np.linspace(-0.03, 0.03, 41)))
           for t in ISOTHERMS_K}
    return uv1960_to_uv_prime(planck_uv(T)), duv, iso


_WHITE: list = []


def _white_figure():
    """One figure reused for every close-up (its axis and tick objects are kept; each
    spec's artists are removed after saving)."""
    if not _WHITE:
        fig = plt.figure(figsize=(5.6, 4.9))
        ax = fig.add_axes((0.13, 0.25, 0.84, 0.69))
        ax.set_aspect("equal")
        ax.grid(color=PALETTE["grid"], lw=0.4)
        ax.locator_params(nbins=6)
        _WHITE.append((fig, ax))
    return _WHITE[0]


def white_closeup(layer: Layer, span: float = 0.02):
    """The white target in CIE 1976 u'v' with the Planckian locus, isotherms and lines of
    constant Duv (CIE 1960 uv distances, drawn in u'v'). Lines are labelled inside the
    frame; the legend sits below it so that it covers nothing."""
    fig, ax = _white_figure()
    fig._colourspec_drawn = _Drawn(fig, ax, "")
    w = xy_to_uv_prime(np.array(layer.white_xy))
    pts = [w] + [xy_to_uv_prime(np.array(xy)) for _, xy, _ in layer.units]
    for _, poly in layer.tolerances:
        pts += list(xy_to_uv_prime(np.asarray(poly)))
    pts = np.array(pts)
    half = max(span, float(np.max(np.abs(pts - w))) * 1.25)
    x0, x1, y0, y1 = w[0] - half, w[0] + half, w[1] - half * 0.8, w[1] + half * 0.8

    def within(line, m):
        mx, my = m * 2 * half, m * 1.6 * half
        return ((line[:, 0] > x0 + mx) & (line[:, 0] < x1 - mx) & (line[:, 1] > y0 + my) & (line[:, 1] < y1 - my))

    def visible_part(line):
        """The line's points in the frame and one beyond on each side (None if it misses it)."""
        keep = within(line, -0.02)
        if not keep.any():
            return None
        keep = keep | np.roll(keep, 1) | np.roll(keep, -1)
        return line[keep]

    pl, duv_lines, isotherms = _white_lines()
    for duv, line in duv_lines.items():
        part = visible_part(line)
        if part is None:
            continue
        ax.plot(*part.T, color=PALETTE["isotherm"], lw=0.7, ls=(0, (2, 2)), zorder=1)
        vis = line[within(line, 0.04)]
        if len(vis):  # label where the line leaves the frame at the bottom
            p = vis[np.argmin(vis[:, 1])]
            ax.text(*p, f"Duv {duv:+.3f}", fontsize=6.5, color="#333333", ha="center", va="bottom",
                    zorder=4, bbox=_LABEL_BOX)
    ax.plot(*visible_part(pl).T if visible_part(pl) is not None else ([], []), color=PALETTE["planck"], lw=1.2,
            label="Planckian locus (Duv 0)", zorder=2)
    label = "isotherms (CCT) and lines of constant Duv"
    for t, iso in isotherms.items():
        if visible_part(iso) is None:
            continue
        ax.plot(*iso.T, color=PALETTE["isotherm"], lw=0.7, zorder=1, label=label)
        label = "_nolegend_"
        vis = iso[within(iso, 0.04)]
        if len(vis):  # label at the isotherm's highest visible point
            p = vis[np.argmax(vis[:, 1])]
            ax.text(*p, f"{t} K", fontsize=6.5, color="#333333", ha="center", va="top", zorder=4,
                    bbox=_LABEL_BOX)
    for i, (label, poly) in enumerate(layer.tolerances):
        ax.plot(*_closed(xy_to_uv_prime(np.asarray(poly))).T, color=PALETTE["tolerance"], lw=1.1,
                ls=TOLERANCE_DASHES[i % len(TOLERANCE_DASHES)], zorder=3, label=f"{plain_text(label)} (to scale)")
    ax.plot(*w, marker="*", color=PALETTE["target"], ms=11, ls="none", zorder=5, label="white target")
    _units(ax, layer.units, lambda xy: xy_to_uv_prime(np.array(xy)))
    ax.set(xlim=(x0, x1), ylim=(y0, y1), xlabel="u'", ylabel="v'")
    fig.text(0.55, 0.985, plain_text(layer.title), fontsize=10, ha="center", va="top")
    fig.legend(*ax.get_legend_handles_labels(), loc="lower center", ncols=2, fontsize=7, frameon=False)
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
    fig.tight_layout()
    return fig, ax


def _xml(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace('"', "&quot;")


_CLIP_ID = re.compile(r'<clipPath id="((?:o-)?p[0-9a-f]{10})"')


def _stable_ids(svg: str) -> str:
    """Clip-path ids numbered in order of definition. matplotlib derives the id of a clip
    path set on an artist from the object's memory address, which differs between runs."""
    for n, old in enumerate(dict.fromkeys(_CLIP_ID.findall(svg)), start=1):
        svg = svg.replace(f'id="{old}"', f'id="clip{n}"').replace(f"url(#{old})", f"url(#clip{n})")
    return svg


def save_svg(fig, title: str = "", desc: str = "") -> str:
    """The figure as SVG text, with a <title> and <desc> for screen readers when given. A
    figure drawn on a cached frame has its spec's layers removed afterwards."""
    buf = io.StringIO()
    with warnings.catch_warnings():
        # text is written as SVG text (svg.fonttype none) and drawn by the reader's fonts, so a
        # character missing from the layout font (CJK in a title) only affects spacing
        warnings.filterwarnings("ignore", message=r"Glyph \d+ .* missing from font", category=UserWarning)
        fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": None})
    svg = buf.getvalue()
    drawn = getattr(fig, "_colourspec_drawn", None)
    if drawn is not None:
        drawn.clear()
        fig._colourspec_drawn = None
        if drawn.base_svg:
            svg = _compose(drawn.base_svg, svg)
    else:
        plt.close(fig)
    svg = _stable_ids(svg)
    if title or desc:
        m = re.search(r"<svg\b[^>]*>", svg)
        head = svg[: m.end()]
        head = head[:-1] + ' role="img" aria-labelledby="fig-title fig-desc">'
        svg = (head + f'\n <title id="fig-title">{_xml(title)}</title>\n <desc id="fig-desc">{_xml(desc)}</desc>'
               + svg[m.end():])
    return svg


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


SPECTRUM_COLOURS = ("#0b57d0", "#137333", "#b3261e", "#6b6b6b", "#8e24aa", "#00796b", "#ad5700", "#5c6bc0")


def spectra_plot(series, observer_title: str):
    """Spectra normalised to their own peak: ``series`` of (label, wavelengths, values,
    is_unit); design spectra solid, measured units thin and dashed."""
    fig, ax = plt.subplots(figsize=(7.2, 3.6))
    design = [s for s in series if not s[3]]
    colour_of = {label: SPECTRUM_COLOURS[i % len(SPECTRUM_COLOURS)] for i, (label, *_rest) in enumerate(design)}
    k = len(design)
    for label, wl, v, is_unit in series:
        v = np.asarray(v, dtype=float)
        peak = np.nanmax(v)
        if not peak > 0:
            continue
        c = colour_of.get(label.split(" ", 1)[-1]) if is_unit else colour_of[label]
        if c is None:
            c = SPECTRUM_COLOURS[k % len(SPECTRUM_COLOURS)]
            k += 1
        ax.plot(wl, v / peak, color=c, lw=0.7 if is_unit else 1.5, ls=(0, (3, 2)) if is_unit else "-",
                label=None if is_unit else plain_text(label), zorder=2 if is_unit else 3)
    if any(s[3] for s in series):
        ax.plot([], [], color="#444444", lw=0.7, ls=(0, (3, 2)), label="measured units")
    ax.set(xlim=(360, 830), ylim=(0, 1.08), xlabel="wavelength (nm)", ylabel="relative to own peak")
    ax.grid(color=PALETTE["grid"], lw=0.4)
    ax.set_title(plain_text(f"Spectra ({observer_title} used to integrate them)"), fontsize=10)
    ax.legend(loc="upper right", fontsize=7, frameon=True)
    return fig, ax


VOLUME_LIGHTNESS = (15.0, 30.0, 45.0, 60.0, 75.0, 90.0)


def volume_slices(slices, spec_label: str, reference_label: str):
    """Cross-sections of two CIELAB gamut solids at fixed lightness: ``slices`` of
    (L, A, B, inside_spec, inside_reference) grids, drawn as a*b* outlines."""
    fig, axes = plt.subplots(2, 3, figsize=(7.8, 5.4), sharex=True, sharey=True)
    for ax, (L, A, B, spec_in, ref_in) in zip(axes.ravel(), slices, strict=True):
        for mask, colour, ls in ((ref_in, "#6b6b6b", (0, (4, 2))), (spec_in, PALETTE["gamut"], "-")):
            if mask.any() and not mask.all():
                ax.contour(A, B, mask.astype(float), levels=[0.5], colors=[colour], linestyles=[ls],
                           linewidths=1.2)
        ax.axhline(0, color=PALETTE["grid"], lw=0.5)
        ax.axvline(0, color=PALETTE["grid"], lw=0.5)
        ax.set_title(f"L* = {L:g}", fontsize=8)
        ax.set_aspect("equal")
    for ax in axes[-1]:
        ax.set_xlabel("a*")
    for ax in axes[:, 0]:
        ax.set_ylabel("b*")
    axes[0, 0].set(xlim=(-200, 200), ylim=(-200, 200))
    axes[0, 0].plot([], [], color=PALETTE["gamut"], lw=1.2, label=plain_text(spec_label))
    axes[0, 0].plot([], [], color="#6b6b6b", lw=1.2, ls=(0, (4, 2)), label=plain_text(reference_label))
    fig.legend(loc="lower center", ncol=2, fontsize=7, frameon=False)
    fig.suptitle(plain_text(f"CIELAB gamut at six lightness levels, against {reference_label}"), fontsize=10)
    return fig, axes
