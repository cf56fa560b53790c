"""Rank-reversal checks (Wang & Triantaphyllou 2008, Omega 36(1):45-63, tests 1-3).

Verdicts are compared with scikit-criteria's checkers (``skcriteria.ranksrev``
0.10: RankInvariantChecker, RankTransitivityChecker, RankClonesChecker) on a
TOPSIS pipeline with vector scaling, on a few small random matrices (those
checkers make one pipeline call per pair or mutation and are slow).
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.assumptions import resolve
from ranker.report.words import Namer
from ranker.report.words.checks import check_sentence
from ranker.score.methods import METHODS
from ranker.score.ranks import rank_scores
from ranker.score.topsis import topsis
from ranker.score.weighted_sum import weighted_sum
from ranker.stress.batch import Scorer
from ranker.stress.reversal import (
    all_checks,
    clone,
    leave_one_out,
    pairwise,
    replace_worse,
    worsen,
)

from ._helpers import skc_dm, skc_topsis_pipeline


def _pymcdm_topsis(x, w, benefit):
    from pymcdm.methods import TOPSIS
    from pymcdm.normalizations import vector_normalization

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        return TOPSIS(normalization_function=vector_normalization)(
            np.asarray(x, float), np.asarray(w, float), np.where(benefit, 1, -1)
        )


def test_topsis_reversal_by_adding_a_dominated_alternative_garcia_cascales_lamata():
    """Adding an alternative reverses two others under TOPSIS, and the checks flag it.

    The phenomenon is the one García-Cascales & Lamata (2012), "On rank
    reversal and TOPSIS method", Math. Comput. Modelling 56:123-132, report:
    the vector-normalised TOPSIS order of A and B depends on which other
    alternatives are present. Their printed matrix is not reproduced here
    (from memory only); the case below is constructed: D is dominated by B
    and by C, yet adding D puts A ahead of B. The scores are confirmed with
    pymcdm's TOPSIS.
    """
    x = np.array([[9.0, 1.0], [2.0, 6.0], [7.0, 5.0], [2.0, 4.0]])  # A, B, C, D
    w, b = np.array([0.5, 0.5]), np.array([True, True])
    three, four = _pymcdm_topsis(x[:3], w, b), _pymcdm_topsis(x, w, b)
    assert three[1] > three[0] and four[0] > four[1]  # B ahead of A, then A ahead of B
    ids = ["A", "B", "C", "D"]
    checks = {c.check: c for c in all_checks(Scorer(topsis, b), x, w, ids)}
    loo = checks["leave_one_out"]
    assert not loo.passed
    swap = next(d for d in loo.details if d["changed"] == "D")
    assert {swap["corridor_id"], swap["other_id"]} == {"A", "B"}
    assert swap["score_gap_before"] == pytest.approx(four[0] - four[1], abs=1e-12)
    assert swap["score_gap_after"] == pytest.approx(three[0] - three[1], abs=1e-12)
    assert "Removing corridor D makes" in check_sentence(loo.to_json())


def _skc_checks(x, w, b, ids, seed=1):
    from skcriteria.ranksrev import (
        RankClonesChecker,
        RankInvariantChecker,
        RankTransitivityChecker,
    )

    pipe, dm = skc_topsis_pipeline(), skc_dm(x, w, b, ids)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        inv = RankInvariantChecker(pipe, random_state=seed).evaluate(dm)
        trans = RankTransitivityChecker(pipe).evaluate(dm)
        clones = RankClonesChecker(pipe).evaluate(dm)
    return inv, trans, clones


@pytest.mark.parametrize("seed", [0, 1, 2, 3, 4, 5, 6, 7])
def test_same_verdicts_as_scikit_criteria(seed):
    """Tests 1, 2, 3 and clones agree with scikit-criteria on random 6 x 3 matrices.

    Test 1 is fed scikit-criteria's own mutations (its worse alternatives are
    random); for each mutation both must agree on whether first place held.
    """
    rng = np.random.default_rng(seed)
    x = rng.uniform(1, 10, size=(6, 3))
    b = np.array([True, False, True])
    w = np.array([0.5, 0.3, 0.2])
    ids = [f"A{i}" for i in range(6)]
    inv, trans, clones = _skc_checks(x, w, b, ids)
    sc = Scorer(topsis, b)
    t2, t3 = pairwise(sc, x, w, ids)
    assert t2.passed == bool(trans.extra_.test_criterion_2)
    assert t3.passed == bool(trans.extra_.test_criterion_3)
    reference = inv.named_ranks["Reference"].to_series()
    best = reference.idxmin()
    for name, rank in inv.named_ranks.items():
        if name == "Reference":
            continue
        info = rank.extra_.rank_inv_check
        j = ids.index(info.mutated)
        row = x[j] + info.noise.to_numpy()
        ours = replace_worse(sc, x, w, ids, replacements={j: row})
        assert ours.passed == bool(rank.to_series()[best] == 1)
    cl = clone(sc, x, w, ids)
    changed = set(cl.changed)
    for name, rank in clones.named_ranks.items():
        if name == "Reference":
            continue
        alt = name.removeprefix("D.")
        s = rank.to_series()[ids]
        same = np.array_equal(rank_scores(-s.to_numpy()), rank_scores(-reference[ids].to_numpy()))
        assert same == (alt not in changed)


def test_verdict_cases_cover_pass_and_fail():
    """The random cases above include both outcomes for tests 2-3 (so they can fail)."""
    outcomes = set()
    for seed in range(8):
        rng = np.random.default_rng(seed)
        x = rng.uniform(1, 10, size=(6, 3))
        t2, t3 = pairwise(
            Scorer(topsis, np.array([True, False, True])),
            x,
            np.array([0.5, 0.3, 0.2]),
            [str(i) for i in range(6)],
        )
        outcomes.add(t3.passed)
    assert outcomes == {True, False}


def test_worsen_rule():
    """Worse by 5% of the range on every criterion that varies; never past zero."""
    x = np.array([[10.0, 0.5, 7.0, -1.0], [20.0, 40.0, 7.0, -30.0], [30.0, 60.0, 7.0, -2.0]])
    b = np.array([True, True, False, False])
    out = worsen(x, b)
    assert np.allclose(out[:, 0], x[:, 0] - 1.0)  # range 20 -> 1 down
    assert out[0, 1] == 0.0 and np.allclose(out[1:, 1], x[1:, 1] - 2.975)  # stops at zero
    assert np.array_equal(out[:, 2], x[:, 2])  # constant criterion: unchanged
    assert out[0, 3] == 0.0 and np.allclose(out[1:, 3], x[1:, 3] + 1.45)  # cost goes up, to 0


@settings(max_examples=30, deadline=None, derandomize=True)
@given(st.integers(2, 7), st.integers(1, 4), st.integers(0, 10_000))
def test_weighted_sum_on_min_max_survives_clones(n, k, seed):
    """A copy leaves every column's min and max alone, so min-max weighted sums never reverse."""
    rng = np.random.default_rng(seed)
    x = rng.uniform(0, 10, size=(n, k))
    check = clone(
        Scorer(weighted_sum, rng.random(k) < 0.5),
        x,
        rng.dirichlet(np.ones(k)),
        [str(i) for i in range(n)],
    )
    assert check.passed and check.count == 0


def test_test1_flags_loss_of_first_place():
    """Making a non-first corridor worse hands first place over (TOPSIS); test 1 fails.

    Constructed case (Wang & Triantaphyllou's test 1 phenomenon for TOPSIS):
    B is first; A made 5% of each range worse on both criteria puts C first.
    The orders are confirmed with pymcdm's TOPSIS.
    """
    x = np.array([[3.0, 7.0], [4.0, 6.0], [5.0, 5.0], [6.0, 2.0]])
    w, b = np.array([0.5, 0.5]), np.array([True, True])
    worse_a = worsen(x, b)[0]
    assert np.all(worse_a < x[0])
    changed = x.copy()
    changed[0] = worse_a
    assert rank_scores(_pymcdm_topsis(x, w, b))[1] == 1
    assert rank_scores(_pymcdm_topsis(changed, w, b))[2] == 1
    chk = replace_worse(Scorer(topsis, b), x, w, list("ABCD"))
    assert not chk.passed and chk.count == 1
    d = chk.details[0]
    assert (d["changed"], d["corridor_id"], d["other_id"]) == ("A", "B", "C")
    assert d["affects_first"] and d["ranks_after"] == [2, 1]
    after = _pymcdm_topsis(changed, w, b)
    assert d["score_gap_after"] == pytest.approx(after[1] - after[2], abs=1e-12)
    assert "hands first place from corridor B to corridor C" in check_sentence(chk.to_json())


def test_sentences_and_json_shape():
    """Every check is JSON-ready with the four contract keys."""
    rng = np.random.default_rng(4)
    x = rng.uniform(1, 10, size=(5, 3))
    for c in all_checks(
        Scorer(topsis, np.array([True, True, False])),
        x,
        np.array([0.4, 0.4, 0.2]),
        list("ABCDE"),
    ):
        rec = c.to_json()
        assert {"check", "passed", "details", "facts"} <= set(rec)
        assert isinstance(rec["passed"], bool) and check_sentence(rec, Namer({"A": "North Spur"}))


def _brute_swaps(r0, ranks, kept):
    """Swapped pairs (a above b before, below after) among the kept corridors, by loops."""
    return {(a, b) for a in kept for b in kept if r0[a] < r0[b] and ranks[a] > ranks[b]}


@pytest.mark.parametrize("key", sorted(METHODS))
@settings(max_examples=8, deadline=None, derandomize=True)
@given(seed=st.integers(0, 10_000))
def test_stacked_checks_equal_scoring_each_variant_alone(key, seed):
    """Test 1, clones and leave-one-out scored as stacks give the swaps of one-by-one scoring.

    Each modified matrix is scored on its own with the 2-D kernel and the
    swaps are counted pair by pair (the definition in the module notes).
    """
    method = METHODS[key]
    opts = method.kernel_options(resolve({}))
    rng = np.random.default_rng(seed)
    n, k = 14, 3
    x = rng.integers(1, 30, size=(n, k)).astype(float)  # coarse values: near ties occur
    b = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k))
    ids = [f"C{i}" for i in range(n)]
    sc = Scorer(method.kernel, b, method.higher_is_better, opts)
    sign = 1.0 if method.higher_is_better else -1.0

    def ranks_of(m):
        return rank_scores(sign * method.kernel(m, w, b, **opts))

    r0 = ranks_of(x)
    first = {i for i in range(n) if r0[i] == 1}
    worse = worsen(x, b)
    expected = {"replace_worse": [], "clone": [], "leave_one_out": []}
    for j in range(n):
        rest = [i for i in range(n) if i != j]
        if j not in first:
            m = x.copy()
            m[j] = worse[j]
            expected["replace_worse"].append((j, _brute_swaps(r0, ranks_of(m), rest)))
        expected["clone"].append((j, _brute_swaps(r0, ranks_of(np.vstack([x, x[j]])), range(n))))
        short = np.zeros(n, dtype=int)
        short[rest] = ranks_of(np.delete(x, j, axis=0))
        expected["leave_one_out"].append((j, _brute_swaps(r0, short, rest)))
    checks = {
        "replace_worse": replace_worse(sc, x, w, ids),
        "clone": clone(sc, x, w, ids),
        "leave_one_out": leave_one_out(sc, x, w, ids),
    }
    for name, check in checks.items():
        swaps = expected[name]
        total = sum(len(s) for _, s in swaps)
        top = sum(1 for _, s in swaps for a, _ in s if a in first)
        lost = [ids[j] for j, s in swaps if any(a in first for a, _ in s)]
        assert check.changed == [ids[j] for j, s in swaps if s]
        assert check.first_lost == lost
        if name == "replace_worse":  # counts replacements that cost first place
            assert check.count == len(lost)
            sentence = check_sentence(check.to_json())
            assert (f"Lower down, {total - top:,} pair(s)" in sentence) == (total > top)
        else:
            assert check.count == total
        listed = {(d["changed"], d["corridor_id"], d["other_id"]) for d in check.details}
        every = {(ids[j], ids[a], ids[c]) for j, s in swaps for a, c in s}
        assert listed <= every and len(listed) == min(total, len(check.details))
