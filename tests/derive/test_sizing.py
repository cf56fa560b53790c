"""Charger sizing: Erlang B/C against textbook values, formulas and a simulation."""

from __future__ import annotations

import math

import numpy as np
import pytest
import simpy
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.assumptions import resolve
from ranker.derive.sizing import (
    QUEUE_METRICS,
    blocking_probability_erlang_b,
    charger_sizing,
    mean_wait_erlang_c,
    ports_energy_balance,
    ports_erlang_c,
    sites_spacing,
    wait_probability_erlang_c,
)


def _erlang_b_recursion(c: int, a: float) -> float:
    """B(0) = 1, B(k) = A B(k-1) / (k + A B(k-1)) (Gross et al. 2008, sec. 2.6)."""
    b = 1.0
    for k in range(1, c + 1):
        b = a * b / (k + a * b)
    return b


def _erlang_c_textbook(c: int, a: float) -> float:
    """C = (A^c/c! c/(c-A)) / (sum_{k<c} A^k/k! + A^c/c! c/(c-A)) (Kleinrock 1975, sec. 3.5)."""
    top = a**c / math.factorial(c) * c / (c - a)
    return top / (sum(a**k / math.factorial(k) for k in range(c)) + top)


def test_erlang_c_3_servers_load_2_is_4_9_kleinrock_1975():
    """C(c=3, A=2) = 4/9; Wq = C / (c mu - lambda) = 0.4444 service times at lambda 2, mu 1
    (Kleinrock 1975, Queueing Systems vol. 1; Gross, Shortle, Thompson & Harris 2008;
    REFERENCES grade B/C)."""
    assert float(wait_probability_erlang_c(3, 2.0)) == pytest.approx(4 / 9, rel=1e-12)
    assert float(mean_wait_erlang_c(3, 2.0, 1.0)) == pytest.approx(4 / 9, rel=1e-12)


def test_erlang_b_3_servers_load_2_and_the_b_to_c_identity():
    """B(3, 2) = 0.2105 (REFERENCES grade C) and C = B / (1 - rho (1 - B))."""
    b = float(blocking_probability_erlang_b(3, 2.0))
    assert b == pytest.approx(0.2105, abs=5e-5)
    rho = 2.0 / 3.0
    assert b / (1 - rho * (1 - b)) == pytest.approx(4 / 9, rel=1e-12)


@settings(max_examples=200, deadline=None)
@given(c=st.integers(1, 60), a=st.floats(0.01, 80.0))
def test_erlang_b_matches_the_recursion(c, a):
    assert float(blocking_probability_erlang_b(c, a)) == pytest.approx(
        _erlang_b_recursion(c, a), rel=1e-9, abs=1e-300
    )


@settings(max_examples=100, deadline=None)
@given(
    c=st.lists(st.integers(0, 300), min_size=1, max_size=40),
    a=st.lists(st.floats(0.0, 400.0), min_size=1, max_size=40),
)
def test_erlang_b_equals_scipys_poisson_ratio(c, a):
    """Vectorised over mixed server counts: B = pmf(c; A) / cdf(c; A) with
    scipy.special's xlogy, gammaln and gammaincc (the library formulation)."""
    from scipy.special import gammaincc, gammaln, xlogy

    n = min(len(c), len(a))
    cs, loads = np.array(c[:n], float), np.array(a[:n], float)
    cdf = gammaincc(cs + 1.0, loads)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        ref = np.exp(xlogy(cs, loads) - loads - gammaln(cs + 1.0)) / cdf
    ref = np.where(cdf > 0.0, np.minimum(ref, 1.0), 1.0)
    np.testing.assert_allclose(
        blocking_probability_erlang_b(cs, loads), ref, rtol=1e-9, atol=1e-300
    )
    grid = blocking_probability_erlang_b(cs[:, None], loads[None, :])  # broadcasting
    assert grid.shape == (n, n)
    np.testing.assert_allclose(np.diag(grid), ref, rtol=1e-9, atol=1e-300)


@settings(max_examples=60, deadline=None)
@given(c=st.integers(401, 2500), ratio=st.floats(0.05, 20.0))
def test_erlang_b_beyond_the_recursion_limit_equals_the_recursion(c, ratio):
    """Above RECURSION_MAX_SERVERS: scipy's Poisson ratio (A < c) and the
    falling series (A >= c) against the recursion run all the way
    (Gross et al. 2008, sec. 2.3)."""
    from ranker.derive.sizing import RECURSION_MAX_SERVERS, _erlang_b_recursion

    assert c > RECURSION_MAX_SERVERS
    cs, a = np.array([float(c)]), np.array([c * ratio])
    full = _erlang_b_recursion(cs, a, np.ones(1, bool))
    np.testing.assert_allclose(blocking_probability_erlang_b(cs, a), full, rtol=1e-9, atol=1e-300)


def test_erlang_b_heavy_overload_keeps_its_value():
    """Far past overload B -> 1 - c / A (Kleinrock 1975, sec. 3.5); the Poisson
    ratio in floating point loses it where the cdf underflows (c 140, A 1180)."""
    b = float(blocking_probability_erlang_b(140, 1180.0))
    assert b == pytest.approx(_erlang_b_recursion(140, 1180.0), rel=1e-12)
    assert 1 - 140 / 1180 < b < 1


def test_ports_for_enormous_loads_follow_square_root_staffing():
    """A load of 1e8 Erlang at one site still sizes, without stepping through
    1e8 servers, and lands on Halfin and Whitt's (1981) heavy-traffic answer
    c = A + beta sqrt(A) with 1 / (1 + beta Phi(beta) / phi(beta)) = 0.2."""
    from scipy.optimize import brentq
    from scipy.stats import norm

    beta = brentq(lambda x: 1 / (1 + x * norm.cdf(x) / norm.pdf(x)) - 0.2, 0.01, 5.0)
    c = ports_erlang_c(np.array([1e8]), 1.0, max_wait_probability=0.2)
    assert c[0] == pytest.approx(1e8 + beta * 1e4, abs=3.0)


@settings(max_examples=200, deadline=None)
@given(c=st.integers(1, 60), frac=st.floats(0.01, 0.99))
def test_erlang_c_matches_the_textbook_sum(c, frac):
    a = c * frac
    assert float(wait_probability_erlang_c(c, a)) == pytest.approx(
        _erlang_c_textbook(c, a), rel=1e-9
    )


def test_unstable_and_empty_queues():
    np.testing.assert_array_equal(
        wait_probability_erlang_c([2, 2, 0], [2.0, 5.0, 0.0]), [1.0, 1.0, 0.0]
    )
    assert np.isinf(mean_wait_erlang_c(2, 3.0, 1.0))


def _simulate_mm_c(servers: int, lam: float, mu: float, n: int, seed: int):
    """Waits of n customers of an M/M/c queue, simulated with simpy."""
    rng = np.random.default_rng(seed)
    gaps = rng.exponential(1 / lam, n)
    service = rng.exponential(1 / mu, n)
    env = simpy.Environment()
    pool = simpy.Resource(env, capacity=servers)
    waits = np.empty(n)

    def customer(i):
        arrive = env.now
        with pool.request() as req:
            yield req
            waits[i] = env.now - arrive
            yield env.timeout(service[i])

    def source():
        for i in range(n):
            yield env.timeout(gaps[i])
            env.process(customer(i))

    env.process(source())
    env.run()
    return waits


def test_erlang_c_against_simpy_simulation():
    """Discrete-event simulation of M/M/3 at lambda 2, mu 1 (simpy): the share who wait and
    the mean wait agree with C = 4/9 and Wq = 4/9 within four batch-means standard errors."""
    waits = _simulate_mm_c(3, 2.0, 1.0, 40_000, seed=20240611)[2_000:]
    batches = waits.reshape(38, -1)
    for stat, expected in ((batches > 0).mean(axis=1), 4 / 9), (batches.mean(axis=1), 4 / 9):
        se = stat.std(ddof=1) / np.sqrt(stat.size)
        assert abs(stat.mean() - expected) < 4 * se
        assert se < 0.03  # the check is sharp enough to mean something


def _fewest_ports_brute_force(a, t, metric, limit):
    c = 0
    while True:
        if a == 0:
            return 0
        if c > a:
            value = _erlang_c_textbook(c, a)
            # A value equal to its target meets it (to 1e-12 relative, both ways of rounding).
            if metric == "wait_probability" and value <= limit * (1 + 1e-12):
                return c
            if metric == "mean_wait" and value * t / (c - a) * 60 <= limit * (1 + 1e-12):
                return c
        c += 1


@settings(max_examples=60, deadline=None)
@given(
    loads=st.lists(st.floats(0.0, 40.0), min_size=1, max_size=20),
    t=st.floats(0.2, 3.0),
    metric=st.sampled_from(sorted(QUEUE_METRICS)),
    limit=st.floats(0.01, 0.9),
)
def test_ports_erlang_c_is_the_fewest_meeting_the_target(loads, t, metric, limit):
    """The vectorised search equals a scalar search with the textbook formula."""
    limit_kw = {"max_wait_probability": limit, "max_mean_wait_min": limit * 30}
    got = ports_erlang_c(loads, t, queue_metric=metric, **limit_kw)
    lim = limit if metric == "wait_probability" else limit * 30
    want = [_fewest_ports_brute_force(a, t, metric, lim) for a in loads]
    np.testing.assert_array_equal(got, want)


def test_energy_balance_and_spacing():
    """ceil(E / (P H U)) and max(1, ceil(L / spacing))."""
    per_port = 350.0 * 24 * 0.25
    np.testing.assert_array_equal(
        ports_energy_balance(
            [0.0, per_port, per_port * 1.001],
            charger_power_kw=350.0,
            operating_hours_per_day=24.0,
            target_utilization=0.25,
        ),
        [0.0, 1.0, 2.0],
    )
    np.testing.assert_array_equal(
        sites_spacing([0.5, 100.0, 100.1], site_spacing_mi=50.0), [1.0, 2.0, 3.0]
    )


def test_no_electric_trucks_still_gets_the_coverage_minimum():
    a = resolve({"min_ports_per_site": 2})
    out = charger_sizing(
        length_mi=[120.0],
        trucks_per_day=[0.0],
        electric_share=0.3,
        energy_kwh_per_pass=[200.0],
        assumptions=a,
    )
    assert out["sites"][0] == 3 and out["ports"][0] == 6
    assert out["governing_rule"][0] == "minimum"


@settings(max_examples=60, deadline=None)
@given(
    tpd=st.lists(st.floats(0.0, 20_000.0), min_size=2, max_size=2),
    share=st.floats(0.0, 1.0),
    length=st.floats(1.0, 400.0),
    metric=st.sampled_from(sorted(QUEUE_METRICS)),
    peak=st.floats(0.02, 0.5),
)
def test_more_trucks_never_need_fewer_ports(tpd, share, length, metric, peak):
    a = resolve({"queue_metric": metric, "peak_hour_share": peak})
    lo, hi = sorted(tpd)
    kw = dict(
        length_mi=[length, length],
        electric_share=share,
        assumptions=a,
        energy_kwh_per_pass=[1.8 * length] * 2,
    )
    out = charger_sizing(trucks_per_day=[lo, hi], **kw)
    assert out["ports"][1] >= out["ports"][0]
    assert (
        np.all(out["wait_probability"] <= a["max_wait_probability"] + 1e-12)
        or metric == "mean_wait"
    )
