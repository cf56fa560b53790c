"""Rank-reversal checks: does the order survive changes that should not matter?

Five checks, each re-scoring the problem with the same weights:

* ``replace_worse`` -- test 1 of Wang & Triantaphyllou [1]_: each corridor
  that is not first is replaced by a worse copy of itself; the first must
  stay first. Rule: the copy is worse by ``fraction`` (default 5 %) of the
  criterion's range (max - min over corridors) on every criterion, in the
  criterion's bad direction (down for a benefit, up for a cost); a value
  never crosses zero (a move towards zero stops at zero), as in
  scikit-criteria's ``RankInvariantChecker`` [3]_. A criterion with a
  single value cannot be made worse and is left as is.
* ``transitivity`` -- test 2 of [1]_: every pair of corridors is ranked on
  its own (a two-corridor problem); the winners must never form a cycle
  (A over B, B over C, C over A). Cycles are sought in the strict
  preferences; a tie is no preference.
* ``pairwise_agreement`` -- test 3 of [1]_: each two-corridor result must
  agree with the order of the two in the full ranking (a tie with a tie).
  Passing it implies test 2.
* ``clone`` -- an exact copy of one corridor is added (Belton & Gear [2]_);
  the order of the original corridors must not change.
* ``leave_one_out`` -- one corridor is removed at a time; the order of the
  rest must not change. Every pair that swaps is listed.

A swap is a pair whose strict order reverses (A above B before, B above A
after); a pair moving into or out of a tie is not a swap. At most
:data:`MAX_DETAILS` swaps are listed per check (the count is always given).
The variants of each check (every replaced, cloned or left-out problem, and
every two-corridor sub-problem of tests 2 and 3) are scored as stacks, a
chunk per kernel call (see :mod:`ranker.stress.batch`), and compared a pass
of variants at a time (see :mod:`ranker.stress.swaps`), so memory does not
grow with the square of the number of corridors; all pairs are always
checked.

References
----------
.. [1] X. Wang and E. Triantaphyllou, "Ranking irregularities when
   evaluating alternatives by using some ELECTRE methods", Omega 36(1):45-63,
   2008. doi:10.1016/j.omega.2005.12.003
.. [2] V. Belton and T. Gear, "On a short-coming of Saaty's method of
   analytic hierarchies", Omega 11(3):228-230, 1983.
.. [3] J. B. Cabral, N. A. Luczywo and J. L. Zanazzi, "Scikit-Criteria:
   colección de métodos de análisis multi-criterio integrado al stack
   científico de Python", 45 JAIIO, 2016 (``skcriteria.ranksrev``).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import partial

import numpy as np

from ranker.score.stack import empty_stack

from .batch import chunk_size, rank_batch, score_variants
from .pairs import cycles_from_rows, pair_relation, signs_row
from .swaps import Collector, passes
from .variants import topsis_variants

#: Most swaps listed per check (all are counted) [-].
MAX_DETAILS = 200
#: Default worsening for test 1, as a share of each criterion's range [-].
WORSEN_FRACTION = 0.05
#: Pairs scored and compared per block in tests 2 and 3 [-].
PAIR_BLOCK = 1_000_000


@dataclass
class Check:
    """One rank-reversal check.

    Attributes
    ----------
    check : str
        ``replace_worse``, ``transitivity``, ``pairwise_agreement``,
        ``clone`` or ``leave_one_out``.
    passed : bool
        True when no reversal was found.
    details : list of dict
        JSON-ready records of what reversed.
    facts : dict
        The numbers the check's sentence quotes (corridors, replacements,
        swaps lower down, ...); :mod:`ranker.report.words.checks` writes it.
    count : int
        How many reversals (swaps, cycles or disagreements) were found [-].
    changed : list of str
        Corridors whose replacement, copy or removal reordered others (all
        of them, not capped like ``details``).
    first_lost : list of str
        Corridors whose replacement, copy or removal cost the first
        corridor its place.
    """

    check: str
    passed: bool
    details: list[dict] = field(default_factory=list)
    facts: dict = field(default_factory=dict)
    count: int = 0
    changed: list[str] = field(default_factory=list)
    first_lost: list[str] = field(default_factory=list)

    def to_json(self) -> dict:
        """Return the JSON-ready record ``{"check", "passed", "details", "facts", ...}``."""
        return {
            "check": self.check,
            "passed": bool(self.passed),
            "details": self.details,
            "facts": dict(self.facts),
            "count": int(self.count),
            "changed": list(self.changed),
            "first_lost": list(self.first_lost),
        }


def worsen(matrix: np.ndarray, is_benefit: np.ndarray, *, fraction: float = WORSEN_FRACTION):
    """Return every corridor made worse by ``fraction`` of each criterion's range.

    Parameters
    ----------
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    is_benefit : ndarray of bool, shape (k,)
        True where more is better.
    fraction : float
        Share of the range (max - min) to move each value [-].

    Returns
    -------
    ndarray, shape (n, k)
        Row i is corridor i made worse; values never cross zero [same unit].
    """
    x = np.asarray(matrix, dtype=float)
    step = fraction * (x.max(axis=0) - x.min(axis=0))
    moved = np.where(is_benefit, x - step, x + step)
    # A move towards zero stops at zero (no change of sign).
    return np.where((x >= 0) & (moved < 0), 0.0, np.where((x <= 0) & (moved > 0), 0.0, moved))


def replace_worse(
    scorer, matrix, weights, ids, *, fraction=WORSEN_FRACTION, replacements=None
) -> Check:
    """Run test 1 of Wang & Triantaphyllou (2008): the first stays first.

    Parameters
    ----------
    scorer : Scorer
        The method kernel with its directions and options.
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weights : ndarray, shape (k,)
        Weights [-].
    ids : list of str
        Corridor ids, in matrix order.
    fraction : float
        Worsening rule, see :func:`worsen` [-].
    replacements : dict of int to ndarray, optional
        Explicit worse rows by corridor index (replaces the rule; corridors
        not listed are not replaced).

    Returns
    -------
    Check
    """
    x = np.asarray(matrix, dtype=float)
    n, k = x.shape
    g0 = scorer.weights(x, weights)[0]
    r0 = rank_batch(g0)
    best = set(np.nonzero(r0 == 1)[0].tolist())
    worse = worsen(x, scorer.is_benefit, fraction=fraction)
    if replacements is None:
        targets = [j for j in range(n) if j not in best]
        rows = {j: worse[j] for j in targets}
    else:
        rows = {int(j): np.asarray(v, dtype=float) for j, v in replacements.items()}
        targets = sorted(rows)
    unchanged = [j for j in targets if np.array_equal(rows[j], x[j])]

    target_rows = np.array([rows[j] for j in targets]).reshape(len(targets), k)
    target_idx = np.asarray(targets, dtype=int)

    def build(start, stop, offset=0):
        start, stop = start + offset, stop + offset
        mats = empty_stack(stop - start, n, k)
        mats[...] = x
        mats[np.arange(stop - start), target_idx[start:stop]] = target_rows[start:stop]
        return mats

    col = Collector(ids, targets, r0, g0, best, MAX_DETAILS)
    at = col.inv[target_idx]  # each replaced corridor's layout column
    closed = topsis_variants(scorer, x, weights, col.perm)
    for s, e in passes(len(targets), n, k):
        if closed is not None:
            goods = closed.with_replaced(target_idx[s:e], target_rows[s:e])
        else:
            goods = score_variants(scorer, weights, e - s, n, k, partial(build, offset=s))
            goods = goods[:, col.perm]
        compared = np.ones((e - s, n), dtype=bool)
        compared[np.arange(e - s), at[s:e]] = False
        col.add_scores(s, goods, compared, goods[np.arange(e - s), at[s:e]][:, None])
    details, count, lost, moved, top_count = col.result()
    passed = not lost
    facts = {
        "replacements": len(targets),
        "lower_swaps": int(count - top_count),
        "not_worsened": len(unchanged),
        "fraction": float(fraction),
        "by_rule": replacements is None,
    }
    return Check("replace_worse", passed, details, facts, len(lost), moved, lost)


def clone(scorer, matrix, weights, ids) -> Check:
    """Add an exact copy of each corridor in turn; the order of the others must hold."""
    x = np.asarray(matrix, dtype=float)
    n, k = x.shape
    g0 = scorer.weights(x, weights)[0]
    r0 = rank_batch(g0)
    best = set(np.nonzero(r0 == 1)[0].tolist())

    def build(start, stop, offset=0):
        mats = empty_stack(stop - start, n + 1, k)
        mats[:, :n] = x
        mats[:, n] = x[start + offset : stop + offset]
        return mats

    col = Collector(ids, range(n), r0, g0, best, MAX_DETAILS)
    closed = topsis_variants(scorer, x, weights, col.perm)
    for s, e in passes(n, n + 1, k):
        if closed is not None:
            goods = closed.with_copy(np.arange(s, e))
        else:
            goods = score_variants(scorer, weights, e - s, n + 1, k, partial(build, offset=s))
            goods = np.concatenate([goods[:, col.perm], goods[:, n:]], axis=1)
        # The copy (last column) ranks but takes no part in the comparison.
        col.add_scores(s, goods[:, :n], np.ones((e - s, n), dtype=bool), goods[:, n:])
    details, count, lost, changed, _ = col.result()
    return Check("clone", count == 0, details, {"corridors": n}, count, changed, lost)


def empty_stack_of(mats: np.ndarray) -> np.ndarray:
    """Copy a stack (s, m, k) into the layout the kernels prefer."""
    out = empty_stack(*mats.shape)
    out[...] = mats
    return out


def leave_one_out(scorer, matrix, weights, ids) -> Check:
    """Remove each corridor in turn and list every pair of the rest that swaps."""
    x = np.asarray(matrix, dtype=float)
    n, k = x.shape
    g0 = scorer.weights(x, weights)[0]
    r0 = rank_batch(g0)
    best = set(np.nonzero(r0 == 1)[0].tolist())
    if n < 3:
        return Check("leave_one_out", True, [], {"corridors": n})

    rest = np.arange(n - 1)[None, :]

    def build(start, stop, offset=0):
        mats = empty_stack(stop - start, n - 1, k)
        mats[...] = x[kept_rows(start + offset, stop + offset)]
        return mats

    def kept_rows(start, stop):
        # Row r of variant i is corridor r, or r + 1 from the removed one on.
        return rest + (rest >= np.arange(start, stop)[:, None])  # corridor indices

    col = Collector(ids, range(n), r0, g0, best, MAX_DETAILS)
    closed = topsis_variants(scorer, x, weights, col.perm)
    for s, e in passes(n, n - 1, k):
        variant, kept = np.arange(e - s)[:, None], kept_rows(s, e)
        compared = np.ones((e - s, n), dtype=bool)
        compared[np.arange(e - s), col.inv[s:e]] = False
        if closed is None:
            short = score_variants(scorer, weights, e - s, n - 1, k, partial(build, offset=s))
            goods = np.zeros((e - s, n))
            goods[variant, col.inv[kept]] = short
        else:
            goods = closed.without(np.arange(s, e))
            moves = np.nonzero(closed.removal_moves_ideal[s:e])[0]
            for start in range(0, moves.size, chunk_size(n - 1, k)):
                m = moves[start : start + chunk_size(n - 1, k)]
                short = scorer.stack(empty_stack_of(x[kept[m]]), weights)
                goods[m[:, None], col.inv[kept[m]]] = short
        col.add_scores(s, goods, compared)
    details, count, lost, removed, _ = col.result()
    return Check("leave_one_out", count == 0, details, {"corridors": n}, count, removed, lost)


def pairwise(scorer, matrix, weights, ids) -> tuple[Check, Check]:
    """Run tests 2 and 3 of Wang & Triantaphyllou (2008) on two-corridor sub-problems.

    Returns
    -------
    transitivity, agreement : Check
        ``facts`` of both: ``corridors`` [-]; of the agreement: ``pairs``
        compared [-].
    """
    x = np.asarray(matrix, dtype=float)
    n, k = x.shape
    g0 = scorer.weights(x, weights)[0]
    r0 = rank_batch(g0)
    if n < 2:
        facts = {"corridors": n, "pairs": 0}
        return (
            Check("transitivity", True, [], {"corridors": n}),
            Check("pairwise_agreement", True, [], facts),
        )
    rel = pair_relation(scorer, x, weights, r0, block=PAIR_BLOCK, limit=MAX_DETAILS)
    cycles = rel.cycles
    if n < 3 or not cycles:
        trans = Check("transitivity", True, [], {"corridors": n})
    else:
        found = cycles_from_rows(partial(signs_row, scorer, x, weights), n, MAX_DETAILS)
        details = [{"cycle": [ids[i] for i in cyc]} for cyc in found]
        trans = Check("transitivity", False, details, {"corridors": n}, cycles)
    bad_count = rel.disagree
    details = []
    for pa, pb, sign in zip(rel.bad_a, rel.bad_b, rel.bad_sign, strict=True):
        a, b = (pa, pb) if r0[pa] <= r0[pb] else (pb, pa)
        winner = None if sign == 0 else ids[pa if sign > 0 else pb]
        details.append(
            {
                "corridor_id": ids[a],
                "other_id": ids[b],
                "full_ranks": [int(r0[a]), int(r0[b])],
                "pair_winner": winner,
                "score_gap_full": float(g0[a] - g0[b]),
            }
        )
    facts = {"corridors": n, "pairs": int(rel.count)}
    agree = Check("pairwise_agreement", not bad_count, details, facts, int(bad_count))
    return trans, agree


def all_checks(scorer, matrix, weights, ids) -> list[Check]:
    """Run every rank-reversal check; see the module notes for the rules.

    Parameters
    ----------
    scorer : Scorer
        The method kernel with its directions and options.
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weights : ndarray, shape (k,)
        Weights summing to 1 [-].
    ids : list of str
        Corridor ids in matrix order.

    Returns
    -------
    list of Check
        replace_worse, transitivity, pairwise_agreement, clone, leave_one_out.

    Examples
    --------
    >>> from ranker.score.weighted_sum import weighted_sum
    >>> from ranker.stress.batch import Scorer
    >>> m = np.array([[3.0, 1.0], [2.0, 2.0], [1.0, 3.0]])
    >>> sc = Scorer(weighted_sum, np.array([True, True]))
    >>> [c.passed for c in all_checks(sc, m, np.array([0.6, 0.4]), ["A", "B", "C"])]
    [True, True, True, True, True]
    """
    ids = [str(i) for i in ids]
    trans, agree = pairwise(scorer, matrix, weights, ids)
    return [
        replace_worse(scorer, matrix, weights, ids),
        trans,
        agree,
        clone(scorer, matrix, weights, ids),
        leave_one_out(scorer, matrix, weights, ids),
    ]
