"""Time reading, assessing and summarising a large lot (prints figures; not a test).

    OPENBLAS_NUM_THREADS=1 python tools/benchmark_lots.py [UNITS] [REPEATS]

Writes a spec and a CSV (white + three primaries per unit, four records a unit) and a
CGATS.17 file of the same units into a temporary folder, then times, as medians: reading
the file, loading + resolving the spec (which reads it), the column-wise assessment with
lot statistics, and building the per-unit entries and rows for results.json (both built
on first use, after the assessment).
"""
from __future__ import annotations

import os
import statistics
import sys
import tempfile
import time
from pathlib import Path

os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")

import numpy as np  # noqa: E402

from generator.assess.requirements import assess  # noqa: E402
from generator.derive import derive  # noqa: E402
from generator.measure.files import read  # noqa: E402
from generator.spec.load import load_specs  # noqa: E402

SPEC = """spec: 1
id: bench
white:
  target: D65
  tolerance: {delta_uv: 0.005, cct: [6200, 6900], duv: [-0.004, 0.006]}
  luminance: {min: 250}
primaries:
  red:   {x: 0.640, y: 0.330}
  green: {x: 0.300, y: 0.600}
  blue:  {x: 0.150, y: 0.060}
  tolerance: {delta_uv: 0.010}
gamut:
  - {reference: srgb, metric: coverage, diagram: xy, min: 95}
  - {reference: dci-p3, metric: area-ratio, diagram: uv, min: 70}
decision_rule: guard-banded
uncertainty: {xy: 0.002, delta_uv: 0.0015, cct: 30, luminance: '3%', coverage: 0.5}
measurements: [FILE]
"""


def write_lot(folder: Path, n: int) -> tuple[Path, Path]:
    rng = np.random.default_rng(1)
    targets = {"white": (0.3127, 0.3290), "red": (0.64, 0.33), "green": (0.30, 0.60), "blue": (0.15, 0.06)}
    serial = np.array([f"B{i:07d}" for i in range(n)])
    lot = np.array([f"LOT-{i % 20:02d}" for i in range(n)])
    lines = ["serial,lot,supplier,channel,x,y,Y"]
    sets = []
    for ch, (x0, y0) in targets.items():
        x = x0 + rng.normal(0, 0.0015, n)
        y = y0 + rng.normal(0, 0.0015, n)
        Y = rng.normal(290 if ch == "white" else 60, 8, n)
        lines += [f"{s},{lo},Tessaly Panel Works,{ch},{a:.5f},{b:.5f},{c:.2f}"
                  for s, lo, a, b, c in zip(serial, lot, x, y, Y)]
        sets += [f'{s} {lo} {ch} {a:.5f} {b:.5f} {c:.2f}' for s, lo, a, b, c in zip(serial, lot, x, y, Y)]
    csv = folder / "lot.csv"
    csv.write_text("\n".join(lines) + "\n")
    cg = folder / "lot.cgats"
    cg.write_text("\n".join(["CGATS.17", 'KEYWORD "LOT"', 'KEYWORD "CHANNEL"', 'KEYWORD "SUPPLIER"',
                             'SUPPLIER "Tessaly Panel Works"', "NUMBER_OF_FIELDS 6", "BEGIN_DATA_FORMAT",
                             "SAMPLE_ID LOT CHANNEL XYY_X XYY_Y XYY_CAPY", "END_DATA_FORMAT",
                             f"NUMBER_OF_SETS {len(sets)}", "BEGIN_DATA", *sets, "END_DATA"]) + "\n")
    return csv, cg


def median_time(f, repeats):
    times, out = [], None
    for _ in range(repeats):
        t0 = time.perf_counter()
        out = f()
        times.append(time.perf_counter() - t0)
    return statistics.median(times), out


def main() -> None:
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 100_000
    repeats = int(sys.argv[2]) if len(sys.argv) > 2 else 3
    with tempfile.TemporaryDirectory() as d:
        folder = Path(d)
        csv, cg = write_lot(folder, n)
        print(f"{n} units, {4 * n} records; CSV {csv.stat().st_size / 1e6:.1f} MB, CGATS {cg.stat().st_size / 1e6:.1f} MB")
        t, _ = median_time(lambda: read(csv, "lot.csv"), repeats)
        print(f"read CSV                      {t:6.2f} s")
        t, _ = median_time(lambda: read(cg, "lot.cgats"), repeats)
        print(f"read CGATS.17                 {t:6.2f} s")
        for name in ("lot.csv", "lot.cgats"):
            spec = folder / "bench.yaml"
            spec.write_text(SPEC.replace("FILE", name))
            t_load, (specs, _) = median_time(lambda: load_specs(spec), repeats)
            s = specs[0]
            der = derive(s)
            t_assess, a = median_time(lambda: assess(s, der), repeats)
            print(f"load + resolve ({name:9s})    {t_load:6.2f} s  (parse, group, physical checks)")
            print(f"assess + lot statistics       {t_assess:6.2f} s  ({len(a.columns)} requirements, "
                  f"{len(a.lots)} lots, verdict {a.verdict})")
        t_units, units = median_time(lambda: len(a.units) if not a.__dict__.pop("units", None) else len(a.units),
                                     1)
        print(f"per-unit entries (first use)   {t_units:5.2f} s  ({units} units: serial, verdict, failing rows)")
        t_rows, rows = median_time(lambda: len(a.rows) if not a.__dict__.pop("rows", None) else len(a.rows), 1)
        print(f"per-unit rows for results.json {t_rows:5.2f} s  ({rows} rows)")


if __name__ == "__main__":
    main()
