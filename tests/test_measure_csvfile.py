"""Measurement CSV reader: columns, forms, comments and every malformed case."""
from __future__ import annotations

import numpy as np
import pytest

from generator.measure.csvfile import parse_csv
from generator.measure.records import ReadError

GOOD = """# station 3
serial,lot,supplier,channel,point,x,y,Y
S1,L1,"Tessaly Panel Works, plant 2",white,C,0.3127,0.3290,250.5

S1,L1,"Tessaly Panel Works, plant 2",red,,0.64,0.33,50
"""


def test_xyY_rows_with_quoted_cells_comments_and_blank_lines():
    r = parse_csv(GOOD, "m.csv")
    assert r.serial == ["S1", "S1"] and r.channel == ["white", "red"] and r.point == ["C", ""]
    assert r.supplier[0] == "Tessaly Panel Works, plant 2"
    assert list(r.x) == [0.3127, 0.64] and list(r.Y) == [250.5, 50.0]
    assert list(r.line) == [3, 5]


def test_XYZ_columns_give_chromaticity_and_luminance():
    r = parse_csv("serial,channel,X,Y,Z\nS1,white,95.047,100,108.883\n", "m.csv")
    s = 95.047 + 100 + 108.883
    assert r.x[0] == pytest.approx(95.047 / s) and r.y[0] == pytest.approx(100 / s) and r.Y[0] == 100
    assert r.lot == [""]


def test_without_Y_the_luminance_is_nan():
    r = parse_csv("Serial,Channel,x,y\nS1,white,0.31,0.33\n", "m.csv")
    assert np.isnan(r.Y[0])


@pytest.mark.parametrize("text,line,col,field,words", [
    ("serial,channel,x,y,colour\nS1,white,0.3,0.3,red\n", 1, 5, "colour", "expected a column name"),
    ("serial,x,y\nS1,0.3,0.3\n", 1, 1, "channel", "'channel' column"),
    ("serial,channel,x\nS1,white,0.3\n", 1, 1, "x", "x and y"),
    ("serial,channel,x,y,X,Y,Z\n", 1, 1, "x", "found both"),
    ("serial,channel,x,y\nS1,white,0.3\n", 2, 1, "row", "expected 4 cells"),
    ("serial,channel,x,y\nS1,white,0.3,0.3\nS2,white,0.3,abc\n", 3, 4, "y", "finite number"),
    ("serial,channel,x,y\nS1,white,0.3,nan\n", 2, 4, "y", "finite number"),
    ("serial,channel,x,y\n,white,0.3,0.3\n", 2, 1, "serial", "expected a serial"),
    ('serial,channel,x,y\n"S1,white,0.3,0.3\n', 2, 1, "row", "well-formed CSV"),
    ("# nothing\n", 1, 1, "header", "header line"),
    ("serial,channel,x,y,x\n", 1, 5, "x", "each column once"),
])
def test_malformed_csv_names_line_column_and_field(text, line, col, field, words):
    with pytest.raises(ReadError) as e:
        parse_csv(text, "bad.csv")
    assert (e.value.file, e.value.line, e.value.col, e.value.field) == ("bad.csv", line, col, field), e.value
    assert words in e.value.message


def test_an_empty_Y_cell_is_not_measured_but_a_bad_one_is_an_error():
    r = parse_csv("serial,channel,x,y,Y\nS1,white,0.31,0.33,\nS2,white,0.31,0.33,120\n", "m.csv")
    assert np.isnan(r.Y[0]) and r.Y[1] == 120.0
    with pytest.raises(ReadError) as e:
        parse_csv("serial,channel,x,y,Y\nS1,white,0.31,0.33,\nS2,white,0.31,0.33,lots\n", "m.csv")
    assert (e.value.line, e.value.col, e.value.field) == (3, 5, "Y")


def _spectral_csv(w, rows):
    head = "serial,channel," + ",".join(f"{x:g}" for x in w)
    return head + "\n" + "\n".join(f"{s},white," + ",".join(f"{v:.9g}" for v in vals) for s, vals in rows) + "\n"


def test_spectral_columns_equal_energy_gives_the_published_chromaticity():
    # check-values §12.9: equal energy over 360-830 nm at 1 nm gives (0.333314, 0.333288), not 1/3
    w = np.arange(360, 831, 5)
    r = parse_csv(_spectral_csv(w, [("E", np.full(w.size, 0.001))]), "s.csv")
    assert r.x[0] == pytest.approx(0.333314, abs=2e-6) and r.y[0] == pytest.approx(0.333288, abs=2e-6)


def test_spectral_columns_match_a_1_nm_summation_computed_here():
    from generator.colour.spectral import K_M
    from generator.data import cmfs

    grid, cmf = cmfs("cie1931-2")
    S = 0.002 * np.exp(-0.5 * ((grid - 545.0) / 18.0) ** 2)          # a green LED-like peak
    r = parse_csv(_spectral_csv(grid, [("G", S)]), "s.csv")
    X, Y, Z = K_M * (S[:, None] * cmf).sum(axis=0)                  # CIE 15:2004 eq. 7.1, Δλ = 1 nm
    assert r.Y[0] == pytest.approx(Y, rel=1e-9)
    assert r.x[0] == pytest.approx(X / (X + Y + Z), rel=1e-9) and r.y[0] == pytest.approx(Y / (X + Y + Z), rel=1e-9)


def test_spectral_headers_must_increase_and_not_mix_with_colour_columns():
    with pytest.raises(ReadError) as e:
        parse_csv("serial,channel,400,390,410\n", "s.csv")
    assert e.value.col == 4 and "increasing" in e.value.message
    with pytest.raises(ReadError) as e:
        parse_csv("serial,channel,x,y,400,410,420\n", "s.csv")
    assert "found both" in e.value.message


def _records_equal(a, b):
    import numpy as np

    for f in ("serial", "lot", "supplier", "channel", "point"):
        assert getattr(a, f) == getattr(b, f), f
    for f in ("x", "y", "Y", "line"):
        np.testing.assert_array_equal(getattr(a, f), getattr(b, f))


PLAIN = """\
# comment before the header
serial, lot ,channel,x,y,Y

S1,L1,white,0.3127,0.3290,250
  # an indented comment
S1,L1, red ,0.640,0.330,
S2 ,L1,white,\t0.3130,0.3291,251.5
   \t
S2,L1,red,0.641,0.331,60
"""


def test_the_fast_unquoted_reader_gives_the_cells_of_the_csv_module():
    from generator.measure.csvfile import parse_csv

    plain = parse_csv(PLAIN, "m.csv")
    quoted = parse_csv(PLAIN.replace("S1,L1,white", '"S1",L1,white'), "m.csv")   # read by the csv module
    _records_equal(plain, quoted)
    assert plain.serial == ["S1", "S1", "S2", "S2"] and plain.channel == ["white", "red", "white", "red"]
    assert list(plain.line) == [4, 6, 7, 9]


@pytest.mark.parametrize("bad_line", [4, 7, 9])
def test_a_row_of_the_wrong_width_is_reported_at_its_line_by_both_readers(bad_line):
    from generator.measure.csvfile import parse_csv
    from generator.measure.records import ReadError

    lines = PLAIN.splitlines()
    lines[bad_line - 1] += ",extra"
    text = "\n".join(lines) + "\n"
    got = []
    for t in (text, text.replace("S1,L1,white", '"S1",L1,white')):
        with pytest.raises(ReadError) as e:
            parse_csv(t, "m.csv")
        got.append((e.value.line, str(e.value)))
    assert got[0] == got[1] and got[0][0] == bad_line
