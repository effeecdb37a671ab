"""Resource limits for reading input, configurable with environment variables.

- COLOURSPEC_MAX_BYTES, default 8388608 (8 MiB): a YAML file larger than this, refused
  before it is read;
- COLOURSPEC_MAX_NODES, default 50000: a document with more values than this, counted
  while parsing and again once aliases are expanded (a "billion laughs" bomb);
- COLOURSPEC_MAX_DEPTH, default 64 (at most 200): mappings and lists nested deeper.

Each is refused with a FILE:LINE:COL problem (exit 2) before the document is built in
memory, so a hostile file costs time and memory in proportion to the limit, not to
what it would expand to. The node limit also bounds the work on a document that passes
it: a spec needs a few hundred values (a few thousand with many inline units), and
parsing 50000 values took about 0.6 s on a shared 2-core machine (bench/limits.py).
A setting that is not a whole number in range is a usage error (exit 2).
"""
from __future__ import annotations

import os
from dataclasses import dataclass


class LimitsError(Exception):
    pass


@dataclass(frozen=True)
class Limits:
    max_bytes: int = 8 * 1024 * 1024
    max_nodes: int = 50_000
    max_depth: int = 64


# variable -> (field, lowest, highest). Depth is capped because the document is walked
# recursively afterwards; 200 levels is far beyond any spec and well inside Python's stack.
VARIABLES = {
    "COLOURSPEC_MAX_BYTES": ("max_bytes", 1, 2**31),
    "COLOURSPEC_MAX_NODES": ("max_nodes", 1, 10**8),
    "COLOURSPEC_MAX_DEPTH": ("max_depth", 1, 200),
}
DEFAULTS = Limits()


def limits(environ=None) -> Limits:
    """The limits in force: defaults, overridden by COLOURSPEC_MAX_* variables."""
    env = os.environ if environ is None else environ
    values = {}
    for var, (name, lo, hi) in VARIABLES.items():
        raw = env.get(var)
        if raw is None or raw.strip() == "":
            continue
        text = raw.strip().replace("_", "")
        if not text.isascii() or not text.isdigit() or not lo <= int(text) <= hi:
            raise LimitsError(f"{var}: expected a whole number from {lo} to {hi}, found {raw!r}")
        values[name] = int(text)
    return Limits(**{**DEFAULTS.__dict__, **values})
