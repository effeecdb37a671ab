"""CIELAB gamut volume and volume coverage in generator/colour/volume.py."""
from __future__ import annotations

import numpy as np
import pytest

from generator.colour.npm import npm_from_primaries
from generator.colour.volume import cube_surface, lab_gamut_volume, lab_volume_coverage, lightness_slice, mesh_volume

# check values §9 quotes mesh volumes to whole units: half a unit plus float noise
ROUNDING_UNIT = 0.5 + 1e-6
# a 1 ΔE*ab grid count against the mesh volume (independent methods): within 0.3 %
GRID_REL = 3e-3

D65 = (0.3127, 0.3290)
SPACES = {
    "srgb": ([(0.64, 0.33), (0.30, 0.60), (0.15, 0.06)], D65),
    "bt2020": ([(0.708, 0.292), (0.170, 0.797), (0.131, 0.046)], D65),
    "p3-d65": ([(0.680, 0.320), (0.265, 0.690), (0.150, 0.060)], D65),
    "dci-p3": ([(0.680, 0.320), (0.265, 0.690), (0.150, 0.060)], (0.314, 0.351)),
    "adobe-rgb": ([(0.64, 0.33), (0.21, 0.71), (0.15, 0.06)], D65),
    "ntsc-1953": ([(0.67, 0.33), (0.21, 0.71), (0.14, 0.08)], (0.310, 0.316)),   # C as BT.470-6 writes it
}


def _npm(key):
    prim, white = SPACES[key]
    return npm_from_primaries(prim, white)


@pytest.mark.parametrize(("key", "volume"), [
    # check values §9 [C]: n = 64 mesh, CIELAB with the space's own white, no adaptation
    ("srgb", 819_555), ("bt2020", 1_853_654), ("p3-d65", 1_230_056), ("dci-p3", 1_235_450),
    ("adobe-rgb", 1_194_994), ("ntsc-1953", 1_252_352),
])
def test_reference_volumes_at_n_64(key, volume):
    assert abs(lab_gamut_volume(_npm(key), n=64) - volume) <= ROUNDING_UNIT


def test_finer_meshes_approach_the_extrapolated_volume():
    # check values §9 [C]: sRGB n = 256 gives 820,254; extrapolated 820,300
    v256 = lab_gamut_volume(_npm("srgb"), n=256)
    assert abs(v256 - 820_254) <= ROUNDING_UNIT
    assert lab_gamut_volume(_npm("srgb"), n=64) < v256 < 820_300


def test_cube_surface_is_closed_and_outward():
    v, t = cube_surface(5)
    assert mesh_volume(v, t) == pytest.approx(1.0, abs=1e-12)
    assert mesh_volume(v * 2.0, t) == pytest.approx(8.0, abs=1e-12)


def test_grid_volume_agrees_with_the_mesh_volume():
    covered, whole = lab_volume_coverage(_npm("srgb"), _npm("srgb"))
    assert covered == whole
    assert whole == pytest.approx(lab_gamut_volume(_npm("srgb"), n=128), rel=GRID_REL)


def test_coverage_of_a_contained_and_a_containing_space():
    # sRGB lies inside BT.2020 (same white): BT.2020 covers all of sRGB; sRGB covers about
    # V(sRGB) / V(BT.2020) = 44.2 % of BT.2020
    covered, whole = lab_volume_coverage(_npm("bt2020"), _npm("srgb"))
    assert covered / whole == pytest.approx(1.0, abs=1e-9)
    covered, whole = lab_volume_coverage(_npm("srgb"), _npm("bt2020"))
    ratio = lab_gamut_volume(_npm("srgb")) / lab_gamut_volume(_npm("bt2020"))
    assert covered / whole == pytest.approx(ratio, rel=GRID_REL)


def test_nan_or_singular_matrices_give_nan():
    bad = np.full((3, 3), np.nan)
    assert np.isnan(lab_gamut_volume(bad))
    assert all(np.isnan(v) for v in lab_volume_coverage(bad, _npm("srgb")))


def test_lightness_slice_marks_the_white_axis_inside():
    M = _npm("srgb")
    A, B, inside = lightness_slice(M, 50.0, M @ np.ones(3), step=2.0)
    assert A.shape == B.shape == inside.shape
    assert inside[np.argmin(np.abs(A[:, 0])), np.argmin(np.abs(B[0]))]   # a* = b* = 0 is grey: inside
    assert not inside[0, 0]                                               # a* = b* = -200: outside


@pytest.mark.parametrize("spec, ref", [("p3-d65", "bt2020"), ("bt2020", "srgb"), ("ntsc-1953", "adobe-rgb")])
def test_interval_counting_equals_testing_every_grid_point(spec, ref):
    """lab_volume_coverage counts each a* row's inside points by binary search on Z; the
    same counts as converting every grid point to RGB and testing it (brute force here)."""
    from generator.colour.difference import Lab_to_XYZ, XYZ_to_Lab

    step = 3.0
    M, R = _npm(spec), _npm(ref)
    white = R @ np.ones(3)
    lab = XYZ_to_Lab(cube_surface(8)[0] @ R.T, white)
    lo, hi = lab.min(axis=0) - step, lab.max(axis=0) + step
    L = np.arange(max(lo[0], 0.0) + step / 2, min(hi[0], 100.0), step)
    a = np.arange(lo[1] + step / 2, hi[1], step)
    b = np.arange(lo[2] + step / 2, hi[2], step)
    grid = np.stack(np.meshgrid(L, a, b, indexing="ij"), -1).reshape(-1, 3)
    XYZ = Lab_to_XYZ(grid, white)

    def inside(npm):
        rgb = XYZ @ np.linalg.inv(npm).T
        return np.all((rgb >= -1e-12) & (rgb <= 1 + 1e-12), axis=-1)

    in_r = inside(R)
    covered, whole = lab_volume_coverage(M, R, step=step)
    assert whole == np.count_nonzero(in_r) * step ** 3
    assert covered == np.count_nonzero(in_r & inside(M)) * step ** 3
