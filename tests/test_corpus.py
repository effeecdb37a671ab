"""The bad-input corpus: every case is refused with exit status 2, exactly the problem
lines it states (FILE:LINE:COL: key.path: expected ..., found ...), no traceback, and
`build` writes nothing.

A case is one of
- `corpus/NAME.yaml` with `# expect: LINE:COL: ...` comments (at its end, so that they
  do not move the lines they describe);
- `corpus/NAME.yaml` with `corpus/NAME.yaml.expect` beside it, for files that cannot
  carry a comment (empty, UTF-16, an unclosed quote); its first line says what the case is;
- `corpus/NAME/`, a folder of specs, with `expect` listing `FILE:LINE:COL: ...` lines.
"""
from __future__ import annotations

import re
import shutil
from pathlib import Path

import pytest

from generator.cli import main

CORPUS = Path(__file__).resolve().parent / "corpus"
CASES = sorted([p for p in CORPUS.glob("*.yaml")] + [p for p in CORPUS.iterdir() if p.is_dir()])
PROBLEM = re.compile(r"^specs/[^:]+\.yaml:\d+:\d+: ")


def expected(case: Path) -> list[str]:
    if case.is_dir():
        lines = (case / "expect").read_text(encoding="utf-8").splitlines()
        return [f"specs/{line}" for line in lines if line and not line.startswith("#")]
    sidecar = case.with_name(case.name + ".expect")
    if sidecar.exists():
        lines = sidecar.read_text(encoding="utf-8").splitlines()
        return [f"specs/{case.name}:{line}" for line in lines if line and not line.startswith("#")]
    text = case.read_bytes().decode("utf-8", errors="replace")
    return [f"specs/{case.name}:{m.rstrip(chr(13))}" for m in re.findall(r"^# expect: (.*)$", text, re.MULTILINE)]


def install(case: Path, tmp_path: Path) -> None:
    if case.is_dir():
        shutil.copytree(case, tmp_path / "specs", ignore=shutil.ignore_patterns("expect"))
    else:
        (tmp_path / "specs").mkdir()
        shutil.copy(case, tmp_path / "specs" / case.name)


def test_the_corpus_has_at_least_sixty_cases_each_with_expectations():
    assert len(CASES) >= 60
    for case in CASES:
        assert expected(case), f"{case.name} states no expected problem"


@pytest.mark.parametrize("case", CASES, ids=[c.name.removesuffix(".yaml") for c in CASES])
def test_bad_input_is_refused_with_exactly_the_stated_problems(tmp_path, monkeypatch, capsys, case):
    install(case, tmp_path)
    monkeypatch.chdir(tmp_path)
    for argv in (["check", "specs"], ["build", "specs", "-o", "site"]):
        status = main(argv)
        out, err = capsys.readouterr()
        assert "Traceback" not in err
        assert status == 2, err
        problems = [line for line in err.splitlines() if line.startswith("specs/")]
        assert problems == expected(case)
        assert all(PROBLEM.match(line) for line in problems)
        assert err.rstrip().endswith(f"{len(problems)} error(s): nothing was assessed or written.")
        assert out == ""
        assert not (tmp_path / "site").exists()
