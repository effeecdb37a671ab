"""Locating a requirement row in the YAML: the key that set its limit, through inheritance."""
from __future__ import annotations

from generator.spec.load import load_specs

PARENT = """\
spec: 1
id: base-panel
title: Base panel
white:
  target: D65
  tolerance: {cct: [6000, 7000], delta_uv: 0.004}
primaries:
  red:   {x: 0.640, y: 0.330, tolerance: {delta_uv: 0.002}}
  green: {x: 0.300, y: 0.600}
  blue:  {x: 0.150, y: 0.060}
  tolerance: {delta_uv: 0.005}
gamut:
  - {reference: srgb, metric: coverage, diagram: xy, min: 99}
"""

CHILD = """\
spec: 1
id: child-panel
extends: base-panel
title: Child panel
white:
  luminance: {min: 300}
units:
  - serial: U1
    white: {x: 0.3127, y: 0.3290, Y: 310}
    green: {x: 0.300, y: 0.600}
"""


def _located(spec_dir):
    from generator.spec.locate import locate_row

    spec_dir("base.yaml", PARENT)
    spec_dir("child.yaml", CHILD)
    specs, _ = load_specs(spec_dir.dir)
    by_id = {s.id: s for s in specs}

    def at(sid, rid, sample=None):
        m = locate_row(by_id[sid].source, {"id": rid, "sample": sample})
        return m.file.rsplit("/", 1)[-1], m.line, m.col
    return at


def test_white_tolerance_rows_point_at_their_tolerance_key(spec_dir):
    at = _located(spec_dir)
    assert at("base-panel", "white.cct") == ("base.yaml", 6, 15)
    assert at("base-panel", "white.delta_uv") == ("base.yaml", 6, 34)


def test_a_primary_row_points_at_its_own_tolerance_or_the_default_one(spec_dir):
    at = _located(spec_dir)
    assert at("base-panel", "primaries.red.delta_uv") == ("base.yaml", 8, 43)
    assert at("base-panel", "primaries.green.delta_uv") == ("base.yaml", 11, 15)


def test_a_gamut_row_points_at_its_limit(spec_dir):
    at = _located(spec_dir)
    assert at("base-panel", "gamut.srgb.coverage.xy") == ("base.yaml", 13, 54)


def test_an_inherited_limit_points_at_the_parent_file_and_an_own_one_at_the_child(spec_dir):
    at = _located(spec_dir)
    assert at("child-panel", "white.cct") == ("base.yaml", 6, 15)
    assert at("child-panel", "white.luminance") == ("child.yaml", 6, 3)


def test_a_unit_row_points_at_the_measurement_of_that_unit(spec_dir):
    at = _located(spec_dir)
    assert at("child-panel", "white.cct", "U1") == ("child.yaml", 9, 5)
    assert at("child-panel", "primaries.green.delta_uv", "U1") == ("child.yaml", 10, 5)


COLOURED = """\
spec: 1
id: lamp
title: Lamp
category: indicator
colours:
  reference_white: D65
  tolerance: {delta_e2000: 3}
  red:
    target: {x: 0.690, y: 0.300, Y: 12}
    tolerance: {dominant_wavelength: [615, 630]}
  green:
    target: {x: 0.170, y: 0.700, Y: 40}
units:
  - serial: L1
    colours:
      green: {x: 0.172, y: 0.698, Y: 39}
"""

VOLUMES = PARENT.replace("gamut:\n", "gamut:\n  - {reference: srgb, metric: volume, min: 95}\n")


def test_a_colour_row_points_at_its_own_tolerance_or_the_section_default(spec_dir):
    from generator.spec.locate import locate_row

    spec_dir("lamp.yaml", COLOURED)
    (spec,), _ = load_specs(spec_dir.dir)

    def at(rid, sample=None):
        m = locate_row(spec.source, {"id": rid, "sample": sample})
        return m.line, m.col
    assert at("colours.red.dominant_wavelength") == (10, 17)
    assert at("colours.red.delta_e2000") == (7, 15)
    assert at("colours.green.delta_e2000") == (7, 15)
    assert at("colours.green.delta_e2000", "L1") == (16, 7)


def test_gamut_rows_of_one_reference_are_told_apart_by_their_metric(spec_dir):
    from generator.spec.locate import locate_row

    spec_dir("base.yaml", VOLUMES)
    (spec,), _ = load_specs(spec_dir.dir)

    def at(rid):
        m = locate_row(spec.source, {"id": rid, "sample": None})
        return m.line, m.col
    assert at("gamut.srgb.volume.lab") == (13, 39)
    assert at("gamut.srgb.coverage.xy") == (14, 54)


MEASURED = """\
spec: 1
id: lot-panel
extends: base-panel
title: Lot panel
measurements:
  - m/first.csv
  - m/second.csv
units:
  - serial: U1
    white: {x: 0.3127, y: 0.3290}
"""


def test_a_unit_from_a_measurement_file_points_at_its_measurements_entry(spec_dir):
    from generator.spec.locate import locate_row, unit_files

    spec_dir("base.yaml", PARENT)
    spec_dir("lot.yaml", MEASURED)
    (spec_dir.dir / "m").mkdir()
    spec_dir("m/first.csv", "serial,channel,x,y\nF1,white,0.3127,0.3290\n")
    spec_dir("m/second.csv", "serial,channel,x,y\nS1,white,0.3127,0.3290\nS2,red,0.640,0.330\n")
    specs, _ = load_specs(spec_dir.dir)
    spec = {s.id: s for s in specs}["lot-panel"]
    files = unit_files(spec)
    assert files == {"F1": 0, "S1": 1, "S2": 1}

    def at(rid, sample, located=files):
        m = locate_row(spec.source, {"id": rid, "sample": sample}, located)
        return m.file.rsplit("/", 1)[-1], m.line, m.col
    assert at("white.cct", "F1") == ("lot.yaml", 6, 5)
    assert at("primaries.red.delta_uv", "S2") == ("lot.yaml", 7, 5)
    assert at("white.cct", "U1") == ("lot.yaml", 10, 5)          # inline units as before
    # without the file of each unit, the measurements: key itself
    assert at("white.cct", "S1", None) == ("lot.yaml", 5, 1)
