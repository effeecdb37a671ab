"""Measurement CSV files (RFC 4180 quoting, UTF-8).

The first non-comment line names the columns; lines starting with '#' are comments.

| column | required | meaning |
|---|---|---|
| serial | yes | the unit's serial number |
| channel | yes | `white`, the name of one of the spec's primaries, or `colours.NAME` for one of its colours |
| lot, supplier | no | the unit's production lot and who made it |
| point | no | measurement point on the unit (for uniformity, e.g. 1-9 of a 3 x 3 grid) |
| x, y, Y | one of the two | CIE 1931 chromaticity and luminance Y in cd/m² (Y optional; an empty Y cell: not measured) |
| X, Y, Z | | CIE tristimulus values, Y in cd/m² |
| 380, 385, ... | | a spectrum: spectral radiance, W·sr⁻¹·m⁻²·nm⁻¹, at each wavelength in nm |

For a colour record (``colours.NAME``) Y is the luminance factor (reference white Y = 100).
With wavelength columns a ``Y`` column may give it; its cell must be empty on white and
primary records, whose luminance is the spectrum's.

Column names are matched without regard to case, except x/X, y/Y and z/Z.
"""
from __future__ import annotations

import csv
import io

import numpy as np

from .records import ReadError, Records, to_float, xyz_to_xyY

TEXT_COLUMNS = ("serial", "lot", "supplier", "channel", "point")
COLOUR_CHANNEL = "colours."     # a channel "colours.NAME" is a measurement of the spec's colour NAME
NUMBER_COLUMNS = ("x", "y", "Y", "X", "Z")


def _wavelength(name: str) -> float | None:
    try:
        v = float(name)
    except ValueError:
        return None
    return v if 360.0 <= v <= 830.0 else None


def _header(cells: list[str], file: str, line: int) -> dict[str, int]:
    cols: dict[str, int] = {}
    spectral: list[tuple[float, int]] = []
    for i, c in enumerate(cells):
        name = c.strip()
        if _wavelength(name) is not None:
            if spectral and _wavelength(name) <= spectral[-1][0]:
                raise ReadError(file, line, i + 1, name, "expected wavelengths in increasing order, found "
                                f"{name} after {spectral[-1][0]:g}")
            spectral.append((_wavelength(name), i))
            continue
        key = name if name in NUMBER_COLUMNS else name.lower()
        if key not in TEXT_COLUMNS and key not in NUMBER_COLUMNS:
            raise ReadError(file, line, i + 1, name or f"column {i + 1}",
                            f"expected a column name ({', '.join(TEXT_COLUMNS + NUMBER_COLUMNS)}), "
                            f"found {name!r}", "see the CSV columns in docs/spec-keys.md")
        if key in cols:
            raise ReadError(file, line, i + 1, name, "expected each column once, found it again")
        cols[key] = i
    for need in ("serial", "channel"):
        if need not in cols:
            raise ReadError(file, line, 1, need, f"expected a '{need}' column, found none",
                            "the header needs serial, channel and x, y (Y) or X, Y, Z")
    has_xy, has_xz = "x" in cols or "y" in cols, "X" in cols or "Z" in cols
    if spectral:   # a Y column beside a spectrum holds the luminance factor of colour records
        if has_xy or has_xz:
            raise ReadError(file, line, 1, "x", "expected colour columns or wavelength columns, found both")
        if len(spectral) < 3:
            raise ReadError(file, line, spectral[0][1] + 1, "wavelength", "expected three or more wavelength columns")
        cols["spectrum"] = spectral     # type: ignore[assignment]
        return cols
    if has_xy and has_xz:
        raise ReadError(file, line, 1, "x", "expected x, y, Y or X, Y, Z, found both")
    if has_xz and not all(k in cols for k in ("X", "Y", "Z")):
        raise ReadError(file, line, 1, "X", "expected all of X, Y, Z")
    if not has_xz and not ("x" in cols and "y" in cols):
        raise ReadError(file, line, 1, "x", "expected columns x and y (and Y), or X, Y and Z, found neither")
    return cols


def _optional(rows, i, file, lines):
    """The luminance column of the x, y, Y form: an empty cell means not measured (NaN)."""
    cells = [r[i].strip() for r in rows]
    filled = [k for k, c in enumerate(cells) if c]
    out = np.full(len(cells), np.nan)
    if filled:
        out[filled] = to_float([cells[k] for k in filled], file, lines[filled], lambda _k: i + 1, "Y")
    return out


def _collect(numbered_rows, file: str):
    """Header and data rows from (line, cells) pairs; blank and '#' lines are skipped."""
    cols, width, rows, lines = None, 0, [], []
    for line, cells in numbered_rows:
        if not cells or (len(cells) == 1 and not cells[0].strip()) or cells[0].lstrip().startswith("#"):
            continue
        if cols is None:
            cols, width = _header(cells, file, line), len(cells)
            continue
        if len(cells) != width:
            raise ReadError(file, line, 1, "row", f"expected {width} cells as in the header, found {len(cells)}")
        rows.append(cells)
        lines.append(line)
    return cols, width, rows, lines


def _read_quoted(text: str, file: str):
    reader = csv.reader(io.StringIO(text, newline=""), strict=True)
    try:
        return _collect(((reader.line_num, cells) for cells in reader), file)
    except csv.Error as e:
        raise ReadError(file, reader.line_num, 1, "row", f"expected well-formed CSV, found {e}",
                        "a quoted cell must end with a closing quote") from None


def spectra_to_XYZ(wl, S, observer: str):
    """XYZ (Y in cd/m²) of spectral radiance S (n, k) in W·sr⁻¹·m⁻²·nm⁻¹ sampled at ``wl`` (k,) nm.

    The same method as every other spectrum of a spec (generator.colour.spectrum): CIE 167
    resampling to 1 nm, CIE 15:2004 eq. 7.1 summed at 1 nm, K_m = 683.002 lm/W.
    """
    from ..colour.spectral import K_M
    from ..colour.spectrum import resample_to_1nm, spectrum_XYZ

    r = resample_to_1nm(wl, S)
    # negative spectral power (noise, interpolation ringing beside narrow peaks) counts as 0,
    # as for the spectra of a spec (spec.resolve)
    return K_M * spectrum_XYZ(r.wavelengths, np.clip(r.values, 0.0, None), observer)


def parse_csv(text: str, file: str, observer: str = "cie1931-2") -> Records:
    """Read one measurement CSV; raise ReadError naming file, line and column."""
    if '"' in text:
        cols, width, rows, lines = _read_quoted(text, file)
    else:   # no quoting anywhere: plain splitting gives the same cells, much faster
        cols, width, rows, lines = _collect(((n, raw.split(",")) for n, raw in
                                             enumerate(text.splitlines(), 1)), file)
    if cols is None:
        raise ReadError(file, 1, 1, "header", "expected a header line naming the columns, found none")
    line_arr = np.array(lines, dtype=np.int64)

    def text(name, default=""):
        i = cols.get(name)
        if i is None:
            return [default] * len(rows)
        return [r[i].strip() for r in rows]

    def num(name):
        i = cols[name]
        return to_float([r[i].strip() for r in rows], file, line_arr, lambda _k: i + 1, name)

    r = Records(file, text("serial"), text("lot"), text("supplier"), text("channel"), text("point"))
    for i, s in enumerate(r.serial):
        if not s:
            raise ReadError(file, lines[i], cols["serial"] + 1, "serial", "expected a serial, found an empty cell")
    for i, c in enumerate(r.channel):
        if not c:
            raise ReadError(file, lines[i], cols["channel"] + 1, "channel", "expected a channel, found an empty cell")
    if "spectrum" in cols:
        wl = np.array([w for w, _ in cols["spectrum"]])
        S = np.stack([to_float([r_[i].strip() for r_ in rows], file, line_arr, lambda _k, i=i: i + 1, f"{w:g} nm")
                      for w, i in cols["spectrum"]], axis=-1) if rows else np.zeros((0, wl.size))
        if wl.size < 3 or np.any(np.diff(wl) <= 0):
            raise ReadError(file, 1, 1, "header", f"expected three or more increasing wavelength columns, found "
                            f"{', '.join(f'{w:g}' for w in wl)}", "list the wavelengths in nm, in increasing order")
        r.x, r.y, r.Y = xyz_to_xyY(*spectra_to_XYZ(wl, S, observer).T)
        colour = np.array([c.startswith(COLOUR_CHANNEL) for c in r.channel], bool)
        if "Y" in cols:
            factor = _optional(rows, cols["Y"], file, line_arr)
            bad = np.flatnonzero(~colour & np.isfinite(factor))
            if bad.size:
                i = int(bad[0])
                raise ReadError(file, lines[i], cols["Y"] + 1, "Y", f"expected an empty Y for a {r.channel[i]} "
                                f"spectrum, found {rows[i][cols['Y']].strip()!r}",
                                "a spectrum gives its own luminance; Y beside a spectrum is the luminance "
                                "factor of a colours.NAME record")
        else:
            factor = np.full(len(rows), np.nan)
        # a colour's Y is its luminance factor (reference white Y = 100), never the spectrum's cd/m²
        r.Y = np.where(colour, factor, r.Y)
    elif "X" in cols:
        r.x, r.y, r.Y = xyz_to_xyY(num("X"), num("Y"), num("Z"))
    else:
        r.x, r.y = num("x"), num("y")
        r.Y = _optional(rows, cols["Y"], file, line_arr) if "Y" in cols else np.full(len(rows), np.nan)
    r.line = line_arr
    return r
