"""Normalised primary matrices in generator/colour/npm.py."""
from __future__ import annotations

import colour
import numpy as np
import pytest

from generator.colour.npm import inverse_npm, npm_from_primaries
from generator.data import REFERENCE_SPACES

# published matrices and coefficients are rounded to 4 decimals
ROUNDING_4DP = 5e-5 + 1e-12
# the IEC 4-dp inverse is the inverse of the rounded forward matrix, not the exact
# inverse (check values §12.3): its entries differ from ours by up to 3.7e-4
PUBLISHED_INVERSE_TOL = 5e-4
ROUNDING_5DP = 5e-6 + 1e-12
ROUNDING_6DP = 5e-7 + 1e-12
# the 10-decimal matrices of the check values are rounded at 1e-10
ROUNDING_10DP = 5e-11 + 1e-13
LIBRARY_TOL = 1e-12


def _npm(key):
    s = REFERENCE_SPACES[key]
    return npm_from_primaries(s.primaries, s.white)


def test_srgb_against_iec_61966_2_1_4dp_matrix():
    # IEC 61966-2-1 RGB→XYZ, 4 dp (as stored by colour-science; recalled from memory, not confirmed)
    iec = [[0.4124, 0.3576, 0.1805], [0.2126, 0.7152, 0.0722], [0.0193, 0.1192, 0.9505]]
    np.testing.assert_allclose(_npm("srgb"), iec, rtol=0, atol=ROUNDING_4DP)


def test_srgb_inverse_against_iec_published_inverse():
    # IEC 61966-2-1 XYZ→RGB, 4 dp (as stored by colour-science; recalled from memory, not confirmed)
    iec_inv = [[3.2406, -1.5372, -0.4986], [-0.9689, 1.8758, 0.0415], [0.0557, -0.2040, 1.0570]]
    inv = inverse_npm(_npm("srgb"))
    np.testing.assert_allclose(inv, iec_inv, rtol=0, atol=PUBLISHED_INVERSE_TOL)
    # the trap: our exact inverse is not the published one at 4-dp rounding
    assert np.max(np.abs(inv - iec_inv)) > ROUNDING_4DP


def test_srgb_exact_inverse():
    # independent computation (SMPTE RP 177 method), 10 dp
    exact = [[3.2409699419, -1.5373831776, -0.4986107603],
             [-0.9692436363, 1.8759675015, 0.0415550574],
             [0.0556300797, -0.2039769589, 1.0569715142]]
    np.testing.assert_allclose(inverse_npm(_npm("srgb")), exact, rtol=0, atol=ROUNDING_10DP)


@pytest.mark.parametrize(
    ("key", "matrix"),
    [
        # independent computation (SMPTE RP 177 method), 10 dp
        ("bt709", [[0.4123907993, 0.3575843394, 0.1804807884], [0.2126390059, 0.7151686788, 0.0721923154],
                   [0.0193308187, 0.1191947798, 0.9505321522]]),
        ("bt2020", [[0.6369580483, 0.1446169036, 0.1688809752], [0.2627002120, 0.6779980715, 0.0593017165],
                    [0.0, 0.0280726930, 1.0609850577]]),
        ("dci-p3", [[0.4451698156, 0.2771344092, 0.1722826698], [0.2094916779, 0.7215952542, 0.0689130679],
                    [0.0, 0.0470605601, 0.9073553944]]),
        ("display-p3", [[0.4865709486, 0.2656676932, 0.1982172852], [0.2289745641, 0.6917385218, 0.0792869141],
                        [0.0, 0.0451133819, 1.0439443689]]),
        ("adobe-rgb-1998", [[0.5766690429, 0.1855582379, 0.1882286462], [0.2973449753, 0.6273635663, 0.0752914585],
                            [0.0270313614, 0.0706888525, 0.9913375368]]),
        ("ntsc-1953", [[0.6069928307, 0.1734485269, 0.2005713005], [0.2989666181, 0.5864212101, 0.1146121717],
                       [0.0, 0.0660756293, 1.1174686745]]),
    ],
)
def test_npm_check_values(key, matrix):
    np.testing.assert_allclose(_npm(key), matrix, rtol=0, atol=ROUNDING_10DP)


def test_bt2020_inverse_check_values():
    # independent computation (SMPTE RP 177 method), 10 dp
    exact = [[1.7166511880, -0.3556707838, -0.2533662814],
             [-0.6666843518, 1.6164812366, 0.0157685458],
             [0.0176398574, -0.0427706133, 0.9421031212]]
    np.testing.assert_allclose(inverse_npm(_npm("bt2020")), exact, rtol=0, atol=ROUNDING_10DP)


@pytest.mark.parametrize(
    ("key", "coefficients", "tol"),
    [
        # ITU-R BT.709-6 item 3.2 luminance coefficients (recalled from memory, not confirmed)
        ("bt709", (0.2126, 0.7152, 0.0722), ROUNDING_4DP),
        # ITU-R BT.2020-2 Table 4 luminance coefficients (recalled from memory, not confirmed)
        ("bt2020", (0.2627, 0.6780, 0.0593), ROUNDING_4DP),
        # Adobe RGB (1998) 2005, 5 dp (colour-science 0.4.7 data, citing Adobe)
        ("adobe-rgb-1998", (0.29734, 0.62736, 0.07529), ROUNDING_5DP),
        # independent computation, 6 dp
        ("dci-p3", (0.209492, 0.721595, 0.068913), ROUNDING_6DP),
        ("display-p3", (0.228975, 0.691739, 0.079287), ROUNDING_6DP),
    ],
)
def test_luminance_coefficients(key, coefficients, tol):
    np.testing.assert_allclose(_npm(key)[1], coefficients, rtol=0, atol=tol)


def test_dci_p3_against_4dp_matrix():
    # DCI-P3 NPM, 4 dp (recalled from memory, reproduced by independent computation)
    p3 = [[0.4452, 0.2771, 0.1723], [0.2095, 0.7216, 0.0689], [0.0, 0.0471, 0.9074]]
    np.testing.assert_allclose(_npm("dci-p3"), p3, rtol=0, atol=ROUNDING_4DP)


def test_adobe_rgb_against_adobe_5dp_matrices():
    # Adobe RGB (1998) Color Image Encoding 2005, 5 dp (colour-science 0.4.7 data)
    fwd = [[0.57667, 0.18556, 0.18823], [0.29734, 0.62736, 0.07529], [0.02703, 0.07069, 0.99134]]
    inv = [[2.04159, -0.56501, -0.34473], [-0.96924, 1.87597, 0.04156], [0.01344, -0.11836, 1.01517]]
    m = _npm("adobe-rgb-1998")
    np.testing.assert_allclose(m, fwd, rtol=0, atol=ROUNDING_5DP)
    np.testing.assert_allclose(inverse_npm(m), inv, rtol=0, atol=ROUNDING_5DP)


def test_ntsc_luma_0_587_needs_the_5dp_illuminant_c():
    # BT.601 luma 0.299, 0.587, 0.114 (published code comment; from memory, not confirmed).
    # trap (check values §12.4): with C = (0.310, 0.316) as in BT.470 the green weight is
    # 0.586421 (rounds to 0.586); with C = (0.31006, 0.31616) it is 0.586620 (rounds to 0.587)
    s = REFERENCE_SPACES["ntsc-1953"]
    y_stored = npm_from_primaries(s.primaries, s.white)[1]
    y_c5 = npm_from_primaries(s.primaries, (0.31006, 0.31616))[1]
    # independent computation, 6 dp
    np.testing.assert_allclose(y_stored, (0.298967, 0.586421, 0.114612), rtol=0, atol=ROUNDING_6DP)
    np.testing.assert_allclose(y_c5, (0.298903, 0.586620, 0.114477), rtol=0, atol=ROUNDING_6DP)
    assert round(y_stored[1], 3) == 0.586
    np.testing.assert_allclose(y_c5, (0.299, 0.587, 0.114), rtol=0, atol=5e-4 + 1e-12)


def test_bt709_to_bt2020_and_back_against_bt2087_and_bt2407():
    to2020 = inverse_npm(_npm("bt2020")) @ _npm("bt709")
    # ITU-R BT.2087, 4 dp (recalled from memory, reproduced by independent computation)
    bt2087 = [[0.6274, 0.3293, 0.0433], [0.0691, 0.9195, 0.0114], [0.0164, 0.0880, 0.8956]]
    np.testing.assert_allclose(to2020, bt2087, rtol=0, atol=ROUNDING_4DP)
    # ITU-R BT.2407, 4 dp (recalled from memory, reproduced by independent computation)
    bt2407 = [[1.6605, -0.5876, -0.0728], [-0.1246, 1.1329, -0.0083], [-0.0182, -0.1006, 1.1187]]
    np.testing.assert_allclose(inverse_npm(to2020), bt2407, rtol=0, atol=ROUNDING_4DP)


@pytest.mark.parametrize("key", sorted(REFERENCE_SPACES))
def test_against_colour_science(key):
    s = REFERENCE_SPACES[key]
    ref = colour.normalised_primary_matrix(np.array(s.primaries), np.array(s.white))
    np.testing.assert_allclose(npm_from_primaries(s.primaries, s.white), ref, rtol=0, atol=LIBRARY_TOL)


@pytest.mark.parametrize("key", sorted(REFERENCE_SPACES))
def test_white_maps_to_white_and_primaries_keep_their_chromaticity(key):
    s = REFERENCE_SPACES[key]
    m = npm_from_primaries(s.primaries, s.white)
    x, y = s.white
    np.testing.assert_allclose(m @ np.ones(3), (x / y, 1.0, (1 - x - y) / y), rtol=0, atol=1e-14)
    cols = m.T
    np.testing.assert_allclose(cols[:, :2] / cols.sum(axis=1, keepdims=True), s.primaries, atol=1e-14)
    np.testing.assert_allclose(inverse_npm(m) @ m, np.eye(3), rtol=0, atol=1e-14)


def test_n_dimensional_stacks_and_broadcast_white():
    keys = ["srgb", "bt2020", "dci-p3", "adobe-rgb-1998"]
    prims = np.array([REFERENCE_SPACES[k].primaries for k in keys]).reshape(2, 2, 3, 2)
    whites = np.array([REFERENCE_SPACES[k].white for k in keys]).reshape(2, 2, 2)
    m = npm_from_primaries(prims, whites)
    assert m.shape == (2, 2, 3, 3)
    for i, k in enumerate(keys):
        np.testing.assert_allclose(m.reshape(-1, 3, 3)[i], _npm(k), rtol=0, atol=1e-15)
    one_white = npm_from_primaries(prims, (0.3127, 0.3290))
    assert one_white.shape == (2, 2, 3, 3)
    np.testing.assert_allclose(one_white[0, 0], _npm("srgb"), atol=1e-15)
    inv = inverse_npm(m)
    assert inv.shape == (2, 2, 3, 3)
    np.testing.assert_allclose(inv @ m, np.broadcast_to(np.eye(3), m.shape), atol=1e-13)


@pytest.mark.parametrize(
    "primaries",
    [
        [[0.1, 0.1], [0.2, 0.2], [0.3, 0.3]],     # collinear, exactly singular
        [[0.1, 0.2], [0.2, 0.3], [0.3, 0.4]],     # collinear, singular only up to rounding
        [[0.64, 0.33], [0.64, 0.33], [0.15, 0.06]],  # two primaries the same
        [[np.nan, 0.33], [0.3, 0.6], [0.15, 0.06]],
        [[np.inf, 0.33], [0.3, 0.6], [0.15, 0.06]],
    ],
)
def test_degenerate_or_non_finite_primaries_give_all_nan(primaries):
    assert np.all(np.isnan(npm_from_primaries(primaries, (0.3127, 0.3290))))


def test_white_without_luminance_or_nan_gives_all_nan():
    p = REFERENCE_SPACES["srgb"].primaries
    assert np.all(np.isnan(npm_from_primaries(p, (0.3, 0.0))))
    assert np.all(np.isnan(npm_from_primaries(p, (np.nan, 0.3))))


def test_one_bad_entry_in_a_stack_does_not_spoil_the_others():
    good = np.array(REFERENCE_SPACES["srgb"].primaries)
    stack = np.stack([good, [[0.1, 0.1], [0.2, 0.2], [0.3, 0.3]], good])
    m = npm_from_primaries(stack, (0.3127, 0.3290))
    assert np.all(np.isnan(m[1]))
    np.testing.assert_array_equal(m[0], _npm("srgb"))
    np.testing.assert_array_equal(m[2], _npm("srgb"))
    inv = inverse_npm(np.stack([np.eye(3), np.zeros((3, 3)), np.full((3, 3), np.nan)]))
    np.testing.assert_array_equal(inv[0], np.eye(3))
    assert np.all(np.isnan(inv[1:]))


def test_wrong_shapes_are_errors():
    with pytest.raises(ValueError) as err:
        npm_from_primaries([[0.64, 0.33], [0.3, 0.6]], (0.3127, 0.3290))
    assert str(err.value) == "expected three (x, y) primaries, got shape (2, 2)"
    with pytest.raises(ValueError) as err:
        npm_from_primaries(REFERENCE_SPACES["srgb"].primaries, (0.3127, 0.3290, 1.0))
    assert str(err.value) == "expected a white (x, y), got shape (3,)"
    with pytest.raises(ValueError) as err:
        inverse_npm(np.eye(2))
    assert str(err.value) == "expected a 3 x 3 matrix, got shape (2, 2)"
