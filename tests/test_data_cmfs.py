"""The CIE 1931 2° and CIE 1964 10° colour-matching-function tables in generator/data."""
from __future__ import annotations

import colour
import numpy as np
import pytest

from generator.data import OBSERVERS, cmfs

# Tabulated CMF values are given to 6-7 significant digits; sums of 471 of them are
# quoted to 6 decimals, so 5e-6 covers the rounding of the quoted figures.
TABLE_TOL = 5e-6
SUM_TOL = 5e-6
# colour-science ships the same CIE tables; the two copies agree to the last digit printed
LIBRARY_TOL = 1e-6

COLOUR_NAMES = {
    "cie1931-2": "CIE 1931 2 Degree Standard Observer",
    "cie1964-10": "CIE 1964 10 Degree Standard Observer",
}


@pytest.mark.parametrize("observer", sorted(OBSERVERS))
def test_tables_cover_360_to_830_nm_at_1_nm(observer):
    wl, cmf = cmfs(observer)
    assert wl.shape == (471,)
    assert cmf.shape == (471, 3)
    np.testing.assert_array_equal(wl, np.arange(360.0, 831.0))
    assert np.all(np.isfinite(cmf))
    assert np.all(cmf >= 0)


@pytest.mark.parametrize("observer", sorted(OBSERVERS))
def test_tables_are_read_only_and_cached(observer):
    wl, cmf = cmfs(observer)
    assert not wl.flags.writeable
    assert not cmf.flags.writeable
    with pytest.raises(ValueError):
        cmf[0, 0] = 1.0
    assert cmfs(observer)[1] is cmf


def test_unknown_observer_is_an_error_that_lists_the_known_ones():
    with pytest.raises(ValueError) as err:
        cmfs("cie1931-10")
    assert str(err.value) == "unknown observer 'cie1931-10'; known: cie1931-2, cie1964-10"


@pytest.mark.parametrize(
    ("observer", "expected"),
    [
        # independent computation: plain sums over the 471 rows, 360-830 nm at 1 nm
        ("cie1931-2", (106.865469, 106.856917, 106.892251)),
        # independent computation: plain sums over the 471 rows, 360-830 nm at 1 nm
        ("cie1964-10", (116.648520, 116.661877, 116.673981)),
    ],
)
def test_column_sums_at_1_nm(observer, expected):
    _, cmf = cmfs(observer)
    np.testing.assert_allclose(cmf.sum(axis=0), expected, rtol=0, atol=SUM_TOL)


def test_cie1931_sums_at_5_nm_over_380_780_nm_are_nearly_equal():
    wl, cmf = cmfs("cie1931-2")
    rows = (wl >= 380) & (wl <= 780) & (wl % 5 == 0)
    # independent computation: 5 x sum of the 5 nm rows, 380-780 nm
    expected = (106.857626, 106.856639, 106.857701)
    np.testing.assert_allclose(5 * cmf[rows].sum(axis=0), expected, rtol=0, atol=SUM_TOL)


@pytest.mark.parametrize(
    ("observer", "nm", "expected"),
    [
        # colour-science 0.4.7 data; CIE 018:2019 Table 6 (555 nm row, from memory, not confirmed)
        ("cie1931-2", 555, (0.5120501, 1.000000, 0.005749999)),
        # colour-science 0.4.7 data (CIE 1931 2°)
        ("cie1931-2", 450, (0.33620, 0.03800, 1.77211)),
        ("cie1931-2", 500, (0.00490, 0.32300, 0.27200)),
        ("cie1931-2", 600, (1.06220, 0.63100, 0.00080)),
        ("cie1931-2", 700, (0.011359, 0.004102, 0.0)),
        # colour-science 0.4.7 data (CIE 1964 10°)
        ("cie1964-10", 555, (0.616053, 0.99911, 0.001091)),
    ],
)
def test_published_rows(observer, nm, expected):
    wl, cmf = cmfs(observer)
    np.testing.assert_allclose(cmf[wl == nm][0], expected, rtol=0, atol=TABLE_TOL)


@pytest.mark.parametrize(
    ("observer", "peaks_nm", "peak_values", "value_tol"),
    [
        # independent computation: argmax of each 1 nm column
        ("cie1931-2", (599, 555, 446), (1.062910, 1.0, 1.782968), TABLE_TOL),
        # independent computation: argmax of each 1 nm column (values quoted to 4 decimals)
        ("cie1964-10", (595, 557, 445), (1.1343, 1.0, 2.0273), 5e-4),
    ],
)
def test_peaks(observer, peaks_nm, peak_values, value_tol):
    wl, cmf = cmfs(observer)
    np.testing.assert_array_equal(wl[np.argmax(cmf, axis=0)], peaks_nm)
    np.testing.assert_allclose(cmf.max(axis=0), peak_values, rtol=0, atol=value_tol)


@pytest.mark.parametrize("observer", sorted(OBSERVERS))
def test_tables_match_colour_science_copy(observer):
    ref = colour.MSDS_CMFS[COLOUR_NAMES[observer]]
    wl, cmf = cmfs(observer)
    np.testing.assert_array_equal(ref.wavelengths, wl)
    np.testing.assert_allclose(cmf, ref.values, rtol=0, atol=LIBRARY_TOL)
