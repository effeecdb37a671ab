"""Outlines of masks by marching squares (render/contour.py)."""
from __future__ import annotations

import numpy as np

from generator.render.contour import mask_outlines


def _area(p):
    x, y = p[:, 0], p[:, 1]
    return 0.5 * float(np.sum(x[:-1] * y[1:] - x[1:] * y[:-1]))


def test_a_block_gives_one_closed_outline_between_inside_and_outside_points():
    m = np.zeros((10, 8), bool)
    m[2:6, 3:5] = True          # 4 × 2 points
    (outline,) = mask_outlines(m)
    assert np.array_equal(outline[0], outline[-1])
    assert outline[:, 0].min() == 1.5 and outline[:, 0].max() == 5.5
    assert outline[:, 1].min() == 2.5 and outline[:, 1].max() == 4.5
    # the midpoints cut each corner by a right triangle of legs 0.5: 4 × 2 - 4 × 0.125
    assert abs(abs(_area(outline)) - (8 - 0.5)) < 1e-12


def test_every_outline_keeps_the_inside_on_the_same_side():
    m = np.zeros((12, 12), bool)
    m[1:4, 1:4] = True
    m[6:11, 5:9] = True
    outlines = mask_outlines(m)
    assert len(outlines) == 2
    assert len({np.sign(_area(o)) for o in outlines}) == 1


def test_a_hole_is_outlined_the_other_way_round():
    m = np.zeros((9, 9), bool)
    m[1:8, 1:8] = True
    m[4, 4] = False
    outlines = mask_outlines(m)
    assert len(outlines) == 2
    assert {np.sign(_area(o)) for o in outlines} == {1.0, -1.0}


def test_a_region_reaching_the_border_gives_an_open_outline():
    m = np.zeros((6, 6), bool)
    m[:3, :] = True
    (outline,) = mask_outlines(m)
    assert not np.array_equal(outline[0], outline[-1])
    assert set(outline[:, 0]) == {2.5}


def test_empty_full_and_degenerate_masks_have_no_outline():
    assert mask_outlines(np.zeros((5, 5), bool)) == []
    assert mask_outlines(np.ones((5, 5), bool)) == []
    assert mask_outlines(np.ones((1, 5), bool)) == []
