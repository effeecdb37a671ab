"""Measured spectra: resampling to the 1 nm table interval, integration to XYZ and
luminance, and the shape figures (peak, centroid, FWHM).

- Resampling: CIE 167:2005 (Sprague for uniform spacing, cubic spline for irregular).
- Integration: CIE 15:2004 §7.1, eq. 7.1 as a sum at the 1 nm interval of the
  colour-matching functions over 360-830 nm; the spectrum counts as zero outside its
  measured range (no extrapolation).
- Luminance: L = K_m Σ S(λ) ȳ(λ) Δλ with K_m = 683.002 lm/W (CIE 15:2004 §7.1; CIE S 017
  ILV 17-21-006) for spectral radiance in W·sr⁻¹·m⁻²·nm⁻¹.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from ..data import cmfs
from .convert import XYZ_to_xy
from .interpolation import SPRAGUE_MIN_POINTS, cubic_spline, sprague
from .spectral import K_M

UNIFORM_RTOL = 1e-6   # spacings within this fraction of each other count as uniform


@dataclass(frozen=True)
class Resampled:
    wavelengths: np.ndarray   # integer nm, 1 nm apart
    values: np.ndarray        # (..., n)
    method: str               # "none" (already at 1 nm), "sprague" or "cubic-spline"


def resample_to_1nm(wavelengths, values) -> Resampled:
    """Samples at any wavelengths to every whole nanometre inside their range."""
    wl = np.asarray(wavelengths, dtype=float)
    v = np.asarray(values, dtype=float)
    if wl.ndim != 1 or len(wl) < 3 or v.shape[-1] != len(wl) or np.any(np.diff(wl) <= 0):
        raise ValueError("a spectrum needs three or more strictly increasing wavelengths")
    step = np.diff(wl)
    whole = np.allclose(wl, np.round(wl), atol=1e-9)
    if whole and np.allclose(step, 1.0, atol=1e-9):
        return Resampled(np.round(wl), v.copy(), "none")
    grid = np.arange(np.ceil(wl[0] - 1e-9), np.floor(wl[-1] + 1e-9) + 1.0)
    uniform = np.allclose(step, step[0], rtol=UNIFORM_RTOL, atol=0)
    if uniform and len(wl) >= SPRAGUE_MIN_POINTS:
        return Resampled(grid, sprague(wl, v, grid), "sprague")
    return Resampled(grid, cubic_spline(wl, v, grid), "cubic-spline")


def on_cmf_grid(wavelengths_1nm, values, observer: str = "cie1931-2"):
    """A 1 nm spectrum placed on the 360-830 nm grid of the CMFs, zero outside its range."""
    grid, _ = cmfs(observer)
    wl = np.asarray(wavelengths_1nm, dtype=float)
    v = np.asarray(values, dtype=float)
    out = np.zeros(v.shape[:-1] + (len(grid),))
    lo = int(round(max(wl[0], grid[0]) - grid[0]))
    hi = int(round(min(wl[-1], grid[-1]) - grid[0]))
    if hi >= lo:
        a = int(round(grid[0] + lo - wl[0]))
        out[..., lo:hi + 1] = v[..., a:a + hi - lo + 1]
    return out


@lru_cache(maxsize=64)
def integration_weights(start_nm: int, n: int, observer: str = "cie1931-2") -> np.ndarray:
    """Weights (n, 3) that integrate a spectrum sampled at start_nm, start_nm + 1, ... (n
    values, 1 nm apart) in one matrix product: x̄, ȳ, z̄ · Δλ (Δλ = 1 nm) at each of its
    wavelengths, zero where the CMF table (360-830 nm) has no value. Cached per grid and
    observer; read-only."""
    grid, cmf = cmfs(observer)
    w = np.zeros((n, 3))
    lo = max(int(grid[0]), start_nm)
    hi = min(int(grid[-1]), start_nm + n - 1)
    if hi >= lo:
        w[lo - start_nm:hi - start_nm + 1] = cmf[lo - int(grid[0]):hi - int(grid[0]) + 1]
    w.setflags(write=False)
    return w


def spectrum_XYZ(wavelengths_1nm, values, observer: str = "cie1931-2"):
    """Tristimulus sums Σ S x̄ Δλ, Σ S ȳ Δλ, Σ S z̄ Δλ at Δλ = 1 nm (CIE 15:2004 eq. 7.1, k = 1),
    for spectra (..., n) at whole nanometres ``wavelengths_1nm``; zero outside 360-830 nm."""
    wl = np.asarray(wavelengths_1nm, dtype=float)
    values = np.asarray(values, dtype=float)
    # CIE 15:2004 eq. 7.1: X = k Σ S(λ) x̄(λ) Δλ, likewise Y and Z, as one product with cached weights
    return values @ integration_weights(int(round(wl[0])), len(wl), observer)


def luminance(XYZ_sum):
    """Luminance (cd/m²) of a spectral radiance whose Σ S ȳ Δλ is XYZ_sum[..., 1]."""
    # CIE 15:2004 §7.1: L_v = K_m Σ S(λ) V(λ) Δλ, K_m = 683.002 lm/W
    return K_M * np.asarray(XYZ_sum, dtype=float)[..., 1]


def peak_wavelength(wavelengths, values):
    """Wavelength of the largest value (nm); NaN for a spectrum without a positive value."""
    wl = np.asarray(wavelengths, dtype=float)
    v = np.asarray(values, dtype=float)
    i = np.nanargmax(np.where(np.isnan(v), -np.inf, v), axis=-1)
    peak = wl[i]
    return np.where(np.nanmax(np.where(np.isnan(v), -np.inf, v), axis=-1) > 0, peak, np.nan)


def centroid_wavelength(wavelengths, values):
    """Centroid wavelength Σ λ S(λ) / Σ S(λ) (nm), the spectrum's first moment."""
    wl = np.asarray(wavelengths, dtype=float)
    v = np.asarray(values, dtype=float)
    s = v.sum(axis=-1)
    with np.errstate(divide="ignore", invalid="ignore"):
        # first moment of the spectral distribution: λc = Σ λ S(λ) / Σ S(λ)
        return np.where(s > 0, (v * wl).sum(axis=-1) / s, np.nan)


def fwhm(wavelengths, values):
    """Full width at half maximum (nm) of the peak: the distance between the outermost
    half-maximum crossings on either side of the peak, linearly interpolated."""
    wl = np.asarray(wavelengths, dtype=float)
    v = np.asarray(values, dtype=float)
    flat = v.reshape(-1, v.shape[-1])
    out = np.full(len(flat), np.nan)
    for k, s in enumerate(flat):
        if not np.all(np.isfinite(s)) or s.max() <= 0:
            continue
        i = int(np.argmax(s))
        half = s[i] / 2.0
        left = np.nonzero(s[:i] < half)[0]
        right = np.nonzero(s[i:] < half)[0]
        if len(left) == 0 or len(right) == 0:
            continue   # the half maximum is not reached inside the measured range
        a = left[-1]
        b = i + right[0]
        # linear interpolation of the half-maximum crossings
        xa = wl[a] + (half - s[a]) * (wl[a + 1] - wl[a]) / (s[a + 1] - s[a])
        xb = wl[b - 1] + (half - s[b - 1]) * (wl[b] - wl[b - 1]) / (s[b] - s[b - 1])
        out[k] = xb - xa
    return out.reshape(v.shape[:-1])


def spectrum_chromaticity(wavelengths_1nm, values, observer: str = "cie1931-2"):
    """xy of a 1 nm spectrum."""
    return XYZ_to_xy(spectrum_XYZ(wavelengths_1nm, values, observer))
