"""The dominance warning found from column bests equals the corridor-by-corridor search.

Corridor i dominates the others when it is at least as good on every
criterion and strictly better on at least one than each other corridor
(Pareto dominance; common practice). The earlier search, kept below
verbatim, compared every corridor with all others; the current one looks
only at corridors holding every column's best value. Both must warn about
exactly the same corridors on many random cases with ties and duplicates.
"""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.report.words import Namer
from ranker.report.words.stress import stress_warnings
from ranker.score.topsis import topsis
from ranker.stress.batch import Scorer
from ranker.stress.run import _input_warnings


def _reference_dominant(y: np.ndarray) -> list[int]:
    n = y.shape[0]
    out = []
    for i in range(n):
        others = np.delete(np.arange(n), i)
        if n > 1 and np.all(y[i] >= y[others]) and np.all((y[i] > y[others]).any(axis=1)):
            out.append(i)
    return out


@settings(max_examples=80, deadline=None, derandomize=True)
@given(st.integers(1, 12), st.integers(1, 4), st.integers(0, 10_000), st.integers(1, 4))
def test_dominance_warnings_equal_pairwise_search(n, k, seed, levels):
    rng = np.random.default_rng(seed)
    x = rng.integers(0, levels, size=(n, k)).astype(float)
    if rng.random() < 0.3:
        x[rng.integers(n)] = x.max(axis=0)  # a corridor best everywhere
    benefit = rng.random(k) < 0.5
    ids = [f"C{i}" for i in range(n)]
    warns, _ = _input_warnings(
        x,
        ids,
        [f"k{j}" for j in range(k)],
        np.full(k, 1.0 / k),
        np.zeros(k),
        "dirichlet",
        Scorer(topsis, benefit),
    )
    found = [w["corridor"] for w in warns if w["kind"] == "dominates"]
    said = [t for t in stress_warnings(warns, Namer(None, None)) if "dominates them" in t]
    assert [t.split(" ")[1] for t in said] == found
    expected = [ids[i] for i in _reference_dominant(x * np.where(benefit, 1.0, -1.0))]
    assert found == expected
