"""Named white points in generator/data/illuminants.py."""
from __future__ import annotations

import numpy as np
import pytest

from generator.data import ILLUMINANTS

# Values below are quoted to the same number of decimals as the table, so they must
# match to floating-point precision.
EXACT_TOL = 1e-12


@pytest.mark.parametrize(
    ("name", "xy"),
    [
        # ITU-R BT.709-6 item 1.4 / IEC 61966-2-1 4-decimal D65 (recalled from memory, not
        # confirmed; also the value colour-science stores)
        ("D65", (0.3127, 0.3290)),
        # DCI System Specification white, as stored by colour-science 0.4.7 ('DCI-P3')
        ("DCI", (0.314, 0.351)),
        # equal-energy white, 1/3, 1/3 by definition
        ("E", (1 / 3, 1 / 3)),
        # published 5-decimal code tables; colour-science 0.4.7 (C)
        ("C", (0.31006, 0.31616)),
        # published 5-decimal form; independent computation 5 nm from 360 nm gives it too
        ("D50", (0.34567, 0.35850)),
        # published 5-decimal form (D55, D75)
        ("D55", (0.33242, 0.34743)),
        ("D75", (0.29902, 0.31485)),
        # published 5-decimal form in public code
        ("A", (0.44757, 0.40745)),
    ],
)
def test_white_points_match_their_published_values(name, xy):
    ill = ILLUMINANTS[name]
    np.testing.assert_allclose((ill.x, ill.y), xy, rtol=0, atol=EXACT_TOL)
    assert ill.name == name


def test_d65_is_the_4_decimal_definition_not_a_5_decimal_form():
    # Trap (check values §12.1): 0.31271, 0.32902 is a different, 5-decimal D65
    d65 = ILLUMINANTS["D65"]
    assert (d65.x, d65.y) == (0.3127, 0.3290)


@pytest.mark.parametrize("name", sorted(ILLUMINANTS))
def test_every_white_names_a_source_and_is_a_real_chromaticity(name):
    ill = ILLUMINANTS[name]
    assert ill.source.strip()
    assert 0 < ill.x < 1 and 0 < ill.y < 1 and ill.x + ill.y < 1
