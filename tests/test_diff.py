"""colourspec diff: a loosened tolerance shows as exactly that change plus the verdicts it
flips, from two folders and from two git revisions; text and Markdown."""
from __future__ import annotations

import os
import shutil
import subprocess
import sys

import pytest

from generator import diff as D

from .conftest import DEMO_SPECS, ROOT

ATLAS = "corvinta-atlas-27-studio.yaml"
GIT_ENV = {"GIT_AUTHOR_NAME": "Test Author", "GIT_AUTHOR_EMAIL": "author@example.invalid",
           "GIT_COMMITTER_NAME": "Test Author", "GIT_COMMITTER_EMAIL": "author@example.invalid",
           "GIT_AUTHOR_DATE": "2026-03-01T10:00:00+00:00", "GIT_COMMITTER_DATE": "2026-03-01T10:00:00+00:00",
           "GIT_CONFIG_GLOBAL": os.devnull, "GIT_CONFIG_NOSYSTEM": "1"}


def run(*args, cwd=ROOT):
    return subprocess.run([sys.executable, "-m", "generator", *args], cwd=cwd, capture_output=True, text=True,
                          timeout=120, env={**os.environ, "PYTHONPATH": str(ROOT)})


def _loosen(folder):
    p = folder / ATLAS
    text = p.read_text(encoding="utf-8")
    assert text.count("delta_uv: 0.004") == 1
    p.write_text(text.replace("delta_uv: 0.004", "delta_uv: 0.005"), encoding="utf-8")


@pytest.fixture
def two_folders(tmp_path):
    old, new = tmp_path / "old", tmp_path / "new"
    shutil.copytree(DEMO_SPECS, old)
    shutil.copytree(DEMO_SPECS, new)
    _loosen(new)
    return old, new


def test_loosened_tolerance_is_the_only_change_and_its_flipped_verdict_is_shown(two_folders):
    diffs = D.compare(D.side(str(two_folders[0])), D.side(str(two_folders[1])))
    assert [d.id for d in diffs] == ["corvinta-atlas-27-studio"]
    d = diffs[0]
    assert [(c.kind, c.key, c.old, c.new) for c in d.changes] == [
        ("tolerance", "white.tolerance.delta_uv", 0.004, 0.005)]
    assert [(v.row, v.sample, v.old, v.new) for v in d.verdicts] == [("white.delta_uv", "AT27-0002", "fail", "pass")]
    assert (d.old_verdict, d.new_verdict) == ("fail", "fail")  # AT27-0002 still fails other rows


def test_identical_folders_have_no_change(tmp_path):
    shutil.copytree(DEMO_SPECS, tmp_path / "a")
    diffs = D.compare(D.side(str(DEMO_SPECS)), D.side(str(tmp_path / "a")))
    assert diffs == []
    assert D.text_report(diffs, "a", "b") == "colourspec diff a -> b: no change to any spec\n"


def test_a_parent_change_shows_in_every_child_it_reaches(tmp_path):
    old, new = tmp_path / "old", tmp_path / "new"
    shutil.copytree(DEMO_SPECS, old)
    shutil.copytree(DEMO_SPECS, new)
    p = new / "corvinta-brisk-14-office.yaml"
    p.write_text(p.read_text(encoding="utf-8").replace("min: 95}", "min: 96}"), encoding="utf-8")
    diffs = D.compare(D.side(str(old)), D.side(str(new)))
    assert {d.id: [(c.key, c.old, c.new) for c in d.changes] for d in diffs} == {
        "corvinta-brisk-14-office": [("gamut.srgb.coverage.xy", ">= 95", ">= 96")],
        "corvinta-brisk-16-office": [("gamut.srgb.coverage.xy", ">= 95", ">= 96")]}


def test_added_and_removed_specs_and_units(tmp_path):
    old, new = tmp_path / "old", tmp_path / "new"
    shutil.copytree(DEMO_SPECS, old)
    shutil.copytree(DEMO_SPECS, new)
    (new / "corvinta-prism-5-cinema.yaml").unlink()
    p = new / "corvinta-brisk-16-office.yaml"
    text = p.read_text(encoding="utf-8")
    p.write_text(text[:text.index("  - serial: BR16-0002")], encoding="utf-8")
    diffs = {d.id: d for d in D.compare(D.side(str(old)), D.side(str(new)))}
    assert diffs["corvinta-prism-5-cinema"].status == "removed"
    d = diffs["corvinta-brisk-16-office"]
    assert [(c.kind, c.action, c.key) for c in d.changes] == [("unit", "removed", "units.BR16-0002")]
    assert (d.old_verdict, d.new_verdict) == ("fail", "pass")
    assert {v.new for v in d.verdicts} == {None} and {v.sample for v in d.verdicts} == {"BR16-0002"}
    text = D.text_report(list(diffs.values()), "a", "b")
    assert "corvinta-prism-5-cinema (" in text and "spec removed (verdict pass)" in text
    assert "  measured unit removed: units.BR16-0002: white x 0.3109, y 0.3262, Y 351;" in text


def test_text_and_markdown_reports(two_folders):
    diffs = D.compare(D.side(str(two_folders[0])), D.side(str(two_folders[1])))
    text = D.text_report(diffs, "old", "new")
    assert text.splitlines()[0] == "colourspec diff old -> new: 1 spec changed, 1 requirement verdict changed"
    assert "  tolerance changed: white.tolerance.delta_uv: 0.004 -> 0.005" in text
    assert "  verdict fail -> pass: white.delta_uv [unit AT27-0002] (0.0048 against ≤ 0.0050)" in text
    md = D.markdown_report(diffs, "old", "new")
    assert "| tolerance changed | `white.tolerance.delta_uv` | 0.004 | 0.005 |" in md
    assert "| `white.delta_uv` | AT27-0002 | ✗ fail | **✓ pass** | 0.0048 against ≤ 0.0050 |" in md
    assert md.startswith("### colourspec diff `old` → `new`\n")


def test_markdown_escapes_table_breaking_text():
    assert D._md("a|b\nc<script>") == "a\\|b c&lt;script>"


def _git(cwd, *args):
    subprocess.run(["git", *args], cwd=cwd, check=True, capture_output=True, env={**os.environ, **GIT_ENV})


@pytest.fixture
def repo(tmp_path):
    if shutil.which("git") is None:
        pytest.skip("git is not installed")
    r = tmp_path / "repo"
    shutil.copytree(DEMO_SPECS, r / "specs")
    _git(r, "init", "-q", "-b", "main")
    _git(r, "add", "-A")
    _git(r, "commit", "-q", "-m", "first")
    _loosen(r / "specs")
    _git(r, "commit", "-q", "-am", "loosen the white tolerance")
    return r


def test_git_revisions_are_read_without_checkout(repo):
    r = run("diff", "--git", "HEAD~1..HEAD", "--format", "md", cwd=repo)
    assert r.returncode == 0, r.stderr
    assert "| tolerance changed | `white.tolerance.delta_uv` | 0.004 | 0.005 |" in r.stdout
    assert "`specs/corvinta-atlas-27-studio.yaml`" in r.stdout
    assert "1 spec changed, 1 requirement verdict changed" in r.stderr
    status = subprocess.run(["git", "status", "--porcelain"], cwd=repo, capture_output=True, text=True)
    assert status.stdout == ""


def test_git_revision_against_the_working_folder(repo):
    p = repo / "specs" / ATLAS
    p.write_text(p.read_text(encoding="utf-8").replace("revision: C", "revision: D"), encoding="utf-8")
    r = run("diff", "--git", "HEAD..", cwd=repo)
    assert r.returncode == 0, r.stderr
    assert "  metadata changed: revision: C -> D" in r.stdout
    assert "delta_uv" not in r.stdout


def test_bad_revision_and_bad_usage_exit_2(repo):
    r = run("diff", "--git", "nosuchrev..HEAD", cwd=repo)
    assert r.returncode == 2 and "Traceback" not in r.stderr and "colourspec: error: git rev-parse" in r.stderr
    assert run("diff", "--git", "HEAD", cwd=repo).returncode == 2
    assert run("diff", "specs", cwd=repo).returncode == 2


def test_invalid_spec_at_a_revision_names_the_revision(repo):
    p = repo / "specs" / ATLAS
    p.write_text(p.read_text(encoding="utf-8").replace("status: released", "status: gone"), encoding="utf-8")
    _git(repo, "commit", "-q", "-am", "break it")
    r = run("diff", "--git", "HEAD~1..HEAD", cwd=repo)
    assert r.returncode == 2
    assert "HEAD:specs/corvinta-atlas-27-studio.yaml:" in r.stderr and "status: expected one of" in r.stderr


VELA_LOT = "measurements/vela-24/tessaly-lot-TPW-2611A.csv"
VELA_RED = "VL24-00001,TPW-2611A,Tessaly Panel Works,red,,0.63942,0.32979,57.74"


def _move_red(folder):
    p = folder / VELA_LOT
    text = p.read_text(encoding="utf-8")
    assert text.count(VELA_RED) == 1
    p.write_text(text.replace(VELA_RED, VELA_RED.replace("0.63942", "0.66000")), encoding="utf-8")


def test_units_from_measurement_files_are_compared(tmp_path):
    old, new = tmp_path / "old", tmp_path / "new"
    shutil.copytree(DEMO_SPECS, old)
    shutil.copytree(DEMO_SPECS, new)
    _move_red(new)
    diffs = D.compare(D.side(str(old)), D.side(str(new)))
    assert [d.id for d in diffs] == ["corvinta-vela-24-monitor"]
    d = diffs[0]
    assert [(c.kind, c.action, c.key) for c in d.changes] == [("unit", "changed", "units.VL24-00001")]
    assert "red x 0.6394" in d.changes[0].old and "red x 0.6600" in d.changes[0].new
    assert ("primaries.red.delta_uv", "VL24-00001", "pass", "fail") in {
        (v.row, v.sample, v.old, v.new) for v in d.verdicts}


def test_measurement_files_are_read_at_the_revision(repo):
    # an uncommitted edit of a lot file changes nothing between two commits ...
    _move_red(repo / "specs")
    r = run("diff", "--git", "HEAD~1..HEAD", cwd=repo)
    assert r.returncode == 0, r.stderr
    assert "VL24-00001" not in r.stdout
    # ... and shows against the working folder
    r = run("diff", "--git", "HEAD..", cwd=repo)
    assert r.returncode == 0, r.stderr
    assert "  measured unit changed: units.VL24-00001:" in r.stdout


def test_a_measurement_path_leaving_the_specs_folder_is_refused_at_a_revision(repo):
    (repo / "outside.csv").write_text("serial,channel,x,y\nX1,white,0.3127,0.3290\n", encoding="utf-8")
    p = repo / "specs" / "corvinta-vela-24-monitor.yaml"
    p.write_text(p.read_text(encoding="utf-8").replace(f"  - {VELA_LOT}\n", "  - ../outside.csv\n"),
                 encoding="utf-8")
    _git(repo, "add", "-A")
    _git(repo, "commit", "-q", "-m", "read a file outside the specs")
    r = run("diff", "--git", "HEAD~1..HEAD", cwd=repo)
    assert r.returncode == 2 and "Traceback" not in r.stderr
    assert "expected a file inside the specs folder" in r.stderr


def test_a_measured_colour_from_a_measurement_file_shows_as_a_unit_change(tmp_path):
    old, new = tmp_path / "old", tmp_path / "new"
    shutil.copytree(DEMO_SPECS, old)
    shutil.copytree(DEMO_SPECS, new)
    p = new / "measurements" / "keel-12" / "umbrin-lot-K2614.csv"
    text = p.read_text(encoding="utf-8")
    line = next(ln for ln in text.splitlines() if ln.startswith("KL12-04612,") and "colours.legend-teal" in ln)
    cells = line.split(",")
    cells[-1] = "30.00"                      # the legend's luminance factor
    p.write_text(text.replace(line, ",".join(cells)), encoding="utf-8")
    diffs = D.compare(D.side(str(old)), D.side(str(new)))
    assert [d.id for d in diffs] == ["corvinta-keel-12-keypad"]
    (c,) = diffs[0].changes
    assert c.key == "units.KL12-04612" and "legend-teal" in c.old and "Y 30" in c.new and "Y 30" not in c.old
