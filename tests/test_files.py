"""Atomic writes and the marker that lets ranker replace only its own files."""

from __future__ import annotations

import os

import pytest

from ranker.errors import InputError
from ranker.files import HTML_MARKER, check_out_dir, write_all_atomic, written_by_ranker


def test_write_all_atomic_leaves_no_temp(tmp_path):
    a, b = tmp_path / "a.html", tmp_path / "b.html"
    write_all_atomic({a: HTML_MARKER.encode(), b: HTML_MARKER.encode()})
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a.html", "b.html"]
    assert written_by_ranker(a)


def test_foreign_file_is_not_replaced(tmp_path):
    a = tmp_path / "a.html"
    a.write_text("mine")
    with pytest.raises(InputError, match="was not written by ranker"):
        write_all_atomic({a: b"new"})
    assert a.read_text() == "mine"


def test_missing_and_read_only_folders(tmp_path):
    check_out_dir(tmp_path / "nope" / "deeper")  # a folder that can be created is fine
    (tmp_path / "f").write_text("x")
    with pytest.raises(InputError, match="is a file, not a folder"):
        check_out_dir(tmp_path / "f" / "sub")
    ro = tmp_path / "ro"
    ro.mkdir()
    os.chmod(ro, 0o500)
    try:
        if os.access(ro, os.W_OK):  # root ignores permissions
            pytest.skip("running as root: a read-only folder is still writable")
        with pytest.raises(InputError, match="read-only"):
            check_out_dir(ro)
    finally:
        os.chmod(ro, 0o700)
