"""Year-one share of the greedy plan over score samples."""

from __future__ import annotations

import numpy as np
import pandas as pd
from hypothesis import given, settings
from hypothesis import strategies as st

import ranker.plan.robust as robust
from ranker.plan import build_plan
from ranker.plan.robust import year_one_share

from .reference import greedy_reference


@settings(max_examples=40, deadline=None, derandomize=True)
@given(
    st.integers(1, 8),
    st.integers(1, 3),
    st.integers(1, 30),
    st.integers(0, 2**32 - 1),
    st.booleans(),
    st.booleans(),
)
def test_share_matches_reference_per_sample(n, years, samples, seed, carry, split):
    rng = np.random.default_rng(seed)
    cost = rng.integers(1, 10, n).astype(float)
    budget = rng.integers(0, 15, years).astype(float)
    scores = rng.random((samples, n))
    got = year_one_share(cost, scores, budget, carry_over=carry, allow_split=split)
    count = np.zeros(n)
    for s in scores:
        _, started, _ = greedy_reference(
            cost.tolist(),
            np.argsort(-s, kind="stable").tolist(),
            budget.tolist(),
            carry_over=carry,
            allow_split=split,
        )
        count += started == 0
    assert np.allclose(got, count / samples)
    assert ((got >= 0) & (got <= 1)).all()
    if not split:  # on average no more than year one's money is spent in year one
        assert (got * cost).sum() <= budget[0] + 1e-9


def test_chunks_do_not_change_the_answer(monkeypatch):
    rng = np.random.default_rng(5)
    cost, budget = rng.integers(1, 10, 12).astype(float), np.array([20.0, 20.0])
    scores = rng.random((500, 12))
    whole = year_one_share(cost, scores, budget, carry_over=True, allow_split=True)
    monkeypatch.setattr(robust, "CHUNK", 7)
    assert np.array_equal(
        whole, year_one_share(cost, scores, budget, carry_over=True, allow_split=True)
    )


def test_samples_equal_to_the_scores_give_the_plan():
    """Every sample the same as the ranking's scores: share 1 for the corridors the
    greedy plan funds in year one, 0 for the rest."""
    ids = ["A", "B", "C", "D"]
    score = pd.Series([0.9, 0.7, 0.5, 0.3], index=ids)
    cost = pd.Series([4e6, 7e6, 3e6, 2e6], index=ids)
    budget = pd.DataFrame({"year": [2027, 2028], "capital_usd": [9e6, 9e6]})
    p = build_plan(
        cost,
        score,
        pd.Series([1, 2, 3, 4], index=ids),
        budget,
        sample_scores=np.tile(score.to_numpy(), (20, 1)),
    )
    first = p.greedy.set_index("corridor_id")["year_started"].eq(2027).fillna(False)
    assert p.year_one_share.to_dict() == {i: float(first[i]) for i in ids}
    assert p.year_one_share.name == "year_one_share"
