"""`colourspec new`: a commented starter spec that validates as written."""
from __future__ import annotations

import re
import sys
from pathlib import Path

STARTER = """\
# A colour specification, format version 1. Every key is described in docs/spec-keys.md.
spec: 1
id: {id}                     # unique slug, used in the site's URLs
title: {title}
product: {title}
revision: A
status: draft                # draft | released | obsolete
observer: cie1931-2          # cie1931-2 | cie1964-10

white:
  target: D65                # a named illuminant, {{x, y}}, {{u_prime, v_prime}} or {{cct, duv}}
  tolerance:
    delta_uv: 0.005          # radius in CIE 1976 u'v'
    cct: [6300, 6800]        # kelvin, inclusive
    duv: [-0.003, 0.006]
  luminance: {{min: 250}}      # cd/m²

primaries:                   # three or more; the gamut is their convex hull
  red:   {{x: 0.640, y: 0.330}}
  green: {{x: 0.300, y: 0.600}}
  blue:  {{x: 0.150, y: 0.060}}
  tolerance: {{delta_uv: 0.010}}

gamut:
  - {{reference: srgb, metric: coverage, diagram: xy, min: 95}}

# units:                     # measured units, inline
#   - serial: U0001
#     lot: L01
#     white: {{x: 0.3130, y: 0.3288, Y: 262}}
#     red:   {{x: 0.6391, y: 0.3305}}
#     green: {{x: 0.3008, y: 0.5990}}
#     blue:  {{x: 0.1502, y: 0.0604}}

# measurements:              # instrument files beside this spec (CSV or CGATS.17)
#   - measurements/lot-01.csv
# decision_rule: guard-banded  # simple (default) or guard-banded (ILAC-G8, w = U)
# uncertainty: {{xy: 0.002, delta_uv: 0.0015, cct: 30, luminance: '2%'}}   # expanded, k = 2

notes: |
  Why this spec exists and what it is for. *Markdown* is allowed.
"""


def write_starter(path: Path, spec_id: str | None) -> int:
    sid = spec_id or re.sub(r"[^a-z0-9-]+", "-", path.stem.lower()).strip("-") or "my-spec"
    if not re.fullmatch(r"[a-z0-9][a-z0-9-]*", sid):
        print(f"colourspec: error: --id must be a slug of lower-case letters, digits and hyphens, found {sid!r}",
              file=sys.stderr)
        return 2
    if path.exists():
        print(f"colourspec: error: {path} exists; refusing to overwrite it", file=sys.stderr)
        return 2
    path.parent.mkdir(parents=True, exist_ok=True)
    title = sid.replace("-", " ").capitalize()
    path.write_text(STARTER.format(id=sid, title=title), encoding="utf-8")
    print(f"Wrote {path}; check it with: colourspec check {path}")
    return 0
