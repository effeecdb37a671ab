"""Write the demo spectra CSV files of the Lumen 32 LED tile spec (invented data).

Each emitter is an asymmetric Gaussian in wavelength, a simple model of an LED's emission
band: a narrower short-wavelength side and a longer tail. The white is the sum of the three
emitters, weighted so that it lands near D65 at 800 cd/m²; the values are spectral radiance
in W·sr⁻¹·m⁻²·nm⁻¹ at 5 nm from 380 to 780 nm, as a spectroradiometer would report them.

Run from the project root:  python tools/demo_spectra.py
"""
from __future__ import annotations

from pathlib import Path

import numpy as np

from generator.colour.spectral import K_M
from generator.colour.spectrum import spectrum_XYZ

WL = np.arange(380.0, 781.0, 5.0)
FINE = np.arange(380.0, 781.0, 1.0)


def led(wl, peak, fwhm_left, fwhm_right):
    """Asymmetric Gaussian band: half widths at half maximum on each side of the peak."""
    s = np.where(wl < peak, fwhm_left, fwhm_right) / (2 * np.sqrt(2 * np.log(2)))
    return np.exp(-0.5 * ((wl - peak) / s) ** 2)


EMITTERS = {"red": (630.0, 16.0, 22.0), "green": (527.0, 28.0, 38.0), "blue": (458.0, 18.0, 26.0)}
UNIT_SHIFTS = {"L32-0107": ({"red": 1.5, "green": -2.0, "blue": 1.0}, (1.02, 0.99, 1.01)),
               "L32-0112": ({"red": -3.5, "green": 4.0, "blue": 2.5}, (0.93, 1.04, 1.06))}
WHITE_XY, WHITE_L = (0.3127, 0.3290), 800.0


def weights(shapes):
    """Radiance scales of the three emitters whose sum has the white's chromaticity and luminance."""
    XYZ = np.array([spectrum_XYZ(FINE, on(s)) for s in shapes]).T   # columns: R, G, B
    x, y = WHITE_XY
    target = np.array([x / y, 1.0, (1 - x - y) / y]) * WHITE_L / K_M
    return np.linalg.solve(XYZ, target)


def on(shape_fn):
    return shape_fn(FINE)


def shapes(shifts=None):
    shifts = shifts or {}
    return [lambda w, p=p, a=a, b=b, n=n: led(w, p + shifts.get(n, 0.0), a, b)
            for n, (p, a, b) in EMITTERS.items()]


DESIGN_WEIGHTS = weights(shapes())


def table(shifts=None, gains=(1.0, 1.0, 1.0)):
    """The emitters at the design drive (so a unit's white moves with its emitters), with
    the instrument's noise floor: values below 1e-6 of the peak read as 0."""
    fns = shapes(shifts)
    cols = {}
    for i, n in enumerate(EMITTERS):
        v = gains[i] * DESIGN_WEIGHTS[i] * fns[i](WL)
        cols[n] = np.where(v < 1e-6 * v.max(), 0.0, v)
    cols["white"] = sum(cols.values())
    return cols


def write(path: Path, header: list[str], blocks: dict[str, dict[str, np.ndarray]]):
    names = ["wavelength"]
    data = [WL]
    for prefix, cols in blocks.items():
        for n, v in cols.items():
            names.append(f"{prefix}{n}")
            data.append(v)
    lines = [f"# {h}" for h in header] + [",".join(names)]
    for row in np.array(data).T:
        lines.append(f"{row[0]:.0f}," + ",".join(f"{v:.6e}" for v in row[1:]))
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")


if __name__ == "__main__":
    out = Path("specs/spectra")
    out.mkdir(parents=True, exist_ok=True)
    common = ["Invented demo data: asymmetric-Gaussian LED model (tools/demo_spectra.py)",
              "spectral radiance, W/(sr m2 nm), 380-780 nm at 5 nm"]
    write(out / "lumen-32-design.csv", ["Lumen 32 tile, design spectra of the three emitters and their white"]
          + common, {"": table()})
    write(out / "lumen-32-units.csv", ["Lumen 32 tile, spectra measured on two production tiles"] + common,
          {f"{serial}-": table(shift, gain) for serial, (shift, gain) in UNIT_SHIFTS.items()})
    print("wrote specs/spectra/lumen-32-design.csv and specs/spectra/lumen-32-units.csv")
