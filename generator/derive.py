"""Compute: the derived figures of a spec's targets.

Measured units are assessed column-wise in ``assess/units.py``, not here.
Pure numbers in, pure numbers out (plain dicts shaped like results.json's `derived`);
no YAML, no HTML, no files.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .colour.cct import cct_duv_from_xy
from .colour.convert import xy_to_uv_prime
from .colour.gamut import area_ratio, convex_hull, coverage, polygon_area
from .colour.npm import inverse_npm, npm_from_primaries
from .colour.wavelength import dominant_wavelength
from .model import Spec

CONTRACT_REFERENCES = ("srgb", "bt709", "dci-p3", "display-p3", "bt2020", "adobe-rgb-1998", "ntsc-1953")


def _num(v) -> float | None:
    v = float(v)
    return v if np.isfinite(v) else None


@dataclass
class GamutFigures:
    hull_xy: np.ndarray
    hull_uv: np.ndarray
    area_xy: float
    area_uv: float
    vs: dict[str, dict[str, float | None]]

    def as_json(self) -> dict:
        return {"area_xy": self.area_xy, "area_uv": self.area_uv, "vs": self.vs}


def reference_hulls(spec: Spec) -> dict[str, tuple[np.ndarray, np.ndarray]]:
    out = {}
    for key, ref in spec.references.items():
        xy = np.array(ref.primaries)
        out[key] = (convex_hull(xy), convex_hull(xy_to_uv_prime(xy)))
    return out


def gamut_figures(primaries_xy, ref_hulls, keys) -> GamutFigures:
    """Area of the primaries' convex hull in xy and u'v', and coverage / area ratio (%)
    against each reference in ``keys``."""
    xy = np.asarray(primaries_xy, dtype=float)
    hxy = convex_hull(xy)
    huv = convex_hull(xy_to_uv_prime(xy))
    vs = {}
    for k in keys:
        rxy, ruv = ref_hulls[k]
        vs[k] = {"coverage_xy": _num(coverage(hxy, rxy)), "coverage_uv": _num(coverage(huv, ruv)),
                 "area_ratio_xy": _num(area_ratio(hxy, rxy)), "area_ratio_uv": _num(area_ratio(huv, ruv))}
    return GamutFigures(hxy, huv, polygon_area(hxy), polygon_area(huv), vs)


def white_figures(xy) -> dict:
    """x, y, u', v', CCT and Duv for chromaticities of shape (n, 2) -> list of dicts."""
    xy = np.asarray(xy, dtype=float).reshape(-1, 2)
    uv = xy_to_uv_prime(xy)
    cct, duv = cct_duv_from_xy(xy)
    return [{"x": float(a[0]), "y": float(a[1]), "u_prime": float(b[0]), "v_prime": float(b[1]),
             "cct_K": _num(c), "duv": _num(d)} for a, b, c, d in zip(xy, uv, cct, duv, strict=True)]


@dataclass
class Derived:
    white: dict | None
    primaries: dict[str, dict]
    npm: list | None
    npm_inverse: list | None
    gamut: GamutFigures | None
    ref_hulls: dict

    def as_json(self) -> dict:
        d: dict = {"white": self.white, "primaries": self.primaries}
        if self.npm is not None:
            d["npm"] = self.npm
            d["npm_inverse"] = self.npm_inverse
        d["gamut"] = self.gamut.as_json() if self.gamut else None
        return d


def derive(spec: Spec) -> Derived:
    ref_hulls = reference_hulls(spec)
    keys = sorted(set(CONTRACT_REFERENCES) | {g.reference for g in spec.gamut} | set(spec.references))
    white_xy = spec.white.xy if spec.white else None
    white = white_figures([white_xy])[0] if white_xy else None

    prims: dict[str, dict] = {}
    if spec.primaries:
        pxy = np.array([p.xy for p in spec.primaries])
        puv = xy_to_uv_prime(pxy)
        ref_white = white_xy if white_xy else (0.3127, 0.3290)
        dom, comp, pur = dominant_wavelength(pxy, ref_white, spec.observer)
        for p, uv, d, c, e in zip(spec.primaries, puv, dom, comp, pur, strict=True):
            prims[p.name] = {"x": p.xy[0], "y": p.xy[1], "u_prime": float(uv[0]), "v_prime": float(uv[1]),
                             "dominant_wavelength_nm": _num(d), "complementary_wavelength_nm": _num(c),
                             "excitation_purity": _num(e)}
    npm = npm_inv = None
    if len(spec.primaries) == 3 and white_xy:
        m = npm_from_primaries([p.xy for p in spec.primaries], white_xy)
        if np.all(np.isfinite(m)):
            npm, npm_inv = m.tolist(), inverse_npm(m).tolist()
    gamut = None
    if len(spec.primaries) >= 3:
        gamut = gamut_figures([p.xy for p in spec.primaries], ref_hulls, keys)

    return Derived(white, prims, npm, npm_inv, gamut, ref_hulls)
