"""Specs with measurement files: units read and assessed like inline ones; bad files and
bad paths reported as FILE:LINE:COL with exit 2, never a traceback."""
from __future__ import annotations

import json
import os
import subprocess
import sys

import pytest

from generator.build import evaluate

SPEC = """\
spec: 1
id: lot-check
white:
  target: D65
  tolerance: {delta_uv: 0.005}
  luminance: {min: 200}
decision_rule: RULE
uncertainty: {delta_uv: 0.0015, luminance: '2%'}
measurements:
  - m/lot.csv
units:
  - serial: INL-1
    lot: L1
    white: {x: 0.3127, y: 0.3290, Y: 300}
"""

CSV = """serial,lot,supplier,channel,x,y,Y
F-1,L1,Tessaly Panel Works,white,0.3127,0.3290,300
F-2,L1,Tessaly Panel Works,white,0.3185,0.3340,300
F-3,L2,Umbrin Optoelectronics,white,0.3127,0.3290,203
"""


def _write(spec_dir, rule="guard-banded", csv=CSV):
    spec_dir("lot.yaml", SPEC.replace("RULE", rule))
    (spec_dir.dir / "m").mkdir(exist_ok=True)
    (spec_dir.dir / "m" / "lot.csv").write_text(csv, encoding="utf-8")


def test_file_units_are_assessed_beside_inline_units(spec_dir):
    _write(spec_dir)
    (e,), _ = evaluate(spec_dir.dir)
    a = e.assessment
    assert [u["serial"] for u in a.units] == ["INL-1", "F-1", "F-2", "F-3"]
    rows = {(r["sample"], r["id"]): r for r in a.rows}
    # F-2 lies about 0.0041 from D65 in u'v': inside 0.005 but within U of it
    assert rows[("F-2", "white.delta_uv")]["verdict"] == "indeterminate"
    assert rows[("F-2", "white.delta_uv")]["uncertainty"] == 0.0015
    # 203 cd/m² against min 200 with U = 2 % (4.06): indeterminate
    assert rows[("F-3", "white.luminance")]["verdict"] == "indeterminate"
    assert rows[("F-1", "white.delta_uv")]["verdict"] == "pass"
    lots = {lot["lot"]: lot for lot in a.lots}
    assert lots["L1"]["n"] == 3 and lots["L1"]["verdict"] == "indeterminate"
    assert lots["L2"]["suppliers"] == ["Umbrin Optoelectronics"]
    assert [s["supplier"] for s in a.suppliers] == ["Tessaly Panel Works", "Umbrin Optoelectronics"]
    assert a.units[1]["source"].endswith("m/lot.csv:2")


def test_simple_rule_decides_the_same_units(spec_dir):
    _write(spec_dir, rule="simple")
    (e,), _ = evaluate(spec_dir.dir)
    rows = {(r["sample"], r["id"]): r for r in e.assessment.rows}
    assert rows[("F-2", "white.delta_uv")]["verdict"] == "pass"
    assert rows[("F-3", "white.luminance")]["verdict"] == "pass"
    assert e.assessment.rule.as_json()["guard_band"] == "w = 0"


def _run(cwd, *args):
    env = dict(os.environ, PYTHONWARNINGS="default")
    return subprocess.run([sys.executable, "-m", "generator", *args], cwd=cwd, capture_output=True, text=True,
                          timeout=120, env=env)


@pytest.mark.parametrize("csv,expected", [
    (CSV.replace("F-2,L1", "F-2,L1,extra"), "specs/m/lot.csv:3:1: row: expected 7 cells as in the header, found 8"),
    (CSV.replace("0.3340", "0.3x40"), "specs/m/lot.csv:3:6: y: expected a finite number, found '0.3x40'"),
    (CSV.replace("F-3,L2", "F-1,L2"), "specs/m/lot.csv:4:1: lot: expected the same lot for every record of unit F-1"),
    (CSV.replace("F-3,L2,Umbrin Optoelectronics,white", "F-3,L2,Umbrin Optoelectronics,cyan"),
     "specs/m/lot.csv:4:1: channel: expected 'white' or a primary of the spec"),
    (CSV.replace("0.3127,0.3290,203", "0.6,0.6,203"), "specs/m/lot.csv:4:1: x: expected x + y <= 1, found x + y = 1.2000"),
])
def test_bad_file_content_is_reported_by_file_line_and_field(spec_dir, csv, expected):
    _write(spec_dir, csv=csv)
    p = _run(spec_dir.dir.parent, "check", "specs")
    assert p.returncode == 2, p.stderr
    assert "Traceback" not in p.stderr
    assert any(line.startswith(expected) for line in p.stderr.splitlines()), p.stderr


def test_a_path_leaving_the_specs_folder_is_refused_at_its_key(spec_dir):
    spec_dir("lot.yaml", SPEC.replace("RULE", "simple").replace("m/lot.csv", "../secret.csv"))
    (spec_dir.dir.parent / "secret.csv").write_text(CSV)
    p = _run(spec_dir.dir.parent, "check", "specs")
    assert p.returncode == 2
    assert "specs/lot.yaml:10:5: measurements[0]: expected a file inside the specs folder" in p.stderr


def test_check_json_has_the_rule_lots_statistics_and_suppliers(spec_dir, tmp_path):
    _write(spec_dir)
    out = tmp_path / "r.json"
    p = _run(spec_dir.dir.parent, "check", "specs", "--json", str(out))
    assert p.returncode == 0, p.stderr            # indeterminate is not a failure
    s = json.loads(out.read_text())["specs"][0]
    assert s["decision_rule"] == "guard-banded" and s["decision"]["guard_band"] == "w = U"
    assert s["decision"]["uncertainty"]["luminance"] == {"relative_percent": 2.0}
    assert s["measurements"] == ["specs/m/lot.csv"]
    lot = next(lot for lot in s["lots"] if lot["lot"] == "L1")
    st = {x["id"]: x for x in lot["statistics"]}
    assert st["white.delta_uv"]["n"] == 3 and st["white.delta_uv"]["capability_form"].startswith("upper, radial")
    assert [x["supplier"] for x in s["suppliers"]] == ["Tessaly Panel Works", "Umbrin Optoelectronics"]


def test_measurements_named_by_a_parent_spec_are_relative_to_the_parent(spec_dir):
    _write(spec_dir)
    (spec_dir.dir / "child").mkdir()
    spec_dir("child/child.yaml", "spec: 1\nid: lot-child\nextends: lot-check\n")
    (_, child), _ = evaluate(spec_dir.dir)
    assert child.spec.id == "lot-child" and len(child.assessment.units) == 4


def test_the_fast_locus_distance_equals_the_exact_one():
    import numpy as np

    from generator.colour.wavelength import outside_locus_distance
    from generator.spec.measured import locus_distance

    rng = np.random.default_rng(5)
    p = np.vstack([rng.uniform(-0.1, 0.9, (5000, 2)), rng.normal((0.3127, 0.329), 0.01, (5000, 2))])
    for observer in ("cie1931-2", "cie1964-10"):
        assert np.array_equal(locus_distance(p, observer), outside_locus_distance(p, observer))
