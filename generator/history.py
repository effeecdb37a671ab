"""Per-spec revision history from git: for each commit that touched a spec file, its
commit, date (the committer's, from git, so builds stay reproducible), message, the
spec's `revision:` at that commit and which keys of the file changed.

Read with one ``git log --raw`` over the specs folder and one ``git cat-file --batch``
for the file versions; no checkout. Outside a git repository there is no history.
"""
from __future__ import annotations

import os
import subprocess
from dataclasses import dataclass
from pathlib import Path

from .spec.load import SPEC_SUFFIXES, display_path
from .spec.problems import Problems
from .spec.yamlnodes import Map, Scalar, Seq, parse_yaml

MAX_ENTRIES = 20      # per spec, newest first
MAX_KEYS = 6          # changed keys named per entry, then "and N more"
NULL = "0" * 40


@dataclass(frozen=True)
class Entry:
    commit: str       # abbreviated to 10 hex digits
    date: str         # YYYY-MM-DD, committer date
    subject: str
    revision: str     # the spec's revision: at this commit ("" if none)
    change: str       # "created", "deleted", or the keys that changed

    def as_json(self) -> dict:
        return {"commit": self.commit, "date": self.date, "subject": self.subject, "revision": self.revision,
                "change": self.change}


def _git(args: list[str], cwd: Path, stdin: bytes | None = None) -> bytes | None:
    try:
        r = subprocess.run(["git", *args], cwd=cwd, input=stdin, capture_output=True, check=False)
    except (FileNotFoundError, OSError):
        return None
    return r.stdout if r.returncode == 0 else None


def flatten(node, prefix: str = "", out: dict | None = None) -> dict[str, str]:
    """Dotted key path -> scalar text, lists by index: gamut[0].min -> '95'."""
    out = {} if out is None else out
    if isinstance(node, Map):
        for k, v in node.items.items():
            flatten(v, f"{prefix}.{k}" if prefix else k, out)
    elif isinstance(node, Seq):
        for i, v in enumerate(node.items):
            flatten(v, f"{prefix}[{i}]", out)
    elif isinstance(node, Scalar):
        out[prefix] = node.text
    return out


def _keys(data: bytes | None) -> dict[str, str] | None:
    if data is None:
        return None
    node = parse_yaml(data, "history", Problems())
    return flatten(node) if node is not None else {}


def describe_change(old: dict | None, new: dict | None) -> str:
    if old is None:
        return "created"
    if new is None:
        return "deleted"
    parts = []
    for k in list(new) + [k for k in old if k not in new]:
        if k in old and k in new and old[k] != new[k]:
            parts.append(f"{k} {old[k]} → {new[k]}")
        elif k not in old:
            parts.append(f"{k} added")
        elif k not in new:
            parts.append(f"{k} removed")
    if not parts:
        return "no change to any key (layout or comments)"
    more = f"; and {len(parts) - MAX_KEYS} more" if len(parts) > MAX_KEYS else ""
    return "; ".join(parts[:MAX_KEYS]) + more


def _blobs(ids: set[str], cwd: Path) -> dict[str, bytes]:
    ids = sorted(i for i in ids if i != NULL)
    if not ids:
        return {}
    raw = _git(["cat-file", "--batch"], cwd, ("\n".join(ids) + "\n").encode())
    out, pos = {}, 0
    while raw and pos < len(raw):
        eol = raw.index(b"\n", pos)
        head = raw[pos:eol].split()
        if len(head) < 3:  # "<id> missing"
            pos = eol + 1
            continue
        size = int(head[2])
        out[head[0].decode()] = raw[eol + 1:eol + 1 + size]
        pos = eol + 1 + size + 1
    return out


def spec_histories(specs: Path) -> dict[str, list[Entry]]:
    """Display file name -> history entries, newest first; {} outside a git repository."""
    folder = specs if specs.is_dir() else specs.parent
    top = _git(["rev-parse", "--show-toplevel"], folder)
    if top is None:
        return {}
    root = Path(top.decode().strip())
    log = _git(["log", "--format=%x1e%H%x1f%cI%x1f%s", "--raw", "--no-abbrev", "--no-renames", "-z",
                "--", "."], folder)
    if not log:
        return {}
    changes: dict[str, list[tuple[str, str, str, str, str]]] = {}  # path -> (commit, date, subject, old, new)
    blob_ids: set[str] = set()
    for record in log.decode("utf-8", errors="replace").split("\x1e")[1:]:
        head, _, raw = record.partition("\0")
        commit, date, subject = (head.split("\x1f") + ["", ""])[:3]
        fields = [f for f in raw.strip("\n\0").split("\0")]
        i = 0
        while i + 1 < len(fields):
            meta, path = fields[i].lstrip("\n"), fields[i + 1]
            i += 2
            bits = meta.split()
            if len(bits) < 5 or Path(path).suffix not in SPEC_SUFFIXES:
                continue
            old, new = bits[2], bits[3]
            changes.setdefault(path, []).append((commit, date[:10], subject, old, new))
            blob_ids.update((old, new))
    blobs = _blobs(blob_ids, root)
    out: dict[str, list[Entry]] = {}
    for path, items in changes.items():
        shown = display_path(Path(os.path.join(root, path)), specs)
        if specs.is_file() and Path(shown) != Path(display_path(specs, specs)):
            continue
        entries = []
        for commit, date, subject, old, new in items[:MAX_ENTRIES]:
            new_keys = _keys(blobs.get(new)) if new != NULL else None
            old_keys = _keys(blobs.get(old)) if old != NULL else None
            revision = (new_keys or {}).get("revision", "")
            entries.append(Entry(commit[:10], date, subject, revision, describe_change(old_keys, new_keys)))
        out[shown] = entries
    return out
