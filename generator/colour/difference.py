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


def _ciede2000(Lab1, Lab2, kL, kC, kH):
    L1, a1, b1 = Lab1[..., 0], Lab1[..., 1], Lab1[..., 2]
    L2, a2, b2 = Lab2[..., 0], Lab2[..., 1], Lab2[..., 2]
    # Sharma eq. 2-3: mean chroma C*ab and G
    Cab = 0.5 * (np.hypot(a1, b1) + np.hypot(a2, b2))
    Cab7 = Cab ** 7
    G = 0.5 * (1.0 - np.sqrt(Cab7 / (Cab7 + 25.0 ** 7)))
    # Sharma eq. 4-7: a', C', h' (h' = 0 where a' = b' = 0)
    a1p, a2p = (1.0 + G) * a1, (1.0 + G) * a2
    C1p, C2p = np.hypot(a1p, b1), np.hypot(a2p, b2)
    h1p = np.where(C1p == 0, 0.0, np.degrees(np.arctan2(b1, a1p)) % 360.0)
    h2p = np.where(C2p == 0, 0.0, np.degrees(np.arctan2(b2, a2p)) % 360.0)
    # Sharma eq. 8-10: ΔL', ΔC', Δh' (Δh' = 0 when either chroma is 0), ΔH'
    dLp = L2 - L1
    dCp = C2p - C1p
    dh = h2p - h1p
    dhp = np.where(dh > 180.0, dh - 360.0, np.where(dh < -180.0, dh + 360.0, dh))
    zero = (C1p * C2p) == 0
    dhp = np.where(zero, 0.0, dhp)
    dHp = 2.0 * np.sqrt(C1p * C2p) * np.sin(np.radians(dhp) / 2.0)
    # Sharma eq. 12-14: means L', C', h' (h' mean = sum when either chroma is 0)
    Lp = 0.5 * (L1 + L2)
    Cp = 0.5 * (C1p + C2p)
    hsum = h1p + h2p
    far = np.abs(h1p - h2p) > 180.0
    hp = np.where(far, np.where(hsum < 360.0, (hsum + 360.0) / 2.0, (hsum - 360.0) / 2.0), hsum / 2.0)
    hp = np.where(zero, hsum, hp)
    # Sharma eq. 15: T
    T = (1.0 - 0.17 * np.cos(np.radians(hp - 30.0)) + 0.24 * np.cos(np.radians(2.0 * hp))
         + 0.32 * np.cos(np.radians(3.0 * hp + 6.0)) - 0.20 * np.cos(np.radians(4.0 * hp - 63.0)))
    # Sharma eq. 16-21: Δθ, R_C, S_L, S_C, S_H, R_T and ΔE00
    dtheta = 30.0 * np.exp(-(((hp - 275.0) / 25.0) ** 2))
    Cp7 = Cp ** 7
    RC = 2.0 * np.sqrt(Cp7 / (Cp7 + 25.0 ** 7))
    SL = 1.0 + 0.015 * (Lp - 50.0) ** 2 / np.sqrt(20.0 + (Lp - 50.0) ** 2)
    SC = 1.0 + 0.045 * Cp
    SH = 1.0 + 0.015 * Cp * T
    RT = -np.sin(np.radians(2.0 * dtheta)) * RC
    tL, tC, tH = dLp / (kL * SL), dCp / (kC * SC), dHp / (kH * SH)
    return np.sqrt(tL * tL + tC * tC + tH * tH + RT * tC * tH)
