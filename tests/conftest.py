"""Shared fixtures: the demo specs, a built demo site (once per session), helpers."""
from __future__ import annotations

import json
import os
import shutil
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent


def pytest_configure(config):
    """Tables cached between processes (generator/tablecache.py) go to a folder of this run,
    not the user's cache; subprocesses of the tests inherit it."""
    if "COLOURSPEC_CACHE" not in os.environ:
        import tempfile

        config._table_cache = tempfile.mkdtemp(prefix="colourspec-tables-")
        os.environ["COLOURSPEC_CACHE"] = config._table_cache


def pytest_unconfigure(config):
    folder = getattr(config, "_table_cache", None)
    if folder:
        shutil.rmtree(folder, ignore_errors=True)
        os.environ.pop("COLOURSPEC_CACHE", None)
DEMO_SPECS = ROOT / "specs"


@pytest.fixture(scope="session")
def demo_site(tmp_path_factory) -> Path:
    """The demo specs built into a temporary folder (built once for the whole run)."""
    from generator.build import build

    out = tmp_path_factory.mktemp("site") / "site_output"
    cwd = os.getcwd()
    os.chdir(ROOT)  # file paths in results.json are relative to where the tool runs
    try:
        build(DEMO_SPECS, out)
    finally:
        os.chdir(cwd)
    return out


@pytest.fixture(scope="session")
def demo_results(demo_site) -> dict:
    return json.loads((demo_site / "results.json").read_text(encoding="utf-8"))


@pytest.fixture
def spec_dir(tmp_path):
    """A temporary specs folder; write(name, text) adds a file."""
    d = tmp_path / "specs"
    d.mkdir()

    def write(name: str, text: str) -> Path:
        p = d / name
        p.write_text(text, encoding="utf-8")
        return p

    write.dir = d
    return write


def copy_demo(tmp_path: Path) -> Path:
    d = tmp_path / "specs"
    shutil.copytree(DEMO_SPECS, d)
    return d
