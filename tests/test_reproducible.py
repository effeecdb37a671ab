"""Two builds of the same specs, in different folders, at different (simulated) times,
with different SOURCE_DATE_EPOCH, hash seeds and time zones, are byte-identical. The site
shows no build date, so SOURCE_DATE_EPOCH only sets the files' modification times."""
from __future__ import annotations

import os
import shutil
import subprocess
import sys
from pathlib import Path

from .conftest import DEMO_SPECS, ROOT

# Runs the build with every Python clock moved to 2041: a date taken from the clock would show.
FUTURE_CLOCK = """
import datetime, sys, time
T = 2250000000.0
time.time = lambda: T
time.time_ns = lambda: int(T * 1e9)
_lt, _gt = time.localtime, time.gmtime
time.localtime = lambda s=None: _lt(T if s is None else s)
time.gmtime = lambda s=None: _gt(T if s is None else s)
class FutureDateTime(datetime.datetime):
    @classmethod
    def now(cls, tz=None):
        return datetime.datetime.fromtimestamp(T, tz)
    @classmethod
    def utcnow(cls):
        return datetime.datetime.utcfromtimestamp(T)
    @classmethod
    def today(cls):
        return cls.now()
class FutureDate(datetime.date):
    @classmethod
    def today(cls):
        return datetime.date.fromtimestamp(T)
datetime.datetime, datetime.date = FutureDateTime, FutureDate
from generator.cli import main
sys.exit(main(sys.argv[1:]))
"""


def build_in(folder: Path, env: dict, future: bool) -> Path:
    shutil.copytree(DEMO_SPECS, folder / "specs")
    cmd = [sys.executable, "-c", FUTURE_CLOCK] if future else [sys.executable, "-m", "generator"]
    env = dict(os.environ, PYTHONPATH=str(ROOT), **env)
    r = subprocess.run(cmd + ["build", "specs", "-o", "site"], cwd=folder, env=env, capture_output=True,
                       text=True, timeout=300)
    assert r.returncode == 0, r.stderr
    return folder / "site"


def contents(site: Path) -> dict[str, bytes | None]:
    return {p.relative_to(site).as_posix(): (p.read_bytes() if p.is_file() else None) for p in sorted(site.rglob("*"))}


def test_two_builds_at_different_places_and_times_are_byte_identical(tmp_path):
    a = build_in(tmp_path / "first", {"SOURCE_DATE_EPOCH": "1", "PYTHONHASHSEED": "1", "TZ": "UTC"}, False)
    b = build_in(tmp_path / "second" / "deeper", {"SOURCE_DATE_EPOCH": "2000000000", "PYTHONHASHSEED": "2",
                                                  "TZ": "Pacific/Kiritimati"}, True)
    ca, cb = contents(a), contents(b)
    assert sorted(ca) == sorted(cb)
    assert [rel for rel in ca if ca[rel] != cb[rel]] == []
    assert len([rel for rel in ca if rel.endswith(".svg")]) >= 12
    assert {int(p.stat().st_mtime) for p in a.rglob("*")} == {1}
    assert {int(p.stat().st_mtime) for p in b.rglob("*")} == {2000000000}

