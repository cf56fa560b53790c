"""The streamed rank-reversal checks equal the earlier all-at-once implementation.

The swap counter (inversions by divide and conquer instead of comparing every
pair), the passes over variants, the pair blocks of tests 2 and 3 and the
row blocks of the cycle search must change no result: every check is compared,
record for record, with the earlier code kept verbatim in
``_reference_reversal.py``, on many random cases (coarse values, so ties and
swaps occur), with the block sizes shrunk so that every pass boundary is hit.
The inversion count is also checked against its definition (pairs i < j with
a_i > a_j; Knuth, The Art of Computer Programming vol. 3, 2nd ed., 1998,
sec. 5.1.1).
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.assumptions import resolve
from ranker.report.words.checks import check_sentence
from ranker.score.methods import METHODS
from ranker.stress import batch, pairs, reversal, swaps
from ranker.stress.batch import Scorer, rank_batch

from . import _reference_reversal as ref


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.integers(0, 1200), st.integers(1, 50), st.integers(0, 10_000))
def test_inversions_match_definition(m, top, seed):
    """Strict inversions equal the pair count of the definition (ties are no inversion)."""
    rng = np.random.default_rng(seed)
    seq = rng.integers(0, top, size=m)
    brute = int(np.count_nonzero(np.triu(seq[:, None] > seq[None, :], 1)))
    assert swaps.inversions(seq) == brute
    # Nearly sorted (the banded count): sorted, then a few short moves.
    near = np.sort(seq)
    for _ in range(m // 10):
        i = int(rng.integers(0, max(1, m - 30)))
        near[i : i + 30] = rng.permutation(near[i : i + 30])
    brute = int(np.count_nonzero(np.triu(near[:, None] > near[None, :], 1)))
    assert swaps.inversions(near) == brute


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.integers(2, 60), st.data())
def test_pair_index_follows_triu_order(n, data):
    """Pairs by flat index are those of numpy's upper-triangle order."""
    ia, ib = np.triu_indices(n, 1)
    start = data.draw(st.integers(0, ia.size - 1))
    stop = data.draw(st.integers(start, ia.size))
    a, b = pairs.pair_index(start, stop, n)
    assert np.array_equal(a, ia[start:stop]) and np.array_equal(b, ib[start:stop])


@settings(max_examples=60, deadline=None, derandomize=True)
@given(
    st.integers(1, 40),
    st.integers(0, 12),
    st.integers(1, 6),
    st.integers(0, 10_000),
    st.sampled_from([1, 3, 200]),
)
def test_collect_equals_reference(n, v, levels, seed, cap):
    """Swap records, counts and lists equal the earlier pairwise counter."""
    rng = np.random.default_rng(seed)
    g0 = rng.integers(0, levels, size=n).astype(float)
    r0 = rank_batch(g0)
    goods = g0 + rng.integers(-1, 2, size=(v, n)) * rng.random((v, n))
    goods = np.round(goods, 1)
    ranks = rank_batch(goods) if v else np.zeros((0, n), dtype=int)
    kept = rng.random((v, n)) < 0.9
    best = set(np.nonzero(r0 == 1)[0].tolist())
    ids = [f"C{i}" for i in range(n)]
    changed = rng.integers(0, n, size=v).tolist()
    col = swaps.Collector(ids, changed, r0, g0, best, cap)  # every variant in one pass
    col.add(0, ranks, goods, kept)
    new = col.result()
    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(ref, "MAX_DETAILS", cap)
        old = ref._collect(ids, changed, r0, g0, ranks, goods, kept, best)
    assert new == old


@settings(max_examples=30, deadline=None, derandomize=True)
@given(st.integers(3, 40), st.integers(0, 10_000), st.sampled_from([1, 7, 64]))
def test_three_cycles_equal_reference(n, seed, block):
    """Cycles found a block of rows at a time are those found on the whole matrix."""
    rng = np.random.default_rng(seed)
    upper = np.triu(rng.random((n, n)) < 0.5, 1)
    tie = np.triu(rng.random((n, n)) < 0.1, 1)
    prefer = (upper & ~tie) | (~upper & ~tie & np.triu(np.ones((n, n), bool), 1)).T
    prefer = prefer.astype(float)
    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(pairs, "ROW_BLOCK", block)
        for limit in (1, 5, 10_000):
            assert pairs.three_cycles(prefer.astype(np.float32), limit) == ref.three_cycles(
                prefer, limit
            )
        assert pairs._cycle_count(prefer.astype(np.float32)) == int(
            round(np.trace(prefer @ prefer @ prefer) / 3)
        )


def _same_with_words(new, old) -> None:
    """The records agree, and the words written from the new records' numbers
    (:func:`ranker.report.words.checks.check_sentence`) are the earlier sentences."""
    assert [check_sentence(r) for r in new] == [r["sentence"] for r in old]
    _same(
        [{k: v for k, v in r.items() if k != "facts"} for r in new],
        [{k: v for k, v in r.items() if k != "sentence"} for r in old],
    )


def _same(new, old, path="") -> None:
    """Equal records, floats to 1e-12: TOPSIS copies and removals are scored in closed form
    (:mod:`ranker.stress.variants`), equal to the kernel's scores to rounding."""
    if isinstance(old, float):
        assert isinstance(new, float) and abs(new - old) <= 1e-12, (path, new, old)
    elif isinstance(old, dict):
        assert new.keys() == old.keys(), path
        for key in old:
            _same(new[key], old[key], f"{path}.{key}")
    elif isinstance(old, list):
        assert len(new) == len(old), (path, len(new), len(old))
        for i, (a, b) in enumerate(zip(new, old, strict=True)):
            _same(a, b, f"{path}[{i}]")
    else:
        assert new == old, (path, new, old)


@pytest.mark.parametrize("key", sorted(METHODS))
@settings(max_examples=6, deadline=None, derandomize=True)
@given(
    n=st.integers(1, 16),
    k=st.integers(1, 4),
    seed=st.integers(0, 10_000),
    small=st.booleans(),
)
def test_all_checks_equal_reference(key, n, k, seed, small):
    """Every check's JSON record equals the earlier implementation's, pass boundaries included."""
    method = METHODS[key]
    opts = method.kernel_options(resolve({}))
    rng = np.random.default_rng(seed)
    x = rng.integers(1, 6, size=(n, k)).astype(float)  # coarse values: ties and swaps occur
    b = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k))
    ids = [f"C{i}" for i in range(n)]
    sc = Scorer(method.kernel, b, method.higher_is_better, opts)
    with pytest.MonkeyPatch.context() as mp:
        if small:  # a few variants per kernel call and per pass
            mp.setattr(batch, "ELEMENT_BUDGET", 3 * n * k)
            mp.setattr(swaps, "VARIANT_BUDGET", 1)
            mp.setattr(reversal, "PAIR_BLOCK", 7)
            mp.setattr(reversal, "MAX_DETAILS", 3)
            mp.setattr(ref, "MAX_DETAILS", 3)
            mp.setattr(pairs, "ROW_BLOCK", 3)
        new = [c.to_json() for c in reversal.all_checks(sc, x, w, ids)]
        old = [c.to_json() for c in ref.all_checks(sc, x, w, ids)]
    _same_with_words(new, old)


def test_all_checks_equal_reference_on_a_larger_topsis_case():
    """A 300-corridor TOPSIS case, where passes span many kernel chunks."""
    rng = np.random.default_rng(11)
    x = np.round(rng.uniform(1, 100, size=(300, 5)), 0)
    b = np.array([True, False, True, True, False])
    w = np.array([0.3, 0.2, 0.2, 0.15, 0.15])
    sc = Scorer(METHODS["topsis"].kernel, b, True, {"normalization": "vector"})
    ids = [f"C{i}" for i in range(300)]
    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(swaps, "VARIANT_BUDGET", 20_000)
        mp.setattr(reversal, "PAIR_BLOCK", 9_999)
        mp.setattr(pairs, "ROW_BLOCK", 64)
        new = [c.to_json() for c in reversal.all_checks(sc, x, w, ids)]
    old = [c.to_json() for c in ref.all_checks(sc, x, w, ids)]
    _same_with_words(new, old)
