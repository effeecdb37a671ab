"""Measurement records: one row per (unit, channel, point), columns as arrays.

Every reader (CSV, CGATS.17, inline YAML units) produces ``Records``; grouping them into
units happens once, in ``generator/spec/units.py``.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np


class ReadError(Exception):
    """Bad input in a measurement file: where, which field, what was expected."""

    def __init__(self, file: str, line: int, col: int, field: str, message: str, hint: str = ""):
        super().__init__(f"{file}:{line}:{col}: {field}: {message}")
        self.file, self.line, self.col, self.field, self.message, self.hint = file, line, col, field, message, hint


@dataclass
class Records:
    """Columns of equal length; ``x, y, Y`` are floats (Y NaN when not measured)."""
    file: str
    serial: list[str] = field(default_factory=list)
    lot: list[str] = field(default_factory=list)
    supplier: list[str] = field(default_factory=list)
    channel: list[str] = field(default_factory=list)
    point: list[str] = field(default_factory=list)
    x: np.ndarray = field(default_factory=lambda: np.zeros(0))
    y: np.ndarray = field(default_factory=lambda: np.zeros(0))
    Y: np.ndarray = field(default_factory=lambda: np.zeros(0))
    line: np.ndarray = field(default_factory=lambda: np.zeros(0, dtype=np.int64))

    def __len__(self) -> int:
        return len(self.serial)


def to_float(values: list[str], file: str, lines, col_names, field_name: str) -> np.ndarray:
    """Text cells to floats; the first cell that is no finite number is reported by line."""
    try:
        a = np.array(values, dtype=float)
    except ValueError:
        a = None
    if a is not None and np.all(np.isfinite(a)):
        return a
    for i, v in enumerate(values):
        try:
            f = float(v)
        except ValueError:
            f = float("nan")
        if not np.isfinite(f):
            raise ReadError(file, int(lines[i]), col_names(i), field_name,
                            f"expected a finite number, found {v!r}")
    raise AssertionError("unreachable")  # pragma: no cover


def xyz_to_xyY(X, Y, Z):
    """CIE 15:2004 §7.3: x = X / (X + Y + Z), y = Y / (X + Y + Z)."""
    s = X + Y + Z
    with np.errstate(divide="ignore", invalid="ignore"):
        return X / s, Y / s, Y


def concat(parts: list[Records], file: str = "") -> Records:
    r = Records(file)
    for p in parts:
        r.serial += p.serial
        r.lot += p.lot
        r.supplier += p.supplier
        r.channel += p.channel
        r.point += p.point
    if parts:
        r.x = np.concatenate([p.x for p in parts])
        r.y = np.concatenate([p.y for p in parts])
        r.Y = np.concatenate([p.Y for p in parts])
        r.line = np.concatenate([p.line for p in parts])
    return r
