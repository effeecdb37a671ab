"""Builds in worker processes (generator/parallel.py) publish the same bytes as serial ones."""
from __future__ import annotations

import os

import pytest

from generator.build import build
from generator.parallel import can_fork, map_indexed

from .conftest import copy_demo
from .test_cache import files_of


def test_map_indexed_keeps_the_order_and_runs_in_other_processes():
    parent = os.getpid()
    got = map_indexed(lambda i: (i * i, os.getpid()), 12, jobs=2)
    assert [v for v, _ in got] == [i * i for i in range(12)]
    if can_fork():
        assert any(pid != parent for _, pid in got)


def test_map_indexed_runs_small_or_single_job_work_here():
    parent = os.getpid()
    assert {pid for pid in map_indexed(lambda i: os.getpid(), 3, jobs=4)} == {parent}   # under min_items
    assert {pid for pid in map_indexed(lambda i: os.getpid(), 10, jobs=1)} == {parent}


def test_an_error_in_a_worker_reaches_the_caller():
    def task(i):
        if i == 5:
            raise ValueError("item five")
        return i

    with pytest.raises(ValueError, match="item five"):
        map_indexed(task, 10, jobs=2)


def test_a_parallel_build_equals_a_serial_build_byte_for_byte(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    specs = copy_demo(tmp_path)
    serial = build(specs, tmp_path / "serial", incremental=False, jobs=1)
    parallel = build(specs, tmp_path / "parallel", incremental=False, jobs=2)
    assert files_of(tmp_path / "serial") == files_of(tmp_path / "parallel")
    assert serial.results == parallel.results
    assert set(parallel.stages) == {"load", "compute", "assess", "render", "publish"}
