"""The rank counts added entry by entry equal the earlier dense histogram per chunk.

Every field of :func:`ranker.stress.acceptability.rank_acceptability` is
compared with the earlier implementation kept verbatim in
``_reference_acceptability.py``, on many random cases: with distinct values
the acceptabilities are exact counts and must be identical; with coarse
values (ties spread a sample over several ranks) the shares are summed in
another order and must agree to 1e-12. The percentile blocks are shrunk so
that every block boundary is hit.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.assumptions import resolve
from ranker.score.methods import METHODS
from ranker.stress import acceptability, batch
from ranker.stress.acceptability import rank_acceptability, weights_dirichlet
from ranker.stress.batch import Scorer

from . import _reference_acceptability as ref

FIELDS = (
    "acceptability",
    "first_rank",
    "central_weights",
    "confidence",
    "pair_swap_share",
    "pair_diff_low",
    "pair_diff_high",
)


def _case(n, k, seed, coarse, spread_on, method):
    rng = np.random.default_rng(seed)
    x = rng.integers(1, 4, size=(n, k)).astype(float) if coarse else rng.random((n, k)) + 0.1
    m = METHODS[method]
    scorer = Scorer(
        m.kernel, rng.random(k) < 0.5, m.higher_is_better, m.kernel_options(resolve({}))
    )
    w = rng.random(k) + 0.05
    draws = weights_dirichlet(w / w.sum(), 97, rng=rng, concentration=20.0)
    spread = np.where(rng.random(k) < 0.5, 0.2, 0.0) if spread_on else np.zeros(k)
    pairs = np.stack([np.arange(n - 1), np.arange(1, n)], axis=1)
    return scorer, x, draws, spread, pairs


@settings(max_examples=50, deadline=None, derandomize=True)
@given(
    st.integers(2, 30),
    st.integers(1, 5),
    st.integers(0, 10_000),
    st.booleans(),
    st.booleans(),
    st.sampled_from(sorted(METHODS)),
    st.sampled_from([1, 7, 10_000]),
)
def test_counts_equal_reference(n, k, seed, coarse, spread_on, method, block):
    """Identical without ties, within 1e-12 with them; every other field identical."""
    scorer, x, draws, spread, pairs = _case(n, k, seed, coarse, spread_on, method)

    def run(module):
        return module.rank_acceptability(
            scorer,
            x,
            draws,
            spread=spread,
            rng_values=np.random.default_rng(seed + 1),
            rng_confidence=np.random.default_rng(seed + 2),
            pairs=pairs,
        )

    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(acceptability, "PERCENTILE_BUDGET", block)
        mp.setattr(batch, "ELEMENT_BUDGET", 64)  # many small chunks
        new = run(acceptability)
        old = run(ref)
    for name in FIELDS:
        a, b = getattr(new, name), getattr(old, name)
        if name in ("acceptability", "first_rank") and coarse:
            assert np.allclose(a, b, rtol=0, atol=1e-12), name
        else:
            assert np.array_equal(a, b, equal_nan=True), name
    assert new.samples == old.samples and new.confidence_draws == old.confidence_draws
    assert new.notes == old.notes


def test_large_case_equals_reference():
    """600 corridors x 8 criteria, 2,000 samples: every count identical."""
    scorer, x, draws, spread, pairs = _case(600, 8, 3, False, False, "topsis")
    draws = np.repeat(draws, 21, axis=0)[:2000]
    new = rank_acceptability(scorer, x, draws, pairs=pairs)
    old = ref.rank_acceptability(scorer, x, draws, pairs=pairs)
    for name in FIELDS:
        assert np.array_equal(getattr(new, name), getattr(old, name), equal_nan=True), name
