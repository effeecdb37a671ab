"""Decision rules: from a value, its limits and its uncertainty to a verdict.

Limits are inclusive. A value within EPS (scaled by the limit's size) of a limit counts
as on it, so that floating-point noise in a computed value cannot flip a verdict.

- simple acceptance (ILAC-G8:09/2019 §4.2.1, guard band w = 0): pass inside the
  limits, fail outside.
- guard-banded acceptance (ILAC-G8:09/2019 §4.2.2 and §4.2.3 with w = U): pass when
  the value lies inside the limits narrowed by the expanded uncertainty U, fail when
  it lies outside the limits widened by U, indeterminate in between.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

EPS = 1e-9

PASS, FAIL, INDETERMINATE = "pass", "fail", "indeterminate"
SYMBOL = {PASS: "✓", FAIL: "✗", INDETERMINATE: "?"}


@dataclass(frozen=True)
class DecisionRule:
    name: str = "simple"  # "simple" | "guard-banded"
    uncertainty: object = None  # model.Uncertainty: expanded U (k = 2) per quantity

    def describe(self) -> str:
        if self.name == "simple":
            return ("simple acceptance (ILAC-G8:09/2019 §4.2.1): pass when the value lies "
                    "within the limits, limits included")
        return ("guard-banded acceptance with w = U (ILAC-G8:09/2019 §4.2.2-4.2.3): pass inside "
                "the limits narrowed by U, fail outside the limits widened by U, indeterminate between")

    def U(self, quantity: str, value=None):
        """Expanded uncertainty (k = 2) of ``quantity`` at ``value``; 0 when none is stated."""
        return self.uncertainty.of(quantity, value) if self.uncertainty is not None else 0.0

    def guard_band(self, quantity: str, value=None):
        """w of ILAC-G8:09/2019 §4.1: U for guard-banded acceptance, 0 for simple acceptance."""
        return self.U(quantity, value) if self.name == "guard-banded" else 0.0

    def as_json(self) -> dict:
        return {"name": self.name,
                "clause": "ILAC-G8:09/2019 §4.2.1" if self.name == "simple" else "ILAC-G8:09/2019 §4.2.2-4.2.3",
                "guard_band": "w = 0" if self.name == "simple" else "w = U",
                "coverage_factor": 2,
                "uncertainty": self.uncertainty.as_json() if self.uncertainty is not None else {},
                "description": self.describe()}


SIMPLE = DecisionRule("simple")


def _eps(limit: float) -> float:
    return EPS * max(1.0, abs(limit))


def decide(value, lo=None, hi=None, U: float = 0.0, rule: DecisionRule = SIMPLE) -> str:
    """Verdict for a scalar value against inclusive limits lo <= value <= hi."""
    if value is None or value != value:  # None or NaN
        return INDETERMINATE
    w = U if rule.name == "guard-banded" else 0.0
    inside_narrow = ((lo is None or value >= lo + w - _eps(lo))
                     and (hi is None or value <= hi - w + _eps(hi)))
    if inside_narrow:
        return PASS
    outside_wide = ((lo is not None and value < lo - w - _eps(lo))
                    or (hi is not None and value > hi + w + _eps(hi)))
    return FAIL if outside_wide or w == 0 else INDETERMINATE


CODES = (PASS, INDETERMINATE, FAIL)   # verdict codes 0, 1, 2 in arrays; -1 = not assessed


def decide_many(value, lo=None, hi=None, U=0.0, rule: DecisionRule = SIMPLE) -> np.ndarray:
    """``decide`` over an array of values (U scalar or per value); verdict codes 0 / 1 / 2."""
    v = np.asarray(value, dtype=float)
    w = np.asarray(U, dtype=float) if rule.name == "guard-banded" else np.zeros(())
    ok = np.ones(v.shape, bool)
    out_ = np.zeros(v.shape, bool)
    with np.errstate(invalid="ignore"):
        if lo is not None:
            ok &= v >= lo + w - _eps(lo)
            out_ |= v < lo - w - _eps(lo)
        if hi is not None:
            ok &= v <= hi - w + _eps(hi)
            out_ |= v > hi + w + _eps(hi)
    code = np.where(ok, 0, np.where(out_ | (np.broadcast_to(w, v.shape) == 0), 2, 1)).astype(np.int8)
    return np.where(np.isnan(v), np.int8(1), code).astype(np.int8)


def margin(value, lo=None, hi=None):
    """Distance to the nearest limit, positive inside, negative outside."""
    if value is None or value != value:
        return None
    m = []
    if lo is not None:
        m.append(value - lo)
    if hi is not None:
        m.append(hi - value)
    return min(m) if m else None


def combine(verdicts) -> str:
    """A group's verdict: fail if any fails, else indeterminate if any is, else pass."""
    vs = set(verdicts)
    if FAIL in vs:
        return FAIL
    if INDETERMINATE in vs:
        return INDETERMINATE
    return PASS
