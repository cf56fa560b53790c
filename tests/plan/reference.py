"""Slow, plain reference implementations the plan's kernels are checked against.

Written from the documented rules, loop by loop, sharing no code with
ranker.plan.
"""

from __future__ import annotations

import itertools

import numpy as np


def brute_force(cost, value, budget, *, cumulative):
    """Best total value over every assignment of corridors to years (or none).

    Enumerates all (T + 1) ** n assignments at once with numpy. Feasible:
    each year's completions within its budget, or (cumulative) the balance
    b[t] = b[t-1] + B[t] - spend[t] never below zero.
    """
    cost = np.asarray(cost, float)
    value = np.asarray(value, float)
    budget = np.asarray(budget, float)
    n, big_t = value.shape
    grid = np.array(list(itertools.product(range(-1, big_t), repeat=n)), dtype=int)  # (K, n)
    spend = np.zeros((grid.shape[0], big_t))
    total = np.zeros(grid.shape[0])
    for i in range(n):
        for t in range(big_t):
            on = grid[:, i] == t
            spend[on, t] += cost[i]
            total[on] += value[i, t]
    tol = 1e-9 * max(budget.sum(), 1.0)
    if cumulative:
        balance = np.zeros(grid.shape[0])
        ok = np.ones(grid.shape[0], bool)
        for t in range(big_t):
            balance = balance + budget[t] - spend[:, t]
            ok &= balance >= -tol
    else:
        ok = (spend <= budget[None, :] + tol).all(axis=1)
    best = np.argmax(np.where(ok, total, -np.inf))
    return float(total[best]), grid[best]


def greedy_reference(cost, order, budget, *, carry_over, allow_split):
    """The greedy rule of ranker.plan.greedy, one corridor at a time, in plain Python.

    Returns (completed, started, pay) with year indices (-1 = never) and the
    payments per corridor and year.
    """
    n, big_t = len(cost), len(budget)
    tol = 1e-9 * max(sum(budget), max(cost, default=0.0), 1.0)
    completed = [-1] * n
    started = [-1] * n
    pay = [[0.0] * big_t for _ in range(n)]
    carry = 0.0
    part = None  # [corridor, amount still owed]
    for t in range(big_t):
        money = budget[t] + carry
        left = money
        if part is not None:
            p = min(part[1], left)
            pay[part[0]][t] += p
            part[1] -= p
            left -= p
            if part[1] <= tol:
                completed[part[0]] = t
                part = None
        for i in order:
            if started[i] >= 0:
                continue
            if cost[i] <= left + tol:
                completed[i] = started[i] = t
                pay[i][t] += cost[i]
                left = max(left - cost[i], 0.0)
            elif (
                allow_split
                and part is None
                and cost[i] > money + tol
                and left > tol
                and left + sum(budget[t + 1 :]) >= cost[i] - tol
            ):
                started[i] = t
                pay[i][t] += left
                part = [i, cost[i] - left]
                left = 0.0
        carry = left if carry_over else 0.0
    return np.array(completed), np.array(started), np.array(pay)
