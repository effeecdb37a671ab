"""Problems found in input, reported to people as FILE:LINE:COL: key.path: message."""
from __future__ import annotations

from dataclasses import dataclass, field


@dataclass(frozen=True, order=True)
class Problem:
    file: str
    line: int
    col: int
    path: str
    message: str
    hint: str = ""
    severity: str = "error"  # "error" | "warning"

    def format(self) -> str:
        where = f"{self.file}:{self.line}:{self.col}"
        key = f" {self.path}:" if self.path else ""
        text = f"{where}:{key} {self.message}"
        if self.severity == "warning":
            text = f"{where}: warning:{key} {self.message}"
        if self.hint:
            text += f"\n    hint: {self.hint}"
        return text

    def as_json(self) -> dict:
        return {"file": self.file, "line": self.line, "col": self.col, "path": self.path,
                "message": self.message, "hint": self.hint, "severity": self.severity}


@dataclass
class Problems:
    """Collects every problem of a run; nothing stops at the first."""

    items: list[Problem] = field(default_factory=list)

    def error(self, where, path: str, message: str, hint: str = "") -> None:
        self.items.append(Problem(where.file, where.line, where.col, path, message, hint))

    def warn(self, where, path: str, message: str, hint: str = "") -> None:
        self.items.append(Problem(where.file, where.line, where.col, path, message, hint, "warning"))

    @property
    def errors(self) -> list[Problem]:
        return [p for p in self.items if p.severity == "error"]

    @property
    def warnings(self) -> list[Problem]:
        return [p for p in self.items if p.severity == "warning"]

    def sorted(self) -> list[Problem]:
        return sorted(set(self.items))


class InputError(Exception):
    """Raised to stop a run after invalid input; carries every problem found."""

    def __init__(self, problems: list[Problem]):
        super().__init__(f"{len(problems)} problem(s) in the input")
        self.problems = problems


def did_you_mean(word: str, choices) -> str:
    import difflib

    close = difflib.get_close_matches(str(word), [str(c) for c in choices], n=1, cutoff=0.6)
    return f"did you mean '{close[0]}'?" if close else ""
