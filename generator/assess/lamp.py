"""Rows and unit columns for the fixed figures of the lighting standards (``ellipse_of``,
``quadrangle_of``): one value per sample, the same decision rule as every other limit.

- ``ellipse_of``: the distance from the standard's centre in steps of its tabulated 1-step
  ellipse, sqrt(dᵀ G d), against n steps; U in xy counts as U / b steps (b the 1-step
  semi-minor axis, the direction in which U moves the value most).
- ``quadrangle_of``: the xy distance outside the quadrangle's outline (0 inside), as for a
  ``region``; under guard-banded acceptance the signed distance to the outline (negative
  inside) is decided against 0 with U in xy.

Design targets are assessed too (the figure is fixed, so a target need not lie inside it),
without uncertainty.
"""
from __future__ import annotations

import numpy as np

from ..colour.lamp_tolerance import ellipse_steps
from ..colour.region import distance_to_polygon_edges, in_polygon
from ..data.lamp_standards import standard_name as _std_name
from ..model import FixedEllipse, FixedQuadrangle
from .rules import DecisionRule, decide, decide_many, margin


def ellipse_limit(e: FixedEllipse) -> dict:
    return {"max": e.steps, "standard": e.standard, "colour": e.colour, "centre": list(e.centre),
            "a1": e.a, "b1": e.b, "angle1": e.angle, "source": e.citation, "confidence": e.confidence}


def quadrangle_limit(q: FixedQuadrangle) -> dict:
    return {"max": 0.0, "standard": q.standard, "nominal_cct": q.nominal_cct,
            "cct": {"min": q.cct[0], "max": q.cct[1]}, "duv": {"min": q.duv[0], "max": q.duv[1]},
            "centre": list(q.centre), "corners": [list(c) for c in q.corners], "source": q.citation,
            "confidence": q.confidence}


def ellipse_label(e: FixedEllipse) -> str:
    return f"steps from the {_std_name(e.standard)} {e.colour} centre ({e.confidence} values)"


def quadrangle_label(q: FixedQuadrangle) -> str:
    return f"distance outside the {_std_name(q.standard)} {q.nominal_cct} K quadrangle ({q.confidence} values)"


def ellipse_value(e: FixedEllipse, xy):
    return ellipse_steps(xy, e.centre, e.a, e.b, e.angle)


def quadrangle_value(q: FixedQuadrangle, xy):
    """(distance outside, 0 inside; signed distance to the outline, negative inside) for xy (..., 2)."""
    poly = np.array(q.outline)
    inside = in_polygon(xy, poly)
    edge = distance_to_polygon_edges(xy, poly)
    return np.where(inside, 0.0, edge), np.where(inside, -edge, edge)


def one_sample_rows(prefix, subject, sample, tol, xy, rule: DecisionRule, design: bool, row) -> list[dict]:
    """Rows of one chromaticity ``xy``; ``row`` is requirements._row."""
    rows = []
    Uxy = 0.0 if design else rule.U("xy")
    if tol.ellipse_of is not None:
        e = tol.ellipse_of
        s = float(ellipse_value(e, np.array(xy)))
        rows.append(row(f"{prefix}.ellipse_of", subject, sample, "ellipse_of", s, ellipse_limit(e),
                        decide(s, None, e.steps, Uxy / e.b, rule), margin(s, None, e.steps), ellipse_label(e)))
    if tol.quadrangle_of is not None:
        q = tol.quadrangle_of
        d, signed = (float(v) for v in quadrangle_value(q, np.array(xy)))
        rows.append(row(f"{prefix}.quadrangle_of", subject, sample, "quadrangle_of", d, quadrangle_limit(q),
                        decide(signed, None, 0.0, Uxy, rule), -signed, quadrangle_label(q)))
    return rows


def lamp_columns(prefix, subject, tol, xy, mask, rule: DecisionRule) -> list:
    """Columns over measured chromaticities ``xy`` (n, 2), as ``one_sample_rows`` for each."""
    from .units import Column

    cols = []
    Uxy = rule.U("xy")
    n = len(xy)
    if tol.ellipse_of is not None:
        e = tol.ellipse_of
        s = ellipse_value(e, xy) if n else np.zeros(0)
        U = Uxy / e.b
        code = np.where(mask, decide_many(s, None, e.steps, U, rule), np.int8(-1)).astype(np.int8)
        cols.append(Column(f"{prefix}.ellipse_of", subject, "ellipse_of", ellipse_label(e), ellipse_limit(e), s,
                           code, e.steps - s, U, hi=e.steps, stat_form="upper, radial (steps >= 0)"))
    if tol.quadrangle_of is not None:
        q = tol.quadrangle_of
        d, signed = quadrangle_value(q, xy) if n else (np.zeros(0), np.zeros(0))
        code = np.where(mask, decide_many(signed, None, 0.0, Uxy, rule), np.int8(-1)).astype(np.int8)
        cols.append(Column(f"{prefix}.quadrangle_of", subject, "quadrangle_of", quadrangle_label(q),
                           quadrangle_limit(q), d, code, -signed, Uxy, hi=0.0,
                           stat_form="upper (distance outside, 0 inside)"))
    return cols
