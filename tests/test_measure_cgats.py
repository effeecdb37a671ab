"""CGATS.17 reader: hand-made files, good and malformed; errors name file, line and field."""
from __future__ import annotations

import numpy as np
import pytest

from generator.measure.cgats import parse_cgats, parse_tables, tokens
from generator.measure.records import ReadError

GOOD = '''CGATS.17
ORIGINATOR "Tessaly ""QA"" lab"   # a doubled quote is one quote
KEYWORD "LOT"
LOT "L 7"
KEYWORD "CHANNEL"
CHANNEL "white"
# XYZ in cd/m2
NUMBER_OF_FIELDS 4
BEGIN_DATA_FORMAT
SAMPLE_ID XYZ_X XYZ_Y XYZ_Z
END_DATA_FORMAT
NUMBER_OF_SETS 2
BEGIN_DATA
"A 1" 95.047 100.0 108.883
A2	47.5235	50	54.4415   # tabs and a trailing comment
END_DATA

CGATS.17
KEYWORD "CHANNEL"
KEYWORD "LOT"
LOT "L 7"
NUMBER_OF_FIELDS 5
BEGIN_DATA_FORMAT
SAMPLE_ID CHANNEL XYY_X XYY_Y XYY_CAPY
END_DATA_FORMAT
NUMBER_OF_SETS 1
BEGIN_DATA
"A 1" red 0.64 0.33 21.3
END_DATA
'''


def test_two_tables_with_header_keywords_strings_and_comments():
    tables = parse_tables(GOOD, "m.txt")
    assert len(tables) == 2
    assert tables[0].header["ORIGINATOR"][0] == 'Tessaly "QA" lab'
    assert tables[0].fields == ["SAMPLE_ID", "XYZ_X", "XYZ_Y", "XYZ_Z"]
    assert tables[0].set_lines == [14, 15]
    first, second = parse_cgats(GOOD, "m.txt")
    assert first.serial == ["A 1", "A2"] and first.lot == ["L 7", "L 7"] and first.channel == ["white"] * 2
    # D65 XYZ (CIE 15:2004 Table T.3) gives x 0.3127, y 0.3290 to 4 decimals
    assert first.x[0] == pytest.approx(95.047 / (95.047 + 100 + 108.883))
    assert first.y[0] == pytest.approx(100 / (95.047 + 100 + 108.883))
    assert list(first.Y) == [100.0, 50.0]
    assert second.channel == ["red"] and second.x[0] == 0.64 and second.Y[0] == 21.3
    assert list(second.line) == [28]


def test_xyY_without_luminance_gives_nan_Y():
    text = "CGATS.17\nKEYWORD \"CHANNEL\"\nCHANNEL white\nNUMBER_OF_FIELDS 3\nBEGIN_DATA_FORMAT\n" \
           "SAMPLE_ID XYY_X XYY_Y\nEND_DATA_FORMAT\nNUMBER_OF_SETS 1\nBEGIN_DATA\nS1 0.31 0.33\nEND_DATA\n"
    (r,) = parse_cgats(text, "f.txt")
    assert np.isnan(r.Y[0]) and r.x[0] == 0.31


def test_tokens_keep_quoted_hashes_and_spaces():
    assert [t[0] for t in tokens('A "b # c" d # e', "f", 1)] == ["A", "b # c", "d"]
    assert [t[1] for t in tokens('A  "b"', "f", 1)] == [1, 4]


def _error(text) -> ReadError:
    with pytest.raises(ReadError) as e:
        parse_cgats(text, "bad.txt")
    return e.value


def _replace(old, new, count=1):
    assert old in GOOD
    return GOOD.replace(old, new, count)


@pytest.mark.parametrize("text,line,field,words", [
    (_replace("NUMBER_OF_FIELDS 4", "NUMBER_OF_FIELDS 5"), 11, "NUMBER_OF_FIELDS", "expected 5 field names"),
    (_replace("NUMBER_OF_SETS 2", "NUMBER_OF_SETS 3"), 16, "NUMBER_OF_SETS", "expected 3 sets"),
    (_replace("A2\t47.5235\t50\t54.4415", "A2 47.5 50"), 15, "set", "expected 4 values"),
    (_replace('"A 1" 95.047', '"A 1 95.047'), 14, "string", "closing quote"),
    (_replace("SAMPLE_ID XYZ_X", "SAMPLE_ID XYZ_Q"), 10, "XYZ_Q", "declared field name"),
    (_replace('LOT "L 7"', 'BATCH "L 7"'), 4, "BATCH", "declared keyword"),
    (_replace("A2\t47.5235", "A2\tabc"), 15, "XYZ_X", "finite number"),
    (_replace("NUMBER_OF_SETS 2", "NUMBER_OF_SETS two"), 12, "NUMBER_OF_SETS", "whole number"),
    (GOOD.split("END_DATA\n")[0], 16, "END_DATA", "found the end of the file"),
    (GOOD.replace("CGATS.17\nKEYWORD \"CHANNEL\"\nKEYWORD", "BEGIN_DATA\nKEYWORD"), 18, "BEGIN_DATA",
     "new table's identifier"),
    (GOOD.replace("BEGIN_DATA_FORMAT\nSAMPLE_ID CHANNEL XYY_X XYY_Y XYY_CAPY\nEND_DATA_FORMAT\n", ""), 24,
     "BEGIN_DATA", "BEGIN_DATA_FORMAT before BEGIN_DATA"),
    (GOOD.replace('KEYWORD "CHANNEL"\nCHANNEL "white"\n', ""), 1, "CHANNEL", "CHANNEL field or header"),
    ("", 1, "identifier", "empty file"),
])
def test_malformed_files_name_line_and_field(text, line, field, words):
    e = _error(text)
    assert (e.file, e.line, e.field) == ("bad.txt", line, field), e
    assert words in e.message


def test_a_second_table_keeps_its_own_declarations():
    # keywords declared in the first table do not carry over into the second
    text = GOOD.replace('LOT "L 7"\nKEYWORD "CHANNEL"\nCHANNEL "white"',
                        'LOT "L 7"\nKEYWORD "BATCH_NOTE"\nBATCH_NOTE "x"\nCHANNEL "white"', 1)
    assert len(parse_tables(text, "m.txt")) == 2
    e = _error(text.replace('LOT "L 7"\nNUMBER_OF_FIELDS 5', 'BATCH_NOTE "y"\nNUMBER_OF_FIELDS 5'))
    assert e.field == "BATCH_NOTE" and "declared keyword" in e.message


def test_colourspec_names_need_no_declaration():
    text = GOOD.replace('KEYWORD "LOT"\n', "").replace('KEYWORD "CHANNEL"\n', "")
    first, second = parse_cgats(text, "m.txt")
    assert first.lot == ["L 7", "L 7"] and second.channel == ["red"]


def test_sample_name_serves_as_serial_without_sample_id():
    text = GOOD.replace("SAMPLE_ID XYZ_X", "SAMPLE_NAME XYZ_X")
    first, _ = parse_cgats(text, "m.txt")
    assert first.serial == ["A 1", "A2"]
