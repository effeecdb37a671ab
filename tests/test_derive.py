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


TEN_DEGREE_WHITE = """\
spec: 1
id: ten-white
observer: OBSERVER
white:
  target: {cct: 5000, duv: 0.002}
  tolerance: {cct: [4800, 5200], duv: [-0.004, 0.006]}
units:
  - {serial: U1, white: {x: 0.3460, y: 0.3590}}
"""


@pytest.mark.parametrize("observer", ["cie1931-2", "cie1964-10"])
def test_white_cct_and_unit_cct_follow_the_spec_observer(spec_dir, observer):
    from generator.build import evaluate
    from generator.colour.cct import cct_duv_from_xy, xy_from_cct_duv

    spec_dir("s.yaml", TEN_DEGREE_WHITE.replace("OBSERVER", observer))
    (e,), _ = evaluate(spec_dir.dir)
    # a {cct, duv} target is placed on the spec observer's locus and reads back the same
    assert e.spec.white.xy == pytest.approx(tuple(xy_from_cct_duv(5000, 0.002, observer)), abs=1e-15)
    assert e.derived.white["cct_K"] == pytest.approx(5000, abs=1e-6)
    assert e.derived.white["duv"] == pytest.approx(0.002, abs=1e-12)
    other = "cie1931-2" if observer == "cie1964-10" else "cie1964-10"
    assert e.derived.white["x"] != pytest.approx(float(xy_from_cct_duv(5000, 0.002, other)[0]), abs=1e-4)
    # a measured unit's CCT row uses the same observer
    (row,) = [r for r in e.assessment.rows if r["id"] == "white.cct" and r["sample"] == "U1"]
    assert row["value"] == pytest.approx(float(cct_duv_from_xy((0.3460, 0.3590), observer)[0]), abs=1e-9)
