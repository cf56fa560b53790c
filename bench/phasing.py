"""Time the build plan's optimiser, greedy rule and year-one robustness.

Invented problems: 50, 200 and 1,000 corridors x 10 plan years, costs drawn
log-normal around 5 million USD, scores uniform, each year's budget 5 % of
the total cost (so about half the corridors can be funded). Both budget
modes are timed: "balance" (carry-over or splitting on, the default) and
"per-year" (both off, a harder program). The solver runs with a time limit
so the largest case finishes; the optimality gap it reports is printed.
Times are printed with their ratio to the 50-corridor run of the same mode,
measured in the same process.

Reproduce with::

    PYTHONPATH=. python bench/phasing.py [--time-limit 30] [--years 10] [--samples 10000] [--seed 7]

``--against-scipy`` also solves every program with ``scipy.optimize.milp``
(HiGHS as scipy bundles it) in the same process and prints its time and the
ratio of the two plans' values.
"""

from __future__ import annotations

import argparse
import sys
import time

import numpy as np

from ranker.plan import optimise
from ranker.plan.greedy import greedy_kernel
from ranker.plan.highs import MilpSolution
from ranker.plan.objectives import value_score
from ranker.plan.optimise import milp_kernel
from ranker.plan.robust import year_one_share


def case(n: int, years: int, rng: np.random.Generator):
    """Return invented costs [USD], scores [-] and budgets [USD]."""
    cost = rng.lognormal(np.log(5e6), 0.6, n)
    score = rng.uniform(0.05, 0.95, n)
    budget = np.full(years, 0.05 * cost.sum())
    return cost, score, budget


def scipy_solve_milp(cost, *, upper, integrality, rows, mip_rel_gap, time_limit):
    """The same program through ``scipy.optimize.milp`` (the reference)."""
    from scipy import sparse
    from scipy.optimize import Bounds, LinearConstraint, milp

    m = len(cost)
    constraints = [
        LinearConstraint(
            sparse.csr_matrix((r.value, (r.row, r.col)), shape=(r.lo.size, m)), r.lo, r.hi
        )
        for r in rows
    ]
    options = {"mip_rel_gap": mip_rel_gap, "presolve": True}
    if time_limit is not None:
        options["time_limit"] = time_limit
    res = milp(
        cost,
        integrality=integrality,
        bounds=Bounds(np.zeros(m), upper),
        constraints=constraints,
        options=options,
    )
    return MilpSolution(res.x, int(res.status), str(res.message), res.mip_dual_bound)


def main(argv: list[str] | None = None) -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--time-limit", type=float, default=30.0, help="solver time limit [s]")
    ap.add_argument("--years", type=int, default=10)
    ap.add_argument("--samples", type=int, default=10_000, help="score samples for year one")
    ap.add_argument("--seed", type=int, default=7)
    ap.add_argument("--against-scipy", action="store_true", help="also time scipy's milp")
    args = ap.parse_args(argv)
    rng = np.random.default_rng(args.seed)
    first: dict[str, float] = {}
    print(
        f"{'corridors':>9} {'mode':>9} {'milp_s':>8} {'x50':>6} {'gap':>9} {'status':>6} "
        f"{'greedy_s':>8} {'opt/greedy':>10}"
        + (f" {'scipy_s':>8} {'scipy/ours':>10} {'value ratio':>11}" if args.against_scipy else "")
    )
    years = np.arange(2027, 2027 + args.years)
    cases = {n: case(n, args.years, rng) for n in (50, 200, 1000)}
    for n, (cost, score, budget) in cases.items():
        value = value_score(score, years, 0.07)
        order = np.argsort(-score, kind="stable")
        for mode, cumulative in (("balance", True), ("per-year", False)):
            t0 = time.perf_counter()
            g = greedy_kernel(cost, order, budget, carry_over=cumulative, allow_split=False)
            tg = time.perf_counter() - t0
            done = g.completed[0]
            f = done >= 0
            vg = value[np.flatnonzero(f), done[f]].sum()
            m = milp_kernel(cost, value, budget, cumulative=cumulative, time_limit=args.time_limit)
            first.setdefault(mode, m.seconds)
            extra = ""
            if args.against_scipy:
                ours = optimise.solve_milp
                optimise.solve_milp = scipy_solve_milp
                try:
                    r = milp_kernel(
                        cost, value, budget, cumulative=cumulative, time_limit=args.time_limit
                    )
                finally:
                    optimise.solve_milp = ours
                extra = (
                    f" {r.seconds:>8.2f} {r.seconds / m.seconds:>10.2f} {r.value / m.value:>11.6f}"
                )
            print(
                f"{n:>9} {mode:>9} {m.seconds:>8.2f} {m.seconds / first[mode]:>6.1f} "
                f"{m.gap:>9.2e} {m.status:>6} {tg:>8.3f} {m.value / vg:>10.4f}" + extra
            )
    print(f"\nyear-one share over {args.samples} score samples (greedy rule re-run per sample):")
    ref = None
    for n, (cost, _score, budget) in cases.items():
        samples = rng.uniform(0.0, 1.0, (args.samples, n))
        t0 = time.perf_counter()
        year_one_share(cost, samples, budget, carry_over=True, allow_split=True)
        dt = time.perf_counter() - t0
        ref = ref or dt
        print(f"{n:>9} corridors {dt:>8.2f} s {dt / ref:>6.1f} x the 50-corridor run")
    print(
        f"\ncommand: PYTHONPATH=. {sys.executable} bench/phasing.py --time-limit {args.time_limit:g} "
        f"--years {args.years} --samples {args.samples} --seed {args.seed}"
        + (" --against-scipy" if args.against_scipy else "")
    )
    print(
        "status 0 = proven optimal within the relative gap 1e-7; 1 = stopped at the time limit "
        "(gap = (bound - value) / value, from the solver's dual bound)."
    )


if __name__ == "__main__":
    main()
