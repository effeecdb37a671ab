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

    @property
    def failing(self) -> list[str]:
        return [e.spec.id for e in self.evaluated if e.assessment.verdict == "fail"]

    @property
    def exit_code(self) -> int:
        return 1 if self.failing else 0


def evaluate(specs_path: Path) -> tuple[list[Evaluated], list]:
    specs, warnings = load_specs(specs_path)
    out = []
    for spec in specs:
        d = derive(spec)
        out.append(Evaluated(spec, d, assess(spec, d)))
    return out, warnings


def results_of(evaluated: list[Evaluated]) -> dict:
    from .render.results import results_document, spec_result

    return results_document([spec_result(e.spec, e.derived, e.assessment) for e in evaluated])


def check(specs_path: Path) -> Summary:
    t0 = time.perf_counter()
    evaluated, warnings = evaluate(specs_path)
    return Summary(evaluated, warnings, results_of(evaluated), seconds=time.perf_counter() - t0)


def build(specs_path: Path, out: Path) -> Summary:
    from .publish import publish
    from .render.site import render_site

    t0 = time.perf_counter()
    evaluated, warnings = evaluate(specs_path)
    results = results_of(evaluated)
    site, n_pages, n_figures = render_site(evaluated, results)
    publish(site, out, protect=(specs_path,))
    return Summary(evaluated, warnings, results, n_pages, n_figures, time.perf_counter() - t0)
