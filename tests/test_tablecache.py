"""Tables kept between processes: the same bits as a fresh build, rebuilt when damaged,
nothing kept when switched off."""
from __future__ import annotations

import subprocess
import sys

import numpy as np
import pytest

from generator import tablecache
from generator.colour import cct


@pytest.fixture
def store(tmp_path, monkeypatch):
    monkeypatch.setenv("COLOURSPEC_CACHE", str(tmp_path / "tables"))
    cct.locus_table.cache_clear()
    yield tmp_path / "tables"
    cct.locus_table.cache_clear()


def _same(a: cct.LocusTable, b: cct.LocusTable):
    for k in ("mired", "uv", "duv_dmired", "coef", "grid_mired", "grid_fast"):
        x, y = getattr(a, k), getattr(b, k)
        assert x.dtype == y.dtype and x.shape == y.shape and np.array_equal(x, y), k
    assert a.grid_origin == b.grid_origin and a.tube == b.tube and a.observer == b.observer


@pytest.mark.parametrize("observer", ["cie1931-2", "cie1964-10"])
def test_a_stored_locus_table_is_the_table_built_afresh_bit_for_bit(store, observer):
    first = cct.locus_table(observer)               # built and stored
    assert len(list(store.glob("planck-locus-*.npz"))) == 1
    cct.locus_table.cache_clear()
    again = cct.locus_table(observer)               # read back
    _same(again, cct.build_locus_table(observer))
    _same(first, again)
    assert not again.coef.flags.writeable


def test_cct_in_a_new_process_reading_the_stored_table_equals_this_process(store, tmp_path):
    uv = np.array([[0.1978, 0.3122], [0.2400, 0.3500], [0.1900, 0.3000]])
    T, duv = cct.cct_duv_from_uv(uv)
    code = ("import numpy as np, sys; from generator.colour.cct import cct_duv_from_uv; "
            "T, d = cct_duv_from_uv(np.array([[0.1978, 0.3122], [0.2400, 0.3500], [0.1900, 0.3000]])); "
            "sys.stdout.write(repr((T.tolist(), d.tolist())))")
    for _ in range(2):                               # the first builds and stores, the second reads
        out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True,
                             env={**__import__("os").environ, "COLOURSPEC_CACHE": str(store)}).stdout
        assert out == repr((T.tolist(), duv.tolist()))
    assert len(list(store.glob("*.npz"))) == 1


def test_a_damaged_stored_table_is_built_again(store):
    cct.locus_table()
    (path,) = store.glob("*.npz")
    path.write_bytes(b"not a zip file")
    cct.locus_table.cache_clear()
    _same(cct.locus_table(), cct.build_locus_table())


def test_switched_off_nothing_is_kept(tmp_path, monkeypatch):
    monkeypatch.setenv("COLOURSPEC_CACHE", "off")
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "xdg"))
    calls = []
    got = tablecache.stored_arrays("t", "k", lambda: calls.append(1) or {"a": np.arange(3)})
    assert calls == [1] and np.array_equal(got["a"], [0, 1, 2])
    assert not (tmp_path / "xdg").exists()


def test_an_unwritable_cache_folder_only_costs_the_build(tmp_path, monkeypatch):
    blocker = tmp_path / "file"
    blocker.write_text("x")
    monkeypatch.setenv("COLOURSPEC_CACHE", str(blocker / "below"))
    got = tablecache.stored_arrays("t", "k", lambda: {"a": np.ones(2)})
    assert np.array_equal(got["a"], [1.0, 1.0])


def test_the_key_and_the_inputs_change_the_file(tmp_path, monkeypatch):
    monkeypatch.setenv("COLOURSPEC_CACHE", str(tmp_path))
    tablecache.stored_arrays("t", "k1", lambda: {"a": np.zeros(1)})
    tablecache.stored_arrays("t", "k2", lambda: {"a": np.ones(1)})
    assert len(list(tmp_path.glob("t-*.npz"))) == 2
    assert tablecache.stored_arrays("t", "k2", lambda: {"a": np.full(1, 7.0)})["a"][0] == 1.0


def test_a_reference_space_volume_read_back_is_the_computed_volume(store):
    from generator import derive
    from generator.colour.npm import npm_from_primaries
    from generator.colour.volume import lab_gamut_volume

    prim, white = ((0.64, 0.33), (0.30, 0.60), (0.15, 0.06)), (0.3127, 0.3290)  # BT.709 / sRGB primaries, D65
    derive._reference_volume.cache_clear()
    first = derive._reference_volume(prim, white)
    derive._reference_volume.cache_clear()
    again = derive._reference_volume(prim, white)
    assert first == again
    assert again[0] == lab_gamut_volume(npm_from_primaries(list(prim), white))
    assert len(list(store.glob("lab-volume-*.npz"))) == 1


def test_compiled_templates_are_kept_and_a_damaged_one_is_compiled_again(store):
    from generator.render.pages import environment

    def fresh():            # a new environment, as in a new process (environment() is one per process)
        environment.cache_clear()
        return environment()

    ctx = {"root": "", "canonical": "", "reload": False}
    try:
        first = fresh().get_template("base.html").render(**ctx)
        kept = list((store / "templates").iterdir())
        assert kept
        assert fresh().get_template("base.html").render(**ctx) == first
        for p in kept:
            p.write_bytes(b"j2\x00 damaged")
        assert fresh().get_template("base.html").render(**ctx) == first
    finally:
        environment.cache_clear()


def test_without_a_home_folder_nothing_is_kept(tmp_path, monkeypatch):
    monkeypatch.delenv("COLOURSPEC_CACHE", raising=False)
    monkeypatch.delenv("XDG_CACHE_HOME", raising=False)
    monkeypatch.setattr(tablecache.os.path, "expanduser", lambda p: p)     # as when HOME cannot be found
    monkeypatch.chdir(tmp_path)
    assert tablecache.cache_root() is None
    assert np.array_equal(tablecache.stored_arrays("t", "k", lambda: {"a": np.ones(1)})["a"], [1.0])
    assert list(tmp_path.iterdir()) == []                                 # no "~" folder in the working folder


def test_an_atomic_write_that_fails_leaves_the_old_file_and_nothing_else(tmp_path):
    target = tmp_path / "sub" / "t.bin"
    tablecache.write_atomically(target, lambda f: f.write(b"old"))

    def fail(f):
        f.write(b"half")
        raise ValueError("cannot encode")

    with pytest.raises(ValueError):
        tablecache.write_atomically(target, fail)
    assert target.read_bytes() == b"old" and [p.name for p in target.parent.iterdir()] == ["t.bin"]
