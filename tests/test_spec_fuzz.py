"""Property tests: whatever bytes or spec-like YAML the loader is given, it either returns
specs or raises the tool's own InputError, and `colourspec check` never prints a traceback."""
from __future__ import annotations

import contextlib
import io
import re
import tempfile
from pathlib import Path

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from generator.cli import main
from generator.spec.load import load_specs
from generator.spec.problems import InputError, Problems
from generator.spec.yamlnodes import Map, Scalar, Seq, parse_yaml

FUZZ = settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])

YAML_ALPHABET = " \t\n\r:-[]{}&*!|>'\"#%@`,?~0123456789abcdexyznoes.+_\\\x00\x01\u00e9\ufeff"

BASE = """\
spec: 1
id: orbit-base
white: {target: D65, tolerance: {delta_uv: 0.004}}
primaries:
  red: {x: 0.64, y: 0.33}
  green: {x: 0.30, y: 0.60}
  blue: {x: 0.15, y: 0.06}
"""


def load_files(files: dict[str, bytes]):
    """Load a folder holding ``files``; returns the specs or the InputError raised."""
    with tempfile.TemporaryDirectory() as d:
        for name, data in files.items():
            (Path(d) / name).write_bytes(data)
        try:
            return load_specs(Path(d))
        except InputError as e:
            return e


def check_files(files: dict[str, bytes]) -> tuple[int, str]:
    with tempfile.TemporaryDirectory() as d:
        for name, data in files.items():
            (Path(d) / name).write_bytes(data)
        err = io.StringIO()
        with contextlib.redirect_stderr(err), contextlib.redirect_stdout(io.StringIO()):
            status = main(["check", d])
        return status, err.getvalue()


# ---- spec-like documents: the real keys with good, bad and tricky values -------------

NUMBER_TOKENS = ["0", "1", "0.3", "0.33", ".5", "5e-3", "1e-3", "-0.01", "1e400", "-1e400", ".nan", ".inf",
                 "-.inf", "'0.3'", "010", "0x10", "1_000", "no", "~", "6500", "100001", "1:20", "0,3"]
number = st.one_of(st.sampled_from(NUMBER_TOKENS),
                   st.floats(-0.2, 1.2, allow_nan=False).map(lambda v: f"{v:.4f}"),
                   st.floats(-1e6, 1e6, allow_nan=False).map(repr))
text = st.sampled_from(["D65", "D66", "E", "DCI", "no", "yes", "on", "~", "''", "released", "draft", "x y",
                        "orbit-base", "Orbit", "1", "010"])


def flow_map(fields: dict) -> st.SearchStrategy[str]:
    """A flow mapping {k: v, ...} of a random subset of ``fields`` (key -> value strategy)."""
    keys = st.lists(st.sampled_from(sorted(fields)), unique=True, max_size=len(fields))
    return keys.flatmap(lambda ks: st.tuples(*[fields[k] for k in ks]).map(
        lambda vs, ks=ks: "{" + ", ".join(f"{k}: {v}" for k, v in zip(ks, vs, strict=True)) + "}"))


def flow_list(item: st.SearchStrategy[str], max_size: int = 3) -> st.SearchStrategy[str]:
    return st.lists(item, max_size=max_size).map(lambda xs: "[" + ", ".join(xs) + "]")


chromaticity = st.one_of(flow_map({"x": number, "y": number}),
                         flow_map({"u_prime": number, "v_prime": number}),
                         flow_map({"cct": number, "duv": number}),
                         flow_map({"X": number, "Y": number, "Z": number, "x": number}),
                         text, flow_list(number))
rng = st.one_of(flow_list(number, 3), flow_map({"min": number, "max": number, "mx": number}), number)
tolerance = flow_map({"delta_uv": number, "cct": rng, "duv": rng, "tolerence": number,
                      "box": flow_map({"dx": number, "dy": number}),
                      "ellipse": flow_map({"a": number, "b": number, "angle": number}),
                      "region": flow_list(flow_list(number, 2), 4)})
white = flow_map({"target": chromaticity, "tolerance": tolerance,
                  "luminance": flow_map({"min": number, "max": number, "target": number})})
primary = st.one_of(chromaticity, flow_map({"x": number, "y": number, "tolerance": tolerance}))
primaries = flow_map({"red": primary, "green": primary, "blue": primary, "cyan": primary,
                      "tolerance": tolerance, "Red 2": primary})
gamut_row = flow_map({"reference": st.sampled_from(["srgb", "bt2020", "dci-p3", "orbit-base", "bt2021", "Srgb"]),
                      "metric": st.sampled_from(["coverage", "area-ratio", "volume"]),
                      "diagram": st.sampled_from(["xy", "uv", "lab"]), "min": number, "max": number})
unit = flow_map({"serial": st.sampled_from(["S1", "S2", "~"]), "white": chromaticity,
                 "red": chromaticity, "green": chromaticity, "rde": chromaticity, "lot": text})
TOP = {"spec": st.sampled_from(["1", "2", "'1'", "1.0"]), "id": st.sampled_from(["orbit-24", "Orbit", "~"]),
       "extends": st.sampled_from(["orbit-base", "orbit-24", "nope"]), "status": text, "revision": text,
       "observer": st.sampled_from(["cie1931-2", "cie1964-10", "cie2006"]), "white": white,
       "primaries": primaries, "gamut": flow_list(gamut_row), "units": flow_list(unit), "tittle": text}


@st.composite
def spec_documents(draw) -> str:
    keys = draw(st.lists(st.sampled_from(sorted(TOP)), unique=True, max_size=len(TOP)))
    keys = sorted(set(keys) | {"spec", "id"}) if draw(st.booleans()) else keys
    lines = [f"{k}: {draw(TOP[k])}" for k in keys]
    if lines and draw(st.booleans()):
        lines.append(draw(st.sampled_from(lines)))  # a duplicate key
    return "\n".join(lines) + "\n"


def _xy(xr: tuple[float, float], yr: tuple[float, float]) -> st.SearchStrategy[str]:
    coord = lambda r: st.floats(*r).map(lambda v: f"{v:.4f}")  # noqa: E731
    return st.tuples(coord(xr), coord(yr)).map(lambda p: f"{{x: {p[0]}, y: {p[1]}}}")


RED, GREEN, BLUE = _xy((0.60, 0.66), (0.30, 0.33)), _xy((0.20, 0.30), (0.55, 0.68)), _xy((0.145, 0.16), (0.05, 0.08))
good_tolerance = st.sampled_from(["{delta_uv: 0.004}", "{box: {dx: 0.01, dy: 0.01}}", "{ellipse: {a: 0.01, "
                                  "b: 0.005, angle: 30}}", "{delta_uv: 0.01, region: [[0.6, 0.3], [0.7, 0.3], "
                                  "[0.65, 0.35]]}"])
good_white_tolerance = st.sampled_from(["{delta_uv: 0.004, cct: [6300, 6800], duv: [-0.003, 0.003]}",
                                        "{cct: {min: 6000}}", "{}", "{duv: {max: 0.01}}"])


@st.composite
def nearly_valid_specs(draw) -> str:
    """A plausible, usually valid spec; sometimes one number swapped for a tricky token."""
    target = draw(st.one_of(st.sampled_from(["D65", "D50", "E", "DCI", "{cct: 6500, duv: 0.002}",
                                             "{u_prime: 0.1978, v_prime: 0.4683}"]),
                            _xy((0.28, 0.34), (0.29, 0.36))))
    lines = ["spec: 1", "id: orbit-24", "extends: orbit-base" if draw(st.booleans()) else "title: Orbit 24",
             "white:", f"  target: {target}", f"  tolerance: {draw(good_white_tolerance)}",
             f"  luminance: {{min: {draw(st.integers(0, 400))}}}", "primaries:",
             f"  red: {draw(RED)}", f"  green: {draw(GREEN)}", f"  blue: {draw(BLUE)}",
             f"  tolerance: {draw(good_tolerance)}", "gamut:"]
    for ref in draw(st.lists(st.sampled_from(["srgb", "bt2020", "dci-p3", "orbit-base", "adobe-rgb-1998"]),
                             min_size=1, max_size=3)):
        metric = draw(st.sampled_from(["coverage", "area-ratio"]))
        lines.append(f"  - {{reference: {ref}, metric: {metric}, diagram: {draw(st.sampled_from(['xy', 'uv']))}, "
                     f"min: {draw(st.integers(0, 150))}}}")
    lines.append("units:")
    for i in range(draw(st.integers(0, 3))):
        lines += [f"  - serial: S{i}", f"    white: {{x: 0.313, y: 0.329, Y: {draw(st.integers(0, 400))}}}",
                  f"    red: {draw(RED)}", f"    green: {draw(GREEN)}", f"    blue: {draw(BLUE)}"]
    doc = "\n".join(lines) + "\n"
    numbers = list(re.finditer(r"(?<=: )-?[0-9.]+(?=[,}\n])", doc))
    if numbers and draw(st.booleans()):
        m = draw(st.sampled_from(numbers))
        doc = doc[:m.start()] + draw(st.sampled_from(NUMBER_TOKENS)) + doc[m.end():]
    return doc


# ---- the properties -----------------------------------------------------------------


def _walk(node):
    yield node
    if isinstance(node, Map):
        for child in node.items.values():
            yield from _walk(child)
    elif isinstance(node, Seq):
        for child in node.items:
            yield from _walk(child)


@FUZZ
@given(st.one_of(st.binary(max_size=300), st.text(YAML_ALPHABET, max_size=300).map(lambda t: t.encode())))
def test_random_bytes_give_nodes_or_positioned_problems(data):
    problems = Problems()
    node = parse_yaml(data, "f.yaml", problems)
    if node is None:
        assert problems.errors
    for p in problems.items:
        assert p.line >= 1 and p.col >= 1 and p.file == "f.yaml"
    if node is not None:
        assert all(isinstance(n, (Map, Seq, Scalar)) for n in _walk(node))


@FUZZ
@given(st.one_of(st.binary(max_size=300), st.text(YAML_ALPHABET, max_size=300).map(lambda t: t.encode())))
def test_random_bytes_never_raise_anything_but_input_error(data):
    result = load_files({"s.yaml": data})
    assert isinstance(result, (tuple, InputError))


@FUZZ
@given(st.one_of(spec_documents(), nearly_valid_specs()), st.booleans())
def test_random_spec_documents_load_or_raise_input_error(doc, with_parent):
    files = {"s.yaml": doc.encode()}
    if with_parent:
        files["base.yaml"] = BASE.encode()
    result = load_files(files)
    if isinstance(result, InputError):
        assert result.problems and all(p.format().count(":") >= 3 for p in result.problems)
    else:
        specs, _ = result
        assert all(s.id for s in specs)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.one_of(spec_documents(), nearly_valid_specs()))
def test_check_never_prints_a_traceback(doc):
    status, err = check_files({"s.yaml": doc.encode(), "base.yaml": BASE.encode()})
    assert "Traceback" not in err, err
    assert status in (0, 1, 2), err
