"""results.json rows of measured units written straight from the assessment's columns.

The same text as encoding ``assess.units.unit_rows`` dicts with ``json.dumps`` (tested),
without building a dict per row: each requirement's fixed parts are encoded once, and
only the serial, value, verdict, margin, uncertainty and lot change from unit to unit.
"""
from __future__ import annotations

import json

import numpy as np

from ..assess.units import UNITS
from ..assess.units import _num as _value     # NaN and infinities as None, as in every unit row
from ..assess.rules import CODES

_FIXED = ("id", "subject", "sample", "quantity", "value", "unit", "limit", "verdict", "margin", "label",
          "uncertainty", "lot")


def _j(v) -> str:
    return json.dumps(v, ensure_ascii=False, allow_nan=False)


def _row_dict(c, i: int, serial: str, lot: str, U) -> dict:
    """The row as assess.units.unit_rows builds it, without its label."""
    if c.rows is not None:
        r = {k: v for k, v in c.rows[i].items() if k != "label"}
    else:
        v = {"dx": float(c.parts["dx"][i]), "dy": float(c.parts["dy"][i])} if c.parts else _value(float(c.value[i]))
        r = {"id": c.id, "subject": c.subject, "sample": serial, "quantity": c.quantity, "value": v,
             "unit": UNITS.get(c.quantity, ""), "limit": c.limit, "verdict": CODES[int(c.code[i])],
             "margin": _value(float(c.margin[i]))}
        r.update(c.extra)
    if U is not None:
        r["uncertainty"] = U[i]
    r["lot"] = lot
    return r


def _column_texts(c, serials, lots, serials_j, lots_j, with_uncertainty: bool) -> list[str | None]:
    """One JSON text per unit (None where the unit was not assessed on this column)."""
    code = c.code.tolist()
    n = len(code)
    U = _broadcast(c.U, n) if with_uncertainty else None
    if c.rows is not None or any(k in _FIXED for k in c.extra):     # rows built one by one: encode them
        return [None if code[i] < 0 else _j(_row_dict(c, i, serials[i], lots[i], U)) for i in range(n)]
    head = f'{{"id": {_j(c.id)}, "subject": {_j(c.subject)}, "sample": '
    mid = f', "quantity": {_j(c.quantity)}, "value": '
    tail = f', "unit": {_j(UNITS.get(c.quantity, ""))}, "limit": {_j(c.limit)}, "verdict": '
    extra = "".join(f", {_j(k)}: {_j(v)}" for k, v in c.extra.items())
    verdicts = [_j(v) for v in CODES]
    if c.parts:
        values = [f'{{"dx": {_j(a)}, "dy": {_j(b)}}}'
                  for a, b in zip(c.parts["dx"].tolist(), c.parts["dy"].tolist(), strict=True)]
    else:
        values = _num_texts(c.value)
    margins = _num_texts(c.margin)
    unc = _texts(U, ', "uncertainty": ') if U is not None else [""] * n
    verdict_of = [v + ', "margin": ' for v in verdicts] + [None]           # code -1: not assessed
    return [None if k < 0 else f"{head}{s}{mid}{v}{tail}{verdict_of[k]}{m}{extra}{u}, \"lot\": {lot}}}"
            for s, v, k, m, u, lot in zip(serials_j, values, code, margins, unc, lots_j, strict=True)]


def _split(text: str, n: int) -> list[str]:
    # the JSON text of a list of n numbers, cut into its items (a number's text has no ", ")
    return text[1:-1].split(", ") if n else []


def _texts(values: list, prefix: str) -> list[str]:
    """``prefix + json.dumps(value)`` of each number, the whole list by the C encoder."""
    return [prefix + t for t in _split(json.dumps(values, allow_nan=False), len(values))]


def _num_texts(arr) -> list[str]:
    """``_num`` of each item of a numeric array: its JSON text, "null" where not finite."""
    texts = _split(json.dumps(arr.tolist(), allow_nan=True), arr.size)
    for i in np.flatnonzero(~np.isfinite(arr)).tolist():
        texts[i] = "null"
    return texts


def _broadcast(U, n: int) -> list:
    return np.broadcast_to(U, (n,)).tolist()


def unit_rows_json(cols: list, table, with_uncertainty: bool) -> list[str]:
    """The JSON text of every unit row, unit by unit, in column order (as assess.units.unit_rows)."""
    memo: dict[str, str] = {}

    def enc(s):
        if s not in memo:
            memo[s] = _j(s)
        return memo[s]

    serials, lots = list(table.serial), list(table.lot)
    serials_j, lots_j = [enc(s) for s in serials], [enc(s) for s in lots]
    per_col = [_column_texts(c, serials, lots, serials_j, lots_j, with_uncertainty) for c in cols]
    return [t for unit in zip(*per_col) for t in unit if t is not None]


_ENTRY_KEYS = ("serial", "lot", "supplier", "verdict", "rows", "failing", "source")


def unit_entry_texts(units: list[dict]) -> list[str]:
    """``json.dumps(entry, ensure_ascii=False)`` of each unit entry (assess.requirements
    .unit_entries: strings, an int and a list of strings, in ``_ENTRY_KEYS`` order), the
    strings by the C string encoder json.dumps uses (tested equal)."""
    enc = json.encoder.encode_basestring
    memo: dict[str, str] = {}

    def e(s: str) -> str:
        t = memo.get(s)
        if t is None:
            t = memo[s] = enc(s)
        return t

    out = []
    for u in units:
        if tuple(u) != _ENTRY_KEYS or type(u["rows"]) is not int or not all(
                type(u[k]) is str for k in ("serial", "lot", "supplier", "verdict", "source")):
            out.append(_j(u))
            continue
        failing = ", ".join(e(f) for f in u["failing"])
        out.append(f'{{"serial": {enc(u["serial"])}, "lot": {e(u["lot"])}, "supplier": {e(u["supplier"])}, '
                   f'"verdict": {e(u["verdict"])}, "rows": {u["rows"]}, "failing": [{failing}], '
                   f'"source": {enc(u["source"])}}}')
    return out
