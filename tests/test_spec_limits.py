"""Resource limits: oversized files, too many values, alias bombs and deep nesting are
refused with a positioned problem before the document is built in memory; the limits
come from COLOURSPEC_MAX_* variables. (Speed and memory figures: bench/limits.py.)"""
from __future__ import annotations

import tracemalloc

import pytest
import yaml

from generator.cli import main
from generator.spec import yamlnodes
from generator.spec.limits import DEFAULTS, Limits, LimitsError, limits
from generator.spec.problems import Problems


def parse(text: str, lim: Limits | None = None):
    problems = Problems()
    node = yamlnodes.parse_yaml(text.encode(), "s.yaml", problems, lim)
    return node, [p.format() for p in problems.items]


def test_defaults_without_variables():
    assert limits({}) == Limits(8 * 1024 * 1024, 50_000, 64) == DEFAULTS


def test_each_variable_overrides_its_limit():
    env = {"COLOURSPEC_MAX_BYTES": "1000", "COLOURSPEC_MAX_NODES": "1_000", "COLOURSPEC_MAX_DEPTH": " 8 "}
    assert limits(env) == Limits(1000, 1000, 8)
    assert limits({"COLOURSPEC_MAX_DEPTH": ""}) == DEFAULTS


@pytest.mark.parametrize("var, raw, lo, hi", [
    ("COLOURSPEC_MAX_BYTES", "8MB", 1, 2**31),
    ("COLOURSPEC_MAX_BYTES", "0", 1, 2**31),
    ("COLOURSPEC_MAX_NODES", "-5", 1, 10**8),
    ("COLOURSPEC_MAX_NODES", "1e6", 1, 10**8),
    ("COLOURSPEC_MAX_DEPTH", "201", 1, 200),
    ("COLOURSPEC_MAX_DEPTH", "٣", 1, 200),
])
def test_a_setting_out_of_range_is_refused(var, raw, lo, hi):
    with pytest.raises(LimitsError) as e:
        limits({var: raw})
    assert str(e.value) == f"{var}: expected a whole number from {lo} to {hi}, found {raw!r}"


def test_cli_reports_a_bad_setting_as_a_usage_error(monkeypatch, capsys, tmp_path):
    monkeypatch.setenv("COLOURSPEC_MAX_DEPTH", "deep")
    assert main(["check", str(tmp_path)]) == 2
    assert capsys.readouterr().err == ("colourspec: COLOURSPEC_MAX_DEPTH: expected a whole number from 1 to 200, "
                                       "found 'deep'\n")


def write_spec(tmp_path, name: str, data: bytes):
    (tmp_path / "specs").mkdir(exist_ok=True)
    (tmp_path / "specs" / name).write_bytes(data)


def check_problems(tmp_path, monkeypatch, capsys) -> tuple[int, list[str]]:
    monkeypatch.chdir(tmp_path)
    status = main(["check", "specs"])
    err = capsys.readouterr().err
    assert "Traceback" not in err
    return status, [line for line in err.splitlines() if line.startswith("specs/")]


def test_file_over_the_byte_limit_is_refused(tmp_path, monkeypatch, capsys):
    monkeypatch.setenv("COLOURSPEC_MAX_BYTES", "100")
    write_spec(tmp_path, "s.yaml", b"spec: 1\nid: big\ntitle: " + b"x" * 200 + b"\n")
    assert check_problems(tmp_path, monkeypatch, capsys) == (
        2, ["specs/s.yaml:1:1: expected a file of at most 100 bytes, found 224 bytes"])


def test_huge_file_is_refused_without_being_read(tmp_path, monkeypatch, capsys):
    (tmp_path / "specs").mkdir()
    with open(tmp_path / "specs" / "huge.yaml", "wb") as f:
        f.truncate(64 * 1024**3)  # sparse: 64 GiB that take no disk, and would not fit in memory
    assert check_problems(tmp_path, monkeypatch, capsys) == (
        2, [f"specs/huge.yaml:1:1: expected a file of at most {DEFAULTS.max_bytes} bytes, found {64 * 1024**3} bytes"])


def test_parse_yaml_refuses_oversized_bytes_given_directly():
    _, errors = parse("a: 12345\n", Limits(max_bytes=5))
    assert errors == ["s.yaml:1:1: expected a file of at most 5 bytes, found 9 bytes\n"
                      "    hint: split the file, or set COLOURSPEC_MAX_BYTES to allow more"]


def test_too_many_values_are_refused_where_the_limit_is_passed(tmp_path, monkeypatch, capsys):
    monkeypatch.setenv("COLOURSPEC_MAX_NODES", "10")
    # mapping, 2 keys + 2 values, 'family' key, list, 4 items: the 11th value is the 4th item
    write_spec(tmp_path, "s.yaml", b"spec: 1\nid: many\nfamily: [a, b, c, d]\n")
    assert check_problems(tmp_path, monkeypatch, capsys) == (
        2, ["specs/s.yaml:3:19: expected at most 10 values, found more"])


def test_too_many_values_are_refused_before_any_node_is_built(monkeypatch):
    def no_compose(*a, **k):
        raise AssertionError("composed a document that the event scan should have refused")

    monkeypatch.setattr(yaml, "compose_all", no_compose)
    text = "a: [" + ", ".join(["0"] * (DEFAULTS.max_nodes + 10)) + "]\n"
    node, errors = parse(text)
    assert node is None
    # root map, key 'a' and the list are values 1-3; item k is value 3 + k, at column 5 + 3 (k - 1)
    col = 5 + 3 * (DEFAULTS.max_nodes + 1 - 3 - 1)
    assert errors == [f"s.yaml:1:{col}: expected at most {DEFAULTS.max_nodes} values, found more\n"
                      "    hint: a spec needs a few hundred values; set COLOURSPEC_MAX_NODES to allow more"]


def test_a_file_of_the_largest_allowed_size_of_tiny_values_is_refused_in_bounded_memory():
    text = "[" + "0," * (DEFAULTS.max_bytes // 2 - 2) + "]\n"  # just under the byte limit; 4 million values
    tracemalloc.start()
    try:
        node, errors = parse(text)
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    assert node is None and "values, found more" in errors[0]
    assert peak < 64 * 1024**2  # composing it would take gigabytes of node objects


def test_alias_bomb_against_a_lower_node_limit():
    text = "a: &a [x, x, x]\nb: &b [*a, *a, *a]\nc: [*b, *b]\n"  # a: 4 values, b: 1 + 3 * 4, c: 1 + 2 * 13
    node, errors = parse(text, Limits(max_nodes=20))
    assert node is None
    assert errors == ["s.yaml:3:4: expected at most 20 values once aliases are expanded, found more\n"
                      "    hint: YAML aliases that expand this far are refused"]
    assert parse(text, Limits(max_nodes=48))[1] == []  # the whole document: 1 + 3 keys + 4 + 13 + 27


def test_nesting_limit_from_the_environment(tmp_path, monkeypatch, capsys):
    monkeypatch.setenv("COLOURSPEC_MAX_DEPTH", "2")
    write_spec(tmp_path, "s.yaml", b"spec: 1\nid: deep\nwhite:\n  tolerance: {cct: [6000, 7000]}\n")
    assert check_problems(tmp_path, monkeypatch, capsys) == (
        2, ["specs/s.yaml:4:15: expected at most 2 levels of nesting, found more"])  # the key 'cct', a value at depth 3


def test_nesting_at_the_limit_is_accepted():
    assert parse("a: [[1]]\n", Limits(max_depth=3))[1] == []
    assert parse("a: [[1]]\n", Limits(max_depth=2))[1][0].startswith("s.yaml:1:6: expected at most 2 levels")


def test_many_small_documents_count_together():
    node, errors = parse("---\n[1, 2]\n---\n[3, 4]\n---\n[5, 6]\n", Limits(max_nodes=7))
    assert node is None
    assert errors[0].startswith("s.yaml:6:2: expected at most 7 values, found more")
