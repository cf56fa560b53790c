"""What the command line does when something outside the input goes wrong.

- :func:`write_error_log` writes an internal error's traceback to a new file
  that only the user can read, in a folder only the user can write: created
  exclusively with :func:`tempfile.mkstemp` (a unique name, ``O_EXCL``, so an
  existing file or symbolic link of that name is never followed or
  overwritten).
- :func:`stop_on_sigterm` turns SIGTERM into :class:`Terminated`, which
  unwinds like Ctrl-C does, so the atomic writer's clean-up (temporary files
  and backups beside the outputs) runs for a ``kill`` as it does for Ctrl-C.
"""

from __future__ import annotations

import contextlib
import os
import signal
import stat
import tempfile
from pathlib import Path


class Terminated(BaseException):  # noqa: N818 - read as "the process was terminated"
    """Raised in the main thread when the process receives SIGTERM."""


@contextlib.contextmanager
def stop_on_sigterm():
    """Within the block, SIGTERM raises :class:`Terminated` (once; a second is ignored)."""

    def handler(signum, frame):
        signal.signal(signal.SIGTERM, signal.SIG_IGN)  # the clean-up is not interrupted
        raise Terminated

    try:
        previous = signal.signal(signal.SIGTERM, handler)
    except ValueError:  # not the main thread: leave signals alone
        yield
        return
    try:
        yield
    finally:
        signal.signal(signal.SIGTERM, previous)


def _private_folder() -> Path:
    """Return a folder only this user can write, creating it if needed.

    ``$XDG_STATE_HOME/ranker`` (default ``~/.local/state/ranker``), made with
    mode 0700; used only when it is a real folder (not a link) owned by the
    user and closed to others. Otherwise a fresh :func:`tempfile.mkdtemp`
    folder (also 0700, with a unique name).
    """
    base = os.environ.get("XDG_STATE_HOME") or os.path.join(
        os.path.expanduser("~"), ".local", "state"
    )
    folder = Path(base) / "ranker"
    try:
        folder.mkdir(mode=0o700, parents=True, exist_ok=True)
        info = os.lstat(folder)
        uid = os.getuid() if hasattr(os, "getuid") else info.st_uid
        if (
            stat.S_ISDIR(info.st_mode)
            and info.st_uid == uid
            and not info.st_mode & (stat.S_IWGRP | stat.S_IWOTH)
        ):
            return folder
    except OSError:
        pass
    return Path(tempfile.mkdtemp(prefix="ranker-"))


def write_error_log(text: str) -> Path | None:
    """Write ``text`` to a new user-only log file; return its path (None if impossible)."""
    try:
        fd, name = tempfile.mkstemp(prefix="ranker-error-", suffix=".log", dir=_private_folder())
        with os.fdopen(fd, "w", encoding="utf-8", errors="replace") as fh:
            fh.write(text)
        return Path(name)
    except OSError:
        return None
