"""Spectra CSV files: a strict, documented format.

    # comment lines start with '#', anywhere
    wavelength,red,green,blue
    380,0.0012,0.0003,0.0150
    385,...

The first line that is not a comment is the header: `wavelength` (nm) then one name per
channel. Every other line holds one number per column; wavelengths strictly increase.
"""
from __future__ import annotations

import csv
import io
import math
import re
from dataclasses import dataclass

_NUMBER = re.compile(r"^[-+]?(\.[0-9]+|[0-9]+(\.[0-9]*)?)([eE][-+]?[0-9]+)?$")


@dataclass(frozen=True)
class SpectraTable:
    wavelengths: tuple[float, ...]
    channels: dict[str, tuple[float, ...]]


class SpectraFileError(ValueError):
    def __init__(self, line: int, col: int, message: str):
        super().__init__(message)
        self.line, self.col, self.message = line, col, message


def parse_spectra_csv(text: str) -> SpectraTable:
    """The table of a spectra CSV file, or SpectraFileError with its line and column."""
    header = None
    rows: list[tuple[int, list[str]]] = []
    for n, raw in enumerate(io.StringIO(text), start=1):
        line = raw.strip()
        if not line or line.startswith("#"):
            continue
        cells = next(csv.reader([line]))
        if header is None:
            header = (n, [c.strip() for c in cells])
            continue
        rows.append((n, cells))
    if header is None:
        raise SpectraFileError(1, 1, "expected a header 'wavelength,<channel>,...', found no lines")
    hn, names = header
    if names[0] != "wavelength":
        raise SpectraFileError(hn, 1, f"expected the first column to be 'wavelength' (nm), found '{names[0]}'")
    if len(names) < 2 or any(not c for c in names[1:]):
        raise SpectraFileError(hn, 1, "expected one named column per channel after 'wavelength', found "
                               f"{', '.join(repr(c) for c in names[1:]) or 'none'}")
    if len(set(names)) != len(names):
        raise SpectraFileError(hn, 1, "expected every column name once, found a repeated name")
    if len(rows) < 3:
        raise SpectraFileError(hn, 1, f"expected three or more rows of data, found {len(rows)}")
    table: list[list[float]] = []
    for n, cells in rows:
        if len(cells) != len(names):
            raise SpectraFileError(n, 1, f"expected {len(names)} values, found {len(cells)}")
        vals = []
        col = 1
        for c in cells:
            t = c.strip()
            if not _NUMBER.match(t) or not math.isfinite(float(t)):
                raise SpectraFileError(n, col, f"expected a number, found '{t}'")
            vals.append(float(t))
            col += len(c) + 1
        table.append(vals)
    wl = [r[0] for r in table]
    for (n, _), a, b in zip(rows[1:], wl, wl[1:], strict=False):
        if b <= a:
            raise SpectraFileError(n, 1, f"expected wavelengths that increase, found {b:g} after {a:g}")
    return SpectraTable(tuple(wl), {name: tuple(r[i] for r in table) for i, name in enumerate(names) if i > 0})
