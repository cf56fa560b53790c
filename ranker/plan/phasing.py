"""The phased build plan: what to fund in which year, greedy and optimised.

:func:`build_plan` checks its inputs, runs the greedy plan
(:mod:`ranker.plan.greedy`), the optimised plan (:mod:`ranker.plan.optimise`),
turns both into payments (:mod:`ranker.plan.schedule`), compares them,
and adds the coverage view (:mod:`ranker.plan.coverage`) and the year-one
robustness (:mod:`ranker.plan.robust`) when their inputs are given. It
returns numbers and records; the words are :mod:`ranker.report.words.plan`.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ..input_warnings import warning
from ..plain import plain
from . import optimise
from .checks import check_endpoints, check_inputs, check_samples, check_series
from .coverage import coverage_view
from .greedy import greedy_kernel
from .objectives import OBJECTIVES
from .robust import year_one_share
from .schedule import completion_from_payments, feasible, payments

PLANS = ("greedy", "optimised")


@dataclass
class Plan:
    """A phased build plan, greedy and optimised.

    Attributes
    ----------
    greedy : DataFrame
        One row per corridor in rank order: ``corridor_id``, ``name`` (when
        names are given), ``rank`` [-], ``score`` [-], ``capital_usd``
        [USD], ``year_started`` and ``year_funded`` (the year the last part
        is paid; both nullable integers, blank when unfunded) [year], and
        ``value``, the corridor's share of the objective (objective's unit).
    optimised : DataFrame
        The same columns for the optimised plan.
    schedule : DataFrame
        Long table of payments: ``plan`` (``"greedy"``/``"optimised"``),
        ``year`` [year], ``corridor_id``, ``spend_usd`` [USD].
    budget : DataFrame
        ``year`` [year], ``capital_usd``, ``spent_greedy``,
        ``remaining_greedy``, ``spent_optimised``, ``remaining_optimised``
        [USD]. Remaining is the balance carried to the next year with
        carry-over, else the money of that year left unspent (and lost).
    objective : str
        Key of the objective maximised (``score`` or ``truck_miles``).
    objective_value : dict
        ``{"greedy": float, "optimised": float}`` (objective's unit: [-]
        for score, [mi] for truck-miles).
    gap : float
        Optimality gap of the optimised plan: (solver's bound - value) /
        value; 0 when proven optimal [-].
    comparison : dict
        The numbers behind the comparison of the two plans, for
        :func:`ranker.report.words.plan.plan_differences`: ``ids``,
        ``cost`` [USD], ``quantity`` (objective's per-corridor unit),
        ``objective`` (key), ``years`` [year], ``priority`` (rank order),
        ``greedy`` and ``optimised`` (completion year index, -1 unfunded),
        ``value`` ({plan: objective value}), ``unspent_greedy`` [USD],
        ``stopped_at_greedy`` (the optimiser stopped with the greedy plan).
    coverage : dict or None
        ``endpoints``, ``rule``, ``connected_year`` ({plan: year or None}),
        ``funded_set``, ``possible``; None without ``connects``.
    year_one_share : Series or None
        Share of score samples in which the greedy plan funds each corridor
        in the first plan year [-]; None without samples.
    warnings : list of dict
        Doubtful but legal input and solver limits: records ``{"kind", ...}``
        of :data:`ranker.input_warnings.WARNING_KINDS` (the plan's kinds);
        the words are :func:`ranker.report.narrative.plan_warnings`.
    """

    greedy: pd.DataFrame
    optimised: pd.DataFrame
    schedule: pd.DataFrame
    budget: pd.DataFrame
    objective: str
    objective_value: dict
    gap: float
    comparison: dict
    coverage: dict | None
    year_one_share: pd.Series | None
    warnings: list[dict] = field(default_factory=list)

    def to_json(self) -> dict:
        """Return the plan as plain JSON-ready types (NaN and blanks as None)."""
        return {
            "objective": self.objective,
            "objective_value": {k: plain(v) for k, v in self.objective_value.items()},
            "gap": plain(self.gap),
            "greedy": _records(self.greedy),
            "optimised": _records(self.optimised),
            "schedule": _records(self.schedule),
            "budget": _records(self.budget),
            "coverage": plain(self.coverage),
            "year_one_share": (
                None
                if self.year_one_share is None
                else {str(k): plain(v) for k, v in self.year_one_share.items()}
            ),
            "warnings": list(self.warnings),
        }


def _records(frame: pd.DataFrame) -> list[dict]:
    return [
        {k: plain(v) for k, v in row.items()} for row in frame.astype(object).to_dict("records")
    ]


def build_plan(
    capital_usd: pd.Series,
    score: pd.Series,
    rank: pd.Series,
    budget: pd.DataFrame,
    *,
    carry_over: bool = True,
    allow_split: bool = False,
    objective: str = "score",
    truck_miles: pd.Series | None = None,
    discount_rate: float = 0.07,
    connects: pd.Series | None = None,
    endpoints: Sequence[str] | None = None,
    sample_scores: np.ndarray | None = None,
    names: dict | None = None,
) -> Plan:
    """Build the greedy and the optimised phased plan for a yearly budget.

    Parameters
    ----------
    capital_usd : Series
        Capital cost per corridor, index ``corridor_id`` [USD].
    score : Series
        Score per corridor, higher is better [-].
    rank : Series
        Rank per corridor, 1 is best (ties broken by higher score, then
        input order) [-].
    budget : DataFrame
        Columns ``year`` [year] and ``capital_usd`` [USD], one row per year.
    carry_over : bool
        Whether money unspent in a year is added to the next [-].
    allow_split : bool
        Whether a corridor may be paid over several consecutive years [-].
    objective : str
        What the optimised plan maximises: ``"score"`` (sum of score x
        (1 + r) ** -(year index) over funded corridors) or ``"truck_miles"``
        (electric truck-miles served each year from completion to the last
        budget year, discounted alike).
    truck_miles : Series, optional
        Electric truck-miles a year per corridor; required for
        ``objective="truck_miles"`` [mi/yr].
    discount_rate : float
        Real discount rate [1/yr].
    connects : Series, optional
        Text ``"A-B"`` per corridor: the two places it joins [-].
    endpoints : sequence of str, optional
        Places the coverage view must see joined; empty or None for every
        place named in ``connects`` [-].
    sample_scores : ndarray, shape (s, n), optional
        Monte Carlo samples of the scores, columns in the order of
        ``capital_usd``, higher is better (pass ``-ranks`` for ranks) [-].
    names : dict, optional
        Corridor id to name, for the ``name`` column of the plans.

    Returns
    -------
    Plan
        Both plans, their payments and budget use, the objective values and
        gap, the numbers behind their differences, coverage, year-one
        robustness and the warning records.

    Raises
    ------
    ValueError
        For a bad budget (negative, blank, a year twice), costs, scores,
        ranks, objective, truck-miles or connects. The reader checks each of
        these in its cell before a run gets here.

    References
    ----------
    .. [1] H. M. Weingartner, "Mathematical Programming and the Analysis of
       Capital Budgeting Problems", Prentice-Hall, 1963.
    .. [2] G. B. Dantzig, "Discrete-variable extremum problems", Operations
       Research 5(2):266-288, 1957.

    Examples
    --------
    >>> import pandas as pd
    >>> ids = ["C1", "C2", "C3", "C4"]
    >>> cost = pd.Series([7.0, 5.0, 4.0, 3.0], index=ids) * 1e6
    >>> score = pd.Series([22.0, 16.0, 12.0, 8.0], index=ids)
    >>> rank = pd.Series([1, 2, 3, 4], index=ids)
    >>> budget = pd.DataFrame({"year": [2027], "capital_usd": [14e6]})
    >>> p = build_plan(cost, score, rank, budget)
    >>> p.greedy["year_funded"].tolist()
    [2027, 2027, <NA>, <NA>]
    >>> p.optimised["year_funded"].tolist()
    [2027, <NA>, 2027, 2027]
    >>> p.objective_value
    {'greedy': 38.0, 'optimised': 42.0}
    """
    a = check_inputs(capital_usd, score, rank, budget, discount_rate=discount_rate)
    if objective not in OBJECTIVES:
        raise ValueError(f"objective is '{objective}'; use one of {', '.join(OBJECTIVES)}")
    obj = OBJECTIVES[objective]
    if objective == "truck_miles":
        if truck_miles is None:
            raise ValueError("objective truck_miles needs truck_miles, a Series per corridor")
        quantity = check_series(truck_miles, a.ids, "electric truck-miles a year")
    else:
        quantity = a.score
    names = {str(k): v for k, v in (names or {}).items()}
    cumulative = bool(carry_over or allow_split)
    warnings = _warnings(a, quantity, obj.key, carry_over=carry_over, allow_split=allow_split)
    value = obj.value(quantity, a.years, discount_rate)
    n, big_t = value.shape

    g = greedy_kernel(
        a.cost,
        a.order,
        a.budget,
        carry_over=carry_over,
        allow_split=allow_split,
        record_spend=True,
    )
    done = {"greedy": g.completed[0]}
    pay = {"greedy": g.spend[0]}
    got = {"greedy": _total(value, done["greedy"])}

    m = optimise.milp_kernel(
        a.cost, value, a.budget, cumulative=cumulative, time_limit=optimise.TIME_LIMIT_S
    )
    use_greedy = m.completed is None
    if not use_greedy:
        p = payments(
            a.cost,
            m.completed,
            a.budget,
            carry_over=carry_over,
            allow_split=allow_split,
            priority=a.order,
        )
        c = completion_from_payments(p, m.completed)
        if not feasible(a.cost, c, a.budget, cumulative=cumulative):
            warnings.append(warning("optimiser_plan_infeasible"))
            use_greedy = True
        else:
            v = _total(value, c)
            # An optimum no better than the greedy plan: show the greedy plan, it is optimal too.
            use_greedy = v <= got["greedy"] + 1e-9 * max(abs(v), 1e-300)
    if use_greedy:
        c, p, v = done["greedy"], pay["greedy"], got["greedy"]
    done["optimised"], pay["optimised"], got["optimised"] = c, p, v
    bound = max(m.bound, v) if np.isfinite(m.bound) else np.inf
    gap = (
        0.0
        if bound - v <= 1e-12 * max(abs(bound), 1e-300)
        else ((bound - v) / abs(v) if v else np.inf)
    )
    stopped = m.status != 0
    if m.status == 1:
        warnings.append(
            warning(
                "optimiser_time_limit",
                time_limit_s=float(optimise.TIME_LIMIT_S),
                gap=float(gap) if np.isfinite(gap) else None,
            )
        )
    elif stopped:
        warnings.append(
            warning("optimiser_unfinished", message=str(m.message), shows_greedy=bool(use_greedy))
        )

    spent = {k: pay[k].sum(axis=0) for k in PLANS}
    if cumulative:
        unspent_g = np.cumsum(a.budget) - np.cumsum(spent["greedy"])
    else:
        unspent_g = a.budget - spent["greedy"]
    frames = {k: _frame(a, names, done[k], pay[k], value) for k in PLANS}
    comparison = {
        "stopped_at_greedy": bool(stopped and use_greedy),
        "ids": list(a.ids),
        "cost": a.cost,
        "quantity": quantity,
        "objective": obj.key,
        "years": a.years,
        "priority": a.order,
        "greedy": done["greedy"],
        "optimised": done["optimised"],
        "value": got,
        "unspent_greedy": unspent_g,
    }
    plan = Plan(
        greedy=frames["greedy"],
        optimised=frames["optimised"],
        schedule=_schedule(a, done, pay),
        budget=_budget(a, spent, carry_over=carry_over),
        objective=objective,
        objective_value={k: float(got[k]) for k in PLANS},
        gap=float(gap),
        comparison=comparison,
        coverage=None,
        year_one_share=None,
        warnings=warnings,
    )
    if connects is not None:
        plan.coverage, more = coverage_view(
            connects, a.ids, check_endpoints(endpoints), done, a.years
        )
        plan.warnings.extend(more)
    elif check_endpoints(endpoints):
        plan.warnings.append(warning("endpoints_without_connects_column"))
    if sample_scores is not None:
        samples = check_samples(sample_scores, n)
        share = year_one_share(
            a.cost, samples, a.budget, carry_over=carry_over, allow_split=allow_split
        )
        plan.year_one_share = pd.Series(
            share, index=pd.Index(a.ids, name="corridor_id"), name="year_one_share"
        )
    return plan


def _total(value: np.ndarray, completed: np.ndarray) -> float:
    f = completed >= 0
    return float(value[np.flatnonzero(f), completed[f]].sum())


def _warnings(a, quantity, objective: str, *, carry_over: bool, allow_split: bool) -> list[dict]:
    """The records of doubtful budgets and corridors, before planning."""
    out = []
    total = float(a.budget.sum())
    ids = np.asarray(a.ids)
    if total <= 0:
        out.append(warning("budget_zero"))
    never = a.cost > total * (1 + 1e-12)
    if never.any() and total > 0:
        out.append(
            warning(
                "never_fundable",
                corridors=[str(i) for i in ids[never]],
                costs=[float(c) for c in a.cost[never]],
                total=total,
            )
        )
    if not (carry_over or allow_split):
        single = (a.cost > a.budget.max() * (1 + 1e-12)) & ~never
        if single.any():
            out.append(
                warning(
                    "over_any_year",
                    corridors=[str(i) for i in ids[single]],
                    largest=float(a.budget.max()),
                )
            )
    nothing = quantity <= 0
    if nothing.any():
        out.append(
            warning("adds_nothing", corridors=[str(i) for i in ids[nothing]], objective=objective)
        )
    missing = sorted(set(range(a.years[0], a.years[-1] + 1)) - set(a.years.tolist()))
    if missing:
        out.append(warning("budget_years_missing", years=[int(y) for y in missing]))
    return out


def _frame(a, names, completed, pay, value) -> pd.DataFrame:
    o = a.order
    paid = pay > 0
    first = np.where(paid.any(axis=1), np.argmax(paid, axis=1), completed)
    first = np.where(completed >= 0, first, -1)

    def year(idx):
        return pd.array([int(a.years[t]) if t >= 0 else pd.NA for t in idx[o]], dtype="Int64")

    f = completed >= 0
    contrib = np.zeros(len(a.ids))
    contrib[f] = value[np.flatnonzero(f), completed[f]]
    out = {"corridor_id": [a.ids[i] for i in o]}
    if names:
        out["name"] = [str(names.get(a.ids[i], "")) for i in o]
    out.update(
        {
            "rank": a.rank[o],
            "score": a.score[o],
            "capital_usd": a.cost[o],
            "year_started": year(first),
            "year_funded": year(completed),
            "value": contrib[o],
        }
    )
    return pd.DataFrame(out)


def _schedule(a, done, pay) -> pd.DataFrame:
    rows = []
    for plan in PLANS:
        for t in range(len(a.years)):
            for i in a.order:
                if pay[plan][i, t] > 0 or (done[plan][i] == t and a.cost[i] == 0):
                    rows.append((plan, int(a.years[t]), a.ids[i], float(pay[plan][i, t])))
    return pd.DataFrame(rows, columns=["plan", "year", "corridor_id", "spend_usd"])


def _budget(a, spent, *, carry_over: bool) -> pd.DataFrame:
    out = {"year": a.years.astype(int), "capital_usd": a.budget}
    for plan in PLANS:
        s = spent[plan]
        left = np.cumsum(a.budget) - np.cumsum(s) if carry_over else a.budget - s
        out[f"spent_{plan}"] = s
        out[f"remaining_{plan}"] = np.maximum(left, 0.0)
    return pd.DataFrame(out)


__all__ = ["Plan", "build_plan"]
