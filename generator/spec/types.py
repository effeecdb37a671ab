"""Schema building blocks: each checks a positioned YAML node and returns a plain value.

A type's ``check`` reports every problem it finds to ``problems`` and returns INVALID
for a value it could not read; ``json_schema`` describes the same rule in JSON Schema
draft-07, so the validator and the editor schema come from one declaration.
"""
from __future__ import annotations

import math
import re
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any

from .problems import Problems, did_you_mean
from .yamlnodes import Map, Node, Scalar, Seq


class _Invalid:
    def __repr__(self) -> str:
        return "INVALID"

    def __bool__(self) -> bool:
        return False


INVALID: Any = _Invalid()

_NUMBER = re.compile(r"^[-+]?(\.[0-9]+|[0-9]+(\.[0-9]*)?)([eE][-+]?[0-9]+)?$")
_NONFINITE = re.compile(r"^[-+]?\.?(inf|nan)(inity)?$", re.IGNORECASE)
_BOOLISH = {"yes", "no", "on", "off", "y", "n", "true", "false"}


def _short(text: str, limit: int = 40) -> str:
    return text if len(text) <= limit else f"{text[:limit]}... ({len(text)} characters)"


def describe(node: Node) -> str:
    """How a value reads in an error message: 'the text "x"', 'a mapping', ..."""
    if isinstance(node, Map):
        return "a mapping"
    if isinstance(node, Seq):
        return f"a list of {len(node.items)}"
    if node.is_null:
        return "nothing (null)"
    if not node.plain:
        return f"the quoted text {_short(node.text)!r}"
    return repr(_short(node.text))


def _near_miss(word: str, choices) -> bool:
    """A very close spelling of a declared key (tolerence, tolerances), not merely a similar
    name: 'orange' or 'warm-white' stay free names."""
    import difflib

    return bool(difflib.get_close_matches(word, list(choices), n=1, cutoff=0.85))


class Type:
    description: str = ""

    def check(self, node: Node, path: str, problems: Problems) -> Any:  # pragma: no cover
        raise NotImplementedError

    def json_schema(self) -> dict:  # pragma: no cover
        raise NotImplementedError

    def expected(self) -> str:
        return self.__class__.__name__.lower()


def read_number(node: Node, path: str, problems: Problems, what: str = "a number"):
    if not isinstance(node, Scalar):
        problems.error(node.mark, path, f"expected {what}, found {describe(node)}")
        return INVALID
    t = node.text.strip()
    if node.plain and _NUMBER.match(t):
        v = float(t)
        if not math.isfinite(v):
            problems.error(node.mark, path, f"expected {what}, found {_short(t)}, too large to be a number")
            return INVALID
        return v
    if node.plain and _NONFINITE.match(t):
        problems.error(node.mark, path, f"expected {what}, found {t}, which is not a finite number")
        return INVALID
    hint = ""
    if not node.plain and _NUMBER.match(t):
        hint = "remove the quotes to give a number"
    elif "," in t and _NUMBER.match(t.replace(",", ".")):
        hint = "use a point, not a comma, as the decimal mark"
    problems.error(node.mark, path, f"expected {what}, found {describe(node)}", hint)
    return INVALID


@dataclass
class Number(Type):
    description: str = ""
    minimum: float | None = None
    maximum: float | None = None
    exclusive_minimum: float | None = None
    unit: str = ""

    def expected(self) -> str:
        parts = []
        if self.exclusive_minimum is not None:
            parts.append(f"> {self.exclusive_minimum:g}")
        if self.minimum is not None:
            parts.append(f">= {self.minimum:g}")
        if self.maximum is not None:
            parts.append(f"<= {self.maximum:g}")
        return "a number" + (" " + " and ".join(parts) if parts else "")

    def check(self, node, path, problems):
        v = read_number(node, path, problems, self.expected())
        if v is INVALID:
            return v
        bad = ((self.minimum is not None and v < self.minimum)
               or (self.maximum is not None and v > self.maximum)
               or (self.exclusive_minimum is not None and v <= self.exclusive_minimum))
        if bad:
            problems.error(node.mark, path, f"expected {self.expected()}, found {_short(node.text)}")
            return INVALID
        return v

    def json_schema(self):
        s: dict = {"type": "number", "description": self.description}
        if self.minimum is not None:
            s["minimum"] = self.minimum
        if self.maximum is not None:
            s["maximum"] = self.maximum
        if self.exclusive_minimum is not None:
            s["exclusiveMinimum"] = self.exclusive_minimum
        return s


@dataclass
class Integer(Type):
    description: str = ""
    allowed: tuple[int, ...] = ()

    def check(self, node, path, problems):
        text = node.text.strip() if isinstance(node, Scalar) else ""
        if isinstance(node, Scalar) and node.plain and re.fullmatch(r"[-+]?[0-9]{1,18}", text):
            v = int(text)
            if self.allowed and v not in self.allowed:
                problems.error(node.mark, path, f"expected {self.expected()}, found {v}")
                return INVALID
            return v
        hint = "remove the quotes to give a number" if isinstance(node, Scalar) and not node.plain \
            and re.fullmatch(r"[-+]?[0-9]+", text) else ""
        found = _short(text) if isinstance(node, Scalar) and node.plain and _NUMBER.match(text) else describe(node)
        problems.error(node.mark, path, f"expected {self.expected()}, found {found}", hint)
        return INVALID

    def expected(self) -> str:
        if len(self.allowed) == 1:
            return f"the number {self.allowed[0]}"
        if self.allowed:
            return "one of " + ", ".join(map(str, self.allowed))
        return "a whole number"

    def json_schema(self):
        s: dict = {"type": "integer", "description": self.description}
        if self.allowed:
            s["enum"] = list(self.allowed)
        return s


# C0 and C1 controls other than tab and line ends, and the XML non-characters U+FFFE, U+FFFF
_CONTROL = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\x7f-\x9f\ufffe\uffff]")


@dataclass
class Text(Type):
    """Any scalar, taken as its source text: `revision: 2` is "2", `status: no` is "no"."""

    description: str = ""
    pattern: str | None = None
    pattern_help: str = ""
    choices: tuple[str, ...] = ()
    max_length: int = 100_000

    def check(self, node, path, problems):
        if not isinstance(node, Scalar) or node.is_null:
            problems.error(node.mark, path, f"expected {self.expected()}, found {describe(node)}")
            return INVALID
        v = node.text
        if len(v) > self.max_length:
            problems.error(node.mark, path, f"expected at most {self.max_length} characters, found {len(v)}")
            return INVALID
        bad = _CONTROL.search(v)
        if bad:  # a quoted "\x07" or "\0" escape; such characters also make the SVG diagrams invalid XML
            problems.error(node.mark, path, f"expected text without control characters, found U+{ord(bad.group()):04X} "
                           f"at character {bad.start() + 1}", "remove the escape sequence that writes it")
            return INVALID
        if self.choices and v not in self.choices:
            hint = did_you_mean(v, self.choices)
            if v.lower() in _BOOLISH and node.plain:
                hint = hint or "YAML 1.1 would read this word as a boolean; it is kept as text here"
            problems.error(node.mark, path, f"expected one of {', '.join(self.choices)}, found {v!r}", hint)
            return INVALID
        if self.pattern and not re.fullmatch(self.pattern, v):
            problems.error(node.mark, path, f"expected {self.expected()}, found {_short(v)!r}")
            return INVALID
        return v

    def expected(self) -> str:
        if self.choices:
            return "one of " + ", ".join(self.choices)
        return self.pattern_help or "text"

    def json_schema(self):
        s: dict = {"type": "string", "description": self.description}
        if self.choices:
            s["enum"] = list(self.choices)
        if self.pattern:
            s["pattern"] = f"^(?:{self.pattern})$"
        return s


@dataclass
class Field:
    type: Type
    required: bool = False
    description: str = ""


@dataclass
class Record(Type):
    """A mapping with declared keys; ``extra`` types any further key matching ``extra_key``."""

    fields: dict[str, Field]
    description: str = ""
    extra: Type | None = None
    extra_key: str = r"[A-Za-z][A-Za-z0-9_-]*"
    extra_help: str = ""
    expects: str = ""     # how an error names this mapping; built from the keys when empty

    def check(self, node, path, problems):
        if not isinstance(node, Map):
            problems.error(node.mark, path, f"expected {self.expected()}, found {describe(node)}")
            return INVALID
        out: dict[str, Any] = {}
        ok = True
        for key, child in node.items.items():
            kpath = f"{path}.{key}" if path else key
            f = self.fields.get(key)
            if f is not None:
                if isinstance(child, Scalar) and child.is_null and not f.required:
                    continue
                v = f.type.check(child, kpath, problems)
            elif (self.extra is not None and re.fullmatch(self.extra_key, key)
                  and not (isinstance(child, Map) and _near_miss(key, self.fields))):
                # a free key (a primary's name) that is a near-miss of a declared key and
                # holds a mapping is far likelier a typo ('tolerence') than a new name
                v = self.extra.check(child, kpath, problems)
            else:
                hint = did_you_mean(key, self.fields)
                if not hint:
                    hint = "known keys: " + ", ".join(self.fields)
                    if self.extra_help:
                        hint += f"; {self.extra_help}"
                problems.error(node.key_marks[key], kpath, f"expected a known key, found unknown key '{key}'",
                               hint)
                ok = False
                continue
            if v is INVALID:
                ok = False
            else:
                out[key] = v
        for key, f in self.fields.items():
            if f.required and key not in node.items:
                kpath = f"{path}.{key}" if path else key
                problems.error(node.mark, kpath, f"expected the required key '{key}' "
                               f"({f.type.expected()}), found no such key", f.description)
                ok = False
        return out if ok else INVALID

    def expected(self) -> str:
        if self.expects:
            return self.expects
        req = [k for k, f in self.fields.items() if f.required]
        if len(req) == 1:
            return f"a mapping with the key {req[0]}"
        return f"a mapping with the keys {', '.join(req)}" if req else "a mapping of " + ", ".join(self.fields)

    def json_schema(self):
        props = {}
        for k, f in self.fields.items():
            sub = dict(f.type.json_schema())
            if f.description:
                sub["description"] = f.description
            props[k] = sub
        s: dict = {"type": "object", "description": self.description, "properties": props,
                   "required": [k for k, f in self.fields.items() if f.required]}
        if self.extra is not None:
            s["patternProperties"] = {f"^(?:{self.extra_key})$": self.extra.json_schema()}
        s["additionalProperties"] = False
        if not s["required"]:
            del s["required"]
        return s


@dataclass
class ListOf(Type):
    item: Type
    description: str = ""
    min_items: int = 0
    max_items: int | None = None

    def check(self, node, path, problems):
        if not isinstance(node, Seq):
            problems.error(node.mark, path, f"expected a list, found {describe(node)}")
            return INVALID
        n = len(node.items)
        if n < self.min_items or (self.max_items is not None and n > self.max_items):
            want = (f"exactly {self.min_items}" if self.min_items == self.max_items
                    else f"at least {self.min_items}")
            problems.error(node.mark, path, f"expected a list of {want} items, found {n}")
            return INVALID
        out, ok = [], True
        for i, child in enumerate(node.items):
            v = self.item.check(child, f"{path}[{i}]", problems)
            ok = ok and v is not INVALID
            out.append(v)
        return out if ok else INVALID

    def expected(self) -> str:
        return "a list"

    def json_schema(self):
        s: dict = {"type": "array", "description": self.description, "items": self.item.json_schema()}
        if self.min_items:
            s["minItems"] = self.min_items
        if self.max_items is not None:
            s["maxItems"] = self.max_items
        return s


@dataclass
class Range(Type):
    """An inclusive range, written [low, high] or {min: low, max: high} (either bound optional)."""

    description: str = ""
    bound: Number = field(default_factory=Number)

    def check(self, node, path, problems):
        if isinstance(node, Seq):
            if len(node.items) != 2:
                problems.error(node.mark, path, f"expected [low, high], found a list of {len(node.items)}")
                return INVALID
            lo = self.bound.check(node.items[0], f"{path}[0]", problems)
            hi = self.bound.check(node.items[1], f"{path}[1]", problems)
        elif isinstance(node, Map):
            unknown = [k for k in node.items if k not in ("min", "max")]
            for k in unknown:
                problems.error(node.key_marks[k], f"{path}.{k}", f"expected min or max, found unknown key '{k}'",
                               did_you_mean(k, ("min", "max")))
            if not node.items:
                problems.error(node.mark, path, "expected a range with min or max, found an empty mapping")
                return INVALID
            lo = self.bound.check(node.items["min"], f"{path}.min", problems) if "min" in node.items else None
            hi = self.bound.check(node.items["max"], f"{path}.max", problems) if "max" in node.items else None
            if unknown:
                return INVALID
        else:
            problems.error(node.mark, path, f"expected a range [low, high], found {describe(node)}")
            return INVALID
        if lo is INVALID or hi is INVALID:
            return INVALID
        if lo is not None and hi is not None and lo > hi:
            problems.error(node.mark, path, f"expected low <= high, found [{lo:g}, {hi:g}]",
                           "swap the two bounds")
            return INVALID
        return (lo, hi)

    def expected(self) -> str:
        return "a range [low, high]"

    def json_schema(self):
        b = self.bound.json_schema()
        b.pop("description", None)
        return {"description": self.description, "oneOf": [
            {"type": "array", "items": b, "minItems": 2, "maxItems": 2},
            {"type": "object", "properties": {"min": b, "max": b}, "additionalProperties": False,
             "minProperties": 1}]}


@dataclass
class Custom(Type):
    """A type whose check is a function; used where a value has several written forms."""

    func: Callable[[Node, str, Problems], Any]
    schema: dict
    description: str = ""
    expects: str = "a value"

    def check(self, node, path, problems):
        return self.func(node, path, problems)

    def expected(self) -> str:
        return self.expects

    def json_schema(self):
        return dict(self.schema, description=self.description)
