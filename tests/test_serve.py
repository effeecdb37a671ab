"""colourspec serve: rebuild on change, errors shown instead of dying, status for the page."""
from __future__ import annotations

import json
import threading
import urllib.request

import pytest

from generator.render.pages import templates_dir
from generator.serve import State, rebuild, start_server, watch, watched_files

from .conftest import copy_demo

WAIT = 120  # generous upper bound for a rebuild on a busy machine; not a timing assertion


def _get(url: str) -> bytes:
    with urllib.request.urlopen(url, timeout=10) as r:
        return r.read()


def test_watched_files_see_a_changed_spec_and_a_new_measurement_file(tmp_path):
    specs = copy_demo(tmp_path)
    before = watched_files(specs, templates_dir())
    (specs / "corvinta-atlas-27-studio.yaml").write_text(
        (specs / "corvinta-atlas-27-studio.yaml").read_text(encoding="utf-8") + "\n", encoding="utf-8")
    changed = watched_files(specs, templates_dir())
    (specs / "lot-L2611.csv").write_text("serial,x,y\n", encoding="utf-8")
    added = watched_files(specs, templates_dir())
    assert before != changed != added
    assert any(k.endswith("lot-L2611.csv") for k in added)
    assert any(k.endswith("spec.html") for k in before)


def test_broken_spec_is_reported_in_the_status_and_the_last_good_site_stays(tmp_path):
    specs = copy_demo(tmp_path)
    out = tmp_path / "site"
    state = State()
    rebuild(specs, out, state)
    status = json.loads(state.status_json())
    assert status == {"build": 1, "errors": [], "seconds": pytest.approx(state.seconds, abs=1e-3)}
    good = (out / "index.html").read_bytes()
    p = specs / "corvinta-atlas-27-studio.yaml"
    p.write_text(p.read_text(encoding="utf-8").replace("revision: C", "revision: [C"), encoding="utf-8")
    rebuild(specs, out, state)
    status = json.loads(state.status_json())
    assert status["build"] == 2
    # a specs folder outside the working folder is named from its parent (display_path)
    assert status["errors"] and status["errors"][0].startswith("specs/corvinta-atlas-27-studio.yaml:8:7: ")
    assert "YAML syntax error" in status["errors"][0]
    assert (out / "index.html").read_bytes() == good


def test_server_serves_the_site_and_its_status_and_rebuilds_when_a_spec_is_saved(tmp_path):
    specs = copy_demo(tmp_path)
    out = tmp_path / "site"
    state = State()
    rebuild(specs, out, state)
    server = start_server(out, state, 0)
    stop = threading.Event()
    watcher = threading.Thread(target=watch, args=(specs, out, state, 0.05, stop), daemon=True)
    watcher.start()
    try:
        base = f"http://127.0.0.1:{server.server_address[1]}/"
        page = _get(base + "corvinta-atlas-27-studio/index.html").decode()
        assert "revision C" in page and '<script src="../static/reload.js"></script>' in page
        assert _get(base + "static/reload.js").startswith(b"/* Live preview")
        p = specs / "corvinta-atlas-27-studio.yaml"
        p.write_text(p.read_text(encoding="utf-8").replace("revision: C", "revision: D"), encoding="utf-8")
        done = threading.Event()

        def poll():
            while not done.wait(0.05):
                if json.loads(_get(base + "__colourspec/status.json"))["build"] >= 2:
                    done.set()

        threading.Thread(target=poll, daemon=True).start()
        assert done.wait(WAIT), "no rebuild after the spec was saved"
        assert "revision D" in _get(base + "corvinta-atlas-27-studio/index.html").decode()
    finally:
        stop.set()
        watcher.join(WAIT)
        server.shutdown()
        server.server_close()


def test_server_without_a_site_yet_shows_a_page_that_waits_for_a_good_build(tmp_path):
    specs = tmp_path / "specs"
    specs.mkdir()
    (specs / "bad.yaml").write_text("spec: 1\nid: [\n", encoding="utf-8")
    out = tmp_path / "site"
    state = State()
    rebuild(specs, out, state)
    server = start_server(out, state, 0)
    try:
        base = f"http://127.0.0.1:{server.server_address[1]}/"
        page = _get(base).decode()
        assert "The site could not be built" in page and 'src="/static/reload.js"' in page
        assert _get(base + "static/reload.js").startswith(b"/* Live preview")
        assert json.loads(_get(base + "__colourspec/status.json"))["errors"]
    finally:
        server.shutdown()
        server.server_close()


def test_a_rebuild_redraws_only_the_edited_spec_from_the_incremental_cache(tmp_path, capsys):
    specs = copy_demo(tmp_path)
    out = tmp_path / "site"
    state = State()
    rebuild(specs, out, state)
    p = specs / "corvinta-prism-5-cinema.yaml"
    p.write_text(p.read_text(encoding="utf-8").replace("revision: ", "revision: X", 1), encoding="utf-8")
    rebuild(specs, out, state)
    err = capsys.readouterr().err.splitlines()
    assert "reused" not in err[0]
    others = len(list(specs.glob("*.yaml"))) - 1   # every demo spec but the edited one
    assert err[1].endswith(f" ({others} unchanged pages reused)")
    assert '<script src="../static/reload.js"></script>' in (out / "corvinta-prism-5-cinema" / "index.html").read_text(
        encoding="utf-8")


def test_the_watch_leaves_out_hidden_folders_and_the_site(tmp_path):
    specs = copy_demo(tmp_path)
    (specs / ".cache").mkdir()
    (specs / ".cache" / "entry").write_text("x", encoding="utf-8")
    (specs / "site").mkdir()
    (specs / "site" / "index.html").write_text("x", encoding="utf-8")
    files = watched_files(specs, templates_dir(), (specs / "site",))
    assert not any("/.cache/" in k or k.endswith("site/index.html") for k in files)
    assert any(k.endswith("corvinta-prism-5-cinema.yaml") for k in files)
