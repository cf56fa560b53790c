"""What the command line does when something outside the input goes wrong (ranker.crash).

* :func:`write_error_log` writes to a new file only the user can read
  (mode 0600), in a folder only the user can write (0700), under
  ``$XDG_STATE_HOME/ranker`` (XDG Base Directory Specification 0.8: state
  data) when that folder is safe, else in a fresh private temporary folder.
* :func:`stop_on_sigterm` turns SIGTERM into :class:`Terminated` in the main
  thread and restores the previous handler afterwards.
"""

from __future__ import annotations

import os
import signal
import stat
import sys
import threading

import pytest

from ranker import crash

posix = pytest.mark.skipif(sys.platform == "win32", reason="POSIX permissions and signals")


def _mode(path) -> int:
    return stat.S_IMODE(os.lstat(path).st_mode)


@posix
def test_log_is_private_and_under_the_state_folder(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path / "state"))
    path = crash.write_error_log("Traceback: boom é\n")
    assert path.parent == tmp_path / "state" / "ranker"
    assert path.name.startswith("ranker-error-") and path.suffix == ".log"
    assert path.read_text(encoding="utf-8") == "Traceback: boom é\n"
    assert _mode(path) == 0o600  # only the user reads it
    assert _mode(path.parent) == 0o700  # only the user writes there


@posix
def test_every_log_is_a_new_file(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path))
    first, second = crash.write_error_log("one"), crash.write_error_log("two")
    assert first != second
    assert (first.read_text(), second.read_text()) == ("one", "two")


@posix
def test_default_folder_is_under_home(tmp_path, monkeypatch):
    monkeypatch.delenv("XDG_STATE_HOME", raising=False)
    monkeypatch.setenv("HOME", str(tmp_path))
    path = crash.write_error_log("x")
    assert path.parent == tmp_path / ".local" / "state" / "ranker"


@posix
def test_unsafe_state_folder_is_not_used(tmp_path, monkeypatch):
    # A folder others may write to, or a link, is passed over for a fresh private one.
    open_folder = tmp_path / "open" / "ranker"
    open_folder.mkdir(parents=True)
    open_folder.chmod(0o777)
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path / "open"))
    path = crash.write_error_log("x")
    assert path.parent != open_folder and path.parent.name.startswith("ranker-")
    assert _mode(path.parent) == 0o700 and _mode(path) == 0o600
    elsewhere = tmp_path / "elsewhere"
    elsewhere.mkdir(mode=0o700)
    (tmp_path / "linked").mkdir()
    (tmp_path / "linked" / "ranker").symlink_to(elsewhere)
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path / "linked"))
    path = crash.write_error_log("x")
    assert path.parent != elsewhere and not list(elsewhere.iterdir())


def test_no_log_when_nothing_can_be_written(monkeypatch):
    def refuse(*a, **k):
        raise OSError("read-only file system")

    monkeypatch.setattr(crash.tempfile, "mkstemp", refuse)
    assert crash.write_error_log("x") is None


@posix
def test_sigterm_raises_terminated_and_the_handler_comes_back():
    before = signal.getsignal(signal.SIGTERM)
    with pytest.raises(crash.Terminated):
        with crash.stop_on_sigterm():
            assert signal.getsignal(signal.SIGTERM) is not before
            os.kill(os.getpid(), signal.SIGTERM)
            for _ in range(1000):  # the handler runs between bytecodes
                pass
    assert signal.getsignal(signal.SIGTERM) is before
    assert issubclass(crash.Terminated, BaseException)
    assert not issubclass(crash.Terminated, Exception)  # unwinds like Ctrl-C


@posix
def test_a_second_sigterm_during_clean_up_is_ignored():
    seen = []
    with pytest.raises(crash.Terminated):
        with crash.stop_on_sigterm():
            try:
                os.kill(os.getpid(), signal.SIGTERM)
                for _ in range(1000):
                    pass
            finally:
                seen.append(signal.getsignal(signal.SIGTERM))
                os.kill(os.getpid(), signal.SIGTERM)  # ignored: the clean-up goes on
                seen.append("cleaned")
    assert seen == [signal.SIG_IGN, "cleaned"]


def test_outside_the_main_thread_signals_are_left_alone():
    got = []

    def work():
        before = signal.getsignal(signal.SIGTERM)
        with crash.stop_on_sigterm():
            got.append(signal.getsignal(signal.SIGTERM) is before)
        got.append("done")

    t = threading.Thread(target=work)
    t.start()
    t.join()
    assert got == [True, "done"]
