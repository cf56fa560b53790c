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
from ranker.stress.reversal import pairwise

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
