"""Group measurement records into units: one row per serial, one column block per channel.

Pure arrays: the records of a 100,000-unit lot are grouped with sorting, not loops.
"""
from __future__ import annotations

import numpy as np

from ..model import UnitTable
from .records import ReadError, Records

MAX_REPORTED = 5   # problems of one kind reported per spec before "and N more"


def group(parts: list[Records], channels: list[str], centre: str, check) -> tuple[UnitTable, list, list]:
    """(table, errors, warnings) from records; ``check(x, y) -> (error_mask, warn_mask, message_fn)``
    applies the physical checks."""
    errors: list[ReadError] = []
    warnings: list[ReadError] = []
    parts = [p for p in parts if len(p)]
    if not parts:
        return UnitTable([], [], [], [], {c: np.full((0, 3), np.nan) for c in channels}), errors, warnings
    files = [p.file for p in parts]
    fidx = np.concatenate([np.full(len(p), i) for i, p in enumerate(parts)])
    serial = np.array(sum((p.serial for p in parts), []), dtype=object)
    lot = np.array(sum((p.lot for p in parts), []), dtype=object)
    supplier = np.array(sum((p.supplier for p in parts), []), dtype=object)
    channel = np.array(sum((p.channel for p in parts), []), dtype=object)
    point = np.array(sum((p.point for p in parts), []), dtype=object)
    x = np.concatenate([p.x for p in parts])
    y = np.concatenate([p.y for p in parts])
    Y = np.concatenate([p.Y for p in parts])
    line = np.concatenate([p.line for p in parts])

    def report(into, idx, fld, message, hint=""):
        for k, i in enumerate(idx[:MAX_REPORTED]):
            into.append(ReadError(files[fidx[i]], int(line[i]), 1, fld, message(i), hint))
        if len(idx) > MAX_REPORTED:
            into.append(ReadError(files[fidx[idx[MAX_REPORTED]]], int(line[idx[MAX_REPORTED]]), 1, fld,
                                  f"and {len(idx) - MAX_REPORTED} more records with the same problem"))

    known = np.isin(channel.astype(str), np.array(channels, dtype=str))
    colour_channels = [c for c in channels if c.startswith("colours.")]
    prims = [c for c in channels[1:] if c not in colour_channels]
    also = f", or one of its colours ({', '.join(colour_channels)})" if colour_channels else ""
    report(errors, np.flatnonzero(~known), "channel",
           lambda i: f"expected 'white' or a primary of the spec ({', '.join(prims) or 'none'}){also}, "
                     f"found {channel[i]!r}")
    err, warn, msg = check(x, y)
    report(errors, np.flatnonzero(err & known), "x", msg)
    report(warnings, np.flatnonzero(warn & ~err & known), "x", msg,
           "taken as instrument noise or a calibration error; still assessed")

    # units in order of first appearance
    useq, first, unit_of = np.unique(serial.astype(str), return_index=True, return_inverse=True)
    order = np.argsort(first, kind="stable")
    rank = np.empty_like(order)
    rank[order] = np.arange(len(order))
    unit_of = rank[unit_of]
    first = first[order]
    n = len(first)
    for name, col in (("lot", lot), ("supplier", supplier)):
        bad = np.flatnonzero(col != col[first[unit_of]])
        report(errors, bad, name, lambda i, name=name, col=col:
               f"expected the same {name} for every record of unit {serial[i]}, found {col[i]!r} "
               f"against {col[first[unit_of[i]]]!r}")

    ch_codes = {c: k for k, c in enumerate(channels)}
    ch = np.array([ch_codes.get(c, -1) for c in channel]) if len(channel) < 64 else \
        _codes(channel.astype(str), channels)
    pnames, pcode = np.unique(point.astype(str), return_inverse=True)
    key = (unit_of.astype(np.int64) * (len(channels) + 1) + (ch + 1)) * (len(pnames) + 1) + pcode
    _, kfirst, kinv, kcount = np.unique(key, return_index=True, return_inverse=True, return_counts=True)
    dup = np.flatnonzero((kcount[kinv] > 1) & (np.arange(len(key)) != kfirst[kinv]) & known)
    report(errors, dup, "serial", lambda i: f"expected one record per unit, channel and point, found unit "
           f"{serial[i]} channel {channel[i]} point {point[i] or '(none)'} again (first at line "
           f"{line[kfirst[kinv[i]]]})")

    xyY = np.stack([x, y, Y], axis=-1)
    is_main = (point == "") | (point == centre)
    out = {}
    for c, k in ch_codes.items():
        a = np.full((n, 3), np.nan)
        sel = (ch == k) & is_main
        a[unit_of[sel]] = xyY[sel]
        out[c] = a
    pts = None
    names: tuple = ()
    wsel = (ch == 0) & (point != "")
    if np.any(wsel):
        names = tuple(str(p) for p in pnames if p != "")
        pos = {p: i for i, p in enumerate(names)}
        pts = np.full((n, len(names), 3), np.nan)
        col = np.array([pos[p] for p in point[wsel]])
        pts[unit_of[wsel], col] = xyY[wsel]
        missing = np.flatnonzero(np.any(np.isfinite(pts[:, :, 0]), axis=1) & ~np.isfinite(out["white"][:, 0]))
        report(errors, first[missing], "point",
               lambda i: f"expected a white measurement at the centre point {centre!r} of unit {serial[i]}, "
                         "found only other points", "name the centre point as uniformity.centre says")
    source = [f"{files[fidx[i]]}:{line[i]}" for i in first]
    table = UnitTable([str(s) for s in serial[first]], [str(s) for s in lot[first]],
                      [str(s) for s in supplier[first]], source, out, pts, names)
    return table, errors, warnings


def _codes(values: np.ndarray, channels: list[str]) -> np.ndarray:
    codes = np.full(len(values), -1)
    for k, c in enumerate(channels):
        codes[values == c] = k
    return codes
