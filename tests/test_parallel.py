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


def test_loading_in_workers_reports_the_same_problems_and_warnings(tmp_path, monkeypatch):
    """Specs resolved in worker processes (measurement and spectra files read there) give
    the same specs, warnings and errors as a serial load."""
    from generator.spec.load import load_specs
    from generator.spec.problems import InputError

    monkeypatch.chdir(tmp_path)
    specs = copy_demo(tmp_path)
    for i in range(8):   # enough specs for the load to go to workers
        (specs / f"copy-{i}.yaml").write_text(
            (specs / "corvinta-lumen-32-tile.yaml").read_text(encoding="utf-8")
            .replace("id: corvinta-lumen-32-tile", f"id: copy-{i}"), encoding="utf-8")
    serial, w1 = load_specs(specs, jobs=1)
    parallel, w2 = load_specs(specs, jobs=2)
    assert [s.id for s in serial] == [s.id for s in parallel]
    assert w1 == w2 and any("copy-3.yaml" in w.file for w in w1)
    assert [s.warnings for s in serial] == [s.warnings for s in parallel]
    (specs / "copy-5.yaml").write_text((specs / "copy-5.yaml").read_text(encoding="utf-8")
                                       .replace("scale: radiance", "scale: radiant"), encoding="utf-8")
    errors = []
    for jobs in (1, 2):
        with pytest.raises(InputError) as e:
            load_specs(specs, jobs=jobs)
        errors.append(e.value.problems)
    assert errors[0] == errors[1] and any(p.file.endswith("copy-5.yaml") for p in errors[0])


def test_costliest_items_first_still_gives_the_results_in_input_order():
    def task(i):
        return (i, os.getpid())

    cost = [i % 7 for i in range(30)]
    got = map_indexed(task, 30, jobs=2, cost=cost)
    assert [i for i, _ in got] == list(range(30))
    if can_fork():
        assert all(pid != os.getpid() for _, pid in got)      # done in the workers
