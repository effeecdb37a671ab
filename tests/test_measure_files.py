"""Which measurement files a spec may name: inside the specs folder only."""
from __future__ import annotations

import os

import pytest

from generator.measure.files import PathRefused, locate, read
from generator.measure.records import ReadError


@pytest.fixture
def tree(tmp_path):
    root = tmp_path / "specs"
    (root / "m").mkdir(parents=True)
    (root / "m" / "lot.csv").write_text("serial,channel,x,y\nS1,white,0.31,0.33\n")
    (tmp_path / "outside.csv").write_text("serial,channel,x,y\nS1,white,0.31,0.33\n")
    return root


def test_a_file_beside_the_spec_is_found(tree):
    assert locate("m/lot.csv", tree, tree) == (tree / "m" / "lot.csv").resolve()
    assert locate("../m/lot.csv", tree / "m", tree) == (tree / "m" / "lot.csv").resolve()


@pytest.mark.parametrize("written,words", [
    ("/etc/passwd", "absolute path"),
    ("../outside.csv", "leading out of it"),
    ("m/none.csv", "found nothing"),
])
def test_paths_that_leave_the_folder_or_lead_nowhere_are_refused(tree, written, words):
    with pytest.raises(PathRefused) as e:
        locate(written, tree, tree)
    assert words in e.value.message


def test_a_symbolic_link_pointing_out_is_refused(tree):
    os.symlink(tree.parent / "outside.csv", tree / "m" / "link.csv")
    with pytest.raises(PathRefused) as e:
        locate("m/link.csv", tree, tree)
    assert "symbolic link" in e.value.message


def test_a_symbolic_link_inside_the_folder_is_followed(tree):
    os.symlink(tree / "m" / "lot.csv", tree / "alias.csv")
    assert locate("alias.csv", tree, tree) == (tree / "m" / "lot.csv").resolve()


def test_unknown_extensions_are_refused(tree):
    (tree / "m" / "lot.xlsx").write_bytes(b"PK")
    with pytest.raises(PathRefused) as e:
        locate("m/lot.xlsx", tree, tree)
    assert ".csv" in e.value.message


def test_read_dispatches_by_extension_and_refuses_non_utf8(tree):
    (r,) = read(tree / "m" / "lot.csv", "m/lot.csv")
    assert r.serial == ["S1"]
    (tree / "m" / "bad.csv").write_bytes(b"serial,channel,x,y\n\xff\n")
    with pytest.raises(ReadError) as e:
        read(tree / "m" / "bad.csv", "m/bad.csv")
    assert "UTF-8" in e.value.message
