"""Re-run whenever the input is saved (``ranker run --watch``).

Polls the file's size and modification time; waits until both have been
still for a moment (a spreadsheet program writes in several steps) and the
file opens, then re-runs and prints what changed since the previous run.
"""

from __future__ import annotations

import json
import sys
import time
import zipfile
from pathlib import Path

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
                    result = run_once(args, overrides)
                except InputError as exc:
                    for p in exc.problems:
                        print(str(p), file=sys.stderr)
                    print("Fix the workbook and save it again; still watching.", file=sys.stderr)
                    continue
                if Path(result.outputs.get("workbook", "")).resolve() == path.resolve():
                    seen = _stamp(path)  # refreshed in place: our own write is not a save
                print(f"--- run {runs} at {time.strftime('%H:%M:%S')} ---")
                if args.json:
                    json.dump(result.to_json(), sys.stdout)
                    sys.stdout.write("\n")
                    sys.stdout.flush()
                elif not args.quiet:
                    print_ranking(result)  # includes what changed since the last run
                print(f"Watching {path} for changes (Ctrl-C ends).", file=sys.stderr)
            time.sleep(poll_s)
    except KeyboardInterrupt:
        print("Stopped watching.", file=sys.stderr)
    return 0
