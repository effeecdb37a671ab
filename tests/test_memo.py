"""The evaluation memo (generator/memo.py): an incremental build takes unchanged specs'
evaluations from the previous build, evaluates again exactly those an edit can change,
and publishes what a full build publishes."""
from __future__ import annotations

import pickle
from pathlib import Path

import pytest

from generator import cache as C
from generator.build import build

from .test_cache import CHILD, PANEL, files_of

SPECTRUM_SPEC = """\
spec: 1
id: s
title: Spectrum spec
white:
  target: {spectrum: {file: white.csv, channel: white}}
  tolerance: {delta_uv: 0.01}
"""


def _white_csv(scale: float) -> str:
    rows = ["wavelength,white"] + [f"{w},{scale * (1.0 + 0.001 * (w - 380)):.6f}" for w in range(380, 781, 5)]
    return "\n".join(rows) + "\n"


@pytest.fixture
def library(spec_dir, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    spec_dir("a.yaml", PANEL.format(id="a", ref="srgb"))
    spec_dir("b.yaml", PANEL.format(id="b", ref="a"))      # uses spec a as its reference gamut
    spec_dir("c.yaml", CHILD.format(id="c", parent="a"))   # inherits from a
    spec_dir("d.yaml", PANEL.format(id="d", ref="bt2020"))
    return spec_dir


def _memo(out):
    return C.cache_dir_for(out) / "evaluated"


def test_a_second_build_recalls_every_evaluation_and_publishes_the_same_bytes(library, tmp_path, monkeypatch):
    import generator.build as B

    out = tmp_path / "site"
    first = build(library.dir, out)
    before = files_of(out)

    def no_derive(spec):
        raise AssertionError(f"{spec.id} was computed again")

    monkeypatch.setattr(B, "derive", no_derive)
    second = build(library.dir, out)
    assert (first.recalled, second.recalled) == (0, 4)
    assert files_of(out) == before
    assert second.results == first.results


def test_an_edit_evaluates_again_that_spec_its_children_and_the_specs_using_it(library, tmp_path):
    out, full = tmp_path / "site", tmp_path / "full"
    build(library.dir, out)
    p = library.dir / "a.yaml"
    p.write_text(p.read_text().replace("red:   {x: 0.640", "red:   {x: 0.650"))
    inc = build(library.dir, out)
    assert inc.recalled == 1                           # only d: a changed, b uses a, c extends a
    ref = build(library.dir, full, incremental=False)
    assert files_of(out) == files_of(full)
    assert inc.results == ref.results


def test_a_new_spec_file_or_a_changed_measurement_file_evaluates_everything_again(library, tmp_path):
    out = tmp_path / "site"
    build(library.dir, out)
    library("e.yaml", PANEL.format(id="e", ref="srgb"))
    assert build(library.dir, out).recalled == 0
    assert build(library.dir, out).recalled == 5
    (library.dir / "notes.csv").write_text("wavelength,x\n380,1\n")   # any other file under the specs folder
    assert build(library.dir, out).recalled == 0


def test_a_spectra_file_edit_is_seen(spec_dir, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    spec_dir("s.yaml", SPECTRUM_SPEC)
    spec_dir("white.csv", _white_csv(1.0))
    out = tmp_path / "site"
    first = build(spec_dir.dir, out)
    spec_dir("white.csv", _white_csv(1.0).replace("wavelength,white\n380,1.000000", "wavelength,white\n380,9.000000"))
    second = build(spec_dir.dir, out)
    assert second.recalled == 0
    assert second.results["specs"][0]["derived"] != first.results["specs"][0]["derived"]


def test_warnings_of_a_recalled_spec_are_reported_again(spec_dir, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    spec_dir("s.yaml", SPECTRUM_SPEC)
    spec_dir("white.csv", _white_csv(1.0))            # 5 nm: resampled to 1 nm with a warning
    out = tmp_path / "site"
    first = build(spec_dir.dir, out)
    second = build(spec_dir.dir, out)
    assert second.recalled == 1
    assert first.warnings and second.warnings == first.warnings


@pytest.mark.parametrize("damage", [b"", b"not a pickle", pickle.dumps({"format": "other"}),
                                    pickle.dumps({"format": "colourspec-evaluated/1", "closure": {}})])
def test_a_damaged_memo_entry_is_evaluated_again(library, tmp_path, damage):
    out = tmp_path / "site"
    build(library.dir, out)
    before = files_of(out)
    for entry in _memo(out).iterdir():
        entry.write_bytes(damage)
    again = build(library.dir, out)
    assert again.recalled == 0
    assert files_of(out) == before


def test_no_memo_without_incremental_builds_or_for_a_single_file(library, tmp_path):
    out = tmp_path / "site"
    build(library.dir, out, incremental=False)
    assert not _memo(out).exists()
    build(library.dir / "d.yaml", tmp_path / "one")
    assert not _memo(tmp_path / "one").exists()


def test_clean_empties_the_memo(library, tmp_path):
    out = tmp_path / "site"
    build(library.dir, out)
    assert build(library.dir, out, clean=True).recalled == 0
    assert build(library.dir, out).recalled == 4


def test_an_input_error_is_reported_even_when_other_specs_are_recalled(library, tmp_path):
    from generator.spec.problems import InputError

    out = tmp_path / "site"
    build(library.dir, out)
    p = library.dir / "d.yaml"
    p.write_text(p.read_text().replace("min: 90", "min: ninety"))
    with pytest.raises(InputError) as err:
        build(library.dir, out)
    assert any(pr.file.endswith("d.yaml") and "gamut" in pr.path for pr in err.value.problems)


def test_evaluations_kept_by_worker_processes_are_recalled(library, tmp_path, monkeypatch):
    """With --jobs, each worker keeps the evaluations it made; the next build recalls them all."""
    import generator.build as B
    from generator.parallel import can_fork

    if not can_fork():
        pytest.skip("no fork on this platform: the work runs in this process")
    out = tmp_path / "site"
    for k in range(4, 10):                       # enough specs to go to the workers (at least 4)
        library(f"e{k}.yaml", PANEL.format(id=f"e{k}", ref="srgb"))
    first = build(library.dir, out, jobs=2)
    before = files_of(out)
    assert len([p for p in _memo(out).glob("*.pickle") if not p.name.startswith("parsed-")]) == 10

    def no_derive(spec):
        raise AssertionError(f"{spec.id} was computed again")

    monkeypatch.setattr(B, "derive", no_derive)
    second = build(library.dir, out, jobs=2)
    assert (first.recalled, second.recalled) == (0, 10)
    assert files_of(out) == before


def test_spec_files_are_parsed_again_only_when_their_bytes_change(library, tmp_path, monkeypatch):
    """The parses of the spec files are kept beside the memo; a build parses only the files
    whose name or bytes changed, and publishes what a clean build publishes."""
    import generator.spec.load as L

    out, ref = tmp_path / "site", tmp_path / "clean"
    build(library.dir, out)
    parsed = []
    real = L.parse_yaml
    monkeypatch.setattr(L, "parse_yaml", lambda data, shown, *a: parsed.append(shown) or real(data, shown, *a))
    build(library.dir, out)
    assert parsed == []
    (library.dir / "d.yaml").write_text((library.dir / "d.yaml").read_text().replace("title: ", "title: New "))
    build(library.dir, out)
    assert [Path(p).name for p in parsed] == ["d.yaml"]
    build(library.dir, ref, incremental=False)
    assert files_of(out) == files_of(ref)


def test_a_changed_limit_parses_every_file_again(library, tmp_path, monkeypatch):
    out = tmp_path / "site"
    build(library.dir, out)
    monkeypatch.setenv("COLOURSPEC_MAX_BYTES", "60")        # smaller than every spec file: each is refused
    from generator.spec.problems import InputError

    with pytest.raises(InputError) as e:
        build(library.dir, out)
    assert "at most 60 bytes" in e.value.problems[0].message


def test_a_recalled_spec_gets_its_yaml_nodes_from_this_load(library, tmp_path):
    """The memo keeps no YAML nodes; a recalled spec's ``source`` is the merged node the
    loader made this time, with the same keys and positions as a fresh evaluation's."""
    from generator.spec.yamlnodes import Map

    def shape(node):
        if isinstance(node, Map):
            return {k: (node.key_marks[k], shape(v)) for k, v in node.items.items()}
        return (type(node).__name__, node.mark, getattr(node, "text", None))

    out = tmp_path / "site"
    first = {e.spec.id: e.spec for e in build(library.dir, out).evaluated}
    second = build(library.dir, out)
    assert second.recalled == 4
    for e in second.evaluated:
        assert e.spec.source is not None and shape(e.spec.source) == shape(first[e.spec.id].source)
    for p in _memo(out).glob("*.pickle"):
        if not p.name.startswith("parsed-"):
            assert pickle.loads(p.read_bytes())["evaluated"].spec.source is None
