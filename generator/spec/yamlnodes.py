"""YAML to a tree of positioned nodes, with none of YAML 1.1's implicit typing.

PyYAML's loaders resolve YAML 1.1 tags: `no` and `on` become booleans, `1e-3` a string,
`010` an octal 8 and `1:20` a sexagesimal 80, and a duplicate key silently keeps the
last value. We only *compose* (libyaml's C composer where installed, about eight times
faster than the pure-Python one) and keep every scalar as its source text; the schema
decides what a scalar means. Duplicate keys, merge keys, alias bombs and deep nesting
are refused here.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Union

import yaml

from .problems import Problems

try:
    _Loader = yaml.CSafeLoader
except AttributeError:  # pure-Python PyYAML build
    _Loader = yaml.SafeLoader

MAX_BYTES = 8 * 1024 * 1024      # a spec or measurement YAML file, bytes
MAX_NODES = 200_000              # nodes after alias expansion
MAX_DEPTH = 64                   # nesting of mappings and sequences


@dataclass(frozen=True)
class Mark:
    file: str
    line: int  # 1-based
    col: int   # 1-based


@dataclass(eq=False)
class Scalar:
    text: str
    plain: bool       # unquoted, so the schema may read it as a number / bool / null
    mark: Mark

    @property
    def is_null(self) -> bool:
        return self.plain and self.text in ("", "~", "null", "Null", "NULL")


@dataclass(eq=False)
class Seq:
    items: list["Node"]
    mark: Mark


@dataclass(eq=False)
class Map:
    items: dict[str, "Node"]
    key_marks: dict[str, Mark]
    mark: Mark
    # where each key came from when inheritance merged two mappings: key -> spec id
    inherited: dict[str, str] = field(default_factory=dict)


Node = Union[Scalar, Seq, Map]


class _TooBig(Exception):
    pass


def _mark(file: str, m) -> Mark:
    return Mark(file, m.line + 1, m.column + 1)


def parse_yaml(data: bytes, file: str, problems: Problems) -> Node | None:
    """Parse one YAML document into nodes; every problem goes to ``problems``."""
    top = Mark(file, 1, 1)
    if len(data) > MAX_BYTES:
        problems.error(top, "", f"file too large: {len(data)} bytes, the limit is {MAX_BYTES}",
                       "split the file, or raise generator.spec.yamlnodes.MAX_BYTES")
        return None
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        line = data[: e.start].count(b"\n") + 1
        col = e.start - (data.rfind(b"\n", 0, e.start) + 1) + 1
        problems.error(Mark(file, line, col), "", f"expected UTF-8 text, found byte 0x{data[e.start]:02x}",
                       "save the file as UTF-8")
        return None
    if "\x00" in text:
        problems.error(top, "", "expected text, found a NUL character (binary file?)")
        return None
    try:
        nodes = list(yaml.compose_all(text, Loader=_Loader))
    except yaml.MarkedYAMLError as e:
        m = e.problem_mark or e.context_mark
        where = _mark(file, m) if m else top
        msg = e.problem or "invalid YAML"
        if e.context:
            msg = f"{e.context}, {msg}"
        hint = ""
        if "\t" in text and "tab" in msg.lower():
            hint = "YAML indents with spaces only; replace the tabs"
        problems.error(where, "", f"YAML syntax error: {msg}", hint)
        return None
    except yaml.YAMLError as e:
        problems.error(top, "", f"YAML error: {e}")
        return None
    except RecursionError:
        problems.error(top, "", f"document nested too deeply (limit {MAX_DEPTH} levels)")
        return None
    if not nodes or nodes[0] is None:
        problems.error(top, "", "expected a spec mapping, found an empty file",
                       "run 'colourspec new' for a starter spec")
        return None
    if len(nodes) > 1:
        problems.error(_mark(file, nodes[1].start_mark), "", "expected one YAML document, found several",
                       "put each spec in a file of its own")
        return None
    count = [0]
    try:
        return _convert(nodes[0], file, problems, count, 0, set(), "")
    except _TooBig as e:
        problems.error(top, "", str(e), "YAML aliases that expand this far are refused")
        return None


def _convert(n, file, problems, count, depth, active, path) -> Node:
    count[0] += 1
    if count[0] > MAX_NODES:
        raise _TooBig(f"document expands to more than {MAX_NODES} nodes")
    if depth > MAX_DEPTH:
        raise _TooBig(f"document nested deeper than {MAX_DEPTH} levels")
    mark = _mark(file, n.start_mark)
    tag = n.tag or ""
    if tag.startswith("tag:yaml.org,2002:"):
        tag = ""
    if tag and tag != "!":
        problems.error(mark, path, f"YAML tag {n.tag!r} is not supported", "remove the tag")
    if isinstance(n, yaml.ScalarNode):
        return Scalar(n.value, n.style in (None, ""), mark)
    if id(n) in active:
        raise _TooBig("a YAML alias refers to itself")
    active.add(id(n))
    try:
        if isinstance(n, yaml.SequenceNode):
            return Seq([_convert(c, file, problems, count, depth + 1, active, f"{path}[{i}]")
                        for i, c in enumerate(n.value)], mark)
        items: dict[str, Node] = {}
        key_marks: dict[str, Mark] = {}
        for k, v in n.value:
            kmark = _mark(file, k.start_mark)
            if not isinstance(k, yaml.ScalarNode):
                problems.error(kmark, path, "expected a plain key, found a mapping or list as key")
                continue
            if k.tag == "tag:yaml.org,2002:merge" or k.value == "<<":
                problems.error(kmark, path, "YAML merge keys ('<<') are not supported",
                               "use 'extends: <spec id>' to inherit from another spec")
                continue
            key = k.value
            kpath = f"{path}.{key}" if path else key
            if key in items:
                first = key_marks[key]
                problems.error(kmark, kpath, f"duplicate key '{key}' (first given at line {first.line})",
                               "YAML keeps only the last value; remove one of them")
                continue
            items[key] = _convert(v, file, problems, count, depth + 1, active, kpath)
            key_marks[key] = kmark
        return Map(items, key_marks, mark)
    finally:
        active.discard(id(n))
