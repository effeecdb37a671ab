"""A synthetic spec library for the benchmark: invented panels, lots and units.

Every spec has a white with a tolerance and three primaries with gamut rows in xy and
u'v' (so three diagrams: xy, u'v' and the white close-up); every fifth extends the spec
before it. ``lots`` specs, spread over the library, each read one measurement CSV of
``units`` units (a white and three primaries per unit, one lot per file). The numbers are
made up and seeded, so two runs write the same bytes.
"""
from __future__ import annotations

from pathlib import Path

import numpy as np

SPEC = """\
spec: 1
id: bench-panel-{i:03d}
title: Bench panel {i:03d}
product: Bench panel {i:03d}
family: Bench family {family}
revision: A
status: draft
decision_rule: guard-banded
uncertainty: {{xy: 0.001, delta_uv: 0.0008, luminance: '2%'}}
white:
  target: {{x: {wx:.4f}, y: {wy:.4f}}}
  tolerance: {{delta_uv: 0.004, cct: [6000, 7000]}}
  luminance: {{min: 250}}
primaries:
  red:   {{x: {rx:.4f}, y: 0.3300}}
  green: {{x: 0.3000, y: {gy:.4f}}}
  blue:  {{x: 0.1500, y: 0.0600}}
  tolerance: {{delta_uv: 0.008}}
gamut:
  - {{reference: srgb, metric: coverage, diagram: xy, min: 95}}
  - {{reference: dci-p3, metric: coverage, diagram: uv, min: 80}}
units:
  - {{serial: B{i:03d}-1, lot: L1, white: {{x: 0.3130, y: 0.3292, Y: 260}},
     red: {{x: {rx:.4f}, y: 0.3310}}, green: {{x: 0.3010, y: {gy:.4f}}}, blue: {{x: 0.1505, y: 0.0605}}}}
{measurements}"""

CHILD = """\
spec: 1
id: bench-panel-{i:03d}
extends: bench-panel-{p:03d}
title: Bench panel {i:03d}, variant
white:
  luminance: {{min: 300}}
"""

CHANNELS = {"white": (0.3127, 0.3290, 280.0), "red": (0.640, 0.330, 60.0),
            "green": (0.300, 0.600, 190.0), "blue": (0.150, 0.060, 30.0)}


def spec_name(i: int) -> str:
    return f"bench-panel-{i:03d}.yaml"


def lot_specs(n_specs: int, n_lots: int) -> list[int]:
    """Indices of the specs that read a lot file: spread evenly, never a child spec."""
    if n_lots <= 0:
        return []
    picks = []
    for k in range(n_lots):
        i = (k * n_specs) // n_lots
        i -= 1 if i % 5 == 4 else 0
        picks.append(i)
    return sorted(set(picks))


def lot_csv(i: int, n_units: int, seed: int) -> str:
    """One lot of ``n_units`` units, four records each (white, red, green, blue)."""
    rng = np.random.default_rng(seed)
    lines = ["serial,lot,supplier,channel,x,y,Y"]
    spread = {"white": 0.0012, "red": 0.0025, "green": 0.0030, "blue": 0.0015}
    for ch, (x0, y0, Y0) in CHANNELS.items():
        x = x0 + rng.normal(0.0, spread[ch], n_units)
        y = y0 + rng.normal(0.0, spread[ch], n_units)
        Y = Y0 * (1.0 + rng.normal(0.0, 0.03, n_units))
        lines += [f"S{i:03d}-{u:05d},LOT-{i:03d},Bench Supplier,{ch},{x[u]:.5f},{y[u]:.5f},{Y[u]:.2f}"
                  for u in range(n_units)]
    return "\n".join(lines) + "\n"


def write_library(folder: Path, n_specs: int = 200, n_lots: int = 20, n_units: int = 5000) -> dict:
    """Write the library into ``folder`` (created); returns what it holds."""
    folder.mkdir(parents=True)
    with_lots = set(lot_specs(n_specs, n_lots))
    for i in range(n_specs):
        if i % 5 == 4 and i not in with_lots:
            text = CHILD.format(i=i, p=i - 1)
        else:
            meas = ""
            if i in with_lots:
                name = f"measurements/lot-{i:03d}.csv"
                (folder / "measurements").mkdir(exist_ok=True)
                (folder / name).write_text(lot_csv(i, n_units, seed=i), encoding="utf-8")
                meas = f"measurements:\n  - {name}\n"
            text = SPEC.format(i=i, family=i // 20, wx=0.3127 + 0.0001 * (i % 7), wy=0.3290 - 0.0001 * (i % 5),
                               rx=0.640 + 0.001 * (i % 9), gy=0.600 + 0.002 * (i % 11), measurements=meas)
        (folder / spec_name(i)).write_text(text, encoding="utf-8")
    return {"specs": n_specs, "lots": len(with_lots), "units_per_lot": n_units,
            "units": len(with_lots) * n_units + n_specs, "lot_specs": sorted(with_lots)}


def edit_one(folder: Path, i: int, k: int = 0) -> Path:
    """Loosen one spec's white tolerance (the edit an author makes)."""
    p = folder / spec_name(i)
    text = p.read_text(encoding="utf-8")
    if "delta_uv: 0.004" not in text:
        raise ValueError(f"{p.name} has no white tolerance to edit")
    p.write_text(text.replace("delta_uv: 0.004", f"delta_uv: 0.00{5 + k}", 1), encoding="utf-8")
    return p
