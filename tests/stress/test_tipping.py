"""Weight tipping points (one-at-a-time sweeps, Triantaphyllou & Sanchez 1997).

The weighted sum's crossings are checked against the closed form of two
score lines written out here from the min-max formula; TOPSIS's against
pymcdm's TOPSIS re-ranking just either side of each reported weight.
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.score.methods import METHODS
from ranker.score.ranks import rank_scores
from ranker.score.topsis import topsis
from ranker.score.weighted_sum import weighted_sum
from ranker.stress import stress_test
from ranker.stress.batch import Scorer
from ranker.stress.tipping import sweep_criterion, sweep_weights

from ._helpers import frame


def _minmax(x, benefit):
    """Min-max normalisation written out: (x - min)/(max - min), reversed for a cost."""
    lo, hi = x.min(axis=0), x.max(axis=0)
    span = np.where(hi > lo, hi - lo, 1.0)
    return np.where(benefit, (x - lo) / span, (hi - x) / span)


def _lines(x, benefit, w, c):
    """Intercept and slope of each corridor's weighted-sum score in the swept weight t.

    s_i(t) = t N_ic + (1 - t) / (1 - w_c) sum_{j != c} w_j N_ij.
    """
    n = _minmax(x, benefit)
    rest = (np.delete(n, c, axis=1) @ np.delete(w, c)) / (1 - w[c])
    return rest, n[:, c] - rest


def _nearest_crossings(a, b, t0):
    """For each i, the nearest t in [0, 1] above and below t0 where line i meets another."""
    n = a.size
    up, down = np.ones(n), np.zeros(n)
    for i in range(n):
        for j in range(n):
            if i == j or b[i] == b[j]:
                continue
            t = (a[j] - a[i]) / (b[i] - b[j])
            if t0 <= t <= 1:
                up[i] = min(up[i], t)
            if 0 <= t <= t0:
                down[i] = max(down[i], t)
    return down, up


@settings(max_examples=25, deadline=None, derandomize=True)
@given(st.integers(2, 7), st.integers(2, 4), st.integers(0, 10_000))
def test_weighted_sum_crossings_equal_closed_form(n, k, seed):
    """Rank intervals end exactly where two score lines cross (to 1e-12)."""
    rng = np.random.default_rng(seed)
    x = rng.uniform(0, 100, size=(n, k))
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k))
    for c in range(k):
        sw = sweep_criterion(Scorer(weighted_sum, benefit), x, w, c)
        a, b = _lines(x, benefit, w, c)
        down, up = _nearest_crossings(a, b, w[c])
        assert sw.exact
        assert np.allclose(sw.high, up, atol=1e-12) and np.allclose(sw.low, down, atol=1e-12)


def test_weighted_sum_top_tipping_point_is_the_crossing():
    """The reported top tipping point is the closed-form crossing of the two lines."""
    m = frame([[10.0, 300.0, 2.0], [14.0, 260.0, 1.0], [9.0, 150.0, 3.0], [12.0, 200.0, 5.0]])
    benefit = {"k0": True, "k1": False, "k2": True}
    w = {"k0": 0.5, "k1": 0.25, "k2": 0.25}
    r = stress_test(m, w, benefit, kernel=weighted_sum, samples=0)
    tops = [t for t in r.tipping_points if t["kind"] == "top"]
    assert tops
    x, bvec, wvec = m.to_numpy(), np.array(list(benefit.values())), np.array(list(w.values()))
    for t in tops:
        c = list(m.columns).index(t["criterion"])
        a, b = _lines(x, bvec, wvec, c)
        i, j = list(m.index).index(t["corridor_id"]), list(m.index).index(t["other_id"])
        assert t["weight_at"] == pytest.approx((a[j] - a[i]) / (b[i] - b[j]), abs=1e-12)
        assert t["exact"]
    cost = [t for t in tops if t["criterion"] == "k1"]
    from ranker.report.narrative import tipping_sentence
    from ranker.report.words import Namer

    assert "capital cost" in tipping_sentence(cost[0], Namer({}, {"k1": "capital cost"}))


def _pymcdm_ranks(x, w, benefit):
    from pymcdm.methods import TOPSIS
    from pymcdm.normalizations import vector_normalization

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        pref = TOPSIS(normalization_function=vector_normalization)(x, w, np.where(benefit, 1, -1))
    return rank_scores(pref)


@settings(max_examples=12, deadline=None, derandomize=True)
@given(st.integers(3, 8), st.integers(2, 4), st.integers(0, 10_000))
def test_topsis_tipping_points_confirmed_either_side(n, k, seed):
    """Re-ranking with pymcdm's TOPSIS 2e-6 either side of each tipping weight.

    On the current side the pair keeps its order; past it, the order flips
    (first place changes hands for a "top" tipping point).
    """
    rng = np.random.default_rng(seed)
    m = frame(rng.uniform(1, 100, size=(n, k)))
    benefit = dict(zip(m.columns, rng.random(k) < 0.5, strict=True))
    w = dict(zip(m.columns, rng.dirichlet(np.ones(k)), strict=True))
    r = stress_test(m, w, benefit, kernel=topsis, samples=0)
    x, bvec = m.to_numpy(), np.array(list(benefit.values()))
    wvec = np.array(list(w.values()))
    ids = list(m.index)
    for t in r.tipping_points:
        c = list(m.columns).index(t["criterion"])
        sign = 1.0 if t["direction"] == "above" else -1.0
        i, j = ids.index(t["corridor_id"]), ids.index(t["other_id"])
        before = _pymcdm_ranks(x, sweep_weights(wvec, c, [t["weight_at"] - sign * 2e-6])[0], bvec)
        after = _pymcdm_ranks(x, sweep_weights(wvec, c, [t["weight_at"] + sign * 2e-6])[0], bvec)
        now = _pymcdm_ranks(x, wvec, bvec)
        assert np.sign(before[i] - before[j]) == np.sign(now[i] - now[j])
        assert np.sign(after[i] - after[j]) != np.sign(now[i] - now[j])
        assert after[i] == t["rank_after"]
        if t["kind"] == "top":
            assert now[i] == 1 and after[j] == 1


@settings(max_examples=8, deadline=None, derandomize=True)
@given(
    st.integers(3, 6),
    st.integers(2, 3),
    st.integers(0, 10_000),
    st.sampled_from(["topsis", "weighted_product", "vikor"]),
)
def test_rank_intervals_match_a_dense_scan(n, k, seed, method):
    """Each corridor's interval equals a 1e-5 scan of the sweep (every registered method)."""
    rng = np.random.default_rng(seed)
    x = rng.uniform(1, 100, size=(n, k))
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k))
    meth = METHODS[method]
    sc = Scorer(meth.kernel, benefit, meth.higher_is_better)
    t = np.linspace(0, 1, 100_001)
    for c in range(k):
        sw = sweep_criterion(sc, x, w, c)
        scores = meth.kernel(x, sweep_weights(w, c, t), benefit)
        ranks = rank_scores(scores, higher_is_better=meth.higher_is_better)
        g0 = np.searchsorted(t, w[c])
        for i in range(n):
            same = ranks[:, i] == sw.ranks[i]
            hi = g0 + np.argmin(same[g0:]) - 1 if not same[g0:].all() else len(t) - 1
            lo = g0 - np.argmin(same[: g0 + 1][::-1]) + 1 if not same[: g0 + 1].all() else 0
            if not same[g0]:
                continue  # current weight sits exactly on a crossing
            assert abs(t[hi] - sw.high[i]) <= 2e-5 and abs(t[lo] - sw.low[i]) <= 2e-5


def test_sweep_keeps_the_other_weights_in_proportion():
    """w_j(t) = w_j (1 - t) / (1 - w_c); all-zero others share 1 - t equally."""
    w = np.array([0.2, 0.6, 0.2])
    out = sweep_weights(w, 0, np.array([0.0, 0.2, 0.5, 1.0]))
    assert np.allclose(out.sum(axis=1), 1.0)
    assert np.allclose(out[:3, 1] / out[:3, 2], 3.0)
    assert np.allclose(out[1], w)
    assert np.allclose(sweep_weights(np.array([1.0, 0.0, 0.0]), 0, [0.4])[0], [0.4, 0.3, 0.3])


def test_sentences_a_board_can_read():
    """Sentences name corridors and criteria as the planner did and give both weights."""
    m = frame([[10.0, 300.0], [14.0, 200.0], [9.0, 150.0]])
    r = stress_test(
        m,
        {"k0": 0.75, "k1": 0.25},
        {"k0": True, "k1": False},
        kernel=topsis,
        samples=0,
    )
    from ranker.report.narrative import tipping_sentence
    from ranker.report.words import Namer

    namer = Namer({"C0": "North Spur", "C1": "Valley Line"}, {"k1": "capital cost"})
    text = " ".join(tipping_sentence(t, namer) for t in r.tipping_points)
    assert "capital cost" in text and "0.25 now" in text
    assert "North Spur (C0)" in text or "Valley Line (C1)" in text
    from ranker.report.words.tipping import with_interval_sentences

    holds = with_interval_sentences(r.rank_intervals, namer)
    assert set(holds["criterion"]) == {"k0", "k1"} and len(holds) == 6
    for row in holds.to_dict(orient="records"):
        who = {"C0": "North Spur (C0)", "C1": "Valley Line (C1)"}.get(row["corridor_id"])
        who = who or f"Corridor {row['corridor_id']}"
        label = {"k1": "capital cost"}.get(row["criterion"], row["criterion"])
        if row["weight_low"] <= 0 and row["weight_high"] >= 1:
            assert row["sentence"].endswith(f"whatever the weight on {label} (0 to 1).")
        else:
            now = f"{row['current_weight']:.2f}"
            assert row["sentence"].startswith(f"{who} stays ")
            assert f"the weight on {label} is between" in row["sentence"]
            assert row["sentence"].endswith(f"it is {now} now.")


@pytest.mark.parametrize("kernel", [topsis, weighted_sum])
@pytest.mark.parametrize("solve", [True, False])
def test_equal_values_draw_level_when_the_criterion_has_all_the_weight(kernel, solve):
    """Two corridors with the same value on the swept criterion tie at w_c = 1 (each is
    scored on that criterion alone there), so the one behind draws level: its interval
    ends at 1 with the other named, the record gives both the shared rank, and the
    sentence says "level with", not "passing"; a crossing inside the sweep stays a pass."""
    from ranker.report import narrative
    from ranker.report.words import Namer, ordinal
    from ranker.stress.tipping import TOLERANCE, tipping_records

    # A and B share criterion 0's value and beat C and D on both; B is better on
    # criterion 1. C and D cross each other inside the sweep.
    x = np.array([[5.0, 3.5], [5.0, 4.0], [1.0, 2.0], [2.0, 1.0]])
    benefit = np.array([True, True])
    w = np.array([0.3, 0.7])
    sw = sweep_criterion(Scorer(kernel, benefit), x, w, 0, solve=solve)
    at_one = rank_scores(kernel(x, sweep_weights(w, 0, np.array([1.0]))[0], benefit))
    assert at_one[0] == at_one[1]  # the tie the check is about
    a = 0  # A, behind B now
    assert sw.ranks[a] > sw.ranks[1]
    assert abs(sw.high[a] - 1.0) <= TOLERANCE and sw.high_by[a] == 1 and sw.level[1][a]
    # Only A and B draw level (the weighted sum's closed form also ends B's interval there).
    assert not sw.level[-1].any() and set(np.flatnonzero(sw.level[1])) <= {0, 1}
    records, _ = tipping_records([sw], ["A", "B", "C", "D"], ["k0", "k1"])
    (tie,) = [r for r in records if {r["corridor_id"], r["other_id"]} == {"A", "B"}]
    assert tie["weight_at"] >= 1 - TOLERANCE
    assert tie["rank_after"] == tie["other_rank_after"] == at_one[0]
    text = narrative.tipping_sentence(tie, Namer())
    assert text.startswith("If k0 takes all of the weight (it has 0.30 now), corridor ")
    assert "level with corridor" in text and "passing" not in text and "takes first" not in text
    assert text.endswith(f"{ordinal(int(at_one[0]))}, level with corridor B.") or text.endswith(
        "draws level with corridor B for first place."
    )
    inside = [r for r in records if TOLERANCE < r["weight_at"] < 1 - TOLERANCE]
    assert inside and all(r["other_rank_after"] != r["rank_after"] for r in inside)
