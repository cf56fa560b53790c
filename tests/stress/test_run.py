"""ranker.stress.run, the stress stage's entry point: degenerate inputs finish with warnings,
bad input names its sheet."""

from __future__ import annotations

import json

import numpy as np
import pandas as pd
import pytest

from ranker.report.words.stress import stress_warnings
from ranker.score.methods import METHODS
from ranker.score.ranks import rank_scores
from ranker.score.topsis import topsis
from ranker.score.weighted_sum import weighted_sum
from ranker.stress import Robustness, stress_test

from ._helpers import frame

CHECKS = ["replace_worse", "transitivity", "pairwise_agreement", "clone", "leave_one_out"]


def run(m, weights=None, benefit=None, *, shaken=True, **kw):
    """Run every analysis (with weight sets and, if shaken, 5% value noise on k0)."""
    weights = weights or {c: 1 / m.shape[1] for c in m.columns}
    benefit = benefit or {c: True for c in m.columns}
    kw.setdefault("samples", 400)
    kw.setdefault("kernel", topsis)
    sets = {"a": weights, "b": {c: float(i + 1) for i, c in enumerate(m.columns)}}
    noise = {m.columns[0]: 5.0} if shaken else None
    r = stress_test(m, weights, benefit, weight_sets=sets, uncertainty_pct=noise, **kw)
    assert isinstance(r, Robustness)
    json.dumps(r.to_json())  # JSON-ready
    assert [c["check"] for c in r.rank_reversal] == CHECKS
    assert all(c["facts"] for c in r.rank_reversal)
    if r.samples:
        acc = r.acceptability.to_numpy()
        assert np.allclose(acc.sum(axis=0), 1) and np.allclose(acc.sum(axis=1), 1)
    return r


def test_two_corridors():
    r = run(frame([[3.0, 1.0], [1.0, 3.0]]), {"k0": 0.6, "k1": 0.4})
    assert any("Only two corridors" in w for w in stress_warnings(r.warnings))
    assert r.acceptability.shape == (2, 2) and len(r.closeness) == 1
    assert {c["check"]: c["passed"] for c in r.rank_reversal}["transitivity"]
    tops = [t for t in r.tipping_points if t["kind"] == "top"]
    assert tops and all(0 <= t["weight_at"] <= 1 for t in tops)


def test_identical_corridors():
    r = run(frame([[3.0, 1.0], [3.0, 1.0], [1.0, 2.0]]), shaken=False)
    assert any(
        "identical values" in w and "C0" in w and "C1" in w for w in stress_warnings(r.warnings)
    )
    assert np.allclose(r.acceptability.loc["C0"], r.acceptability.loc["C1"])
    assert r.first_rank["C0"] == pytest.approx((1 - r.first_rank["C2"]) / 2, abs=1e-12)
    tie = r.closeness.set_index("corridor_id").loc["C0"]
    assert tie["practically_tied"] and tie["basis"] == "identical"
    assert not any({t["corridor_id"], t["other_id"]} == {"C0", "C1"} for t in r.tipping_points)


def test_all_corridors_identical():
    r = run(frame([[2.0, 2.0]] * 3), shaken=False)
    assert np.allclose(r.acceptability.to_numpy(), 1 / 3)
    assert r.tipping_points == [] and r.closeness["practically_tied"].all()


def test_constant_criterion():
    m = frame([[3.0, 7.0, 1.0], [1.0, 7.0, 3.0], [2.0, 7.0, 2.5]])
    r = run(m)
    assert any("k1 has the same value" in w for w in stress_warnings(r.warnings))
    assert set(r.rank_intervals["criterion"]) == {"k0", "k1", "k2"}


def test_single_criterion():
    m = frame([[3.0], [1.0], [2.0]])
    r = run(m, {"k0": 1.0}, {"k0": False}, samples=300)
    assert any("Only one criterion" in w for w in stress_warnings(r.warnings))
    assert r.tipping_points == [] and r.rank_intervals.empty
    # No weight can change the order; only the 5% value noise can, and it cannot
    # bridge gaps of 33-100%: acceptability is the order itself.
    expected = np.eye(3)[rank_scores(-m["k0"].to_numpy()) - 1]
    assert np.array_equal(r.acceptability.to_numpy(), expected)


def test_dominating_corridor():
    m = frame([[9.0, 9.0], [5.0, 2.0], [2.0, 6.0], [4.0, 4.0]])
    r = run(m)
    assert any("dominates" in w and "C0" in w for w in stress_warnings(r.warnings))
    assert r.first_rank["C0"] == 1.0 and r.confidence["C0"] == 1.0
    assert not [t for t in r.tipping_points if t["kind"] == "top"]
    top = r.rank_intervals[r.rank_intervals["corridor_id"] == "C0"]
    assert (top["weight_low"] == 0).all() and (top["weight_high"] == 1).all()


def test_single_corridor():
    r = run(frame([[1.0, 2.0]]))
    assert any("Only one corridor" in w for w in stress_warnings(r.warnings))
    assert r.acceptability.to_numpy().tolist() == [[1.0]] and r.closeness.empty


def test_lower_is_better_method():
    """VIKOR's Q (lower is better): rank 1 goes to the lowest Q."""
    rng = np.random.default_rng(0)
    m = frame(rng.uniform(1, 10, size=(6, 3)))
    w = {"k0": 0.5, "k1": 0.3, "k2": 0.2}
    b = {"k0": True, "k1": False, "k2": True}
    r = stress_test(
        m,
        w,
        b,
        kernel=METHODS["vikor"].kernel,
        higher_is_better=False,
        kernel_options={"v": 0.5},
        samples=500,
        concentration=5000.0,
    )
    q = METHODS["vikor"].kernel(
        m.to_numpy(), np.array(list(w.values())), np.array(list(b.values())), v=0.5
    )
    assert r.first_rank.idxmax() == m.index[int(np.argmin(q))]


def test_kernel_options_reach_the_kernel():
    m = frame([[1.0, 10.0], [2.0, 1.0], [3.0, 4.0]])
    w, b = {"k0": 0.5, "k1": 0.5}, {"k0": True, "k1": True}
    a = stress_test(m, w, b, kernel=topsis, samples=0, kernel_options={"normalization": "max"})
    c = stress_test(m, w, b, kernel=topsis, samples=0)
    assert a.rank_intervals["weight_high"].tolist() != c.rank_intervals["weight_high"].tolist()


def test_progress_is_reported_to_the_end():
    seen = []
    stress_test(
        frame([[1.0, 2.0], [2.0, 1.0], [3.0, 0.0]]),
        {"k0": 0.5, "k1": 0.5},
        {"k0": True, "k1": True},
        kernel=weighted_sum,
        samples=250,
        progress=lambda d, t: seen.append((d, t)),
    )
    assert seen[-1][0] == seen[-1][1] == 254
    assert all(b[0] >= a[0] for a, b in zip(seen, seen[1:], strict=False))


def test_weights_are_rescaled_with_a_warning():
    r = stress_test(
        frame([[1.0, 2.0], [2.0, 1.0]]),
        {"k0": 2.0, "k1": 2.0},
        {"k0": True, "k1": True},
        kernel=topsis,
        samples=0,
    )
    assert any("rescaled" in w for w in stress_warnings(r.warnings))
    assert r.rank_intervals["current_weight"].eq(0.5).all()


def test_json_summary_keys():
    r = stress_test(
        frame([[1.0, 2.0], [2.0, 1.0], [3.0, 1.5]]),
        {"k0": 0.5, "k1": 0.5},
        {"k0": True, "k1": False},
        kernel=topsis,
        samples=100,
        seed=7,
    )
    js = r.to_json()
    assert {"samples", "seed", "rank_reversal", "tipping_points"} <= set(js)
    assert js["samples"] == 100 and js["seed"] == 7
    assert all(len(v) == 3 for v in js["acceptability"].values())
    assert all(v is None or isinstance(v, float) for v in js["confidence"].values())


@pytest.mark.parametrize(
    ("change", "match"),
    [
        (dict(matrix=frame([[1.0, np.nan], [2.0, 1.0]])), "no usable value"),
        (dict(weights={"k0": 1.0}), "no weight for criterion 'k1'"),
        (dict(weights={"k0": -1.0, "k1": 1.0}), "weight of 'k0' is -1.0"),
        (dict(weights={"k0": 0.0, "k1": 0.0}), "every weight is zero"),
        (dict(sampling="latin"), "weight_sampling"),
        (dict(concentration=0.0), "weight_concentration"),
        (dict(uncertainty_pct={"k0": -5.0}), "uncertainty_pct of 'k0'"),
        (dict(samples=-1), "samples is -1"),
        (dict(seed=-3), "seed is -3"),
        (dict(weight_sets={"board": {"k0": 0.0}}), "weight set 'board'"),
        (dict(matrix=pd.DataFrame()), "no corridors"),
    ],
)
def test_bad_arguments_are_refused(change, match):
    """Library callers get a ValueError; a run's input never gets here (the reader
    refuses it first, naming the cell: see tests/workbook)."""
    args = dict(
        matrix=frame([[1.0, 2.0], [2.0, 1.0]]),
        weights={"k0": 0.5, "k1": 0.5},
        is_benefit={"k0": True, "k1": True},
        kernel=topsis,
        samples=10,
    )
    args.update(change)
    matrix, weights, benefit = args.pop("matrix"), args.pop("weights"), args.pop("is_benefit")
    with pytest.raises(ValueError, match=match):
        stress_test(matrix, weights, benefit, **args)


@pytest.mark.parametrize("key", ["topsis", "vikor"])
def test_weight_sample_scores_are_the_kernel_under_the_draws(key):
    """The plan's sample scores: the method's own kernel under the Monte Carlo's weight
    draws, turned so higher is better (VIKOR's Q is lower-is-better)."""
    from ranker.assumptions import resolve

    method = METHODS[key]
    opts = method.kernel_options(resolve({}))
    rng = np.random.default_rng(5)
    m = frame(rng.uniform(1, 10, size=(7, 3)))
    benefit = {"k0": True, "k1": False, "k2": True}
    r = stress_test(
        m,
        {"k0": 0.5, "k1": 0.3, "k2": 0.2},
        benefit,
        kernel=method.kernel,
        higher_is_better=method.higher_is_better,
        kernel_options=opts,
        samples=300,
    )
    got = r.weight_sample_scores()
    raw = method.kernel(m.to_numpy(), r.weight_draws, [True, False, True], **opts)
    expected = raw if method.higher_is_better else -raw
    assert got.shape == (300, 7)
    assert np.array_equal(got, expected)
    off = stress_test(m, {"k0": 1.0, "k1": 1.0, "k2": 1.0}, benefit, kernel=topsis, samples=0)
    assert off.weight_sample_scores() is None


def test_beside_returns_raises_and_never_holds_the_run():
    # The rank-reversal checks run on a second thread while the samples are scored
    # (common practice: numpy releases the interpreter lock in its array loops).
    import threading

    from ranker.stress.run import Beside

    assert Beside(lambda a, b: a + b, 2, 3).result() == 5
    with pytest.raises(ZeroDivisionError):
        Beside(lambda: 1 / 0).result()
    gate = threading.Event()
    job = Beside(gate.wait)
    assert job._thread.daemon  # a stopped run does not wait for it
    gate.set()
    assert job.result() is True


def test_checks_on_their_own_thread_give_what_they_give_alone():
    from ranker.stress.reversal import all_checks
    from ranker.stress.run import stress_test

    rng = np.random.default_rng(3)
    m = pd.DataFrame(
        rng.random((40, 3)), columns=["a", "b", "c"],
        index=pd.Index([f"C{i}" for i in range(40)], name="corridor_id"),
    )  # fmt: skip
    w = {"a": 0.5, "b": 0.3, "c": 0.2}
    benefit = {"a": True, "b": False, "c": True}
    got = stress_test(m, w, benefit, kernel=topsis, samples=50)
    from ranker.stress.batch import Scorer

    alone = all_checks(
        Scorer(topsis, np.array([True, False, True])), m.to_numpy(), np.array([0.5, 0.3, 0.2]),
        list(m.index),
    )  # fmt: skip
    assert got.rank_reversal == [c.to_json() for c in alone]
    assert any(not c.passed for c in alone)  # something to compare
