"""Typed specs: what the validator produces and every later stage reads.

Chromaticities are CIE 1931 (x, y) of the spec's observer; every written form (named
illuminant, u'v', CCT and Duv) is converted to xy once, when the spec is resolved.
"""
from __future__ import annotations

from dataclasses import dataclass, field

XY = tuple[float, float]


@dataclass(frozen=True)
class Tolerance:
    delta_uv: float | None = None
    box: tuple[float, float] | None = None            # (dx, dy) in xy
    ellipse: tuple[float, float, float] | None = None  # (a, b, angle in degrees) in xy
    region: tuple[XY, ...] | None = None              # polygon corners in xy
    cct: tuple[float | None, float | None] | None = None
    duv: tuple[float | None, float | None] | None = None

    def kinds(self) -> list[str]:
        return [k for k in ("delta_uv", "box", "ellipse", "region", "cct", "duv")
                if getattr(self, k) is not None]


@dataclass(frozen=True)
class White:
    xy: XY
    written: str            # how the spec gave it, e.g. "D65" or "CCT 6500 K, Duv 0.003"
    tolerance: Tolerance
    luminance: dict         # any of target / min / max, cd/m²


@dataclass(frozen=True)
class Primary:
    name: str
    xy: XY
    tolerance: Tolerance
    tolerance_from: str     # "own" or "default"


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
    metric: str             # "coverage" | "area-ratio"
    diagram: str            # "xy" | "uv"
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
    inherited: dict[str, str] = field(default_factory=dict)  # dotted key path -> ancestor id
    warnings: list = field(default_factory=list)             # Problem, severity "warning"
    # the merged source node (after inheritance), for locating rows in the YAML; not compared
    source: object = field(default=None, repr=False, compare=False)
    digest: str = ""   # sha256 of the spec file's bytes (the incremental build's cache key)
