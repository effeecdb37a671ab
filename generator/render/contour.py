"""The outline of a region given as a boolean mask on a regular grid, by marching squares:
each grid cell whose corners are not all inside or all outside gives a segment between the
midpoints of its crossed edges (the 0.5 level of the mask), and the segments are joined
into polylines. Used to draw the CIELAB gamut slices."""
from __future__ import annotations

import numpy as np

# Cell edges: 0 bottom (corner 0 to 1), 1 right (1 to 2), 2 top (3 to 2), 3 left (0 to 3); corners
# 0 (i, j), 1 (i+1, j), 2 (i+1, j+1), 3 (i, j+1). Case bits: corner k inside gives 1 << k.
_SEGMENTS = {1: ((3, 0),), 2: ((0, 1),), 3: ((3, 1),), 4: ((1, 2),), 5: ((3, 0), (1, 2)), 6: ((0, 2),),
             7: ((3, 2),), 8: ((2, 3),), 9: ((2, 0),), 10: ((0, 1), (2, 3)), 11: ((2, 1),), 12: ((1, 3),),
             13: ((1, 0),), 14: ((0, 3),)}


def _edge_point(i: int, j: int, e: int) -> tuple[float, float]:
    """Grid-index coordinates of the midpoint of edge ``e`` of cell (i, j)."""
    return ((i + 0.5, j), (i + 1, j + 0.5), (i + 0.5, j + 1), (i, j + 0.5))[e]


def mask_outlines(mask) -> list[np.ndarray]:
    """Polylines (k, 2) in grid-index coordinates (first index, second index) around the
    True cells of ``mask``; closed outlines repeat their first point at the end."""
    m = np.asarray(mask, dtype=bool)
    if m.ndim != 2 or m.shape[0] < 2 or m.shape[1] < 2:
        return []
    case = (m[:-1, :-1] * 1 + m[1:, :-1] * 2 + m[1:, 1:] * 4 + m[:-1, 1:] * 8).astype(np.int8)
    nxt: dict = {}
    for i, j in zip(*np.nonzero((case > 0) & (case < 15)), strict=True):
        for a, b in _SEGMENTS[int(case[i, j])]:
            nxt[_edge_point(int(i), int(j), a)] = _edge_point(int(i), int(j), b)
    # each segment goes from its start to its end with the inside on one side, so segments chain
    # head to tail; an outline that reaches the grid's border starts where no segment ends
    ends = set(nxt.values())
    starts = sorted(p for p in nxt if p not in ends) + sorted(nxt)
    out = []
    for s in starts:
        if s not in nxt:
            continue
        chain = [s]
        p = s
        while p in nxt:
            q = nxt.pop(p)
            chain.append(q)
            p = q
        out.append(np.array(chain, dtype=float))
    return out
