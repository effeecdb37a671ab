"""Per-spec history from git: commits, commit dates, revision and the keys that changed,
shown on the spec page; nothing outside a git repository."""
from __future__ import annotations

import os
import shutil
import subprocess

import pytest

from generator import history as H
from generator.build import build

from .conftest import DEMO_SPECS
from .test_diff import GIT_ENV

ATLAS = "corvinta-atlas-27-studio.yaml"
KEPT = (ATLAS, "corvinta-prism-5-cinema.yaml")


def _git(cwd, *args, date="2026-03-01T10:00:00+00:00"):
    env = {**os.environ, **GIT_ENV, "GIT_AUTHOR_DATE": date, "GIT_COMMITTER_DATE": date}
    subprocess.run(["git", *args], cwd=cwd, check=True, capture_output=True, env=env)


@pytest.fixture
def repo(tmp_path, monkeypatch):
    if shutil.which("git") is None:
        pytest.skip("git is not installed")
    r = tmp_path / "repo"
    (r / "specs").mkdir(parents=True)
    for name in KEPT:  # two specs keep the builds below short
        shutil.copy(DEMO_SPECS / name, r / "specs" / name)
    _git(r, "init", "-q", "-b", "main")
    _git(r, "add", "-A")
    _git(r, "commit", "-q", "-m", "Atlas 27 first release")
    p = r / "specs" / ATLAS
    p.write_text(p.read_text(encoding="utf-8").replace("delta_uv: 0.004", "delta_uv: 0.005")
                 .replace("revision: C", "revision: D"), encoding="utf-8")
    _git(r, "commit", "-q", "-am", "Loosen the white tolerance", date="2026-04-15T09:30:00+02:00")
    monkeypatch.chdir(r)
    return r


def test_each_commit_that_changed_a_spec_is_listed_newest_first(repo):
    hist = H.spec_histories(repo / "specs")
    atlas = hist["specs/" + ATLAS]
    assert [(e.date, e.revision, e.subject) for e in atlas] == [
        ("2026-04-15", "D", "Loosen the white tolerance"), ("2026-03-01", "C", "Atlas 27 first release")]
    assert atlas[0].change == "revision C → D; white.tolerance.delta_uv 0.004 → 0.005"
    assert atlas[1].change == "created"
    assert len(atlas[0].commit) == 10
    assert [e.change for e in hist["specs/corvinta-prism-5-cinema.yaml"]] == ["created"]


def test_the_page_lists_the_history_and_two_builds_agree(repo, tmp_path):
    a = build(repo / "specs", tmp_path / "a", history=True)
    build(repo / "specs", tmp_path / "b", history=True, incremental=False)
    page = (tmp_path / "a" / "corvinta-atlas-27-studio" / "index.html").read_text(encoding="utf-8")
    section = page.split('<section id="history" class="history"', 1)[1].split("</section>", 1)[0]
    assert "<td>D</td>" in section and "<td>2026-04-15</td>" in section
    assert "revision C → D; white.tolerance.delta_uv 0.004 → 0.005" in section
    assert section.index("2026-04-15") < section.index("2026-03-01")
    assert '<a href="#history">History</a>' in page  # in the page's table of contents
    assert page == (tmp_path / "b" / "corvinta-atlas-27-studio" / "index.html").read_text(encoding="utf-8")
    assert a.reused == 0


def test_a_new_commit_redraws_only_the_page_it_touches(repo, tmp_path):
    build(repo / "specs", tmp_path / "site", history=True)
    p = repo / "specs" / "corvinta-prism-5-cinema.yaml"
    p.write_text(p.read_text(encoding="utf-8") + "\n# a comment\n", encoding="utf-8")
    _git(repo, "commit", "-q", "-am", "comment only", date="2026-05-01T00:00:00+00:00")
    s = build(repo / "specs", tmp_path / "site", history=True)
    assert s.reused == 1
    page = (tmp_path / "site" / "corvinta-prism-5-cinema" / "index.html").read_text(encoding="utf-8")
    assert "no change to any key (layout or comments)" in page


def test_no_history_outside_a_git_repository(tmp_path, monkeypatch):
    shutil.copytree(DEMO_SPECS, tmp_path / "specs")
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("GIT_CEILING_DIRECTORIES", str(tmp_path))
    assert H.spec_histories(tmp_path / "specs") == {}


def test_describe_change_names_added_removed_and_changed_keys_and_caps_the_list():
    assert H.describe_change({"a": "1", "b": "2"}, {"a": "1", "b": "3", "c": "4"}) == "b 2 → 3; c added"
    assert H.describe_change({"a": "1", "b": "2"}, {"a": "1"}) == "b removed"
    assert H.describe_change(None, {"a": "1"}) == "created"
    assert H.describe_change({"a": "1"}, None) == "deleted"
    many = H.describe_change({}, {f"k{i}": "1" for i in range(9)})
    assert many.endswith("k5 added; and 3 more")


def test_flatten_gives_dotted_paths_and_list_indices():
    from generator.spec.problems import Problems
    from generator.spec.yamlnodes import parse_yaml

    node = parse_yaml(b"white: {tolerance: {cct: [6300, 6800]}}\ngamut:\n  - {min: 95}\n", "f", Problems())
    assert H.flatten(node) == {"white.tolerance.cct[0]": "6300", "white.tolerance.cct[1]": "6800",
                               "gamut[0].min": "95"}
