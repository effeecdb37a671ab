"""The pipeline: load, validate, resolve, compute, assess, render, publish.

``check`` stops after assessing and imports no plotting code; ``build`` renders the
whole site in memory and publishes it in one swap.
"""
from __future__ import annotations

import time
from dataclasses import dataclass, replace
from pathlib import Path

from .assess.requirements import Assessment, assess
from .derive import Derived, derive
from .model import Spec
from .spec.load import load_specs


@dataclass
class Evaluated:
    spec: Spec
    derived: Derived
    assessment: Assessment


@dataclass
class Summary:
    evaluated: list[Evaluated]
    warnings: list
    _results: dict | None
    pages: int = 0
    figures: int = 0
    seconds: float = 0.0
    reused: int = 0      # spec pages taken from the incremental-build cache
    recalled: int = 0    # spec evaluations taken from the memo (generator/memo.py)
    stages: dict = None  # seconds per pipeline stage

    def __post_init__(self):
        if self.stages is None:
            self.stages = {}

    @property
    def results(self) -> dict:
        """results.json as a dict (built on first use: for 100,000 units it is large)."""
        if self._results is None:
            self._results = results_of(self.evaluated)
        return self._results

    @property
    def failing(self) -> list[str]:
        return [e.spec.id for e in self.evaluated if e.assessment.verdict == "fail"]

    @property
    def exit_code(self) -> int:
        return 1 if self.failing else 0


def _evaluate_one(spec: Spec) -> tuple[Evaluated, float, float]:
    t0 = time.perf_counter()
    d = derive(spec)
    t1 = time.perf_counter()
    a = assess(spec, d)
    return Evaluated(spec, d, a), t1 - t0, time.perf_counter() - t1


def evaluate_specs(specs: list[Spec], stages: dict | None = None, jobs: int = 1, done_one=None) -> list[Evaluated]:
    """Compute and assess each spec, in ``jobs`` worker processes when that is worth it.
    ``stages`` gains the seconds spent computing and assessing (wall time, shared between
    the two in proportion to the time the work took). ``done_one(evaluated)`` runs where
    each spec was evaluated (in its worker), e.g. to keep it in the memo."""
    from .parallel import map_indexed

    stages = stages if stages is not None else {}

    def one(i: int):
        # a worker passes back the figures and the assessment without the unit table, which
        # the parent already holds in the spec (about half of what would travel)
        e, td, ta = _evaluate_one(specs[i])
        if done_one is not None:
            done_one(e)
        return e.derived, replace(e.assessment, table=None), td, ta

    t0 = time.perf_counter()
    done = map_indexed(one, len(specs), jobs, cost=[len(s.table) if s.table is not None else 0 for s in specs])
    wall = time.perf_counter() - t0
    t_derive, t_assess = sum(x[2] for x in done), sum(x[3] for x in done)
    share = t_derive / (t_derive + t_assess) if t_derive + t_assess > 0 else 1.0
    stages["compute"] = stages.get("compute", 0.0) + wall * share
    stages["assess"] = stages.get("assess", 0.0) + wall * (1.0 - share)
    return [Evaluated(spec, d, replace(a, table=spec.table)) for spec, (d, a, _, _) in zip(specs, done, strict=True)]


def evaluate(specs_path: Path, memo=None, stages: dict | None = None, jobs: int = 1) -> tuple[list[Evaluated], list]:
    """Every spec of ``specs_path`` loaded, validated, resolved, computed and assessed. With
    a memo (generator/memo.py), specs whose inputs are unchanged since the build that filled
    it are taken from it whole."""
    stages = stages if stages is not None else {}
    t0 = time.perf_counter()
    reused: dict = {}
    parsed = memo.parsed_nodes() if memo is not None else None
    known = set(parsed or ())
    specs, warnings = load_specs(specs_path, memo.reuse if memo is not None else None, reused, jobs, parsed)
    if memo is not None:
        memo.store_parsed(parsed, changed=set(parsed) != known)     # the same names and bytes: kept as is
    stages["load"] = time.perf_counter() - t0
    done_one = None
    if memo is not None:     # each fresh evaluation is kept by the worker that made it
        every = specs + [e.spec for e in reused.values()]
        by_id, digests = {s.id: s for s in every}, {s.file: s.digest for s in every}

        def done_one(e):
            memo.store_one(e, by_id, digests)
    evaluated = evaluate_specs(specs, stages, jobs, done_one) + list(reused.values())
    evaluated.sort(key=lambda e: e.spec.id)
    if memo is not None:
        for s in specs:
            memo.mark_used(s.file, digests)
    return evaluated, warnings


def results_of(evaluated: list[Evaluated]) -> dict:
    from .render.results import results_document, spec_result

    return results_document([spec_result(e.spec, e.derived, e.assessment) for e in evaluated])


def check(specs_path: Path) -> Summary:
    t0 = time.perf_counter()
    evaluated, warnings = evaluate(specs_path)
    return Summary(evaluated, warnings, results_of(evaluated), seconds=time.perf_counter() - t0)


def build(specs_path: Path, out: Path, *, clean: bool = False, incremental: bool = True,
          history: bool = False, site_url: str | None = None, reload: bool = False, jobs: int = 1) -> Summary:
    """Build the site into ``out``. Unless ``incremental`` is off, reuse the diagrams, their
    data files and the pages of unchanged specs from the cache beside ``out``; ``clean``
    empties it first. With ``history``, each spec page lists the git commits that changed
    its file. ``site_url`` (the site's public address) adds canonical links; ``reload``
    adds the live-preview script that ``colourspec serve`` uses. ``jobs`` > 1 computes and
    draws in that many worker processes; the site is the same bytes."""
    from .cache import Cache, cache_dir_for
    from .publish import check_output, publish
    from .render.site import render_site

    t0 = time.perf_counter()
    check_output(out, protect=(specs_path,))  # before anything (the cache beside it) is written
    stages: dict = {}
    memo = None
    if incremental and specs_path.is_dir():
        from .memo import EvaluationMemo

        cdir = cache_dir_for(out)
        if clean and cdir.exists():
            import shutil

            shutil.rmtree(cdir)
        memo = EvaluationMemo(cdir / "evaluated", specs_path, skip=(out,))
    evaluated, warnings = evaluate(specs_path, memo, stages, jobs)
    t1 = time.perf_counter()
    from .render.results import results_document

    results = results_document([], [e.assessment.verdict for e in evaluated])   # entries: encoded per spec
    histories = None
    if history:
        from .history import spec_histories

        histories = spec_histories(specs_path)
    cache = Cache(cache_dir_for(out), clean=clean and memo is None) if incremental else None  # emptied above
    site, n_pages, n_figures = render_site(evaluated, results, cache, histories,
                                           site_url=site_url, reload=reload, jobs=jobs)
    t2 = time.perf_counter()
    stages["render"] = t2 - t1
    publish(site, out, protect=(specs_path,))
    if cache is not None:
        cache.prune()
    if memo is not None:
        memo.prune()
    stages["publish"] = time.perf_counter() - t2
    summary = Summary(evaluated, warnings, None, n_pages, n_figures, time.perf_counter() - t0, stages=stages)
    summary.reused = cache.hits if cache is not None else 0
    summary.recalled = memo.hits if memo is not None else 0
    return summary
