"""Approximate sRGB swatches of chromaticities (a preview, never a measurement)."""
from __future__ import annotations

import numpy as np

# IEC 61966-2-1:1999, XYZ (D65) to linear sRGB
_M = np.array([[3.2406, -1.5372, -0.4986], [-0.9689, 1.8758, 0.0415], [0.0557, -0.2040, 1.0570]])


def srgb_encode(rgb):
    """The IEC 61966-2-1:1999 transfer function (encoding) on linear values in [0, 1]."""
    rgb = np.asarray(rgb, dtype=float)
    return np.where(rgb <= 0.0031308, 12.92 * rgb, 1.055 * np.power(np.clip(rgb, 0.0031308, None), 1 / 2.4) - 0.055)


def xy_to_preview_rgb(xy):
    """Chromaticities (..., 2) to encoded sRGB in [0, 1] at the brightest in-range level:
    negative channels (outside sRGB) clipped, then scaled so the largest channel is 1.
    NaN or y <= 0 gives black."""
    xy = np.asarray(xy, dtype=float)
    x, y = xy[..., 0], xy[..., 1]
    ok = np.isfinite(x) & np.isfinite(y) & (y > 0)
    ys = np.where(ok, y, 1.0)
    XYZ = np.stack([x / ys, np.ones_like(x), (1 - x - y) / ys], axis=-1)
    rgb = np.clip(np.where(ok[..., None], XYZ @ _M.T, 0.0), 0, None)
    rgb = rgb / np.maximum(rgb.max(axis=-1, keepdims=True), 1e-12)
    return srgb_encode(rgb)


def swatch_hex(xy) -> str:
    r, g, b = np.round(xy_to_preview_rgb(xy) * 255).astype(int)
    return f"#{r:02x}{g:02x}{b:02x}"
