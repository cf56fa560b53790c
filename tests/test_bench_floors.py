"""The plain-numpy floors of ``bench/stages.py`` compute what the stages compute.

A floor is only a fair yardstick if it does the same job: on random
continuous matrices (no ties, where the floors' shortcuts hold) each floor
must give the stage's numbers exactly. The floors follow the published
definitions: TOPSIS (Hwang & Yoon 1981, pp. 128-134), SMAA-2 rank
acceptability (Lahdelma & Salminen 2001), tests 2 and 3 of Wang &
Triantaphyllou (2008) and the circular-triad count of Kendall & Babington
Smith (1940).
"""

from __future__ import annotations

import importlib.util
from pathlib import Path

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.score.topsis import topsis
from ranker.stress.acceptability import rank_acceptability, weights_dirichlet
from ranker.stress.batch import Scorer
from ranker.stress.reversal import clone, leave_one_out, pairwise, replace_worse

ROOT = Path(__file__).resolve().parents[1]


def _stages():
    spec = importlib.util.spec_from_file_location("stages", ROOT / "bench" / "stages.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


STAGES = _stages()


def _case(n, k, seed):
    rng = np.random.default_rng(seed)
    x = rng.uniform(0.5, 10.0, size=(n, k))
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k) * 3)
    return x, w, benefit, Scorer(topsis, benefit, True, {"normalization": "vector"})


@settings(max_examples=25, deadline=None, derandomize=True)
@given(st.integers(2, 60), st.integers(2, 8), st.integers(0, 10_000))
def test_acceptability_floor_equals_stage(n, k, seed):
    x, w, benefit, sc = _case(n, k, seed)
    draws = weights_dirichlet(w, 300, rng=np.random.default_rng(seed), concentration=30.0)
    stage = rank_acceptability(sc, x, draws).acceptability
    assert np.array_equal(STAGES.floor_acceptability(x, draws, benefit, chunk=37), stage)


@settings(max_examples=25, deadline=None, derandomize=True)
@given(st.integers(3, 60), st.integers(2, 8), st.integers(0, 10_000))
def test_pairs_floor_equals_stage(n, k, seed):
    x, w, benefit, sc = _case(n, k, seed)
    trans, agree = pairwise(sc, x, w, [f"C{i}" for i in range(n)])
    _, cycles, disagree = STAGES.floor_pairs(x, w, benefit)
    assert (trans.count, agree.count) == (cycles, disagree)


@settings(max_examples=25, deadline=None, derandomize=True)
@given(
    st.integers(3, 60),
    st.integers(2, 8),
    st.integers(0, 10_000),
    st.sampled_from(["worse", "clone", "loo"]),
)
def test_variant_floor_equals_stage(n, k, seed, kind):
    """Test 1, clones and leave-one-out: the floor's swaps are the check's."""
    x, w, benefit, sc = _case(n, k, seed)
    check = {"worse": replace_worse, "clone": clone, "loo": leave_one_out}[kind]
    got = check(sc, x, w, [f"C{i}" for i in range(n)])
    counts, top = STAGES.floor_variant_swaps(x, w, benefit, kind, block=7)
    assert STAGES._same_swaps(got, counts, top) == "yes"
    # Not vacuous: the check does reorder some of these cases (see test_swaps_occur).


def test_swaps_occur():
    """The random cases above include reordering ones, so the comparison can fail."""
    found = {"worse": 0, "clone": 0, "loo": 0}
    for seed in range(40):
        x, w, benefit, sc = _case(40, 5, seed)
        for kind in found:
            counts, top = STAGES.floor_variant_swaps(x, w, benefit, kind)
            found[kind] += int(counts.sum())
    assert all(v > 0 for v in found.values()), found
