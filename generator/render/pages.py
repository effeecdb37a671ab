"""Pages: Jinja2 with autoescape and StrictUndefined; contexts are built here, so that
templates only lay out what they are given."""
from __future__ import annotations

import math
import os
from functools import lru_cache
from pathlib import Path

import jinja2
import markdown as md

from ..assess.rules import SYMBOL
from ..colour.cct import METHOD as CCT_METHOD
from ..colour.macadam import METHOD as MACADAM_METHOD
from ..data import ILLUMINANTS, OBSERVERS
from ..data.lamp_standards import ELLIPSE_STANDARDS, MEMORY_NOTE, QUADRANGLE_STANDARDS
from ..data.lamp_standards import standard_name as lamp_name

CAUTION_CATEGORIES = ("signal", "safety", "lighting")
CAUTION = ("The figures on this page are an engineering check of the specification. For signal, "
           "safety and lighting products the applicable regulations and standards, and testing by "
           "an accredited laboratory, govern conformity; do not use this page as a certificate.")


def templates_dir() -> Path:
    here = Path(__file__).resolve().parent.parent
    for cand in (here / "templates", here.parent / "templates"):
        if (cand / "base.html").is_file():
            return cand
    raise FileNotFoundError("templates folder not found beside the generator package")


class _TemplateCodeCache(jinja2.FileSystemBytecodeCache):
    """Compiled templates kept in the table cache folder (generator/tablecache.py): Jinja
    checks each file's template checksum and Python version; a folder that cannot be used
    only costs the compile (about 0.2 s a process)."""

    def load_bytecode(self, bucket) -> None:
        try:
            super().load_bytecode(bucket)
        except Exception:   # noqa: BLE001 -- a damaged file of any kind: compile again
            bucket.reset()

    def dump_bytecode(self, bucket) -> None:
        try:
            os.makedirs(self.directory, exist_ok=True)
            super().dump_bytecode(bucket)
        except OSError:
            pass


def _code_cache():
    from ..tablecache import cache_root

    root = cache_root()
    return _TemplateCodeCache(str(root / "templates")) if root is not None else None


@lru_cache(maxsize=1)
def environment() -> jinja2.Environment:
    env = jinja2.Environment(
        loader=jinja2.FileSystemLoader(str(templates_dir())),
        bytecode_cache=_code_cache(),
        autoescape=True,
        undefined=jinja2.StrictUndefined,
        trim_blocks=True,
        lstrip_blocks=True,
        keep_trailing_newline=True,
    )
    return env


def fmt(v, digits: int = 4) -> str:
    """Fixed formatting for numbers on pages; '—' for missing values."""
    if v is None or (isinstance(v, float) and not math.isfinite(v)):
        return "—"
    if isinstance(v, dict):
        return ", ".join(f"{k} {fmt(x, digits)}" for k, x in v.items() if not isinstance(x, list))
    if isinstance(v, (int, float)):
        return f"{v:.{digits}f}"
    return str(v)


_DIGITS = {"cct": 0, "duv": 4, "delta_uv": 4, "box": 4, "ellipse": 2, "region": 4,
           "luminance": 1, "coverage": 1, "area-ratio": 1, "volume": 1, "volume-coverage": 1,
           "delta_e2000": 2, "delta_e76": 2,
           "dominant_wavelength": 1, "excitation_purity": 3,
           "macadam_steps": 2, "ellipse_of": 2, "quadrangle_of": 4,
           "luminance_uniformity": 1, "colour_uniformity": 4}


def limit_text(row) -> str:
    lim, d = row["limit"], _DIGITS.get(row["quantity"], 4)
    unit = f" {row['unit']}" if row["unit"] and row["unit"] != "%" else row["unit"]
    if row["quantity"] == "box":
        return f"|Δx| ≤ {lim['dx']:.4f}, |Δy| ≤ {lim['dy']:.4f}"
    if row["quantity"] == "ellipse":
        return f"inside a = {lim['a']:.4f}, b = {lim['b']:.4f}, θ = {lim['angle']:g}°"
    if row["quantity"] == "region":
        return f"inside a {len(lim['polygon'])}-corner xy region"
    if row["quantity"] == "ellipse_of":
        return (f"≤ {lim['max']:g} steps of the {lamp_name(lim['standard'])} {lim['colour']} ellipse "
                f"{lim['confidence']}")
    if row["quantity"] == "quadrangle_of":
        c, u = lim["cct"], lim["duv"]
        return (f"inside the {lamp_name(lim['standard'])} {lim['nominal_cct']} K quadrangle ({c['min']:.0f}-"
                f"{c['max']:.0f} K, Duv {u['min']:+.4f} to {u['max']:+.4f}) {lim['confidence']}")
    lo, hi = lim.get("min"), lim.get("max")
    if row["quantity"] == "delta_e2000" and (lim["kL"], lim["kC"], lim["kH"]) != (1.0, 1.0, 1.0):
        return f"≤ {hi:.{d}f} (kL {lim['kL']:g}, kC {lim['kC']:g}, kH {lim['kH']:g})"
    if lo is not None and hi is not None:
        return f"{lo:.{d}f} to {hi:.{d}f}{unit}"
    if lo is not None:
        return f"≥ {lo:.{d}f}{unit}"
    return f"≤ {hi:.{d}f}{unit}"


def value_text(row) -> str:
    d = _DIGITS.get(row["quantity"], 4)
    v = row["value"]
    unit = f" {row['unit']}" if row["unit"] and row["unit"] != "%" else row["unit"]
    if isinstance(v, dict):
        return f"Δx {v['dx']:+.4f}, Δy {v['dy']:+.4f}"
    if v is None:
        return "—"
    return f"{v:.{d}f}{unit}"


def shortfall_text(row) -> str:
    """How far outside its limit a row lies, in the row's unit ('' when inside)."""
    m = row.get("margin")
    if m is None or m >= 0:
        return ""
    d = _DIGITS.get(row["quantity"], 4)
    unit = {"%": " points", "": ""}.get(row["unit"], f" {row['unit']}")
    return f"outside by {-m:.{max(d, 1)}f}{unit}"


def row_view(row) -> dict:
    return {"id": row["id"], "label": row["label"], "subject": row["subject"], "sample": row["sample"],
            "limit": limit_text(row), "value": value_text(row), "verdict": row["verdict"],
            "symbol": SYMBOL[row["verdict"]], "lot": row.get("lot", ""), "shortfall": shortfall_text(row)}


_ALLOWED_TAGS = {"p", "em", "strong", "code", "pre", "ul", "ol", "li", "a", "blockquote", "h3", "h4",
                 "table", "thead", "tbody", "tr", "th", "td", "br", "hr", "sub", "sup"}


def render_markdown(text: str) -> str:
    """Markdown notes to HTML, then sanitised (nh3): no script, no event handlers, no
    javascript: links, only the tags above."""
    import nh3

    html = md.markdown(text, extensions=["tables"], output_format="html")
    return nh3.clean(html, tags=_ALLOWED_TAGS, url_schemes={"http", "https", "mailto"},
                     link_rel="noopener noreferrer")


def methods(spec) -> list[tuple[str, str]]:
    extra = []
    if spec.colours:
        extra = [
            ("Colour differences", "CIELAB per CIE 15:2004 §8.2.1 relative to each colour's reference white "
                                   "(white Y = 100, no chromatic adaptation); CIEDE2000 per CIE 142-2001 as "
                                   "written out by Sharma, Wu & Dalal (2005), with the stated kL, kC, kH; "
                                   "ΔE*ab per CIE 15:2004 §8.2.1"),
            ("Colours: dominant wavelength", "CIE 15:2004 §9.1, relative to each colour's reference white, or "
                                             "to the equal-energy white E (x = y = 1/3) where none is stated"),
        ]
    if spec.observer != "cie1931-2":
        extra.append(("Observer and CCT", "chromaticities, the spectral locus, dominant wavelengths and spectra "
                                          "follow the spec's observer, and so do CCT / Duv: the nearest point "
                                          "of the Planckian locus integrated with the same observer, in the "
                                          "CIE 1960 uv diagram of that observer. CIE 15:2004 §9.5 states CCT "
                                          "for the CIE 1931 2° observer; a 10° chromaticity has no 2° "
                                          "equivalent without its spectrum, so these are the 10° counterparts "
                                          "of CCT and Duv, not the CIE-defined CCT"))
    tols = [spec.white.tolerance] if spec.white else []
    tols += [p.tolerance for p in spec.primaries] + [c.tolerance for c in spec.colours]
    if any(t.macadam_steps is not None for t in tols):
        extra.append(("MacAdam steps", MACADAM_METHOD))
    lamp = lamp_methods(tols)
    if lamp:
        extra.append(("Lighting-standard tolerances", lamp))
    if any(g.metric.startswith("volume") for g in spec.gamut) or (spec.white and len(spec.primaries) == 3):
        extra.append(("Gamut volume", "CIELAB gamut volume (the metric ICDM IDMS §5.32 recommends): the "
                                      "RGB cube's surface, 64 × 64 quads per face, through the NPM to XYZ and "
                                      "CIELAB (CIE 15:2004 §8.2.1) with the display's own white (white Y = 100; "
                                      "the white luminance cancels), volume by the divergence theorem; volume "
                                      "ratio = volume / reference volume (each with its own white); volume "
                                      "coverage = share of a 1 ΔE*ab grid over the reference solid inside the "
                                      "gamut, both with the reference's white, no chromatic adaptation"))
    if spec.spectra:
        extra.append(("Spectra", "resampled to 1 nm as CIE 167:2005 recommends (Sprague 1880 for uniform "
                                 "spacing, a natural cubic spline for irregular spacing); integrated per CIE "
                                 "15:2004 eq. 7.1 at 1 nm over 360-830 nm, zero outside the measured range; "
                                 "negative values (noise, interpolation ringing) set to zero; "
                                 "luminance of radiance spectra with K_m = 683.002 lm/W; FWHM of the highest "
                                 "peak, centroid = Σλ S(λ) / Σ S(λ)"))
    return extra + [
        ("Observer", OBSERVERS[spec.observer][1] + ", colour-matching functions at 1 nm, 360-830 nm "
                     "(CIE 018:2019)"),
        ("CCT and Duv", CCT_METHOD + "; Planck's law with c2 = 1.4388e-2 m·K; Duv in CIE 1960 uv, "
                                     "positive above the locus"),
        ("Chromaticity diagrams", "CIE 1931 xy and CIE 1976 u'v' (CIE 15:2004 §7-8)"),
        ("Gamut", "convex hull of the primaries; coverage = reference area inside the gamut / reference "
                  "area; area ratio = gamut area / reference area; both computed in the stated diagram"),
        ("RGB to XYZ", "normalized primary matrix, SMPTE RP 177-1993, white Y = 1"),
        ("Dominant wavelength", "CIE 15:2004 §9.1, relative to the spec's white target"),
        ("Decision rule", decision_text(spec)),
        ("Lot statistics", "sample standard deviation (n − 1); Cp = (USL − LSL) / 6s and Cpk = min(USL − mean, "
                           "mean − LSL) / 3s for two-sided limits, the one side for one-sided limits; a radial "
                           "limit (Δu'v' ≤ r, an ellipse, a region) is taken as one-sided upper: Cpk = (r − mean) / 3s "
                           "(Montgomery, Introduction to Statistical Quality Control, §8.3)"),
        ("Tolerance regions", "drawn to scale in the diagrams: Δu'v' circles in CIE 1976 u'v', boxes, ellipses "
                              "and regions in CIE 1931 xy, CCT × Duv quadrangles bounded by isotherms and lines "
                              "of constant Duv"),
        ("Diagram fill and swatches", "approximate sRGB previews (IEC 61966-2-1:1999 matrix and encoding, "
                                      "out-of-gamut colours clipped); they show where colours lie, not how a "
                                      "product looks, and take no part in any verdict"),
    ]


def lamp_methods(tols) -> str:
    """How the fixed figures of lighting standards were taken and assessed, with the standards,
    their editions and the marking of values recalled from memory; '' when none is used."""
    ellipses = sorted({t.ellipse_of.standard for t in tols if t.ellipse_of is not None})
    quads = sorted({t.quadrangle_of.standard for t in tols if t.quadrangle_of is not None})
    if not ellipses and not quads:
        return ""
    parts = []
    for key in ellipses:
        std = ELLIPSE_STANDARDS[key]
        parts.append(f"{std.name} ({std.edition}), {std.clause}: {std.note} {std.confidence}; an n-step "
                     "ellipse has n times the tabulated 1-step semi-axes and is centred on the standard "
                     "colour's centre, not on the target; a chromaticity's distance in steps is sqrt(dᵀ G d) "
                     "with G = R diag(1/a², 1/b²) Rᵀ, U in xy counting as U / b steps")
    for key in quads:
        std = QUADRANGLE_STANDARDS[key]
        parts.append(f"{std.name}, {std.clause}: {std.note} {std.confidence}; each quadrangle is bounded by "
                     "the isotherms at target CCT ± tolerance and the lines of constant Duv at target Duv ± "
                     "0.006 (CIE 1960 uv), drawn and assessed as that outline in xy (Duv edges sampled at 64 "
                     "points); the value is the xy distance outside it, 0 inside")
    parts.append(f"[M]: {MEMORY_NOTE}; [M+C]: recalled from memory and reproduced by an independent "
                 "computation. These are engineering checks against figures of lighting standards: for lamps "
                 "and luminaires the applicable regulations and the standards' own text, and testing by an "
                 "accredited laboratory, govern conformity")
    return ". ".join(parts)


_U_UNITS = {"cct": " K", "luminance": " cd/m²", "coverage": " percentage points",
            "luminance_uniformity": " percentage points"}


def uncertainty_text(spec) -> str:
    u = spec.uncertainty
    if u is None or not u.values:
        return "no measurement uncertainty stated (U = 0)"
    parts = [f"{q} {r * 100:g} % of the value" if r is not None else f"{q} {a:g}{_U_UNITS.get(q, '')}"
             for q, a, r in u.values]
    return "expanded uncertainty U (k = 2): " + "; ".join(parts)


def decision_text(spec) -> str:
    if spec.decision_rule == "guard-banded":
        rule = ("guard-banded acceptance, w = U (ILAC-G8:09/2019 §4.2.2-4.2.3): pass inside the limits "
                "narrowed by U, fail outside the limits widened by U, indeterminate between")
    else:
        rule = "simple acceptance (ILAC-G8:09/2019 §4.2.1): limits inclusive, guard band w = 0"
    return f"{rule}; {uncertainty_text(spec)}"


def illuminant_source(name: str) -> str:
    ill = ILLUMINANTS.get(name)
    return ill.source if ill else ""
