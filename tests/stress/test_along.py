"""Tipping crossings solved along the weight line equal the bracketed search run to convergence.

:mod:`ranker.stress.along` (TOPSIS, the default) replaces the bracketed
search of :mod:`ranker.stress.tipping` (false position, then bisection, to
a bracket of ``TOLERANCE``) by solving each crossing. The bracketed search
is proven equal to the earlier all-corridor search in
``test_tipping_narrowing.py``; here, with its ``TOLERANCE`` taken down to
1e-13 so that it converges, it must give the same rank intervals as the
solved search: ends to 1e-12, the same partners and the same ranks beyond,
on random continuous and coarse (tied) matrices, every normalisation and
mixed directions. Below the product's resolution two differences are
rounding, not error, and are checked for what they are: near twins crossed
at one weight (either may be named: they must be level there), and a rank
beyond read across a second crossing within the 2e-13 step (the solved
search's must be the full re-ranking's). At the product's ``TOLERANCE`` the two ends differ by at
most half of it. The root search is checked against
:func:`scipy.optimize.brentq` (Brent 1973), the closed form's ``take``
against the line it came from. TOPSIS: Hwang & Yoon (1981), pp. 128-134;
the sweep: Triantaphyllou & Sanchez (1997).
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st
from scipy.optimize import brentq

from ranker.score.ranks import beat_thresholds
from ranker.score.topsis import topsis
from ranker.stress import along, tipping
from ranker.stress.batch import Scorer
from ranker.stress.rows import TopsisRows

FIELDS = ("ranks", "low_by", "high_by", "low_rank", "high_rank", "exact")


def _case(n, k, seed, kind):
    rng = np.random.default_rng(seed)
    if kind == "coarse":  # many exact ties, at the current weight and along the sweep
        x = rng.integers(1, 5, size=(n, k)).astype(float)
    elif kind == "twins":  # continuous, with some corridors repeated exactly
        x = rng.random((n, k)) + 0.1
        x[rng.integers(0, n, size=n // 4)] = x[rng.integers(0, n, size=n // 4)]
    elif kind == "near":  # twins apart by rounding-sized steps: tied by the rule, not equal
        x = rng.random((n, k)) + 0.1
        x[rng.integers(0, n, size=n // 4)] = x[rng.integers(0, n, size=n // 4)]
        x *= 1.0 + rng.integers(-3, 4, size=(n, 1)) * 1e-14
    else:
        x = rng.random((n, k)) + 0.1
    w = rng.random(k) + 0.05
    return x, w / w.sum(), rng.random(k) < 0.5


def _sweeps(sc, x, w, c, tolerance):
    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(tipping, "TOLERANCE", tolerance)
        return (
            tipping.sweep_criterion(sc, x, w, c),
            tipping.sweep_criterion(sc, x, w, c, solve=False),
        )


@settings(max_examples=60, deadline=None, derandomize=True)
@given(
    st.integers(2, 300),
    st.integers(2, 6),
    st.integers(0, 10_000),
    st.sampled_from(["continuous", "coarse", "twins", "near"]),
    st.sampled_from(["vector", "minmax", "sum", "max"]),
)
@example(5, 2, 2, "near", "vector")  # near twins crossed at one weight: either may be named
@example(8, 2, 0, "near", "minmax")  # a second crossing within 1e-12 of where the rank is read
def test_solved_equals_converged_search(n, k, seed, kind, normalization):
    x, w, benefit = _case(n, k, seed, kind)
    sc = Scorer(topsis, benefit, True, {"normalization": normalization})
    for c in range(k):
        solved, searched = _sweeps(sc, x, w, c, 1e-13)
        for name in ("low", "high"):
            got, want = getattr(solved, name), getattr(searched, name)
            assert np.allclose(got, want, rtol=0, atol=1e-12), (name, c)
        for name in FIELDS:
            got, want = getattr(solved, name), getattr(searched, name)
            if name in ("low_by", "high_by"):
                end = getattr(solved, "low" if name == "low_by" else "high")
                got = _same_partner(sc, x, w, c, end, got, want)
            if name in ("low_rank", "high_rank"):
                side = -1 if name == "low_rank" else 1
                end = getattr(solved, "low" if side < 0 else "high")
                got = _rank_near_end(sc, x, w, c, end, side, got, want, 1e-13)
            assert np.array_equal(got, want), (name, c)


def _same_partner(sc, x, w, c, end, got, want):
    """``got`` where the two searches name partners level with each other at the end.

    Near twins (1e-14 apart: tied by the tie rule) are crossed at one weight;
    which of them a search names is decided by rounding, and either is true.
    Elsewhere ``got`` is returned unchanged, so a different partner still fails.
    """
    got = got.copy()
    for i in np.flatnonzero((got != want) & (got >= 0) & (want >= 0)):
        g = sc.weights(x, tipping.sweep_weights(w, c, np.array([end[i]])))[0]
        a, b = g[[got[i]]], g[[want[i]]]
        if not (a > beat_thresholds(b) or b > beat_thresholds(a)):
            got[i] = want[i]
    return got


def _rank_near_end(sc, x, w, c, end, side, got, want, tolerance):
    """``got`` where it is the full re-ranking's rank at the point it is read.

    The rank beyond an end is read ``2 tolerance`` past it. With near twins
    (1e-14 apart, tied with each other by the tie rule) and the search taken
    down to 1e-13, a second crossing can lie within that step, where the
    bracketed search counts the corridors beaten one by one at its bracket's
    far end while the solved search re-ranks the corridors (``rank_batch``,
    the rule of the ranking table). Where the two differ, the solved one must
    be that re-ranking's rank; any other difference still fails.
    """
    from ranker.stress.batch import rank_batch

    got = got.copy()
    for i in np.flatnonzero(got != want):
        at = np.clip([end[i] + side * 2 * tolerance], 0.0, 1.0)
        if rank_batch(sc.weights(x, tipping.sweep_weights(w, c, at)))[0, i] == got[i]:
            got[i] = want[i]
    return got


@settings(max_examples=20, deadline=None, derandomize=True)
@given(st.integers(2, 300), st.integers(2, 6), st.integers(0, 10_000))
def test_ends_within_half_the_search_tolerance(n, k, seed):
    """At the product's TOLERANCE the search's ends are midpoints of a bracket around the root."""
    x, w, benefit = _case(n, k, seed, "continuous")
    sc = Scorer(topsis, benefit, True, {"normalization": "vector"})
    for c in range(k):
        solved, searched = _sweeps(sc, x, w, c, tipping.TOLERANCE)
        for name in ("low", "high"):
            gap = np.abs(getattr(solved, name) - getattr(searched, name))
            assert gap.max() <= tipping.TOLERANCE / 2 + 1e-12, (name, c)


@pytest.mark.parametrize("at_once", [0, 10**9])
def test_large_solved_sweep_uses_the_shifted_comparisons_and_the_tie_rule(at_once):
    """1,500 corridors with twins: the sorted-row partner search and the tie hand-back both run.

    With ``AT_ONCE`` 0 each grid cell's corridors are taken a cell at a time
    (as for all but the smallest matrices), else a block's cells at once (as
    for a few dozen corridors).
    """
    x, w, benefit = _case(1500, 5, 3, "twins")
    sc = Scorer(topsis, benefit, True, {"normalization": "vector"})
    seen = {"sorted": 0, "tied": 0}
    real_inv, real_narrow = along._inversions, tipping._narrow_cells

    def inversions(v, mine):
        seen["sorted"] += int(mine.sum() > along.FEW)
        return real_inv(v, mine)

    def narrow(*args):
        seen["tied"] += args[5][0].size
        return real_narrow(*args)

    for c in (0, 2):
        with pytest.MonkeyPatch.context() as mp:
            mp.setattr(along, "_inversions", inversions)
            mp.setattr(tipping, "_narrow_cells", narrow)
            mp.setattr(tipping, "TOLERANCE", 1e-13)
            mp.setattr(along, "AT_ONCE", at_once)
            solved = tipping.sweep_criterion(sc, x, w, c)
        with pytest.MonkeyPatch.context() as mp:
            mp.setattr(tipping, "TOLERANCE", 1e-13)
            searched = tipping.sweep_criterion(sc, x, w, c, solve=False)
        for name in ("low", "high"):
            assert np.allclose(getattr(solved, name), getattr(searched, name), rtol=0, atol=1e-12)
        for name in FIELDS:
            assert np.array_equal(getattr(solved, name), getattr(searched, name)), (name, c)
    assert seen["tied"]
    if at_once == 0:
        assert seen["sorted"]


def test_many_ties_leave_the_sweep_to_the_search():
    """Where most corridors share a rank the whole sweep goes to the bracketed search."""
    x = np.repeat(np.array([[1.0, 2.0, 3.0], [2.0, 1.0, 3.0]]), 100, axis=0)
    sc = Scorer(topsis, np.array([True, True, False]), True, {"normalization": "vector"})
    w = np.array([0.5, 0.3, 0.2])
    at_t0 = sc.weights(x, w[None, :])
    ranks = tipping.rank_batch(at_t0)[0]
    grid = np.unique(np.concatenate([np.linspace(0, 1, tipping.GRID_POINTS), [w[0]]]))
    line = tipping._closed_line(sc, x, w, 0)
    g0 = int(np.searchsorted(grid, w[0]))
    assert along.crossings_along(line, at_t0[0], grid, g0, ranks) is None
    solved = tipping.sweep_criterion(sc, x, w, 0)
    searched = tipping.sweep_criterion(sc, x, w, 0, solve=False)
    for name in ("low", "high", *FIELDS):
        assert np.array_equal(getattr(solved, name), getattr(searched, name)), name


@settings(max_examples=30, deadline=None, derandomize=True)
@given(st.integers(2, 40), st.integers(2, 6), st.integers(0, 10_000))
def test_roots_equal_brentq(n, k, seed):
    """Each solved crossing is the root scipy's Brent method finds in the same bracket."""
    rng = np.random.default_rng(seed)
    x = rng.random((n, k)) + 0.1
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k))
    c = int(rng.integers(0, k))
    share = tipping.sweep_weights(w, c, np.zeros(1))[0]
    line = TopsisRows(x, benefit).along(share, c)
    grid = np.linspace(0.0, 1.0, 41)
    g = line(grid, np.arange(n)[None, :])
    i, j, cell = np.nonzero(np.diff(np.sign(g[:, :, None] - g[:, None, :]), axis=0).T != 0)
    keep = i < j
    i, j, cell = i[keep], j[keep], cell[keep]
    if not i.size:
        return
    pair = line.take(np.stack([i, j], axis=1))

    def f(t, sel):
        s = pair(t, sel)
        return s[:, 0] - s[:, 1]

    got = along._root(f, grid[cell], grid[cell + 1])
    for m in range(i.size):
        lo, hi = grid[cell[m]], grid[cell[m] + 1]
        want = brentq(lambda t, m=m: f(np.array([t]), np.array([m]))[0], lo, hi, xtol=1e-15)
        assert got[m] == pytest.approx(want, abs=1e-13)


def test_take_equals_the_line_on_the_chosen_rows():
    rng = np.random.default_rng(5)
    x = rng.random((30, 4)) + 0.1
    line = TopsisRows(x, np.array([True, False, True, True])).along(
        np.array([0.0, 0.5, 0.3, 0.2]), 0
    )
    cols = rng.integers(0, 30, size=(7, 3))
    t = rng.random(7)
    sub = rng.integers(0, 7, size=5)
    np.testing.assert_array_equal(line.take(cols)(t[sub], sub), line(t[sub], cols[sub]))
