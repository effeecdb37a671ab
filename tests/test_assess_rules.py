"""Decision rules (ILAC-G8:09/2019 §4.2.1-4.2.3, w = U) at, inside and outside limit ± U,
for the scalar rule and its array form."""
from __future__ import annotations

import numpy as np
import pytest

from generator.assess.rules import CODES, DecisionRule, decide, decide_many
from generator.model import Uncertainty

GB = DecisionRule("guard-banded")
SIMPLE = DecisionRule("simple")
U = 0.0015
TL = 0.005                                   # an upper tolerance limit, e.g. Δu'v' <= 0.005
d = 1e-6                                     # a step well above the rule's floating-point allowance

UPPER = [  # value, guard-banded verdict, simple verdict
    (TL - U - d, "pass", "pass"),            # inside the acceptance zone
    (TL - U, "pass", "pass"),                # exactly on the acceptance limit (inclusive)
    (TL - U + d, "indeterminate", "pass"),   # just inside the guard band
    (TL, "indeterminate", "pass"),           # on the tolerance limit
    (TL + d, "indeterminate", "fail"),
    (TL + U, "indeterminate", "fail"),       # exactly on the rejection limit
    (TL + U + d, "fail", "fail"),            # beyond it: non-conformity proven
]


@pytest.mark.parametrize("value,gb,simple", UPPER)
def test_upper_limit(value, gb, simple):
    assert decide(value, None, TL, U=U, rule=GB) == gb
    assert decide(value, None, TL, U=U, rule=SIMPLE) == simple
    assert CODES[int(decide_many(np.array([value]), None, TL, U, GB)[0])] == gb
    assert CODES[int(decide_many(np.array([value]), None, TL, U, SIMPLE)[0])] == simple


@pytest.mark.parametrize("value,gb", [(6230.0 - 1e-3, "indeterminate"), (6230.0, "pass"), (6170.0, "indeterminate"),
                                      (6170.0 - 1e-3, "fail"), (6870.0, "pass"), (6870.001, "indeterminate"),
                                      (6930.0, "indeterminate"), (6930.001, "fail"), (6500.0, "pass")])
def test_two_sided_range_with_U_30_K(value, gb):
    assert decide(value, 6200.0, 6900.0, U=30.0, rule=GB) == gb
    assert CODES[int(decide_many([value], 6200.0, 6900.0, 30.0, GB)[0])] == gb


def test_array_form_agrees_with_the_scalar_rule_everywhere():
    rng = np.random.default_rng(4)
    v = np.concatenate([rng.uniform(0.002, 0.008, 3000), [TL, TL - U, TL + U, np.nan]])
    Us = rng.uniform(0, 0.002, v.size)
    for rule in (GB, SIMPLE):
        codes = decide_many(v, None, TL, Us, rule)
        assert [CODES[c] for c in codes] == [decide(float(x), None, TL, U=float(u), rule=rule)
                                             for x, u in zip(v, Us)]


def test_no_uncertainty_makes_the_guard_banded_rule_binary():
    assert decide(TL + d, None, TL, U=0.0, rule=GB) == "fail"
    assert decide_many([TL + d], None, TL, 0.0, GB)[0] == 2


def test_rule_carries_absolute_and_relative_uncertainties():
    unc = Uncertainty((("cct", 30.0, None), ("luminance", None, 0.02)))
    rule = DecisionRule("guard-banded", unc)
    assert rule.U("cct") == 30.0 and rule.U("duv") == 0.0
    assert rule.U("luminance", 250.0) == pytest.approx(5.0)
    assert rule.guard_band("cct") == 30.0 and DecisionRule("simple", unc).guard_band("cct") == 0.0
    j = rule.as_json()
    assert j["guard_band"] == "w = U" and j["coverage_factor"] == 2
    assert j["uncertainty"] == {"cct": 30.0, "luminance": {"relative_percent": 2.0}}
