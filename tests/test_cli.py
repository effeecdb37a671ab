"""The command line as CI uses it: exit codes, --json, --junit, no plotting on check."""
from __future__ import annotations

import json
import subprocess
import sys
from xml.etree import ElementTree as ET

from .conftest import DEMO_SPECS, ROOT

PASSING = """\
spec: 1
id: tiny-panel
title: Tiny panel
revision: A
status: draft
white:
  target: D65
  tolerance: {cct: [6000, 7000]}
primaries:
  red:   {x: 0.640, y: 0.330}
  green: {x: 0.300, y: 0.600}
  blue:  {x: 0.150, y: 0.060}
gamut:
  - {reference: srgb, metric: coverage, diagram: xy, min: 99}
"""


def run(*args, cwd=ROOT):
    return subprocess.run([sys.executable, "-m", "generator", *args], cwd=cwd, capture_output=True,
                          text=True, timeout=120)


def test_check_passes_with_exit_0_and_writes_results(spec_dir, tmp_path):
    spec_dir("tiny.yaml", PASSING)
    out = tmp_path / "r.json"
    r = run("check", str(spec_dir.dir), "--json", str(out))
    assert r.returncode == 0, r.stderr
    doc = json.loads(out.read_text())
    assert doc["format"] == "colourspec-results/1"
    assert [s["verdict"] for s in doc["specs"]] == ["pass"]
    assert "1 spec: all pass" in r.stderr


def test_check_fails_with_exit_1_when_a_requirement_fails(spec_dir):
    spec_dir("tiny.yaml", PASSING.replace("min: 99", "min: 101, max: 120").replace("metric: coverage",
                                                                                  "metric: area-ratio"))
    r = run("check", str(spec_dir.dir), "--json", "-")
    assert r.returncode == 1
    doc = json.loads(r.stdout)
    row = [x for x in doc["specs"][0]["requirements"] if x["quantity"] == "area-ratio"][0]
    assert row["verdict"] == "fail" and row["value"] == 100.0


def test_invalid_spec_exits_2_with_file_line_and_key(spec_dir):
    spec_dir("tiny.yaml", PASSING.replace("status: draft", "status: no"))
    r = run("check", str(spec_dir.dir))
    assert r.returncode == 2
    assert "tiny.yaml:5:9: status: expected one of draft, released, obsolete, found 'no'" in r.stderr
    assert "Traceback" not in r.stderr


def test_usage_error_exits_2():
    r = run("frobnicate")
    assert r.returncode == 2
    assert "invalid choice" in r.stderr


def test_junit_has_one_suite_per_spec_file_and_one_case_per_row(tmp_path):
    out = tmp_path / "j.xml"
    r = run("check", str(DEMO_SPECS), "--junit", str(out), "--json", str(tmp_path / "r.json"))
    assert r.returncode == 1
    doc = json.loads((tmp_path / "r.json").read_text())
    root = ET.parse(out).getroot()
    suites = root.findall("testsuite")
    assert sorted(s.get("name") for s in suites) == sorted(s["file"] for s in doc["specs"])
    n_rows = sum(len(s["requirements"]) for s in doc["specs"])
    assert len(root.findall("testsuite/testcase")) == n_rows == int(root.get("tests"))
    n_fail = sum(r["verdict"] != "pass" for s in doc["specs"] for r in s["requirements"])
    assert len(root.findall("testsuite/testcase/failure")) == n_fail > 0


def test_check_does_not_import_matplotlib_or_any_figure_code():
    figure_code = ["matplotlib", "generator.render.figures", "generator.render.svgplot", "generator.render.charts",
                   "generator.render.diagrams", "generator.render.png"]
    code = ("import sys; from generator.cli import main; rc = main(['check', 'specs']); "
            f"print(any(m in sys.modules for m in {figure_code!r}), rc)")
    r = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True, timeout=120)
    assert r.stdout.split() == ["False", "1"], r.stderr


def test_build_exits_0_once_the_site_is_written_and_1_with_gate(tmp_path):
    assert run("build", str(DEMO_SPECS), "-o", str(tmp_path / "a")).returncode == 0
    assert run("build", str(DEMO_SPECS), "-o", str(tmp_path / "b"), "--gate").returncode == 1


def test_build_summary_names_pages_diagrams_and_failing_specs(tmp_path):
    r = run("build", str(DEMO_SPECS), "-o", str(tmp_path / "out"))
    assert r.returncode == 0, r.stderr
    line = r.stdout.strip().splitlines()[-1]
    # the demo site changes as demo specs are added: count pages and diagrams from the site itself
    n_specs = len(list(DEMO_SPECS.glob("*.yaml")))
    n_svg = len(list((tmp_path / "out").rglob("*.svg")))
    assert n_specs >= 6 and n_svg >= 18
    assert line.startswith(f"Built {n_specs} spec pages and {n_svg} diagrams into ")
    assert "corvinta-atlas-27-studio" in line


def test_failed_build_leaves_the_previous_site_untouched(spec_dir, tmp_path):
    spec_dir("tiny.yaml", PASSING)
    out = tmp_path / "site"
    assert run("build", str(spec_dir.dir), "-o", str(out)).returncode == 0
    before = {p: p.read_bytes() for p in out.rglob("*") if p.is_file()}
    spec_dir("tiny.yaml", PASSING.replace("x: 0.640", "x: 0.94"))
    r = run("build", str(spec_dir.dir), "-o", str(out))
    assert r.returncode == 2
    after = {p: p.read_bytes() for p in out.rglob("*") if p.is_file()}
    assert after == before


def test_new_writes_a_starter_spec_that_validates(tmp_path):
    target = tmp_path / "specs" / "my-panel.yaml"
    r = run("new", str(target))
    assert r.returncode == 0, r.stderr
    assert "id: my-panel" in target.read_text()
    r = run("check", str(target))
    assert r.returncode == 0, r.stderr
    assert run("new", str(target)).returncode == 2  # refuses to overwrite


def test_schema_is_draft07_and_accepts_every_demo_spec(tmp_path):
    import jsonschema
    import yaml

    r = run("schema")
    assert r.returncode == 0
    schema = json.loads(r.stdout)
    jsonschema.Draft7Validator.check_schema(schema)
    v = jsonschema.Draft7Validator(schema)
    for f in sorted(DEMO_SPECS.glob("*.yaml")):
        assert list(v.iter_errors(yaml.safe_load(f.read_text()))) == [], f.name
    bad = yaml.safe_load(PASSING.replace("status: draft", "status: finished"))
    assert list(v.iter_errors(bad))


def test_generated_key_reference_is_up_to_date():
    from generator.docs import json_schema_text, spec_keys_markdown

    assert (ROOT / "docs" / "spec-keys.md").read_text(encoding="utf-8") == spec_keys_markdown(), \
        "regenerate with: python -m generator.docs"
    assert (ROOT / "docs" / "spec-1.schema.json").read_text(encoding="utf-8") == json_schema_text()


def test_annotations_go_to_stdout_and_point_at_the_line_of_the_failing_limit(spec_dir):
    from generator.render.annotations import parse

    spec_dir("tiny.yaml", PASSING.replace("min: 99", "min: 101, max: 120").replace("metric: coverage",
                                                                                  "metric: area-ratio"))
    r = run("check", str(spec_dir.dir), "--annotations")
    assert r.returncode == 1
    lines = r.stdout.splitlines()
    assert len(lines) == 1
    a = parse(lines[0])
    assert (a.severity, a.file.rsplit("/", 1)[-1], a.line, a.col) == ("error", "tiny.yaml", 14, 56)
    assert a.title == "colourspec gamut.srgb.area-ratio.xy"
    assert a.message.startswith("tiny-panel: area-ratio of sRGB (CIE 1931 xy) is fail: 100.0% against 101.0 to")
    assert "Checked 1 spec: 1 fail" in r.stderr and "::" not in r.stderr


def test_annotations_of_invalid_input_carry_file_line_and_col_and_exit_2(spec_dir):
    from generator.render.annotations import parse

    spec_dir("tiny.yaml", PASSING.replace("status: draft", "status: no"))
    r = run("check", str(spec_dir.dir), "--annotations")
    assert r.returncode == 2
    a = parse(r.stdout.splitlines()[0])
    assert (a.severity, a.line, a.col, a.title) == ("error", 5, 9, "colourspec status")
    assert a.message == ("expected one of draft, released, obsolete, found 'no'\n"
                         "hint: YAML 1.1 would read this word as a boolean; it is kept as text here")


def test_annotations_of_the_demo_are_capped_with_a_summary_line():
    r = run("check", str(DEMO_SPECS), "--annotations", "--annotations-limit", "3")
    lines = r.stdout.splitlines()
    assert r.returncode == 1
    kinds = [ln.split(" ")[0] for ln in lines]
    # the spectra warnings (resampled to 1 nm) come first, then the failing rows; indeterminate
    # rows (the guard-banded Vela 24 lots) are warnings too, capped with them at 3
    w = kinds.index("::error")
    assert 1 <= w < 3
    assert kinds == ["::warning"] * w + ["::error"] * 3 + ["::warning"] * (3 - w) + ["::notice"]
    assert "more errors" in lines[-1] and "not shown as annotations (limit 3 per kind" in lines[-1]
    # a unit read from a measurement file is located at its measurements: entry (uncapped, so
    # that other demo specs' rows before it do not push it out)
    r = run("check", str(DEMO_SPECS), "--annotations", "--annotations-limit", "100000")
    vela = [ln for ln in r.stdout.splitlines() if "corvinta-vela-24-monitor.yaml" in ln]
    assert vela and all(",line=4" in ln and ",col=5," in ln for ln in vela)


def test_strict_turns_warnings_into_a_failure(spec_dir):
    # a measured red 0.003 outside the spectral locus is kept with a warning (instrument noise)
    spec_dir("tiny.yaml", PASSING + "units:\n  - serial: S1\n    red: {x: 0.735, y: 0.262}\n")
    plain = run("check", str(spec_dir.dir), "--annotations")
    assert plain.returncode == 0, plain.stderr
    assert "warning: units[0].red: measured chromaticity" in plain.stderr
    assert plain.stdout.startswith("::warning file=")
    strict = run("check", str(spec_dir.dir), "--strict")
    assert strict.returncode == 1
    assert "--strict: 1 warning(s) and 0 indeterminate spec(s) count as failures" in strict.stderr


def test_strict_without_warnings_still_passes(spec_dir):
    spec_dir("tiny.yaml", PASSING)
    assert run("check", str(spec_dir.dir), "--strict").returncode == 0


def test_two_machine_outputs_on_stdout_are_a_usage_error(spec_dir):
    spec_dir("tiny.yaml", PASSING)
    r = run("check", str(spec_dir.dir), "--json", "-", "--annotations")
    assert r.returncode == 2
    assert "--json and --annotations cannot both write to standard output" in r.stderr


def test_no_gate_passes_failing_verdicts_but_not_invalid_input(spec_dir):
    spec_dir("tiny.yaml", PASSING.replace("min: 99", "min: 101, max: 120").replace("metric: coverage",
                                                                                  "metric: area-ratio"))
    assert run("check", str(spec_dir.dir)).returncode == 1
    assert run("check", str(spec_dir.dir), "--no-gate").returncode == 0
    spec_dir("tiny.yaml", PASSING.replace("status: draft", "status: no"))
    assert run("check", str(spec_dir.dir), "--no-gate").returncode == 2


def test_pre_commit_hooks_run_check_on_the_specs_folder():
    import shlex

    import yaml

    hooks = {h["id"]: h for h in yaml.safe_load((ROOT / ".pre-commit-hooks.yaml").read_text(encoding="utf-8"))}
    assert sorted(hooks) == ["colourspec-check", "colourspec-validate"]
    for h in hooks.values():
        assert {"id", "name", "entry", "language"} <= set(h)
        assert h["pass_filenames"] is False and h["language"] == "python"
        argv = shlex.split(h["entry"])[1:] + h["args"]
        r = run(*argv)  # the demo specs: valid, with failing units on purpose
        assert r.returncode == (0 if h["id"] == "colourspec-validate" else 1), r.stderr


def test_build_reuses_unchanged_pages_and_clean_draws_everything(spec_dir, tmp_path):
    spec_dir("tiny.yaml", PASSING)
    out = tmp_path / "site"
    first = run("build", str(spec_dir.dir), "-o", str(out))
    again = run("build", str(spec_dir.dir), "-o", str(out))
    clean = run("build", str(spec_dir.dir), "-o", str(out), "--clean")
    assert (first.returncode, again.returncode, clean.returncode) == (0, 0, 0)
    assert "reused" not in first.stdout and "reused" not in clean.stdout
    assert "; 1 unchanged pages reused)" in again.stdout
    assert (tmp_path / ".site.cache").is_dir() and not any((out / n).exists() for n in (".cache", ".site.cache"))


def test_the_summary_line_names_at_most_ten_failing_specs_and_counts_the_rest(spec_dir):
    failing = PASSING.replace("min: 99", "min: 101, max: 120").replace("metric: coverage", "metric: area-ratio")
    for k in range(12):
        spec_dir(f"tiny-{k:02d}.yaml", failing.replace("id: tiny-panel", f"id: tiny-{k:02d}"))
    r = run("check", str(spec_dir.dir))
    assert r.returncode == 1
    line = [x for x in r.stderr.splitlines() if x.startswith("Checked")][0]
    assert "12 specs: 12 fail (tiny-00, tiny-01," in line
    assert "tiny-09 and 2 more: see results.json)" in line and "tiny-10" not in line
