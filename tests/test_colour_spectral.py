"""Spectral integration and the spectral locus in generator/colour/spectral.py."""
from __future__ import annotations

import colour
import numpy as np
import pytest

from generator.colour.spectral import spectral_locus_uv, spectral_locus_xy, spectrum_to_XYZ

# check values are quoted to 5 or 6 decimals, or XYZ to 3 decimals
ROUNDING_5DP = 5e-6 + 1e-12
ROUNDING_6DP = 5e-7 + 1e-12
ROUNDING_3DP = 5e-4 + 1e-9


@pytest.mark.parametrize(
    ("nm", "xy"),
    [
        # independent computation: chromaticity of the CIE 1931 1 nm table rows
        (380, (0.17411, 0.00496)),
        (450, (0.15664, 0.01770)),
        (480, (0.09129, 0.13270)),
        (500, (0.00817, 0.53842)),
        (520, (0.07430, 0.83380)),
        (555, (0.33736, 0.65885)),
        (580, (0.51249, 0.48659)),
        (600, (0.62704, 0.37249)),
        (620, (0.69150, 0.30834)),
        (700, (0.73469, 0.26531)),
        (780, (0.73469, 0.26531)),
    ],
)
def test_spectral_locus_points(nm, xy):
    wl, loc = spectral_locus_xy()
    np.testing.assert_allclose(loc[wl == nm][0], xy, rtol=0, atol=ROUNDING_5DP)


def test_spectral_locus_covers_the_table_and_is_read_only():
    wl, xy = spectral_locus_xy()
    assert wl[0] == 360 and wl[-1] == 830 and xy.shape == (wl.size, 2)
    assert not xy.flags.writeable
    wl10, xy10 = spectral_locus_xy("cie1964-10")
    assert xy10.shape == (wl10.size, 2)
    assert not np.allclose(xy10[wl10 == 500], xy[wl == 500], atol=1e-3)


def test_spectral_locus_uv_is_the_u_prime_v_prime_of_the_xy_locus():
    wl, xy = spectral_locus_xy()
    wl2, uv = spectral_locus_uv()
    np.testing.assert_array_equal(wl, wl2)
    np.testing.assert_allclose(uv, colour.xy_to_Luv_uv(xy), rtol=0, atol=1e-12)


@pytest.mark.parametrize(
    ("observer", "xy", "XYZ"),
    [
        # independent computation: equal-energy spectrum through the 1 nm 360-830 nm table
        ("cie1931-2", (0.333314, 0.333288), (100.008, 100.0, 100.033)),
        ("cie1964-10", (0.333296, 0.333335), (99.989, 100.0, 100.010)),
    ],
)
def test_equal_energy_white_through_the_tables(observer, xy, XYZ):
    # trap (check values §12.9): E is not exactly 1/3, 1/3 over 360-830 nm at 1 nm
    out = spectrum_to_XYZ(np.ones(471), observer, normalise_Y=100.0)
    np.testing.assert_allclose(out, XYZ, rtol=0, atol=ROUNDING_3DP)
    np.testing.assert_allclose(out[:2] / out.sum(), xy, rtol=0, atol=ROUNDING_6DP)


def test_monochromatic_spectrum_gives_the_cmf_row():
    s = np.zeros(471)
    s[555 - 360] = 2.0
    # colour-science data: CMF at 555 nm = 0.5120501, 1, 0.005749999
    np.testing.assert_allclose(spectrum_to_XYZ(s), 2 * np.array([0.5120501, 1.0, 0.005749999]), atol=1e-9)


def test_against_colour_science_integration_of_a_smooth_spectrum():
    wl = np.arange(360, 831)
    values = 1 + 0.5 * np.sin(wl / 40.0)
    cmfs = colour.MSDS_CMFS["CIE 1931 2 Degree Standard Observer"]
    sd = colour.SpectralDistribution(dict(zip(wl, values, strict=True)))
    ref = colour.sd_to_XYZ(sd, cmfs, method="Integration", k=1.0)
    # the two CMF copies differ by up to 5e-7 in single entries
    np.testing.assert_allclose(spectrum_to_XYZ(values), ref, rtol=1e-7)


def test_n_dimensional_spectra():
    rng = np.random.default_rng(3)
    s = rng.uniform(0, 1, (2, 3, 471))
    out = spectrum_to_XYZ(s, normalise_Y=1.0)
    assert out.shape == (2, 3, 3)
    np.testing.assert_allclose(out[..., 1], 1.0, rtol=1e-14)
    np.testing.assert_allclose(out[1, 2], spectrum_to_XYZ(s[1, 2], normalise_Y=1.0), rtol=1e-14)


def test_zero_and_nan_spectra_do_not_raise():
    assert np.all(np.isnan(spectrum_to_XYZ(np.zeros(471), normalise_Y=100.0)))
    np.testing.assert_array_equal(spectrum_to_XYZ(np.zeros(471)), 0.0)
    s = np.ones((2, 471))
    s[0, 100] = np.nan
    out = spectrum_to_XYZ(s)
    assert np.all(np.isnan(out[0])) and np.all(np.isfinite(out[1]))


def test_wrong_sampling_is_an_error():
    with pytest.raises(ValueError):
        spectrum_to_XYZ(np.ones(81))


def test_unknown_observer_is_an_error():
    with pytest.raises(ValueError, match="unknown observer 'cie2015-2'"):
        spectrum_to_XYZ(np.ones(471), "cie2015-2")
