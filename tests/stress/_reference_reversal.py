"""Earlier implementation of the rank-reversal checks, kept to prove the current one equal.

Verbatim copy (imports aside) of ``ranker/stress/reversal.py`` and
``ranker/stress/pairs.py`` as they were before swaps were counted by
inversions and the variants and pairs streamed in passes: it compares every
pair of swap candidates (``O(m^2)`` per variant) and holds all variants and
pairs at once. Used only by ``test_reversal_equivalence.py``.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ranker.report.words import Namer
from ranker.score.stack import empty_stack
from ranker.stress.batch import Scorer, rank_batch, score_variants


@dataclass
class PairPreferences:
    """The outcome of every two-corridor problem scored.

    Attributes
    ----------
    a, b : ndarray of int, shape (p,)
        The corridors of each pair (a < b by index).
    sign : ndarray of int, shape (p,)
        +1 where a wins its pair, -1 where b wins, 0 for a tie.
    prefer : ndarray, shape (n, n)
        1 where the row corridor beats the column corridor on their own.
    cycles : int
        Number of 3-cycles (a > b > c > a) in ``prefer`` [-].
    """

    a: np.ndarray
    b: np.ndarray
    sign: np.ndarray
    prefer: np.ndarray
    cycles: int


def pair_preferences(scorer: Scorer, matrix: np.ndarray, weights: np.ndarray) -> PairPreferences:
    """Score every two-corridor sub-problem and count preference cycles.

    Parameters
    ----------
    scorer : Scorer
        The method kernel with its directions and options.
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weights : ndarray, shape (k,)
        Weights [-].

    Returns
    -------
    PairPreferences
    """
    x = np.asarray(matrix, dtype=float)
    n, k = x.shape
    ia, ib = np.triu_indices(n, 1)

    def build(start, stop):
        return np.stack([x[ia[start:stop]], x[ib[start:stop]]], axis=1)

    pr = rank_batch(score_variants(scorer, weights, ia.size, 2, k, build))
    sign = np.sign(pr[:, 1] - pr[:, 0])
    prefer = np.zeros((n, n))
    prefer[ia[sign > 0], ib[sign > 0]] = 1.0
    prefer[ib[sign < 0], ia[sign < 0]] = 1.0
    # Each 3-cycle appears three times on the diagonal of P^3.
    cycles = int(round(np.trace(prefer @ prefer @ prefer) / 3))
    return PairPreferences(ia, ib, sign, prefer, cycles)


def three_cycles(prefer: np.ndarray, limit: int) -> list[tuple[int, int, int]]:
    """Up to ``limit`` 3-cycles (a > b > c > a) of a strict preference matrix."""
    two = prefer @ prefer  # two[a, c] > 0: a > b > c for some b
    a_idx, c_idx = np.nonzero((two > 0) & (prefer.T > 0))  # and c > a
    found, seen = [], set()
    for a, c in zip(a_idx, c_idx, strict=True):
        for b in np.nonzero(prefer[a] * prefer[:, c])[0]:
            key = frozenset((int(a), int(b), int(c)))
            if key not in seen:
                seen.add(key)
                found.append((int(a), int(b), int(c)))
            if len(found) >= limit:
                return found
    return found


#: Most swaps listed per check (all are counted) [-].
MAX_DETAILS = 200
#: Default worsening for test 1, as a share of each criterion's range [-].
WORSEN_FRACTION = 0.05


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
    sentence : str
        The result in words.
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
    sentence: str = ""
    count: int = 0
    changed: list[str] = field(default_factory=list)
    first_lost: list[str] = field(default_factory=list)

    def to_json(self) -> dict:
        """Return the JSON-ready record ``{"check", "passed", "details", "sentence"}``."""
        return {
            "check": self.check,
            "passed": bool(self.passed),
            "details": self.details,
            "sentence": self.sentence,
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


class _Swaps:
    """The swaps of every variant: counts for all, pairs on demand.

    Sorting each variant's kept corridors by their old rank (then new rank),
    a swap is a later corridor with a better new rank. Only corridors with a
    worse new rank somewhere before them, or a better one after them, can be
    part of a swap; pairs are counted, and listed when asked for, among
    those alone.

    Attributes
    ----------
    counts : ndarray of int, shape (v,)
        Swaps per variant [-].
    top : ndarray of int, shape (v,)
        Swaps per variant whose upper corridor was first before [-].
    """

    def __init__(self, r0, ranks, kept, is_best):
        v, size = ranks.shape
        big = size + 1
        self.old = np.where(kept, r0[None, :], big).astype(np.int64)
        self.new = np.where(kept, ranks, big).astype(np.int64)
        self.counts = np.zeros(v, dtype=np.int64)
        self.top = np.zeros(v, dtype=np.int64)
        self._members: dict[int, np.ndarray] = {}
        if not v:
            return
        order = np.argsort(self.old * (size + 2) + self.new, axis=1, kind="stable")
        after = np.take_along_axis(self.new, order, axis=1)
        moved = np.nonzero((np.diff(after, axis=1) < 0).any(axis=1))[0]
        if not moved.size:
            return
        after, order = after[moved], order[moved]
        before_max = np.maximum.accumulate(
            np.concatenate([after[:, :1], after[:, :-1]], axis=1), axis=1
        )
        after_min = np.minimum.accumulate(
            np.concatenate([after[:, 1:], after[:, -1:]], axis=1)[:, ::-1], axis=1
        )[:, ::-1]
        flagged = (before_max > after) | (after_min < after)
        for row, var in enumerate(moved):
            m = order[row, flagged[row]]
            self._members[int(var)] = m
            o, w = self.old[var, m], self.new[var, m]
            self.counts[var] = np.count_nonzero(
                (o[:, None] < o[None, :]) & (w[:, None] > w[None, :])
            )
        for a in np.nonzero(is_best)[0]:
            oa, wa = self.old[:, a : a + 1], self.new[:, a : a + 1]
            self.top += ((self.old > oa) & (self.new < wa)).sum(axis=1)

    def pairs(self, var: int) -> tuple[np.ndarray, np.ndarray]:
        """Swapped pairs (a above b before, below it after) of one variant, in sorted order."""
        m = self._members.get(int(var))
        if m is None:
            return np.zeros(0, dtype=int), np.zeros(0, dtype=int)
        o, w = self.old[var, m], self.new[var, m]
        ia, ib = np.nonzero((o[:, None] < o[None, :]) & (w[:, None] > w[None, :]))
        return m[ia], m[ib]


def _collect(ids, changed_list, r0, g0, ranks, goods, kept, best):
    """Swap records for each variant; variant v changed corridor changed_list[v].

    ``kept`` (variants x corridors, bool) marks the corridors each variant's
    order is compared on. Returns the records (at most MAX_DETAILS, those
    costing first place first), the number of swaps, the corridors whose
    change cost first place, the corridors whose change reordered anything,
    and the number of swaps that cost first place.
    """
    changed_list = list(changed_list)
    is_best = np.zeros(len(r0), dtype=bool)
    is_best[sorted(best)] = True
    sw = _Swaps(np.asarray(r0), ranks, kept, is_best)
    moved = [ids[changed_list[v]] for v in np.nonzero(sw.counts)[0]]
    lost = [ids[changed_list[v]] for v in np.nonzero(sw.top)[0]]
    top_found, other_found = [], []
    # Variant by variant, pairs in sorted order: swaps costing first place first.
    for v in np.nonzero(sw.top)[0]:
        if len(top_found) >= MAX_DETAILS:
            break
        a, b = sw.pairs(v)
        top_found.extend((v, int(a[p]), int(b[p])) for p in np.nonzero(is_best[a])[0])
    for v in np.nonzero(sw.counts - sw.top)[0]:
        room = MAX_DETAILS - len(other_found)
        if room <= 0 or len(top_found) >= MAX_DETAILS:
            break
        a, b = sw.pairs(v)
        other_found.extend((v, int(a[p]), int(b[p])) for p in np.nonzero(~is_best[a])[0][:room])
    records = []
    for v, a, b in (top_found + other_found)[:MAX_DETAILS]:
        records.append(
            {
                "changed": ids[changed_list[v]],
                "corridor_id": ids[a],
                "other_id": ids[b],
                "ranks_before": [int(r0[a]), int(r0[b])],
                "ranks_after": [int(ranks[v][a]), int(ranks[v][b])],
                "score_gap_before": float(g0[a] - g0[b]),
                "score_gap_after": float(goods[v][a] - goods[v][b]),
                "affects_first": bool(is_best[a]),
            }
        )
    records.sort(key=lambda r: (not r["affects_first"], r["ranks_before"]))
    return records, int(sw.counts.sum()), lost, moved, int(sw.top.sum())


def replace_worse(
    scorer, matrix, weights, ids, namer, *, fraction=WORSEN_FRACTION, replacements=None
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
    namer : Namer
        For the sentence.
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

    def build(start, stop):
        mats = empty_stack(stop - start, n, k)
        mats[...] = x
        mats[np.arange(stop - start), target_idx[start:stop]] = target_rows[start:stop]
        return mats

    goods = score_variants(scorer, weights, len(targets), n, k, build)
    ranks = rank_batch(goods) if targets else np.zeros((0, n), dtype=int)
    kept = np.ones((len(targets), n), dtype=bool)
    kept[np.arange(len(targets)), target_idx] = False
    details, count, lost, moved, top_count = _collect(
        ids, targets, r0, g0, ranks, goods, kept, best
    )
    passed = not lost
    count -= top_count
    if not targets:
        sentence = "Only the first-placed corridor is left, so test 1 has nothing to replace."
    elif passed:
        sentence = (
            "The first-placed corridor stays first when any other corridor is made worse "
            f"({100 * fraction:g}% of each criterion's range on every criterion): "
            "test 1 of Wang & Triantaphyllou is met."
            if replacements is None
            else "The first-placed corridor stays first under every replacement: test 1 is met."
        )
    else:
        rec = details[0]
        sentence = (
            f"Making {namer.corridor(rec['changed'])} worse hands first place from "
            f"{namer.corridor(rec['corridor_id'])} to {namer.corridor(rec['other_id'])}: "
            f"a rank reversal (test 1 of Wang & Triantaphyllou fails in "
            f"{len(lost)} of {len(targets)} replacements)."
        )
    if count > 0:
        sentence += f" Lower down, {count:,} pair(s) of other corridors swap."
    if unchanged:
        sentence += f" {len(unchanged)} corridor(s) could not be made worse (no criterion varies)."
    return Check("replace_worse", passed, details, sentence, len(lost), moved, lost)


def clone(scorer, matrix, weights, ids, namer) -> Check:
    """Add an exact copy of each corridor in turn; the order of the others must hold."""
    x = np.asarray(matrix, dtype=float)
    n, k = x.shape
    g0 = scorer.weights(x, weights)[0]
    r0 = rank_batch(g0)
    best = set(np.nonzero(r0 == 1)[0].tolist())

    def build(start, stop):
        mats = empty_stack(stop - start, n + 1, k)
        mats[:, :n] = x
        mats[:, n] = x[start:stop]
        return mats

    goods = score_variants(scorer, weights, n, n + 1, k, build)
    ranks = rank_batch(goods)
    kept = np.ones((n, n + 1), dtype=bool)
    kept[:, n] = False  # the copy takes no part in the comparison
    r0x, g0x = np.append(r0, 0), np.append(g0, 0.0)
    details, count, lost, changed, _ = _collect(
        ids + ["(copy)"], range(n), r0x, g0x, ranks, goods, kept, best
    )
    if not count:
        sentence = (
            "Adding an exact copy of any one corridor leaves the order of the others unchanged."
        )
    else:
        d = details[0]
        sentence = (
            f"Adding a copy of {namer.corridor(d['changed'])} makes "
            f"{namer.corridor(d['corridor_id'])} and {namer.corridor(d['other_id'])} swap; "
            f"copies of {len(changed)} corridor(s) change the order ({count:,} swap(s) in all)."
        )
    return Check("clone", count == 0, details, sentence, count, changed, lost)


def leave_one_out(scorer, matrix, weights, ids, namer) -> Check:
    """Remove each corridor in turn and list every pair of the rest that swaps."""
    x = np.asarray(matrix, dtype=float)
    n, k = x.shape
    g0 = scorer.weights(x, weights)[0]
    r0 = rank_batch(g0)
    best = set(np.nonzero(r0 == 1)[0].tolist())
    if n < 3:
        return Check(
            "leave_one_out",
            True,
            [],
            "With fewer than three corridors, removing one leaves nothing to reorder.",
        )

    # Row r of variant i is corridor r, or r + 1 from the removed one on.
    rest = np.arange(n - 1)[None, :]
    kept = rest + (rest >= np.arange(n)[:, None])  # (n, n - 1) corridor indices

    def build(start, stop):
        mats = empty_stack(stop - start, n - 1, k)
        mats[...] = x[kept[start:stop]]
        return mats

    short = score_variants(scorer, weights, n, n - 1, k, build)
    # Put the results back in full index space; the removed corridor gets 0.
    variant = np.arange(n)[:, None]
    ranks = np.zeros((n, n), dtype=int)
    goods = np.zeros((n, n))
    ranks[variant, kept] = rank_batch(short)
    goods[variant, kept] = short
    present = ~np.eye(n, dtype=bool)
    details, count, lost, removed, _ = _collect(ids, range(n), r0, g0, ranks, goods, present, best)
    if not count:
        sentence = "Removing any one corridor leaves the order of the rest unchanged."
    else:
        d = details[0]
        sentence = (
            f"Removing {namer.corridor(d['changed'])} makes {namer.corridor(d['corridor_id'])} "
            f"and {namer.corridor(d['other_id'])} swap; {len(removed)} of {n} removals change "
            f"the order ({count:,} swap(s) in all)."
        )
    return Check("leave_one_out", count == 0, details, sentence, count, removed, lost)


def pairwise(scorer, matrix, weights, ids, namer) -> tuple[Check, Check]:
    """Run tests 2 and 3 of Wang & Triantaphyllou (2008) on two-corridor sub-problems.

    Returns
    -------
    transitivity, agreement : Check
    """
    x = np.asarray(matrix, dtype=float)
    n, k = x.shape
    g0 = scorer.weights(x, weights)[0]
    r0 = rank_batch(g0)
    if n < 2:
        one = "A single corridor has no pairs to compare."
        return Check("transitivity", True, [], one), Check("pairwise_agreement", True, [], one)
    pp = pair_preferences(scorer, x, weights)
    ia, ib, pair_sign, cycles = pp.a, pp.b, pp.sign, pp.cycles
    full_sign = np.sign(r0[ib] - r0[ia])
    if n < 3:
        trans = Check(
            "transitivity",
            True,
            [],
            "With two corridors no cycle is possible: test 2 is met trivially.",
        )
    elif not cycles:
        trans = Check(
            "transitivity",
            True,
            [],
            "Compared two at a time, the corridors never form a cycle "
            "(A over B over C over A): test 2 of Wang & Triantaphyllou is met.",
        )
    else:
        found = three_cycles(pp.prefer, MAX_DETAILS)
        details = [{"cycle": [ids[i] for i in cyc]} for cyc in found]
        a, b, c = (namer.corridor(ids[i]) for i in found[0])
        trans = Check(
            "transitivity",
            False,
            details,
            f"Compared two at a time, {cycles} cycle(s) appear, for example {a} beats "
            f"{b}, {b} beats {c} and {c} beats {a}: test 2 of Wang & Triantaphyllou "
            "fails.",
            cycles,
        )
    bad = np.nonzero(pair_sign != full_sign)[0]
    details = []
    for p in bad[:MAX_DETAILS]:
        a, b = (ia[p], ib[p]) if r0[ia[p]] <= r0[ib[p]] else (ib[p], ia[p])
        winner = None if pair_sign[p] == 0 else ids[ia[p] if pair_sign[p] > 0 else ib[p]]
        details.append(
            {
                "corridor_id": ids[a],
                "other_id": ids[b],
                "full_ranks": [int(r0[a]), int(r0[b])],
                "pair_winner": winner,
                "score_gap_full": float(g0[a] - g0[b]),
            }
        )
    if not bad.size:
        agree = Check(
            "pairwise_agreement",
            True,
            [],
            "Every two-corridor comparison agrees with the full order: test 3 of "
            "Wang & Triantaphyllou is met.",
        )
    else:
        d = details[0]
        who = f"{namer.corridor(d['pair_winner'])} wins" if d["pair_winner"] else "it is a tie"
        agree = Check(
            "pairwise_agreement",
            False,
            details,
            f"{bad.size} of {ia.size} two-corridor comparisons disagree with the full "
            f"order; e.g. between {namer.corridor(d['corridor_id'])} "
            f"(ranked {d['full_ranks'][0]}) and {namer.corridor(d['other_id'])} "
            f"(ranked {d['full_ranks'][1]}) on their own, {who}: test 3 of "
            "Wang & Triantaphyllou fails.",
            int(bad.size),
        )
    return trans, agree


def all_checks(scorer, matrix, weights, ids, names=None, labels=None) -> list[Check]:
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
    names, labels : dict, optional
        Corridor names and criterion labels for the sentences.

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
    namer = Namer(names, labels)
    ids = [str(i) for i in ids]
    trans, agree = pairwise(scorer, matrix, weights, ids, namer)
    return [
        replace_worse(scorer, matrix, weights, ids, namer),
        trans,
        agree,
        clone(scorer, matrix, weights, ids, namer),
        leave_one_out(scorer, matrix, weights, ids, namer),
    ]
