"""What a previous build computed for a spec, reused when the spec's inputs are unchanged.

An incremental build (generator/cache.py keeps the drawn pages) would otherwise still
validate, resolve, compute and assess every spec of the library on every run. The memo
keeps, per spec, its evaluation (typed spec, derived figures, assessment) pickled beside
the site, under a key that hashes:

- the tool (generator/cache.py ``tool_digest``: version, source, data, templates);
- the spec's file name and bytes, and the names of every spec file of the library (a
  spec added, removed or renamed anywhere invalidates every entry);
- the bytes of every other file under the specs folder (measurement and spectra files:
  any such change invalidates every entry, which keeps the rule simple and safe).

An entry also lists the files of the specs it depends on (ancestors and the specs its
gamut rows use as references, with theirs) and their digests; it is used only when all
of them are unchanged. The memo is local build state in the tool's hidden cache folder,
like the page cache; it is read only from there and never published.
"""
from __future__ import annotations

import hashlib
import os
import pickle
from pathlib import Path

from .cache import dependencies, tool_digest
from .spec.load import SPEC_SUFFIXES
from .tablecache import write_atomically

FORMAT = "colourspec-evaluated/1"


def _other_files_digest(specs: Path, skip: tuple[Path, ...]) -> str:
    """sha256 over the names and bytes of every non-spec file below the specs folder."""
    h = hashlib.sha256()
    skip_real = {os.path.realpath(p) for p in skip}
    for dirpath, dirnames, filenames in os.walk(specs):
        dirnames[:] = sorted(d for d in dirnames if not d.startswith(".")
                             and os.path.realpath(os.path.join(dirpath, d)) not in skip_real)
        for name in sorted(filenames):
            if name.startswith(".") or name.endswith(SPEC_SUFFIXES):
                continue
            p = os.path.join(dirpath, name)
            h.update(os.path.relpath(p, specs).encode("utf-8", "surrogateescape") + b"\0")
            try:
                with open(p, "rb") as f:
                    h.update(hashlib.file_digest(f, "sha256").digest())
            except OSError:
                h.update(b"unreadable")
    return h.hexdigest()


class EvaluationMemo:
    """file name -> Evaluated of a previous build, in ``root`` (one pickle per key)."""

    def __init__(self, root: Path, specs: Path, skip: tuple[Path, ...] = ()):
        self.root = root
        self.used: set[str] = set()
        self.hits = 0
        self._base = tool_digest() + "\0" + FORMAT + "\0" + _other_files_digest(specs, skip + (root,))
        self._keys: dict[str, str] = {}

    def _key(self, file: str, digests: dict[str, str]) -> str:
        if file not in self._keys:
            h = hashlib.sha256(self._base.encode())
            h.update("\0".join(sorted(digests)).encode() + b"\0" + file.encode() + b"\0")
            h.update(digests[file].encode())
            self._keys[file] = h.hexdigest()
        return self._keys[file]

    def reuse(self, file: str, digests: dict[str, str]):
        """The Evaluated stored for ``file`` if every file it depends on is unchanged."""
        key = self._key(file, digests)
        try:
            with open(self.root / f"{key}.pickle", "rb") as f:
                entry = pickle.load(f)
            if entry["format"] != FORMAT or any(digests.get(n) != d for n, d in entry["closure"].items()):
                return None
            evaluated = entry["evaluated"]
        except (OSError, EOFError, pickle.UnpicklingError, KeyError, TypeError, AttributeError,
                ImportError, IndexError, ValueError):
            return None
        self.used.add(key)
        self.hits += 1
        return evaluated

    def store_one(self, e, by_id: dict, digests: dict[str, str]) -> None:
        """Keep one evaluation (``by_id``: every spec of the build, for its closure). A worker
        process may call it; the parent then marks the key used (``mark_used``)."""
        key = self._key(e.spec.file, digests)
        if key in self.used:
            return
        closure = {by_id[sid].file: by_id[sid].digest for sid in dependencies(e.spec, by_id)}
        self.used.add(key)
        source, e.spec.source = e.spec.source, None     # the merged YAML nodes: the loader has them again
        try:
            self._write(key, {"format": FORMAT, "closure": closure, "evaluated": e})
        finally:
            e.spec.source = source

    def _write(self, stem: str, entry: dict) -> None:
        try:
            write_atomically(self.root / f"{stem}.pickle", lambda f: pickle.dump(entry, f, protocol=5))
        except (OSError, pickle.PicklingError, TypeError, AttributeError):
            pass  # a memo that cannot be written only costs time

    def mark_used(self, file: str, digests: dict[str, str]) -> None:
        self.used.add(self._key(file, digests))

    # The spec files' parses, (shown name, sha256) -> node, kept in one file: reading it is
    # several times faster than parsing 200 YAML files again. Keyed on the tool and the limits
    # (a limit that changed must be able to refuse a file).
    def _parsed_stem(self) -> str:
        from .spec.limits import limits

        return "parsed-" + hashlib.sha256((self._base + "\0" + repr(limits())).encode()).hexdigest()[:32]

    def parsed_nodes(self) -> dict:
        try:
            with open(self.root / f"{self._parsed_stem()}.pickle", "rb") as f:
                entry = pickle.load(f)
            return dict(entry["nodes"]) if entry.get("format") == FORMAT else {}
        except (OSError, EOFError, pickle.UnpicklingError, KeyError, TypeError, AttributeError,
                ImportError, IndexError, ValueError):
            return {}

    def store_parsed(self, nodes: dict, changed: bool = True) -> None:
        stem = self._parsed_stem()
        self.used.add(stem)
        if changed:
            self._write(stem, {"format": FORMAT, "nodes": nodes})

    def prune(self) -> None:
        """Remove every entry this build did not use."""
        if not self.root.is_dir():
            return
        for p in self.root.iterdir():
            if p.suffix != ".pickle" or p.stem not in self.used:
                p.unlink(missing_ok=True)
