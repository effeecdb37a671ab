"""Print how long the demo site's diagrams take to draw and save as SVG (medians).

    OPENBLAS_NUM_THREADS=1 python benchmarks/figures.py

Not a test: timings on a shared machine vary; compare runs made one after the other.
"""
from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def main(repeats: int = 5) -> int:
    sys.path.insert(0, str(ROOT))
    from generator.build import evaluate
    from generator.render import site

    evaluated, _ = evaluate(ROOT / "specs")
    site.spec_figures(evaluated[0])  # warm-up: imports, fonts, cached static layers
    per_spec = []
    for _ in range(repeats):
        for e in evaluated:
            t0 = time.perf_counter()
            figs = site.spec_figures(e)
            per_spec.append((time.perf_counter() - t0) * 1000 / max(1, len(figs)))
    print(f"diagram (draw + SVG), median over {len(per_spec)} spec renders: "
          f"{statistics.median(per_spec):.1f} ms (min {min(per_spec):.1f}, max {max(per_spec):.1f})")
    return 0


if __name__ == "__main__":
    sys.exit(main())
