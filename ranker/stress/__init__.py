"""Stress-test a corridor ranking: how robust is the order, and why?

One entry point, :func:`stress_test`, runs every analysis on the criteria
matrix with a method kernel passed in (so any scoring method can be
stressed), and :func:`futures` re-ranks under alternative assumptions
through a callback. The modules hold the pure analyses:

* :mod:`.acceptability` -- SMAA-2 rank acceptability, central weights,
  confidence factors (Lahdelma & Salminen 2001).
* :mod:`.reversal` -- rank-reversal checks (Wang & Triantaphyllou 2008
  tests 1-3, clones, leave-one-out).
* :mod:`.tipping` -- weight tipping points and rank intervals.
* :mod:`.consensus` -- stakeholder weight sets, Borda and Copeland.
* :mod:`.closeness` -- gaps between neighbours, "practically tied".
* :mod:`.tiers` -- pairwise winning shares and the tiers they settle.
* :mod:`.scenarios` -- futures.
* :mod:`.batch` -- batch ranking by sorting and the kernel wrapper.

The rules each analysis follows are in its module docstring and in
``docs/robustness.md``.
"""

from __future__ import annotations

from .run import WARNING_KINDS, Robustness, stress_test
from .scenarios import futures

__all__ = ["WARNING_KINDS", "Robustness", "futures", "stress_test"]
