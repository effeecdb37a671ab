"""Inheritance with `extends`: deep merge (child wins, lists replaced), and the problems:
a missing parent, a cycle, duplicate spec ids across files."""
from __future__ import annotations

from pathlib import Path

import pytest

from generator.spec.load import load_specs
from generator.spec.problems import InputError

BASE = """\
spec: 1
id: orbit-base
title: Orbit panels, common limits
owner: Halvard Optics
white:
  target: D65
  tolerance: {delta_uv: 0.004, cct: [6300, 6800]}
  luminance: {min: 250}
primaries:
  red: {x: 0.64, y: 0.33}
  green: {x: 0.30, y: 0.60}
  blue: {x: 0.15, y: 0.06}
  tolerance: {delta_uv: 0.01}
gamut:
  - {reference: srgb, metric: coverage, min: 95}
  - {reference: dci-p3, metric: coverage, min: 70}
"""

CHILD = """\
spec: 1
id: orbit-24
extends: orbit-base
title: Orbit 24
white:
  tolerance: {delta_uv: 0.002}
gamut:
  - {reference: bt709, metric: area-ratio, min: 100}
"""


@pytest.fixture
def load(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)

    def run(files: dict[str, str]):
        for name, text in files.items():
            (tmp_path / name).write_text(text, encoding="utf-8")
        try:
            specs, _ = load_specs(Path("."))
        except InputError as e:
            return [p.format() for p in e.problems]
        return {s.id: s for s in specs}

    return run


def test_child_overrides_and_inherits_key_by_key(load):
    specs = load({"base.yaml": BASE, "child.yaml": CHILD})
    child = specs["orbit-24"]
    assert child.title == "Orbit 24"
    assert child.owner == "Halvard Optics"
    assert child.extends == "orbit-base"
    # white.tolerance is a mapping: merged key by key, the child's delta_uv wins
    assert child.white.tolerance.delta_uv == 0.002
    assert child.white.tolerance.cct == (6300.0, 6800.0)
    assert child.white.luminance == {"min": 250.0}
    assert [p.name for p in child.primaries] == ["red", "green", "blue"]


def test_lists_are_replaced_not_appended(load):
    specs = load({"base.yaml": BASE, "child.yaml": CHILD})
    assert [(g.reference, g.metric) for g in specs["orbit-24"].gamut] == [("bt709", "area-ratio")]
    assert [g.reference for g in specs["orbit-base"].gamut] == ["srgb", "dci-p3"]


def test_inherited_keys_name_the_ancestor(load):
    specs = load({"base.yaml": BASE, "child.yaml": CHILD})
    inherited = specs["orbit-24"].inherited
    assert inherited["owner"] == "orbit-base"
    assert inherited["primaries"] == "orbit-base"
    assert "title" not in inherited and "gamut" not in inherited


def test_null_in_the_child_removes_an_inherited_section(load):
    specs = load({"base.yaml": BASE, "child.yaml": CHILD + "owner: ~\n"})
    assert specs["orbit-24"].owner == ""


def test_grandchild_inherits_through_the_chain(load):
    grandchild = "spec: 1\nid: orbit-24-matte\nextends: orbit-24\nwhite:\n  luminance: {min: 200}\n"
    specs = load({"base.yaml": BASE, "child.yaml": CHILD, "grandchild.yaml": grandchild})
    g = specs["orbit-24-matte"]
    assert (g.title, g.white.luminance, g.white.tolerance.delta_uv) == ("Orbit 24", {"min": 200.0}, 0.002)


def test_error_in_an_inherited_value_points_at_the_parent_file(load):
    child = "spec: 1\nid: orbit-24\nextends: orbit-base\n"
    errors = load({"base.yaml": BASE.replace("delta_uv: 0.01}", "delta_uv: -0.01}"), "child.yaml": child})
    assert errors == ["base.yaml:13:25: primaries.tolerance.delta_uv: expected a number > 0 and <= 1, found -0.01"]


def test_problem_only_in_the_merge_points_at_the_child(load):
    child = "spec: 1\nid: orbit-24\nextends: orbit-base\nwhite:\n  target: {x: 0.55, y: 0.43}\n"
    errors = load({"base.yaml": BASE, "child.yaml": child})
    assert errors == [
        "child.yaml:5:11: white.target: expected a white inside the gamut of the primaries, found (0.5500, 0.4300) "
        "outside it\n    hint: a display cannot make a white outside its own gamut; check the white and primaries"]


def test_missing_parent_suggests_the_closest_id(load):
    errors = load({"base.yaml": BASE, "child.yaml": CHILD.replace("extends: orbit-base", "extends: orbit-bsae")})
    assert errors == ["child.yaml:3:10: extends: expected the id of another spec, found 'orbit-bsae'\n"
                      "    hint: did you mean 'orbit-base'?"]


def test_missing_parent_without_a_close_match_lists_the_ids(load):
    errors = load({"base.yaml": BASE, "child.yaml": CHILD.replace("extends: orbit-base", "extends: zzz")})
    assert errors == ["child.yaml:3:10: extends: expected the id of another spec, found 'zzz'\n"
                      "    hint: known ids: orbit-24, orbit-base"]


def test_spec_extending_itself(load):
    errors = load({"a.yaml": "spec: 1\nid: orbit-24\nextends: orbit-24\n"})
    assert errors == ["a.yaml:3:10: extends: expected a spec that does not inherit from itself, found the cycle "
                      "orbit-24 -> orbit-24\n    hint: a spec cannot extend itself or one of its descendants"]


def test_cycle_is_reported_once_even_with_a_descendant_outside_it(load):
    errors = load({
        "a.yaml": "spec: 1\nid: a\nextends: b\n",
        "b.yaml": "spec: 1\nid: b\nextends: c\n",
        "c.yaml": "spec: 1\nid: c\nextends: a\n",
        "d.yaml": "spec: 1\nid: d\nextends: a\n",
    })
    assert errors == ["c.yaml:3:10: extends: expected a spec that does not inherit from itself, found the cycle "
                      "a -> b -> c -> a\n    hint: a spec cannot extend itself or one of its descendants"]


def test_duplicate_spec_ids_across_files(load):
    errors = load({"a.yaml": "spec: 1\nid: orbit-24\n", "b.yaml": "spec: 1\ntitle: copy\nid: orbit-24\n"})
    assert errors == ["b.yaml:3:5: id: expected an id of its own, found 'orbit-24' again (also the id of a.yaml)\n"
                      "    hint: every spec needs an id of its own"]


def test_specs_without_an_id_are_not_duplicates_of_each_other(load):
    errors = load({"a.yaml": "spec: 1\nid: ~\n", "b.yaml": "spec: 1\nid: ~\n"})
    assert errors == [
        "a.yaml:2:5: id: expected a slug of lower-case letters, digits and hyphens, found nothing (null)",
        "b.yaml:2:5: id: expected a slug of lower-case letters, digits and hyphens, found nothing (null)",
    ]


def test_gamut_reference_to_another_spec(load):
    other = "spec: 1\nid: orbit-27\n" + BASE[BASE.index("primaries:"):BASE.index("gamut:")] \
        + "gamut:\n  - {reference: orbit-base, metric: coverage, min: 99}\n"
    specs = load({"base.yaml": BASE, "other.yaml": other})
    assert specs["orbit-27"].references["orbit-base"].primaries == ((0.64, 0.33), (0.30, 0.60), (0.15, 0.06))


def test_inherited_values_are_listed_by_dotted_path_down_to_what_the_child_overrides(load):
    specs = load({"base.yaml": BASE, "child.yaml": CHILD})
    inherited = specs["orbit-24"].inherited
    # the child writes white.tolerance.delta_uv only: its siblings are inherited one by one
    assert inherited == {"owner": "orbit-base", "primaries": "orbit-base", "white.target": "orbit-base",
                         "white.tolerance.cct": "orbit-base", "white.luminance": "orbit-base"}
    assert specs["orbit-base"].inherited == {}


def test_a_grandchild_names_the_ancestor_that_wrote_each_value(load):
    grandchild = "spec: 1\nid: orbit-24-matte\nextends: orbit-24\nwhite:\n  luminance: {min: 200}\n"
    specs = load({"base.yaml": BASE, "child.yaml": CHILD, "grandchild.yaml": grandchild})
    inherited = specs["orbit-24-matte"].inherited
    assert inherited["title"] == "orbit-24"
    assert inherited["gamut"] == "orbit-24"
    assert inherited["white.tolerance.delta_uv"] == "orbit-24"
    assert inherited["white.tolerance.cct"] == "orbit-base"
    assert inherited["white.target"] == "orbit-base"
    assert "white.luminance" not in inherited and "white" not in inherited


def test_a_mapping_written_whole_by_one_ancestor_is_listed_once(load):
    grandchild = "spec: 1\nid: orbit-24-matte\nextends: orbit-24\ntitle: Matte\n"
    specs = load({"base.yaml": BASE, "child.yaml": CHILD, "grandchild.yaml": grandchild})
    inherited = specs["orbit-24-matte"].inherited
    assert inherited["primaries"] == "orbit-base"
    assert not any(k.startswith("primaries.") for k in inherited)
    assert "white" not in inherited and inherited["white.tolerance.delta_uv"] == "orbit-24"
