"""The editor JSON Schema (draft-07), checked by a JSON Schema validator: it accepts every
demo spec, with or without an editor modeline and `$schema`, and rejects bad specs."""
from __future__ import annotations

import shutil

import jsonschema
import pytest
import yaml

from generator.docs import json_schema
from generator.spec.load import load_specs

from .conftest import DEMO_SPECS, ROOT

BAD = ROOT / "tests" / "bad_specs"
MODELINE = "# yaml-language-server: $schema=../docs/spec-1.schema.json\n"

GOOD = """\
spec: 1
id: schema-panel
title: Schema panel
status: draft
white:
  target: D65
  tolerance: {delta_uv: 0.004, cct: [6300, 6800]}
primaries:
  red:   {x: 0.640, y: 0.330}
  green: {x: 0.300, y: 0.600}
  blue:  {x: 0.150, y: 0.060}
  tolerance: {delta_uv: 0.008}
gamut:
  - {reference: srgb, metric: coverage, diagram: xy, min: 95}
"""

# (what is wrong, old text, new text): each must be rejected by the schema
BROKEN = [
    ("misspelt key", "  tolerance: {delta_uv: 0.008}", "  tolerence: {delta_uv: 0.008}"),
    ("unknown top-level key", "status: draft", "status: draft\ntittle: x"),
    ("status outside its choices", "status: draft", "status: finished"),
    ("format version 2", "spec: 1", "spec: 2"),
    ("negative tolerance", "delta_uv: 0.008", "delta_uv: -0.008"),
    ("coordinate as text", "x: 0.640", "x: 'red-ish'"),
    ("range of three numbers", "cct: [6300, 6800]", "cct: [6300, 6500, 6800]"),
    ("unknown gamut metric", "metric: coverage", "metric: volume"),
    ("unknown diagram", "diagram: xy", "diagram: lab"),
    ("id that is not a slug", "id: schema-panel", "id: Schema Panel"),
    ("missing id", "id: schema-panel\n", ""),
    ("gamut not a list", "gamut:\n  - {reference: srgb, metric: coverage, diagram: xy, min: 95}",
     "gamut: {reference: srgb}"),
]

# bad-spec fixtures whose problem is one of shape, which the schema must catch too
BAD_BY_SHAPE = ["alias-bomb.yaml", "deep.yaml", "numbers.yaml", "unknown-keys.yaml", "wrong-types.yaml",
                "yaml11-traps.yaml"]
# problems no JSON Schema can state (positions, duplicate keys, the spectral locus, ids of
# other specs, one serial per unit): the tool's own checks find them
BEYOND_SCHEMA = ["duplicate-keys.yaml", "extends-missing.yaml", "gamut-shape.yaml", "outside-locus.yaml",
                 "units.yaml"]


@pytest.fixture(scope="module")
def validator():
    schema = json_schema()
    jsonschema.Draft7Validator.check_schema(schema)
    return jsonschema.Draft7Validator(schema)


def test_the_schema_is_valid_draft_07(validator):
    assert json_schema()["$schema"] == "http://json-schema.org/draft-07/schema#"


@pytest.mark.parametrize("path", sorted(DEMO_SPECS.glob("*.yaml")), ids=lambda p: p.name)
def test_every_demo_spec_is_valid(validator, path):
    assert [e.message for e in validator.iter_errors(yaml.safe_load(path.read_text(encoding="utf-8")))] == []


def test_the_small_good_spec_is_valid(validator):
    assert list(validator.iter_errors(yaml.safe_load(GOOD))) == []


@pytest.mark.parametrize("what,old,new", BROKEN, ids=[b[0] for b in BROKEN])
def test_a_broken_spec_is_rejected(validator, what, old, new):
    assert old in GOOD
    assert list(validator.iter_errors(yaml.safe_load(GOOD.replace(old, new)))), what


@pytest.mark.parametrize("name", BAD_BY_SHAPE)
def test_bad_spec_fixtures_of_shape_are_rejected(validator, name):
    assert list(validator.iter_errors(yaml.safe_load((BAD / name).read_text(encoding="utf-8"))))


def test_every_bad_spec_fixture_is_accounted_for():
    parsable = sorted(p.name for p in BAD.glob("*.yaml") if p.name not in ("malformed.yaml", "tabs.yaml"))
    assert parsable == sorted(BAD_BY_SHAPE + BEYOND_SCHEMA)


def test_a_child_spec_may_leave_out_what_it_inherits_but_not_state_unknown_keys(validator):
    child = "spec: 1\nid: schema-child\nextends: schema-panel\nwhite: {luminance: {min: 300}}\n"
    assert list(validator.iter_errors(yaml.safe_load(child))) == []
    assert list(validator.iter_errors(yaml.safe_load(child + "colour: blue\n")))
    assert list(validator.iter_errors(yaml.safe_load("spec: 1\nextends: schema-panel\n")))  # still needs an id


def test_an_editor_modeline_and_a_schema_key_are_accepted_by_the_tool_and_the_schema(validator, tmp_path):
    specs = tmp_path / "specs"
    shutil.copytree(DEMO_SPECS, specs)
    for p in specs.glob("*.yaml"):
        text = p.read_text(encoding="utf-8")
        p.write_text(MODELINE + text.replace("spec: 1\n", "spec: 1\n$schema: ../docs/spec-1.schema.json\n", 1),
                     encoding="utf-8")
        doc = yaml.safe_load(p.read_text(encoding="utf-8"))
        assert doc["$schema"] == "../docs/spec-1.schema.json"
        assert list(validator.iter_errors(doc)) == [], p.name
    loaded, warnings = load_specs(specs)
    assert len(loaded) == len(list(DEMO_SPECS.glob("*.yaml"))) and warnings == []
