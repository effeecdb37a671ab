"""Fixed chromaticity tolerance figures that lighting standards tabulate at nominal CCTs.

Two tables, each with its source, edition and how far its values can be trusted:

- IEC 60081, *Double-capped fluorescent lamps - Performance specifications*, Annex D
  (chromaticity coordinates of the standard lamp colours and their tolerance ellipses):
  the centres (x, y in CIE 1931) and the 1-step ellipse (semi-axes a, b in xy, angle θ of
  the major axis from the +x axis, degrees) of the standard colours F6500, F5000, F4000,
  F3500, F3000 and F2700. An n-step ellipse has semi-axes n·a, n·b. **Values recalled from
  memory, not checked against the standard text [M]**; the edition (IEC 60081:1997 and its
  amendments) is recalled too. Cross-checked only for plausibility: they are of the size
  and orientation of the MacAdam (1942) ellipses interpolated at the same centres
  (tests/test_colour_lamp_tolerance.py), not equal to them.

- ANSI C78.377-2008, *Specifications for the Chromaticity of Solid State Lighting
  Products*: the nominal-CCT quadrangles 2700 K to 6500 K, each bounded by the isotherms
  at target CCT ± tolerance and by the lines of constant Duv at target Duv ± 0.006 (CIE
  1960 uv). Target CCT, CCT tolerance and target Duv **recalled from memory [M]**; the
  centres these give (xy of target CCT and Duv) reproduce the centres remembered
  independently to 4 decimals, so the table counts as [M+C] (memory confirmed by
  computation), not as checked against the standard text. Not included, for low
  confidence: the 2200 K and 2500 K quadrangles of later editions, the 1800 K and 2000 K
  ones of the 2024 edition, and the 4-decimal Duv targets of later editions.
"""
from __future__ import annotations

from dataclasses import dataclass

MEMORY_NOTE = "values recalled from memory, not checked against the standard text"


@dataclass(frozen=True)
class StandardEllipse:
    colour: str
    centre: tuple[float, float]      # x, y (CIE 1931)
    a: float                         # 1-step semi-major axis in xy
    b: float                         # 1-step semi-minor axis in xy
    angle: float                     # major axis from +x, degrees


@dataclass(frozen=True)
class StandardQuadrangle:
    nominal_cct: int                 # K, the category's name
    cct: float                       # target CCT, K
    cct_tolerance: float             # ± K
    duv: float                       # target Duv
    duv_tolerance: float             # ±


@dataclass(frozen=True)
class LampStandard:
    key: str                         # as written in a spec
    name: str                        # how pages and messages name it, e.g. "ANSI C78.377-2008"
    title: str                       # e.g. "IEC 60081"
    edition: str
    clause: str
    subject: str
    confidence: str                  # "[M]" or "[M+C]", with MEMORY_NOTE on the page
    note: str                        # how the values were obtained, for the page
    figures: dict                    # colour name or nominal CCT -> StandardEllipse | StandardQuadrangle

    @property
    def citation(self) -> str:
        return f"{self.title} ({self.edition}), {self.clause}"


def _ellipse(colour, x, y, a, b, angle):
    return colour, StandardEllipse(colour, (x, y), a, b, angle)


IEC_60081 = LampStandard(
    key="iec-60081",
    name="IEC 60081",
    title="IEC 60081",
    edition="1997 with amendments, edition recalled from memory",
    clause="Annex D, standard lamp colours and their tolerance ellipses",
    subject="double-capped fluorescent lamps",
    confidence="[M]",
    note=f"the centres and 1-step ellipses are {MEMORY_NOTE}",
    figures=dict([
        # colour, x, y, a, b, θ (degrees)                     [M] IEC 60081 Annex D, from memory
        _ellipse("F6500", 0.313, 0.337, 0.00223, 0.00095, 58.23),
        _ellipse("F5000", 0.346, 0.359, 0.00274, 0.00118, 59.62),
        _ellipse("F4000", 0.380, 0.380, 0.00313, 0.00134, 54.00),
        _ellipse("F3500", 0.409, 0.394, 0.00317, 0.00139, 52.13),
        _ellipse("F3000", 0.440, 0.403, 0.00278, 0.00136, 53.13),
        _ellipse("F2700", 0.463, 0.420, 0.00258, 0.00137, 57.28),
    ]),
)


def _quad(nominal, cct, tol, duv):
    return nominal, StandardQuadrangle(nominal, cct, tol, duv, 0.006)


ANSI_C78_377_2008 = LampStandard(
    key="ansi-c78.377-2008",
    name="ANSI C78.377-2008",
    title="ANSI C78.377",
    edition="2008",
    clause="nominal CCT categories (quadrangles of target CCT ± tolerance and target Duv ± 0.006)",
    subject="solid-state lighting products",
    confidence="[M+C]",
    note=(f"the target CCTs, tolerances and Duvs are {MEMORY_NOTE}; the centres they give reproduce the centres "
          "remembered independently to 4 decimals"),
    figures=dict([
        # nominal K, target CCT K, ± K, target Duv (± 0.006)  [M+C] ANSI C78.377-2008, from memory
        _quad(2700, 2725.0, 145.0, 0.000),
        _quad(3000, 3045.0, 175.0, 0.000),
        _quad(3500, 3465.0, 245.0, 0.000),
        _quad(4000, 3985.0, 275.0, 0.001),
        _quad(4500, 4503.0, 243.0, 0.001),
        _quad(5000, 5028.0, 283.0, 0.002),
        _quad(5700, 5665.0, 355.0, 0.002),
        _quad(6500, 6530.0, 510.0, 0.003),
    ]),
)

ELLIPSE_STANDARDS: dict[str, LampStandard] = {IEC_60081.key: IEC_60081}
QUADRANGLE_STANDARDS: dict[str, LampStandard] = {ANSI_C78_377_2008.key: ANSI_C78_377_2008}


def standard_name(key: str) -> str:
    """The shown name of a standard by its key: "iec-60081" -> "IEC 60081"."""
    std = ELLIPSE_STANDARDS.get(key) or QUADRANGLE_STANDARDS[key]
    return std.name
