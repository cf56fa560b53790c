"""The plain-numpy floor of ``bench/floor_tipping.py`` computes what the tipping stage computes.

A floor is only a fair yardstick if it does the same job: on random
continuous matrices (no ties) the floor must give the stage's
:func:`ranker.stress.tipping.sweep_criterion` result, as defined in the
floor's docstring: the corridors that end each interval and the ranks just
beyond equal, the ends within 2e-6 of the swept weight. The sweep is the
one-at-a-time weight sensitivity of Triantaphyllou & Sanchez (1997);
the scores are TOPSIS on vector-normalised values (Hwang & Yoon 1981,
pp. 128-134).
"""

from __future__ import annotations

import importlib.util
from pathlib import Path

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.score.topsis import topsis
from ranker.stress.batch import Scorer
from ranker.stress.tipping import sweep_criterion

ROOT = Path(__file__).resolve().parents[1]


def _floor_module():
    spec = importlib.util.spec_from_file_location(
        "floor_tipping", ROOT / "bench" / "floor_tipping.py"
    )
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


FLOOR = _floor_module()


def _scorer(benefit):
    return Scorer(topsis, benefit, True, {"normalization": "vector"})


def _case(n, k, seed):
    rng = np.random.default_rng(seed)
    x = rng.uniform(0.5, 10.0, size=(n, k))
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k) * 3)
    return x, w, benefit


def _compare(x, w, benefit, criteria):
    """Differences (by field) between stage and floor, summed over the criteria."""
    sc = _scorer(benefit)
    total: dict[str, int] = {}
    interior = 0
    for c in criteria:
        sweep = sweep_criterion(sc, x, w, c)
        floor = FLOOR.floor_tipping(x, w, benefit, c, crowded=True)
        for key, v in FLOOR.differences(sweep, floor).items():
            total[key] = total.get(key, 0) + v
        interior += int(np.count_nonzero(floor[2] >= 0) + np.count_nonzero(floor[3] >= 0))
    return total, interior


@settings(max_examples=30, deadline=None, derandomize=True)
@given(st.integers(2, 300), st.integers(2, 8), st.integers(0, 10_000))
def test_floor_equals_stage_on_random_cases(n, k, seed):
    """Every field agrees; crowded corridors only loosen the rank check (see differences)."""
    x, w, benefit = _case(n, k, seed)
    # All criteria where cheap, else two of them, to keep the test fast.
    criteria = range(k) if n * k <= 600 else np.random.default_rng(seed).choice(k, 2, False)
    total, _ = _compare(x, w, benefit, criteria)
    total.pop("crowded")
    # Same result as defined in the floor's docstring (Triantaphyllou & Sanchez 1997
    # sweep; TOPSIS of Hwang & Yoon 1981): no field differs for any corridor.
    assert total == dict.fromkeys(total, 0), total


def test_random_cases_have_crossings():
    """The random comparison is not vacuous: most corridors' intervals end inside (0, 1)."""
    x, w, benefit = _case(120, 5, 3)
    total, interior = _compare(x, w, benefit, range(5))
    # Common practice: a check that can only pass on trivial cases proves nothing.
    assert interior > 120 * 5, interior
    assert sum(v for key, v in total.items() if key != "crowded") == 0, total


def test_two_corridors_cross_where_weighted_gaps_meet():
    """Two corridors, each best on one criterion: the closed-form crossing.

    With two corridors every column's ideal and anti-ideal are the two
    values, so corridor A (best on criterion 0) has d+ = w_1 D_1 and
    d- = w_0 D_0 (D_j the gap of the vector-normalised values), and A and B
    tie where w_0 D_0 = w_1 D_1: sweeping w_0 = t, w_1 = 1 - t, at
    t* = D_1 / (D_0 + D_1).
    """
    x = np.array([[9.0, 2.0], [3.0, 7.0]])
    benefit = np.array([True, True])
    w = np.array([0.7, 0.3])
    r = x / np.sqrt((x * x).sum(axis=0))
    gap = np.abs(r[0] - r[1])
    t_star = gap[1] / (gap[0] + gap[1])  # Hwang & Yoon 1981, closeness d- / (d+ + d-)
    low, high, low_by, high_by, low_rank, high_rank = FLOOR.floor_tipping(x, w, benefit, 0)
    # A leads at w_0 = 0.7 > t*: its interval runs down to t*, where B overtakes it
    # (Triantaphyllou & Sanchez 1997: the smallest weight change that reverses the pair).
    assert t_star < 0.7
    assert abs(low[0] - t_star) <= 2e-6 and abs(low[1] - t_star) <= 2e-6
    assert (low_by[0], low_by[1], low_rank[0], low_rank[1]) == (1, 0, 2, 1)
    # Above 0.7 nothing changes up to w_0 = 1 (common practice: -1 for no crossing).
    assert np.array_equal(high, [1.0, 1.0]) and np.array_equal(high_by, [-1, -1])
    assert np.array_equal(high_rank, [1, 2])
    sweep = sweep_criterion(_scorer(benefit), x, w, 0)
    assert FLOOR.differences(sweep, FLOOR.floor_tipping(x, w, benefit, 0, crowded=True)) == {
        "low": 0,
        "high": 0,
        "low_by": 0,
        "high_by": 0,
        "low_rank": 0,
        "high_rank": 0,
        "crowded": 0,
    }


def test_dominating_corridor_never_changes():
    """A corridor best on every criterion stays first over the whole sweep."""
    rng = np.random.default_rng(11)
    x = rng.uniform(1.0, 5.0, size=(12, 4))
    benefit = np.array([True, False, True, False])
    x[0] = np.where(benefit, 6.0, 0.5)  # best on every criterion
    w = np.array([0.4, 0.3, 0.2, 0.1])
    for c in range(4):
        low, high, low_by, high_by, low_rank, high_rank = FLOOR.floor_tipping(x, w, benefit, c)
        # Hwang & Yoon 1981: the ideal itself has closeness 1 under any weights.
        assert (low[0], high[0], low_by[0], high_by[0]) == (0.0, 1.0, -1, -1)
        assert (low_rank[0], high_rank[0]) == (1, 1)
        total, _ = _compare(x, w, benefit, [c])
        assert sum(v for key, v in total.items() if key != "crowded") == 0, total


def test_edge_weights_agree_with_stage():
    """Current weight on a grid point, one weight zero, and the swept weight at 1."""
    x, _, benefit = _case(40, 3, 21)
    for w in (
        np.array([0.5, 0.25, 0.25]),  # 0.5 is a grid point: no extra grid row
        np.array([0.6, 0.4, 0.0]),  # a criterion that carries no weight
        np.array([1.0, 0.0, 0.0]),  # the others share 1 - t equally
    ):
        total, _ = _compare(x, w, benefit, range(3))
        # Same result as the stage (Triantaphyllou & Sanchez 1997 sweep; common
        # practice for the degenerate weights: follow the stage's own rule).
        assert sum(v for key, v in total.items() if key != "crowded") == 0, (w, total)
