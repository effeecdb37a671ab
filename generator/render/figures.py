"""Chromaticity diagrams and the white-point close-up as deterministic, hand-written SVG.

Each plotting function returns (Figure, Axes) of ``svgplot``; ``save_svg`` gives the SVG
text with its <title> and <desc>. The static part of a full diagram (locus with its
approximate colour fill and wavelength labels, Planckian locus, grid, axes) is drawn once
per diagram kind, observer and fill, and every spec's diagram starts from a copy of it.
"""
from __future__ import annotations

import inspect
from dataclasses import dataclass
from functools import cache, lru_cache
from math import isfinite

import numpy as np

from ..colour.cct import uv_from_cct_duv
from ..colour.convert import uv1960_to_uv_prime, uv1960_to_xy, uv_prime_to_xy, xy_to_uv_prime
from ..colour.planck import planck_uv
from ..colour.spectral import spectral_locus_xy
from . import png
from . import svgplot as S
from .svgplot import Key
from .swatch import xy_to_preview_rgb

# One palette for every figure; verdicts also differ by marker shape.
PALETTE = {
    "locus": "#222222", "planck": "#7a5c00", "gamut": "#0b57d0", "target": "#0b57d0",
    "tolerance": "#b3261e", "grid": "#d9d9d9", "pass": "#137333", "fail": "#b3261e",
    "indeterminate": "#8a5a00", "isotherm": "#9a9a9a",
}
# Reference gamuts differ by line style and colour: (colour, (offset, dash pattern in line widths)).
REFERENCE_STYLES = [("#6b6b6b", (0, (5, 2))), ("#8e24aa", (0, (1, 1.5))), ("#00796b", (0, (6, 2, 1, 2))),
                    ("#ad5700", (0, (3, 3))), ("#5c6bc0", (0, (8, 2, 2, 2, 2, 2)))]
MARKERS = {"pass": "o", "fail": "X", "indeterminate": "D"}   # circle, X, diamond
LOCUS_LABELS = (380, 460, 470, 480, 490, 500, 510, 520, 540, 560, 580, 600, 620, 700)
TEXT_GREY = "#444444"


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


@cache
def _takes_observer(fn) -> bool:
    try:
        return "observer" in inspect.signature(fn).parameters
    except (TypeError, ValueError):
        return False


def _kw(fn, observer: str) -> dict:
    """``observer=`` for a colorimetry function that accepts it (the Planckian locus depends
    on the observer); nothing for one that does not."""
    return {"observer": observer} if _takes_observer(fn) else {}


def planck_uv_prime(T, observer: str = "cie1931-2") -> np.ndarray:
    return uv1960_to_uv_prime(planck_uv(T, **_kw(planck_uv, observer)))


def cct_duv_uv_prime(T, duv, observer: str = "cie1931-2") -> np.ndarray:
    return uv1960_to_uv_prime(uv_from_cct_duv(T, duv, **_kw(uv_from_cct_duv, observer)))


def _to(diagram, xy):
    xy = np.asarray(xy, dtype=float)
    return xy if diagram == "xy" else xy_to_uv_prime(xy)


# Diagram frames, fixed: the static part is the same for every spec.
_FRAME = {"xy": dict(xlim=(-0.04, 0.8), ylim=(-0.02, 0.9), xlabel="x", ylabel="y"),
          "uv": dict(xlim=(-0.04, 0.66), ylim=(-0.02, 0.64), xlabel="u'", ylabel="v'")}
FULL_SIZE = (403.2, 424.8)                 # points (5.6 × 5.9 in)
FULL_AXES = (0.11, 0.1, 0.86, 0.85)       # left, bottom, width, height as fractions of the figure
FILL_NOTE = "Fill: approximate colours (sRGB preview), not measured values."
FILL_PIXELS = 128


def _axes_box(size, frac):
    w, h = size
    left, bottom, fw, fh = frac
    return left * w, (1 - bottom - fh) * h, fw * w, fh * h


@cache
def locus_fill(diagram: str, n: int = FILL_PIXELS) -> np.ndarray:
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
    a = np.round(rgb * 255).astype(np.uint8)
    a.setflags(write=False)
    return a


@cache
def _fill_uri(diagram: str) -> str:
    return png.data_uri(locus_fill(diagram)[::-1])


@dataclass(frozen=True)
class _Static:
    fig: S.Figure
    ax: S.Axes
    clip: str                    # id of the axes' clip path
    avoid: np.ndarray            # figure points the legend should not cover (locus, Planckian locus)
    label_boxes: tuple           # boxes of the wavelength labels, which target labels keep off


@cache
def _static(diagram: str, observer: str, fill: bool) -> _Static:
    """The static layers of a full diagram: locus (filled or neutral), grid, wavelength
    labels, Planckian locus, axes; drawn once per diagram, observer and fill."""
    f = _FRAME[diagram]
    fig = S.Figure(*FULL_SIZE)
    ax = S.Axes(_axes_box(FULL_SIZE, FULL_AXES), f["xlim"], f["ylim"], equal=True)
    clip = fig.clip_rect(ax)
    wl, locus = spectral_locus_xy(observer)
    loc = _to(diagram, locus)
    loc_px = ax.px(loc)
    if fill:
        lc = fig.clip_path(loc_px)
        fig.add(f'<g clip-path="url(#{lc})"><image x="{S.num(ax.left)}" y="{S.num(ax.top)}"'
                f' width="{S.num(ax.width)}" height="{S.num(ax.height)}" preserveAspectRatio="none"'
                f' xlink:href="{_fill_uri(diagram)}"/></g>\n')
    else:
        fig.add(S.line(loc_px, "none", 0, closed=True, fill="#f4f4f4", clip=clip))
    xt, xd = S.nice_ticks(*f["xlim"], max_ticks=10)
    yt, yd = S.nice_ticks(*f["ylim"], max_ticks=10)
    fig.add(S.grid(ax, xt, yt, PALETTE["grid"]))
    fig.add(S.line(loc_px, PALETTE["locus"], 0.9, closed=True, clip=clip))
    c = loc.mean(axis=0)
    ticks, labels, boxes = [], [], []
    for w in LOCUS_LABELS:
        p = loc[int(np.argmin(np.abs(wl - w)))]
        d = (p - c) / max(np.linalg.norm(p - c), 1e-9)
        ticks.append(ax.px(np.array([p, p + 0.012 * d])))
        q = ax.px(p + 0.03 * d)
        labels.append(S.text(q[0], q[1], f"{w}", 7, TEXT_GREY, anchor="middle", va="center"))
        boxes.append(S.text_box(q[0], q[1], f"{w}", 7, "middle", "center"))
    fig.add(f'<path d="{"".join(S.path_d(t) for t in ticks)}" stroke="{PALETTE["locus"]}" stroke-width="0.6"/>\n',
            *labels)
    pl = planck_uv_prime(np.geomspace(1000, 25000, 80), observer)
    pl_px = ax.px(pl if diagram == "uv" else uv_prime_to_xy(pl))
    fig.add(S.line(pl_px, PALETTE["planck"], 0.8, clip=clip))
    fig.add(S.frame(ax, xt, yt, f["xlabel"], f["ylabel"], xd, yd))
    if fill:
        fig.add(S.text(FULL_AXES[0] * FULL_SIZE[0], FULL_SIZE[1] * (1 - 0.012), FILL_NOTE, 7, TEXT_GREY))
    return _Static(fig, ax, clip, np.vstack([loc_px, pl_px]), tuple(boxes))


def _densify(px, closed: bool, step: float = 4.0) -> np.ndarray:
    """Points along a polyline at most ``step`` apart (for the legend's placement)."""
    px = np.asarray(px, dtype=float).reshape(-1, 2)
    if closed and len(px) > 1:
        px = np.vstack([px, px[:1]])
    seg = px[1:] - px[:-1]
    if not np.all(np.isfinite(seg)):
        raise ValueError("a polyline to densify has a point that is not finite")
    # segment i gets n_i points a_i + (b_i - a_i) k / n_i, k = 1..n_i (all segments at once)
    n = np.maximum(1, np.ceil(np.hypot(seg[:, 0], seg[:, 1]) / step).astype(np.intp))
    i = np.repeat(np.arange(len(seg)), n)
    k = np.arange(1, int(n.sum()) + 1) - np.repeat(np.cumsum(n) - n, n)
    return np.vstack([px[:1], px[:-1][i] + seg[i] * (k / n[i])[:, None]])


LEGEND_FONT = 7.0
_CORNERS = {"xy": ("upper right", "lower right", "upper left", "lower left"),
            "uv": ("lower right", "upper right", "lower left", "upper left")}


def _corner(ax: S.Axes, where: str, size, pad: float = 3.5):
    w, h = size
    x = ax.right - pad - w if where.endswith("right") else ax.left + pad
    y = ax.top + pad if where.startswith("upper") else ax.bottom - pad - h
    return x, y


def unit_keys(units) -> list[Key]:
    """Legend entries of the verdicts drawn (a unit without a finite point draws nothing)."""
    present = {v for _, (x, y), v in units if isfinite(x) and isfinite(y)}
    return [Key(f"unit: {v}", marker=MARKERS[v], marker_size=5, marker_fill="none" if v == "pass" else PALETTE[v],
                marker_stroke=PALETTE[v]) for v in ("pass", "indeterminate", "fail") if v in present]


def draw_units(fig: S.Figure, ax: S.Axes, units, to_px, clip: str) -> np.ndarray:
    """Measured units by verdict, each verdict its own shape and colour; their figure points."""
    drawn = []
    for verdict in ("pass", "indeterminate", "fail"):
        pts = [xy for _, xy, v in units if v == verdict]
        if pts:
            px = to_px(np.array(pts, dtype=float))
            fill = "none" if verdict == "pass" else PALETTE[verdict]
            fig.add(S.markers(px, MARKERS[verdict], 5, fill, PALETTE[verdict], 1.0, clip=clip, cls=f"unit-{verdict}"))
            drawn.append(px)
    return np.vstack(drawn) if drawn else np.zeros((0, 2))


def chromaticity_diagram(layer: Layer, diagram: str, fill: bool = True):
    """The full diagram in CIE 1931 xy (``diagram='xy'``) or CIE 1976 u'v' (``'uv'``): a copy
    of the static frame with the spec's layers, title and legend drawn on it."""
    st = _static(diagram, layer.observer, fill)
    fig, ax, clip = st.fig.copy(), st.ax, st.clip

    def to_px(xy):
        return ax.px(_to(diagram, xy))

    keys = [Key("spectral locus", PALETTE["locus"], 0.9), Key("Planckian locus", PALETTE["planck"], 0.8)]
    lines, points = [], []
    for i, (title, hull) in enumerate(layer.references):
        colour, dash = REFERENCE_STYLES[i % len(REFERENCE_STYLES)]
        px = to_px(hull)
        fig.add(S.line(px, colour, 1.1, dash, clip=clip, closed=True))
        keys.append(Key(title, colour, 1.1, dash))
        lines.append(_densify(px, True))
    if layer.gamut_xy is not None:
        px = to_px(layer.gamut_xy)
        fig.add(S.line(px, PALETTE["gamut"], 1.8, clip=clip, closed=True))
        keys.append(Key("spec gamut", PALETTE["gamut"], 1.8))
        lines.append(_densify(px, True))
    for _label, poly in layer.tolerances:
        px = to_px(poly)
        fig.add(S.line(px, PALETTE["tolerance"], 0.8, clip=clip, closed=True))
        points.append(px)
    if layer.tolerances:
        keys.append(Key("tolerance regions (to scale)", PALETTE["tolerance"], 0.8))
    if layer.primaries:
        px = to_px(np.array([xy for _, xy in layer.primaries], dtype=float))
        fig.add(S.markers(px, "+", 8, "none", PALETTE["target"], 1.0, clip=clip))
        points.append(px)
    if layer.white_xy is not None:
        px = to_px(np.array([layer.white_xy], dtype=float))
        fig.add(S.markers(px, "*", 9, PALETTE["target"], PALETTE["target"], 0.6, clip=clip))
        keys.append(Key("white target", marker="*", marker_size=9, marker_fill=PALETTE["target"],
                        marker_stroke=PALETTE["target"]))
        points.append(px)
    points.append(draw_units(fig, ax, layer.units, to_px, clip))
    keys += unit_keys(layer.units)
    fig.add(S.text((FULL_AXES[0] + FULL_AXES[2] / 2) * FULL_SIZE[0], 0.025 * FULL_SIZE[1], S.shorten(layer.title),
                   10, anchor="middle", va="top", max_width=FULL_SIZE[0] - 20))
    size = S.legend_size(keys, LEGEND_FONT, max_width=ax.width - 7)
    avoid = [st.avoid, *lines, *points]
    weights = [np.ones(len(st.avoid))] + [np.ones(len(p)) for p in lines] + [np.full(len(p), 25.0) for p in points]
    box = S.place_legend([_corner(ax, c, size) for c in _CORNERS[diagram]], size, np.vstack(avoid),
                         np.concatenate(weights))
    fig.add(S.legend(keys, box, LEGEND_FONT))
    if layer.primaries:
        _target_labels(fig, ax, layer.primaries, to_px, [*st.label_boxes, (box.x, box.y, box.x + box.width,
                                                                           box.y + box.height)], np.vstack(points))
    return fig, ax


TARGET_LABEL = 8.0
# offsets (points) and alignment of a target's name around its mark, in order of preference
_AROUND = ((5, -5, "start", "baseline"), (5, 5, "start", "top"), (-5, -5, "end", "baseline"), (-5, 5, "end", "top"),
           (0, -7, "middle", "baseline"), (0, 7, "middle", "top"), (7, 0, "start", "center"), (-7, 0, "end", "center"))


def _target_labels(fig, ax, targets, to_px, taken, points) -> None:
    """Each target's name beside its mark: up and to the right where that is free, else at the
    first of the other places around it (near, then farther) that meets no other label, the
    wavelength labels or the legend, and covers no drawn point."""
    taken = list(taken)
    bounds = (ax.left, ax.top, ax.right, ax.bottom)
    px = to_px(np.array([xy for _, xy in targets], dtype=float))
    for (name, _), (x, y) in zip(targets, px.tolist(), strict=True):
        s = S.shorten(name)
        cands = [(x + k * dx, y + k * dy, anchor, va) for k in (1, 2.5)
                 for dx, dy, anchor, va in _AROUND]
        found = S.free_place(cands, s, TARGET_LABEL, taken, points, bounds)
        (cx, cy, anchor, va), b = found if found is not None else (cands[0], S.text_box(*cands[0][:2], s, TARGET_LABEL))
        taken.append(b)
        fig.add(S.text(cx, cy, s, TARGET_LABEL, anchor=anchor, va=va))


TOLERANCE_DASHES = ("-", (0, (4, 2)), (0, (1, 1.5)))
ISOTHERMS_K = (2000, 2500, 2700, 3000, 3500, 4000, 4500, 5000, 5700, 6500, 7500, 9300, 12000, 20000)
DUV_LINES = (-0.02, -0.01, -0.005, 0.005, 0.01, 0.02)
WHITE_SIZE = (403.2, 352.8)               # points (5.6 × 4.9 in)
WHITE_AXES = (0.13, 0.25, 0.84, 0.69)
LINE_LABEL = 6.5


@cache
def _white_lines(observer: str = "cie1931-2"):
    """Planckian locus, lines of constant Duv and isotherms in u'v': the same for every
    close-up, and costly (each point integrates Planck's law over the observer)."""
    T = np.geomspace(1000, 100000, 400)
    duv = {d: cct_duv_uv_prime(T, d, observer) for d in DUV_LINES}
    iso = {t: cct_duv_uv_prime(np.full(41, float(t)), np.linspace(-0.03, 0.03, 41), observer) for t in ISOTHERMS_K}
    return planck_uv_prime(T, observer), duv, iso


def _place_labels(fig, ax, labels, data_px) -> None:
    """Each line label at the first of its candidate points (figure coordinates, best first)
    where its box stays inside the axes, meets no label placed before it and covers none of
    ``data_px`` (units, target, tolerance outlines); failing that where it only covers data."""
    taken = []
    bounds = (ax.left, ax.top, ax.right, ax.bottom)
    for cands, s, va in labels:
        found = S.free_place([(x, y, "middle", va) for x, y in cands], s, LINE_LABEL, taken, data_px, bounds, 1.2)
        if found is not None:
            (x, y, _, _), box = found
            taken.append(box)
            fig.add(S.label_box(x, y, s, LINE_LABEL, va=va), S.text(x, y, s, LINE_LABEL, "#333333", anchor="middle",
                                                                   va=va))


def white_closeup(layer: Layer, span: float = 0.02):
    """The white target in CIE 1976 u'v' with the Planckian locus, isotherms and lines of
    constant Duv (CIE 1960 uv distances, drawn in u'v'). Lines are labelled inside the
    frame; the legend sits below it so that it covers nothing."""
    w = xy_to_uv_prime(np.array(layer.white_xy, dtype=float))
    pts = [w[None], xy_to_uv_prime(np.array([xy for _, xy, _ in layer.units], dtype=float).reshape(-1, 2))]
    pts += [xy_to_uv_prime(np.asarray(poly, dtype=float)) for _, poly in layer.tolerances]
    pts = np.vstack(pts)
    pts = pts[np.isfinite(pts).all(axis=1)]
    half = max(span, float(np.max(np.abs(pts - w))) * 1.25)
    x0, x1, y0, y1 = w[0] - half, w[0] + half, w[1] - half * 0.8, w[1] + half * 0.8
    fig = S.Figure(*WHITE_SIZE)
    ax = S.Axes(_axes_box(WHITE_SIZE, WHITE_AXES), (x0, x1), (y0, y1), equal=True)
    clip = fig.clip_rect(ax)

    def within(line, m):
        mx, my = m * 2 * half, m * 1.6 * half
        return (line[:, 0] > x0 + mx) & (line[:, 0] < x1 - mx) & (line[:, 1] > y0 + my) & (line[:, 1] < y1 - my)

    def visible_part(line):
        """The line's points in the frame and one beyond on each side (None if it misses it)."""
        keep = within(line, -0.02)
        if not keep.any():
            return None
        keep = keep | np.roll(keep, 1) | np.roll(keep, -1)
        return line[keep]

    xt, xd = S.nice_ticks(x0, x1, max_ticks=7)
    yt, yd = S.nice_ticks(y0, y1, max_ticks=7)
    fig.add(S.grid(ax, xt, yt, PALETTE["grid"]))
    pl, duv_lines, isotherms = _white_lines(layer.observer)
    labels = []
    for duv, line in duv_lines.items():
        part = visible_part(line)
        if part is None:
            continue
        fig.add(S.line(ax.px(part), PALETTE["isotherm"], 0.7, (0, (2, 2)), clip=clip))
        vis = line[within(line, 0.03)]
        if len(vis):  # label where the line leaves the frame at the bottom, else higher up along it
            labels.append((ax.px(vis[np.argsort(vis[:, 1], kind="stable")]).tolist(), f"Duv {duv:+.3f}", "bottom"))
    keys = []
    part = visible_part(pl)
    if part is not None:
        fig.add(S.line(ax.px(part), PALETTE["planck"], 1.2, clip=clip))
    keys.append(Key("Planckian locus (Duv 0)", PALETTE["planck"], 1.2))
    iso_key = False
    for t, iso in isotherms.items():
        if visible_part(iso) is None:
            continue
        fig.add(S.line(ax.px(iso), PALETTE["isotherm"], 0.7, clip=clip))
        iso_key = True
        vis = iso[within(iso, 0.03)]
        if len(vis):  # label at the isotherm's highest visible point, else lower down along it
            labels.append((ax.px(vis[np.argsort(-vis[:, 1], kind="stable")]).tolist(), f"{t} K", "top"))
    if iso_key:
        keys.append(Key("isotherms (CCT) and lines of constant Duv", PALETTE["isotherm"], 0.7))
    data = [ax.px(w[None]), ax.px(xy_to_uv_prime(np.array([xy for _, xy, _ in layer.units], dtype=float)
                                                  .reshape(-1, 2)))]
    data += [_densify(ax.px(xy_to_uv_prime(np.asarray(poly, dtype=float))), True, 3.0) for _, poly in layer.tolerances]
    _place_labels(fig, ax, labels, np.vstack(data))
    for i, (label, poly) in enumerate(layer.tolerances):
        dash = TOLERANCE_DASHES[i % len(TOLERANCE_DASHES)]
        fig.add(S.line(ax.px(xy_to_uv_prime(np.asarray(poly, dtype=float))), PALETTE["tolerance"], 1.1, dash,
                       clip=clip, closed=True))
        keys.append(Key(f"{S.shorten(label)} (to scale)", PALETTE["tolerance"], 1.1, dash))
    fig.add(S.markers(ax.px(w[None]), "*", 11, PALETTE["target"], PALETTE["target"], 0.6, clip=clip))
    keys.append(Key("white target", marker="*", marker_size=11, marker_fill=PALETTE["target"],
                    marker_stroke=PALETTE["target"]))
    draw_units(fig, ax, layer.units, lambda xy: ax.px(xy_to_uv_prime(xy)), clip)
    keys += unit_keys(layer.units)
    fig.add(S.frame(ax, xt, yt, "u'", "v'", xd, yd))
    fig.add(S.text(0.55 * WHITE_SIZE[0], 0.015 * WHITE_SIZE[1], S.shorten(layer.title), 10, anchor="middle",
                   va="top", max_width=WHITE_SIZE[0] - 20))
    lw, lh = S.legend_size(keys, LEGEND_FONT, ncols=2, max_width=WHITE_SIZE[0] - 20)
    top = ax.bottom + 36
    fig.add(S.legend(keys, S.LegendBox((WHITE_SIZE[0] - lw) / 2, top, lw, lh), LEGEND_FONT, ncols=2, frame=False))
    return fig, ax


def save_svg(fig: S.Figure, title: str = "", desc: str = "") -> str:
    """The figure as SVG text, with a <title> and <desc> for screen readers when given."""
    return fig.to_svg(title, desc)


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
    """The CCT x Duv quadrangle: isotherm edges and constant-Duv edges, in xy (a copy of the
    one computed for the same limits: each of its points integrates Planck's law)."""
    (t0, t1), (d0, d1) = cct, duv
    return _cct_duv_quad(*(None if v is None else float(v) for v in (t0, t1, d0, d1)), n).copy()


@lru_cache(maxsize=256)
def _cct_duv_quad(t0, t1, d0, d1, n):
    t0 = t0 if t0 is not None else 1000.0
    t1 = t1 if t1 is not None else 25000.0
    d0 = d0 if d0 is not None else -0.02
    d1 = d1 if d1 is not None else 0.02
    T = np.geomspace(t0, t1, n)
    lower = uv_from_cct_duv(T, d0)
    upper = uv_from_cct_duv(T[::-1], d1)
    return uv1960_to_xy(np.vstack([lower, upper]))
