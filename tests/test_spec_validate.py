"""Validation and physical checks: one test per kind of bad input, each asserting the
exact FILE:LINE:COL: key.path: message line(s)."""
from __future__ import annotations

from pathlib import Path

import pytest

from generator.spec.load import load_specs
from generator.spec.problems import InputError

HEAD = "spec: 1\nid: orbit-24\n"  # lines 1-2 of every spec below
PRIMARIES = """\
primaries:
  red: {x: 0.64, y: 0.33}
  green: {x: 0.30, y: 0.60}
  blue: {x: 0.15, y: 0.06}
"""


@pytest.fixture
def load(tmp_path, monkeypatch):
    """load(text) or load({name: text}): (specs, warnings), or the formatted problems on error."""
    monkeypatch.chdir(tmp_path)

    def run(files):
        if not isinstance(files, dict):
            files = {"s.yaml": files}
        for name, text in files.items():
            (tmp_path / name).write_bytes(text if isinstance(text, bytes) else text.encode("utf-8"))
        try:
            specs, warnings = load_specs(Path("."))
        except InputError as e:
            return [p.format() for p in e.problems]
        return specs, [w.format() for w in warnings]

    return run


def test_the_demo_spec_loads_without_problems(monkeypatch):
    root = Path(__file__).resolve().parent.parent
    monkeypatch.chdir(root)
    specs, warnings = load_specs(Path("specs"))
    # the only warnings are the intended notices that the 5 nm demo spectra were resampled
    assert specs and all("resampled to 1 nm by Sprague" in w.message for w in warnings)
    assert [w.file for w in warnings] == ["specs/corvinta-lumen-32-tile.yaml"] * 2


def test_a_minimal_spec_loads(load):
    specs, warnings = load(HEAD)
    assert ([s.id for s in specs], warnings) == (["orbit-24"], [])


def test_byte_order_mark_loads_fine(load):
    specs, _ = load(b"\xef\xbb\xbf" + HEAD.encode())
    assert [s.id for s in specs] == ["orbit-24"]


def test_wrong_types(load):
    assert load(HEAD + "white: D65\nprimaries: [1, 2]\ngamut: {a: 1}\nunits: 3\ntitle: [a]\n") == [
        "s.yaml:3:8: white: expected a mapping with the key target, found 'D65'",
        "s.yaml:4:12: primaries: expected a mapping of primaries by name, e.g. red: {x: 0.64, y: 0.33}, "
        "found a list of 2",
        "s.yaml:5:8: gamut: expected a list, found a mapping",
        "s.yaml:6:8: units: expected a list, found '3'",
        "s.yaml:7:8: title: expected text, found a list of 1",
    ]


def test_spec_version_must_be_the_whole_number_1(load):
    assert load("spec: 1.0\nid: a\n") == ["s.yaml:1:7: spec: expected the number 1, found 1.0"]
    assert load("spec: 2\nid: a\n") == ["s.yaml:1:7: spec: expected the number 1, found 2"]


def test_a_very_long_whole_number_is_an_error_not_a_crash(load):
    assert load("spec: " + "1" * 5000 + "\nid: a\n") == [
        "s.yaml:1:7: spec: expected the number 1, found 1111111111111111111111111111111111111111... "
        "(5000 characters)"]


def test_missing_required_keys(load):
    assert load("title: Orbit\nwhite:\n  tolerance: {delta_uv: 0.004}\n") == [
        "s.yaml:1:1: id: expected the required key 'id' (a slug of lower-case letters, digits and hyphens), "
        "found no such key\n    hint: a unique slug such as orvane-27-studio",
        "s.yaml:1:1: spec: expected the required key 'spec' (the number 1), found no such key\n"
        "    hint: the format version: spec: 1",
        "s.yaml:3:3: white.target: expected the required key 'target' (a named illuminant or {x, y} or "
        "{u_prime, v_prime} or {cct, duv} or {spectrum}), found no such key\n"
        "    hint: a named illuminant (A, C, D50, D55, D65, D75, E, DCI), {x, y}, {u_prime, v_prime}, "
        "{cct, duv} or {spectrum}",
    ]


def test_unknown_keys_suggest_the_closest_known_key(load):
    assert load(HEAD + "tittle: Orbit\nwhite:\n  target: D65\n  tolerence: {delta_uv: 0.004}\n") == [
        "s.yaml:3:1: tittle: expected a known key, found unknown key 'tittle'\n    hint: did you mean 'title'?",
        "s.yaml:6:3: white.tolerence: expected a known key, found unknown key 'tolerence'\n"
        "    hint: did you mean 'tolerance'?",
    ]


def test_unknown_key_without_a_close_match_lists_the_known_keys(load):
    assert load(HEAD + "white:\n  target: D65\n  tolerance: {zzz: 1}\n") == [
        "s.yaml:5:15: white.tolerance.zzz: expected a known key, found unknown key 'zzz'\n"
        "    hint: known keys: delta_uv, box, ellipse, region, macadam_steps, cct, duv, ellipse_of, quadrangle_of"]


def test_unknown_key_in_a_range(load):
    assert load(HEAD + "white:\n  target: D65\n  tolerance: {cct: {min: 6000, mx: 7000}}\n") == [
        "s.yaml:5:32: white.tolerance.cct.mx: expected min or max, found unknown key 'mx'\n"
        "    hint: did you mean 'max'?"]


def test_duplicate_keys(load):
    assert load(HEAD + "title: a\ntitle: b\n") == [
        "s.yaml:4:1: title: expected each key once, found 'title' again (first at line 3, column 1)\n"
        "    hint: YAML would silently keep only the last value; remove one of them"]


def test_yaml_1_1_traps_are_guarded(load):
    text = HEAD + "revision: 010\nwhite:\n  target: D65\n  tolerance: {delta_uv: 5e-3}\n"
    specs, _ = load(text)
    assert (specs[0].revision, specs[0].white.tolerance.delta_uv) == ("010", 0.005)


def test_status_no_stays_text_and_is_rejected(load):
    assert load(HEAD + "status: no\n") == [
        "s.yaml:3:9: status: expected one of draft, released, obsolete, found 'no'\n"
        "    hint: YAML 1.1 would read this word as a boolean; it is kept as text here"]


def test_quoted_number_is_rejected_with_a_hint(load):
    assert load(HEAD + "white:\n  target: {x: '0.3127', y: 0.329}\n") == [
        "s.yaml:4:15: white.target.x: expected a number >= 0 and <= 1, found the quoted text '0.3127'\n"
        "    hint: remove the quotes to give a number"]


def test_decimal_comma_has_a_hint(load):
    assert load(HEAD + "white:\n  target: {x: '0,3127', y: 0.329}\n") == [
        "s.yaml:4:15: white.target.x: expected a number >= 0 and <= 1, found the quoted text '0,3127'\n"
        "    hint: use a point, not a comma, as the decimal mark"]


def test_enormous_number(load):
    assert load(HEAD + "white:\n  target: D65\n  luminance: {min: 1e400}\n") == [
        "s.yaml:5:20: white.luminance.min: expected a number >= 0, found 1e400, too large to be a number"]


@pytest.mark.parametrize("written", [".nan", ".NaN", ".inf", "-.inf", "+.Inf"])
def test_nan_and_infinity_are_rejected(load, written):
    assert load(HEAD + f"white:\n  target: D65\n  luminance: {{min: {written}}}\n") == [
        f"s.yaml:5:20: white.luminance.min: expected a number >= 0, found {written}, which is not a finite number"]


def test_negative_tolerances(load):
    assert load(HEAD + "white:\n  target: D65\n  tolerance:\n    delta_uv: -0.01\n"
                "    box: {dx: -0.002, dy: 0.002}\n") == [
        "s.yaml:6:15: white.tolerance.delta_uv: expected a number > 0 and <= 1, found -0.01",
        "s.yaml:7:15: white.tolerance.box.dx: expected a number > 0 and <= 1, found -0.002",
    ]


def test_ranges_with_min_above_max(load):
    assert load(HEAD + "white:\n  target: D65\n  tolerance: {cct: [6800, 6300], duv: {min: 0.003, max: -0.003}}\n"
                "  luminance: {min: 300, max: 200}\n") == [
        "s.yaml:5:20: white.tolerance.cct: expected low <= high, found [6800, 6300]\n    hint: swap the two bounds",
        "s.yaml:5:39: white.tolerance.duv: expected low <= high, found [0.003, -0.003]\n    hint: swap the two bounds",
        "s.yaml:6:14: white.luminance: expected min <= max, found min 300 > max 200",
    ]


def test_gamut_requirement_with_min_above_max(load):
    assert load(HEAD + PRIMARIES + "gamut:\n  - {reference: srgb, metric: coverage, min: 90, max: 80}\n") == [
        "s.yaml:8:5: gamut[0]: expected min <= max, found min 90 > max 80"]


def test_x_plus_y_above_one(load):
    assert load(HEAD + "white:\n  target: {x: 0.6, y: 0.5}\n") == [
        "s.yaml:4:11: white.target: expected x + y <= 1, found x + y = 1.1000\n"
        "    hint: no real colour has x + y > 1; check for swapped or mistyped coordinates"]


def test_chromaticity_outside_the_spectral_locus_is_an_error(load):
    assert load(HEAD + "white:\n  target: {x: 0.1, y: 0.1}\n") == [
        "s.yaml:4:11: white.target: expected a chromaticity inside the spectral locus, found (0.1000, 0.1000), "
        "0.0037 outside it\n    hint: no real light has this chromaticity; check the coordinates "
        "(targets up to 0.001 outside count as on the locus)"]


def test_primary_outside_the_locus_given_in_u_v(load):
    text = HEAD + "primaries:\n  red: {x: 0.64, y: 0.33}\n  green: {u_prime: 0.0, v_prime: 0.1}\n" \
        "  blue: {x: 0.15, y: 0.06}\n"
    errors = load(text)
    assert len(errors) == 1
    assert errors[0].startswith("s.yaml:5:10: primaries.green: expected a chromaticity inside the spectral locus")


def test_bt2020_primaries_exactly_are_accepted(load):
    specs, warnings = load(HEAD + "white: {target: D65}\nprimaries:\n  red: {x: 0.708, y: 0.292}\n"
                           "  green: {x: 0.170, y: 0.797}\n  blue: {x: 0.131, y: 0.046}\n")
    assert warnings == []
    assert [p.xy for p in specs[0].primaries] == [(0.708, 0.292), (0.170, 0.797), (0.131, 0.046)]


def test_target_just_beyond_the_locus_tolerance_is_refused(load):
    # BT.2020 green moved 0.003 further out, about 1.8e-3 beyond the locus: past the 1e-3 allowance
    errors = load(HEAD + "primaries:\n  red: {x: 0.708, y: 0.292}\n  green: {x: 0.168, y: 0.800}\n"
                  "  blue: {x: 0.131, y: 0.046}\n")
    assert len(errors) == 1
    assert errors[0].startswith("s.yaml:5:10: primaries.green: expected a chromaticity inside the spectral locus")


def test_measured_unit_slightly_outside_the_locus_warns_and_is_kept(load):
    specs, warnings = load(HEAD + PRIMARIES + "units:\n  - serial: S1\n    red: {x: 0.735, y: 0.262}\n")
    assert warnings == [
        "s.yaml:9:10: warning: units[0].red: measured chromaticity (0.7350, 0.2620) lies 0.0031 outside the "
        "spectral locus; it is still assessed\n    hint: taken as instrument noise or a calibration error"]
    m = specs[0].units[0].primaries["red"]
    assert m.xy == (0.735, 0.262)
    assert m.outside_locus == pytest.approx(0.0031, abs=1e-4)


def test_measured_unit_far_outside_the_locus_is_an_error(load):
    assert load(HEAD + PRIMARIES + "units:\n  - serial: S1\n    red: {x: 0.5, y: 0.1}\n") == [
        "s.yaml:9:10: units[0].red: expected a measured chromaticity within the spectral locus, found "
        "(0.5000, 0.1000), 0.0509 outside it\n    hint: no real light has this chromaticity; check the "
        "coordinates (measurements up to 0.02 outside pass as noise)"]


def test_collinear_primaries(load):
    assert load(HEAD + "primaries:\n  red: {x: 0.3, y: 0.3}\n  green: {x: 0.4, y: 0.4}\n"
                "  blue: {x: 0.2, y: 0.2}\n") == [
        "s.yaml:4:3: primaries: expected primaries that span an area, found them on one line\n"
        "    hint: a gamut needs primaries at the corners of a triangle; check for a mistyped primary"]


def test_duplicate_primaries_name_the_repeated_one(load):
    assert load(HEAD + "primaries:\n  red: {x: 0.64, y: 0.33}\n  green: {x: 0.30, y: 0.60}\n"
                "  blue: {x: 0.64, y: 0.33}\n") == [
        "s.yaml:6:9: primaries.blue: expected a chromaticity of its own, found the same as red\n"
        "    hint: check for a copied or mistyped primary"]


def test_primary_inside_the_gamut_of_the_others_warns(load):
    _, warnings = load(HEAD + PRIMARIES + "  cyan: {x: 0.3, y: 0.3}\n")
    assert warnings == ["s.yaml:4:3: warning: primaries: primary cyan lies inside the gamut of the others\n"
                        "    hint: it adds nothing to the gamut area"]


def test_white_outside_the_gamut(load):
    assert load(HEAD + "white: {target: {x: 0.5, y: 0.45}}\n" + PRIMARIES) == [
        "s.yaml:3:17: white.target: expected a white inside the gamut of the primaries, found (0.5000, 0.4500) "
        "outside it\n    hint: a display cannot make a white outside its own gamut; check the white and primaries"]


def test_fewer_than_three_primaries(load):
    assert load(HEAD + "primaries:\n  red: {x: 0.64, y: 0.33}\n  green: {x: 0.30, y: 0.60}\n"
                "  tolerance: {delta_uv: 0.01}\n") == [
        "s.yaml:4:3: primaries: expected three or more primaries, found 2\n"
        "    hint: a gamut needs at least red, green and blue"]


def test_four_primaries_are_accepted(load):
    specs, warnings = load(HEAD + PRIMARIES + "  cyan: {x: 0.07, y: 0.50}\n")
    assert ([p.name for p in specs[0].primaries], warnings) == (["red", "green", "blue", "cyan"], [])


def test_unknown_reference_suggests_the_closest(load):
    assert load(HEAD + PRIMARIES + "gamut:\n  - {reference: bt2021, metric: coverage, min: 90}\n") == [
        "s.yaml:8:17: gamut[0].reference: expected a reference space or spec id, found 'bt2021'\n"
        "    hint: did you mean 'bt2020'?"]


def test_unknown_illuminant_suggests_the_closest(load):
    assert load(HEAD + "white: {target: D66}\n") == [
        "s.yaml:3:17: white.target: expected a named illuminant, found 'D66'\n    hint: did you mean 'D65'?"]


def test_unknown_illuminant_without_a_close_match_lists_them(load):
    errors = load(HEAD + "white: {target: daylight}\n")
    assert errors == ["s.yaml:3:17: white.target: expected a named illuminant, found 'daylight'\n"
                      "    hint: known: A, C, D50, D55, D65, D75, E, DCI"]


def test_unit_key_that_is_not_a_primary(load):
    assert load(HEAD + PRIMARIES + "units:\n  - serial: S1\n    rde: {x: 0.64, y: 0.33}\n") == [
        "s.yaml:9:5: units[0].rde: expected a unit key or a primary of this spec, found unknown key 'rde'\n"
        "    hint: did you mean 'red'?"]


def test_duplicate_serials(load):
    assert load(HEAD + PRIMARIES + "units:\n  - serial: S1\n  - serial: S2\n  - serial: S1\n") == [
        "s.yaml:10:13: units[2].serial: expected a serial of its own, found 'S1' again (also units[0])\n"
        "    hint: every measured unit needs a unique serial"]


def test_gamut_requirement_without_primaries(load):
    assert load(HEAD + "gamut:\n  - {reference: srgb, metric: coverage, min: 90}\n") == [
        "s.yaml:4:5: gamut[0]: expected primaries to assess this gamut requirement on, found none\n"
        "    hint: add a primaries: section, or remove the requirement"]


def test_every_problem_of_one_file_is_reported_in_one_run(load):
    errors = load("spec: 2\nid: Orbit\nstatus: yes\nwhite:\n  target: {x: 1.2, y: 0.3}\n  tolerence: 1\n")
    assert [e.split("\n")[0] for e in errors] == [
        "s.yaml:1:7: spec: expected the number 1, found 2",
        "s.yaml:2:5: id: expected a slug of lower-case letters, digits and hyphens, found 'Orbit'",
        "s.yaml:3:9: status: expected one of draft, released, obsolete, found 'yes'",
        "s.yaml:5:15: white.target.x: expected a number >= 0 and <= 1, found 1.2",
        "s.yaml:6:3: white.tolerence: expected a known key, found unknown key 'tolerence'",
    ]


def test_problems_of_two_files_are_reported_in_one_run(load):
    errors = load({"a.yaml": HEAD + "status: final\n",
                   "b.yaml": "spec: 1\nid: orbit-27\nwhite: {target: {x: 0.6, y: 0.5}}\n"})
    assert [e.split("\n")[0] for e in errors] == [
        "a.yaml:3:9: status: expected one of draft, released, obsolete, found 'final'",
        "b.yaml:3:17: white.target: expected x + y <= 1, found x + y = 1.1000",
    ]


def test_a_good_spec_beside_a_bad_one_does_not_hide_the_error(load):
    errors = load({"a.yaml": HEAD, "b.yaml": "spec: 1\nid: orbit-27\nowner: [a]\n"})
    assert errors == ["b.yaml:3:8: owner: expected text, found a list of 1"]


def test_top_level_list_is_refused(load):
    assert load("- spec: 1\n") == [
        "s.yaml:1:1: expected a spec mapping (key: value lines), found a list of 1\n"
        "    hint: a spec starts with lines such as 'spec: 1' and 'id: my-spec'"]


def test_empty_folder(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    with pytest.raises(InputError) as e:
        load_specs(Path("."))
    assert [p.format() for p in e.value.problems] == [
        ".:1:1: expected spec files (*.yaml), found none\n"
        "    hint: run 'colourspec new specs/my-spec.yaml' for a starter spec"]


COLOURS_HEAD = HEAD + "colours:\n"


def test_colours_need_a_reference_white_for_cielab_targets_and_delta_e(load):
    got = load(COLOURS_HEAD + """\
  tolerance: {delta_e2000: 2}
  teal:
    target: {L: 55, a: -32, b: -8}
  green:
    target: {x: 0.17, y: 0.70, Y: 60}
""")
    assert got == [
        "s.yaml:4:14: colours.tolerance: expected a reference_white for a ΔE limit, found none\n"
        "    hint: CIELAB differences need the white the colours are seen against, e.g. reference_white: D65",
        "s.yaml:6:13: colours.teal.target: expected a reference_white for a CIELAB target, found none\n"
        "    hint: add reference_white: D65 (or the white the target was measured against) to the colour or "
        "to the colours section",
    ]


def test_a_delta_e_limit_needs_a_luminance_factor(load):
    got = load(COLOURS_HEAD + """\
  reference_white: D65
  green:
    target: {x: 0.17, y: 0.70}
    tolerance: {delta_e76: 3}
""")
    assert got == [
        "s.yaml:6:13: colours.green.target: expected a luminance factor Y (or a CIELAB target) for a ΔE "
        "limit, found only a chromaticity\n"
        "    hint: write the target as {x, y, Y} with the reference white at Y = 100, or as {L, a, b}"]


def test_delta_e2000_limit_keys_and_ranges_are_checked(load):
    got = load(COLOURS_HEAD + """\
  reference_white: D65
  red:
    target: {x: 0.70, y: 0.30, Y: 20}
    tolerance: {delta_e2000: {max: 2, kq: 1}, dominant_wavelength: [630, 620], excitation_purity: [0, 2]}
""")
    assert got == [
        "s.yaml:7:39: colours.red.tolerance.delta_e2000.kq: expected a known key, found unknown key 'kq'\n"
        "    hint: known keys: max, kL, kC, kH",
        "s.yaml:7:68: colours.red.tolerance.dominant_wavelength: expected low <= high, found [630, 620]\n"
        "    hint: swap the two bounds",
        "s.yaml:7:103: colours.red.tolerance.excitation_purity[1]: expected a number >= 0 and <= 1, found 2",
    ]


def test_unit_colours_must_name_a_colour_of_the_spec(load):
    got = load(COLOURS_HEAD + """\
  green:
    target: {x: 0.17, y: 0.70}
units:
  - serial: A
    colours:
      gren: {x: 0.17, y: 0.70}
""")
    assert got == ["s.yaml:9:7: units[0].colours.gren: expected the name of one of the spec's colours, found "
                   "unknown colour 'gren'\n    hint: did you mean 'green'?"]


def test_a_cielab_target_resolves_to_xy_and_luminance_factor(load):
    import colour

    (spec,), _ = load(COLOURS_HEAD + """\
  reference_white: D50
  teal:
    target: {L: 55, a: -32, b: -8}
""")
    c = spec.colours[0]
    ref = colour.xyY_to_XYZ([0.34567, 0.35850, 1.0])
    XYZ = colour.Lab_to_XYZ([55, -32, -8], [0.34567, 0.35850])
    assert c.xy == pytest.approx(tuple(colour.XYZ_to_xy(XYZ)), abs=1e-12)
    assert c.Y == pytest.approx(100 * XYZ[1] / ref[1], abs=1e-9)
    assert c.reference_white == (0.34567, 0.35850) and c.reference_white_written == "D50"


def test_volume_requirements_take_the_lab_diagram_only(load):
    got = load(HEAD + PRIMARIES + "gamut:\n  - {reference: srgb, metric: volume, diagram: xy, min: 90}\n"
               "  - {reference: srgb, metric: coverage, diagram: lab, min: 90}\n")
    assert got == [
        "s.yaml:8:48: gamut[0].diagram: expected lab for a volume requirement, found xy\n"
        "    hint: gamut volumes are taken in CIELAB; leave diagram out",
        "s.yaml:9:50: gamut[1].diagram: expected xy or uv for a coverage requirement, found lab\n"
        "    hint: lab is for metric: volume or volume-coverage",
    ]


def test_a_volume_requirement_needs_a_white(load):
    got = load(HEAD + PRIMARIES + "gamut:\n  - {reference: bt2020, metric: volume-coverage, min: 60}\n")
    assert got == [
        "s.yaml:8:33: gamut[0].metric: expected three primaries and a white for a CIELAB volume-coverage "
        "requirement, found 3 primaries and no white\n"
        "    hint: the CIELAB volume is that of an additive RGB display with its white"]


def test_a_primary_that_fails_its_check_is_still_a_primary_for_the_units(load):
    text = HEAD + "primaries:\n  red: {x: 0.5, y: 0.1}\n  green: {x: 0.30, y: 0.60}\n  blue: {x: 0.15, y: 0.06}\n" \
        "units:\n  - serial: S1\n    red: {x: 0.64, y: 0.33}\n"
    errors = load(text)
    assert len(errors) == 1
    assert errors[0].startswith("s.yaml:4:8: primaries.red: expected a chromaticity inside the spectral locus")



def test_a_misspelt_declared_key_among_free_names_is_an_unknown_key_with_did_you_mean(spec_dir):
    from generator.spec.load import load_specs
    from generator.spec.problems import InputError

    spec_dir("p.yaml", """\
spec: 1
id: typo
primaries:
  red:   {x: 0.640, y: 0.330}
  green: {x: 0.300, y: 0.600}
  blue:  {x: 0.150, y: 0.060}
  tolerence: {delta_uv: 0.005}
""")
    import pytest

    with pytest.raises(InputError) as e:
        load_specs(spec_dir.dir)
    lines = [p.format() for p in e.value.problems]
    assert lines == ["specs/p.yaml:7:3: primaries.tolerence: expected a known key, found unknown key 'tolerence'"
                     "\n    hint: did you mean 'tolerance'?"], lines


def test_free_names_that_merely_resemble_a_declared_key_stay_primaries(spec_dir):
    from generator.spec.load import load_specs

    spec_dir("p.yaml", """\
spec: 1
id: tunable
primaries:
  orange:     {x: 0.600, y: 0.390}
  warm-white: {x: 0.450, y: 0.410}
  cool-white: {x: 0.300, y: 0.310}
  blue:       {x: 0.150, y: 0.060}
""")
    (spec,), _ = load_specs(spec_dir.dir)
    assert [p.name for p in spec.primaries] == ["orange", "warm-white", "cool-white", "blue"]
