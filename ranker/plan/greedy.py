"""The greedy plan: fund corridors in rank order while the money lasts.

The rule, year by year:

1. The year's money is its budget, plus the balance carried from the year
   before when carry-over is on.
2. A corridor already started (split) is paid first, as far as the money goes.
3. Then the corridors not yet funded are taken in priority order. One that
   fits in what is left is funded in full. One that does not fit is
   **skipped, and the next is tried** (skip-and-continue, not stop-at-first-
   misfit), so money is not left idle behind a corridor that is too dear.
4. With splitting allowed, a corridor that does not fit and is too expensive
   for one year (its cost exceeds the year's money in step 1) is started
   with what is left, provided the money to the end of the plan can finish
   it; the rest is a first claim on the following years. At most one
   corridor is part-paid at a time. A corridor that would fit in a full
   year is never split: it is skipped and waits, whole.
5. A corridor is complete in the year its last part is paid.

The kernel runs many priority orders at once (one per Monte Carlo sample):
the loop is over plan years and priority positions, each step a vector
operation over samples.

References
----------
.. [1] G. B. Dantzig, "Discrete-variable extremum problems", Operations
   Research 5(2):266-288, 1957 (the greedy rule for the knapsack problem,
   here applied in rank order rather than by value per dollar).
.. [2] H. Kellerer, U. Pferschy and D. Pisinger, "Knapsack Problems",
   Springer, 2004, sec. 2.1 (greedy heuristics and their worst cases).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass
class GreedyArrays:
    """What the greedy kernel found, per sample and corridor.

    Attributes
    ----------
    completed : ndarray of int, shape (s, n)
        Plan-year index in which the corridor is complete; -1 if it is not
        complete within the years run [-].
    started : ndarray of int, shape (s, n)
        Plan-year index of the corridor's first payment; -1 if none [-].
    spend : ndarray, shape (s, n, T) or None
        Payments per corridor and year, when asked for [USD].
    """

    completed: np.ndarray
    started: np.ndarray
    spend: np.ndarray | None


def money_tolerance(cost: np.ndarray, budget: np.ndarray) -> float:
    """Return the amount below which two sums of money count as equal [USD].

    Parameters
    ----------
    cost : ndarray
        Corridor costs [USD].
    budget : ndarray
        Budget per year [USD].

    Returns
    -------
    float
        ``1e-9`` of the larger of the total budget and the dearest corridor,
        at least ``1e-9`` [USD].
    """
    scale = max(float(np.sum(budget)), float(np.max(cost, initial=0.0)), 1.0)
    return 1e-9 * scale


def greedy_kernel(
    cost: np.ndarray,
    order: np.ndarray,
    budget: np.ndarray,
    *,
    carry_over: bool,
    allow_split: bool,
    n_years: int | None = None,
    record_spend: bool = False,
) -> GreedyArrays:
    """Run the greedy rule for one or many priority orders.

    Parameters
    ----------
    cost : ndarray, shape (n,)
        Capital cost per corridor [USD].
    order : ndarray of int, shape (n,) or (s, n)
        Corridor positions in priority order, one row per sample [-].
    budget : ndarray, shape (T,)
        Capital available in each plan year [USD].
    carry_over : bool
        Whether money left at the end of a year is added to the next.
    allow_split : bool
        Whether a corridor too expensive for one year may be paid over
        several consecutive years.
    n_years : int, optional
        Run only the first ``n_years`` plan years (the money of later years
        still counts when deciding whether a split corridor can be
        finished). Default: all.
    record_spend : bool
        Whether to return the payments per corridor and year (memory
        ``s * n * T`` floats).

    Returns
    -------
    GreedyArrays
        Completion and start year index per sample and corridor; the
        payments when asked for.

    References
    ----------
    .. [1] G. B. Dantzig, "Discrete-variable extremum problems", Operations
       Research 5(2):266-288, 1957.

    Examples
    --------
    >>> import numpy as np
    >>> g = greedy_kernel(np.array([6.0, 5.0, 3.0]), np.array([0, 1, 2]), np.array([9.0]),
    ...                   carry_over=False, allow_split=False)
    >>> g.completed
    array([[ 0, -1,  0]])
    """
    cost = np.asarray(cost, dtype=float)
    order = np.atleast_2d(np.asarray(order, dtype=int))
    budget = np.asarray(budget, dtype=float)
    s, n = order.shape
    big_t = budget.size
    run = big_t if n_years is None else min(int(n_years), big_t)
    tol = money_tolerance(cost, budget)
    after = np.concatenate([np.cumsum(budget[::-1])[::-1][1:], [0.0]])  # money of later years
    rows = np.arange(s)
    completed = np.full((s, n), -1, dtype=int)
    started = np.full((s, n), -1, dtype=int)
    spend = np.zeros((s, n, big_t)) if record_spend else None
    carry = np.zeros(s)
    commit = np.full(s, -1, dtype=int)  # corridor being part-paid, -1 if none
    owed = np.zeros(s)
    free_cost = bool((cost <= tol).any())
    for t in range(run):
        money = budget[t] + carry
        # 2. finish what was started, first claim on the year's money
        has = commit >= 0
        pay = np.where(has, np.minimum(owed, money), 0.0)
        owed -= pay
        if spend is not None and has.any():
            spend[rows[has], commit[has], t] += pay[has]
        done = has & (owed <= tol)
        completed[rows[done], commit[done]] = t
        commit[done] = -1
        owed[done] = 0.0
        left = money - pay
        # 3. and 4. walk the priority order
        for k in range(n):
            if not free_cost and not (left > tol).any():
                break
            i = order[:, k]
            c = cost[i]
            open_ = started[rows, i] < 0
            fits = open_ & (c <= left + tol)
            if fits.any():
                completed[rows[fits], i[fits]] = t
                started[rows[fits], i[fits]] = t
                if spend is not None:
                    spend[rows[fits], i[fits], t] += c[fits]
                left = np.where(fits, np.maximum(left - c, 0.0), left)
            if allow_split:
                split = (
                    open_
                    & ~fits
                    & (commit < 0)
                    & (c > money + tol)
                    & (left > tol)
                    & (left + after[t] >= c - tol)
                )
                if split.any():
                    started[rows[split], i[split]] = t
                    commit[split] = i[split]
                    owed[split] = c[split] - left[split]
                    if spend is not None:
                        spend[rows[split], i[split], t] += left[split]
                    left = np.where(split, 0.0, left)
        carry = left if carry_over else np.zeros(s)
    return GreedyArrays(completed, started, spend)
