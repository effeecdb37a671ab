"""Incremental builds: a content-hash cache of each spec's rendered files (its SVG
diagrams, its page, and its lot and supplier pages with their diagrams and histograms),
the part of a build that costs.

The key of a spec hashes everything its page and figures are made from: the bytes of
its own file and of every spec it depends on (its ancestors through ``extends``, the
specs its gamut rows use as references, and theirs) with the spectra CSV files each
of them reads, the bytes of every measurement file it reads (its own ``measurements:``
or inherited ones), its file name and history,
the templates and static files, the generator's own source (figures included: they are
hand-written SVG) and the tool's version. Anything else changed gives a new key, so a hit is the same bytes a
full build would render. The index and results.json are always rebuilt (cheap).

The cache lives in a hidden folder beside the site (``.site_output.cache/`` for
``site_output/``), never inside it; ``build --clean`` empties it first. Entries not
used by a build are removed at its end.
"""
from __future__ import annotations

import hashlib
import json
import os
import shutil
import tempfile
from functools import lru_cache
from pathlib import Path

from . import __version__
from .publish import FileRef

FORMAT = "colourspec-cache/1"
KEEP = {"evaluated"}     # the evaluation memo's folder (generator/memo.py)


def cache_dir_for(out: Path) -> Path:
    out = out.resolve()
    return out.parent / f".{out.name}.cache"


def _tree_digest(root: Path, suffixes: tuple[str, ...] | None = None) -> str:
    h = hashlib.sha256()
    for p in sorted(root.rglob("*")):
        if p.is_file() and "__pycache__" not in p.parts and (suffixes is None or p.suffix in suffixes):
            h.update(p.relative_to(root).as_posix().encode() + b"\0")
            h.update(hashlib.sha256(p.read_bytes()).digest())
    return h.hexdigest()


@lru_cache(maxsize=1)
def tool_digest() -> str:
    """Version, generator source and data, templates and static files."""
    from .render.pages import templates_dir

    here = Path(__file__).resolve().parent
    parts = [FORMAT, __version__, _tree_digest(here, (".py", ".csv")),
             _tree_digest(templates_dir())]
    return hashlib.sha256("\n".join(parts).encode()).hexdigest()


def dependencies(spec, by_id: dict) -> list[str]:
    """Ids of the specs whose bytes the spec's page depends on, itself included, sorted."""
    seen: set[str] = set()
    todo = [spec.id]
    while todo:
        sid = todo.pop()
        if sid in seen or sid not in by_id:
            continue
        seen.add(sid)
        s = by_id[sid]
        if s.extends:
            todo.append(s.extends)
        todo += [k for k in s.references if k in by_id]
    return sorted(seen)


def spec_key(spec, by_id: dict, extra: str = "") -> str:
    h = hashlib.sha256()
    h.update(tool_digest().encode() + b"\0" + spec.id.encode() + b"\0" + spec.file.encode() + b"\0")
    for sid in dependencies(spec, by_id):
        dep = by_id[sid]
        h.update(f"{sid}={dep.digest}\0".encode())
        for name, digest in getattr(dep, "input_files", {}).items():   # spectra CSV files it read
            h.update(f"{sid}:{name}={digest}\0".encode())
    for name, digest in zip(spec.measurements, spec.measurement_digests, strict=True):
        h.update(f"measurements {name}={digest}\0".encode())
    h.update(extra.encode())
    return h.hexdigest()


class Cache:
    """key -> {relative name: bytes}, one folder per key with a manifest."""

    def __init__(self, root: Path, clean: bool = False):
        self.root = root
        self.used: set[str] = set()
        self.hits = self.misses = 0
        if clean and root.exists():
            shutil.rmtree(root)

    def get(self, key: str, refs: bool = False) -> dict | None:
        """The entry's files as bytes, or with ``refs`` as FileRefs to the cache's files
        (published as hard links: an entry's files are never rewritten in place)."""
        entry = self.root / key
        try:
            manifest = json.loads((entry / "manifest.json").read_text(encoding="utf-8"))
            if manifest.get("format") != FORMAT:
                return None
            folder = os.fspath(entry)
            paths = {name: os.path.join(folder, str(i)) for i, name in enumerate(manifest["files"])}
            if refs:
                if not all(os.path.isfile(p) for p in paths.values()):
                    raise OSError("an entry's file is missing")
                files = {name: FileRef(p) for name, p in paths.items()}
            else:
                files = {name: Path(p).read_bytes() for name, p in paths.items()}
        except (OSError, ValueError, KeyError, TypeError):
            self.misses += 1
            return None
        self.used.add(key)
        self.hits += 1
        return files

    def put(self, key: str, files: dict[str, bytes]) -> dict[str, FileRef] | None:
        """Store an entry; FileRefs to its files, or None when the cache cannot be written."""
        self.used.add(key)
        try:
            self.root.mkdir(parents=True, exist_ok=True)
            tmp = Path(tempfile.mkdtemp(prefix=".new-", dir=self.root))
            names = sorted(files)
            for i, name in enumerate(names):
                (tmp / f"{i}").write_bytes(files[name])
            (tmp / "manifest.json").write_text(json.dumps({"format": FORMAT, "files": names}), encoding="utf-8")
            os.chmod(tmp, 0o755)      # mkdtemp makes it private
            target = self.root / key
            if target.exists():
                shutil.rmtree(target)
            os.replace(tmp, target)
        except OSError:
            return None  # a cache that cannot be written only costs time
        folder = os.fspath(target)
        return {name: FileRef(os.path.join(folder, str(i))) for i, name in enumerate(names)}

    def prune(self) -> None:
        """Remove every entry this build did not use (and half-written ones)."""
        if not self.root.is_dir():
            return
        for p in self.root.iterdir():
            if p.name not in self.used and p.name not in KEEP:
                shutil.rmtree(p, ignore_errors=True) if p.is_dir() else p.unlink(missing_ok=True)
