"""Print how long the demo site's diagrams take to draw and save as SVG (medians).

    OPENBLAS_NUM_THREADS=1 python benchmarks/figures.py

Not a test: timings on a shared machine vary; compare runs made one after the other.
The in-memory memo of drawn diagrams is cleared before every draw, so each is drawn.
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
    from generator.render import diagrams as D

    evaluated, _ = evaluate(ROOT / "specs")
    D.spec_figures(evaluated[0])  # warm-up: imports, fonts, the static layers drawn once
    times: dict[str, list[float]] = {"xy": [], "uv": [], "white": []}
    for _ in range(repeats):
        for e in evaluated:
            for which in times:
                if which == "white" and e.spec.white is None:
                    continue
                layer = D.layer_for(e, which)
                D._SVG_MEMO.clear()
                t0 = time.perf_counter()
                D._draw(which, layer, "benchmark", "benchmark")
                times[which].append((time.perf_counter() - t0) * 1000)
    for which, ts in times.items():
        print(f"{which:>5}: median {statistics.median(ts):6.1f} ms over {len(ts)} draws "
              f"(min {min(ts):.1f}, max {max(ts):.1f})")
    return 0


if __name__ == "__main__":
    sys.exit(main())
