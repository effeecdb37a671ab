"""The strict spectra CSV format in generator/measure/spectra_csv.py."""
from __future__ import annotations

import pytest

from generator.measure.spectra_csv import SpectraFileError, parse_spectra_csv

GOOD = """\
# a comment
wavelength,red,green
380,0.1,0.2
385,0.2,0.3
# comments may sit between rows
390,0.3,1e-3
"""


def test_a_good_file_gives_wavelengths_and_channels():
    t = parse_spectra_csv(GOOD)
    assert t.wavelengths == (380.0, 385.0, 390.0)
    assert t.channels == {"red": (0.1, 0.2, 0.3), "green": (0.2, 0.3, 0.001)}


@pytest.mark.parametrize(("text", "line", "col", "message"), [
    ("", 1, 1, "expected a header 'wavelength,<channel>,...', found no lines"),
    ("nm,red\n1,2\n2,3\n3,4\n", 1, 1, "expected the first column to be 'wavelength' (nm), found 'nm'"),
    ("wavelength\n1\n2\n3\n", 1, 1, "expected one named column per channel after 'wavelength', found none"),
    ("wavelength,a,a\n1,2,3\n2,3,4\n3,4,5\n", 1, 1, "expected every column name once, found a repeated name"),
    ("wavelength,a\n1,2\n2,3\n", 1, 1, "expected three or more rows of data, found 2"),
    ("wavelength,a\n1,2\n2,3,4\n3,4\n", 3, 1, "expected 2 values, found 3"),
    ("wavelength,a\n1,2\n2,x\n3,4\n", 3, 3, "expected a number, found 'x'"),
    ("wavelength,a\n1,2\n2,nan\n3,4\n", 3, 3, "expected a number, found 'nan'"),
    ("wavelength,a\n1,2\n3,3\n2,4\n", 4, 1, "expected wavelengths that increase, found 2 after 3"),
])
def test_bad_files_name_line_column_and_problem(text, line, col, message):
    with pytest.raises(SpectraFileError) as e:
        parse_spectra_csv(text)
    assert (e.value.line, e.value.col, e.value.message) == (line, col, message)
