"""Grouping records into units: merging across files, duplicates, channels, points."""
from __future__ import annotations

import numpy as np

from generator.measure.csvfile import parse_csv
from generator.measure.units import group


def _ok(x, y):
    z = np.zeros(len(x), bool)
    return z, z, lambda i: "bad"


def _group(*texts, centre="C"):
    parts = [parse_csv(t, f"f{i}.csv") for i, t in enumerate(texts)]
    return group(parts, ["white", "red"], centre, _ok)


H = "serial,lot,channel,point,x,y,Y\n"


def test_records_of_one_serial_in_two_files_make_one_unit_in_first_seen_order():
    t, errors, _ = _group(H + "B,L,white,,0.31,0.33,100\nA,L,white,,0.30,0.32,90\n", H + "B,L,red,,0.64,0.33,20\n")
    assert errors == []
    assert t.serial == ["B", "A"] and t.source == ["f0.csv:2", "f0.csv:3"]
    assert list(t.channels["red"][0]) == [0.64, 0.33, 20.0]
    assert np.all(np.isnan(t.channels["red"][1]))
    assert list(t.measured("white")) == [True, True]


def test_a_repeated_unit_channel_and_point_is_an_error_naming_both_lines():
    _, errors, _ = _group(H + "A,L,white,,0.31,0.33,1\n", H + "A,L,white,,0.31,0.33,1\n")
    (e,) = errors
    assert (e.file, e.line, e.field) == ("f1.csv", 2, "serial") and "first at line 2" in e.message


def test_unknown_channel_and_conflicting_lot_are_errors():
    _, errors, _ = _group(H + "A,L1,white,,0.31,0.33,1\nA,L2,red,,0.6,0.3,1\nA,L1,blu,,0.15,0.06,1\n")
    fields = sorted((e.line, e.field) for e in errors)
    assert fields == [(3, "lot"), (4, "channel")]


def test_grid_points_fill_the_points_array_and_the_centre_is_the_white():
    t, errors, _ = _group(H + "A,L,white,C,0.31,0.33,100\nA,L,white,TL,0.312,0.331,90\n"
                          "B,L,white,TL,0.3,0.3,80\n")
    assert t.point_names == ("C", "TL")
    assert list(t.channels["white"][0]) == [0.31, 0.33, 100.0]
    assert t.points[0, 1, 2] == 90.0 and np.isnan(t.points[1, 0, 0])
    (e,) = errors   # unit B has points but no centre
    assert e.field == "point" and e.line == 4


def test_physical_check_errors_and_warnings_are_reported_by_record():
    def check(x, y):
        return x > 0.5, y > 0.32, lambda i: f"record {i}"
    parts = [parse_csv(H + "A,L,white,,0.31,0.33,1\nA,L,red,,0.64,0.33,1\n", "f.csv")]
    _, errors, warnings = group(parts, ["white", "red"], "C", check)
    assert [(e.line, e.message) for e in errors] == [(3, "record 1")]
    assert [(w.line, w.message) for w in warnings] == [(2, "record 0")]


def test_many_problems_of_one_kind_are_summarised():
    rows = "".join(f"S{i},L,green,,0.3,0.6,1\n" for i in range(12))
    _, errors, _ = _group(H + rows)
    assert len(errors) == 6 and "and 7 more" in errors[-1].message
