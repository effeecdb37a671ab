"""Where in the source a requirement row was set: a row id and sample -> a Mark.

Rows are located in the merged node of their spec, so a limit a child inherited
points at the parent's file, where the limit is written.
"""
from __future__ import annotations

from .yamlnodes import Map, Mark, Scalar, Seq


def _text(node) -> str:
    return node.text if isinstance(node, Scalar) else ""


def _find_item(seq: Seq, key: str, value: str):
    for item in seq.items:
        if isinstance(item, Map) and _text(item.items.get(key)) == value:
            return item
    return None


def _descend(node: Map, parts: list[str], best: Mark) -> Mark:
    """Follow the key path as far as it goes; a missing key is looked up under 'tolerance'
    (a primary's own tolerance, then the default tolerance of every primary)."""
    for part in parts:
        if not isinstance(node, Map):
            return best
        if part in node.items:
            best, node = node.key_marks[part], node.items[part]
            continue
        tol = node.items.get("tolerance")
        if isinstance(tol, Map) and part in tol.items:
            return tol.key_marks[part]
        if isinstance(tol, Map):
            return node.key_marks.get("tolerance", best)
        return best
    return best


def _named_limit(root: Map, section: str, name: str, key: str) -> Mark:
    """A limit of a named primary or colour: its own tolerance, then the section's default
    tolerance, then the entry itself, then the section."""
    sec = root.items.get(section)
    if isinstance(sec, Map):
        own = sec.items.get(name)
        if isinstance(own, Map) and isinstance(own.items.get("tolerance"), Map) \
                and key in own.items["tolerance"].items:
            return own.items["tolerance"].key_marks[key]
        tol = sec.items.get("tolerance")
        if isinstance(tol, Map) and key in tol.items:
            return tol.key_marks[key]
        if name in sec.items:
            return sec.key_marks[name]
    return root.key_marks.get(section, root.mark)


def _gamut_item(gam: Seq, reference: str, metric: str):
    """The gamut row with this reference and metric (coverage when none is written), else the
    first with this reference."""
    same = [item for item in gam.items if isinstance(item, Map) and _text(item.items.get("reference")) == reference]
    for item in same:
        if (_text(item.items.get("metric")) or "coverage") == metric:
            return item
    return same[0] if same else None


def unit_files(spec) -> dict[str, int]:
    """Serial -> index of the ``measurements:`` entry whose file a unit came from (units
    written inline under ``units:`` are not listed)."""
    t = getattr(spec, "table", None)
    if t is None or not spec.measurements:
        return {}
    index = {name: i for i, name in enumerate(spec.measurements)}
    out = {}
    for serial, src in zip(t.serial, t.source, strict=True):
        i = index.get(src.rsplit(":", 1)[0])
        if i is not None:
            out.setdefault(serial, i)
    return out


def locate_row(root: Map | None, row: dict, files: dict[str, int] | None = None) -> Mark | None:
    """The mark of the spec key that set this row's limit (or of the measured unit). A unit
    read from a measurement file is located at its ``measurements:`` entry (``files``, from
    ``unit_files``), or at the ``measurements:`` key when the entry is not known."""
    if not isinstance(root, Map):
        return None
    parts = row["id"].split(".")
    if row.get("sample"):
        units = root.items.get("units")
        unit = _find_item(units, "serial", row["sample"]) if isinstance(units, Seq) else None
        if unit is None:
            meas = root.items.get("measurements")
            i = (files or {}).get(row["sample"])
            if isinstance(meas, Seq) and i is not None and i < len(meas.items):
                return meas.items[i].mark
            return root.key_marks.get("measurements", root.mark)
        if parts[0] == "colours" and len(parts) > 1:   # units carry measured colours by name
            cols = unit.items.get("colours")
            if isinstance(cols, Map) and parts[1] in cols.items:
                return cols.key_marks[parts[1]]
            return unit.key_marks.get("colours", unit.mark)
        subject = parts[1] if parts[0] == "primaries" else parts[0]
        return unit.key_marks.get(subject, unit.mark) if subject in unit.items else unit.mark
    if parts[0] == "gamut":
        gam = root.items.get("gamut")
        item = _gamut_item(gam, parts[1], parts[2] if len(parts) > 2 else "coverage") \
            if isinstance(gam, Seq) and len(parts) > 1 else None
        if item is None:
            return root.key_marks.get("gamut", root.mark)
        return item.key_marks.get("min", item.mark) if "min" in item.items else item.key_marks.get("max", item.mark)
    if parts[0] in ("primaries", "colours") and len(parts) == 3:
        return _named_limit(root, parts[0], parts[1], parts[2])
    return _descend(root, parts, root.mark)
