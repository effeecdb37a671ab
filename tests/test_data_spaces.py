"""Reference colour spaces in generator/data/spaces.py."""
from __future__ import annotations

import numpy as np
import pytest

from generator.data import ILLUMINANTS, REFERENCE_SPACES

# primaries are defined with 2-4 decimals; the table must hold them exactly
EXACT_TOL = 1e-12
D65 = (0.3127, 0.3290)


@pytest.mark.parametrize(
    ("key", "primaries", "white"),
    [
        # ITU-R BT.709-6 Part 1 items 1.3-1.4 / IEC 61966-2-1 (colour-science 0.4.7 data;
        # recalled from memory, not confirmed against the standard's text)
        ("srgb", ((0.640, 0.330), (0.300, 0.600), (0.150, 0.060)), D65),
        ("bt709", ((0.640, 0.330), (0.300, 0.600), (0.150, 0.060)), D65),
        # ITU-R BT.2020-2 Table 3 (colour-science 0.4.7 data; recalled from memory, not confirmed)
        ("bt2020", ((0.708, 0.292), (0.170, 0.797), (0.131, 0.046)), D65),
        # SMPTE RP 431-2 (colour-science 0.4.7 data; recalled from memory, not confirmed)
        ("dci-p3", ((0.680, 0.320), (0.265, 0.690), (0.150, 0.060)), (0.314, 0.351)),
        # SMPTE EG 432-1: P3 primaries with D65 (colour-science 'P3-D65'; from memory, not confirmed)
        ("display-p3", ((0.680, 0.320), (0.265, 0.690), (0.150, 0.060)), D65),
        # Adobe RGB (1998) Color Image Encoding 2005 (colour-science 0.4.7 data)
        ("adobe-rgb-1998", ((0.6400, 0.3300), (0.2100, 0.7100), (0.1500, 0.0600)), D65),
        # ITU-R BT.470 System M, illuminant C at (0.310, 0.316) (from memory, not confirmed)
        ("ntsc-1953", ((0.67, 0.33), (0.21, 0.71), (0.14, 0.08)), (0.310, 0.316)),
        # EBU Tech 3213 (recalled from memory, not confirmed)
        ("ebu-3213", ((0.640, 0.330), (0.290, 0.600), (0.150, 0.060)), D65),
        # SMPTE C / RP 145 (recalled from memory, not confirmed)
        ("smpte-c", ((0.630, 0.340), (0.310, 0.595), (0.155, 0.070)), D65),
    ],
)
def test_reference_space_primaries_and_white(key, primaries, white):
    s = REFERENCE_SPACES[key]
    assert s.key == key
    np.testing.assert_allclose(np.array(s.primaries), primaries, rtol=0, atol=EXACT_TOL)
    np.testing.assert_allclose(s.white, white, rtol=0, atol=EXACT_TOL)


def test_every_space_has_three_primaries_a_title_and_a_source():
    for s in REFERENCE_SPACES.values():
        assert np.array(s.primaries).shape == (3, 2)
        assert s.title.strip() and s.source.strip()


@pytest.mark.parametrize("key", ["srgb", "bt709", "display-p3", "bt2020", "adobe-rgb-1998"])
def test_d65_spaces_use_the_same_white_as_the_d65_illuminant(key):
    d65 = ILLUMINANTS["D65"]
    assert REFERENCE_SPACES[key].white == (d65.x, d65.y)


def test_dci_white_equals_the_dci_illuminant():
    dci = ILLUMINANTS["DCI"]
    assert REFERENCE_SPACES["dci-p3"].white == (dci.x, dci.y)
