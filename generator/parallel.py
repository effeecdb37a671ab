"""Run independent per-spec work in worker processes, results in input order.

Workers are forked, so they start with the parent's modules and data and only each
result travels back (pickled). Where the platform cannot fork, or for one job, the work
runs in this process: the output is the same either way, because every item is computed
from its own inputs alone.
"""
from __future__ import annotations

import multiprocessing as mp
import os
from concurrent.futures import ProcessPoolExecutor

_TASK = None


def available_cpus() -> int:
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):
        return max(1, os.cpu_count() or 1)


def can_fork() -> bool:
    return "fork" in mp.get_all_start_methods()


def _run(i: int):
    return _TASK(i)


def map_indexed(task, n: int, jobs: int = 1, min_items: int = 4, cost=None) -> list:
    """[task(0), ..., task(n - 1)], spread over ``jobs`` forked processes when that is
    worth it (at least ``min_items`` items); ``task`` may be any callable (a closure).
    ``cost`` (one number per item, e.g. its units) hands the costliest items out first, one
    at a time, so that no worker is left with a large item at the end (longest first)."""
    global _TASK
    jobs = min(jobs, n)
    if jobs <= 1 or n < min_items or not can_fork():
        return [task(i) for i in range(n)]
    _TASK = task
    try:
        with ProcessPoolExecutor(max_workers=jobs, mp_context=mp.get_context("fork")) as pool:
            if cost is None:
                return list(pool.map(_run, range(n), chunksize=max(1, n // (jobs * 8))))
            order = sorted(range(n), key=lambda i: -cost[i])        # stable: ties keep their order
            out: list = [None] * n
            for i, result in zip(order, pool.map(_run, order, chunksize=1), strict=True):
                out[i] = result
            return out
    finally:
        _TASK = None
