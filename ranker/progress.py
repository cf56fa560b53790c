"""Progress on standard error for long runs on a terminal: the stage, and the samples done.

Nothing is shown when standard error is not a terminal, under ``--quiet`` or
``--json`` (the caller passes ``enabled=False``), or for a run that ends
within :data:`DELAY_S`: the first line appears only once the run has taken
that long, from a timer, so a stage that reports nothing (reading a large
workbook) still shows.
"""

from __future__ import annotations

import sys
import threading
import time

#: A run shows progress once it has taken this long [s].
DELAY_S = 2.0
#: Shortest interval between two redraws of the sample count [s].
REDRAW_S = 0.1
WIDTH = 30


class Progress:
    """Stage names and a sample bar, one line on standard error, redrawn in place.

    Call :meth:`stage` when a stage begins and the object itself as
    ``progress(done, total)`` during the robustness analysis (``done`` up to
    ``samples`` counts weight samples, beyond it the checks that follow).
    """

    def __init__(self, enabled: bool, *, samples: int = 0, delay_s: float = DELAY_S, stream=None):
        self.stream = stream if stream is not None else sys.stderr
        try:
            tty = bool(self.stream.isatty())
        except (AttributeError, ValueError, OSError):
            tty = False
        self.enabled = enabled and tty
        self.samples = samples
        self.delay_s = delay_s
        self.started = time.monotonic()
        self.current = ""
        self.shown = False
        self.last = 0.0
        self.lock = threading.Lock()
        self.timer = None
        if self.enabled:
            self.timer = threading.Timer(delay_s, self._draw)
            self.timer.daemon = True
            self.timer.start()

    def _due(self) -> bool:
        return self.shown or time.monotonic() - self.started >= self.delay_s

    def _draw(self, text: str | None = None) -> None:
        with self.lock:
            if not self.enabled:
                return
            line = text if text is not None else self.current
            if not line:
                return
            elapsed = time.monotonic() - self.started
            try:
                self.stream.write(f"\r\x1b[2K[{elapsed:5.0f} s] {line}")
                self.stream.flush()
            except (OSError, ValueError):
                self.enabled = False
            self.shown = True

    def stage(self, name: str) -> None:
        """Say that stage ``name`` begins."""
        self.current = name
        if self.enabled and self._due():
            self._draw()

    def __call__(self, done: int, total: int) -> None:
        if not self.enabled or total <= 0 or not self._due():
            return
        now = time.monotonic()
        if done < total and now - self.last < REDRAW_S:
            return
        self.last = now
        if self.samples and done <= self.samples:
            filled = int(WIDTH * done / self.samples)
            bar = "#" * filled + "." * (WIDTH - filled)
            self.current = f"robustness: samples [{bar}] {done:,}/{self.samples:,}"
        else:
            self.current = "robustness: rank-reversal checks, tipping points, tiers"
        self._draw()

    def close(self) -> None:
        """Stop the timer and end the line, if one was drawn."""
        if self.timer is not None:
            self.timer.cancel()
        with self.lock:
            if self.enabled and self.shown:
                try:
                    self.stream.write("\n")
                    self.stream.flush()
                except (OSError, ValueError):
                    pass
            self.enabled = False


def stage(progress, name: str) -> None:
    """Tell ``progress`` (any callable, or None) that stage ``name`` begins, if it listens."""
    tell = getattr(progress, "stage", None)
    if tell is not None:
        tell(name)
