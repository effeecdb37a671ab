"""`colourspec check` and `build` as a user runs them, on bad specs: exit status 2, one
FILE:LINE:COL line per problem on standard error, never a traceback.

Each file in tests/bad_specs/ lists the problem lines it must produce in `# expect:`
comments at its top; the tests compare them exactly with what the tool prints."""
from __future__ import annotations

import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from generator.cli import main

BAD_SPECS = Path(__file__).resolve().parent / "bad_specs"
FIXTURES = sorted(BAD_SPECS.glob("*.yaml"))


def expected_lines(fixture: Path, shown_as: str) -> list[str]:
    text = fixture.read_text(encoding="utf-8")
    return [f"{shown_as}:{m}" for m in re.findall(r"^# expect: (.*)$", text, re.MULTILINE)]


def run_tool(cwd: Path, *args: str) -> subprocess.CompletedProcess:
    env = dict(os.environ, PYTHONWARNINGS="default")
    return subprocess.run([sys.executable, "-m", "generator", *args], cwd=cwd, capture_output=True,
                          text=True, timeout=120, env=env)


def problem_lines(stderr: str) -> list[str]:
    """The problem lines of a run (not hints, not the summary line)."""
    return [line for line in stderr.splitlines() if line.startswith("specs/")]


def test_every_fixture_states_what_it_expects():
    assert len(FIXTURES) >= 10
    for f in FIXTURES:
        assert expected_lines(f, f.name), f"{f.name} has no '# expect:' line"


@pytest.mark.parametrize("fixture", FIXTURES, ids=[f.stem for f in FIXTURES])
def test_check_reports_each_bad_spec_exactly(tmp_path, monkeypatch, capsys, fixture):
    (tmp_path / "specs").mkdir()
    shutil.copy(fixture, tmp_path / "specs" / fixture.name)
    monkeypatch.chdir(tmp_path)
    status = main(["check", "specs"])
    out, err = capsys.readouterr()
    assert "Traceback" not in err
    assert status == 2, err
    assert problem_lines(err) == expected_lines(fixture, f"specs/{fixture.name}")
    assert out == ""


def test_check_reports_all_problems_of_all_files_in_one_run(tmp_path):
    shutil.copytree(BAD_SPECS, tmp_path / "specs")
    r = run_tool(tmp_path, "check", "specs")
    assert "Traceback" not in r.stderr
    assert r.returncode == 2
    expected = [line for f in FIXTURES for line in expected_lines(f, f"specs/{f.name}")]
    assert problem_lines(r.stderr) == expected
    assert r.stderr.rstrip().endswith(f"{len(expected)} error(s): nothing was assessed or written.")


def test_hints_follow_their_problem_line(tmp_path):
    (tmp_path / "specs").mkdir()
    shutil.copy(BAD_SPECS / "unknown-keys.yaml", tmp_path / "specs")
    r = run_tool(tmp_path, "check", "specs")
    assert r.stderr.splitlines()[:4] == [
        "specs/unknown-keys.yaml:5:1: tittle: expected a known key, found unknown key 'tittle'",
        "    hint: did you mean 'title'?",
        "specs/unknown-keys.yaml:8:3: white.tolerence: expected a known key, found unknown key 'tolerence'",
        "    hint: did you mean 'tolerance'?",
    ]


@pytest.mark.parametrize("content, expected", [
    (b"", "specs/s.yaml:1:1: expected a spec mapping, found an empty file"),
    (b"spec: 1\nid: a\ntitle: caf\xe9\n", "specs/s.yaml:3:11: expected UTF-8 text, found the byte 0xe9"),
    (b"spec: 1\x00\n", "specs/s.yaml:1:8: expected text, found a NUL character (is this a binary file?)"),
], ids=["empty", "latin-1", "binary"])
def test_files_that_are_not_yaml_text(tmp_path, content, expected):
    (tmp_path / "specs").mkdir()
    (tmp_path / "specs" / "s.yaml").write_bytes(content)
    r = run_tool(tmp_path, "check", "specs")
    assert (r.returncode, problem_lines(r.stderr)) == (2, [expected])
    assert "Traceback" not in r.stderr


def test_byte_order_mark_checks_fine(tmp_path):
    (tmp_path / "specs").mkdir()
    (tmp_path / "specs" / "s.yaml").write_bytes(b"\xef\xbb\xbfspec: 1\nid: orbit-24\n")
    r = run_tool(tmp_path, "check", "specs")
    assert r.returncode == 0, r.stderr
    assert problem_lines(r.stderr) == []


def test_build_refuses_bad_specs_and_writes_nothing(tmp_path):
    shutil.copytree(BAD_SPECS, tmp_path / "specs")
    r = run_tool(tmp_path, "build", "specs", "-o", "out")
    assert "Traceback" not in r.stderr
    assert r.returncode == 2
    assert "specs/units.yaml:12:5: units[0].rde: expected a unit key or a primary of this spec, " \
           "found unknown key 'rde'" in problem_lines(r.stderr)
    assert not (tmp_path / "out").exists()


def test_missing_specs_folder(tmp_path):
    r = run_tool(tmp_path, "check", "nowhere")
    assert (r.returncode, "Traceback" in r.stderr) == (2, False)
    assert r.stderr.startswith("nowhere:1:1: expected a spec file or a folder of specs, found nothing there")


def test_a_spec_that_links_out_of_the_specs_folder_is_not_read(tmp_path, monkeypatch, capsys):
    (tmp_path / "outside.yaml").write_text("spec: 1\nid: outside\n", encoding="utf-8")
    (tmp_path / "specs").mkdir()
    (tmp_path / "specs" / "inside.yaml").write_text("spec: 1\nid: inside\n", encoding="utf-8")
    (tmp_path / "specs" / "link.yaml").symlink_to("../outside.yaml")
    (tmp_path / "specs" / "sub").mkdir()
    (tmp_path / "specs" / "sub" / "ok.yaml").symlink_to("../inside.yaml")  # a link inside is fine
    monkeypatch.chdir(tmp_path)
    assert main(["check", "specs"]) == 2
    err = capsys.readouterr().err
    assert problem_lines(err) == ["specs/link.yaml:1:1: expected a spec file inside specs, found a link to a file "
                                  "outside it", "specs/sub/ok.yaml:2:5: id: expected an id of its own, found 'inside' "
                                  "again (also the id of specs/inside.yaml)"]
