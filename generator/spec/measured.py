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
from ..model import Uncertainty, Uniformity, Unit, UnitTable
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


def measured_table(r, v: dict, node, files, units: list[Unit], unit_lines: list[int],
                   primaries: list[str], observer: str, centre: str, limits):
    """(table of every unit of the spec, measurement files as shown, sha256 of each file's
    bytes); ``files`` finds and reads them (measure.files.FolderFiles); errors and warnings
    go to the resolver ``r``."""
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
    table, errors, warnings = group(parts, ["white"] + primaries, centre, physical_check(observer, *limits))
    # an inline unit is physically checked by the resolver already; skip its duplicates here
    for e in errors:
        r.problems.error(Mark(e.file, e.line, e.col), e.field, e.message, e.hint)
        r.ok = False
    for w in warnings:
        if w.file != r.file or not inline_serials:
            r.problems.warn(Mark(w.file, w.line, w.col), w.field, w.message, w.hint)
    return table, shown_files, digests
