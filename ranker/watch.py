"""Re-run whenever the input is saved (``ranker run --watch``).

Polls the file's size and modification time; waits until both have been
still for a moment (a spreadsheet program writes in several steps) and the
file opens, then re-runs and prints what changed since the previous run.
"""

from __future__ import annotations

import sys
import time
import zipfile
from pathlib import Path

from .changes import compare
from .errors import InputError

POLL_S = 0.5
SETTLE_S = 1.0


def _stamp(path: Path):
    try:
        st = path.stat()
        return (st.st_mtime_ns, st.st_size)
    except OSError:
        return None


def _complete(path: Path) -> bool:
    """True when the file is a whole zip (not half-written, not locked)."""
    try:
        with zipfile.ZipFile(path) as z:
            return z.testzip() is None
    except (OSError, zipfile.BadZipFile):
        return False


def watch(
    args,
    overrides: dict,
    run_once,
    *,
    max_runs: int | None = None,
    poll_s: float = POLL_S,
    settle_s: float = SETTLE_S,
) -> int:
    """Run, then re-run on every save until Ctrl-C; return the exit code 0.

    ``max_runs`` stops after that many runs (for tests).
    """
    from .cli import print_ranking

    path: Path = args.input
    previous = None
    runs = 0
    seen = None
    try:
        while max_runs is None or runs < max_runs:
            stamp = _stamp(path)
            if stamp is not None and stamp != seen:
                time.sleep(settle_s)
                if _stamp(path) != stamp or not _complete(path):
                    continue  # still being written: look again next poll
                seen = stamp
                runs += 1
                try:
                    summary = run_once(args, overrides)
                except InputError as exc:
                    for p in exc.problems:
                        print(str(p), file=sys.stderr)
                    print("Fix the workbook and save it again; still watching.", file=sys.stderr)
                    continue
                print(f"--- run {runs} at {time.strftime('%H:%M:%S')} ---")
                print_ranking(summary)
                for line in compare(previous, summary) if previous else []:
                    print(f"  changed: {line}")
                previous = summary
                print(f"Watching {path} for changes (Ctrl-C ends).", file=sys.stderr)
            time.sleep(poll_s)
    except KeyboardInterrupt:
        print("Stopped watching.", file=sys.stderr)
    return 0
