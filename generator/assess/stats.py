"""Lot statistics per requirement: n, mean, standard deviation, extremes, share out of
tolerance, process capability, and the worst units."""
from __future__ import annotations

import numpy as np

WORST = 3


def capability(mean: float, s: float, lo, hi) -> tuple[float | None, float | None]:
    """(Cp, Cpk) for limits lo / hi (either may be None) from the mean and the sample SD.

    Montgomery, Introduction to Statistical Quality Control (7th ed.), §8.3:
    Cp = (USL − LSL) / 6σ; Cpk = min(USL − μ, μ − LSL) / 3σ; one-sided Cpu = (USL − μ) / 3σ,
    Cpl = (μ − LSL) / 3σ. σ is estimated by the sample standard deviation (n − 1).
    """
    if not (s > 0):
        return None, None
    cp = (hi - lo) / (6 * s) if lo is not None and hi is not None else None
    sides = []
    if hi is not None:
        sides.append((hi - mean) / (3 * s))
    if lo is not None:
        sides.append((mean - lo) / (3 * s))
    return cp, (min(sides) if sides else None)


def describe(values: np.ndarray, lo, hi) -> dict:
    """n, mean, sd (n − 1), min, max and percent outside [lo, hi] of finite ``values``."""
    v = values[np.isfinite(values)]
    n = int(v.size)
    if n == 0:
        return {"n": 0, "mean": None, "sd": None, "min": None, "max": None, "out_of_tolerance_percent": None,
                "cp": None, "cpk": None}
    mean = float(v.mean())
    sd = float(v.std(ddof=1)) if n > 1 else None
    out = np.zeros(n, bool)
    if lo is not None:
        out |= v < lo
    if hi is not None:
        out |= v > hi
    cp, cpk = capability(mean, sd, lo, hi) if sd is not None else (None, None)
    return {"n": n, "mean": mean, "sd": sd, "min": float(v.min()), "max": float(v.max()),
            "out_of_tolerance_percent": 100.0 * float(out.mean()), "cp": cp, "cpk": cpk}


def _series(c):
    """(suffix, values, lo, hi, form) for the statistics of a column; a box gives one per axis."""
    if c.parts:
        return [(f".{k}", c.parts[k], -c.limit[k], c.limit[k], "two-sided") for k in ("dx", "dy")]
    return [("", c.value, c.lo, c.hi, c.stat_form)]


def _smallest(values: np.ndarray, k: int) -> np.ndarray:
    """Positions of the k smallest values, as the first k of a stable argsort (NaN last),
    without sorting them all: a partition finds the k-th value, then only the values up to
    it are sorted."""
    if values.size <= 4 * k:
        return np.argsort(values, kind="stable")[:k]
    kth = np.partition(values, k - 1)[k - 1]
    if not np.isfinite(kth):
        return np.argsort(values, kind="stable")[:k]
    cand = np.flatnonzero(values <= kth)                 # ascending positions, ties included
    return cand[np.argsort(values[cand], kind="stable")][:k]


def lot_statistics(cols, table, members: np.ndarray) -> list[dict]:
    """Statistics of every column over the units at indices ``members``."""
    out = []
    serial = table.serial
    for c in cols:
        idx = members[c.code[members] >= 0]
        if idx.size == 0:
            continue
        order = idx[_smallest(c.margin[idx], WORST)]
        worst = [{"serial": serial[i], "margin": float(c.margin[i]) if np.isfinite(c.margin[i]) else None,
                  "verdict": ("pass", "indeterminate", "fail")[c.code[i]]} for i in order]
        for suffix, values, lo, hi, form in _series(c):
            d = describe(values[idx], lo, hi)
            limit = {k: v for k, v in (("min", lo), ("max", hi)) if v is not None}
            out.append({"id": c.id + suffix, "subject": c.subject, "quantity": c.quantity, "limit": limit,
                        **d, "capability_form": form, "worst": worst})
    return out
