"""MacAdam (1942) ellipses (generator/data/macadam1942.py) and MacAdam steps
(generator/colour/macadam.py)."""
from __future__ import annotations

import warnings

import numpy as np
import pytest
from colour.models.datasets.macadam_ellipses import DATA_MACADAM_1942_ELLIPSES

from generator.colour.macadam import ellipse_metric, macadam_metric, macadam_steps, metric_axes
from generator.data.macadam1942 import CALCULATED, CENTRES, OBSERVED

EXACT = 1e-12


def test_table_agrees_with_the_colour_science_copy_of_wyszecki_stiles():
    # colour-science ships Wyszecki & Stiles Table 2(5.4.1) as a (25, 8) array [L]
    ref = np.asarray(DATA_MACADAM_1942_ELLIPSES)
    assert ref.shape == (25, 8)
    assert np.allclose(CENTRES, ref[:, 0:2], atol=EXACT)
    assert np.allclose(OBSERVED, ref[:, 2:5] * (1e-3, 1e-3, 1), atol=EXACT)
    assert np.allclose(CALCULATED, ref[:, 5:8] * (1e-3, 1e-3, 1), atol=EXACT)


def test_the_ellipse_at_a_centre_is_the_tabulated_one():
    # check values §7, ellipse 13 at (0.305, 0.323): calculated 10³a 2.55, 10³b 0.68, θ 57.2 [L]
    a, b, ang = metric_axes(macadam_metric((0.305, 0.323)))
    assert (float(a), float(b), float(ang)) == pytest.approx((2.55e-3, 0.68e-3, 57.2), abs=1e-12)


@pytest.mark.parametrize("i", range(25))
def test_points_on_each_tabulated_ellipse_are_one_step(i):
    (x0, y0), (a, b, ang) = CENTRES[i], CALCULATED[i]
    th = np.deg2rad(ang)
    t = np.linspace(0, 2 * np.pi, 7)
    pts = np.stack([x0 + a * np.cos(t) * np.cos(th) - b * np.sin(t) * np.sin(th),
                    y0 + a * np.cos(t) * np.sin(th) + b * np.sin(t) * np.cos(th)], -1)
    assert np.allclose(macadam_steps(pts, (x0, y0)), 1.0, atol=1e-9)


def test_steps_scale_linearly_with_the_offset():
    t = np.array([0.3127, 0.3290])
    d = np.array([0.001, -0.0004])
    s1, s3 = float(macadam_steps(t + d, t)), float(macadam_steps(t + 3 * d, t))
    assert s3 == pytest.approx(3 * s1, rel=1e-12) and s1 > 0


def test_interpolated_metric_lies_between_its_neighbours():
    # between ellipses 13 (0.305, 0.323) and 14 (0.385, 0.393): the major semi-axis lies between
    # 2.55e-3 and 3.70e-3 (inverse-distance weighting of the metrics)
    a, b, _ = metric_axes(macadam_metric((0.345, 0.358)))
    assert 2.4e-3 < float(a) < 3.8e-3 and 0.6e-3 < float(b) < 1.6e-3


def test_metric_of_an_axis_aligned_ellipse():
    G = ellipse_metric(2.0, 1.0, 0.0)
    assert np.allclose(G, [[0.25, 0.0], [0.0, 1.0]], atol=EXACT)
    a, b, ang = metric_axes(ellipse_metric(3.0, 1.0, 120.0))
    assert (float(a), float(b), float(ang)) == pytest.approx((3.0, 1.0, 120.0))


def test_arrays_in_arrays_out():
    xy = np.full((2, 3, 2), 0.31)
    assert macadam_metric(xy).shape == (2, 3, 2, 2)
    assert macadam_steps(xy, (0.3127, 0.329)).shape == (2, 3)
    assert macadam_steps(xy, np.full((2, 3, 2), 0.3)).shape == (2, 3)


def test_nan_gives_nan_without_warnings():
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert np.isnan(macadam_metric((np.nan, 0.3))).all()
        assert np.isnan(macadam_steps((0.3, 0.3), (np.nan, 0.3)))
        assert np.isnan(macadam_steps((np.nan, 0.3), (0.3127, 0.329)))
