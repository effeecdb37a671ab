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

import yaml

from .limits import DEFAULTS, Limits, limits
from .problems import Problems

try:
    _Loader = yaml.CSafeLoader
except AttributeError:  # pure-Python PyYAML build
    _Loader = yaml.SafeLoader

# The default limits (see generator/spec/limits.py for the COLOURSPEC_MAX_* variables)
MAX_BYTES = DEFAULTS.max_bytes   # a spec or measurement YAML file, bytes
MAX_NODES = DEFAULTS.max_nodes   # values, counted while parsing and after alias expansion
MAX_DEPTH = DEFAULTS.max_depth   # nesting of mappings and sequences


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
    items: list[Node]
    mark: Mark


@dataclass(eq=False)
class Map:
    items: dict[str, Node]
    key_marks: dict[str, Mark]
    mark: Mark
    # where each key came from when inheritance merged two mappings: key -> spec id
    inherited: dict[str, str] = field(default_factory=dict)


Node = Scalar | Seq | Map


class _TooBig(Exception):
    def __init__(self, message: str, mark: Mark, hint: str):
        super().__init__(message)
        self.mark, self.hint = mark, hint


def _mark(file: str, m) -> Mark:
    return Mark(file, m.line + 1, m.column + 1)


def _position(text: str, index: int) -> tuple[int, int]:
    """1-based line and column of a character index (or byte index, for bytes)."""
    nl = "\n" if isinstance(text, str) else b"\n"
    return text.count(nl, 0, index) + 1, index - (text.rfind(nl, 0, index) + 1) + 1


def too_big(file: str, size: int, lim: Limits, problems: Problems) -> None:
    problems.error(Mark(file, 1, 1), "", f"expected a file of at most {lim.max_bytes} bytes, found {size} bytes",
                   "split the file, or set COLOURSPEC_MAX_BYTES to allow more")


def parse_yaml(data: bytes, file: str, problems: Problems, lim: Limits | None = None) -> Node | None:
    """Parse one YAML document into nodes; every problem goes to ``problems``."""
    lim = lim or limits()
    top = Mark(file, 1, 1)
    if len(data) > lim.max_bytes:
        too_big(file, len(data), lim, problems)
        return None
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        body = e.object  # the bytes after any byte order mark; e.start counts from there
        line, col = _position(body, e.start)
        problems.error(Mark(file, line, col), "", f"expected UTF-8 text, found the byte 0x{body[e.start]:02x}",
                       "save the file as UTF-8")
        return None
    if "\x00" in text:
        problems.error(Mark(file, *_position(text, text.index("\x00"))), "",
                       "expected text, found a NUL character (is this a binary file?)")
        return None
    try:
        aliases = _scan_events(text, file, lim)  # streaming: refuses before any node is built
        nodes = list(yaml.compose_all(text, Loader=_Loader))
    except _TooBig as e:
        problems.error(e.mark, "", str(e), e.hint)
        return None
    except yaml.YAMLError as e:
        _syntax_error(e, text, file, problems, lim)
        return None
    except RecursionError:  # only the pure-Python composer recurses
        problems.error(top, "", f"expected at most {lim.max_depth} levels of nesting, found far more",
                       _DEPTH_HINT)
        return None
    if not nodes or nodes[0] is None:
        problems.error(top, "", "expected a spec mapping, found an empty file",
                       "run 'colourspec new' for a starter spec")
        return None
    if len(nodes) > 1:
        problems.error(_mark(file, nodes[1].start_mark), "", "expected one YAML document, found several",
                       "put each spec in a file of its own")
        return None
    try:
        if aliases:
            _check_size(nodes[0], file, lim)
        return _convert(nodes[0], file, problems, 0, "", lim)
    except _TooBig as e:
        problems.error(e.mark, "", str(e), e.hint)
        return None


_DEPTH_HINT = "a spec needs a few levels; this looks like a generated or corrupted file"
_NODES_HINT = "a spec needs a few hundred values; set COLOURSPEC_MAX_NODES to allow more"
_NODE_EVENTS = (yaml.ScalarEvent, yaml.AliasEvent, yaml.SequenceStartEvent, yaml.MappingStartEvent)


def _scan_events(text: str, file: str, lim: Limits) -> int:
    """Count values and nesting in the parser's event stream, which costs constant memory,
    and refuse a document over the limits before composing it into nodes. Returns the
    number of aliases (without any, the expanded size is the count just checked)."""
    loader = _Loader(text)
    depth = -1  # the depth of the innermost open collection; the document's root is 0
    count = aliases = 0
    try:
        while loader.check_event():
            ev = loader.get_event()
            if isinstance(ev, _NODE_EVENTS):
                count += 1
                if depth + 1 > lim.max_depth:
                    raise _TooBig(f"expected at most {lim.max_depth} levels of nesting, found more",
                                  _mark(file, ev.start_mark), _DEPTH_HINT)
                if count > lim.max_nodes:
                    raise _TooBig(f"expected at most {lim.max_nodes} values, found more",
                                  _mark(file, ev.start_mark), _NODES_HINT)
                if isinstance(ev, (yaml.SequenceStartEvent, yaml.MappingStartEvent)):
                    depth += 1
                elif isinstance(ev, yaml.AliasEvent):
                    aliases += 1
            elif isinstance(ev, (yaml.SequenceEndEvent, yaml.MappingEndEvent)):
                depth -= 1
    finally:
        loader.dispose()
    return aliases


def _syntax_error(e: yaml.YAMLError, text: str, file: str, problems: Problems, lim: Limits = DEFAULTS) -> None:
    """Report a libyaml error at the most useful place, in words a newcomer can act on."""
    if isinstance(e, yaml.reader.ReaderError):
        where = Mark(file, *_position(text, e.position))
        problems.error(where, "", f"expected printable text, found the character U+{e.character:04X}",
                       "remove the control character")
        return
    if not isinstance(e, yaml.MarkedYAMLError):
        problems.error(Mark(file, 1, 1), "", f"YAML syntax error: {e}")
        return
    pm, cm = e.problem_mark, e.context_mark
    m = pm or cm
    where = _mark(file, m) if m else Mark(file, 1, 1)
    problem = e.problem or "invalid YAML"
    lines = text.splitlines()
    line_text = lines[where.line - 1] if 0 < where.line <= len(lines) else ""
    indent = line_text[: len(line_text) - len(line_text.lstrip(" \t"))]
    if "\t" in indent or line_text[where.col - 1: where.col] == "\t":
        tab = line_text.index("\t")
        problems.error(Mark(file, where.line, tab + 1), "", "expected spaces for indentation, found a tab",
                       "YAML indents with spaces only; replace the tabs with spaces")
        return
    if "maximum nesting depth" in problem:
        problems.error(where, "", f"expected at most {lim.max_depth} levels of nesting, found far more", _DEPTH_HINT)
        return
    problem = _plain_words(problem)
    context = _plain_words(e.context or "").removeprefix("while ")
    if context and cm is not None and pm is not None and "end of the file" in problem:
        where = _mark(file, cm)  # the unclosed start is what needs fixing
        context = f" ({context} that starts here)"
    elif context and cm is not None and (pm is None or (cm.line, cm.column) != (pm.line, pm.column)):
        context = f" ({context} that starts at line {cm.line + 1}, column {cm.column + 1})"
    elif context:
        context = f" ({context})"
    hint = _SYNTAX_HINTS.get(e.problem or "", "")
    problems.error(where, "", f"YAML syntax error: {problem}{context}", hint)


_SYNTAX_HINTS = {
    "did not find expected key": "check this line's indentation against the lines above",
    "mapping values are not allowed here": "quote a value that contains ': '",
    "mapping values are not allowed in this context": "quote a value that contains ': '",
    "found undefined alias": "a '*name' needs an '&name' earlier in the file; quote text that starts with '*'",
}


def _plain_words(libyaml_text: str) -> str:
    return (libyaml_text.replace("unexpected end of stream", "the end of the file")
            .replace("quoted scalar", "quoted text").replace("plain scalar", "value"))


def _children(n) -> list:
    if isinstance(n, yaml.SequenceNode):
        return n.value
    if isinstance(n, yaml.MappingNode):
        return [c for kv in n.value for c in kv]
    return []


def _check_size(root, file: str, lim: Limits) -> None:
    """Refuse a document whose aliases expand it past MAX_NODES (a "billion laughs" bomb),
    or that refers to itself, before expanding anything. Works on the shared node graph,
    so it costs time in the number of distinct nodes, not in the expanded size."""
    size: dict[int, int] = {}
    open_: set[int] = set()
    stack = [(root, False)]
    while stack:
        n, closing = stack.pop()
        if closing:
            open_.discard(id(n))
            size[id(n)] = 1 + sum(size[id(c)] for c in _children(n))
            if size[id(n)] > lim.max_nodes:
                raise _TooBig(f"expected at most {lim.max_nodes} values once aliases are expanded, found more",
                              _mark(file, n.start_mark), "YAML aliases that expand this far are refused")
            continue
        if id(n) in size:
            continue
        if id(n) in open_:
            raise _TooBig("expected a value, found an alias that refers to itself", _mark(file, n.start_mark),
                          "remove the alias, or write the value out")
        open_.add(id(n))
        stack.append((n, True))
        stack.extend((c, False) for c in _children(n) if id(c) not in size)


# The tags a plain document resolves to, and '!' (the non-specific tag of quoted text).
_PLAIN_TAGS = {"", "!"} | {f"tag:yaml.org,2002:{t}" for t in ("str", "int", "float", "bool", "null", "seq", "map")}


def _convert(n, file, problems, depth, path, lim: Limits) -> Node:
    mark = _mark(file, n.start_mark)
    if depth > lim.max_depth:
        raise _TooBig(f"expected at most {lim.max_depth} levels of nesting, found more", mark, _DEPTH_HINT)
    tag = n.tag or ""
    if tag not in _PLAIN_TAGS:  # !!python/..., !!binary, !!set, local tags: refused, never constructed
        shown = "!!" + tag.removeprefix("tag:yaml.org,2002:") if tag.startswith("tag:yaml.org,2002:") else tag
        problems.error(mark, path, f"expected a plain value, found the YAML tag {shown!r}", "remove the tag")
    if isinstance(n, yaml.ScalarNode):
        return Scalar(n.value, n.style in (None, ""), mark)
    if isinstance(n, yaml.SequenceNode):
        return Seq([_convert(c, file, problems, depth + 1, f"{path}[{i}]", lim) for i, c in enumerate(n.value)],
                   mark)
    items: dict[str, Node] = {}
    key_marks: dict[str, Mark] = {}
    for k, v in n.value:
        kmark = _mark(file, k.start_mark)
        if not isinstance(k, yaml.ScalarNode):
            problems.error(kmark, path, "expected a plain key, found a mapping or list as key")
            continue
        if k.tag == "tag:yaml.org,2002:merge" or k.value == "<<":
            problems.error(kmark, path, "expected a plain key, found a YAML merge key '<<'",
                           "use 'extends: <spec id>' to inherit from another spec")
            continue
        key = k.value
        kpath = f"{path}.{key}" if path else key
        if key in items:
            first = key_marks[key]
            problems.error(kmark, kpath, f"expected each key once, found '{key}' again "
                           f"(first at line {first.line}, column {first.col})",
                           "YAML would silently keep only the last value; remove one of them")
            continue
        items[key] = _convert(v, file, problems, depth + 1, kpath, lim)
        key_marks[key] = kmark
    return Map(items, key_marks, mark)
