"""Spectra where a chromaticity is accepted: resolving, files, errors, and the same verdict
machinery as chromaticity input (generator/spec/resolve.py)."""
from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from generator.build import evaluate
from generator.colour.convert import XYZ_to_xy
from generator.colour.spectrum import resample_to_1nm, spectrum_XYZ
from generator.spec.problems import InputError

WL = np.arange(380.0, 781.0, 5.0)


def _led(peak, fwhm):
    s = fwhm / (2 * np.sqrt(2 * np.log(2)))
    return np.exp(-0.5 * ((WL - peak) / s) ** 2)


CHANNELS = {"red": _led(630, 20), "green": _led(528, 32), "blue": _led(456, 22)}
CHANNELS["white"] = 0.9 * CHANNELS["red"] + 0.8 * CHANNELS["green"] + 1.1 * CHANNELS["blue"]


def _csv():
    lines = ["wavelength," + ",".join(CHANNELS)]
    for i, w in enumerate(WL):
        lines.append(f"{w:g}," + ",".join(f"{CHANNELS[c][i]:.9e}" for c in CHANNELS))
    return "\n".join(lines) + "\n"


def _xy(name):
    rs = resample_to_1nm(WL, CHANNELS[name])
    return tuple(float(v) for v in XYZ_to_xy(spectrum_XYZ(rs.wavelengths, rs.values)))


SPEC = """\
spec: 1
id: {id}
white:
  target: {white}
  tolerance: {{delta_uv: 0.01, cct: [4000, 9000]}}
primaries:
  red: {red}
  green: {green}
  blue: {blue}
  tolerance: {{delta_uv: 0.01}}
gamut:
  - {{reference: srgb, metric: coverage, min: 90}}
units:
  - serial: U1
    white: {{x: 0.31, y: 0.33}}
    red: {{x: 0.69, y: 0.30}}
"""


def _file_form(name):
    return f"{{spectrum: {{file: data/leds.csv, channel: {name}}}}}"


def _xy_form(name):
    x, y = _xy(name)
    return f"{{x: {x!r}, y: {y!r}}}"


def test_spectra_give_the_same_rows_and_verdicts_as_their_chromaticities(spec_dir):
    (spec_dir.dir / "data").mkdir()
    (spec_dir.dir / "data" / "leds.csv").write_text(_csv(), encoding="utf-8")
    spec_dir("a.yaml", SPEC.format(id="by-spectrum", **{n: _file_form(n) for n in CHANNELS}))
    spec_dir("b.yaml", SPEC.format(id="by-xy", **{n: _xy_form(n) for n in CHANNELS}))
    evaluated, warnings = evaluate(spec_dir.dir)
    by_id = {e.spec.id: e for e in evaluated}
    a, b = by_id["by-spectrum"], by_id["by-xy"]
    strip = lambda rows: [(r["id"], r["sample"], r["verdict"], pytest.approx(r["value"])) for r in rows]  # noqa: E731
    assert strip(a.assessment.rows) == strip(b.assessment.rows)
    assert len(a.assessment.rows) == 5
    assert sorted(a.derived.spectra) == ["primaries.blue", "primaries.green", "primaries.red", "white.target"]
    w = a.derived.spectra["white.target"]
    assert w["interpolation"] == "sprague" and w["cct_K"] is not None and w["luminance_cd_m2"] is None
    assert a.derived.spectra["primaries.red"]["peak_wavelength_nm"] == 630.0
    # one resampling warning for the file, not one per column
    assert [w.message for w in warnings] == [
        "spectra of data/leds.csv sampled 380-780 nm at 5 nm resampled to 1 nm by Sprague interpolation "
        "(CIE 167:2005)"]


def test_an_inline_radiance_spectrum_gives_luminance(spec_dir):
    values = ", ".join(f"{v:.6e}" for v in 0.01 * CHANNELS["white"])
    spec_dir("w.yaml", f"""\
spec: 1
id: lamp
white:
  target: {{spectrum: {{start: 380, step: 5, values: [{values}], scale: radiance}}}}
  luminance: {{min: 5}}
""")
    (e,), _ = evaluate(spec_dir.dir)
    f = e.derived.spectra["white.target"]
    rs = resample_to_1nm(WL, [float(v) for v in values.split(", ")])   # the values as written
    expected = 683.002 * spectrum_XYZ(rs.wavelengths, rs.values)[1]
    assert f["luminance_cd_m2"] == pytest.approx(expected, rel=1e-9)
    row = next(r for r in e.assessment.rows if r["id"] == "white.luminance")
    assert row["value"] == pytest.approx(expected, rel=1e-9)


@pytest.fixture
def errors(spec_dir, monkeypatch):
    monkeypatch.chdir(spec_dir.dir)   # files are shown relative to where the tool runs
    return lambda text, files=None: _errors(spec_dir, text, files)


def _errors(spec_dir, text, files=None):
    for name, content in (files or {}).items():
        (spec_dir.dir / name).write_text(content, encoding="utf-8")
    spec_dir("s.yaml", text)
    with pytest.raises(InputError) as e:
        evaluate(Path("."))
    return [p.format() for p in e.value.problems]


HEAD = "spec: 1\nid: s\nwhite:\n  target: "


def test_a_spectra_file_outside_the_spec_folder_is_refused(errors):
    got = errors(HEAD + "{spectrum: {file: ../leds.csv, channel: white}}\n")
    assert got == ["s.yaml:4:29: white.target.spectrum.file: expected a file inside the spec's folder, found "
                   "'../leds.csv'\n    hint: spectra files live beside the spec or in a folder below it"]


def test_an_unknown_channel_suggests_the_closest(errors):
    got = errors(HEAD + "{spectrum: {file: leds.csv, channel: whte}}\n", {"leds.csv": _csv()})
    assert got == ["s.yaml:4:48: white.target.spectrum.channel: expected a column of leds.csv, found 'whte'\n"
                   "    hint: did you mean 'white'?"]


def test_a_bad_spectra_file_is_reported_at_its_own_line(errors):
    got = errors(HEAD + "{spectrum: {file: leds.csv, channel: a}}\n",
                  {"leds.csv": "wavelength,a\n400,1\n410,x\n420,1\n"})
    assert got == ["leds.csv:3:5: expected a number, found 'x'\n    hint: spectra files: a 'wavelength' column in "
                   "nm, then one column per channel (read for white.target.spectrum.file)"]


def test_a_missing_spectra_file_is_an_error(errors):
    got = errors(HEAD + "{spectrum: {file: none.csv, channel: a}}\n")
    assert got == ["s.yaml:4:29: white.target.spectrum.file: expected a readable spectra CSV file, found "
                   "'none.csv' (No such file or directory)\n    hint: give the path relative to the spec file"]


def test_a_dark_spectrum_is_an_error(errors):
    got = errors(HEAD + "{spectrum: {start: 380, step: 10, values: [0, 0, 0, 0]}}\n")
    assert got[0].startswith("s.yaml:4:22: white.target.spectrum: expected a spectrum with visible power")


def test_a_narrow_irregular_spectrum_resolves_despite_spline_ringing(spec_dir):
    # a 590 nm band sampled irregularly: the cubic spline rings below zero beside the peak,
    # which would put x + y above 1; negative values count as zero
    wl = np.array([380, 390, 402, 415, 430, 450, 470, 490, 510, 525, 540, 560, 580, 600, 620, 640, 660, 700,
                   740, 780.0])
    v = np.exp(-0.5 * ((wl - 590) / 8) ** 2)
    (spec_dir.dir / "amber.csv").write_text(
        "wavelength,amber\n" + "\n".join(f"{a:g},{b:.6e}" for a, b in zip(wl, v, strict=True)) + "\n", encoding="utf-8")
    spec_dir("a.yaml", """\
spec: 1
id: amber
colours:
  amber:
    target: {spectrum: {file: amber.csv, channel: amber}}
    tolerance: {dominant_wavelength: [580, 600]}
""")
    (e,), warnings = evaluate(spec_dir.dir)
    f = e.derived.spectra["colours.amber.target"]
    assert f["interpolation"] == "cubic-spline"
    assert f["x"] + f["y"] <= 1.0
    assert "natural cubic spline" in warnings[0].message
    (row,) = e.assessment.rows
    assert row["verdict"] == "pass" and 585 < row["value"] < 592
