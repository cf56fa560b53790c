"""The swap counter of the rank-reversal checks (ranker.stress.swaps), checked on its own.

* :func:`~ranker.stress.swaps.inversions` against the definition (pairs i < j
  with ``seq[i] > seq[j]``, counted by brute force in O(n^2); Knuth, The Art
  of Computer Programming vol. 3, 2nd ed., 1998, sec. 5.1.1) and against the
  discordant pairs behind scipy's Kendall tau-b: with ``x = 0, 1, ..., m - 1``
  (no ties) and ``y = seq``, ``C + D = n0 - n2`` and ``C - D = tau_b
  sqrt(n0 (n0 - n2))`` (Kendall, "The treatment of ties in ranking problems",
  Biometrika 33(3):239-251, 1945), so ``D = ((n0 - n2) - tau_b sqrt(n0 (n0 -
  n2))) / 2``, ``n0 = m (m - 1) / 2``, ``n2`` the pairs tied in ``y``; every
  path of the counter (direct, banded, divide and conquer) is hit.
* :class:`~ranker.stress.swaps.Collector`, fed new ranks or oriented scores,
  against a brute-force listing of the swapped pairs of each variant (both
  compared, strict order reversed).
* :func:`~ranker.stress.swaps.passes` tiles the variants in aligned passes.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.stress import swaps
from ranker.stress.batch import chunk_size, rank_batch


def _brute_inversions(seq) -> int:
    seq = list(seq)
    return sum(1 for i in range(len(seq)) for j in range(i + 1, len(seq)) if seq[i] > seq[j])


def _kendall_discordant(seq) -> int:
    """Discordant pairs of (0..m-1, seq) from scipy's tau-b (formula in the module docstring)."""
    from scipy.stats import kendalltau

    seq = np.asarray(seq)
    m = seq.size
    n0 = m * (m - 1) // 2
    _, counts = np.unique(seq, return_counts=True)
    n2 = int(sum(c * (c - 1) // 2 for c in counts))
    if n0 - n2 == 0:
        return 0
    tau = kendalltau(np.arange(m), seq).statistic
    return int(round(((n0 - n2) - tau * math.sqrt(n0 * (n0 - n2))) / 2))


def test_documented_constants():
    # Pinned as the module states them: 2,000,000 corridor entries per pass,
    # a band of 48 places, every pair compared below 256 corridors.
    assert swaps.VARIANT_BUDGET == 2_000_000
    assert swaps.BAND == 48
    assert swaps._DIRECT == 256


@pytest.mark.parametrize(
    "seq, want",
    [
        ([], 0),
        ([7], 0),
        ([1, 2, 3], 0),
        ([3, 2, 1], 3),  # every one of the C(3, 2) pairs
        ([2, 2, 2], 0),  # ties are no inversion
        ([2, 1, 2, 1], 3),  # (0,1), (0,3), (2,3): worked by hand
        ([4, 3, 2, 1, 0], 10),
    ],
)
def test_inversions_small_by_hand(seq, want):
    assert swaps.inversions(np.asarray(seq, dtype=np.int64)) == want


def test_inversions_reversed_long_is_n_choose_2():
    # A strictly decreasing sequence inverts every pair: m (m - 1) / 2.
    m = 700  # above the direct limit, far from sorted: divide and conquer
    assert swaps.inversions(np.arange(m)[::-1].copy()) == m * (m - 1) // 2


def test_inversions_sorted_long_is_zero():
    m = 1000  # banded path with d = 0: no neighbour compared
    assert swaps.inversions(np.arange(m)) == 0
    assert swaps.inversions(np.repeat(np.arange(50), 20)) == 0


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.integers(0, 700), st.integers(1, 40), st.integers(0, 10_000), st.booleans())
def test_inversions_equal_scipy_discordant_pairs(m, top, seed, near):
    rng = np.random.default_rng(seed)
    seq = rng.integers(0, top, size=m)
    if near:  # nearly sorted: the banded count above 256 corridors
        seq = np.sort(seq)
        for _ in range(m // 20):
            i = int(rng.integers(0, max(1, m - 10)))
            seq[i : i + 10] = rng.permutation(seq[i : i + 10])
    got = swaps.inversions(seq)
    assert got == _kendall_discordant(seq)
    if m <= 300:
        assert got == _brute_inversions(seq)


@pytest.mark.parametrize("d", [1, 2, 10, swaps.BAND])
def test_inversions_pair_at_the_widest_distance_of_the_band(d):
    # Positions 0 .. 2d-1 of a block sorted as: the first moves d places right, the last
    # d places left, the rest one place each; no element moves more than d, and the
    # first and last are inverted 2d - 1 places apart, the widest the banded count
    # must compare. Values are the sorted positions: [d, 0, ..., d-2, d+1, ..., 2d-1, d-1].
    block = [d, *range(d - 1), *range(d + 1, 2 * d), d - 1]
    seq = np.arange(400)
    seq[100 : 100 + 2 * d] = 100 + np.array(block)
    want = _brute_inversions(seq)
    # The first is above the d values 0 .. d-1 after it, the last below the d values
    # d, d+1 .. 2d-1 before it; the pair of the two counts once: 2d - 1 inversions.
    assert want == 2 * d - 1
    assert swaps.inversions(seq) == want


def test_inversions_band_edge_equals_brute_force():
    # Displacement exactly BAND (48) takes the banded path; BAND + 1 does not.
    rng = np.random.default_rng(3)
    for d in (swaps.BAND, swaps.BAND + 1):
        seq = np.arange(400)
        seq[[100, 100 + d]] = seq[[100 + d, 100]]  # one element d places off each way
        seq[200:260] = rng.permutation(seq[200:260])
        assert swaps.inversions(seq) == _brute_inversions(seq)


# -- Collector ------------------------------------------------------------------


def _brute_swaps(r0, ranks, kept):
    """Every (variant, a, b): both kept, a strictly above b before and strictly below after."""
    out = []
    v, n = ranks.shape
    for var in range(v):
        for a in range(n):
            for b in range(n):
                if (
                    kept[var, a]
                    and kept[var, b]
                    and r0[a] < r0[b]
                    and ranks[var, a] > ranks[var, b]
                ):
                    out.append((var, a, b))
    return out


def _case(seed, n, v):
    rng = np.random.default_rng(seed)
    top = max(1, n // 2)
    r0 = rng.integers(1, top + 1, size=n)  # coarse ranks: ties occur
    ranks = rng.integers(1, top + 1, size=(v, n))
    kept = rng.random((v, n)) < 0.85
    g0 = rng.random(n)
    goods = rng.random((v, n))
    changed = rng.integers(0, n, size=v)
    return r0, g0, ranks, goods, kept, changed


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.integers(0, 10_000), st.integers(1, 9), st.integers(0, 6), st.integers(1, 50))
def test_collector_equals_brute_force(seed, n, v, limit):
    r0, g0, ranks, goods, kept, changed = _case(seed, n, v)
    ids = [f"C{i}" for i in range(n)]
    best = set(np.nonzero(r0 == r0.min())[0].tolist())
    want = _brute_swaps(r0, ranks, kept)
    top = [s for s in want if s[1] in best]

    col = swaps.Collector(ids, changed, r0, g0, best, limit)
    col.add(0, ranks, goods, kept)
    records, count, lost, moved, top_count = col.result()

    assert count == len(want)
    assert top_count == len(top)
    # One entry per variant that reorders (or costs first place), in variant order.
    assert lost == [ids[changed[var]] for var in sorted({s[0] for s in top})]
    assert moved == [ids[changed[var]] for var in sorted({s[0] for s in want})]
    assert len(records) == min(limit, len(want))
    truth: dict[tuple, list] = {}
    for var, a, b in want:  # two variants may change the same corridor
        truth.setdefault((ids[changed[var]], ids[a], ids[b]), []).append((var, a, b))
    for rec in records:
        key = (rec["changed"], rec["corridor_id"], rec["other_id"])
        assert key in truth
        assert any(
            rec["ranks_after"] == [int(ranks[var, a]), int(ranks[var, b])]
            and rec["score_gap_after"] == pytest.approx(goods[var, a] - goods[var, b])
            for var, a, b in truth[key]
        )
        _, a, b = truth[key][0]
        assert rec["ranks_before"] == [int(r0[a]), int(r0[b])]
        assert rec["ranks_before"][0] < rec["ranks_before"][1]
        assert rec["ranks_after"][0] > rec["ranks_after"][1]
        assert rec["affects_first"] == (a in best)
        assert rec["score_gap_before"] == pytest.approx(g0[a] - g0[b])
    # Swaps that cost first place come first, then by the ranks before.
    keys = [(not r["affects_first"], r["ranks_before"]) for r in records]
    assert keys == sorted(keys)
    if len(top) >= limit:
        assert all(r["affects_first"] for r in records)
    if limit >= len(want):  # room for all: every swap listed once
        got = sorted((r["changed"], r["corridor_id"], r["other_id"]) for r in records)
        assert got == sorted(k for k, found in truth.items() for _ in found)


def test_collector_hand_made_single_swap():
    # Three corridors ranked 1, 2, 3; the one variant (changing C2) swaps C0 and C1.
    ids = ["A", "B", "C"]
    col = swaps.Collector(ids, [2], [1, 2, 3], [0.9, 0.5, 0.1], {0}, 10)
    ranks = np.array([[2, 1, 3]])
    goods = np.array([[0.4, 0.6, 0.1]])
    col.add(0, ranks, goods, np.ones((1, 3), dtype=bool))
    records, count, lost, moved, top_count = col.result()
    assert (count, lost, moved, top_count) == (1, ["C"], ["C"], 1)
    assert records == [
        {
            "changed": "C",
            "corridor_id": "A",
            "other_id": "B",
            "ranks_before": [1, 2],
            "ranks_after": [2, 1],
            "score_gap_before": pytest.approx(0.4),
            "score_gap_after": pytest.approx(-0.2),
            "affects_first": True,
        }
    ]


def test_collector_tie_is_not_a_swap_and_dropped_corridor_is_ignored():
    ids = ["A", "B", "C"]
    col = swaps.Collector(ids, [0, 1], [1, 2, 3], [0.9, 0.5, 0.1], {0}, 10)
    ranks = np.array([[1, 1, 3], [3, 1, 2]])  # a tie; then A reversed but not kept
    kept = np.array([[True, True, True], [False, True, True]])
    col.add(0, ranks, np.zeros((2, 3)), kept)
    records, count, lost, moved, top_count = col.result()
    # Variant 1 without A: B (2) vs C (3) -> 1 vs 2, no reversal.
    assert (records, count, lost, moved, top_count) == ([], 0, [], [], 0)


def test_collector_with_no_variants():
    col = swaps.Collector(["A", "B"], [], [1, 2], [1.0, 0.0], {0}, 5)
    col.add(0, np.zeros((0, 2), dtype=int), np.zeros((0, 2)), np.zeros((0, 2), dtype=bool))
    assert col.result() == ([], 0, [], [], 0)


def test_collector_passes_add_up_to_one_pass():
    r0, g0, ranks, goods, kept, changed = _case(11, 8, 9)
    ids = [f"C{i}" for i in range(8)]
    best = {int(np.argmin(r0))}
    whole = swaps.Collector(ids, changed, r0, g0, best, 1000)
    whole.add(0, ranks, goods, kept)
    split = swaps.Collector(ids, changed, r0, g0, best, 1000)
    for start, stop in [(0, 4), (4, 5), (5, 9)]:
        split.add(start, ranks[start:stop], goods[start:stop], kept[start:stop])
    assert split.result()[1:] == whole.result()[1:]
    assert sorted(map(str, split.result()[0])) == sorted(map(str, whole.result()[0]))


@settings(max_examples=40, deadline=None, derandomize=True)
@given(
    st.integers(0, 10_000), st.integers(1, 9), st.integers(0, 6), st.integers(0, 2),
    st.booleans(),
)  # fmt: skip
def test_collector_add_scores_equals_brute_force(seed, n, v, extra_count, shuffled):
    """Ranks from scores (the tie rule of rank_batch) over the compared corridors and the
    extra scores, then the swapped pairs listed by brute force."""
    rng = np.random.default_rng(seed)
    g0 = rng.integers(0, 4, size=n).astype(float)  # coarse: ties occur
    r0 = rank_batch(g0)
    if shuffled:  # corridors not given best first: the collector lays them out
        order = rng.permutation(n)
        g0, r0 = g0[order], r0[order]
    goods = rng.integers(0, 4, size=(v, n)).astype(float)
    compared = rng.random((v, n)) < 0.85
    extra = rng.integers(0, 4, size=(v, extra_count)).astype(float) if extra_count else None
    ids = [f"C{i}" for i in range(n)]
    best = set(np.nonzero(r0 == 1)[0].tolist())
    changed = rng.integers(0, n, size=v)

    ranks = np.zeros((v, n), dtype=int)
    for var in range(v):
        idx = np.nonzero(compared[var])[0]
        present = goods[var, idx] if extra is None else np.r_[goods[var, idx], extra[var]]
        ranks[var, idx] = rank_batch(present)[: idx.size]
    want = _brute_swaps(r0, ranks, compared)

    col = swaps.Collector(ids, changed, r0, g0, best, 1000)
    p = col.perm
    assert list(r0[p]) == sorted(r0)  # laid out best first
    col.add_scores(0, goods[:, p], compared[:, p], extra)
    records, count, lost, moved, top_count = col.result()
    assert count == len(want)
    assert top_count == sum(1 for s in want if s[1] in best)
    assert moved == [ids[changed[var]] for var in sorted({s[0] for s in want})]
    assert lost == [ids[changed[var]] for var in sorted({s[0] for s in want if s[1] in best})]
    got = sorted(
        (r["changed"], r["corridor_id"], r["other_id"], *r["ranks_after"]) for r in records
    )
    assert got == sorted(
        (ids[changed[var]], ids[a], ids[b], ranks[var, a], ranks[var, b]) for var, a, b in want
    )


def test_collector_lays_corridors_out_best_first():
    # Ranks 3, 1, 2 and an unranked corridor (0) last: layout B, C, A, D.
    col = swaps.Collector(["A", "B", "C", "D"], [0], [3, 1, 2, 0], [0.1, 0.9, 0.5, 0.0], {1}, 5)
    assert col.perm.tolist() == [1, 2, 0, 3]
    assert col.ids == ["B", "C", "A", "D"]
    assert col.r0.tolist() == [1, 2, 3, 0]


# -- passes ---------------------------------------------------------------------


@pytest.mark.parametrize(
    "count, rows, k", [(0, 5, 3), (1, 5, 3), (10, 2, 2), (5000, 1000, 6), (12345, 40_000, 3)]
)
def test_passes_tile_the_variants(count, rows, k):
    got = swaps.passes(count, rows, k)
    step = chunk_size(rows, k)
    covered = [i for start, stop in got for i in range(start, stop)]
    assert covered == list(range(count))  # every variant once, in order
    for start, stop in got:
        assert start % step == 0  # aligned to the kernel's chunks
        # A pass holds at most VARIANT_BUDGET corridor entries, or one chunk if that is more.
        assert (stop - start) * rows <= max(swaps.VARIANT_BUDGET, step * rows)
