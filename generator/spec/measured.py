"""Resolve the measured side of a spec: inline units and measurement files into one
UnitTable, plus the decision rule, uncertainties and uniformity limits."""
from __future__ import annotations

import hashlib
from pathlib import Path

import numpy as np

from ..colour.wavelength import locus_boundary, outside_locus_distance
from ..measure.files import PathRefused, read
from ..measure.records import ReadError, Records
from ..measure.units import group
from ..measure.csvfile import COLOUR_CHANNEL
from ..model import Measurement, Uncertainty, Uniformity, Unit, UnitTable
from .yamlnodes import Mark


def uncertainty_of(v: dict) -> Uncertainty | None:
    u = v.get("uncertainty")
    if not u:
        return None
    return Uncertainty(tuple((q, w.get("absolute"), w.get("relative")) for q, w in u.items()))


def uniformity_of(v: dict) -> Uniformity | None:
    u = v.get("uniformity")
    if u is None:
        return None
    return Uniformity(u.get("centre", "C"), (u.get("luminance") or {}).get("min"),
                      (u.get("colour") or {}).get("max"), (u.get("colour") or {}).get("between", "pairs"))


def inline_records(file: str, units: list[Unit], lines: list[int]) -> Records:
    r = Records(file)
    xs, ys, Ys, ls = [], [], [], []
    for u, line in zip(units, lines):
        chans = ([("white", u.white)] if u.white is not None else []) + list(u.primaries.items())
        for name, m in chans:
            r.serial.append(u.serial)
            r.lot.append(u.lot)
            r.supplier.append(u.supplier)
            r.channel.append(name)
            r.point.append("")
            xs.append(m.xy[0])
            ys.append(m.xy[1])
            Ys.append(np.nan if m.Y is None else m.Y)
            ls.append(line)
    r.x, r.y, r.Y, r.line = np.array(xs, float), np.array(ys, float), np.array(Ys, float), np.array(ls, np.int64)
    return r


def _surely_inside(xy, poly):
    """True where a point is strictly inside the convex counter-clockwise polygon ``poly``."""
    a, b = poly, np.roll(poly, -1, axis=0)
    out = np.zeros(len(xy), bool)
    for s in range(0, len(xy), 8192):
        p = xy[s:s + 8192]
        cross = ((b - a)[None, :, 0] * (p[:, None, 1] - a[None, :, 1])
                 - (b - a)[None, :, 1] * (p[:, None, 0] - a[None, :, 0]))
        out[s:s + 8192] = np.all(cross > 1e-12, axis=1)
    return out


def locus_distance(xy, observer: str):
    """``outside_locus_distance`` for many points. The locus hull is convex, so a point
    strictly inside a polygon on some of its corners, or strictly inside the hull itself,
    is inside; only the rest are measured exactly."""
    hull, _, _ = locus_boundary(observer)
    inner = hull[np.unique(np.linspace(0, len(hull) - 1, 24).astype(int))]
    d = np.zeros(len(xy))
    rest = np.flatnonzero(~_surely_inside(xy, inner))
    rest = rest[~_surely_inside(xy[rest], hull)]
    if rest.size:
        d[rest] = outside_locus_distance(xy[rest], observer)
    return d


def physical_check(observer: str, locus_tolerance: float, measured_limit: float):
    def check(x, y):
        s = x + y
        d = locus_distance(np.stack([x, y], axis=-1), observer) if len(x) else np.zeros(0)
        err = (s > 1 + 1e-12) | (d > measured_limit) | (x < 0) | (y < 0)
        warn = d > locus_tolerance

        def msg(i):
            if s[i] > 1 + 1e-12:
                return f"expected x + y <= 1, found x + y = {s[i]:.4f}"
            return (f"expected a measured chromaticity within the spectral locus, found ({x[i]:.4f}, "
                    f"{y[i]:.4f}), {d[i]:.4f} outside it")
        return err, warn, msg
    return check


def _colour_records(r, parts: list[Records], colours) -> dict:
    """Check the records of the spec's colours (channel ``colours.NAME``) in measurement files:
    one measurement per unit (no grid points), and a luminance factor Y where the colour has a
    ΔE limit. Returns (serial, colour name) -> (file, line) of each record."""
    needs_Y = {COLOUR_CHANNEL + c.name: c.tolerance.delta_e2000 is not None or c.tolerance.delta_e76 is not None
               for c in colours}
    where: dict = {}
    if not needs_Y:
        return where
    for p in parts:
        ks = [k for k, ch in enumerate(p.channel) if ch.startswith(COLOUR_CHANNEL)]
        for k in ks:
            ch = p.channel[k]
            if ch not in needs_Y:   # an unknown colour: reported with the unknown channels
                continue
            line = int(p.line[k])
            if p.point[k]:
                r.problems.error(Mark(p.file, line, 1), "point", f"expected no point for a {ch} record, found "
                                 f"{p.point[k]!r}", "a colour is measured once per unit; points are for the white")
                r.ok = False
            elif needs_Y[ch] and not np.isfinite(p.Y[k]):
                r.problems.error(Mark(p.file, line, 1), "Y", f"expected a luminance factor Y for {ch}, which has "
                                 "a ΔE limit, found none", "give Y with the reference white at Y = 100 (beside a "
                                 "spectrum too: a spectrum's own luminance is not a luminance factor)")
                r.ok = False
            where[(p.serial[k], ch[len(COLOUR_CHANNEL):])] = (p.file, line)
    return where


def file_colours(r, table: UnitTable, colours, where: dict, observer: str, inline: dict) -> dict:
    """The measured colours of the file records, taken out of ``table.channels`` into serial ->
    colour name -> Measurement, merged with the ``inline`` ones (units[].colours); a colour
    measured both inline and in a file is an error at the file's record."""
    out = {s: dict(cs) for s, cs in inline.items()}
    for c in colours:
        a = table.channels.pop(COLOUR_CHANNEL + c.name, None)
        if a is None:
            continue
        rows = np.flatnonzero(np.isfinite(a[:, 0]))
        if not rows.size:
            continue
        d = locus_distance(a[rows, :2], observer)
        for i, dist in zip(rows.tolist(), d.tolist()):
            serial = table.serial[i]
            if c.name in out.get(serial, {}):
                f, line = where.get((serial, c.name), (r.file, 1))
                r.problems.error(Mark(f, line, 1), "channel", f"expected one measurement of {c.name} for unit "
                                 f"{serial}, found one in this file and one under units", "give each measurement once")
                r.ok = False
                continue
            Y = float(a[i, 2]) if np.isfinite(a[i, 2]) else None
            out.setdefault(serial, {})[c.name] = Measurement((float(a[i, 0]), float(a[i, 1])), Y, float(dist))
    return out


def measured_table(r, v: dict, node, files, units: list[Unit], unit_lines: list[int],
                   primaries: list[str], observer: str, centre: str, limits, colours=()):
    """(table of every unit of the spec, measurement files as shown, sha256 of each file's
    bytes, the measured colours serial -> name -> Measurement, inline and from files);
    ``files`` finds and reads them (measure.files.FolderFiles); errors and warnings go to the
    resolver ``r``."""
    parts = [inline_records(r.file, units, unit_lines)] if units else []
    inline_serials = {u.serial for u in units}
    shown_files, digests = [], []
    for i, written in enumerate(v.get("measurements", [])):
        from .resolve import mark_at

        mark = mark_at(node, ["measurements", i])
        try:
            path = files.find(written, mark.file)
        except PathRefused as e:
            r.error(["measurements", i], e.message, e.hint)
            continue
        shown = (Path(mark.file).parent / written).as_posix()
        try:
            data = files.read_bytes(path)
        except OSError as e:
            r.error(["measurements", i], f"cannot read the file: {e.strerror or e}")
            continue
        try:
            recs = read(path, shown, observer, data)
        except ReadError as e:
            r.problems.error(Mark(e.file, e.line, e.col), e.field, e.message, e.hint)
            r.ok = False
            continue
        parts += recs
        shown_files.append(shown)
        digests.append(hashlib.sha256(data).hexdigest())
    where = _colour_records(r, parts, colours)
    channels = ["white"] + primaries + [COLOUR_CHANNEL + c.name for c in colours]
    table, errors, warnings = group(parts, channels, centre, physical_check(observer, *limits))
    # an inline unit is physically checked by the resolver already; skip its duplicates here
    for e in errors:
        r.problems.error(Mark(e.file, e.line, e.col), e.field, e.message, e.hint)
        r.ok = False
    for w in warnings:
        if w.file != r.file or not inline_serials:
            r.problems.warn(Mark(w.file, w.line, w.col), w.field, w.message, w.hint)
    inline = {u.serial: u.colours for u in units if u.colours}
    return table, shown_files, digests, file_colours(r, table, colours, where, observer, inline)
