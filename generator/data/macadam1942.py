"""MacAdam (1942) colour-matching ellipses, observer PGN.

Source: D. L. MacAdam, "Visual sensitivities to color differences in daylight", JOSA
32(5):247-274 (1942), doi:10.1364/JOSA.32.000247, as tabulated in Wyszecki & Stiles,
Color Science, 2nd ed. (1982/2000), Table 2(5.4.1): centres x0, y0 in CIE 1931 xy;
semi-axes a, b (×10⁻³ in xy) and angle θ (degrees) of the major axis, both as observed and
as calculated from MacAdam's smoothed coefficients. One ellipse is one standard deviation
of colour matching ("one step"). θ is taken from the +x axis towards +y (as read from the
table; the wording of secondary sources is ambiguous: from memory, not confirmed).
"""
from __future__ import annotations

import numpy as np

SOURCE = ("MacAdam (1942), JOSA 32(5):247, as tabulated in Wyszecki & Stiles (1982), Table 2(5.4.1), "
          "calculated semi-axes and angles")

# x0, y0, observed 10³a, 10³b, θ, calculated 10³a, 10³b, θ
_TABLE = np.array([
    [0.160, 0.057, 0.85, 0.35, 62.5, 0.94, 0.30, 62.3],
    [0.187, 0.118, 2.20, 0.55, 77.0, 2.31, 0.44, 74.8],
    [0.253, 0.125, 2.50, 0.50, 55.5, 2.49, 0.49, 54.8],
    [0.150, 0.680, 9.60, 2.30, 105.0, 9.09, 2.21, 102.9],
    [0.131, 0.521, 4.70, 2.00, 112.5, 4.67, 2.10, 110.5],
    [0.212, 0.550, 5.80, 2.30, 100.0, 5.63, 2.30, 100.0],
    [0.258, 0.450, 5.00, 2.00, 92.0, 4.54, 2.08, 88.5],
    [0.152, 0.365, 3.80, 1.90, 110.0, 3.81, 1.86, 111.0],
    [0.280, 0.385, 4.00, 1.50, 75.5, 4.26, 1.46, 74.6],
    [0.380, 0.498, 4.40, 1.20, 70.0, 4.23, 1.32, 69.4],
    [0.160, 0.200, 2.10, 0.95, 104.0, 2.08, 0.94, 95.4],
    [0.228, 0.250, 3.10, 0.90, 72.0, 3.09, 0.82, 70.9],
    [0.305, 0.323, 2.30, 0.90, 58.0, 2.55, 0.68, 57.2],
    [0.385, 0.393, 3.80, 1.60, 65.5, 3.70, 1.48, 65.5],
    [0.472, 0.399, 3.20, 1.40, 51.0, 3.21, 1.30, 54.0],
    [0.527, 0.350, 2.60, 1.30, 20.0, 2.56, 1.27, 22.8],
    [0.475, 0.300, 2.90, 1.10, 28.5, 2.89, 0.99, 29.1],
    [0.510, 0.236, 2.40, 1.20, 29.5, 2.40, 1.15, 30.7],
    [0.596, 0.283, 2.60, 1.30, 13.0, 2.49, 1.15, 11.1],
    [0.344, 0.284, 2.30, 0.90, 60.0, 2.24, 0.97, 65.7],
    [0.390, 0.237, 2.50, 1.00, 47.0, 2.43, 0.98, 44.2],
    [0.441, 0.198, 2.80, 0.95, 34.5, 2.73, 0.90, 33.7],
    [0.278, 0.223, 2.40, 0.55, 57.5, 2.34, 0.61, 60.3],
    [0.300, 0.163, 2.90, 0.60, 54.0, 3.01, 0.60, 53.4],
    [0.365, 0.153, 3.60, 0.95, 40.0, 4.12, 0.90, 38.6],
])
_TABLE.setflags(write=False)

CENTRES = _TABLE[:, 0:2]
OBSERVED = _TABLE[:, 2:5] * (1e-3, 1e-3, 1.0)     # a, b in xy, θ in degrees
CALCULATED = _TABLE[:, 5:8] * (1e-3, 1e-3, 1.0)
