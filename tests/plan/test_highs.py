"""The HiGHS binding against ``scipy.optimize.milp`` (the same solver through scipy).

Random multi-year budgeting programs of both forms the planner builds
(binary choices under row budgets; integer and continuous variables with
equality rows) are solved by both; the status codes and optimal objective
values must agree.
"""

from __future__ import annotations

import subprocess
import sys

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import sparse
from scipy.optimize import Bounds, LinearConstraint, milp

from ranker.plan.highs import INFEASIBLE, OPTIMAL, Rows, solve_milp


def _random_program(seed: int):
    rng = np.random.default_rng(seed)
    m = int(rng.integers(1, 12))
    blocks = []
    for _ in range(int(rng.integers(1, 4))):
        k = int(rng.integers(1, 5))
        dense = rng.uniform(0, 5, (k, m)) * (rng.uniform(size=(k, m)) < 0.6)
        r, c = np.nonzero(dense)
        lo = np.where(rng.uniform(size=k) < 0.3, rng.uniform(0, 3, k), -np.inf)
        hi = lo + rng.uniform(0.5, 10, k)
        hi = np.where(np.isinf(lo), rng.uniform(0, 10, k), hi)
        blocks.append(Rows(r, c, dense[r, c], lo, hi))
    cost = -rng.uniform(0, 10, m)
    upper = np.where(rng.uniform(size=m) < 0.2, np.inf, rng.integers(1, 3, m).astype(float))
    integrality = (rng.uniform(size=m) < 0.7).astype(float)
    return cost, upper, integrality, blocks


@settings(max_examples=150, deadline=None)
@given(st.integers(0, 2**32 - 1))
def test_same_answers_as_scipy_milp(seed):
    cost, upper, integrality, blocks = _random_program(seed)
    m = cost.size
    constraints = [
        LinearConstraint(
            sparse.csr_matrix((b.value, (b.row, b.col)), shape=(b.lo.size, m)), b.lo, b.hi
        )
        for b in blocks
    ]
    # Variables with no upper bound and no row make some programs unbounded:
    # both must then say so (status 3).
    ref = milp(
        cost,
        integrality=integrality,
        bounds=Bounds(np.zeros(m), upper),
        constraints=constraints,
        options={"mip_rel_gap": 1e-9},
    )
    got = solve_milp(cost, upper=upper, integrality=integrality, rows=blocks, mip_rel_gap=1e-9)
    # scipy's presolve may stop at "infeasible or unbounded" (4) where the full
    # solve proves "infeasible" (2): both say there is no solution.
    agree = got.status == ref.status or (got.status, ref.status) == (2, 4)
    assert agree, (got.message, ref.message)
    if ref.status == OPTIMAL:
        assert abs(cost @ got.x - ref.fun) <= 1e-6 * (1 + abs(ref.fun))
        x = got.x
        assert np.all(x >= -1e-6) and np.all(x <= upper + 1e-6)  # HiGHS feasibility tolerance
        whole = integrality > 0
        np.testing.assert_allclose(x[whole], np.round(x[whole]), atol=1e-6)
        for b in blocks:
            lhs = np.bincount(b.row, weights=b.value * x[b.col], minlength=b.lo.size)
            assert np.all(lhs >= b.lo - 1e-6) and np.all(lhs <= b.hi + 1e-6)


def test_infeasible_program_has_no_solution():
    # x0 + x1 >= 3 with both binary: no solution (common practice example).
    rows = [Rows(np.array([0, 0]), np.array([0, 1]), np.ones(2), np.array([3.0]), np.array([4.0]))]
    got = solve_milp(-np.ones(2), upper=np.ones(2), integrality=np.ones(2), rows=rows)
    assert got.status == INFEASIBLE and got.x is None


def test_knapsack_worked_example():
    # 0/1 knapsack of the HiGHS distribution's Python example (ERGO-Code,
    # HiGHS 1.x, examples/knapsack.py):
    # values 8, 5, 3, 11, 7; weights 4, 3, 1, 5, 4; capacity 11 -> items 0, 2, 3, value 22.
    w = np.array([4.0, 3.0, 1.0, 5.0, 4.0])
    rows = [Rows(np.zeros(5, int), np.arange(5), w, np.array([-np.inf]), np.array([11.0]))]
    got = solve_milp(
        -np.array([8.0, 5.0, 3.0, 11.0, 7.0]), upper=np.ones(5), integrality=np.ones(5), rows=rows
    )
    assert got.status == OPTIMAL
    assert np.round(got.x).tolist() == [1, 0, 1, 1, 0]
    assert got.mip_dual_bound <= -22.0 + 1e-9


def test_first_solver_banner_does_not_reach_stdout():
    code = (
        "import numpy as np; from ranker.plan.highs import solve_milp, Rows; "
        "solve_milp(-np.ones(1), upper=np.ones(1), integrality=np.ones(1), "
        "rows=[Rows(np.array([0]), np.array([0]), np.ones(1), np.array([-np.inf]), np.ones(1))]); "
        "print('done')"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout == "done\n", out.stdout


def test_solves_when_there_is_no_stdout_to_redirect():
    # A process started without a console has no file descriptor 1 (common practice).
    code = (
        "import os, numpy as np; os.close(1); "
        "from ranker.plan.highs import solve_milp, Rows; "
        "r = solve_milp(-np.ones(1), upper=np.ones(1), integrality=np.ones(1), "
        "rows=[Rows(np.array([0]), np.array([0]), np.ones(1), np.array([-np.inf]), np.ones(1))]); "
        "import sys; sys.stderr.write(str(r.status))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    assert out.returncode == 0 and out.stderr.strip().endswith("0"), out.stderr
