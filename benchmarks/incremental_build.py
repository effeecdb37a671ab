"""Clean against incremental build of a generated library of specs.

    OPENBLAS_NUM_THREADS=1 python benchmarks/incremental_build.py [N] [--lots]

Writes N specs (default 200; every fifth extends the one before it) into a temporary
folder (with --lots every tenth spec also has 24 measured units in two lots, so that
the build draws lot and supplier pages with their diagrams and histograms), builds them
clean, rebuilds with nothing changed, edits one spec's tolerance and rebuilds, then
checks that the incremental site equals a full build byte for byte. Prints seconds and
the ratio; nothing is asserted about speed (no timed tests).
"""
from __future__ import annotations

import os
import statistics
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

SPEC = """\
spec: 1
id: bench-panel-{i:03d}
title: Bench panel {i:03d}
product: Bench panel {i:03d}
revision: A
status: draft
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
"""
CHILD = """\
spec: 1
id: bench-panel-{i:03d}
extends: bench-panel-{p:03d}
title: Bench panel {i:03d}, variant
white:
  luminance: {{min: 300}}
"""


def lot_units(i: int, count: int = 24) -> str:
    """``count`` more inline units of spec ``i`` in two lots from two suppliers (fixed offsets)."""
    rows = []
    for k in range(count):
        d = ((k * 7) % 11 - 5) * 0.0004
        rows.append(f"  - {{serial: B{i:03d}-L{k:02d}, lot: LOT{k % 2}, supplier: Supplier {k % 2},"
                    f" white: {{x: {0.3127 + d:.4f}, y: {0.3290 - d / 2:.4f}, Y: {255 + k}}},"
                    f" red: {{x: {0.640 + d:.4f}, y: 0.3300}}, green: {{x: 0.3000, y: {0.600 + d:.4f}}},"
                    f" blue: {{x: 0.1500, y: {0.0600 + d / 4:.4f}}}}}")
    return "\n".join(rows) + "\n"


def write_library(folder: Path, n: int, lots: bool = False) -> None:
    folder.mkdir(parents=True)
    for i in range(n):
        if i % 5 == 4:
            text = CHILD.format(i=i, p=i - 1)
        else:
            text = SPEC.format(i=i, wx=0.3127 + 0.0001 * (i % 7), wy=0.3290 - 0.0001 * (i % 5),
                               rx=0.640 + 0.001 * (i % 9), gy=0.600 + 0.002 * (i % 11))
            if lots and i % 10 == 0:
                text += lot_units(i)
        (folder / f"bench-panel-{i:03d}.yaml").write_text(text, encoding="utf-8")


def files_of(site: Path) -> dict[str, bytes]:
    return {p.relative_to(site).as_posix(): p.read_bytes() for p in sorted(site.rglob("*")) if p.is_file()}


def timed(fn):
    t0 = time.perf_counter()
    r = fn()
    return time.perf_counter() - t0, r


def main() -> int:
    from generator.build import build

    args = [a for a in sys.argv[1:] if a != "--lots"]
    n = int(args[0]) if args else 200
    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        os.chdir(tmp)
        specs, site = tmp / "specs", tmp / "site"
        write_library(specs, n, lots="--lots" in sys.argv)
        t_clean, s = timed(lambda: build(specs, site, clean=True))
        t_same, s_same = timed(lambda: build(specs, site))
        incs = []
        for k, i in enumerate((10, 57, 133)):  # three separate one-spec edits, median taken
            p = specs / f"bench-panel-{i:03d}.yaml"
            p.write_text(p.read_text(encoding="utf-8").replace("delta_uv: 0.004", f"delta_uv: 0.00{5 + k}"),
                         encoding="utf-8")
            t, s_inc = timed(lambda: build(specs, site))
            incs.append((t, s_inc.reused))
        t_full, _ = timed(lambda: build(specs, tmp / "full", incremental=False))
        identical = files_of(site) == files_of(tmp / "full")
        t_inc = statistics.median(t for t, _ in incs)
        print(f"{n} specs, {s.figures} diagrams")
        print(f"clean build:                 {t_clean:6.2f} s")
        print(f"rebuild, nothing changed:    {t_same:6.2f} s ({s_same.reused} pages reused)")
        print(f"rebuild after one edit:      {t_inc:6.2f} s median of {len(incs)} "
              f"({', '.join(f'{t:.2f} s, {r} reused' for t, r in incs)})")
        print(f"full build without cache:    {t_full:6.2f} s")
        print(f"clean / incremental:         {t_clean / t_inc:6.1f} x")
        print(f"incremental site == full build, byte for byte: {identical}")
        return 0 if identical else 1


if __name__ == "__main__":
    sys.exit(main())
