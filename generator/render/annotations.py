"""Workflow-command annotations for hosted CI runners, one per line on standard output:

    ::error file=specs/a.yaml,line=14,col=7,title=colourspec primaries.red::message
    ::warning file=...::message

Data (the message) escapes ``%``, CR and LF; property values also escape ``:`` and
``,``. A runner shows only the first few annotations of each kind per step, so at most
``limit`` of each severity are written, then one ``::notice`` line says how many were
left out.
"""
from __future__ import annotations

from dataclasses import dataclass

DEFAULT_LIMIT = 10  # per severity: what a hosted runner displays per step


def escape_data(s: str) -> str:
    return s.replace("%", "%25").replace("\r", "%0D").replace("\n", "%0A")


def escape_property(s: str) -> str:
    return escape_data(s).replace(":", "%3A").replace(",", "%2C")


def unescape_data(s: str) -> str:
    return s.replace("%0A", "\n").replace("%0D", "\r").replace("%25", "%")


def unescape_property(s: str) -> str:
    return unescape_data(s.replace("%3A", ":").replace("%2C", ","))


@dataclass(frozen=True)
class Annotation:
    severity: str   # "error" | "warning" | "notice"
    message: str
    file: str = ""
    line: int = 0
    col: int = 0
    title: str = ""

    def format(self) -> str:
        props = []
        if self.file:
            props.append(f"file={escape_property(self.file)}")
            if self.line:
                props.append(f"line={self.line}")
            if self.col:
                props.append(f"col={self.col}")
        if self.title:
            props.append(f"title={escape_property(self.title)}")
        head = f"::{self.severity}" + (" " + ",".join(props) if props else "")
        return f"{head}::{escape_data(self.message)}"


def parse(line: str) -> Annotation:
    """Read one annotation line back (the inverse of Annotation.format; for tests and tools)."""
    if not line.startswith("::"):
        raise ValueError(f"not an annotation: {line!r}")
    head, sep, data = line[2:].partition("::")
    if not sep:
        raise ValueError(f"not an annotation: {line!r}")
    severity, _, rest = head.partition(" ")
    props = {}
    for item in filter(None, rest.split(",")):
        k, _, v = item.partition("=")
        props[k] = unescape_property(v)
    return Annotation(severity, unescape_data(data), props.get("file", ""), int(props.get("line", 0)),
                      int(props.get("col", 0)), props.get("title", ""))


def from_problem(p) -> Annotation:
    msg = p.message + (f"\nhint: {p.hint}" if p.hint else "")
    title = f"colourspec {p.path}" if p.path else "colourspec"
    return Annotation("warning" if p.severity == "warning" else "error", msg, p.file, p.line, p.col, title)


def from_row(spec, row: dict, mark) -> Annotation:
    from .pages import limit_text, shortfall_text, value_text

    unit = f"unit {row['sample']}: " if row["sample"] else ""
    short = shortfall_text(row)
    msg = (f"{spec.id}: {unit}{row['label']} is {row['verdict']}: {value_text(row)} against "
           f"{limit_text(row)}{f', {short}' if short else ''}")
    sev = "error" if row["verdict"] == "fail" else "warning"
    file, line, col = (mark.file, mark.line, mark.col) if mark else (spec.file, 0, 0)
    return Annotation(sev, msg, file, line, col, f"colourspec {row['id']}")


def render(annotations: list[Annotation], limit: int = DEFAULT_LIMIT) -> str:
    """The lines to print: at most ``limit`` per severity, then a summary of what was left out."""
    shown, left = [], {}
    counts: dict[str, int] = {}
    for a in annotations:
        counts[a.severity] = counts.get(a.severity, 0) + 1
        if counts[a.severity] <= limit:
            shown.append(a.format())
        else:
            left[a.severity] = left.get(a.severity, 0) + 1
    if left:
        parts = ", ".join(f"{n} more {sev}{'s' if n != 1 else ''}" for sev, n in sorted(left.items()))
        total = ", ".join(f"{counts[s]} {s}{'s' if counts[s] != 1 else ''}" for s in sorted(counts))
        shown.append(Annotation("notice", f"{parts} not shown as annotations (limit {limit} per kind; "
                                f"{total} in all); the step log and the JUnit report list every one",
                                title="colourspec: annotations truncated").format())
    return "".join(line + "\n" for line in shown)
