"""Load every spec of a folder: parse, inherit, validate, resolve to typed Specs.

All problems of all files are collected; ``load_specs`` raises InputError carrying
every one of them, or returns the specs (and their warnings) when there are no errors.
"""
from __future__ import annotations

import os
from dataclasses import dataclass
from pathlib import Path

from .limits import limits
from .problems import InputError, Problems, did_you_mean
from .schema import SPEC
from .types import INVALID, describe
from .yamlnodes import Map, Mark, Node, Scalar, parse_yaml, too_big

SPEC_SUFFIXES = (".yaml", ".yml")


@dataclass
class SourceSpec:
    file: str         # as shown to people: relative to the working folder where possible
    path: Path
    node: Map
    id: str


def display_path(path: Path, root: Path | None = None) -> str:
    """A spec's name as shown on pages and in results: relative to the working folder
    when inside it, else relative to the specs folder's parent (``specs/x.yaml``), so that
    no absolute path of the build machine reaches the published site."""
    try:
        rel = os.path.relpath(path)
    except ValueError:
        rel = ".."
    if not rel.startswith(".."):
        return Path(rel).as_posix()
    base = (root if root is not None and root.is_dir() else path).resolve().parent
    try:
        return Path(path).resolve().relative_to(base).as_posix()
    except ValueError:
        return Path(path).name


def discover(specs: Path, problems: Problems) -> list[Path]:
    """The spec files to read: a single file, or every *.yaml / *.yml below a folder."""
    if specs.is_file():
        return [specs]
    if not specs.is_dir():
        problems.error(Mark(str(specs), 1, 1), "", "expected a spec file or a folder of specs, found nothing there",
                       "give the path of a folder such as specs/")
        return []
    files = sorted(p for p in specs.rglob("*") if p.suffix in SPEC_SUFFIXES and p.is_file()
                   and not any(part.startswith(".") for part in p.relative_to(specs).parts))
    root = os.path.realpath(specs)
    inside = [p for p in files if os.path.commonpath([root, os.path.realpath(p)]) == root]
    for p in files:
        if p not in inside:  # a link out of the specs folder: never read it
            problems.error(Mark(display_path(p, specs), 1, 1), "",
                           f"expected a spec file inside {display_path(specs)}, found a link to a file outside it",
                           "copy the file into the specs folder instead")
    files = inside
    if not files and not problems.errors:
        problems.error(Mark(display_path(specs), 1, 1), "", "expected spec files (*.yaml), found none",
                       "run 'colourspec new specs/my-spec.yaml' for a starter spec")
    return files


def read_files(files: list[Path], problems: Problems, root: Path | None = None) -> list[tuple[str, bytes]]:
    """(name shown to people, bytes) of every file that can be read; a file over the byte
    limit is refused before it is read, so memory stays bounded."""
    out = []
    lim = limits()
    for path in files:
        shown = display_path(path, root)
        try:
            with open(path, "rb") as f:
                size = os.fstat(f.fileno()).st_size
                if size > lim.max_bytes:
                    too_big(shown, size, lim, problems)
                    continue
                out.append((shown, f.read(lim.max_bytes + 1)))
        except OSError as e:
            problems.error(Mark(shown, 1, 1), "", f"cannot read the file: {e.strerror}")
    return out


def read_sources(documents: list[tuple[str, bytes]], problems: Problems, parsed: dict | None = None,
                 digests: dict[str, str] | None = None) -> list[SourceSpec]:
    """Each document parsed, or taken from ``parsed`` ((shown name, sha256) -> node: what
    an earlier build parsed, without a problem, from the same bytes under the same name)."""
    out: list[SourceSpec] = []
    seen: dict[str, SourceSpec] = {}
    lim = limits()
    for shown, data in documents:
        path = Path(shown)
        node = parsed.get((shown, digests[shown])) if parsed else None
        if node is None:
            node = parse_yaml(data, shown, problems, lim)
        if node is None:
            continue
        if not isinstance(node, Map):
            problems.error(node.mark, "", f"expected a spec mapping (key: value lines), found {describe(node)}",
                           "a spec starts with lines such as 'spec: 1' and 'id: my-spec'")
            continue
        idn = node.items.get("id")
        sid = idn.text if isinstance(idn, Scalar) and not idn.is_null else ""
        src = SourceSpec(shown, path, node, sid)
        if sid and sid in seen:
            problems.error(idn.mark, "id", f"expected an id of its own, found '{sid}' again "
                           f"(also the id of {seen[sid].file})", "every spec needs an id of its own")
            continue
        if sid:
            seen[sid] = src
        out.append(src)
    return out


def merge(parent: Node, child: Node, parent_id: str) -> Node:
    """Deep merge for inheritance: mappings merge key by key, the child wins; lists and
    scalars are replaced whole. Keys taken whole from the parent remember the id of the
    spec that wrote them (the parent, or the ancestor it inherited them from); a key the
    child states, even in part, is not listed: its merged mapping lists its own."""
    if not (isinstance(parent, Map) and isinstance(child, Map)):
        return child
    items = dict(parent.items)
    marks = dict(parent.key_marks)
    inherited = {k: parent.inherited.get(k, parent_id) for k in parent.items}
    for k, v in child.items.items():
        items[k] = merge(parent.items[k], v, parent_id) if k in parent.items else v
        marks[k] = child.key_marks[k]
        inherited.pop(k, None)
    return Map(items, marks, child.mark, inherited)


def inherited_paths(node: Node, prefix: str = "", source: str | None = None) -> dict[str, str]:
    """Every value of a merged spec that was inherited: dotted key path -> the id of the
    spec that wrote it, at the shallowest level where one ancestor wrote all of it."""
    if not isinstance(node, Map):
        return {}
    out: dict[str, str] = {}
    for k, v in node.items.items():
        path = f"{prefix}{k}"
        src = node.inherited.get(k, source)
        sub = inherited_paths(v, path + ".", src) if isinstance(v, Map) and v.items else {}
        if src is not None and (not sub or set(sub.values()) == {src}):
            out[path] = src
        else:
            out.update(sub)
    return out


def apply_inheritance(sources: list[SourceSpec], problems: Problems) -> dict[str, Node]:
    by_id = {s.id: s for s in sources if s.id}
    merged: dict[str, Node | None] = {}  # None: this spec's ancestry is broken (already reported)

    def resolve(src: SourceSpec, chain: tuple[str, ...]) -> Node | None:
        if src.id in merged:
            return merged[src.id]
        ext = src.node.items.get("extends")
        if not isinstance(ext, Scalar) or ext.is_null:
            result: Node | None = src.node
        elif ext.text in chain + (src.id,):
            cycle = (chain + (src.id,))[(chain + (src.id,)).index(ext.text):] + (ext.text,)
            problems.error(ext.mark, "extends", "expected a spec that does not inherit from itself, "
                           f"found the cycle {' -> '.join(cycle)}",
                           "a spec cannot extend itself or one of its descendants")
            result = None
        else:
            pid = ext.text
            parent = by_id.get(pid)
            pnode = resolve(parent, chain + (src.id,)) if parent is not None else None
            if parent is None:
                problems.error(ext.mark, "extends", f"expected the id of another spec, found '{pid}'",
                               did_you_mean(pid, by_id) or "known ids: " + ", ".join(sorted(by_id)))
            if pnode is None:
                if src.id:
                    merged[src.id] = None
                return None
            pclean = Map({k: v for k, v in pnode.items.items() if k not in ("id", "extends", "$schema")},
                         {k: m for k, m in pnode.key_marks.items() if k not in ("id", "extends", "$schema")},
                         pnode.mark, dict(pnode.inherited))
            result = merge(pclean, src.node, pid)
        if src.id:
            merged[src.id] = result
        return result

    out = {}
    for s in sources:
        node = resolve(s, ())
        if node is not None:
            out[s.file] = node
    return out


def load_specs(specs: Path, reuse=None, reused: dict | None = None, jobs: int = 1, parsed: dict | None = None):
    """Return (list of Spec, warnings) or raise InputError with every problem found.
    ``reuse``, ``reused`` and ``parsed``: see ``load_documents``."""
    from ..measure.files import FolderFiles

    problems = Problems()
    paths = discover(specs, problems)
    documents = read_files(paths, problems, specs)
    files = FolderFiles(specs if specs.is_dir() else specs.parent, {display_path(p, specs): p for p in paths})
    return load_documents(documents, problems, files, reuse=reuse, reused=reused, jobs=jobs, parsed=parsed)


class _CheckedOnDemand(dict):
    """id -> checked values of a spec, checking a spec only when another spec asks for it
    (a spec taken whole from a previous build was not checked again)."""

    def __init__(self, checked: dict, pending: dict):
        super().__init__(checked)
        self._pending = pending            # id -> merged node not checked yet

    def get(self, key, default=None):
        if key not in self and key in self._pending:
            v = SPEC.check(self._pending.pop(key), "", Problems())   # a reused spec had no problems
            if v is not INVALID:
                self[key] = v
        return super().get(key, default)

    def __iter__(self):
        return iter(sorted(set(super().keys()) | set(self._pending)))


def load_documents(documents: list[tuple[str, bytes]], problems: Problems | None = None, files=None,
                   folders: dict[str, Path] | None = None, reuse=None, reused: dict | None = None,
                   jobs: int = 1, parsed: dict | None = None):
    """load_specs for files already in memory, e.g. read from a git revision: a list of
    (file name as shown to people, bytes). ``files`` finds and reads the measurement files
    the specs name (``measure.files.FolderFiles``); without it, naming one is an error.
    ``folders`` gives the folder on disk of each shown name (where its spectra files are
    read); by default that of the spec's real path in ``files``, else the shown name's folder.

    ``reuse(file, digests)`` (file name -> sha256 of every document) may return what a
    previous build made of a spec whose inputs are unchanged; such a spec is neither checked
    nor resolved again, its value goes to ``reused[file]`` and its warnings (``.warnings``
    of the returned object's ``spec``) are reported again. ``jobs`` > 1 resolves the specs
    (reading their measurement and spectra files) in that many worker processes.
    ``parsed`` ((shown name, sha256) -> node) offers the parses of an earlier build; when
    every document loads without an error, it is left holding this build's parses."""
    if folders is None:
        folders = {shown: p.parent for shown, p in getattr(files, "spec_paths", {}).items()}
    import hashlib

    from .resolve import resolve_spec

    problems = problems if problems is not None else Problems()
    digests = {shown: hashlib.sha256(data).hexdigest() for shown, data in documents}
    sources = read_sources(documents, problems, parsed, digests)
    merged = apply_inheritance(sources, problems)
    pending = {}
    if reuse is not None and not problems.errors:
        for src in sources:
            got = reuse(src.file, digests) if src.file in merged else None
            if got is not None:
                reused[src.file] = got
                pending[src.id] = got.spec.source = merged.pop(src.file)   # the memo keeps no nodes
                problems.items.extend(got.spec.warnings)
    values = {}
    for src in sources:
        node = merged.get(src.file)
        if node is None:
            continue
        v = SPEC.check(node, "", problems)
        if v is not INVALID:
            values[src.file] = (src, node, v)
    result = []
    by_id = _CheckedOnDemand({v["id"]: v for (_, _, v) in values.values()}, pending)
    todo = list(values.items())

    def resolve_one(i: int):
        """Resolve one spec against a copy of the problems so far (its warnings are picked
        from them); returns the spec and the problems it added. Runs in a worker process
        when ``jobs`` > 1, so nothing here may rely on changing shared state."""
        file, (_, node, v) = todo[i]
        local = Problems(list(problems.items))
        spec = resolve_spec(file, node, v, by_id, local, (folders or {}).get(file), files)
        return spec, local.items[len(problems.items):]

    from ..parallel import map_indexed

    # measurement files are most of the reading: specs that name them go first
    cost = [len(v.get("measurements") or ()) if isinstance(v, dict) else 0 for _, (_, _, v) in todo]
    resolved = map_indexed(resolve_one, len(todo), jobs, min_items=8, cost=cost)
    for (file, (_, node, v)), (spec, added) in zip(todo, resolved, strict=True):
        problems.items.extend(added)
        if spec is not None:
            spec.source = node
            spec.digest = digests.get(file, "")
            spec.inherited = {k: v for k, v in inherited_paths(node).items() if k != "spec"}
            result.append(spec)
    if problems.errors:
        raise InputError(problems.sorted())
    if parsed is not None:
        parsed.clear()
        parsed.update({(src.file, digests[src.file]): src.node for src in sources})
    result.sort(key=lambda s: s.id)
    return result, sorted(set(problems.warnings))
