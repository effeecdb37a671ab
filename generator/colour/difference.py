"""Colour differences in CIELAB: CIE 1976 ΔE*ab and CIEDE2000, and XYZ to CIELAB.

Sources: CIE 15:2004 §8.2.1 (CIELAB, ΔE*ab); CIE 142-2001 and Sharma, Wu & Dalal (2005),
Color Res. Appl. 30(1):21-30, eqs. 1-21 (CIEDE2000, with the parametric factors kL, kC, kH).
Arrays in, arrays out: the last axis holds (L*, a*, b*); NaN in gives NaN out.
"""
from __future__ import annotations

import numpy as np

_EPSILON = (6.0 / 29.0) ** 3   # CIE 15:2004 §8.2.1: the cube-root branch holds above (24/116)^3
_KAPPA = (29.0 / 6.0) ** 2 / 3.0


def _lab(a):
    a = np.asarray(a, dtype=float)
    if a.shape[-1:] != (3,):
        raise ValueError(f"last axis must have length 3, got shape {a.shape}")
    return a


def _f(t):
    # CIE 15:2004 eq. 8.5: f(t) = t^(1/3) above (6/29)^3, else (841/108) t + 16/116
    with np.errstate(invalid="ignore"):
        return np.where(t > _EPSILON, np.cbrt(t), _KAPPA * t + 4.0 / 29.0)


def _f_inverse(f):
    # CIE 15:2004 eq. 8.5 inverted
    return np.where(f > 6.0 / 29.0, f ** 3, (f - 4.0 / 29.0) / _KAPPA)


def XYZ_to_Lab(XYZ, white_XYZ):
    """CIELAB of XYZ relative to the reference white XYZ (same scale, e.g. white Y = 1 or 100)."""
    XYZ, w = _lab(XYZ), _lab(white_XYZ)
    with np.errstate(divide="ignore", invalid="ignore"):
        r = XYZ / w
        r = np.where(w > 0, r, np.nan)   # a white without a positive X, Y or Z defines no CIELAB
        fx, fy, fz = _f(r[..., 0]), _f(r[..., 1]), _f(r[..., 2])
        # CIE 15:2004 eq. 8.4: L* = 116 f(Y/Yn) - 16, a* = 500 (f(X/Xn) - f(Y/Yn)), b* = 200 (f(Y/Yn) - f(Z/Zn))
        return np.stack([116.0 * fy - 16.0, 500.0 * (fx - fy), 200.0 * (fy - fz)], axis=-1)


def Lab_to_XYZ(Lab, white_XYZ):
    """XYZ of CIELAB relative to the reference white XYZ (inverse of XYZ_to_Lab)."""
    Lab, w = _lab(Lab), _lab(white_XYZ)
    fy = (Lab[..., 0] + 16.0) / 116.0
    fx = fy + Lab[..., 1] / 500.0
    fz = fy - Lab[..., 2] / 200.0
    return np.stack([_f_inverse(fx), _f_inverse(fy), _f_inverse(fz)], axis=-1) * w


def delta_e_76(Lab1, Lab2):
    """CIE 1976 colour difference ΔE*ab: Euclidean distance in CIELAB."""
    # CIE 15:2004 eq. 8.10: ΔE*ab = sqrt(ΔL*² + Δa*² + Δb*²)
    d = _lab(Lab1) - _lab(Lab2)
    return np.sqrt(np.sum(d * d, axis=-1))


def delta_e_2000(Lab1, Lab2, kL: float = 1.0, kC: float = 1.0, kH: float = 1.0):
    """CIEDE2000 colour difference ΔE00 with parametric factors kL, kC, kH (all 1 by default).

    Follows Sharma, Wu & Dalal (2005) eqs. 1-21, including their hue-mean and hue-difference
    branches for hues more than 180° apart and for zero chroma.
    """
    Lab1, Lab2 = np.broadcast_arrays(_lab(Lab1), _lab(Lab2))
    with np.errstate(invalid="ignore", over="ignore"):
        return _ciede2000(Lab1, Lab2, kL, kC, kH)


_25_7 = 25.0 ** 7
_DEG = np.pi / 180.0
# Sharma eq. 15 with T's four cosines from cos h', sin h' by the multiple-angle formulas:
# cos(h' − 30°) = cos h' cos 30° + sin h' sin 30°, cos(3h' + 6°) = cos 3h' cos 6° − sin 3h' sin 6°,
# cos(4h' − 63°) = cos 4h' cos 63° + sin 4h' sin 63°
_C30, _S30 = np.cos(30 * _DEG), np.sin(30 * _DEG)
_C6, _S6 = np.cos(6 * _DEG), np.sin(6 * _DEG)
_C63, _S63 = np.cos(63 * _DEG), np.sin(63 * _DEG)


def _hue_degrees(b, ap, Cp):
    # Sharma eq. 7: h' = atan2(b, a') in [0, 360), 0 where C' = 0
    h = np.degrees(np.arctan2(b, ap))
    return np.where(Cp == 0, 0.0, np.where(h < 0.0, h + 360.0, h))


def _ciede2000(Lab1, Lab2, kL, kC, kH):
    L1, a1, b1 = Lab1[..., 0], Lab1[..., 1], Lab1[..., 2]
    L2, a2, b2 = Lab2[..., 0], Lab2[..., 1], Lab2[..., 2]
    # Sharma eq. 2-3: mean chroma C*ab and G
    Cab = 0.5 * (np.sqrt(a1 * a1 + b1 * b1) + np.sqrt(a2 * a2 + b2 * b2))
    Cab7 = Cab ** 7
    G = 0.5 * (1.0 - np.sqrt(Cab7 / (Cab7 + _25_7)))
    # Sharma eq. 4-7: a', C', h' (h' = 0 where a' = b' = 0)
    a1p, a2p = (1.0 + G) * a1, (1.0 + G) * a2
    C1p, C2p = np.sqrt(a1p * a1p + b1 * b1), np.sqrt(a2p * a2p + b2 * b2)
    h1p, h2p = _hue_degrees(b1, a1p, C1p), _hue_degrees(b2, a2p, C2p)
    # Sharma eq. 8-10: ΔL', ΔC', Δh' (Δh' = 0 when either chroma is 0), ΔH'
    dLp = L2 - L1
    dCp = C2p - C1p
    dh = h2p - h1p
    C12 = C1p * C2p
    zero = C12 == 0
    dhp = np.where(zero, 0.0, np.where(dh > 180.0, dh - 360.0, np.where(dh < -180.0, dh + 360.0, dh)))
    dHp = 2.0 * np.sqrt(C12) * np.sin(dhp * (0.5 * _DEG))
    # Sharma eq. 12-14: means L', C', h' (h' mean = sum when either chroma is 0)
    Lp = 0.5 * (L1 + L2)
    Cp = 0.5 * (C1p + C2p)
    hsum = h1p + h2p
    far = np.abs(dh) > 180.0
    hp = np.where(zero, hsum, np.where(far, np.where(hsum < 360.0, hsum + 360.0, hsum - 360.0), hsum) * 0.5)
    # Sharma eq. 15: T = 1 − 0.17 cos(h' − 30°) + 0.24 cos 2h' + 0.32 cos(3h' + 6°) − 0.20 cos(4h' − 63°)
    hr = hp * _DEG
    c1, s1 = np.cos(hr), np.sin(hr)
    c2, s2 = 2.0 * c1 * c1 - 1.0, 2.0 * s1 * c1
    c3, s3 = c2 * c1 - s2 * s1, s2 * c1 + c2 * s1
    c4, s4 = 2.0 * c2 * c2 - 1.0, 2.0 * s2 * c2
    T = (1.0 - 0.17 * (c1 * _C30 + s1 * _S30) + 0.24 * c2 + 0.32 * (c3 * _C6 - s3 * _S6)
         - 0.20 * (c4 * _C63 + s4 * _S63))
    # Sharma eq. 16-21: Δθ, R_C, S_L, S_C, S_H, R_T and ΔE00
    x = (hp - 275.0) * (1.0 / 25.0)
    dtheta = 30.0 * np.exp(-(x * x))
    Cp7 = Cp ** 7
    RC = 2.0 * np.sqrt(Cp7 / (Cp7 + _25_7))
    L50 = (Lp - 50.0) ** 2
    SL = 1.0 + 0.015 * L50 / np.sqrt(20.0 + L50)
    SC = 1.0 + 0.045 * Cp
    SH = 1.0 + 0.015 * Cp * T
    RT = -np.sin(dtheta * (2.0 * _DEG)) * RC
    tL, tC, tH = dLp / (kL * SL), dCp / (kC * SC), dHp / (kH * SH)
    return np.sqrt(tL * tL + tC * tC + tH * tH + RT * tC * tH)
