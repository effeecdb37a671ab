"""Named illuminants and white points as CIE 1931 2° chromaticities.

Sources, per entry:
- A, C, D50, D55, D75: CIE 15:2004 Table T.3 (5-decimal forms as tabulated in the
  common 1 nm / 5 nm computations of CIE 15; A is a Planckian radiator at 2848 K with
  c2 = 1.435e-2 m·K, i.e. 2855.5 K with today's c2).
- D65: ITU-R BT.709-6 item 1.4 and IEC 61966-2-1 give x = 0.3127, y = 0.3290; this
  4-decimal form is the definition used by sRGB, BT.709, BT.2020 and Display P3.
- E: the equal-energy white, x = y = 1/3 by definition (CIE 15:2004 §3).
- DCI: the DCI-P3 creative white, SMPTE RP 431-2:2011 / DCI System Spec v1.2:
  x = 0.314, y = 0.351.
"""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Illuminant:
    name: str
    x: float
    y: float
    source: str


def _ill(name: str, x: float, y: float, source: str) -> Illuminant:
    return Illuminant(name, x, y, source)


ILLUMINANTS: dict[str, Illuminant] = {
    i.name: i
    for i in (
        _ill("A", 0.44757, 0.40745, "CIE 15:2004 Table T.3"),
        _ill("C", 0.31006, 0.31616, "CIE 15:2004 Table T.3"),
        _ill("D50", 0.34567, 0.35850, "CIE 15:2004 Table T.3"),
        _ill("D55", 0.33242, 0.34743, "CIE 15:2004 Table T.3"),
        _ill("D65", 0.3127, 0.3290, "ITU-R BT.709-6 §1.4; IEC 61966-2-1"),
        _ill("D75", 0.29902, 0.31485, "CIE 15:2004 Table T.3"),
        _ill("E", 1 / 3, 1 / 3, "CIE 15:2004 (equal-energy white, by definition)"),
        _ill("DCI", 0.314, 0.351, "SMPTE RP 431-2:2011; DCI System Specification"),
    )
}
