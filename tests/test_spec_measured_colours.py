"""Colour targets measured in measurement files (channel colours.NAME): as x, y, Y or as a
spectrum, through the one spectrum integration path, assessed like inline measured colours;
bad records reported as FILE:LINE:COL with exit 2."""
from __future__ import annotations

import os
import subprocess
import sys

import numpy as np
import pytest

from generator.build import evaluate

HEAD = """\
spec: 1
id: lamps
colours:
  reference_white: D65
  amber:
    target: {x: 0.5750, y: 0.4240, Y: 48}
    tolerance: {dominant_wavelength: [587, 593], delta_e2000: 5.0}
  red:
    target: {x: 0.7000, y: 0.2990}
    tolerance: {delta_uv: 0.01}
"""

WL = np.arange(380, 781, 5)


def _amber_spectrum(peak=590.0):
    """An amber LED-like band (Gaussian, σ = 7 nm), values at 5 nm from 380 nm."""
    return 0.004 * np.exp(-0.5 * ((WL - peak) / 7.0) ** 2)


def _spectra_csv(rows):
    head = "serial,lot,channel,Y," + ",".join(f"{w:g}" for w in WL)
    return head + "\n" + "".join(f"{s},L1,{ch},{Y}," + ",".join(f"{v:.9g}" for v in vals) + "\n"
                                 for s, ch, Y, vals in rows)


XY_CSV = """serial,lot,channel,x,y,Y
F-1,L1,colours.amber,0.5762,0.4226,47.1
F-1,L1,colours.red,0.6985,0.3004,
F-2,L1,colours.amber,0.5680,0.4300,51.0
"""


def _write(spec_dir, files: dict[str, str], units: str = ""):
    spec_dir("lamps.yaml", HEAD + "measurements:\n" + "".join(f"  - m/{n}\n" for n in files) + units)
    (spec_dir.dir / "m").mkdir(exist_ok=True)
    for n, text in files.items():
        (spec_dir.dir / "m" / n).write_text(text, encoding="utf-8")


def _rows(e):
    return {(r["sample"], r["id"]): r for r in e.assessment.rows}


def test_colour_records_of_a_file_are_assessed_as_the_same_inline_measurements(spec_dir):
    _write(spec_dir, {"xy.csv": XY_CSV})
    (e,), _ = evaluate(spec_dir.dir)
    spec_dir("lamps.yaml", HEAD + """units:
  - {serial: F-1, lot: L1, colours: {amber: {x: 0.5762, y: 0.4226, Y: 47.1}, red: {x: 0.6985, y: 0.3004}}}
  - {serial: F-2, lot: L1, colours: {amber: {x: 0.5680, y: 0.4300, Y: 51.0}}}
""")
    (inline,), _ = evaluate(spec_dir.dir)
    got, want = _rows(e), _rows(inline)
    unit_rows = [k for k in want if k[0] is not None]
    assert len(unit_rows) == 5 and set(k for k in got if k[0] is not None) == set(unit_rows)
    for k in unit_rows:
        assert got[k]["verdict"] == want[k]["verdict"], k
        assert got[k]["value"] == pytest.approx(want[k]["value"], rel=1e-12), k
    assert got[("F-2", "colours.amber.delta_e2000")]["value"] > 0
    assert [u["serial"] for u in e.assessment.units] == ["F-1", "F-2"]
    assert e.assessment.units[0]["source"].endswith("m/xy.csv:2")
    # measured colours are drawn with the units
    from generator.render.diagrams import layer_for

    class _E:
        spec, derived, assessment = e.spec, e.derived, e.assessment
    labels = [u[0] for u in layer_for(_E, "xy").units]
    assert labels == ["F-1 amber", "F-1 red", "F-2 amber"]


def test_a_colour_spectrum_in_a_file_integrates_as_an_inline_spectrum(spec_dir):
    """The file's spectrum and the same values written inline under units[].colours go through
    the one integration path (CIE 167 resampling to 1 nm, CIE 15 summation): same xy."""
    s = _amber_spectrum()
    s[10] = -1e-5                      # a negative reading (noise) counts as zero on both paths
    _write(spec_dir, {"sp.csv": _spectra_csv([("S-1", "colours.amber", 47.5, s)])})
    (e,), warnings = evaluate(spec_dir.dir)
    spec_dir("lamps.yaml", HEAD + "units:\n  - serial: S-1\n    lot: L1\n    colours:\n      amber: {Y: 47.5, "
             "spectrum: {start: 380, step: 5, values: [" + ", ".join(f"{v:.9g}" for v in s) + "]}}\n")
    (inline,), _ = evaluate(spec_dir.dir)
    (m_file,) = [e.spec.unit_colours["S-1"]["amber"]]
    m_inline = inline.spec.unit_colours["S-1"]["amber"]
    assert m_file.xy == pytest.approx(m_inline.xy, abs=1e-12)
    assert m_file.Y == 47.5           # the luminance factor from the Y column, not the spectrum's cd/m²
    got, want = _rows(e), _rows(inline)
    for rid in ("colours.amber.dominant_wavelength", "colours.amber.delta_e2000"):
        assert got[("S-1", rid)]["value"] == pytest.approx(want[("S-1", rid)]["value"], rel=1e-10)
        assert got[("S-1", rid)]["verdict"] == "pass"


def test_a_colour_spectrum_against_an_independent_summation():
    """The spectrum of a colours.NAME record: xy of the 1 nm CIE 15 sum of colour-science's
    Sprague-interpolated values (an independent implementation), to 1e-6."""
    colour = pytest.importorskip("colour")
    from generator.measure.csvfile import parse_csv

    s = _amber_spectrum(596.0)
    r = parse_csv(_spectra_csv([("S-1", "colours.amber", 40, s)]), "sp.csv")
    sd = colour.SpectralDistribution(dict(zip(WL.tolist(), s.tolist())))
    sd = sd.copy().interpolate(colour.SpectralShape(380, 780, 1), interpolator=colour.SpragueInterpolator)
    cmfs = colour.MSDS_CMFS["CIE 1931 2 Degree Standard Observer"].copy().trim(colour.SpectralShape(380, 780, 1))
    XYZ = (np.clip(sd.values, 0, None)[:, None] * cmfs.values).sum(axis=0)
    assert (r.x[0], r.y[0]) == pytest.approx(tuple(XYZ[:2] / XYZ.sum()), abs=1e-6)
    assert r.Y[0] == 40.0 and r.channel == ["colours.amber"]


def test_a_colour_off_its_bin_fails_from_a_file_spectrum(spec_dir):
    _write(spec_dir, {"sp.csv": _spectra_csv([("S-1", "colours.amber", 48, _amber_spectrum(590.0)),
                                              ("S-2", "colours.amber", 48, _amber_spectrum(600.0))])})
    (e,), _ = evaluate(spec_dir.dir)
    rows = _rows(e)
    assert rows[("S-1", "colours.amber.dominant_wavelength")]["verdict"] == "pass"
    assert rows[("S-2", "colours.amber.dominant_wavelength")]["verdict"] == "fail"
    assert [u["verdict"] for u in e.assessment.units] == ["pass", "fail"]


def _run(cwd, *args):
    env = dict(os.environ, PYTHONPATH=os.getcwd())
    return subprocess.run([sys.executable, "-m", "generator", *args], cwd=cwd, capture_output=True, text=True,
                          timeout=120, env=env)


@pytest.mark.parametrize("files,units,expected", [
    ({"xy.csv": XY_CSV.replace("colours.red", "colours.rde")}, "",
     "specs/m/xy.csv:3:1: channel: expected 'white' or a primary of the spec (none), or one of its colours "
     "(colours.amber, colours.red), found 'colours.rde'"),
    ({"xy.csv": XY_CSV.replace("0.4226,47.1", "0.4226,")}, "",
     "specs/m/xy.csv:2:1: Y: expected a luminance factor Y for colours.amber, which has a ΔE limit, found none"),
    ({"sp.csv": _spectra_csv([("S-1", "colours.amber", "", _amber_spectrum())])}, "",
     "specs/m/sp.csv:2:1: Y: expected a luminance factor Y for colours.amber, which has a ΔE limit, found none"),
    ({"sp.csv": _spectra_csv([("S-1", "white", 48, _amber_spectrum())])}, "",
     "specs/m/sp.csv:2:4: Y: expected an empty Y for a white spectrum, found '48'"),
    ({"pt.csv": "serial,channel,point,x,y,Y\nP-1,colours.amber,C,0.575,0.424,48\n"}, "",
     "specs/m/pt.csv:2:1: point: expected no point for a colours.amber record, found 'C'"),
    ({"xy.csv": XY_CSV}, "units:\n  - {serial: F-2, colours: {amber: {x: 0.568, y: 0.430, Y: 51}}}\n",
     "specs/m/xy.csv:4:1: channel: expected one measurement of amber for unit F-2, found one in this file and "
     "one under units"),
])
def test_bad_colour_records_are_reported_by_file_line_and_field(spec_dir, files, units, expected):
    _write(spec_dir, files, units)
    p = _run(spec_dir.dir.parent, "check", "specs")
    assert p.returncode == 2, p.stderr
    assert "Traceback" not in p.stderr
    assert expected in p.stderr, p.stderr


CGATS = """CGATS.17
ORIGINATOR "Varrow Lumen Devices"
KEYWORD "CHANNEL"
CHANNEL "colours.amber"
NUMBER_OF_FIELDS 4
BEGIN_DATA_FORMAT
SAMPLE_ID XYY_X XYY_Y XYY_CAPY
END_DATA_FORMAT
NUMBER_OF_SETS 2
BEGIN_DATA
"C-1" 0.5762 0.4226 47.1
"C-2" 0.5950 0.4030 47.1
END_DATA
"""


def test_cgats_tables_name_colour_targets_by_their_channel_too(spec_dir):
    _write(spec_dir, {"lot.cgats": CGATS})
    (e,), _ = evaluate(spec_dir.dir)
    rows = _rows(e)
    assert e.spec.unit_colours["C-1"]["amber"].Y == 47.1
    assert rows[("C-1", "colours.amber.dominant_wavelength")]["verdict"] == "pass"
    assert rows[("C-2", "colours.amber.dominant_wavelength")]["verdict"] == "fail"
