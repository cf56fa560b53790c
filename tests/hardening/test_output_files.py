"""Output files: missing, read-only and full folders; foreign files; replacing our own.

Read-only and full disks are real where the machine lets a test mount a small
``tmpfs`` (root ignores file modes, so ``chmod`` cannot stand in); everywhere
the failing system calls are also simulated (``PermissionError(EACCES)``,
``OSError(ENOSPC)``) at each step of the atomic write. Whatever fails, the
input stays byte-identical, no temporary file is left, and the outputs are
either all new or all as they were.
"""

from __future__ import annotations

import errno
import os
import shutil
import subprocess
import tempfile
from contextlib import contextmanager
from pathlib import Path

import pytest
from openpyxl import Workbook

import ranker.files as files

from ._cli import assert_no_output, assert_refused, listing, run, sha256
from .cases import direct

OUTPUTS = ["input-ranked.html", "input-ranked.xlsx"]


@pytest.fixture
def workbook(tmp_path) -> Path:
    src = tmp_path / "src"
    src.mkdir()
    return direct(src)[0]


@pytest.fixture
def out(tmp_path) -> Path:
    folder = tmp_path / "out"
    folder.mkdir()
    return folder


def _run(path, out, *extra):
    return run("run", path, "--samples", "0", "--quiet", "--out", out, *extra)


def test_missing_output_folder_is_created(workbook, tmp_path):
    digest = sha256(workbook)
    outcome = _run(workbook, tmp_path / "new" / "deeper")
    assert outcome.code == 0, outcome.err
    assert listing(tmp_path / "new" / "deeper") == OUTPUTS
    assert sha256(workbook) == digest


def test_a_file_where_the_output_folder_should_be(workbook, tmp_path):
    (tmp_path / "plain.txt").write_text("x")
    digest = sha256(workbook)
    outcome = _run(workbook, tmp_path / "plain.txt" / "sub")
    assert_refused(outcome, "plain.txt")
    assert "is a file, not a folder" in outcome.err
    assert sha256(workbook) == digest


def test_a_failed_input_creates_no_output_folder(tmp_path):
    bad = tmp_path / "bad.xlsx"
    bad.write_bytes(b"not a workbook")
    outcome = _run(bad, tmp_path / "never")
    assert outcome.code == 2
    assert not (tmp_path / "never").exists()


def test_outputs_are_readable_by_others_as_the_umask_allows(workbook, out):
    """Temporary files are created 0600; the outputs get the usual 0666 less the umask."""
    old = os.umask(0o022)
    try:
        assert _run(workbook, out).code == 0
    finally:
        os.umask(old)
    assert listing(out) == OUTPUTS
    for name in OUTPUTS:
        assert (out / name).stat().st_mode & 0o777 == 0o644


# --- real read-only and full file systems -----------------------------------------------


@contextmanager
def tmpfs(where: Path, size: str):
    """Mount a small tmpfs at ``where`` for the block; skip where mounting is not allowed."""
    if shutil.which("mount") is None or os.geteuid() != 0:
        pytest.skip("mounting a tmpfs needs root and mount(8)")
    where.mkdir()
    done = subprocess.run(
        ["mount", "-t", "tmpfs", "-o", f"size={size},mode=0777", "tmpfs", str(where)],
        capture_output=True,
        text=True,
        check=False,
    )
    if done.returncode != 0:
        pytest.skip(f"cannot mount a tmpfs here: {done.stderr.strip()}")
    try:
        yield where
    finally:
        subprocess.run(["umount", "-l", str(where)], capture_output=True, check=False)


def _remount_read_only(where: Path) -> None:
    subprocess.run(["mount", "-o", "remount,ro", str(where)], check=True, capture_output=True)


def test_read_only_output_folder(workbook, tmp_path):
    with tmpfs(tmp_path / "ro", "1m") as ro:
        _remount_read_only(ro)
        digest = sha256(workbook)
        outcome = _run(workbook, ro)
        assert_refused(outcome, str(ro))
        assert "read-only" in outcome.err
        assert listing(ro) == []
        assert sha256(workbook) == digest


def test_input_in_a_read_only_folder_without_out(tmp_path):
    """The outputs go beside the input by default; a read-only folder is refused."""
    with tmpfs(tmp_path / "ro", "1m") as ro:
        path, _ = direct(ro)
        _remount_read_only(ro)
        digest, before = sha256(path), listing(ro)
        outcome = run("run", path, "--samples", "0", "--quiet")
        assert_refused(outcome, str(ro))
        assert listing(ro) == before
        assert sha256(path) == digest


def test_full_disk(workbook, tmp_path):
    with tmpfs(tmp_path / "full", "64k") as full:
        digest = sha256(workbook)
        outcome = _run(workbook, full)
        assert_refused(outcome, "input-ranked")
        assert "the disk is full" in outcome.err
        assert listing(full) == []  # no temporary file, no half output
        assert sha256(workbook) == digest


# --- simulated failures at each step ------------------------------------------------------


def _fail_on(monkeypatch, owner, name: str, error: OSError, *, call: int = 1):
    """Make ``owner.name`` raise ``error`` on its ``call``-th use, and work otherwise."""
    original = getattr(owner, name)
    seen = {"n": 0}

    def failing(*args, **kwargs):
        seen["n"] += 1
        if seen["n"] == call:
            raise error
        return original(*args, **kwargs)

    monkeypatch.setattr(owner, name, failing)
    return seen


EACCES = PermissionError(errno.EACCES, "Permission denied")
ENOSPC = OSError(errno.ENOSPC, "No space left on device")


@pytest.mark.parametrize(
    "owner, name, error, call, says",
    [
        (tempfile, "mkstemp", EACCES, 1, "cannot write here"),
        (tempfile, "mkstemp", EACCES, 2, "cannot write here"),
        (os, "fsync", ENOSPC, 1, "the disk is full"),
        (os, "fsync", ENOSPC, 2, "the disk is full"),
        (os, "replace", EACCES, 1, "cannot write here"),
        (os, "replace", EACCES, 2, "cannot write here"),
        (os, "replace", ENOSPC, 2, "the disk is full"),
    ],
    ids=[
        "mkstemp-first",
        "mkstemp-second",
        "fsync-first",
        "fsync-second",
        "replace-first",
        "replace-second",
        "replace-second-full",
    ],
)
def test_a_failed_write_leaves_nothing(workbook, out, monkeypatch, owner, name, error, call, says):
    digest = sha256(workbook)
    _fail_on(monkeypatch, owner, name, error, call=call)
    outcome = _run(workbook, out)
    monkeypatch.undo()
    assert_refused(outcome, str(out / "input-ranked."))
    assert says in outcome.err
    assert_no_output(out, [])
    assert sha256(workbook) == digest


@pytest.mark.parametrize("call", [1, 2])
def test_a_failed_replacement_keeps_the_previous_outputs(workbook, out, monkeypatch, call):
    """Re-running over our own outputs: a failure puts the old pair back, byte-identical."""
    assert _run(workbook, out).code == 0
    before = {name: sha256(out / name) for name in OUTPUTS}
    _fail_on(monkeypatch, os, "replace", EACCES, call=call)
    outcome = _run(workbook, out, "--samples", "30", "--seed", "7")
    monkeypatch.undo()
    assert_refused(outcome)
    assert listing(out) == OUTPUTS  # no .tmp or .bak left
    assert {name: sha256(out / name) for name in OUTPUTS} == before


def test_the_write_helper_checks_every_target_before_creating_any(tmp_path):
    """A foreign second target stops the write before a temporary file exists."""
    ours, foreign = tmp_path / "a.html", tmp_path / "b.html"
    foreign.write_text("someone else's")
    with pytest.raises(files.InputError, match="was not written by ranker"):
        files.write_all_atomic({ours: files.HTML_MARKER.encode(), foreign: b"new"})
    assert listing(tmp_path) == ["b.html"]
    assert foreign.read_text() == "someone else's"


# --- files that are not ours, and files that are ------------------------------------------


def _foreign_workbook(path: Path) -> Path:
    wb = Workbook()
    wb.active["A1"] = "the board's own figures"
    wb.save(path)
    return path


@pytest.mark.parametrize("which", ["xlsx", "html", "both"])
def test_a_file_ranker_did_not_write_is_never_replaced(workbook, out, which):
    if which in ("xlsx", "both"):
        _foreign_workbook(out / "input-ranked.xlsx")
    if which in ("html", "both"):
        (out / "input-ranked.html").write_text("<p>notes</p>", encoding="utf-8")
    before = {name: sha256(out / name) for name in listing(out)}
    outcome = _run(workbook, out)
    assert_refused(outcome, "input-ranked")
    assert "was not written by ranker" in outcome.err
    assert {name: sha256(out / name) for name in listing(out)} == before


def test_a_foreign_file_beside_our_own_output_blocks_both(workbook, out):
    """Ours is not replaced either when its partner is foreign: the pair stays consistent."""
    assert _run(workbook, out).code == 0
    ours = sha256(out / "input-ranked.html")
    (out / "input-ranked.xlsx").unlink()
    _foreign_workbook(out / "input-ranked.xlsx")
    foreign = sha256(out / "input-ranked.xlsx")
    outcome = _run(workbook, out, "--seed", "3")
    assert_refused(outcome, "input-ranked.xlsx")
    assert sha256(out / "input-ranked.html") == ours
    assert sha256(out / "input-ranked.xlsx") == foreign


def test_a_folder_named_like_the_output_is_refused(workbook, out):
    (out / "input-ranked.html").mkdir()
    outcome = _run(workbook, out)
    assert_refused(outcome, "input-ranked.html")
    assert listing(out) == ["input-ranked.html"]


def test_outputs_ranker_wrote_are_replaced(workbook, out):
    assert _run(workbook, out).code == 0
    first = {name: sha256(out / name) for name in OUTPUTS}
    outcome = run("run", workbook, "--samples", "50", "--seed", "9", "--out", out)
    assert outcome.code == 0, outcome.err
    assert listing(out) == OUTPUTS
    second = {name: sha256(out / name) for name in OUTPUTS}
    assert all(first[n] != second[n] for n in OUTPUTS)
    assert files.written_by_ranker(out / "input-ranked.xlsx")
    assert files.written_by_ranker(out / "input-ranked.html")
    assert "changed since the last run" in outcome.out
