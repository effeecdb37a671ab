"""The pipeline: load, validate, resolve, compute, assess, render, publish.

``check`` stops after assessing and imports no plotting code; ``build`` renders the
whole site in memory and publishes it in one swap.
"""
from __future__ import annotations

import time
from dataclasses import dataclass
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
    results: dict
    pages: int = 0
    figures: int = 0
    seconds: float = 0.0
    reused: int = 0      # spec pages taken from the incremental-build cache

    @property
    def failing(self) -> list[str]:
        return [e.spec.id for e in self.evaluated if e.assessment.verdict == "fail"]

    @property
    def exit_code(self) -> int:
        return 1 if self.failing else 0


def evaluate_specs(specs: list[Spec]) -> list[Evaluated]:
    out = []
    for spec in specs:
        d = derive(spec)
        out.append(Evaluated(spec, d, assess(spec, d)))
    return out


def evaluate(specs_path: Path) -> tuple[list[Evaluated], list]:
    specs, warnings = load_specs(specs_path)
    return evaluate_specs(specs), warnings


def results_of(evaluated: list[Evaluated]) -> dict:
    from .render.results import results_document, spec_result

    return results_document([spec_result(e.spec, e.derived, e.assessment) for e in evaluated])


def check(specs_path: Path) -> Summary:
    t0 = time.perf_counter()
    evaluated, warnings = evaluate(specs_path)
    return Summary(evaluated, warnings, results_of(evaluated), seconds=time.perf_counter() - t0)


def build(specs_path: Path, out: Path, *, clean: bool = False, incremental: bool = True,
          history: bool = False, site_url: str | None = None, reload: bool = False) -> Summary:
    """Build the site into ``out``. Unless ``incremental`` is off, reuse the diagrams, their
    data files and the pages of unchanged specs from the cache beside ``out``; ``clean``
    empties it first. With ``history``, each spec page lists the git commits that changed
    its file. ``site_url`` (the site's public address) adds canonical links; ``reload``
    adds the live-preview script that ``colourspec serve`` uses."""
    from .cache import Cache, cache_dir_for
    from .publish import check_output, publish
    from .render.site import render_site

    t0 = time.perf_counter()
    evaluated, warnings = evaluate(specs_path)
    results = results_of(evaluated)
    check_output(out, protect=(specs_path,))  # before anything (the cache beside it) is written
    histories = None
    if history:
        from .history import spec_histories

        histories = spec_histories(specs_path)
    cache = Cache(cache_dir_for(out), clean=clean) if incremental else None
    site, n_pages, n_figures = render_site(evaluated, results, cache, histories,
                                           site_url=site_url, reload=reload)
    publish(site, out, protect=(specs_path,))
    if cache is not None:
        cache.prune()
    summary = Summary(evaluated, warnings, results, n_pages, n_figures, time.perf_counter() - t0)
    summary.reused = cache.hits if cache is not None else 0
    return summary
