"""Safe output files: atomic writes, and never replacing a file ranker did not write."""

from __future__ import annotations

import errno
import os
import tempfile
import zipfile
from pathlib import Path

from .errors import InputError

#: Written into every output (a custom property of the workbook, a meta tag of the
#: HTML) so that a later run knows it may replace the file.
MARKER = "ranker-output"
HTML_MARKER = f'<meta name="generator" content="{MARKER}">'


def written_by_ranker(path: Path) -> bool:
    """Return True where ``path`` carries the ranker marker."""
    try:
        if path.suffix.lower() == ".html":
            with open(path, "rb") as f:
                return HTML_MARKER.encode() in f.read(4096)
        with zipfile.ZipFile(path) as z:
            if "docProps/custom.xml" not in z.namelist():
                return False
            info = z.getinfo("docProps/custom.xml")
            if info.file_size > 1_000_000:
                return False
            return MARKER.encode() in z.read("docProps/custom.xml")
    except (OSError, zipfile.BadZipFile, KeyError):
        return False


def check_replaceable(path: Path) -> None:
    """Raise InputError when ``path`` exists and ranker did not write it."""
    if path.exists() and not written_by_ranker(path):
        raise InputError.one(
            str(path),
            "a file of this name exists and was not written by ranker",
            "move or rename it, or choose another folder with --out",
        )


def check_out_dir(out_dir: Path) -> None:
    """Raise InputError when ``out_dir`` cannot take the outputs."""
    if not out_dir.exists():
        raise InputError.one(
            str(out_dir),
            "the output folder does not exist",
            "create it, or choose another with --out",
        )
    if not out_dir.is_dir():
        raise InputError.one(str(out_dir), "is not a folder", "give a folder with --out")
    if not os.access(out_dir, os.W_OK):
        raise InputError.one(
            str(out_dir),
            "the output folder is read-only",
            "choose a folder you can write with --out",
        )


def write_all_atomic(files: dict[Path, bytes]) -> None:
    """Write several files, each to a temporary name, then move all into place.

    A failure before the moves leaves no output behind and nothing replaced.
    """
    temps: dict[Path, str] = {}
    try:
        for path, data in files.items():
            check_replaceable(path)
            fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
            temps[path] = tmp
            with os.fdopen(fd, "wb") as f:
                f.write(data)
                f.flush()
                os.fsync(f.fileno())
        for path, tmp in temps.items():
            os.replace(tmp, path)
    except OSError as exc:
        for tmp in temps.values():
            try:
                os.unlink(tmp)
            except OSError:
                pass
        raise _os_error(exc) from exc


def _os_error(exc: OSError) -> InputError:
    where = exc.filename or "output"
    if exc.errno == errno.ENOSPC:
        return InputError.one(
            str(where), "the disk is full", "free some space or choose another --out"
        )
    if exc.errno in (errno.EACCES, errno.EPERM, errno.EROFS):
        return InputError.one(
            str(where),
            "cannot write here (read-only, or the file is open in another program)",
            "close the file in the spreadsheet program, or choose another folder with --out",
        )
    if exc.errno == errno.ENOENT:
        return InputError.one(
            str(where),
            "the output folder does not exist",
            "create it, or choose another with --out",
        )
    return InputError.one(
        str(where), f"cannot write the output ({exc.strerror})", "choose another --out"
    )
