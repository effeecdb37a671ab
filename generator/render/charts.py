"""The other figures as hand-written SVG: a lot's histogram of one quantity, the spectra of a
spec, and its CIELAB gamut at six lightness levels. Each returns (Figure, Axes) of
``svgplot``; ``figures.save_svg`` writes them."""
from __future__ import annotations

import numpy as np

from . import svgplot as S
from .contour import mask_outlines
from .figures import PALETTE
from .svgplot import Key

HIST_SIZE = (374.4, 230.4)          # points (5.2 × 3.2 in)
HIST_BOX = (48.0, 22.0, 316.0, 134.0)  # left, top, width, height of the axes; the legend goes below


def histogram(values, lo, hi, guard, title: str, xlabel: str, bins: int = 30):
    """Histogram of one quantity over a lot with its limits (solid) and, where a guard band
    applies, the acceptance limits narrowed by it (dashed). The legend sits below the axes,
    where it covers no bar and no limit."""
    v = np.asarray(values, dtype=float)
    v = v[np.isfinite(v)]
    limits = [x for x in (lo, hi) if x is not None]
    span = np.concatenate([v, limits]) if v.size or limits else np.zeros(1)
    a, b = float(span.min()), float(span.max())
    pad = (b - a) * 0.08 or max(abs(a) * 0.01, 1e-6)
    edges = np.linspace(a - pad, b + pad, bins + 1)
    counts, _ = np.histogram(v, bins=edges)
    xlim = (edges[0] - 0.05 * (edges[-1] - edges[0]), edges[-1] + 0.05 * (edges[-1] - edges[0]))
    top = max(int(counts.max()) if counts.size else 0, 1) * 1.05
    fig = S.Figure(*HIST_SIZE)
    ax = S.Axes(HIST_BOX, xlim, (0, top))
    clip = fig.clip_rect(ax)
    xt, xd = S.nice_ticks(*xlim, max_ticks=10)
    yt, yd = S.nice_ticks(0, top, max_ticks=7, integer=True)
    fig.add(S.grid(ax, xt, yt, PALETTE["grid"]))
    bars = []
    for c, x0, x1 in zip(counts.tolist(), edges[:-1], edges[1:], strict=True):
        if c:
            l, r, t = float(ax.x(x0)), float(ax.x(x1)), float(ax.y(c))
            bars.append(f"M{S.num(l)},{S.num(ax.bottom)}V{S.num(t)}H{S.num(r)}V{S.num(ax.bottom)}Z")
    if bars:
        fig.add(f'<path d="{"".join(bars)}" fill="#9bb7e6" stroke="#0b57d0" stroke-width="0.5"'
                f' clip-path="url(#{clip})"/>\n')
    keys = [Key(f"units (n = {v.size})", "#0b57d0", 0.5, patch="#9bb7e6")]
    vlines = []
    for x, name in ((lo, "lower limit"), (hi, "upper limit")):
        if x is not None:
            vlines.append((x, 1.4, None))
            keys.append(Key(name, PALETTE["tolerance"], 1.4))
    if guard:
        for x, sign in ((lo, 1), (hi, -1)):
            if x is not None:
                vlines.append((x + sign * guard, 0.9, "--"))
                keys.append(Key("acceptance limit (limit − U)" if sign < 0 else "acceptance limit (limit + U)",
                                PALETTE["tolerance"], 0.9, "--"))
    for x, lw, dash in vlines:
        px = float(ax.x(x))
        fig.add(S.line([(px, ax.top), (px, ax.bottom)], PALETTE["tolerance"], lw, dash, clip=clip))
    fig.add(S.frame(ax, xt, yt, xlabel, "units", xd, yd))
    fig.add(S.text(ax.left + ax.width / 2, ax.top - 6, S.shorten(title), 9, anchor="middle",
                   max_width=HIST_SIZE[0] - 20))
    w, h = S.legend_size(keys, 6.5, ncols=2, max_width=HIST_SIZE[0] - 20)
    fig.add(S.legend(keys, S.LegendBox(ax.left + (ax.width - w) / 2, ax.bottom + 34, w, h), 6.5, ncols=2,
                     frame=False))
    return fig, ax


SPECTRUM_COLOURS = ("#0b57d0", "#137333", "#b3261e", "#6b6b6b", "#8e24aa", "#00796b", "#ad5700", "#5c6bc0")
SPECTRA_SIZE = (518.4, 259.2)       # points (7.2 × 3.6 in)
SPECTRA_BOX = (64.8, 31.1, 336.96, 199.6)


def spectra_plot(series, observer_title: str):
    """Spectra normalised to their own peak: ``series`` of (label, wavelengths, values,
    is_unit); design spectra solid, measured units thin and dashed."""
    fig = S.Figure(*SPECTRA_SIZE)
    ax = S.Axes(SPECTRA_BOX, (360, 830), (0, 1.08))
    clip = fig.clip_rect(ax)
    xt, xd = S.nice_ticks(360, 830, max_ticks=6)
    yt, yd = S.nice_ticks(0, 1.08, max_ticks=7)
    fig.add(S.grid(ax, xt, yt, PALETTE["grid"]))
    design = [s for s in series if not s[3]]
    colour_of = {label: SPECTRUM_COLOURS[i % len(SPECTRUM_COLOURS)] for i, (label, *_rest) in enumerate(design)}
    k = len(design)
    keys, units, designs = [], [], []
    for label, wl, v, is_unit in series:
        v = np.asarray(v, dtype=float)
        peak = np.nanmax(v) if v.size else np.nan
        if not peak > 0:
            continue
        c = colour_of.get(label.split(" ", 1)[-1]) if is_unit else colour_of[label]
        if c is None:
            c = SPECTRUM_COLOURS[k % len(SPECTRUM_COLOURS)]
            k += 1
        px = ax.px(np.stack([np.asarray(wl, dtype=float), v / peak], -1))
        if is_unit:
            units.append(S.line(px, c, 0.7, (0, (3, 2)), clip=clip))
        else:
            designs.append(S.line(px, c, 1.5, clip=clip))
            keys.append(Key(label, c, 1.5))
    fig.add(*units, *designs)    # design spectra over the units' dashed lines
    if any(s[3] for s in series):
        keys.append(Key("measured units", "#444444", 0.7, (0, (3, 2))))
    fig.add(S.frame(ax, xt, yt, "wavelength (nm)", "relative to own peak", xd, yd))
    fig.add(S.text(ax.left + ax.width / 2, ax.top - 8, S.shorten(f"Spectra ({observer_title} used to integrate them)"),
                   10, anchor="middle", max_width=SPECTRA_SIZE[0] - 20))
    size = S.legend_size(keys, 7, max_width=ax.width - 7)
    fig.add(S.legend(keys, S.LegendBox(ax.right - 3.5 - size[0], ax.top + 3.5, *size), 7))
    return fig, ax


VOLUME_LIGHTNESS = (15.0, 30.0, 45.0, 60.0, 75.0, 90.0)
VOLUME_SIZE = (561.6, 388.8)        # points (7.8 × 5.4 in)
_PANEL = (122.0, 122.0)             # width, height of each a*b* panel's box
_PANEL_ORIGIN = (68.0, 42.0)
_PANEL_GAP = (40.0, 38.0)


def _grid_px(line, A, B, ax):
    i0, j0 = A[0, 0], B[0, 0]
    da, db = A[1, 0] - A[0, 0], B[0, 1] - B[0, 0]
    return ax.px(np.stack([i0 + line[:, 0] * da, j0 + line[:, 1] * db], -1))


def volume_slices(slices, spec_label: str, reference_label: str):
    """Cross-sections of two CIELAB gamut solids at fixed lightness: ``slices`` of
    (L, A, B, inside_spec, inside_reference) grids, drawn as a*b* outlines."""
    fig = S.Figure(*VOLUME_SIZE)
    axes = []
    ticks, _ = S.nice_ticks(-200, 200, max_ticks=5)
    for n, (L, A, B, spec_in, ref_in) in enumerate(slices):
        r, c = divmod(n, 3)
        box = (_PANEL_ORIGIN[0] + c * (_PANEL[0] + _PANEL_GAP[0]), _PANEL_ORIGIN[1] + r * (_PANEL[1] + _PANEL_GAP[1]),
               *_PANEL)
        ax = S.Axes(box, (-200, 200), (-200, 200), equal=True)
        axes.append(ax)
        clip = fig.clip_rect(ax)
        fig.add(S.line(ax.px([(-200, 0), (200, 0)]), PALETTE["grid"], 0.5),
                S.line(ax.px([(0, -200), (0, 200)]), PALETTE["grid"], 0.5))
        for mask, colour, dash in ((ref_in, "#6b6b6b", (0, (4, 2))), (spec_in, PALETTE["gamut"], None)):
            if mask.any() and not mask.all():
                for outline in mask_outlines(mask):
                    fig.add(S.line(_grid_px(outline, A, B, ax), colour, 1.2, dash, clip=clip))
        fig.add(S.frame(ax, ticks, ticks, "a*" if r == 1 else "", "b*" if c == 0 else "", 0, 0, size=8,
                        xticklabels=r == 1, yticklabels=c == 0))
        fig.add(S.text(ax.left + ax.width / 2, ax.top - 5, f"L* = {L:g}", 8, anchor="middle"))
    keys = [Key(spec_label, PALETTE["gamut"], 1.2), Key(reference_label, "#6b6b6b", 1.2, (0, (4, 2)))]
    w, h = S.legend_size(keys, 7, ncols=2, max_width=VOLUME_SIZE[0] - 20)
    bottom = max((a.bottom for a in axes), default=300.0)
    fig.add(S.legend(keys, S.LegendBox((VOLUME_SIZE[0] - w) / 2, bottom + 34, w, h), 7, ncols=2, frame=False))
    title = S.shorten(f"CIELAB gamut at six lightness levels, against {reference_label}")
    fig.add(S.text(VOLUME_SIZE[0] / 2, 14, title, 10, anchor="middle", va="top", max_width=VOLUME_SIZE[0] - 20))
    return fig, axes
