"""Two-corridor sub-problems (ranker.stress.pairs), checked on their own.

* The closed-form two-corridor TOPSIS winner (:func:`topsis_pair_signs`)
  against a two-corridor problem worked by hand and against
  :func:`ranker.score.topsis.topsis` run on each pair's two-row matrix
  (Hwang & Yoon, Multiple Attribute Decision Making, 1981, Steps 2-6,
  pp. 128-134).
* The streamed relation (:func:`pair_relation`) against a brute force that
  scores every pair with the public kernel and ranks it with
  :func:`ranker.score.ranks.rank_scores`, then counts wins, ties,
  disagreements with the full order and 3-cycles by listing every triple.
* The cycle count of a tournament, ``C(n, 3) - sum_i C(w_i, 2)`` (Kendall &
  Babington Smith, "On the method of paired comparisons", Biometrika
  31(3/4):324-345, 1940), on relations worked by hand.
"""

from __future__ import annotations

from itertools import combinations, permutations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.score.ranks import rank_scores
from ranker.score.topsis import topsis
from ranker.score.weighted_sum import weighted_sum
from ranker.stress import pairs
from ranker.stress.batch import Scorer


def test_documented_constants():
    # As the module documents them.
    assert pairs.ROW_BLOCK == 512
    assert pairs.PAIR_SURE == 1e-10
    assert pairs.PAIR_CHUNK == 32_768
    assert pairs.TIE_BUDGET == 50_000_000
    assert pairs.CYCLE_ROWS == 64


@pytest.mark.parametrize("n", [0, 1, 2, 3, 7])
def test_pair_index_is_triu_order(n):
    a, b = np.triu_indices(n, 1)
    ga, gb = pairs.pair_index(0, a.size, n)
    assert ga.tolist() == a.tolist() and gb.tolist() == b.tolist()
    if a.size > 2:  # a slice from the middle
        ga, gb = pairs.pair_index(1, a.size - 1, n)
        assert ga.tolist() == a[1:-1].tolist() and gb.tolist() == b[1:-1].tolist()


# -- the closed-form two-corridor winner ------------------------------------------


def test_topsis_pair_signs_worked_by_hand():
    # x = [[3, 4], [4, 3]], both benefit, w = (0.6, 0.4). r_0j - r_1j = (x_0j - x_1j) / 5
    # = (-0.2, +0.2); S = 0.36 * 0.04 * (-1) + 0.16 * 0.04 * (+1) = -0.008 < 0: corridor 1
    # wins (its closeness 0.6 against 0.4, Hwang & Yoon 1981, Steps 2-6). With the
    # weights swapped S = +0.008 and corridor 0 wins.
    x = np.array([[3.0, 4.0], [4.0, 3.0]])
    a, b = np.array([0]), np.array([1])
    sign, sure = pairs.topsis_pair_signs(x, np.array([0.6, 0.4]), np.array([True, True]), a, b)
    assert sign.tolist() == [-1] and sure.tolist() == [True]
    sign, _ = pairs.topsis_pair_signs(x, np.array([0.4, 0.6]), np.array([True, True]), a, b)
    assert sign.tolist() == [1]
    # Criterion 1 a cost: corridor 0 is better on both, so it wins at any weights.
    sign, _ = pairs.topsis_pair_signs(x, np.array([0.6, 0.4]), np.array([False, False]), a, b)
    assert sign.tolist() == [1]
    # Equal weights: S = 0 exactly, a tie the closed form is not sure of.
    sign, sure = pairs.topsis_pair_signs(x, np.array([0.5, 0.5]), np.array([True, True]), a, b)
    assert sign.tolist() == [0] and sure.tolist() == [False]


def test_topsis_pair_signs_identical_and_zero_rows():
    x = np.array([[2.0, 5.0], [2.0, 5.0], [0.0, 0.0], [0.0, 0.0]])
    w, benefit = np.array([0.5, 0.5]), np.array([True, False])
    sign, sure = pairs.topsis_pair_signs(x, w, benefit, np.array([0, 2]), np.array([1, 3]))
    assert sign.tolist() == [0, 0] and not sure.any()  # identical rows: a tie, left to the kernel


def test_topsis_pair_signs_other_normalization_has_no_closed_form():
    x = np.array([[3.0, 4.0], [4.0, 3.0]])
    got = pairs.topsis_pair_signs(
        x, np.array([0.5, 0.5]), np.array([True, True]), np.array([0]), np.array([1]),
        normalization="minmax",
    )  # fmt: skip
    assert got is None


def _two_row_sign(x, w, benefit, a, b, kernel=topsis, higher=True, **opts):
    """+1 a wins, -1 b wins, 0 tie: the kernel on the pair's two-row matrix, ranked."""
    scores = kernel(np.stack([x[a], x[b]]), w, benefit, **opts)
    r = rank_scores(scores, higher_is_better=higher)
    return int(np.sign(r[1] - r[0]))


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.integers(2, 12), st.integers(1, 5), st.integers(0, 10_000), st.booleans())
def test_topsis_pair_signs_equal_two_row_topsis(n, k, seed, coarse):
    rng = np.random.default_rng(seed)
    x = rng.integers(0, 4, size=(n, k)).astype(float) if coarse else rng.uniform(0, 9, (n, k))
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k))
    a, b = np.triu_indices(n, 1)
    sign, sure = pairs.topsis_pair_signs(x, w, benefit, a, b)
    want = np.array([_two_row_sign(x, w, benefit, p, q) for p, q in zip(a, b, strict=True)])
    assert np.array_equal(sign[sure], want[sure])
    sc = Scorer(topsis, benefit, True, {"normalization": "vector"})
    assert np.array_equal(pairs.pair_signs(sc, x, w, a, b), want)  # unsure pairs re-scored


def test_pair_signs_without_closed_form_use_the_kernel():
    # Weighted sum has no closed form; VIKOR's Q is lower-is-better. Both go through
    # the kernel, and must agree with the two-row problem ranked by rank_scores.
    from ranker.score.vikor import vikor

    rng = np.random.default_rng(5)
    x = rng.integers(1, 6, size=(7, 3)).astype(float)
    benefit = np.array([True, False, True])
    w = np.array([0.5, 0.3, 0.2])
    a, b = np.triu_indices(7, 1)
    for kernel, higher, opts in [
        (weighted_sum, True, {"normalization": "minmax"}),
        (vikor, False, {}),
    ]:
        sc = Scorer(kernel, benefit, higher, opts)
        want = [
            _two_row_sign(x, w, benefit, p, q, kernel, higher, **opts)
            for p, q in zip(a, b, strict=True)
        ]
        assert pairs.pair_signs(sc, x, w, a, b).tolist() == want


def test_signs_row_is_zero_for_itself():
    x = np.array([[1.0, 1.0], [2.0, 2.0], [3.0, 3.0]])
    sc = Scorer(topsis, np.array([True, True]), True, {"normalization": "vector"})
    row = pairs.signs_row(sc, x, np.array([0.5, 0.5]), 1)
    assert row.tolist() == [1, 0, -1]  # beats the smaller, loses to the larger (dominance)


# -- the relation and its cycles ---------------------------------------------------


def _brute_relation(x, w, benefit, ranks):
    n = x.shape[0]
    wins = np.zeros(n, dtype=int)
    ties, disagree = [], 0
    prefer = np.zeros((n, n), dtype=bool)
    for a, b in combinations(range(n), 2):
        s = _two_row_sign(x, w, benefit, a, b)
        if s > 0:
            wins[a] += 1
            prefer[a, b] = True
        elif s < 0:
            wins[b] += 1
            prefer[b, a] = True
        else:
            ties.append((a, b))
        disagree += s != np.sign(ranks[b] - ranks[a])
    # A 3-cycle is a triple {a, b, c} with a > b > c > a in one of its orders.
    cycles = sum(
        any(prefer[p, q] and prefer[q, r] and prefer[r, p] for p, q, r in permutations(t))
        for t in combinations(range(n), 3)
    )
    return wins, ties, int(disagree), cycles


@settings(max_examples=30, deadline=None, derandomize=True)
@given(
    st.integers(1, 10), st.integers(1, 4), st.integers(0, 10_000), st.integers(1, 7),
    st.integers(0, 5),
)  # fmt: skip
def test_pair_relation_equals_brute_force(n, k, seed, block, limit):
    rng = np.random.default_rng(seed)
    x = rng.integers(0, 3, size=(n, k)).astype(float)  # coarse: ties and cycles occur
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k))
    ranks = rank_scores(topsis(x, w, benefit))
    sc = Scorer(topsis, benefit, True, {"normalization": "vector"})
    rel = pairs.pair_relation(sc, x, w, ranks, block=block, limit=limit)
    wins, ties, disagree, cycles = _brute_relation(x, w, benefit, ranks)
    assert rel.count == n * (n - 1) // 2
    assert rel.wins.tolist() == wins.tolist()
    assert list(zip(rel.tie_a.tolist(), rel.tie_b.tolist(), strict=True)) == ties
    assert rel.disagree == disagree
    assert rel.cycles == cycles
    assert len(rel.bad_a) == min(limit, disagree)
    for p, q, s in zip(rel.bad_a, rel.bad_b, rel.bad_sign, strict=True):
        assert s == _two_row_sign(x, w, benefit, p, q)
        assert s != np.sign(ranks[q] - ranks[p])


@pytest.mark.parametrize("coarse", [True, False])
@pytest.mark.parametrize("seed", [0, 1, 2])
def test_pair_relation_rows_equal_blocks_of_pairs(seed, coarse, monkeypatch):
    # The row-by-row closed form (TOPSIS) against the same relation streamed in
    # blocks of pairs scored one pair index at a time (the path of every other kernel).
    rng = np.random.default_rng(seed)
    n, k = 160, 5
    x = rng.integers(0, 3, size=(n, k)).astype(float) if coarse else rng.random((n, k))
    x[7] = x[3]  # identical corridors tie
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k))
    ranks = rank_scores(topsis(x, w, benefit))
    sc = Scorer(topsis, benefit, True, {"normalization": "vector"})
    rows = pairs.pair_relation(sc, x, w, ranks, block=997, limit=50)
    monkeypatch.setattr(pairs, "_row_form", lambda *args: None)
    blocks = pairs.pair_relation(sc, x, w, ranks, block=997, limit=50)
    for field in ("count", "disagree", "cycles"):
        assert getattr(rows, field) == getattr(blocks, field), field
    for field in ("wins", "tie_a", "tie_b", "bad_a", "bad_b", "bad_sign"):
        assert getattr(rows, field).tolist() == getattr(blocks, field).tolist(), field
    assert rows.tie_a.size  # the identical pair at least


def test_pair_relation_one_corridor():
    sc = Scorer(topsis, np.array([True]), True, {"normalization": "vector"})
    rel = pairs.pair_relation(
        sc, np.array([[1.0]]), np.array([1.0]), np.array([1]), block=4, limit=3
    )
    assert (rel.count, rel.wins.tolist(), rel.disagree, rel.cycles) == (0, [0], 0, 0)
    assert rel.tie_a.size == rel.bad_a.size == 0


def _signs(prefer):
    p = np.asarray(prefer, dtype=np.int8)
    return p - p.T


def test_cycle_count_by_hand():
    # The 3-cycle 0 > 1 > 2 > 0: every corridor wins once, C(3, 3) - 3 C(1, 2) = 1.
    cyc = np.array([[0, 1, 0], [0, 0, 1], [1, 0, 0]], dtype=bool)
    assert pairs.cycle_count(cyc.sum(1), [], [], lambda u: _signs(cyc)[u]) == 1
    # A transitive order 0 > 1 > 2: wins (2, 1, 0), 1 - C(2, 2) = 0.
    order = np.triu(np.ones((3, 3), dtype=bool), 1)
    assert pairs.cycle_count(order.sum(1), [], [], lambda u: _signs(order)[u]) == 0
    # The regular tournament on 5 (i beats i+1 and i+2 mod 5): each wins 2, so
    # C(5, 3) - 5 C(2, 2) = 10 - 5 = 5 cycles.
    reg = np.zeros((5, 5), dtype=bool)
    for i in range(5):
        reg[i, (i + 1) % 5] = reg[i, (i + 2) % 5] = True
    assert pairs.cycle_count(reg.sum(1), [], [], lambda u: _signs(reg)[u]) == 5


def test_cycle_count_with_a_tied_pair():
    # 0 > 1 > 2 > 0 plus corridor 3 tied with 0 and beaten by 1 and 2: the one cycle
    # {0, 1, 2} stays; triples holding the tie (0, 3) cannot be cycles.
    prefer = np.array(
        [[0, 1, 0, 0], [0, 0, 1, 1], [1, 0, 0, 1], [0, 0, 0, 0]], dtype=bool
    )  # fmt: skip
    sg = _signs(prefer)
    got = pairs.cycle_count(prefer.sum(1), np.array([0]), np.array([3]), lambda u: sg[u])
    assert got == 1
    with pytest.MonkeyPatch.context() as mp:  # the fall-back through the whole matrix
        mp.setattr(pairs, "TIE_BUDGET", 0)
        assert pairs.cycle_count(prefer.sum(1), np.array([0]), np.array([3]), lambda u: sg[u]) == 1


def test_cycle_count_below_three_corridors():
    assert pairs.cycle_count(np.array([1, 0]), [], [], lambda u: None) == 0
    assert pairs.cycle_count(np.array([], dtype=int), [], [], lambda u: None) == 0


def test_three_cycles_and_cycles_from_rows_by_hand():
    reg = np.zeros((5, 5), dtype=bool)
    for i in range(5):
        reg[i, (i + 1) % 5] = reg[i, (i + 2) % 5] = True
    # The 5 cycles of the regular tournament, as sets (worked from i > i+1 > i+2 > i ...):
    # {0,1,3}, {0,2,3}, {0,2,4}, {1,2,4}, {1,3,4}.
    want = {frozenset(t) for t in [(0, 1, 3), (0, 2, 3), (0, 2, 4), (1, 2, 4), (1, 3, 4)]}
    got = pairs.three_cycles(reg.astype(np.float32), 100)
    assert {frozenset(t) for t in got} == want and len(got) == 5
    for a, b, c in got:  # each listed in its cycle's order a > b > c > a
        assert reg[a, b] and reg[b, c] and reg[c, a]
    sg = _signs(reg)
    assert pairs.cycles_from_rows(lambda u: sg[u], 5, 100) == got
    assert pairs.three_cycles(reg.astype(np.float32), 2) == got[:2]
    assert pairs.cycles_from_rows(lambda u: sg[u], 5, 2) == got[:2]


def test_no_cycles_in_an_order():
    order = np.triu(np.ones((6, 6), dtype=bool), 1)
    assert pairs.three_cycles(order.astype(np.float32), 10) == []
    assert pairs.cycles_from_rows(lambda u: _signs(order)[u], 6, 10) == []
