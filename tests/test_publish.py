"""The publisher: writes only inside the output folder, never replaces specs or a folder
it did not write, swaps the new site in whole, and leaves the previous site byte-identical
when a build fails or is killed."""
from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
from pathlib import Path, PurePosixPath

import pytest

from generator import publish as P
from generator.cli import main
from generator.publish import MARKER, PublishError, SiteFiles, check_output, publish

ROOT = Path(__file__).resolve().parent.parent

TINY = """\
spec: 1
id: tiny-panel
title: Tiny panel
primaries:
  red:   {x: 0.640, y: 0.330}
  green: {x: 0.300, y: 0.600}
  blue:  {x: 0.150, y: 0.060}
"""


def site_of(files: dict[str, str]) -> SiteFiles:
    s = SiteFiles()
    for rel, text in files.items():
        s.add(rel, text)
    return s


def snapshot(folder: Path) -> dict[str, bytes | None]:
    """Every entry below a folder: files with their bytes, folders as None."""
    return {p.relative_to(folder).as_posix(): (p.read_bytes() if p.is_file() else None)
            for p in sorted(folder.rglob("*"))}


def leftovers(parent: Path) -> list[str]:
    return sorted(p.name for p in parent.iterdir() if ".new-" in p.name or ".old-" in p.name)


# --- SiteFiles: nothing outside the site ---------------------------------------------------

@pytest.mark.parametrize("rel", ["/etc/passwd", "../x.html", "a/../../x", "", ".", "a//b", "a/./b", "a\\..\\b",
                                 "a\nb.html", "./index.html"])
def test_site_paths_outside_the_site_or_not_plain_are_refused(rel):
    with pytest.raises(PublishError) as e:
        SiteFiles().add(rel, "x")
    assert str(e.value) == f"refusing to write outside the site: {rel!r}"


def test_a_second_write_to_one_path_is_refused():
    s = site_of({"a/index.html": "1"})
    with pytest.raises(PublishError) as e:
        s.add("a/index.html", "2")
    assert str(e.value) == "two outputs for one path: a/index.html"


def test_the_marker_file_is_the_publishers_own():
    with pytest.raises(PublishError) as e:
        SiteFiles().add(MARKER, "x")
    assert str(e.value) == f"{MARKER} is the publisher's own marker file"


# --- the output folder --------------------------------------------------------------------

@pytest.fixture
def repo(tmp_path):
    """A repository: .git, specs/ with one spec, a README."""
    r = tmp_path / "repo"
    (r / ".git").mkdir(parents=True)
    (r / "specs").mkdir()
    (r / "specs" / "tiny.yaml").write_text(TINY, encoding="utf-8")
    (r / "README.md").write_text("readme\n", encoding="utf-8")
    return r


def refused(out: Path, protect=()) -> str:
    with pytest.raises(PublishError) as e:
        check_output(out, tuple(protect))
    return str(e.value)


def test_output_at_the_specs_folder_is_refused(repo):
    specs = repo / "specs"
    assert refused(specs, [specs]) == (f"refusing to write the site to {specs}: it would replace the specs in "
                                       f"{specs}; choose a folder of its own, such as site_output/")


def test_output_at_a_parent_of_the_specs_folder_is_refused(repo):
    specs = repo / "specs"
    for out in (repo, repo.parent):
        assert refused(out, [specs]).startswith(f"refusing to write the site to {out}: it would replace the specs")


def test_output_at_the_filesystem_root_is_refused():
    assert refused(Path("/")) == ("refusing to write the site to /: the output must be a folder of its own, "
                                  "not the root of the filesystem")


def test_output_at_the_home_folder_is_refused(tmp_path, monkeypatch):
    monkeypatch.setenv("HOME", str(tmp_path))
    assert refused(tmp_path) == f"refusing to write the site to {tmp_path}: that is the home folder"


def test_output_at_a_repository_root_is_refused_even_with_a_results_json(repo):
    # e.g. after 'colourspec check --json results.json' at the root, then 'build -o .'
    (repo / "results.json").write_text('{"format": "colourspec-results/1", "specs": []}', encoding="utf-8")
    (repo / "specs" / "tiny.yaml").unlink()
    assert refused(repo) == (f"refusing to replace {repo}: it is not empty and not a site written by colourspec "
                             f"(no {MARKER}); choose another folder or empty it yourself")


def test_output_holding_spec_files_is_refused_without_being_told_where_the_specs_are(repo):
    assert refused(repo) == f"refusing to replace {repo}: it holds spec files and is not a built site"


def test_symlinked_output_pointing_at_the_specs_is_refused(repo, tmp_path):
    link = tmp_path / "site_output"
    link.symlink_to(repo / "specs")
    assert refused(link, [repo / "specs"]).startswith(f"refusing to write the site to {link}: it would replace")
    assert refused(link).startswith(f"refusing to replace {link}: it holds spec files")


def test_symlinked_output_pointing_at_a_parent_of_the_specs_is_refused(repo, tmp_path):
    link = tmp_path / "out"
    link.symlink_to(repo)
    assert "it would replace the specs" in refused(link, [repo / "specs" / "tiny.yaml"])


def test_output_that_is_a_file_is_refused(tmp_path):
    f = tmp_path / "site"
    f.write_text("x", encoding="utf-8")
    assert refused(f) == f"refusing to write the site to {f}: it exists and is not a folder"


def test_output_names_with_control_characters_are_refused(tmp_path):
    out = tmp_path / "site\nx"
    assert refused(out) == (f"refusing the output folder {str(out)!r}: expected a folder name without control "
                            "characters")


def test_a_folder_that_is_not_a_site_is_not_replaced(tmp_path):
    out = tmp_path / "docs"
    out.mkdir()
    (out / "important.txt").write_text("keep me\n", encoding="utf-8")
    with pytest.raises(PublishError):
        publish(site_of({"index.html": "new"}), out)
    assert snapshot(out) == {"important.txt": b"keep me\n"}


def test_an_empty_folder_or_a_previous_site_is_replaced(tmp_path):
    out = tmp_path / "site"
    out.mkdir()
    publish(site_of({"index.html": "one", "a/index.html": "a1"}), out)
    assert snapshot(out) == {MARKER: P.MARKER_TEXT, "a": None, "a/index.html": b"a1", "index.html": b"one"}
    publish(site_of({"index.html": "two"}), out)
    assert snapshot(out) == {MARKER: P.MARKER_TEXT, "index.html": b"two"}
    assert leftovers(tmp_path) == []


def test_a_site_written_before_the_marker_existed_is_replaced(tmp_path):
    out = tmp_path / "site"
    out.mkdir()
    (out / "results.json").write_text('{"format": "colourspec-results/1", "specs": []}', encoding="utf-8")
    (out / "index.html").write_text("old", encoding="utf-8")
    publish(site_of({"index.html": "new"}), out)
    assert snapshot(out) == {MARKER: P.MARKER_TEXT, "index.html": b"new"}


def test_symlinked_output_replaces_the_target_and_keeps_the_link(tmp_path):
    real = tmp_path / "releases" / "site"
    publish(site_of({"index.html": "one"}), real)
    link = tmp_path / "site_output"
    link.symlink_to(real)
    publish(site_of({"index.html": "two"}), link)
    assert link.is_symlink() and os.path.realpath(link) == str(real)
    assert (link / "index.html").read_text(encoding="utf-8") == "two"
    assert leftovers(real.parent) == [] and leftovers(tmp_path) == []


def test_the_published_site_is_readable_by_others(tmp_path):
    out = tmp_path / "site"
    publish(site_of({"index.html": "x"}), out)
    assert out.stat().st_mode & 0o755 == 0o755


@pytest.mark.parametrize("out_arg, message", [
    ("specs", "colourspec: refusing to write the site to specs: it would replace the specs in specs; "
              "choose a folder of its own, such as site_output/"),
    (".", "colourspec: refusing to write the site to .: it would replace the specs in specs; "
          "choose a folder of its own, such as site_output/"),
    ("/", "colourspec: refusing to write the site to /: the output must be a folder of its own, "
          "not the root of the filesystem"),
], ids=["specs", "repo-root", "root"])
def test_build_refuses_dangerous_outputs_with_exit_2(repo, monkeypatch, capsys, out_arg, message):
    monkeypatch.chdir(repo)
    before = snapshot(repo.parent)  # the parent too: nothing (no cache) is written beside a refused output
    assert main(["build", "specs", "-o", out_arg]) == 2
    err = capsys.readouterr().err
    assert err.splitlines() == [message]
    assert snapshot(repo.parent) == before


# --- atomic swap ---------------------------------------------------------------------------

def test_exchange_swaps_two_folders(tmp_path):
    a, b = tmp_path / "a", tmp_path / "b"
    a.mkdir()
    b.mkdir()
    (a / "f").write_text("A", encoding="utf-8")
    (b / "f").write_text("B", encoding="utf-8")
    if not P._exchange(a, b):
        pytest.skip("renameat2 exchange is not available on this system")
    assert ((a / "f").read_text(encoding="utf-8"), (b / "f").read_text(encoding="utf-8")) == ("B", "A")


def test_without_exchange_the_two_rename_swap_still_publishes(tmp_path, monkeypatch):
    monkeypatch.setattr(P, "_exchange", lambda a, b: False)
    out = tmp_path / "site"
    publish(site_of({"index.html": "one"}), out)
    publish(site_of({"index.html": "two"}), out)
    assert snapshot(out) == {MARKER: P.MARKER_TEXT, "index.html": b"two"}
    assert leftovers(tmp_path) == []


def test_a_site_moved_aside_by_a_killed_two_rename_swap_comes_back(tmp_path):
    out = tmp_path / "site"
    publish(site_of({"index.html": "one"}), out)
    os.rename(out, tmp_path / ".site.old-abc123")  # killed between the renames: no site at all
    (tmp_path / ".site.new-def456").mkdir()           # and the half-written new one
    P._clean_stale(out)
    assert snapshot(out) == {MARKER: P.MARKER_TEXT, "index.html": b"one"}
    assert leftovers(tmp_path) == []


def test_a_failure_while_writing_leaves_the_previous_site_and_no_temporary_folder(tmp_path):
    out = tmp_path / "site"
    publish(site_of({"index.html": "one"}), out)
    before = snapshot(out)
    bad = site_of({"a": "a file", "a/b.html": "needs a to be a folder"})  # fails midway
    with pytest.raises(PublishError) as e:
        publish(bad, out)
    assert str(e.value).startswith(f"cannot write the site to {out}: File exists (")
    assert snapshot(out) == before
    assert leftovers(tmp_path) == []


def test_an_exception_during_render_leaves_the_previous_site_byte_identical(tmp_path, monkeypatch, capsys):
    specs = tmp_path / "specs"
    specs.mkdir()
    (specs / "tiny.yaml").write_text(TINY, encoding="utf-8")
    out = tmp_path / "site"
    assert main(["build", str(specs), "-o", str(out)]) == 0
    before = snapshot(out)

    def broken(*a, **k):
        raise RuntimeError("render failed")

    import generator.render.site as site_mod
    monkeypatch.setattr(site_mod, "render_site", broken)
    capsys.readouterr()
    assert main(["build", str(specs), "-o", str(out)]) == 3
    assert "RuntimeError: render failed" in capsys.readouterr().err
    assert snapshot(out) == before
    assert leftovers(tmp_path) == []


KILL_MIDWAY = textwrap.dedent("""
    import os, signal, sys
    import generator.publish as P
    calls = [0]
    real_open = open
    def open_then_kill(path, mode="r", *a, **k):
        if "x" in mode:
            calls[0] += 1
            if calls[0] == 4:  # a few files into the new site
                os.kill(os.getpid(), getattr(signal, sys.argv[1]))
        return real_open(path, mode, *a, **k)
    P.open = open_then_kill
    from generator.cli import main
    sys.exit(main(["build", sys.argv[2], "-o", sys.argv[3]]))
""")


def kill_build_midway(tmp_path: Path, sig: str) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-c", KILL_MIDWAY, sig, str(tmp_path / "specs"), str(tmp_path / "site")],
                          cwd=ROOT, capture_output=True, text=True, timeout=120)


@pytest.fixture
def built(tmp_path):
    specs = tmp_path / "specs"
    specs.mkdir()
    (specs / "tiny.yaml").write_text(TINY, encoding="utf-8")
    assert main(["build", str(specs), "-o", str(tmp_path / "site")]) == 0
    (specs / "tiny.yaml").write_text(TINY.replace("Tiny panel", "Tiny panel, revised"), encoding="utf-8")
    return snapshot(tmp_path / "site")


def test_sigterm_midway_leaves_the_previous_site_and_cleans_up(tmp_path, built):
    r = kill_build_midway(tmp_path, "SIGTERM")
    assert r.returncode == 143, r.stderr
    assert r.stderr.splitlines()[-1] == "colourspec: terminated; nothing half-written was published"
    assert "Traceback" not in r.stderr
    assert snapshot(tmp_path / "site") == built
    assert leftovers(tmp_path) == []


def test_sigkill_midway_leaves_the_previous_site_and_the_next_build_cleans_up(tmp_path, built):
    r = kill_build_midway(tmp_path, "SIGKILL")
    assert r.returncode == -signal.SIGKILL
    assert snapshot(tmp_path / "site") == built
    assert len(leftovers(tmp_path)) == 1  # the half-written site of the killed build
    assert main(["build", str(tmp_path / "specs"), "-o", str(tmp_path / "site")]) == 0
    assert leftovers(tmp_path) == []
    assert b"Tiny panel, revised" in (tmp_path / "site" / "tiny-panel" / "index.html").read_bytes()


# --- reproducible files --------------------------------------------------------------------

def test_source_date_epoch_sets_every_mtime(tmp_path, monkeypatch):
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "1700000000")
    out = tmp_path / "site"
    publish(site_of({"index.html": "x", "a/b/c.html": "y"}), out)
    assert {int(p.stat().st_mtime) for p in [out, *out.rglob("*")]} == {1700000000}


def test_replacing_a_site_never_moves_it_aside_where_exchange_exists(tmp_path, monkeypatch):
    a, b = tmp_path / "a", tmp_path / "b"
    a.mkdir()
    b.mkdir()
    if not P._exchange(a, b):
        pytest.skip("renameat2 exchange is not available on this system")
    out = tmp_path / "site"
    publish(site_of({"index.html": "one"}), out)
    renames = []
    monkeypatch.setattr(P.os, "rename", lambda *args: renames.append(args))
    publish(site_of({"index.html": "two"}), out)
    assert renames == []  # no moment without a site: one exchange, no renames
    assert (out / "index.html").read_text(encoding="utf-8") == "two"


# --- property: any path the site is given lands inside the site, or is refused ----------------

from hypothesis import given  # noqa: E402
from hypothesis import strategies as st  # noqa: E402

PATH_PARTS = st.sampled_from(["a", "b.html", "..", ".", "", "/", "\\", "~", "c d", "é", "\x00", "\n", "%2e%2e"])


@given(st.lists(PATH_PARTS, min_size=1, max_size=6).map("".join))
def test_any_site_path_is_refused_or_stays_inside_the_site(rel):
    import posixpath

    s = SiteFiles()
    try:
        s.add(rel, "x")
    except PublishError:
        return
    norm = posixpath.normpath(rel)
    assert norm == rel and not norm.startswith("/") and ".." not in PurePosixPath(rel).parts
    assert "\x00" not in rel and "\n" not in rel
    assert Path("/site", rel).resolve().is_relative_to(Path("/site").resolve())


def test_an_output_folder_that_cannot_be_made_is_an_error_not_a_crash(tmp_path, capsys):
    (tmp_path / "a-file").write_text("x", encoding="utf-8")
    specs = tmp_path / "specs"
    specs.mkdir()
    (specs / "tiny.yaml").write_text(TINY, encoding="utf-8")
    out = tmp_path / "a-file" / "site"
    assert main(["build", str(specs), "-o", str(out)]) == 2
    assert capsys.readouterr().err.startswith(f"colourspec: cannot write the site to {out}: ")


def test_a_previous_site_with_spec_files_put_into_it_is_not_replaced(tmp_path):
    out = tmp_path / "site"
    publish(site_of({"index.html": "one"}), out)
    (out / "deep" / "er").mkdir(parents=True)
    (out / "deep" / "er" / "panel.yml").write_text("spec: 1\n", encoding="utf-8")
    with pytest.raises(PublishError) as e:
        publish(site_of({"index.html": "two"}), out)
    assert str(e.value) == f"refusing to replace {out}: it holds spec files and is not a built site"
    assert (out / "index.html").read_text(encoding="utf-8") == "one"


def test_file_refs_are_published_as_hard_links_and_parts_as_their_bytes(tmp_path):
    src = tmp_path / "stored" / "0"
    src.parent.mkdir()
    src.write_bytes(b"<svg>stored</svg>")
    s = SiteFiles()
    s.add("a/figure.svg", P.FileRef(src))
    s.add("results.json", P.Parts([b"{\n", memoryview(b'  "x": 1xx')[:8], b"\n}\n"]))
    out = publish(s, tmp_path / "site")
    assert (out / "a" / "figure.svg").read_bytes() == b"<svg>stored</svg>"
    assert os.path.samefile(out / "a" / "figure.svg", src)           # no bytes written again
    assert (out / "results.json").read_bytes() == b'{\n  "x": 1\n}\n'


def test_file_refs_are_copied_where_links_are_refused(tmp_path, monkeypatch):
    import errno

    src = tmp_path / "stored"
    src.write_bytes(b"bytes of a cached page")

    def refuse(*_a, **_k):
        raise OSError(errno.EXDEV, "Invalid cross-device link")

    monkeypatch.setattr(P.os, "link", refuse)
    s = SiteFiles()
    s.add("page.html", P.FileRef(src))
    out = publish(s, tmp_path / "site")
    assert (out / "page.html").read_bytes() == b"bytes of a cached page"
    assert not os.path.samefile(out / "page.html", src)


def test_an_incremental_build_links_unchanged_pages_to_the_cache_and_matches_a_clean_build(tmp_path, monkeypatch):
    from generator.build import build
    from generator.cache import cache_dir_for

    from .conftest import copy_demo

    monkeypatch.chdir(tmp_path)
    specs = copy_demo(tmp_path)
    build(specs, tmp_path / "site")
    first = snapshot(tmp_path / "site")
    build(specs, tmp_path / "site")                                     # every page from the cache
    assert snapshot(tmp_path / "site") == first
    cache = cache_dir_for(tmp_path / "site")
    linked = [p for p in (tmp_path / "site").rglob("index.html") if p.parent.name != "site"
              and p.stat().st_nlink > 1]
    assert linked and all(any(os.path.samefile(p, c) for c in cache.rglob("*") if c.is_file()) for p in linked[:2])


@pytest.mark.parametrize("refuse", ["exdev", "missing"])
def test_spans_are_copied_through_memory_where_the_kernel_will_not(tmp_path, monkeypatch, refuse):
    import errno

    src = tmp_path / "entry"
    src.write_bytes(b"0123456789abcdef")
    if refuse == "missing":
        monkeypatch.delattr(P.os, "copy_file_range")
    else:
        def no(*_a, **_k):
            raise OSError(errno.EXDEV, "Invalid cross-device link")

        monkeypatch.setattr(P.os, "copy_file_range", no)
    s = SiteFiles()
    s.add("results.json", P.Parts([b"[", P.Span(src, 4, 6), b"]", P.Span(src, 0, 2), b"\n"]))
    out = publish(s, tmp_path / "site")
    assert (out / "results.json").read_bytes() == b"[456789]01\n"
