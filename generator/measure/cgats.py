"""CGATS.17 exchange files (ANSI CGATS.17, "Graphic technology - Exchange format for
colour and process control data using XML or ASCII text", ASCII part), written here from
the published description of the format.

A file holds one or more tables. Each table is: a file identifier line (e.g. CGATS.17),
header lines ``KEYWORD value`` (strings in double quotes; ``KEYWORD "NAME"`` declares a
non-standard keyword or field name), ``NUMBER_OF_FIELDS n``, a ``BEGIN_DATA_FORMAT`` /
``END_DATA_FORMAT`` block of field names, ``NUMBER_OF_SETS m`` and a ``BEGIN_DATA`` /
``END_DATA`` block of m sets of n values. '#' starts a comment outside quotes; a doubled
quote inside a string stands for one quote.

For colourspec, a table's rows are units: ``SAMPLE_ID`` (else ``SERIAL``, else
``SAMPLE_NAME``) is the serial,
``XYZ_X XYZ_Y XYZ_Z`` or ``XYY_X XYY_Y [XYY_CAPY]`` the colour; ``LOT``, ``SUPPLIER``,
``CHANNEL`` and ``POINT`` may be fields, or header keywords that hold for the whole table
(declaring them with KEYWORD is allowed, not required).
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .records import ReadError, Records, to_float, xyz_to_xyY

# Header keywords and data field names the format defines (the subset used here);
# anything else must first be declared with KEYWORD "NAME".
STANDARD_KEYWORDS = {
    "ORIGINATOR", "FILE_DESCRIPTOR", "DESCRIPTOR", "CREATED", "MANUFACTURER", "MANUFACTURE", "PROD_DATE",
    "SERIAL", "MATERIAL", "INSTRUMENTATION", "MEASUREMENT_SOURCE", "MEASUREMENT_GEOMETRY", "PRINT_CONDITIONS",
    "FILTER", "POLARIZATION", "WEIGHTING_FUNCTION", "COMP", "TARGET_TYPE", "COLORANT", "PROCESSCOLOR_ID",
    "KEYWORD", "NUMBER_OF_FIELDS", "NUMBER_OF_SETS",
}
STANDARD_FIELDS = {
    "SAMPLE_ID", "SAMPLE_NAME", "STRING", "XYZ_X", "XYZ_Y", "XYZ_Z", "XYY_X", "XYY_Y", "XYY_CAPY",
    "LAB_L", "LAB_A", "LAB_B", "LAB_C", "LAB_H", "LAB_DE", "RGB_R", "RGB_G", "RGB_B",
}
# The names colourspec reads, as fields or as table-wide header keywords; being documented
# here they are accepted with or without a KEYWORD declaration.
TABLE_KEYWORDS = ("LOT", "SUPPLIER", "CHANNEL", "POINT")


@dataclass
class Table:
    file: str
    line: int                                  # line of the table's first line
    identifier: str
    header: dict[str, tuple[str, int]] = field(default_factory=dict)   # keyword -> (value, line)
    fields: list[str] = field(default_factory=list)
    sets: list[list[str]] = field(default_factory=list)
    set_lines: list[int] = field(default_factory=list)


def tokens(line: str, file: str, lineno: int) -> list[tuple[str, int, bool]]:
    """Split a line into (text, column, quoted); '#' outside quotes ends the line."""
    if '"' not in line and "#" not in line:
        out, col = [], 0
        for t in line.split():
            col = line.index(t, col)
            out.append((t, col + 1, False))
            col += len(t)
        return out
    out = []
    i, n = 0, len(line)
    while i < n:
        c = line[i]
        if c in " \t\r\n":
            i += 1
        elif c == "#":
            break
        elif c == '"':
            start, i, buf = i, i + 1, []
            while True:
                if i >= n:
                    raise ReadError(file, lineno, start + 1, "string", "expected a closing quote, found the end of the line",
                                    "strings are in double quotes on one line; a quote inside is written twice")
                if line[i] == '"':
                    if i + 1 < n and line[i + 1] == '"':
                        buf.append('"')
                        i += 2
                        continue
                    i += 1
                    break
                buf.append(line[i])
                i += 1
            out.append(("".join(buf), start + 1, True))
        else:
            start = i
            while i < n and line[i] not in " \t\r\n#":
                i += 1
            out.append((line[start:i], start + 1, False))
    return out


def _count(value: str, file: str, line: int, col: int, key: str) -> int:
    if not value.isdigit():
        raise ReadError(file, line, col, key, f"expected a whole number, found {value!r}")
    return int(value)


def parse_tables(text: str, file: str) -> list[Table]:
    """Every table of a CGATS.17 file, with counts and field names checked."""
    tables: list[Table] = []
    declared: set[str] = set()
    t: Table | None = None
    state = "start"          # start | header | format | data | done
    nfields = nsets = None
    nfields_line = nsets_line = 0
    lines = text.splitlines()
    for lineno, raw in enumerate(lines, 1):
        if state == "data" and '"' not in raw and "#" not in raw:     # the common case, kept fast
            vals = raw.split()
            if not vals:
                continue
            if vals[0] != "END_DATA":
                if len(vals) != len(t.fields):
                    raise ReadError(file, lineno, 1, "set",
                                    f"expected {len(t.fields)} values (NUMBER_OF_FIELDS), found {len(vals)}")
                t.sets.append(vals)
                t.set_lines.append(lineno)
                continue
        toks = tokens(raw, file, lineno)
        if not toks:
            continue
        word, col, quoted = toks[0]
        if state in ("start", "done"):
            if state == "done" and word in ("BEGIN_DATA", "BEGIN_DATA_FORMAT", "END_DATA", "END_DATA_FORMAT"):
                raise ReadError(file, lineno, col, word, f"expected a new table's identifier line, found {word}",
                                "each table starts with an identifier such as CGATS.17 and its own header")
            t = Table(file, lineno, word)
            tables.append(t)
            declared = set()
            nfields = nsets = None
            state = "header"
            if len(toks) > 1:
                raise ReadError(file, lineno, toks[1][1], "identifier",
                                f"expected the identifier alone on its line, found {toks[1][0]!r} after it")
            continue
        if state == "header":
            if word == "BEGIN_DATA_FORMAT":
                state = "format"
                continue
            if word == "BEGIN_DATA":
                if not t.fields:
                    raise ReadError(file, lineno, col, "BEGIN_DATA",
                                    "expected BEGIN_DATA_FORMAT before BEGIN_DATA, found none")
                if nsets is None:
                    raise ReadError(file, lineno, col, "NUMBER_OF_SETS", "expected NUMBER_OF_SETS before BEGIN_DATA")
                state = "data"
                continue
            if quoted:
                raise ReadError(file, lineno, col, "keyword", f"expected a keyword, found the string {word!r}")
            if word not in STANDARD_KEYWORDS and word not in TABLE_KEYWORDS and word not in declared:
                raise ReadError(file, lineno, col, word, f"expected a standard or declared keyword, found {word!r}",
                                f'declare it first with KEYWORD "{word}"')
            value = " ".join(v for v, _, _ in toks[1:])
            if word == "KEYWORD":
                if len(toks) != 2:
                    raise ReadError(file, lineno, col, "KEYWORD", "expected one quoted name after KEYWORD")
                declared.add(toks[1][0])
                continue
            if word == "NUMBER_OF_FIELDS":
                nfields, nfields_line = _count(value, file, lineno, toks[1][1] if len(toks) > 1 else col, word), lineno
            elif word == "NUMBER_OF_SETS":
                nsets, nsets_line = _count(value, file, lineno, toks[1][1] if len(toks) > 1 else col, word), lineno
            t.header[word] = (value, lineno)
            continue
        if state == "format":
            if word == "END_DATA_FORMAT":
                if nfields is None:
                    raise ReadError(file, lineno, col, "NUMBER_OF_FIELDS", "expected NUMBER_OF_FIELDS in the header, found none")
                if len(t.fields) != nfields:
                    raise ReadError(file, lineno, col, "NUMBER_OF_FIELDS",
                                    f"expected {nfields} field names (NUMBER_OF_FIELDS, line {nfields_line}), "
                                    f"found {len(t.fields)}")
                state = "header"
                continue
            for name, c, _ in toks:
                if name not in STANDARD_FIELDS and name not in TABLE_KEYWORDS and name not in declared:
                    raise ReadError(file, lineno, c, name, f"expected a standard or declared field name, found {name!r}",
                                    f'declare it in the header with KEYWORD "{name}"')
                if name in t.fields:
                    raise ReadError(file, lineno, c, name, "expected each field once, found it again")
                t.fields.append(name)
            continue
        if state == "data":
            if word == "END_DATA":
                if len(t.sets) != nsets:
                    raise ReadError(file, lineno, col, "NUMBER_OF_SETS",
                                    f"expected {nsets} sets (NUMBER_OF_SETS, line {nsets_line}), found {len(t.sets)}")
                state = "done"
                continue
            if len(toks) != len(t.fields):
                raise ReadError(file, lineno, col, "set",
                                f"expected {len(t.fields)} values (NUMBER_OF_FIELDS), found {len(toks)}")
            t.sets.append([v for v, _, _ in toks])
            t.set_lines.append(lineno)
    end = len(lines) + 1
    if state == "format":
        raise ReadError(file, end, 1, "END_DATA_FORMAT", "expected END_DATA_FORMAT, found the end of the file")
    if state == "data":
        raise ReadError(file, end, 1, "END_DATA", "expected END_DATA, found the end of the file")
    if state == "header":
        raise ReadError(file, end, 1, "BEGIN_DATA", "expected a BEGIN_DATA block, found the end of the file")
    if not tables:
        raise ReadError(file, 1, 1, "identifier", "expected a CGATS.17 table, found an empty file")
    return tables


def _records(t: Table) -> Records:
    f = {name: i for i, name in enumerate(t.fields)}
    lines = np.array(t.set_lines, dtype=np.int64)
    n = len(t.sets)

    def text(*names, default=None):
        for name in names:
            if name in f:
                i = f[name]
                return [s[i] for s in t.sets]
            if name in t.header:
                return [t.header[name][0]] * n
        if default is None:
            raise ReadError(t.file, t.line, 1, names[0],
                            f"expected a {' or '.join(names)} field or header keyword, found none")
        return [default] * n

    def num(name):
        i = f[name]
        return to_float([s[i] for s in t.sets], t.file, lines, lambda _k: 1, name)

    r = Records(t.file, text("SAMPLE_ID", "SERIAL", "SAMPLE_NAME"), text("LOT", default=""), text("SUPPLIER", default=""),
                text("CHANNEL"), text("POINT", default=""))
    if all(k in f for k in ("XYZ_X", "XYZ_Y", "XYZ_Z")):
        r.x, r.y, r.Y = xyz_to_xyY(num("XYZ_X"), num("XYZ_Y"), num("XYZ_Z"))
    elif "XYY_X" in f and "XYY_Y" in f:
        r.x, r.y = num("XYY_X"), num("XYY_Y")
        r.Y = num("XYY_CAPY") if "XYY_CAPY" in f else np.full(n, np.nan)
    else:
        raise ReadError(t.file, t.line, 1, "XYZ_X", "expected fields XYZ_X, XYZ_Y, XYZ_Z or XYY_X, XYY_Y, found neither")
    r.line = lines
    return r


def parse_cgats(text: str, file: str) -> list[Records]:
    return [_records(t) for t in parse_tables(text, file)]
