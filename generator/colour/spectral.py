"""Spectral integration and the spectral locus (CIE 15:2004 §7.1, summation at 1 nm)."""
from __future__ import annotations

from functools import cache

import numpy as np

from ..data import cmfs
from .convert import XYZ_to_xy, xy_to_uv_prime

# CIE 15:2004 / CIE S 017 (ILV 17-21-006): maximum luminous efficacy K_m, lm/W
K_M = 683.002


def spectrum_to_XYZ(values, observer: str = "cie1931-2", normalise_Y: float | None = None):
    """Integrate spectra sampled at 1 nm over 360-830 nm (shape (..., 471)) to XYZ.

    CIE 15:2004 eq. 7.1 as a sum at the table interval. With ``normalise_Y`` the result
    is scaled so that Y equals that value; otherwise the sum is returned as is.
    """
    _, cmf = cmfs(observer)
    values = np.asarray(values, dtype=float)
    XYZ = values @ cmf
    if normalise_Y is not None:
        with np.errstate(divide="ignore", invalid="ignore"):
            XYZ = XYZ * (normalise_Y / XYZ[..., 1:2])
    return XYZ


@cache
def spectral_locus_xy(observer: str = "cie1931-2") -> tuple[np.ndarray, np.ndarray]:
    """Return (wavelengths, xy) of the spectral locus at 1 nm, 360-830 nm.

    Chromaticity of each monochromatic stimulus is that of its CMF triple
    (CIE 15:2004 §7.1). Points where all three CMFs vanish are dropped.
    """
    wl, cmf = cmfs(observer)
    keep = cmf.sum(axis=1) > 0
    xy = XYZ_to_xy(cmf[keep])
    xy.setflags(write=False)
    return wl[keep], xy


def spectral_locus_uv(observer: str = "cie1931-2") -> tuple[np.ndarray, np.ndarray]:
    wl, xy = spectral_locus_xy(observer)
    return wl, xy_to_uv_prime(xy)
