"""The spec format, version 1, declared once.

The validator, the key reference in docs/spec-keys.md and the editor JSON Schema are
all generated from the declarations below.
"""
from __future__ import annotations

from .problems import Problems, did_you_mean
from .types import INVALID, Custom, Field, Integer, ListOf, Number, Range, Record, Text, describe
from .yamlnodes import Map

SLUG = r"[a-z0-9][a-z0-9-]*"
NAME = r"[A-Za-z][A-Za-z0-9_-]*"
RESERVED_PRIMARY_NAMES = ("tolerance",)
UNIT_KEYS = ("serial", "lot", "supplier", "white", "notes", "colours")
RESERVED_COLOUR_NAMES = ("tolerance", "reference_white")
SHORT_TEXT = 500  # characters in a title, name, serial or lot: they go into tables and diagram legends


def _unit_interval(desc):
    return Number(desc, minimum=0.0, maximum=1.0)


_X = Field(_unit_interval("CIE 1931 x chromaticity coordinate"), True)
_Y = Field(_unit_interval("CIE 1931 y chromaticity coordinate"), True)
_U = Field(_unit_interval("CIE 1976 u' chromaticity coordinate"), True)
_V = Field(_unit_interval("CIE 1976 v' chromaticity coordinate"), True)
_CCT = Field(Number("correlated colour temperature, K", minimum=1000.0, maximum=100000.0, unit="K"),
             True)
_DUV = Field(Number("signed distance from the Planckian locus in CIE 1960 uv (positive above); "
                    "CIE 15 holds CCT meaningful within 0.05", minimum=-0.05, maximum=0.05))
MAX_TRISTIMULUS = 1e12  # CIE XYZ: far above any light source; keeps the sum X + Y + Z finite
_LUM = Field(Number("luminance, cd/m²", minimum=0.0, unit="cd/m2"))

BOX = Record({
    "dx": Field(Number("half-width in CIE 1931 x", exclusive_minimum=0.0, maximum=1.0), True),
    "dy": Field(Number("half-height in CIE 1931 y", exclusive_minimum=0.0, maximum=1.0), True),
}, "a rectangle centred on the target in CIE 1931 xy: |x − x0| <= dx and |y − y0| <= dy")

ELLIPSE = Record({
    "a": Field(Number("semi-major axis in CIE 1931 xy", exclusive_minimum=0.0, maximum=1.0), True),
    "b": Field(Number("semi-minor axis in CIE 1931 xy", exclusive_minimum=0.0, maximum=1.0), True),
    "angle": Field(Number("angle of the major axis from the +x axis, degrees",
                          minimum=-360.0, maximum=360.0), True),
}, "an ellipse centred on the target in CIE 1931 xy")

POINT_XY = Custom(lambda n, p, pr: _point_xy(n, p, pr),
                  {"type": "array", "items": {"type": "number", "minimum": 0, "maximum": 1},
                   "minItems": 2, "maxItems": 2},
                  "an [x, y] point in CIE 1931 xy", "an [x, y] pair")

REGION = ListOf(POINT_XY, "a polygon of [x, y] corners in CIE 1931 xy (may be non-convex)",
                min_items=3)


def _point_xy(node, path, problems):
    from .types import ListOf as _L

    v = _L(_unit_interval("x or y"), min_items=2, max_items=2).check(node, path, problems)
    return INVALID if v is INVALID else (v[0], v[1])


def _lamp_figure(record: Record, standards: dict, key: str, what: str):
    """Check a {standard, KEY, ...} mapping naming one figure of a lighting standard's table."""
    def check(node, path, problems):
        v = record.check(node, path, problems)
        if v is INVALID:
            return v
        std = standards[v["standard"]]
        name = v[key]
        if name not in std.figures:
            known = [str(k) for k in std.figures]
            if isinstance(name, float):
                shown = f"{name:g}"
                hint = f"the nearest is {min(std.figures, key=lambda k: abs(k - name))}"
            else:
                shown, hint = repr(name), did_you_mean(name, known)
            problems.error(node.items[key].mark, f"{path}.{key}",
                           f"expected one of {', '.join(known)} (the {what} of {std.name}), found {shown}", hint)
            return INVALID
        return v
    return check


def _ellipse_of() -> Custom:
    from ..data.lamp_standards import ELLIPSE_STANDARDS

    rec = Record({
        "standard": Field(Text("the standard: iec-60081 (IEC 60081 Annex D, double-capped fluorescent lamps; "
                               "values recalled from memory)", choices=tuple(ELLIPSE_STANDARDS)), True),
        "colour": Field(Text("the standard colour, e.g. F4000 (checked against the named standard's table)"),
                        True),
        "steps": Field(Number("size n of the ellipse: n times the tabulated 1-step semi-axes",
                              exclusive_minimum=0.0, maximum=20.0), True),
    }, "an n-step ellipse tabulated by a lighting standard at a fixed centre")
    schema = rec.json_schema()
    schema["properties"]["colour"]["enum"] = sorted({c for s in ELLIPSE_STANDARDS.values() for c in s.figures})
    return Custom(_lamp_figure(rec, ELLIPSE_STANDARDS, "colour", "standard colours"), schema,
                  "the n-step ellipse a lighting standard tabulates for a standard lamp colour, centred on "
                  "the standard's centre (not the target), e.g. {standard: iec-60081, colour: F4000, steps: 5}; "
                  + "; ".join(f"{k}: {', '.join(s.figures)} ({s.confidence})" for k, s in ELLIPSE_STANDARDS.items())
                  + "; [M]: values recalled from memory",
                  "{standard, colour, steps}")


def _quadrangle_of() -> Custom:
    from ..data.lamp_standards import QUADRANGLE_STANDARDS

    rec = Record({
        "standard": Field(Text("the standard: ansi-c78.377-2008 (ANSI C78.377-2008, solid-state lighting; "
                               "values recalled from memory, centres confirmed by computation)",
                               choices=tuple(QUADRANGLE_STANDARDS)), True),
        "nominal_cct": Field(Number("the nominal CCT category, K, e.g. 4000", minimum=1000.0,
                                    maximum=100000.0, unit="K"), True),
    }, "a nominal-CCT quadrangle of a lighting standard")
    schema = rec.json_schema()
    schema["properties"]["nominal_cct"]["enum"] = sorted({k for s in QUADRANGLE_STANDARDS.values()
                                                         for k in s.figures})
    return Custom(_lamp_figure(rec, QUADRANGLE_STANDARDS, "nominal_cct", "nominal CCTs"), schema,
                  "the quadrangle of a nominal CCT category of a lighting standard, bounded by the isotherms "
                  "at target CCT ± tolerance and the lines of constant Duv at target Duv ± 0.006, e.g. "
                  "{standard: ansi-c78.377-2008, nominal_cct: 4000}; "
                  + "; ".join(f"{k}: {', '.join(map(str, s.figures))} K ({s.confidence})"
                              for k, s in QUADRANGLE_STANDARDS.items())
                  + "; [M+C]: values recalled from memory, centres confirmed by computation",
                  "{standard, nominal_cct}")


ELLIPSE_OF = _ellipse_of()
QUADRANGLE_OF = _quadrangle_of()


def _lamp_fields() -> dict[str, Field]:
    return {"ellipse_of": Field(ELLIPSE_OF, description=ELLIPSE_OF.description),
            "quadrangle_of": Field(QUADRANGLE_OF, description=QUADRANGLE_OF.description)}


def _tolerance(white: bool) -> Record:
    f = {
        "delta_uv": Field(Number("radius of a circle around the target in CIE 1976 u'v'",
                                 exclusive_minimum=0.0, maximum=1.0)),
        "box": Field(BOX, description=BOX.description),
        "ellipse": Field(ELLIPSE, description=ELLIPSE.description),
        "region": Field(REGION, description=REGION.description),
        "macadam_steps": Field(Number("size n of an n-step MacAdam ellipse around the target: the MacAdam "
                                      "(1942) ellipses interpolated at the target, scaled by n",
                                      exclusive_minimum=0.0, maximum=20.0)),
    }
    if white:
        f["cct"] = Field(Range("inclusive CCT range, K",
                               bound=Number(minimum=1000.0, maximum=100000.0)))
        f["duv"] = Field(Range("inclusive Duv range", bound=Number(minimum=-0.05, maximum=0.05)))
        f.update(_lamp_fields())
    return Record(f, "limits that must all hold")


WHITE_TOLERANCE = _tolerance(white=True)
COLOUR_TOLERANCE = _tolerance(white=False)

LIMITS = Custom(lambda n, p, pr: _limits(n, p, pr),
                {"type": "object", "properties": {k: {"type": "number", "minimum": 0}
                                                  for k in ("target", "min", "max")},
                 "additionalProperties": False},
                "target, min and max luminance, cd/m² (each optional)", "{target, min, max}")


def _limits(node, path, problems):
    r = Record({k: Field(Number(f"{k} luminance, cd/m²", minimum=0.0)) for k in ("target", "min", "max")})
    v = r.check(node, path, problems)
    if v is INVALID:
        return v
    if "min" in v and "max" in v and v["min"] > v["max"]:
        problems.error(node.mark, path, f"expected min <= max, found min {v['min']:g} > max {v['max']:g}")
        return INVALID
    return v


_SPECTRUM_INLINE = Record({
    "start": Field(Number("first wavelength, nm", minimum=200.0, maximum=1100.0), True),
    "step": Field(Number("wavelength interval, nm", exclusive_minimum=0.0, maximum=50.0), True),
    "values": Field(ListOf(Number(), "spectral values, one per wavelength from start", min_items=3), True),
    "scale": Field(Text("relative (default) or radiance: W·sr⁻¹·m⁻²·nm⁻¹, giving luminance in cd/m²",
                        choices=("relative", "radiance"))),
}, "a spectrum written inline: start, step and values")

_SPECTRUM_FILE = Record({
    "file": Field(Text("CSV file relative to the spec, inside the spec's folder: a 'wavelength' column "
                       "in nm, then one column per channel"), True),
    "channel": Field(Text("the column of the file to read"), True),
    "scale": Field(Text("relative (default) or radiance: W·sr⁻¹·m⁻²·nm⁻¹, giving luminance in cd/m²",
                        choices=("relative", "radiance"))),
}, "a spectrum read from one column of a CSV file")


def _spectrum(node, path, problems):
    if isinstance(node, Map) and "file" in node.items:
        v = _SPECTRUM_FILE.check(node, path, problems)
    else:
        v = _SPECTRUM_INLINE.check(node, path, problems)
    if v is INVALID:
        return v
    v.setdefault("scale", "relative")
    return v


SPECTRUM = Custom(_spectrum, {"oneOf": [_SPECTRUM_INLINE.json_schema(), _SPECTRUM_FILE.json_schema()]},
                  "a spectral power distribution, inline {start, step, values} or {file, channel}; "
                  "resampled to 1 nm (CIE 167:2005) and integrated with the spec's observer",
                  "{start, step, values} or {file, channel}")


def _forms(extra: dict[str, Field], names: bool, cct: bool, xyz: bool, lab: bool = False,
           spectrum: bool = True) -> dict[str, Record]:
    forms = {"xy": Record({"x": _X, "y": _Y, **extra}),
             "uv": Record({"u_prime": _U, "v_prime": _V, **extra})}
    if spectrum:
        forms["spectrum"] = Record({"spectrum": Field(SPECTRUM, True, SPECTRUM.description), **extra})
    if lab:
        lab_extra = {k: f for k, f in extra.items() if k != "Y"}
        forms["Lab"] = Record({
            "L": Field(Number("CIELAB lightness L*", minimum=0.0, maximum=100.0), True),
            "a": Field(Number("CIELAB a* (red-green)", minimum=-500.0, maximum=500.0), True),
            "b": Field(Number("CIELAB b* (yellow-blue)", minimum=-500.0, maximum=500.0), True),
            **lab_extra})
    if cct:
        forms["cct"] = Record({"cct": _CCT, "duv": _DUV, **extra})
    if xyz:
        forms["XYZ"] = Record({"X": Field(Number("CIE X", minimum=0.0, maximum=MAX_TRISTIMULUS), True),
                               "Y": Field(Number("CIE Y, cd/m²", minimum=0.0, maximum=MAX_TRISTIMULUS), True),
                               "Z": Field(Number("CIE Z", minimum=0.0, maximum=MAX_TRISTIMULUS), True), **extra})
    return forms


def chromaticity(description: str, *, extra: dict[str, Field] | None = None, names: bool = False,
                 cct: bool = False, xyz: bool = False, lab: bool = False) -> Custom:
    """A chromaticity in one of its written forms; returns {'form': ..., coordinates..., extras...}."""
    extra = extra or {}
    forms = _forms(extra, names, cct, xyz, lab)
    written = ["{x, y}", "{u_prime, v_prime}"] + (["{cct, duv}"] if cct else []) + (
        ["{X, Y, Z}"] if xyz else []) + (["{L, a, b}"] if lab else []) + ["{spectrum}"]
    if names:
        written.insert(0, "a named illuminant")

    def check(node, path, problems: Problems):
        if names and not isinstance(node, Map):
            v = Text().check(node, path, problems)
            return INVALID if v is INVALID else {"form": "name", "name": v}
        if not isinstance(node, Map):
            problems.error(node.mark, path, f"expected {' or '.join(written)}, found {describe(node)}")
            return INVALID
        keys = set(node.items)
        form = ("spectrum" if "spectrum" in keys else "xy" if keys & {"x", "y"}
                else "uv" if keys & {"u_prime", "v_prime"}
                else "cct" if cct and "cct" in keys else "XYZ" if xyz and keys & {"X", "Z"}
                else "Lab" if lab and keys & {"L", "a", "b"} else None)
        if form is None:
            problems.error(node.mark, path,
                           f"expected {' or '.join(written)}, found keys {', '.join(sorted(keys)) or 'none'}",
                           "give the coordinates as x and y, for example {x: 0.3127, y: 0.3290}")
            return INVALID
        v = forms[form].check(node, path, problems)
        if v is INVALID:
            return v
        return {"form": form, **v}

    alternatives = [f.json_schema() for f in forms.values()]
    if names:
        alternatives.insert(0, {"type": "string", "description": "a named illuminant"})
    return Custom(check, {"oneOf": alternatives}, description, " or ".join(written))


WHITE = Record({
    "target": Field(chromaticity("the white's target chromaticity", names=True, cct=True), True,
                    "a named illuminant (A, C, D50, D55, D65, D75, E, DCI), {x, y}, "
                    "{u_prime, v_prime}, {cct, duv} or {spectrum}"),
    "tolerance": Field(WHITE_TOLERANCE, description="limits on the white; every listed limit must hold"),
    "luminance": Field(LIMITS, description="white luminance limits, cd/m²"),
}, "the white point: target, tolerances and luminance")

PRIMARY = chromaticity("a primary's target chromaticity",
                       extra={"tolerance": Field(COLOUR_TOLERANCE,
                                                 description="this primary's own limits, replacing the default")})

PRIMARIES = Record({"tolerance": Field(COLOUR_TOLERANCE, description="default limits for every primary")},
                   "the display's primaries by name (three or more); their convex hull is the gamut",
                   extra=PRIMARY, extra_key=NAME,
                   extra_help="any other key names a primary, e.g. red: {x: 0.64, y: 0.33}",
                   expects="a mapping of primaries by name, e.g. red: {x: 0.64, y: 0.33}")

REFERENCE_NAMES = ("srgb", "bt709", "dci-p3", "display-p3", "bt2020", "adobe-rgb-1998", "ntsc-1953",
                   "ebu-3213", "smpte-c")

GAMUT_REQUIREMENT = Custom(lambda n, p, pr: _gamut_requirement(n, p, pr), {}, "", "")


def _gamut_requirement(node, path, problems):
    v = _GAMUT_RECORD.check(node, path, problems)
    if v is INVALID:
        return v
    if "min" not in v and "max" not in v:
        problems.error(node.mark, path, "expected a limit: min or max (percent), found neither",
                       "for example min: 95")
        return INVALID
    if "min" in v and "max" in v and v["min"] > v["max"]:
        problems.error(node.mark, path, f"expected min <= max, found min {v['min']:g} > max {v['max']:g}")
        return INVALID
    volume = v["metric"].startswith("volume")
    if volume and v.get("diagram", "lab") != "lab":
        problems.error(node.items["diagram"].mark, f"{path}.diagram", f"expected lab for a {v['metric']} "
                       f"requirement, found {v['diagram']}", "gamut volumes are taken in CIELAB; leave diagram out")
        return INVALID
    if not volume and v.get("diagram") == "lab":
        problems.error(node.items["diagram"].mark, f"{path}.diagram", f"expected xy or uv for a {v['metric']} "
                       "requirement, found lab", "lab is for metric: volume or volume-coverage")
        return INVALID
    v.setdefault("diagram", "lab" if volume else "xy")
    return v


_GAMUT_RECORD = Record({
    "reference": Field(Text("a named reference space or another spec's id", pattern=SLUG,
                            pattern_help="a reference name such as bt2020 or a spec id"), True,
                       "one of " + ", ".join(REFERENCE_NAMES) + ", or another spec's id"),
    "metric": Field(Text("coverage: share of the reference inside the gamut; area-ratio: gamut "
                         "area over reference area; volume: CIELAB gamut volume over the reference's; "
                         "volume-coverage: share of the reference's CIELAB volume inside the gamut",
                         choices=("coverage", "area-ratio", "volume", "volume-coverage")), True),
    "diagram": Field(Text("xy: CIE 1931; uv: CIE 1976 u'v' (default xy); lab: CIELAB, the only one "
                          "(and the default) for volume metrics", choices=("xy", "uv", "lab"))),
    "min": Field(Number("lowest allowed value, percent", minimum=0.0, unit="%")),
    "max": Field(Number("highest allowed value, percent", minimum=0.0, unit="%")),
    "note": Field(Text("why this requirement exists")),
}, "a requirement on the gamut of the primaries")
GAMUT_REQUIREMENT.schema = _GAMUT_RECORD.json_schema()
GAMUT_REQUIREMENT.expects = "a gamut requirement {reference, metric, diagram, min or max}"

MEASURED = chromaticity("a measured chromaticity, with luminance Y in cd/m² where known",
                        extra={"Y": _LUM}, xyz=True)

def _delta_e2000(node, path, problems):
    if isinstance(node, Map):
        return _DELTA_E2000_RECORD.check(node, path, problems)
    v = Number(exclusive_minimum=0.0).check(node, path, problems)
    return INVALID if v is INVALID else {"max": v}


_DELTA_E2000_RECORD = Record({
    "max": Field(Number("largest allowed CIEDE2000 difference", exclusive_minimum=0.0), True),
    "kL": Field(Number("parametric factor for lightness (1 for reference conditions)", exclusive_minimum=0.0)),
    "kC": Field(Number("parametric factor for chroma (1 for reference conditions)", exclusive_minimum=0.0)),
    "kH": Field(Number("parametric factor for hue (1 for reference conditions)", exclusive_minimum=0.0)),
}, "a CIEDE2000 limit with parametric factors")

DELTA_E2000 = Custom(_delta_e2000,
                     {"oneOf": [{"type": "number", "exclusiveMinimum": 0}, _DELTA_E2000_RECORD.json_schema()]},
                     "largest CIEDE2000 difference ΔE00 from the target (CIE 142-2001), a number or "
                     "{max, kL, kC, kH}; needs a luminance factor and a reference white",
                     "a number > 0 or {max, kL, kC, kH}")


def _colour_tolerance() -> Record:
    base = _tolerance(white=False)
    return Record({
        **base.fields,
        "delta_e2000": Field(DELTA_E2000, description=DELTA_E2000.description),
        "delta_e76": Field(Number("largest CIE 1976 ΔE*ab from the target (CIE 15:2004 §8.2.1); needs a "
                                  "luminance factor and a reference white", exclusive_minimum=0.0)),
        "dominant_wavelength": Field(Range("inclusive dominant-wavelength range, nm (CIE 15:2004 §9.1), "
                                           "relative to the reference white (equal-energy E if none)",
                                           bound=Number(minimum=360.0, maximum=830.0))),
        "excitation_purity": Field(Range("inclusive excitation-purity range, 0-1 (CIE 15:2004 §9.1)",
                                         bound=Number(minimum=0.0, maximum=1.0))),
        **_lamp_fields(),
    }, "limits on a colour; every listed limit must hold")


COLOUR_TOLERANCE_FULL = _colour_tolerance()
_Y_FACTOR = Field(Number("luminance factor Y, with the reference white at Y = 100", minimum=0.0))
REFERENCE_WHITE = chromaticity("the reference white for CIELAB and dominant wavelength", names=True)

COLOUR = Record({
    "target": Field(chromaticity("a colour's target", extra={"Y": _Y_FACTOR}, lab=True), True,
                    "{x, y}, {x, y, Y} (Y: luminance factor, reference white Y = 100), "
                    "{u_prime, v_prime} or CIELAB {L, a, b}"),
    "tolerance": Field(COLOUR_TOLERANCE_FULL, description="this colour's own limits, replacing the default"),
    "reference_white": Field(REFERENCE_WHITE, description="this colour's reference white, replacing the "
                             "section's: a named illuminant or {x, y}"),
    "note": Field(Text("what the colour is for")),
}, "an indicator, signal or brand colour: target, reference white and limits")

COLOURS = Record({
    "reference_white": Field(REFERENCE_WHITE, description="reference white for every colour: a named "
                             "illuminant or {x, y}; needed for CIELAB targets and ΔE limits"),
    "tolerance": Field(COLOUR_TOLERANCE_FULL, description="default limits for every colour"),
}, "indicator, signal or brand colours by name", extra=COLOUR, extra_key=NAME,
    extra_help="any other key names a colour, e.g. status-green: {target: {x: 0.17, y: 0.70}}",
    expects="a mapping of colours by name, e.g. status-green: {target: {x: 0.17, y: 0.70}}")

COLOUR_SAMPLE = chromaticity("a measured colour: {x, y, Y} with Y the luminance factor (reference white "
                             "Y = 100), {u_prime, v_prime} or CIELAB {L, a, b}",
                             extra={"Y": _Y_FACTOR}, lab=True)


UNIT_COLOURS = Record({}, "measured colours by name", extra=COLOUR_SAMPLE, extra_key=NAME,
                      extra_help="keys are the names of the spec's colours",
                      expects="a mapping of measured colours by name")

UNIT = Record({
    "serial": Field(Text("the unit's serial number", max_length=SHORT_TEXT), True),
    "lot": Field(Text("the production lot", max_length=SHORT_TEXT)),
    "supplier": Field(Text("who made and measured the unit", max_length=SHORT_TEXT)),
    "white": Field(MEASURED, description="measured white, {x, y, Y}"),
    "notes": Field(Text("free text about the unit")),
    "colours": Field(UNIT_COLOURS,
                     description="measured colours by the name of the spec's colours: {x, y, Y} "
                                 "with Y the luminance factor (reference white Y = 100) or {L, a, b}"),
}, "one measured unit; other keys are its measured primaries by name",
    extra=MEASURED, extra_key=NAME,
    extra_help="other keys are measured primaries and must match a primary's name")

UNCERTAINTY_QUANTITIES = {
    "xy": "x and y, for box, ellipse and region limits (an ellipse's radius takes U / b)",
    "delta_uv": "Δu'v' from a target",
    "cct": "correlated colour temperature, K",
    "duv": "Duv",
    "luminance": "luminance, cd/m², or a percentage of the measured value such as '2%'",
    "coverage": "gamut coverage and area ratio, percentage points",
    "luminance_uniformity": "luminance uniformity, percentage points",
    "colour_uniformity": "colour uniformity, Δu'v'",
}


def _uncertainty_value(node, path, problems):
    from .types import Scalar, describe

    if isinstance(node, Scalar) and node.text.strip().endswith("%"):
        t = node.text.strip()[:-1].strip()
        try:
            f = float(t)
        except ValueError:
            f = float("nan")
        if not (f == f) or f < 0 or f > 100:
            problems.error(node.mark, path, f"expected a percentage between 0 and 100, found {describe(node)}")
            return INVALID
        return {"relative": f / 100.0}
    v = Number(minimum=0.0).check(node, path, problems)
    return INVALID if v is INVALID else {"absolute": v}


UNCERTAINTY_VALUE = Custom(_uncertainty_value,
                           {"oneOf": [{"type": "number", "minimum": 0},
                                      {"type": "string", "pattern": "^[0-9.]+ ?%$"}]},
                           "expanded uncertainty U (k = 2) in the quantity's unit, or a percentage",
                           "a number, or a percentage such as '2%'")

UNCERTAINTY = Record({q: Field(UNCERTAINTY_VALUE, description=d) for q, d in UNCERTAINTY_QUANTITIES.items()},
                     "expanded measurement uncertainty U (coverage factor k = 2) per quantity; "
                     "quantities not named have U = 0")

UNIFORMITY = Record({
    "centre": Field(Text("label of the centre measurement point; its values are the unit's white "
                         "(default C)")),
    "luminance": Field(Record({"min": Field(Number("lowest allowed min/max luminance ratio, percent",
                                                   minimum=0.0, maximum=100.0, unit="%"), True)},
                              "luminance uniformity: lowest point over highest point, percent"),
                       description="luminance uniformity limit: {min: percent}"),
    "colour": Field(Record({
        "max": Field(Number("largest allowed Δu'v'", exclusive_minimum=0.0), True),
        "between": Field(Text("pairs: largest Δu'v' between any two points; centre: largest from the "
                              "centre point (default pairs)", choices=("pairs", "centre"))),
    }, "colour uniformity: largest Δu'v' over the measurement points"),
        description="colour uniformity limit: {max: Δu'v', between: pairs | centre}"),
}, "requirements over a unit's measurement points (e.g. a 3 x 3 grid) of the white")

MEASUREMENTS = ListOf(Text("path of a measurement file (.csv, or .cgats / .txt in CGATS.17), relative to "
                           "the spec file and inside the specs folder"),
                      "measurement files from instruments; their units are assessed like inline units")


# Python-Markdown takes time in the square of the number of '[' (4000 of them: 1.6 s) and
# recurses once per level of list nesting (500 levels: RecursionError); real notes need
# neither, so both are refused here, with the file and line, instead of failing at render.
MAX_NOTE_BRACKETS = 1000
MAX_NOTE_INDENT = 100


def _notes(node, path, problems):
    v = _NOTES_TEXT.check(node, path, problems)
    if v is INVALID:
        return v
    if v.count("[") > MAX_NOTE_BRACKETS:
        problems.error(node.mark, path, f"expected at most {MAX_NOTE_BRACKETS} '[' in the notes, "
                       f"found {v.count('[')}", "split the notes, or link less")
        return INVALID
    for i, line in enumerate(v.splitlines(), 1):
        wide = line.expandtabs(4)
        indent = len(wide) - len(wide.lstrip())
        if indent > MAX_NOTE_INDENT:
            problems.error(node.mark, path, f"expected notes indented at most {MAX_NOTE_INDENT} spaces, found "
                           f"{indent} on line {i} of the notes", "Markdown nests a level for every few spaces")
            return INVALID
    return v


_NOTES_TEXT = Text("Markdown notes shown on the spec page")
NOTES = Custom(_notes, {"type": "string"}, _NOTES_TEXT.description, "Markdown text")

SPEC = Record({
    "$schema": Field(Text("address of the editor JSON Schema (ignored by the tool)")),
    "spec": Field(Integer("format version", allowed=(1,)), True, "the format version: spec: 1"),
    "id": Field(Text("unique slug, used for URLs", pattern=SLUG,
                     pattern_help="a slug of lower-case letters, digits and hyphens"), True,
                "a unique slug such as orvane-27-studio"),
    "title": Field(Text("title of the spec", max_length=SHORT_TEXT)),
    "product": Field(Text("the product the spec is for", max_length=SHORT_TEXT)),
    "family": Field(Text("product family, for grouping on the index", max_length=SHORT_TEXT)),
    "category": Field(Text("kind of product; signal, safety and lighting specs carry a caution",
                           choices=("display", "indicator", "lighting", "signal", "safety"))),
    "revision": Field(Text("revision label", max_length=SHORT_TEXT)),
    "status": Field(Text("life-cycle status", choices=("draft", "released", "obsolete"))),
    "observer": Field(Text("standard observer of every chromaticity, the Planckian locus and CCT / Duv",
                           choices=("cie1931-2", "cie1964-10"))),
    "extends": Field(Text("id of a spec to inherit from", pattern=SLUG,
                          pattern_help="a spec id")),
    "owner": Field(Text("who owns the spec", max_length=SHORT_TEXT)),
    "notes": Field(NOTES),
    "white": Field(WHITE, description=WHITE.description),
    "primaries": Field(PRIMARIES, description=PRIMARIES.description),
    "gamut": Field(ListOf(GAMUT_REQUIREMENT, "requirements on the gamut"),
                   description="requirements on the gamut of the primaries"),
    "colours": Field(COLOURS, description=COLOURS.description),
    "units": Field(ListOf(UNIT, "measured units"), description="measured units, inline"),
    "measurements": Field(MEASUREMENTS, description=MEASUREMENTS.description),
    "decision_rule": Field(Text("simple: ILAC-G8:09/2019 §4.2.1, no guard band; guard-banded: §4.2.2-4.2.3 "
                                "with w = U, pass / indeterminate / fail (default simple)",
                                choices=("simple", "guard-banded"))),
    "uncertainty": Field(UNCERTAINTY, description=UNCERTAINTY.description),
    "uniformity": Field(UNIFORMITY, description=UNIFORMITY.description),
}, "a colour specification, format version 1")
