"""Derived figures in generator/derive.py: colours."""
from __future__ import annotations

import colour
import numpy as np
import pytest

from generator.derive import colour_figures

D65 = (0.3127, 0.3290)


def test_colour_figures_cielab_agrees_with_colour_science():
    got = colour_figures([[0.17, 0.70], [0.575, 0.424]], [62, 48], D65, "cie1931-2")
    for g, (x, y, Y) in zip(got, [(0.17, 0.70, 0.62), (0.575, 0.424, 0.48)], strict=True):
        ref = colour.XYZ_to_Lab(colour.xyY_to_XYZ([x, y, Y]), D65)   # [L] white Y = 1
        assert (g["L"], g["a"], g["b"]) == pytest.approx(tuple(ref), abs=1e-9)
        assert g["reference_white"] == {"x": 0.3127, "y": 0.329}


def test_colour_figures_dominant_wavelength_agrees_with_colour_science():
    got = colour_figures([[0.17, 0.70]], [np.nan], D65, "cie1931-2")[0]
    wl, _, _ = colour.dominant_wavelength([0.17, 0.70], D65)   # [L], 1 nm CMFs interpolated
    assert got["dominant_wavelength_nm"] == pytest.approx(float(wl), abs=1.0)
    assert got["L"] is None and got["Y"] is None   # no luminance factor: no CIELAB


def test_colour_figures_without_a_reference_white_use_equal_energy_for_wavelength_only():
    got = colour_figures([[0.575, 0.424]], [40], None, "cie1931-2")[0]
    assert got["reference_white"] == {"x": 1 / 3, "y": 1 / 3}
    assert got["L"] is None
    assert 589 < got["dominant_wavelength_nm"] < 591   # independent computation: 590.02 nm against E


def test_colour_figures_at_the_white_give_no_wavelength_or_purity():
    got = colour_figures([D65], [100], D65, "cie1931-2")[0]
    assert got["dominant_wavelength_nm"] is None and got["excitation_purity"] is None
    assert (got["L"], got["a"], got["b"]) == pytest.approx((100, 0, 0), abs=1e-9)


def test_colour_figures_follow_the_observer():
    two = colour_figures([[0.17, 0.70]], [50], D65, "cie1931-2")[0]
    ten = colour_figures([[0.17, 0.70]], [50], D65, "cie1964-10")[0]
    assert two["dominant_wavelength_nm"] != ten["dominant_wavelength_nm"]
