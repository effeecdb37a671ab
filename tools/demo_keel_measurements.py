"""Write the demo measurement files of the Keel 12 keypad spec's lot K2614 (invented data).

Two files, as a supplier's end-of-line station might send them:

- ``umbrin-lot-K2614.csv``: chromaticity and luminance (x, y, Y) of each unit's backlight
  white and emitters, and of the printed legend colour (channel ``colours.legend-teal``, Y
  its luminance factor under the station's D65 lamp);
- ``umbrin-lot-K2614-spectra.csv``: the spectrum of each status indicator (channel
  ``colours.NAME``), spectral radiance at 5 nm from 380 to 780 nm, with the indicator's
  luminance factor Y relative to the unit's white indicator at the same drive current.

Each indicator LED is an asymmetric Gaussian band (as tools/demo_spectra.py), its peak found
so that the design LED lands on the spec's target chromaticity; units shift the peak by a
fixed, invented amount. Unit KL12-04613's amber LED is 5 nm long: outside its
dominant-wavelength bin.

Run from the project root:  python tools/demo_keel_measurements.py
"""
from __future__ import annotations

from pathlib import Path

import numpy as np

from generator.colour.convert import XYZ_to_xy, xy_to_XYZ
from generator.colour.difference import Lab_to_XYZ
from generator.colour.spectrum import spectrum_XYZ

OUT = Path(__file__).resolve().parent.parent / "specs" / "measurements" / "keel-12"
WL = np.arange(380.0, 781.0, 5.0)
FINE = np.arange(380.0, 781.0, 1.0)
D65 = (0.3127, 0.3290)
SUPPLIER, LOT = "Umbrin Optoelectronics", "K2614"

# colour: (target x, y, Y from the spec), half widths at half maximum left / right (nm), radiance peak
INDICATORS = {
    "status-green": ((0.1700, 0.7000, 62.0), 21.0, 28.0, 0.0031),
    "status-amber": ((0.5750, 0.4240, 48.0), 7.0, 9.0, 0.0042),
    "status-red": ((0.7000, 0.2990, 18.0), 8.0, 11.0, 0.0050),
    "status-blue": ((0.1310, 0.0750, 7.0), 10.0, 14.0, 0.0046),
}
# serial: (peak shift per indicator, nm; luminance factor scale), invented
UNITS = {
    "KL12-04611": ({"status-green": 0.5, "status-amber": -0.5, "status-red": 1.0, "status-blue": 0.0}, 1.01),
    "KL12-04612": ({"status-green": -1.0, "status-amber": 1.0, "status-red": -0.5, "status-blue": 1.0}, 0.97),
    "KL12-04613": ({"status-green": 1.5, "status-amber": 5.0, "status-red": 0.0, "status-blue": -1.0}, 1.03),
}
# x, y, Y of the backlight white and emitters per unit (invented, near the spec's targets)
BACKLIGHT = {
    "KL12-04611": {"white": (0.3133, 0.3297, 412.0), "red": (0.6912, 0.3077, 88.1), "green": (0.1921, 0.7128, 291.0),
                   "blue": (0.1356, 0.0612, 33.4)},
    "KL12-04612": {"white": (0.3119, 0.3281, 405.3), "red": (0.6926, 0.3064, 86.9), "green": (0.1889, 0.7161, 287.4),
                   "blue": (0.1347, 0.0593, 32.8)},
    "KL12-04613": {"white": (0.3146, 0.3312, 418.8), "red": (0.6899, 0.3090, 89.5), "green": (0.1957, 0.7096, 296.2),
                   "blue": (0.1361, 0.0621, 34.0)},
}
# the printed legend under the station's D65 lamp, CIELAB (spec target L 55, a −32, b −8)
LEGEND = {"KL12-04611": (55.4, -31.6, -8.3), "KL12-04612": (54.7, -32.9, -7.4), "KL12-04613": (56.1, -30.8, -9.0)}


def band(wl, peak, left, right):
    s = np.where(wl < peak, left, right) / np.sqrt(2 * np.log(2))
    return np.exp(-0.5 * ((wl - peak) / s) ** 2)


def xy_of(peak, left, right):
    return XYZ_to_xy(spectrum_XYZ(FINE, band(FINE, peak, left, right)))


def design_peak(target_xy, left, right):
    """The peak wavelength (0.01 nm grid) whose band lies nearest the target chromaticity."""
    peaks = np.arange(430.0, 680.0, 0.01)
    XYZ = np.array([spectrum_XYZ(FINE, band(FINE, p, left, right)) for p in peaks[::100]])
    coarse = peaks[::100][np.argmin(np.hypot(*(XYZ_to_xy(XYZ) - np.array(target_xy)).T))]
    fine = np.arange(coarse - 1.0, coarse + 1.0, 0.01)
    d = [np.hypot(*(xy_of(p, left, right) - np.array(target_xy))) for p in fine]
    return float(fine[int(np.argmin(d))])


def main() -> None:
    OUT.mkdir(parents=True, exist_ok=True)
    lines = ["# Umbrin Optoelectronics, keypad end-of-line station 2, lot K2614 (invented demo data)",
             "# backlight through the legend diffuser: Y in cd/m²; colours.legend-teal: the printed legend",
             "# under the station's D65 lamp, Y its luminance factor (white tile Y = 100)",
             "serial,lot,supplier,channel,x,y,Y"]
    for serial, chans in BACKLIGHT.items():
        for ch, (x, y, Y) in chans.items():
            lines.append(f"{serial},{LOT},{SUPPLIER},{ch},{x:.4f},{y:.4f},{Y:.1f}")
        XYZ = Lab_to_XYZ(list(LEGEND[serial]), xy_to_XYZ(np.array(D65), 100.0))
        x, y = XYZ_to_xy(XYZ)
        lines.append(f"{serial},{LOT},{SUPPLIER},colours.legend-teal,{x:.4f},{y:.4f},{XYZ[1]:.2f}")
    (OUT / "umbrin-lot-K2614.csv").write_text("\n".join(lines) + "\n", encoding="utf-8")

    peaks = {name: design_peak(t[:2], left, right) for name, (t, left, right, _) in INDICATORS.items()}
    head = "serial,lot,supplier,channel,Y," + ",".join(f"{w:g}" for w in WL)
    lines = ["# Umbrin Optoelectronics, keypad end-of-line spectroradiometer, lot K2614 (invented demo data)",
             "# status indicators through the legend: spectral radiance, W/(sr m² nm), 380-780 nm at 5 nm;",
             "# Y: luminance factor against the unit's white indicator at the same drive current (= 100)",
             head]
    for serial, (shifts, gain) in UNITS.items():
        for name, (t, left, right, peak_radiance) in INDICATORS.items():
            s = peak_radiance * band(WL, peaks[name] + shifts[name], left, right)
            s[s < 1e-6 * peak_radiance] = 0.0
            Y = t[2] * gain
            lines.append(f"{serial},{LOT},{SUPPLIER},colours.{name},{Y:.1f}," + ",".join(f"{v:.6g}" for v in s))
    (OUT / "umbrin-lot-K2614-spectra.csv").write_text("\n".join(lines) + "\n", encoding="utf-8")
    print(f"wrote {OUT}/umbrin-lot-K2614.csv and umbrin-lot-K2614-spectra.csv; design peaks: "
          + ", ".join(f"{k} {v:.2f} nm" for k, v in peaks.items()))


if __name__ == "__main__":
    main()
