"""Reference colour spaces: primaries and white as CIE 1931 2° chromaticities.

Each entry names the standard and clause it comes from.
"""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class ReferenceSpace:
    key: str
    title: str
    primaries: tuple[tuple[float, float], ...]  # (x, y) for red, green, blue
    white: tuple[float, float]
    source: str


_D65 = (0.3127, 0.3290)
_BT709 = ((0.640, 0.330), (0.300, 0.600), (0.150, 0.060))
_P3 = ((0.680, 0.320), (0.265, 0.690), (0.150, 0.060))

REFERENCE_SPACES: dict[str, ReferenceSpace] = {
    s.key: s
    for s in (
        ReferenceSpace("srgb", "sRGB", _BT709, _D65, "IEC 61966-2-1:1999"),
        ReferenceSpace("bt709", "ITU-R BT.709", _BT709, _D65, "ITU-R BT.709-6 Part 1, items 1.3-1.4"),
        ReferenceSpace("dci-p3", "DCI-P3", _P3, (0.314, 0.351), "SMPTE RP 431-2:2011"),
        ReferenceSpace("display-p3", "Display P3 (P3-D65)", _P3, _D65, "SMPTE EG 432-1:2010 (P3 primaries, D65 white)"),
        ReferenceSpace("bt2020", "ITU-R BT.2020",
                       ((0.708, 0.292), (0.170, 0.797), (0.131, 0.046)), _D65,
                       "ITU-R BT.2020-2 Table 3"),
        ReferenceSpace("adobe-rgb-1998", "Adobe RGB (1998)",
                       ((0.6400, 0.3300), (0.2100, 0.7100), (0.1500, 0.0600)), _D65,
                       "Adobe RGB (1998) Color Image Encoding, version 2005-05"),
        ReferenceSpace("ntsc-1953", "NTSC 1953 (FCC)",
                       ((0.67, 0.33), (0.21, 0.71), (0.14, 0.08)), (0.310, 0.316),
                       "ITU-R BT.470-6 Table 1, System M (FCC 1953), illuminant C"),
        ReferenceSpace("ebu-3213", "EBU Tech 3213 (BT.601 625-line)",
                       ((0.640, 0.330), (0.290, 0.600), (0.150, 0.060)), _D65,
                       "EBU Tech. 3213-E (1975); ITU-R BT.601-7"),
        ReferenceSpace("smpte-c", "SMPTE C (BT.601 525-line)",
                       ((0.630, 0.340), (0.310, 0.595), (0.155, 0.070)), _D65,
                       "SMPTE RP 145; ITU-R BT.601-7"),
    )
}
