"""Atomic writes and the marker that lets ranker replace only its own files."""

from __future__ import annotations

import errno
import os

import pytest

from ranker import files
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


def _fail_on(monkeypatch, owner, name, error, *, call):
    """Make ``owner.name`` raise ``error`` on its ``call``-th use only."""
    original = getattr(owner, name)
    seen = {"n": 0}

    def failing(*args, **kwargs):
        seen["n"] += 1
        if seen["n"] == call:
            raise error
        return original(*args, **kwargs)

    monkeypatch.setattr(owner, name, failing)


def test_a_second_failure_while_putting_an_output_back_keeps_its_hidden_copy(
    tmp_path, monkeypatch
):
    """The second move fails, and so does moving the first output back: the old first
    output is kept under its hidden name rather than lost, and the new one stays."""
    a, b = tmp_path / "a.html", tmp_path / "b.html"
    a.write_bytes(HTML_MARKER.encode() + b"old a")
    _fail_on(monkeypatch, os, "replace", PermissionError(errno.EACCES, "denied"), call=2)
    _fail_on(monkeypatch, os.path, "samefile", OSError(errno.EIO, "I/O error"), call=1)
    with pytest.raises(InputError, match="cannot write here") as err:
        write_all_atomic({a: HTML_MARKER.encode() + b"new a", b: HTML_MARKER.encode() + b"b"})
    assert err.value.problems[0].where == str(b)
    (bak,) = [p for p in tmp_path.iterdir() if p.name.startswith(".a.html.")]
    assert bak.name.endswith(".bak") and bak.read_bytes().endswith(b"old a")
    assert a.read_bytes().endswith(b"new a")
    assert sorted(p.name for p in tmp_path.iterdir()) == [bak.name, "a.html"]


def test_undo_of_an_output_kept_aside_but_not_yet_moved(tmp_path):
    """A signal between keeping an output aside and moving the new file: the output is
    still in place, so only its hidden copy and the temporary files are removed."""
    a = tmp_path / "a.html"
    a.write_bytes(b"old")
    batch = files._Batch(0o644)
    batch.write_aside(a, b"new")
    batch.backups[a] = files._keep_aside(a)
    batch.undo()
    assert [p.name for p in tmp_path.iterdir()] == ["a.html"]
    assert a.read_bytes() == b"old"


def test_a_new_output_is_removed_when_a_later_one_fails(tmp_path, monkeypatch):
    a, b = tmp_path / "a.html", tmp_path / "b.html"
    _fail_on(monkeypatch, os, "replace", OSError(errno.ENOSPC, "full"), call=2)
    with pytest.raises(InputError, match="the disk is full"):
        write_all_atomic({a: b"a", b: b"b"})
    assert list(tmp_path.iterdir()) == []
