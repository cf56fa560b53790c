"""The optimised plan: choose and schedule corridors as a mixed-integer program.

The decision is ``x[i, t] = 1`` when corridor ``i`` is funded (complete) in
plan year ``t``, binary, with ``sum_t x[i, t] <= 1``. With ``v[i, t]`` the
objective's value of completing ``i`` in ``t``, ``c_i`` its cost and ``B_t``
the year's budget, the program is the multi-period capital-budgeting
program of Lorie and Savage [1] and Weingartner [2], one start per project:

    maximise    sum_i sum_t v[i, t] x[i, t]
    subject to  sum_t x[i, t] <= 1                        for each corridor i
                sum_i c_i x[i, t] <= B_t                  each year (no carry-over, no split)
          or    b[t] = b[t-1] + B_t - sum_i c_i x[i, t]   each year, b[t] >= 0, b[-1] = 0

where ``b[t]`` is the balance left at the end of year ``t``.

**How it is solved.** Without carry-over or splitting the program is
passed as written. With the balance, it is passed in the equivalent
"complete by" variables ``y[i, t] = x[i, 0] + ... + x[i, t]`` (so
``x[i, t] = y[i, t] - y[i, t-1]``, ``y`` non-decreasing in ``t``, and
``sum_t x[i, t] <= 1`` is ``y[i, T-1] <= 1``). The balance equation summed
over the years reads ``b[t] + sum_i c_i y[i, t] = B_0 + ... + B_t``: one
knapsack row per year on binaries, on which the solver's cuts and branching
work far better than on the ``x`` form (on an invented 50 corridors x 10
years case the ``x`` form had not proven its optimum after 20 s; this form
did in about 2 s). The objective becomes
``sum_i sum_t (v[i, t] - v[i, t+1]) y[i, t]`` with ``v[i, T] = 0``. The two
forms are related by an invertible linear map, so they have the same optima
and the same linear relaxation, hence the same bound and gap; such
"complete by" (step) variables are standard in lot-sizing and scheduling
models, Pochet and Wolsey [5].

The balance form serves both carry-over and splitting. With carry-over, the
balance is cash held. Without carry-over but with splitting, a year's money
can only go to corridors, but it may go to one finished later; a set of
completion years can be paid for exactly when, for every year, the costs of
the corridors complete by then do not exceed the budgets to then (Hall's
condition for these nested choices; paying earliest-due first shows it is
enough, Jackson [3]). That is the balance form again, the balance being
money not yet tied to a finished corridor. :mod:`ranker.plan.schedule`
turns the completion years back into payments.

The program is solved by HiGHS [4] through its own binding (:mod:`.highs`).

References
----------
.. [1] J. H. Lorie and L. J. Savage, "Three problems in rationing capital",
   Journal of Business 28(4):229-239, 1955.
.. [2] H. M. Weingartner, "Mathematical Programming and the Analysis of
   Capital Budgeting Problems", Prentice-Hall, 1963.
.. [3] J. R. Jackson, "Scheduling a production line to minimize maximum
   tardiness", Research Report 43, Management Science Research Project,
   UCLA, 1955.
.. [4] Q. Huangfu and J. A. J. Hall, "Parallelizing the dual revised simplex
   method", Mathematical Programming Computation 10(1):119-142, 2018.
   doi:10.1007/s12532-017-0130-5
.. [5] Y. Pochet and L. A. Wolsey, "Production Planning by Mixed Integer
   Programming", Springer, 2006.
"""

from __future__ import annotations

import time
from dataclasses import dataclass

import numpy as np

from .highs import Rows, solve_milp

#: Relative gap at which the solver may stop and call the plan optimal [-].
MIP_REL_GAP = 1e-7
#: Seconds the solver may take before it stops with its best plan so far [s].
TIME_LIMIT_S = 20.0


@dataclass
class MilpArrays:
    """What the solver found.

    Attributes
    ----------
    completed : ndarray of int, shape (n,) or None
        Plan-year index in which each corridor is complete, -1 if it is not
        funded; None when the solver found no plan in time [-].
    value : float
        Objective value of that plan (objective's unit).
    bound : float
        The solver's proven upper bound on the best value (objective's unit).
    gap : float
        ``(bound - value) / |value|`` as reported by the solver; 0 when
        proven optimal to its tolerance [-].
    status : int
        :func:`scipy.optimize.milp`'s status codes (0 optimal, 1 limit reached) [-].
    message : str
        The solver's message.
    seconds : float
        Wall-clock time of the solve [s].
    """

    completed: np.ndarray | None
    value: float
    bound: float
    gap: float
    status: int
    message: str
    seconds: float


def milp_kernel(
    cost: np.ndarray,
    value: np.ndarray,
    budget: np.ndarray,
    *,
    cumulative: bool,
    time_limit: float | None = TIME_LIMIT_S,
    mip_rel_gap: float = MIP_REL_GAP,
) -> MilpArrays:
    """Find completion years that maximise the total value within the budgets.

    Parameters
    ----------
    cost : ndarray, shape (n,)
        Capital cost per corridor [USD].
    value : ndarray, shape (n, T)
        Value of completing corridor ``i`` in plan year ``t`` (objective's
        unit); entries of zero or less are never chosen.
    budget : ndarray, shape (T,)
        Capital available in each plan year [USD].
    cumulative : bool
        True when money can be held over (carry-over) or sunk into a
        corridor finished later (splitting): the balance form. False: each
        year's completions are paid from that year's budget alone.
    time_limit : float or None
        Seconds the solver may take; None for no limit [s].
    mip_rel_gap : float
        Relative gap at which the solver stops [-].

    Returns
    -------
    MilpArrays
        The plan found, its value, the solver's bound and gap.

    References
    ----------
    .. [1] H. M. Weingartner, "Mathematical Programming and the Analysis of
       Capital Budgeting Problems", Prentice-Hall, 1963.
    .. [2] Q. Huangfu and J. A. J. Hall, "Parallelizing the dual revised
       simplex method", Mathematical Programming Computation 10(1):119-142,
       2018. doi:10.1007/s12532-017-0130-5

    Examples
    --------
    >>> import numpy as np
    >>> r = milp_kernel(np.array([6.0, 5.0, 4.0]), np.array([[6.0], [5.0], [4.0]]),
    ...                 np.array([9.0]), cumulative=False)
    >>> r.completed, r.value
    (array([-1,  0,  0]), 9.0)
    """
    cost = np.asarray(cost, dtype=float)
    value = np.asarray(value, dtype=float)
    budget = np.asarray(budget, dtype=float)
    n, big_t = value.shape
    nx = n * big_t
    if n == 0 or big_t == 0:
        return MilpArrays(np.full(n, -1), 0.0, 0.0, 0.0, 0, "nothing to plan", 0.0)
    # Scale money and value to order one so the solver's tolerances mean the same at any size.
    # A corridor dearer than the whole budget can never be funded; leaving its cost in the
    # scale would push every other coefficient below the solver's tolerance.
    never = cost > budget.sum()
    value = np.where(never[:, None], 0.0, value)
    money = max(float(budget.max(initial=0.0)), float(cost[~never].max(initial=0.0)), 1.0)
    c = np.minimum(cost, 2 * budget.sum() + 1) / money
    b = budget / money
    worth = max(float(value.max(initial=0.0)), 1e-300)
    v = value / worth

    if cumulative:
        objective, upper, integrality, constraints = _complete_by_form(c, v, b)
    else:
        objective, upper, integrality, constraints = _per_year_form(c, v, b)
    start = time.perf_counter()
    res = solve_milp(
        objective,
        upper=upper,
        integrality=integrality,
        rows=constraints,
        mip_rel_gap=float(mip_rel_gap),
        time_limit=None if time_limit is None else float(time_limit),
    )
    seconds = time.perf_counter() - start
    if res.x is None:
        bound = -float(res.mip_dual_bound) * worth if res.mip_dual_bound is not None else np.inf
        return MilpArrays(None, np.nan, bound, np.inf, int(res.status), str(res.message), seconds)
    z = res.x[:nx].reshape(n, big_t) > 0.5
    if cumulative:  # y[i, t] = 1 from the completion year on
        chosen = z & ~np.concatenate([np.zeros((n, 1), bool), z[:, :-1]], axis=1)
    else:
        chosen = z
    completed = np.where(chosen.any(axis=1), chosen.argmax(axis=1), -1)
    total = float(value[chosen].sum())
    bound = -float(res.mip_dual_bound) * worth if res.mip_dual_bound is not None else total
    bound = max(bound, total)
    if bound - total <= 1e-12 * worth:
        gap = 0.0
    else:  # as milp's mip_gap: |primal - dual bound| / |primal|
        gap = (bound - total) / abs(total) if total != 0 else np.inf
    return MilpArrays(completed, total, bound, gap, int(res.status), str(res.message), seconds)


def _per_year_form(c: np.ndarray, v: np.ndarray, b: np.ndarray):
    """Build the program in ``x[i, t]`` with one budget row per year (scaled units)."""
    n, big_t = v.shape
    nx = n * big_t
    allowed = (v > 0) & (c[:, None] <= b[None, :] * (1 + 1e-12))
    var = np.arange(nx)
    corridor = np.repeat(np.arange(n), big_t)
    year = np.tile(np.arange(big_t), n)
    constraints = [
        Rows(corridor, var, np.ones(nx), np.full(n, -np.inf), np.ones(n)),  # sum_t x[i, t] <= 1
        Rows(
            year, var, np.repeat(c, big_t), np.full(big_t, -np.inf), b
        ),  # sum_i c_i x[i, t] <= B_t
    ]
    objective = -np.where(allowed, v, 0.0).ravel()
    return objective, allowed.ravel().astype(float), np.ones(nx), constraints


def _complete_by_form(c: np.ndarray, v: np.ndarray, b: np.ndarray):
    """Build the balance program in ``y[i, t]`` (complete by ``t``) and ``b[t]`` (scaled units)."""
    n, big_t = v.shape
    nx = n * big_t
    budget_to = np.cumsum(b)
    allowed = (v.max(axis=1, initial=0.0) > 0)[:, None] & (
        c[:, None] <= budget_to[None, :] * (1 + 1e-12)
    )
    var = np.arange(nx)
    year = np.tile(np.arange(big_t), n)
    # b[t] + sum_i c_i y[i, t] = B_0 + ... + B_t: the balance equation summed over years
    balance = Rows(
        np.concatenate([year, np.arange(big_t)]),
        np.concatenate([var, nx + np.arange(big_t)]),
        np.concatenate([np.repeat(c, big_t), np.ones(big_t)]),
        budget_to,
        budget_to,
    )
    later = var[year > 0]
    k = later.size
    # y[i, t] - y[i, t-1] >= 0, i.e. x[i, t] >= 0
    steps = Rows(
        np.concatenate([np.arange(k), np.arange(k)]),
        np.concatenate([later, later - 1]),
        np.concatenate([np.ones(k), -np.ones(k)]),
        np.zeros(k),
        np.full(k, np.inf),
    )
    constraints = [balance]
    if k:
        constraints.append(steps)
    gain = v.copy()
    gain[:, :-1] -= v[:, 1:]  # v[i, t] - v[i, t+1]
    objective = np.concatenate([-np.where(allowed, gain, 0.0).ravel(), np.zeros(big_t)])
    upper = np.concatenate([allowed.ravel().astype(float), np.full(big_t, np.inf)])
    integrality = np.concatenate([np.ones(nx), np.zeros(big_t)])
    return objective, upper, integrality, constraints
