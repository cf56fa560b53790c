"""Turn completion years into payments, and check a plan's payments.

A plan fixes the year each corridor is complete. The payments follow:

- without splitting, or with carry-over, a corridor is paid in full in the
  year it is complete (with carry-over, money is held until then);
- with splitting and no carry-over, a year's money cannot be held, so a
  corridor may draw on earlier years' money: each corridor, latest first, is
  paid from its completion year backwards, as late as the money allows. The
  payments of one corridor fall in consecutive plan years, and the plan can
  be paid this way exactly when, for every year, the costs of the corridors
  complete by then do not exceed the budgets to then (Jackson's
  earliest-due-date argument [1] run backwards in time).

References
----------
.. [1] J. R. Jackson, "Scheduling a production line to minimize maximum
   tardiness", Research Report 43, Management Science Research Project,
   UCLA, 1955.
"""

from __future__ import annotations

import numpy as np

from .greedy import money_tolerance


def payments(
    cost: np.ndarray,
    completed: np.ndarray,
    budget: np.ndarray,
    *,
    carry_over: bool,
    allow_split: bool,
    priority: np.ndarray | None = None,
) -> np.ndarray:
    """Compute the payments per corridor and year of a set of completion years.

    Parameters
    ----------
    cost : ndarray, shape (n,)
        Capital cost per corridor [USD].
    completed : ndarray of int, shape (n,)
        Plan-year index in which each corridor is complete, -1 if unfunded [-].
    budget : ndarray, shape (T,)
        Capital available in each plan year [USD].
    carry_over : bool
        Whether unspent money is added to the next year.
    allow_split : bool
        Whether a corridor may be paid over several years.
    priority : ndarray of int, shape (n,), optional
        Corridor positions in priority order; among corridors complete in
        the same year, the earlier in this order is paid from the latest
        money. Default: input order.

    Returns
    -------
    ndarray, shape (n, T)
        Payments [USD]. Each funded corridor's row sums to its cost.

    Raises
    ------
    RuntimeError
        When the completion years cannot be paid from the budgets (a plan
        that breaks its own constraints; never for a plan of this package).

    References
    ----------
    .. [1] J. R. Jackson, "Scheduling a production line to minimize maximum
       tardiness", Research Report 43, Management Science Research Project,
       UCLA, 1955.

    Examples
    --------
    >>> payments(np.array([4.0, 12.0]), np.array([0, 1]), np.array([10.0, 10.0]),
    ...          carry_over=False, allow_split=True)
    array([[ 4.,  0.],
           [ 2., 10.]])
    """
    cost = np.asarray(cost, dtype=float)
    completed = np.asarray(completed, dtype=int)
    budget = np.asarray(budget, dtype=float)
    n, big_t = cost.size, budget.size
    pay = np.zeros((n, big_t))
    funded = np.flatnonzero(completed >= 0)
    if carry_over or not allow_split:
        pay[funded, completed[funded]] = cost[funded]
        return pay
    tol = money_tolerance(cost, budget)
    pos = np.empty(n, dtype=int)
    pos[np.arange(n) if priority is None else np.asarray(priority)] = np.arange(n)
    left = budget.copy()
    # latest completion first; each draws from its own year backwards
    for i in sorted(funded, key=lambda j: (-completed[j], pos[j])):
        owed = cost[i]
        for t in range(completed[i], -1, -1):
            take = min(owed, left[t])
            pay[i, t] += take
            left[t] -= take
            owed -= take
            if owed <= tol:
                break
        if owed > tol:
            raise RuntimeError(
                f"completion years cannot be paid from the budgets: corridor at position {i} "
                f"is short of {owed:.6g} USD"
            )
    return pay


def completion_from_payments(pay: np.ndarray, completed: np.ndarray) -> np.ndarray:
    """Return the year each funded corridor's last part is paid.

    Parameters
    ----------
    pay : ndarray, shape (n, T)
        Payments [USD].
    completed : ndarray of int, shape (n,)
        Stated completion year index, -1 where unfunded; kept for a funded
        corridor that costs nothing [-].

    Returns
    -------
    ndarray of int, shape (n,)
        Plan-year index of the last payment, -1 where unfunded [-].
    """
    big_t = pay.shape[1]
    paid = pay > 0
    last = big_t - 1 - np.argmax(paid[:, ::-1], axis=1)
    return np.where(completed < 0, -1, np.where(paid.any(axis=1), last, completed))


def feasible(
    cost: np.ndarray,
    completed: np.ndarray,
    budget: np.ndarray,
    *,
    cumulative: bool,
) -> bool:
    """Check that completion years respect the budgets.

    Parameters
    ----------
    cost : ndarray, shape (n,)
        Capital cost per corridor [USD].
    completed : ndarray of int, shape (n,)
        Plan-year index of completion, -1 if unfunded [-].
    budget : ndarray, shape (T,)
        Capital available in each plan year [USD].
    cumulative : bool
        True: costs complete by each year within the budgets to that year
        (carry-over or splitting). False: each year's completions within
        that year's budget.

    Returns
    -------
    bool
        True when the plan can be paid.
    """
    cost = np.asarray(cost, dtype=float)
    completed = np.asarray(completed, dtype=int)
    budget = np.asarray(budget, dtype=float)
    big_t = budget.size
    per_year = np.zeros(big_t)
    f = completed >= 0
    np.add.at(per_year, completed[f], cost[f])
    tol = money_tolerance(cost, budget) * 10
    if cumulative:
        return bool((np.cumsum(per_year) <= np.cumsum(budget) + tol).all())
    return bool((per_year <= budget + tol).all())
