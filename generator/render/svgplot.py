"""Hand-written SVG for the site's figures: a figure with its defs, linear axes mapping data
to the figure's coordinates, ticks, grid, lines, polygons, markers, text and legends.

Everything returns text; nothing is measured from a font at run time (text widths come
from the advance widths of DejaVu Sans below), so the same input gives the same bytes.
Coordinates are in the figure's user units (points: a 403.2 × 424.8 viewBox is 5.6 × 5.9
inches), y pointing down, written with at most two decimals. Every text is XML-escaped.
"""
from __future__ import annotations

import math
import re
import unicodedata
from dataclasses import dataclass

import numpy as np

FONT_FAMILY = "DejaVu Sans, Bitstream Vera Sans, Verdana, sans-serif"

# Advance widths of DejaVu Sans for ASCII 32..126 in 1/2048 em (the font's hmtx table).
_ASCII_WIDTHS = (
    651, 821, 942, 1716, 1303, 1946, 1597, 563, 799, 799, 1024, 1716, 651, 739, 651, 690, 1303, 1303, 1303, 1303,
    1303, 1303, 1303, 1303, 1303, 1303, 690, 690, 1716, 1716, 1716, 1087, 2048, 1401, 1405, 1430, 1577, 1294, 1178,
    1587, 1540, 604, 604, 1343, 1141, 1767, 1532, 1612, 1235, 1612, 1423, 1300, 1251, 1499, 1401, 2025, 1403, 1251,
    1403, 799, 690, 799, 1716, 1024, 1024, 1255, 1300, 1126, 1300, 1260, 721, 1300, 1298, 569, 569, 1186, 569, 1995,
    1298, 1253, 1300, 1300, 842, 1067, 803, 1298, 1212, 1675, 1212, 1212, 1075, 1303, 690, 1303, 1716)
_OTHER_WIDTHS = {"−": 1716, "×": 1716, "≤": 1716, "≥": 1716, "°": 1024, "—": 2048, "–": 1024, "…": 2048,
                 "Δ": 1401, "′": 563, "’": 651, "\u200b": 0}


def char_width(ch: str) -> float:
    """Advance width of one character in em (an estimate outside ASCII)."""
    o = ord(ch)
    if 32 <= o < 127:
        return _ASCII_WIDTHS[o - 32] / 2048
    if ch in _OTHER_WIDTHS:
        return _OTHER_WIDTHS[ch] / 2048
    if unicodedata.combining(ch):
        return 0.0
    return 1.0 if unicodedata.east_asian_width(ch) in "WF" else 0.62


def text_width(text: str, size: float) -> float:
    return size * sum(char_width(c) for c in text)


_NOT_XML = re.compile("[^\t\n\r\u0020-\ud7ff\ue000-\ufffd\U00010000-\U0010ffff]")


def esc(text) -> str:
    """Text for XML content or a double-quoted attribute; characters XML 1.0 cannot carry
    (control characters, lone surrogates) become U+FFFD."""
    text = _NOT_XML.sub("\ufffd", str(text))
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace('"', "&quot;")


def num(v: float) -> str:
    """A coordinate or length: rounded to two decimals, no trailing zeros, never '-0'."""
    return "%.7g" % (round(float(v), 2) + 0.0)


def _pairs(px: np.ndarray) -> list[str]:
    p = np.round(np.asarray(px, dtype=float), 2) + 0.0
    return ["%.7g,%.7g" % xy for xy in map(tuple, p.tolist())]


def path_d(px, closed: bool = False) -> str:
    """Path data through pixel points (n, 2); a non-finite point breaks the line."""
    px = np.asarray(px, dtype=float).reshape(-1, 2)
    ok = np.isfinite(px).all(axis=1)
    if ok.all():
        runs = [px]
    else:
        edges = np.flatnonzero(np.diff(np.concatenate([[0], ok.astype(np.int8), [0]])))
        runs = [px[a:b] for a, b in zip(edges[::2], edges[1::2], strict=True)]
    out = []
    for run in runs:
        if not len(run):
            continue
        p = _pairs(run)
        out.append("M" + p[0] + ("L" + " ".join(p[1:]) if len(p) > 1 else "") + ("Z" if closed else ""))
    return "".join(out)


def dasharray(pattern, width: float) -> str | None:
    """An SVG dash array from a pattern given in line widths (``(offset, (on, off, ...))``,
    '-', '--', ':' or '-.'), scaled by the line's width as the pattern is written."""
    named = {"-": None, "--": (3.7, 1.6), ":": (1.0, 1.65), "-.": (6.4, 1.6, 1.0, 1.6)}
    if pattern is None or isinstance(pattern, str):
        seq = named[pattern or "-"]
    else:
        seq = pattern[1]
    return None if seq is None else ",".join(num(s * width) for s in seq)


def _attrs(**kw) -> str:
    return "".join(f' {k.rstrip("_").replace("_", "-")}="{v}"' for k, v in kw.items() if v is not None)


def line(px, stroke: str, width: float = 1.0, dash=None, clip: str | None = None, closed: bool = False,
         fill: str = "none", opacity: float | None = None) -> str:
    """A polyline (or closed outline) through pixel points; ``dash`` as for ``dasharray``."""
    d = path_d(px, closed)
    if not d:
        return ""
    return (f'<path d="{d}"' + _attrs(fill=fill, stroke=stroke, stroke_width=num(width),
                                      stroke_dasharray=dasharray(dash, width), opacity=opacity,
                                      clip_path=f"url(#{clip})" if clip else None) + "/>\n")


def rect(x, y, w, h, fill="none", stroke=None, width=None, opacity=None, clip=None) -> str:
    return (f'<rect x="{num(x)}" y="{num(y)}" width="{num(w)}" height="{num(h)}"'
            + _attrs(fill=fill, stroke=stroke, stroke_width=None if width is None else num(width),
                     fill_opacity=opacity, clip_path=f"url(#{clip})" if clip else None) + "/>\n")


# Marker outlines as (x, y) vertices for a marker of size 1 (y down); 'o' and '+' are special.
def _star(n=5, inner=0.19):
    t = -np.pi / 2 + np.arange(2 * n) * np.pi / n
    r = np.where(np.arange(2 * n) % 2 == 0, 0.5, inner)
    return np.stack([r * np.cos(t), r * np.sin(t)], -1)


def _x_shape(arm=0.16):
    a, b = arm, 0.5
    plus = np.array([(-a, -b), (a, -b), (a, -a), (b, -a), (b, a), (a, a), (a, b), (-a, b), (-a, a), (-b, a),
                     (-b, -a), (-a, -a)])
    c = math.cos(math.pi / 4)
    return plus @ np.array([[c, c], [-c, c]]) * 1.05


_SHAPES = {"X": _x_shape(), "D": np.array([(0, -0.6), (0.6, 0), (0, 0.6), (-0.6, 0)]), "*": _star(),
           "s": np.array([(-0.5, -0.5), (0.5, -0.5), (0.5, 0.5), (-0.5, 0.5)])}


def _shape_path(shape: str, size: float) -> tuple[tuple[float, float], str]:
    """(offset of the first vertex, relative path of the rest) of one marker."""
    r = size / 2
    if shape == "o":
        return (-r, 0.0), f"a{num(r)},{num(r)} 0 1,0 {num(2 * r)},0a{num(r)},{num(r)} 0 1,0 {num(-2 * r)},0z"
    if shape == "+":
        return (-r, 0.0), f"h{num(2 * r)}m{num(-r)},{num(-r)}v{num(2 * r)}"
    v = np.round(_SHAPES[shape] * size, 2)
    steps = np.diff(v, axis=0)
    return (float(v[0, 0]), float(v[0, 1])), "l" + " ".join(_pairs(steps)) + "z"


def markers(px, shape: str, size: float, fill: str, stroke: str, width: float = 1.0,
            clip: str | None = None, cls: str | None = None) -> str:
    """One marker of ``shape`` ('o', 'X', 'D', '*', 's', '+') at each pixel point, as one path."""
    px = np.asarray(px, dtype=float).reshape(-1, 2)
    px = px[np.isfinite(px).all(axis=1)]
    if not len(px):
        return ""
    (dx, dy), rest = _shape_path(shape, size)
    starts = _pairs(px + (dx, dy))
    d = "".join("M" + s + rest for s in starts)
    return (f'<path d="{d}"' + _attrs(class_=cls, fill=fill if shape != "+" else "none", stroke=stroke,
                                      stroke_width=num(width), clip_path=f"url(#{clip})" if clip else None) + "/>\n")


# Where the baseline sits for a vertical alignment, in em below the anchor point.
_BASELINE = {"baseline": 0.0, "center": 0.36, "top": 0.76, "bottom": -0.24}


def text(x, y, s, size: float = 9, colour: str = "#000000", anchor: str = "start", va: str = "baseline",
         rotate: float | None = None, clip: str | None = None, max_width: float | None = None) -> str:
    """One line of text; ``anchor`` start / middle / end, ``va`` baseline / center / top / bottom.
    Text wider than ``max_width`` is drawn whole, its glyphs narrowed to fit (``textLength``)."""
    if rotate:  # the offset for the alignment is taken along the rotated vertical
        t = math.radians(rotate)
        off = _BASELINE[va] * size
        x, y = x - off * math.sin(t), y + off * math.cos(t)
        tr = f' transform="rotate({num(rotate)} {num(x)} {num(y)})"'
    else:
        y = y + _BASELINE[va] * size
        tr = ""
    return (f'<text x="{num(x)}" y="{num(y)}" font-size="{num(size)}"' + _attrs(fill=colour)
            + (f' text-anchor="{anchor}"' if anchor != "start" else "") + tr
            + (f' clip-path="url(#{clip})"' if clip else "")
            + (f' textLength="{num(max_width)}" lengthAdjust="spacingAndGlyphs"'
               if max_width is not None and text_width(s, size) > max_width else "")
            + f">{esc(s)}</text>\n")


def text_box(x, y, s, size, anchor="start", va="baseline", pad=0.0) -> tuple[float, float, float, float]:
    """(left, top, right, bottom) of ``text(x, y, s, size, anchor=anchor, va=va)``, grown by ``pad``."""
    w = text_width(s, size)
    left = x - {"start": 0, "middle": w / 2, "end": w}[anchor]
    base = y + _BASELINE[va] * size
    return left - pad, base - 0.76 * size - pad, left + w + pad, base + 0.24 * size + pad


def label_box(x, y, s, size, anchor="middle", va="center", pad=1.2, fill="#ffffff", opacity=0.85):
    """The rectangle drawn behind ``text(x, y, s, size, anchor=anchor, va=va)``."""
    x0, y0, x1, y1 = text_box(x, y, s, size, anchor, va, pad)
    return rect(x0, y0, x1 - x0, y1 - y0, fill=fill, opacity=opacity)


def _meets(a, b) -> bool:
    return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]


def free_place(cands, s, size, taken, points=(), bounds=None, pad=0.0):
    """Where to put a text: the first of the candidates ``(x, y, anchor, va)`` whose box stays
    inside ``bounds`` (left, top, right, bottom), meets none of the boxes ``taken`` and
    covers none of ``points``; failing that the first that only covers points; else None.
    Returns (candidate, its box)."""
    pts = np.asarray(points, dtype=float).reshape(-1, 2)
    fallback = None
    for c in cands:
        box = text_box(c[0], c[1], s, size, c[2], c[3], pad)
        if bounds is not None and not (box[0] >= bounds[0] and box[1] >= bounds[1] and box[2] <= bounds[2]
                                       and box[3] <= bounds[3]):
            continue
        if any(_meets(box, b) for b in taken):
            continue
        if not len(pts) or not ((pts[:, 0] >= box[0]) & (pts[:, 0] <= box[2]) & (pts[:, 1] >= box[1])
                                & (pts[:, 1] <= box[3])).any():
            return c, box
        fallback = fallback or (c, box)
    return fallback


# --- axes ----------------------------------------------------------------------------------

class Axes:
    """A linear mapping of data limits onto a box of the figure (left, top, width, height);
    ``equal`` shrinks the box about its centre so that one data unit is as long in x as in y."""

    def __init__(self, box, xlim, ylim, equal: bool = False):
        left, top, w, h = (float(v) for v in box)
        self.xlim, self.ylim = (float(xlim[0]), float(xlim[1])), (float(ylim[0]), float(ylim[1]))
        dx, dy = self.xlim[1] - self.xlim[0], self.ylim[1] - self.ylim[0]
        if equal:
            s = min(w / dx, h / dy)
            left, top = left + (w - s * dx) / 2, top + (h - s * dy) / 2
            w, h = s * dx, s * dy
        self.left, self.top, self.width, self.height = left, top, w, h
        self.sx, self.sy = w / dx, h / dy

    @property
    def right(self) -> float:
        return self.left + self.width

    @property
    def bottom(self) -> float:
        return self.top + self.height

    def x(self, v):
        return self.left + (np.asarray(v, dtype=float) - self.xlim[0]) * self.sx

    def y(self, v):
        return self.bottom - (np.asarray(v, dtype=float) - self.ylim[0]) * self.sy

    def px(self, pts) -> np.ndarray:
        """Data points (..., 2) to figure coordinates (..., 2)."""
        p = np.asarray(pts, dtype=float)
        return np.stack([self.x(p[..., 0]), self.y(p[..., 1])], axis=-1)


def nice_ticks(lo: float, hi: float, max_ticks: int = 8, integer: bool = False) -> tuple[np.ndarray, int]:
    """Tick values on [lo, hi] at a step of 1, 2, 2.5 or 5 × 10^k giving at most ``max_ticks``
    ticks, and the number of decimals their labels need."""
    span = hi - lo
    if not span > 0 or not math.isfinite(span):
        return np.array([lo]), 0
    raw = span / max(max_ticks - 1, 1)
    k = math.floor(math.log10(raw))
    for m in (1, 2, 2.5, 5, 10):
        step = m * 10.0 ** k
        if step >= raw * (1 - 1e-9) and (not integer or step >= 1):
            break
    if integer:
        step = max(round(step), 1)
    first = math.ceil(lo / step - 1e-9)
    last = math.floor(hi / step + 1e-9)
    values = np.arange(first, last + 1) * step
    decimals = 0 if step >= 1 and float(step).is_integer() else max(0, -math.floor(math.log10(step) + 1e-9))
    if m == 2.5 and step < 10:
        decimals += 1
    return values, int(decimals)


def tick_label(v: float, decimals: int) -> str:
    s = f"{v:.{decimals}f}"
    if float(s) == 0:
        s = s.lstrip("-")
    return s.replace("-", "−")


def grid(ax: Axes, xticks, yticks, colour: str, width: float = 0.4) -> str:
    segs = [f"M{num(x)},{num(ax.top)}V{num(ax.bottom)}" for x in ax.x(xticks)]
    segs += [f"M{num(ax.left)},{num(y)}H{num(ax.right)}" for y in ax.y(yticks)]
    return f'<path d="{"".join(segs)}" fill="none" stroke="{colour}" stroke-width="{num(width)}"/>\n' if segs else ""


def frame(ax: Axes, xticks, yticks, xlabel: str = "", ylabel: str = "", xdec: int = 1, ydec: int = 1,
          size: float = 9, tick_len: float = 3.5, xticklabels: bool = True, yticklabels: bool = True) -> str:
    """The axes' outline, outward ticks with their labels and the axis labels."""
    out = [rect(ax.left, ax.top, ax.width, ax.height, stroke="#000000", width=0.6)]
    xs, ys = ax.x(xticks), ax.y(yticks)
    ticks = [f"M{num(x)},{num(ax.bottom)}v{num(tick_len)}" for x in xs]
    ticks += [f"M{num(ax.left)},{num(y)}h{num(-tick_len)}" for y in ys]
    if ticks:
        out.append(f'<path d="{"".join(ticks)}" stroke="#000000" stroke-width="0.8"/>\n')
    if xticklabels:
        out += [text(x, ax.bottom + tick_len + 2, tick_label(v, xdec), size, anchor="middle", va="top")
                for x, v in zip(xs, xticks, strict=True)]
    if yticklabels:
        out += [text(ax.left - tick_len - 2, y, tick_label(v, ydec), size, anchor="end", va="center")
                for y, v in zip(ys, yticks, strict=True)]
    if xlabel:
        out.append(text(ax.left + ax.width / 2, ax.bottom + tick_len + 3 + 1.35 * size * xticklabels, xlabel,
                        size, anchor="middle", va="top"))
    if ylabel:
        widest = max((text_width(tick_label(v, ydec), size) for v in yticks), default=0) if yticklabels else 0
        out.append(text(ax.left - tick_len - 6 - widest, ax.top + ax.height / 2, ylabel, size, anchor="middle",
                        va="bottom", rotate=-90))
    return "".join(out)


# --- legend --------------------------------------------------------------------------------

@dataclass(frozen=True)
class Key:
    """One legend entry: a line sample, a marker sample, a filled patch, or a combination."""
    label: str
    stroke: str | None = None
    width: float = 1.0
    dash: object = None
    marker: str | None = None
    marker_size: float = 5.0
    marker_fill: str = "none"
    marker_stroke: str | None = None
    patch: str | None = None       # fill of a small rectangle (a histogram's bars)


LABEL_CHARS = 120


def shorten(text: str, n: int = LABEL_CHARS) -> str:
    """A legend label kept readable: the page shows the whole text."""
    text = str(text)
    return text if len(text) <= n else text[: n - 1] + "…"


@dataclass(frozen=True)
class LegendBox:
    x: float
    y: float
    width: float
    height: float

    def covers(self, px) -> np.ndarray:
        px = np.asarray(px, dtype=float).reshape(-1, 2)
        return ((px[:, 0] >= self.x) & (px[:, 0] <= self.x + self.width) & (px[:, 1] >= self.y)
                & (px[:, 1] <= self.y + self.height))


_SAMPLE, _COL_GAP, _PAD = 2.8, 1.5, 0.4   # in em: sample to label, between columns, inside the box


def _columns(keys, ncols):
    rows = math.ceil(len(keys) / ncols)
    return [col for col in (keys[i * rows:(i + 1) * rows] for i in range(ncols)) if col], rows


def _fixed_width(n_cols: int, size: float) -> float:
    return size * (2 * _PAD + _SAMPLE * n_cols + _COL_GAP * (n_cols - 1))


def _label_cap(natural, room: float, size: float) -> float:
    """The widest a column's labels may be so that the columns fit ``room`` (narrow columns
    keep their width, the others share the rest equally); inf if everything fits."""
    if room == math.inf or sum(natural) <= room + 0.01:
        return math.inf
    left, ns = room, sorted(natural)
    for i, n in enumerate(ns):
        share = left / (len(ns) - i)
        if n > share:
            return max(share, 4 * size)
        left -= n
    return math.inf


def legend_size(keys, size: float = 7, ncols: int = 1, max_width: float | None = None) -> tuple[float, float]:
    """Width and height of the legend; with ``max_width`` the widest labels are narrowed so
    that the legend fits it."""
    cols, rows = _columns(keys, ncols)
    fixed = _fixed_width(len(cols), size)
    natural = [max(text_width(shorten(k.label), size) for k in col) for col in cols]
    cap = _label_cap(natural, math.inf if max_width is None else max_width - fixed, size)
    return fixed + sum(min(n, cap) for n in natural), rows * 1.4 * size + 2 * _PAD * size


def legend(keys, box: LegendBox, size: float = 7, ncols: int = 1, frame: bool = True,
           opacity: float = 0.92) -> str:
    """The entries in ``ncols`` columns (filled column by column) inside ``box``; labels too
    wide for the box's width are narrowed to fit (see ``legend_size``)."""
    if not keys:
        return ""
    out = ['<g class="legend">\n']
    if frame:
        out.append(f'<rect x="{num(box.x)}" y="{num(box.y)}" width="{num(box.width)}" height="{num(box.height)}"'
                   f' rx="2" fill="#ffffff" fill-opacity="{opacity}" stroke="#cccccc" stroke-width="0.8"/>\n')
    cols, _ = _columns(keys, ncols)
    natural = [max(text_width(shorten(k.label), size) for k in col) for col in cols]
    cap = _label_cap(natural, box.width - _fixed_width(len(cols), size), size)
    x = box.x + _PAD * size
    for col, wide in zip(cols, natural, strict=True):
        for r, k in enumerate(col):
            y = box.y + _PAD * size + (r + 0.5) * 1.4 * size
            out.append(_sample(k, x, y, 2.0 * size))
            out.append(text(x + _SAMPLE * size, y, shorten(k.label), size, va="center",
                            max_width=None if cap == math.inf else cap))
        x += min(wide, cap) + (_SAMPLE + _COL_GAP) * size
    out.append("</g>\n")
    return "".join(out)


def _sample(k: Key, x: float, y: float, length: float) -> str:
    out = ""
    if k.patch:
        out += rect(x, y - 0.35 * length, length, 0.7 * length, fill=k.patch, stroke=k.stroke, width=k.width)
    elif k.stroke:
        out += line([(x, y), (x + length, y)], k.stroke, k.width, k.dash)
    if k.marker:
        out += markers([(x + length / 2, y)], k.marker, k.marker_size, k.marker_fill, k.marker_stroke or k.stroke)
    return out


def place_legend(candidates, size: tuple[float, float], avoid_px, weights=None) -> LegendBox:
    """The first of the candidate boxes' top-left corners that covers the least of the points
    ``avoid_px`` (weighted), so that a legend hides as little as it can; ties go to the earlier."""
    w, h = size
    avoid = np.asarray(avoid_px, dtype=float).reshape(-1, 2)
    wt = np.ones(len(avoid)) if weights is None else np.asarray(weights, dtype=float)
    best, best_cost = None, None
    for x, y in candidates:
        b = LegendBox(float(x), float(y), w, h)
        cost = float(wt[b.covers(avoid)].sum()) if len(avoid) else 0.0
        if best is None or cost < best_cost - 1e-9:
            best, best_cost = b, cost
    return best


# --- the figure ------------------------------------------------------------------------------

class Figure:
    """An SVG document being built: defs (clip paths, each with its own numbered id) and the
    drawing, in order. ``copy`` starts a new figure from a cached frame."""

    def __init__(self, width: float, height: float, background: str = "#ffffff"):
        self.width, self.height, self.background = float(width), float(height), background
        self.defs: list[str] = []
        self.body: list[str] = []
        self._ids = 0

    def copy(self) -> Figure:
        f = Figure(self.width, self.height, self.background)
        f.defs, f.body, f._ids = list(self.defs), list(self.body), self._ids
        return f

    def add(self, *parts: str) -> None:
        self.body.extend(p for p in parts if p)

    def _clip(self, inner: str) -> str:
        self._ids += 1
        cid = f"clip{self._ids}"
        self.defs.append(f'<clipPath id="{cid}">{inner}</clipPath>\n')
        return cid

    def clip_rect(self, ax: Axes) -> str:
        """The id of a new clip path the size of the axes' box."""
        return self._clip(f'<rect x="{num(ax.left)}" y="{num(ax.top)}" width="{num(ax.width)}"'
                          f' height="{num(ax.height)}"/>')

    def clip_path(self, px) -> str:
        """The id of a new clip path: the closed outline through pixel points."""
        return self._clip(f'<path d="{path_d(px, closed=True)}"/>')

    def to_svg(self, title: str = "", desc: str = "") -> str:
        w, h = num(self.width), num(self.height)
        head = [
            '<?xml version="1.0" encoding="utf-8"?>\n',
            f'<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" version="1.1"'
            f' width="{w}pt" height="{h}pt" viewBox="0 0 {w} {h}"'
            + (' role="img" aria-labelledby="fig-title fig-desc">\n' if title or desc else ">\n"),
        ]
        if title or desc:
            head.append(f' <title id="fig-title">{esc(title)}</title>\n <desc id="fig-desc">{esc(desc)}</desc>\n')
        if self.defs:
            head += ["<defs>\n", *self.defs, "</defs>\n"]
        head.append(f'<rect width="{w}" height="{h}" fill="{self.background}"/>\n')
        head.append(f'<g font-family="{FONT_FAMILY}" stroke-linejoin="round" stroke-linecap="butt">\n')
        return "".join(head + self.body) + "</g>\n</svg>\n"
