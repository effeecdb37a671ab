"""Compute: the derived figures of a spec's targets.

Measured units are assessed column-wise in ``assess/units.py``, not here.
Pure numbers in, pure numbers out (plain dicts shaped like results.json's `derived`);
no YAML, no HTML, no files.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from functools import cache

import numpy as np

from .colour.cct import cct_duv_from_xy
from .colour.convert import xy_to_uv_prime, xy_to_XYZ
from .colour.difference import XYZ_to_Lab
from .colour.gamut import area_ratio, convex_hull, coverage, polygon_area
from .colour.npm import inverse_npm, npm_from_primaries
from .colour.spectrum import centroid_wavelength, fwhm, luminance, peak_wavelength, spectrum_XYZ
from .colour.volume import lab_gamut_volume, lab_volume_coverage
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
    volume: dict | None = None     # CIELAB volume figures; None without an NPM
    npm: np.ndarray | None = None

    def as_json(self) -> dict:
        d = {"area_xy": self.area_xy, "area_uv": self.area_uv, "vs": self.vs}
        if self.volume is not None:
            d["volume"] = self.volume
        return d


@cache
def _reference_volume(primaries: tuple, white: tuple) -> tuple[float, tuple | None]:
    """CIELAB volume of a reference space with its own white, and its NPM (constant: kept for
    the process and in the table cache, generator/tablecache.py)."""
    from .tablecache import stored_arrays

    M = npm_from_primaries(list(primaries), white)
    if not np.all(np.isfinite(M)):
        return float("nan"), None
    V = stored_arrays("lab-volume", repr((primaries, white)), lambda: {"volume": np.array(lab_gamut_volume(M))})
    return float(V["volume"]), tuple(map(tuple, M))


def volume_figures(npm, spec: Spec, coverage_refs) -> dict | None:
    """CIELAB volume of the gamut (own white), each reference space's volume (own white), the
    volume ratio (%), and for ``coverage_refs`` the share of the reference volume covered (%)."""
    if npm is None or not np.all(np.isfinite(npm)):
        return None
    V = lab_gamut_volume(npm)
    vs = {}
    for key in sorted(spec.references):
        ref = spec.references[key]
        if len(ref.primaries) != 3 or not np.all(np.isfinite(ref.white)):
            continue
        Vr, R = _reference_volume(tuple(ref.primaries), tuple(ref.white))
        entry = {"volume": _num(Vr), "volume_ratio": _num(100.0 * V / Vr) if R is not None else None}
        if key in coverage_refs and R is not None:
            covered, whole = lab_volume_coverage(npm, np.array(R))
            entry["volume_coverage"] = _num(min(100.0, 100.0 * covered / whole))
        vs[key] = entry
    return {"cielab": V, "vs": vs}


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


# Dominant wavelength of a colour without a stated reference white is taken from the
# equal-energy white E (x = y = 1/3), as is common in LED binning.
DOMINANT_WAVELENGTH_DEFAULT_WHITE = (1 / 3, 1 / 3)


def colour_figures(xy, Y, reference_white, observer) -> list[dict]:
    """Chromaticity, CIELAB (when Y and a reference white are known), dominant or
    complementary wavelength and excitation purity of colours; xy (n, 2), Y (n,) with NaN
    for unknown luminance factors (reference white Y = 100)."""
    xy = np.asarray(xy, dtype=float).reshape(-1, 2)
    Y = np.asarray(Y, dtype=float).reshape(-1)
    uv = xy_to_uv_prime(xy)
    white = reference_white if reference_white is not None else DOMINANT_WAVELENGTH_DEFAULT_WHITE
    dom, comp, pur = dominant_wavelength(xy, white, observer)
    if reference_white is not None:
        lab = XYZ_to_Lab(xy_to_XYZ(xy, Y), xy_to_XYZ(np.array(reference_white), 100.0))
    else:
        lab = np.full((len(xy), 3), np.nan)
    out = []
    for i in range(len(xy)):
        out.append({"x": float(xy[i, 0]), "y": float(xy[i, 1]), "u_prime": float(uv[i, 0]),
                    "v_prime": float(uv[i, 1]), "Y": _num(Y[i]),
                    "L": _num(lab[i, 0]), "a": _num(lab[i, 1]), "b": _num(lab[i, 2]),
                    "dominant_wavelength_nm": _num(dom[i]), "complementary_wavelength_nm": _num(comp[i]),
                    "excitation_purity": _num(pur[i]),
                    "reference_white": ({"x": float(white[0]), "y": float(white[1])})})
    return out


def spectrum_figures(sd, observer) -> dict:
    """XYZ, chromaticity, luminance (radiance spectra), peak, centroid and FWHM of a 1 nm
    spectrum; CCT and Duv for whites."""
    XYZ = spectrum_XYZ(sd.wavelengths, sd.values, observer)
    radiance = sd.scale == "radiance"
    if radiance:
        XYZ_out = XYZ * (luminance(XYZ) / XYZ[1])   # absolute: Y in cd/m²
    else:
        XYZ_out = XYZ / XYZ[1] * 100.0              # relative: Y = 100
    f = white_figures([XYZ[:2] / XYZ.sum()], observer)[0]
    out = {"label": sd.label, "sample": sd.sample, "source": sd.source, "sampling": sd.sampling,
           "interpolation": sd.interpolation, "scale": sd.scale,
           "X": float(XYZ_out[0]), "Y": float(XYZ_out[1]), "Z": float(XYZ_out[2]),
           "x": f["x"], "y": f["y"], "u_prime": f["u_prime"], "v_prime": f["v_prime"],
           "luminance_cd_m2": float(XYZ_out[1]) if radiance else None,
           "peak_wavelength_nm": _num(peak_wavelength(sd.wavelengths, sd.values)),
           "centroid_wavelength_nm": _num(centroid_wavelength(sd.wavelengths, sd.values)),
           "fwhm_nm": _num(fwhm(sd.wavelengths, sd.values))}
    if sd.is_white:
        out["cct_K"], out["duv"] = f["cct_K"], f["duv"]
    return out


def white_figures(xy, observer: str = "cie1931-2") -> list[dict]:
    """x, y, u', v', CCT and Duv for chromaticities of shape (n, 2) -> list of dicts; CCT and
    Duv against the Planckian locus of the same observer as the chromaticities."""
    xy = np.asarray(xy, dtype=float).reshape(-1, 2)
    uv = xy_to_uv_prime(xy)
    cct, duv = cct_duv_from_xy(xy, observer)
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
    colours: dict[str, dict] = field(default_factory=dict)
    spectra: dict[str, dict] = field(default_factory=dict)
    # measured indicator colours of inline units: serial -> colour name -> figures
    unit_colours: dict[str, dict] = field(default_factory=dict)

    def as_json(self) -> dict:
        d: dict = {"white": self.white, "primaries": self.primaries}
        if self.colours:
            d["colours"] = self.colours
        if self.spectra:
            d["spectra"] = self.spectra
        if self.npm is not None:
            d["npm"] = self.npm
            d["npm_inverse"] = self.npm_inverse
        d["gamut"] = self.gamut.as_json() if self.gamut else None
        return d


def derive(spec: Spec) -> Derived:
    ref_hulls = reference_hulls(spec)
    keys = sorted(set(CONTRACT_REFERENCES) | {g.reference for g in spec.gamut} | set(spec.references))
    white_xy = spec.white.xy if spec.white else None
    white = white_figures([white_xy], spec.observer)[0] if white_xy else None

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
    volume_refs = {g.reference for g in spec.gamut if g.metric == "volume-coverage"}
    if len(spec.primaries) >= 3:
        gamut = gamut_figures([p.xy for p in spec.primaries], ref_hulls, keys)
        gamut.volume = volume_figures(np.array(npm) if npm is not None else None, spec, volume_refs)

    colours = {}
    by_name = {c.name: c for c in spec.colours}
    for c in spec.colours:
        colours[c.name] = colour_figures([c.xy], [np.nan if c.Y is None else c.Y], c.reference_white,
                                         spec.observer)[0]

    # measured colours (inline and from measurement files), each colour's units at once; a unit's
    # colours keep the order it gives them in
    figs: dict[tuple[str, str], dict] = {}
    for name, c in by_name.items():
        serials = [s for s, cs in spec.unit_colours.items() if name in cs]
        if not serials:
            continue
        ms = [spec.unit_colours[s][name] for s in serials]
        out = colour_figures([m.xy for m in ms], [np.nan if m.Y is None else m.Y for m in ms],
                             c.reference_white, spec.observer)
        figs.update(((s, name), f) for s, f in zip(serials, out, strict=True))
    unit_colours = {s: {name: figs[(s, name)] for name in cs} for s, cs in spec.unit_colours.items()}
    spectra = {sd.key: spectrum_figures(sd, spec.observer) for sd in spec.spectra}
    return Derived(white, prims, npm, npm_inv, gamut, ref_hulls, colours, spectra, unit_colours)
