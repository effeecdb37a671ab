"""How long the demo site's figures take to draw as SVG (medians), every kind.

    python bench/figures.py          (bench/run.py includes these figures)

Not a test: timings on a shared machine vary; compare runs made one after the other.
The in-memory memo of drawn diagrams is cleared before every draw, so each is drawn.
The first diagram of a process (imports done, static layers not yet drawn) is timed
apart from the rest; histograms are timed per lot page (all of a lot's histograms,
divided by their number).
"""
from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
KINDS = ("xy", "uv", "white", "spectra", "volume")


def figure_times(repeats: int = 5) -> dict:
    """{"first_ms": ..., "<kind>": {"median_ms", "min_ms", "max_ms", "draws"}} for the demo specs."""
    sys.path.insert(0, str(ROOT))
    from generator.build import evaluate
    from generator.render import diagrams as D
    from generator.render import lots as L

    evaluated, _ = evaluate(ROOT / "specs")
    e0 = evaluated[0]
    layer = D.layer_for(e0, "xy")
    t0 = time.perf_counter()
    D._draw("xy", layer, "benchmark", "benchmark")
    first = (time.perf_counter() - t0) * 1000
    calls = []
    real = D._draw
    D._draw = lambda which, layer, title, desc: calls.append((which, layer, title, desc)) or real(which, layer,
                                                                                                  title, desc)
    for e in evaluated:
        D.spec_figures(e)   # warm-up: every kind drawn once, and the arguments of each draw kept
    D._draw = real
    times: dict[str, list[float]] = {k: [] for k in KINDS}
    for _ in range(repeats):
        for which, layer, title, desc in calls:
            D._SVG_MEMO.clear()
            t0 = time.perf_counter()
            D._draw(which, layer, title, desc)
            times[which].append((time.perf_counter() - t0) * 1000)
    hist = []
    for e in evaluated:
        a = e.assessment
        if a.table is None or not a.lots:
            continue
        lot_arr = np.array(a.table.lot, dtype=object)
        for lot in a.lots:
            members = np.flatnonzero(lot_arr == lot["lot"])
            for _ in range(repeats):
                t0 = time.perf_counter()
                n = len(L._histograms(e, members, "bench"))
                if n:
                    hist.append((time.perf_counter() - t0) * 1000 / n)
    out: dict = {"first_ms": first}
    for which, ts in [*times.items(), ("histogram", hist)]:
        if ts:
            out[which] = {"median_ms": statistics.median(ts), "min_ms": min(ts), "max_ms": max(ts), "draws": len(ts)}
    return out


def main(repeats: int = 5) -> int:
    t = figure_times(repeats)
    print(f"first diagram of the process (xy, static layers drawn): {t.pop('first_ms'):6.1f} ms")
    for which, r in t.items():
        print(f"{which:>9}: median {r['median_ms']:6.1f} ms over {r['draws']} draws "
              f"(min {r['min_ms']:.1f}, max {r['max_ms']:.1f})")
    return 0


if __name__ == "__main__":
    sys.exit(main())
