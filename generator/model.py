"""Typed specs: what the validator produces and every later stage reads.

Chromaticities are CIE 1931 (x, y) of the spec's observer; every written form (named
illuminant, u'v', CCT and Duv) is converted to xy once, when the spec is resolved.
"""
from __future__ import annotations

from dataclasses import dataclass, field

XY = tuple[float, float]


@dataclass(frozen=True, repr=False)
class FixedEllipse:
    """An n-step ellipse a lighting standard tabulates at a fixed centre (``ellipse_of``)."""
    standard: str               # key, e.g. "iec-60081"
    colour: str                 # e.g. "F4000"
    steps: float                # n
    centre: XY
    a: float                    # 1-step semi-axes in xy and major-axis angle, degrees
    b: float
    angle: float
    citation: str               # standard, edition and clause
    confidence: str             # "[M]": values recalled from memory

    def __repr__(self) -> str:   # as a diff shows it
        return f"{self.standard} {self.colour}, {self.steps:g} steps"


@dataclass(frozen=True, repr=False)
class FixedQuadrangle:
    """A nominal-CCT quadrangle of a lighting standard (``quadrangle_of``): CCT and Duv ranges."""
    standard: str               # key, e.g. "ansi-c78.377-2008"
    nominal_cct: int
    cct: tuple[float, float]    # isotherms bounding it, K
    duv: tuple[float, float]    # lines of constant Duv bounding it
    centre: XY                  # xy of the target CCT and Duv
    corners: tuple[XY, ...]     # xy(T0, D0), xy(T1, D0), xy(T1, D1), xy(T0, D1)
    outline: tuple[XY, ...]     # the edges sampled in xy (isotherms straight, Duv edges curved)
    citation: str
    confidence: str             # "[M+C]": recalled from memory, centres confirmed by computation

    def __repr__(self) -> str:   # as a diff shows it
        return f"{self.standard} {self.nominal_cct} K"


@dataclass(frozen=True)
class Tolerance:
    delta_uv: float | None = None
    box: tuple[float, float] | None = None            # (dx, dy) in xy
    ellipse: tuple[float, float, float] | None = None  # (a, b, angle in degrees) in xy
    region: tuple[XY, ...] | None = None              # polygon corners in xy
    cct: tuple[float | None, float | None] | None = None
    duv: tuple[float | None, float | None] | None = None
    delta_e2000: tuple[float, float, float, float] | None = None   # (max, kL, kC, kH)
    macadam_steps: float | None = None
    delta_e76: float | None = None
    dominant_wavelength: tuple[float | None, float | None] | None = None   # nm
    excitation_purity: tuple[float | None, float | None] | None = None
    ellipse_of: FixedEllipse | None = None
    quadrangle_of: FixedQuadrangle | None = None

    def kinds(self) -> list[str]:
        return [k for k in ("delta_uv", "box", "ellipse", "region", "cct", "duv", "delta_e2000", "delta_e76",
                            "macadam_steps", "dominant_wavelength", "excitation_purity", "ellipse_of",
                            "quadrangle_of")
                if getattr(self, k) is not None]


@dataclass(frozen=True)
class White:
    xy: XY
    written: str            # how the spec gave it, e.g. "D65" or "CCT 6500 K, Duv 0.003"
    tolerance: Tolerance
    luminance: dict         # any of target / min / max, cd/m²
    Y: float | None = None  # luminance of a target given as a radiance spectrum, cd/m²


@dataclass(frozen=True)
class Primary:
    name: str
    xy: XY
    tolerance: Tolerance
    tolerance_from: str     # "own" or "default"


@dataclass(frozen=True)
class SpectrumData:
    """A spectrum given where a chromaticity is accepted, already on a 1 nm grid."""
    key: str                 # where it was given, e.g. "white", "primaries.red", "units[0].red"
    label: str               # for legends, e.g. "red", "unit A0001 white"
    wavelengths: object      # np.ndarray, whole nm, 1 nm apart
    values: object           # np.ndarray
    interpolation: str       # "none", "sprague" or "cubic-spline" (CIE 167:2005)
    sampling: str            # how it was measured, e.g. "380-780 nm at 5 nm" or "irregular, 41 points"
    source: str              # "inline" or "file.csv, column red"
    scale: str               # "relative" or "radiance" (W·sr⁻¹·m⁻²·nm⁻¹)
    is_white: bool = False
    sample: str | None = None   # the unit's serial for a measured spectrum


@dataclass(frozen=True)
class Colour:
    """An indicator, signal or brand colour. Y is the luminance factor with the reference
    white at Y = 100 (None when the spec gives only a chromaticity)."""
    name: str
    xy: XY
    Y: float | None
    written: str
    reference_white: XY | None
    reference_white_written: str
    tolerance: Tolerance
    tolerance_from: str     # "own" or "default"
    note: str = ""


@dataclass(frozen=True)
class ReferenceGamut:
    key: str
    title: str
    primaries: tuple[XY, ...]
    white: XY
    source: str


@dataclass(frozen=True)
class GamutRequirement:
    index: int
    reference: str
    metric: str             # "coverage" | "area-ratio" | "volume" | "volume-coverage"
    diagram: str            # "xy" | "uv" | "lab" (volume metrics)
    min: float | None
    max: float | None
    note: str = ""


@dataclass(frozen=True)
class Measurement:
    xy: XY
    Y: float | None = None
    outside_locus: float = 0.0   # xy distance outside the locus (instrument noise), 0 inside


@dataclass(frozen=True)
class Unit:
    serial: str
    lot: str
    supplier: str
    white: Measurement | None
    primaries: dict[str, Measurement]
    notes: str = ""
    colours: dict[str, Measurement] = field(default_factory=dict)   # Y: luminance factor


@dataclass
class Spec:
    id: str
    file: str
    title: str
    product: str
    family: str
    category: str
    revision: str
    status: str
    observer: str
    extends: str
    owner: str
    notes: str
    white: White | None
    primaries: list[Primary]
    gamut: list[GamutRequirement]
    units: list[Unit]
    references: dict[str, ReferenceGamut]   # every named space plus specs named by gamut rows
    colours: list[Colour] = field(default_factory=list)
    spectra: list[SpectrumData] = field(default_factory=list)
    inherited: dict[str, str] = field(default_factory=dict)  # dotted key path -> ancestor id
    warnings: list = field(default_factory=list)             # Problem, severity "warning"
    # the merged source node (after inheritance), for locating rows in the YAML; not compared
    source: object = field(default=None, repr=False, compare=False)
    digest: str = ""   # sha256 of the spec file's bytes (the incremental build's cache key)
    # the other files the spec was read from (spectra CSV files), as written -> sha256 of their bytes
    input_files: dict[str, str] = field(default_factory=dict, compare=False)
    table: UnitTable | None = None                           # every measured unit, as columns
    decision_rule: str = "simple"                            # "simple" | "guard-banded"
    uncertainty: Uncertainty | None = None
    uniformity: Uniformity | None = None
    measurements: list = field(default_factory=list)        # measurement files read, as shown
    measurement_digests: list = field(default_factory=list)  # sha256 of each one's bytes (cache key)
    # measured colours of every unit, inline (units[].colours) and from measurement files
    # (channel colours.NAME): serial -> colour name -> Measurement (Y: luminance factor)
    unit_colours: dict = field(default_factory=dict)


@dataclass
class UnitTable:
    """Every measured unit of a spec (inline and from files), as columns.

    ``channels[name]`` is an (n, 3) array of x, y, Y for ``white`` or a primary, NaN where
    a unit has no measurement of that channel (Y NaN when only chromaticity was given).
    ``points`` holds the white's measurement points for uniformity: (n, P, 3), NaN-padded,
    with their labels in ``point_names``.
    """
    serial: list[str]
    lot: list[str]
    supplier: list[str]
    source: list[str]                     # "file:line" of each unit's first record
    channels: dict                        # name -> np.ndarray (n, 3)
    points: object = None                 # np.ndarray (n, P, 3) or None
    point_names: tuple = ()

    def __len__(self) -> int:
        return len(self.serial)

    def measured(self, channel: str):
        import numpy as np

        c = self.channels.get(channel)
        return np.zeros(len(self), bool) if c is None else np.isfinite(c[:, 0])


@dataclass(frozen=True)
class Uncertainty:
    """Expanded uncertainties (coverage factor k = 2) per assessed quantity; a relative
    value is a fraction of the measured value."""
    values: tuple = ()       # (quantity, absolute or None, relative or None)

    def of(self, quantity: str, value=None):
        for q, a, r in self.values:
            if q == quantity:
                if r is not None:
                    import numpy as np

                    return r * np.abs(value) if value is not None else 0.0
                return a
        return 0.0

    def as_json(self) -> dict:
        return {q: ({"relative_percent": r * 100} if r is not None else a) for q, a, r in self.values}


@dataclass(frozen=True)
class Uniformity:
    centre: str = "C"
    luminance_min: float | None = None     # percent, min/max x 100
    colour_max: float | None = None        # largest Δu'v'
    colour_between: str = "pairs"          # "pairs" | "centre"
