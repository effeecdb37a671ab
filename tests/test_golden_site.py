"""The demo site against the stored golden output (regenerate: python tests/regenerate_golden.py)."""
from __future__ import annotations

import json
import math

from .regenerate_golden import GOLDEN, golden_files

SIGNIFICANT = 10  # numbers in JSON compared to 10 significant digits: last-bit noise across numpy builds


def _round(v):
    if isinstance(v, float) and math.isfinite(v) and v != 0:
        return float(f"{v:.{SIGNIFICANT}g}")
    if isinstance(v, dict):
        return {k: _round(x) for k, x in v.items()}
    if isinstance(v, list):
        return [_round(x) for x in v]
    return v


def test_demo_site_matches_the_golden_output(demo_site):
    built = golden_files(demo_site)
    stored = {p.relative_to(GOLDEN).as_posix(): p.read_bytes() for p in GOLDEN.rglob("*") if p.is_file()}
    assert sorted(built) == sorted(stored), "pages added or removed: regenerate if intended"
    for rel in sorted(built):
        if rel.endswith(".json"):
            assert _round(json.loads(built[rel])) == _round(json.loads(stored[rel])), rel
        else:
            assert built[rel].decode() == stored[rel].decode(), rel
