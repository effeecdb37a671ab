"""colourspec diff: what a change to the specs does to targets, tolerances, requirements
and verdicts, as text or as Markdown for a pull-request comment.

Both sides are loaded, inherited, validated and assessed like ``check``; the typed
specs are flattened into facets (``white.tolerance.delta_uv`` -> 0.004) and compared
key by key, so a change to a parent shows in every child it reaches. Verdicts are
compared row by row (requirement id and unit).
"""
from __future__ import annotations

import math
import posixpath
import subprocess
from dataclasses import dataclass, field
from pathlib import Path, PurePosixPath

from .build import Evaluated, evaluate_specs
from .measure.files import FORMATS, PathRefused
from .spec.load import SPEC_SUFFIXES, display_path, load_documents, load_specs
from .spec.problems import InputError, Problem

KINDS = ("target", "tolerance", "requirement", "unit", "meta")
TITLES = {"target": "target", "tolerance": "tolerance", "requirement": "requirement", "unit": "measured unit",
          "meta": "metadata"}


class DiffError(Exception):
    """A revision or folder that cannot be read (usage, exit 2)."""


# ---------------------------------------------------------------- reading a side

def _git(args: list[str], cwd: Path | None = None) -> bytes:
    try:
        r = subprocess.run(["git", *args], cwd=cwd, capture_output=True, check=False)
    except FileNotFoundError as e:
        raise DiffError("git is not installed; compare two folders instead") from e
    if r.returncode != 0:
        raise DiffError(f"git {' '.join(args[:2])}: {r.stderr.decode(errors='replace').strip()}")
    return r.stdout


class GitFiles:
    """Measurement files at a git revision, with the checks measure.files.locate makes on
    a folder: relative to the spec file, inside the specs folder, no symbolic links."""

    def __init__(self, rev: str, specs: Path, blobs: dict[str, str]):
        self.rev, self.blobs = rev, blobs   # path as listed -> git file mode
        self.base = posixpath.normpath(PurePosixPath(specs).as_posix())

    def find(self, written: str, spec_file: str) -> str:
        p = PurePosixPath(written)
        if p.is_absolute() or written.startswith(("/", "\\")) or (len(written) > 1 and written[1] == ":"):
            raise PathRefused(f"expected a path relative to the spec file, found the absolute path {written!r}",
                              "put the file beside the spec, e.g. measurements/lot-2611.csv")
        target = posixpath.normpath(posixpath.join(posixpath.dirname(spec_file), written))
        inside = self.base == "." and not target.startswith("../") or target.startswith(self.base + "/")
        if not inside:
            raise PathRefused(f"expected a file inside the specs folder, found {written!r} leading out of it",
                              "measurement files must live under the specs folder")
        mode = self.blobs.get(target)
        if mode == "120000":
            raise PathRefused(f"expected a measurement file, found a symbolic link at {written!r}",
                              "measurement files must live under the specs folder")
        if mode is None:
            raise PathRefused(f"expected a measurement file, found nothing at {written!r} in {self.rev}",
                              "paths are relative to the spec file")
        if p.suffix.lower() not in FORMATS:
            raise PathRefused(f"expected a .csv, .cgats or .txt (CGATS.17) file, found {written!r}")
        return target

    def read_bytes(self, target: str) -> bytes:
        return _git(["show", f"{self.rev}:./{target}"])


def git_tree(rev: str, specs: Path) -> tuple[list[tuple[str, bytes]], GitFiles]:
    """The spec files below ``specs`` at ``rev`` and access to the other files there."""
    _git(["rev-parse", "--verify", "--quiet", f"{rev}^{{commit}}"])
    entries = _git(["ls-tree", "-r", "-z", rev, "--", str(specs)]).split(b"\0")
    out, blobs = [], {}
    for raw in sorted(n for n in entries if n):
        meta, _, raw_name = raw.partition(b"\t")
        name = raw_name.decode("utf-8", errors="surrogateescape")
        p = Path(name)
        blobs[posixpath.normpath(p.as_posix())] = meta.split(b" ")[0].decode()
        if p.suffix not in SPEC_SUFFIXES or any(part.startswith(".") for part in p.parts):
            continue
        out.append((display_path(p), _git(["show", f"{rev}:./{name}"])))
    out.sort()
    return out, GitFiles(rev, specs, blobs)


def _evaluate(documents: list[tuple[str, bytes]] | None, folder: Path | None, label: str,
              files=None) -> list[Evaluated]:
    try:
        specs, _ = load_documents(documents, files=files) if documents is not None else load_specs(folder)
    except InputError as e:
        raise InputError([Problem(f"{label}:{p.file}" if documents is not None else p.file, p.line, p.col,
                                  p.path, p.message, p.hint, p.severity) for p in e.problems]) from None
    return evaluate_specs(specs)


def side(spec: str, rev: str | None = None) -> list[Evaluated]:
    """One side of a diff: a folder (or file), or the specs folder at a git revision."""
    if rev is None:
        return _evaluate(None, Path(spec), spec)
    documents, files = git_tree(rev, Path(spec))
    return _evaluate(documents, None, rev, files)


# ---------------------------------------------------------------- facets

def _num(v):
    return round(float(v), 10) if isinstance(v, float) else v


def _tol(prefix: str, tol, out: dict) -> None:
    for k in tol.kinds():
        v = getattr(tol, k)
        out[f"{prefix}.tolerance.{k}"] = ("tolerance", tuple(_num(x) if not isinstance(x, tuple)
                                                             else tuple(map(_num, x)) for x in v)
                                          if isinstance(v, tuple) else _num(v))


def facets(spec) -> dict[str, tuple[str, object]]:
    """Every comparable value of a typed spec: dotted key -> (kind, value)."""
    out: dict[str, tuple[str, object]] = {}
    for k in ("title", "product", "revision", "status", "extends", "observer"):
        out[k] = ("meta", getattr(spec, k) or None)
    if spec.white is not None:
        out["white.target"] = ("target", f"{spec.white.written} (x {spec.white.xy[0]:.4f}, y {spec.white.xy[1]:.4f})")
        _tol("white", spec.white.tolerance, out)
        for k, v in sorted(spec.white.luminance.items()):
            kind = "target" if k == "target" else "tolerance"
            out[f"white.luminance.{k}"] = (kind, _num(v))
    for p in spec.primaries:
        out[f"primaries.{p.name}"] = ("target", f"x {p.xy[0]:.4f}, y {p.xy[1]:.4f}")
        _tol(f"primaries.{p.name}", p.tolerance, out)
    for g in spec.gamut:
        lim = {k: _num(v) for k, v in (("min", g.min), ("max", g.max)) if v is not None}
        out[f"gamut.{g.reference}.{g.metric}.{g.diagram}"] = ("requirement", _limit_str(lim))
    if spec.measurements:   # named relative to the spec file, as written
        here = posixpath.dirname(spec.file) or "."
        out["measurements"] = ("meta", ", ".join(posixpath.relpath(m, here) for m in spec.measurements))
    for key, text in _units(spec):
        out[key] = ("unit", text)
    return out


def _units(spec):
    """(units.SERIAL, its measurements as text) of every unit, inline or from a file."""
    t = spec.table
    if t is None or not len(t):
        return
    names = ["white"] + sorted(c for c in t.channels if c != "white")
    cols = {c: t.channels[c].tolist() for c in names if c in t.channels}
    for i, serial in enumerate(t.serial):
        parts = []
        for c in names:
            if c not in cols:
                continue
            x, y, Y = cols[c][i]
            if math.isnan(x):
                continue
            if c == "white":
                parts.append(f"white x {x:.4f}, y {y:.4f}" + (f", Y {Y:g}" if not math.isnan(Y) else ""))
            else:
                parts.append(f"{c} x {x:.4f}, y {y:.4f}")
        # measured colours, inline or from files (Y: the luminance factor)
        for name, m in spec.unit_colours.get(serial, {}).items():
            parts.append(f"{name} x {m.xy[0]:.4f}, y {m.xy[1]:.4f}" + (f", Y {m.Y:g}" if m.Y is not None else ""))
        yield f"units.{serial}", "; ".join(parts)


def _limit_str(lim: dict) -> str:
    if "min" in lim and "max" in lim:
        return f"{lim['min']:g} to {lim['max']:g}"
    if "min" in lim:
        return f">= {lim['min']:g}"
    if "max" in lim:
        return f"<= {lim['max']:g}"
    return "none"


def show(v) -> str:
    if v is None:
        return "—"
    if isinstance(v, tuple):
        return "[" + ", ".join(show(x) for x in v) + "]"
    if isinstance(v, float):
        return f"{v:g}"
    return str(v)


# ---------------------------------------------------------------- comparing

@dataclass
class Change:
    kind: str       # one of KINDS
    key: str
    old: object     # None: added
    new: object     # None: removed

    @property
    def action(self) -> str:
        return "added" if self.old is None else "removed" if self.new is None else "changed"


@dataclass
class VerdictChange:
    row: str
    sample: str | None
    old: str | None
    new: str | None
    old_text: str = ""
    new_text: str = ""


@dataclass
class SpecDiff:
    id: str
    file: str
    status: str                     # "added" | "removed" | "changed"
    old_verdict: str | None
    new_verdict: str | None
    changes: list[Change] = field(default_factory=list)
    verdicts: list[VerdictChange] = field(default_factory=list)


def _row_text(r: dict) -> str:
    from .render.pages import limit_text, value_text

    return f"{value_text(r)} against {limit_text(r)}"


def _rows(e: Evaluated) -> dict[tuple[str, str | None], dict]:
    return {(r["id"], r["sample"]): r for r in e.assessment.rows}


def compare(old: list[Evaluated], new: list[Evaluated]) -> list[SpecDiff]:
    a = {e.spec.id: e for e in old}
    b = {e.spec.id: e for e in new}
    out = []
    for sid in sorted(set(a) | set(b)):
        ea, eb = a.get(sid), b.get(sid)
        if ea is None or eb is None:
            e = eb or ea
            out.append(SpecDiff(sid, e.spec.file, "added" if ea is None else "removed",
                                ea.assessment.verdict if ea else None, eb.assessment.verdict if eb else None))
            continue
        fa, fb = facets(ea.spec), facets(eb.spec)
        changes = [Change((fb.get(k) or fa.get(k))[0], k, fa[k][1] if k in fa else None,
                          fb[k][1] if k in fb else None)
                   for k in _ordered(fa, fb) if (fa.get(k) or (None, None))[1] != (fb.get(k) or (None, None))[1]]
        ra, rb = _rows(ea), _rows(eb)
        verdicts = []
        for key in _ordered(ra, rb):
            va, vb = ra.get(key), rb.get(key)
            if (va or {}).get("verdict") != (vb or {}).get("verdict"):
                verdicts.append(VerdictChange(key[0], key[1], va["verdict"] if va else None,
                                              vb["verdict"] if vb else None,
                                              _row_text(va) if va else "", _row_text(vb) if vb else ""))
        if changes or verdicts or ea.assessment.verdict != eb.assessment.verdict:
            out.append(SpecDiff(sid, eb.spec.file, "changed", ea.assessment.verdict, eb.assessment.verdict,
                                changes, verdicts))
    return out


def _ordered(a: dict, b: dict) -> list:
    """Keys of b in b's order, then keys only in a, in a's order."""
    return list(b) + [k for k in a if k not in b]


# ---------------------------------------------------------------- output

def _counts(diffs: list[SpecDiff]) -> str:
    n = {s: sum(d.status == s for d in diffs) for s in ("added", "removed", "changed")}
    flips = sum(len(d.verdicts) for d in diffs)
    parts = [f"{v} spec{'s' if v != 1 else ''} {k}" for k, v in n.items() if v]
    parts.append(f"{flips} requirement verdict{'s' if flips != 1 else ''} changed")
    return ", ".join(parts) if diffs else "no change to any spec"


def _who(v: VerdictChange) -> str:
    return v.row + (f" [unit {v.sample}]" if v.sample else "")


def text_report(diffs: list[SpecDiff], old_label: str, new_label: str) -> str:
    lines = [f"colourspec diff {old_label} -> {new_label}: {_counts(diffs)}"]
    for d in diffs:
        lines.append("")
        if d.status != "changed":
            v = d.new_verdict or d.old_verdict
            lines.append(f"{d.id} ({d.file}): spec {d.status} (verdict {v})")
            continue
        verdict = (f"verdict {d.old_verdict} -> {d.new_verdict}" if d.old_verdict != d.new_verdict
                   else f"verdict {d.new_verdict}, unchanged")
        lines.append(f"{d.id} ({d.file}): {verdict}")
        for c in d.changes:
            lines.append(f"  {TITLES[c.kind]} {c.action}: {c.key}: {show(c.old)} -> {show(c.new)}"
                         if c.action == "changed" else
                         f"  {TITLES[c.kind]} {c.action}: {c.key}: {show(c.new if c.old is None else c.old)}")
        for v in d.verdicts:
            lines.append(f"  verdict {v.old or '(no row)'} -> {v.new or '(no row)'}: {_who(v)}"
                         + (f" ({v.new_text or v.old_text})" if (v.new_text or v.old_text) else ""))
    return "\n".join(lines) + "\n"


def _md(s) -> str:
    return str(s).replace("\\", "\\\\").replace("|", "\\|").replace("\n", " ").replace("<", "&lt;")


_SYM = {"pass": "✓ pass", "fail": "✗ fail", "indeterminate": "? indeterminate", None: "—"}


def markdown_report(diffs: list[SpecDiff], old_label: str, new_label: str) -> str:
    out = [f"### colourspec diff `{_md(old_label)}` → `{_md(new_label)}`", "", _counts(diffs) + "."]
    for d in diffs:
        out.append("")
        if d.status != "changed":
            out.append(f"#### `{_md(d.id)}` — spec {d.status}")
            out.append("")
            out.append(f"`{_md(d.file)}`, verdict {_SYM[d.new_verdict or d.old_verdict]}")
            continue
        verdict = (f"verdict {_SYM[d.old_verdict]} → **{_SYM[d.new_verdict]}**" if d.old_verdict != d.new_verdict
                   else f"verdict {_SYM[d.new_verdict]} (unchanged)")
        out += [f"#### `{_md(d.id)}` — {verdict}", "", f"`{_md(d.file)}`", ""]
        if d.changes:
            out += ["| change | key | before | after |", "|---|---|---|---|"]
            out += [f"| {TITLES[c.kind]} {c.action} | `{_md(c.key)}` | {_md(show(c.old))} | {_md(show(c.new))} |"
                    for c in d.changes]
            out.append("")
        if d.verdicts:
            out += ["| requirement | unit | before | after | now |", "|---|---|---|---|---|"]
            out += [f"| `{_md(v.row)}` | {_md(v.sample or '—')} | {_SYM[v.old]} | **{_SYM[v.new]}** | "
                    f"{_md(v.new_text or v.old_text)} |" for v in d.verdicts]
            out.append("")
    return "\n".join(out).rstrip("\n") + "\n"
