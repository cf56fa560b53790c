"""The build plan in plain words: how the optimised plan differs from the greedy one,
the coverage view, and the plan's warnings (:data:`WORDS`).

One sentence for the totals, then one per corridor whose year differs,
naming the corridors whose money it takes or gives up:

- a corridor funded earlier (or only) in the optimised plan takes money the
  greedy plan had spent, by that year, on corridors the optimised plan funds
  later or leaves out; or money the greedy plan left unspent;
- a corridor funded later (or not at all) gives its money, in its greedy
  year, to corridors the optimised plan funds by then that the greedy plan
  funds later or not at all.

Each sentence compares what the corridors deliver per dollar (score per
million USD, or electric truck-miles a year per USD), the quantity that
decides a budget-limited choice (Dantzig's ratio, [1]).

References
----------
.. [1] G. B. Dantzig, "Discrete-variable extremum problems", Operations
   Research 5(2):266-288, 1957.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from ...plan.objectives import OBJECTIVES, Objective
from ...workbook.tables import BUDGET
from .basic import Namer, listing, money, number


def _names(labels: list[str]) -> str:
    """:func:`listing`, with more than four corridors said as three and "N more"."""
    if len(labels) > 4:
        labels = labels[:3] + [f"{len(labels) - 3} more"]
    return listing(labels)


def describe_differences(
    ids: list[str],
    names: dict | None,
    cost: np.ndarray,
    quantity: np.ndarray,
    objective: Objective,
    years: np.ndarray,
    priority: np.ndarray,
    greedy: np.ndarray,
    optimised: np.ndarray,
    value: dict[str, float],
    unspent_greedy: np.ndarray,
) -> list[str]:
    """Write the sentences comparing the optimised plan with the greedy plan.

    Parameters
    ----------
    ids : list of str
        Corridor ids in plan order.
    names : dict or None
        Corridor id to name, for the sentences.
    cost : ndarray, shape (n,)
        Capital cost per corridor [USD].
    quantity : ndarray, shape (n,)
        What each corridor delivers: score [-] or electric truck-miles a
        year [mi/yr].
    objective : Objective
        The objective maximised.
    years : ndarray of int, shape (T,)
        Plan years [year].
    priority : ndarray of int, shape (n,)
        Corridor positions in rank order [-].
    greedy, optimised : ndarray of int, shape (n,)
        Completion year index per corridor in each plan, -1 unfunded [-].
    value : dict
        ``{"greedy": float, "optimised": float}`` objective values
        (objective's unit).
    unspent_greedy : ndarray, shape (T,)
        Money the greedy plan has not spent by each year (cumulative when
        money can be held, else that year's leftover) [USD].

    Returns
    -------
    list of str
        The sentences, totals first.
    """
    names = names or {}

    def label(i: int) -> str:
        name = str(names.get(ids[i], "") or "")
        return f"{ids[i]} ({name})" if name and name != ids[i] else ids[i]

    def per_usd(idx) -> float:
        idx = list(idx)
        c = float(cost[idx].sum())
        return float(quantity[idx].sum()) / c * objective.per_usd if c > 0 else np.inf

    changed = [i for i in priority if greedy[i] != optimised[i]]
    vg, vo = value["greedy"], value["optimised"]
    if not changed:
        return [
            "The optimised plan funds the same corridors in the same years as the greedy plan: "
            f"funding in rank order is already the best use of this budget for the {objective.label}."
        ]
    pct = (vo - vg) / abs(vg) * 100 if vg else np.inf
    more = f"{pct:+.1f} %" if np.isfinite(pct) else "the greedy plan delivers nothing"
    out = [
        f"The optimised plan delivers {number(vo)} {objective.label} against {number(vg)} for the "
        f"greedy plan ({more}); {len(changed)} corridor{'s' if len(changed) != 1 else ''} "
        "change year or drop in or out."
    ]
    n = len(ids)
    unit = objective.intensity
    for i in changed:
        g, o = int(greedy[i]), int(optimised[i])
        yg = int(years[g]) if g >= 0 else None
        yo = int(years[o]) if o >= 0 else None
        mine = per_usd([i])
        if o >= 0 and (g < 0 or o < g):
            head = (
                f"{label(i)} is funded in {yo} instead of {yg}"
                if g >= 0
                else f"{label(i)} is funded in {yo} in the optimised plan but not at all in the greedy plan"
            )
            gave = [
                j
                for j in range(n)
                if j != i and 0 <= greedy[j] <= o and (optimised[j] < 0 or optimised[j] > o)
            ]
            if gave:
                later = all(optimised[j] >= 0 for j in gave)
                dropped = all(optimised[j] < 0 for j in gave)
                fate = (
                    "funds later"
                    if later
                    else ("leaves out" if dropped else "funds later or leaves out")
                )
                theirs = per_usd(gave)
                compare = (
                    f"it gives {number(mine)} {unit} against {number(theirs)} for "
                    f"{'that corridor' if len(gave) == 1 else 'those'}"
                    if mine > theirs
                    else "it fits the money left better, so the rearranged years deliver more in total"
                )
                out.append(
                    f"{head} because the optimised plan uses money the greedy plan spent by {yo} on "
                    f"{_names([label(j) for j in gave])}, which it {fate}; {compare}."
                )
            elif unspent_greedy[o] >= cost[i] * (1 - 1e-9):
                out.append(
                    f"{head} because the greedy plan leaves {money(unspent_greedy[o])} unspent by {yo}, "
                    "enough for it, and the optimised plan puts that money to use."
                )
            else:
                out.append(
                    f"{head} because the optimised plan moves other corridors' years "
                    f"to make room for it by {yo}."
                )
        else:
            head = (
                f"{label(i)} is funded in {yo} instead of {yg}"
                if o >= 0
                else f"{label(i)} is not funded in the optimised plan (the greedy plan funds it in {yg})"
            )
            took = [
                j
                for j in range(n)
                if j != i and 0 <= optimised[j] <= g and (greedy[j] < 0 or greedy[j] > g)
            ]
            if took:
                theirs = per_usd(took)
                compare = (
                    f"which give {number(theirs)} {unit} against its {number(mine)}"
                    if theirs > mine
                    else "which fit the money better and deliver more in total"
                )
                out.append(
                    f"{head} because its {money(cost[i])} goes by {yg} to "
                    f"{_names([label(j) for j in took])} instead, {compare}."
                )
            else:
                out.append(
                    f"{head} because the optimised plan spends that money first on corridors "
                    "that deliver more, and the total is higher this way."
                )
    return out


def plan_differences(comparison: dict, names: dict | None = None) -> list[str]:
    """The sentences comparing the two plans, from :attr:`ranker.plan.phasing.Plan.comparison`.

    When the optimiser stopped without a plan better than the greedy one, one
    sentence says so (the optimised plan shown is then the greedy plan).
    """
    if comparison.get("stopped_at_greedy"):
        return [
            "The optimiser found no plan better than the greedy plan before it stopped, so "
            "the optimised plan shown is the greedy plan."
        ]
    c = comparison
    return describe_differences(
        c["ids"],
        names,
        c["cost"],
        c["quantity"],
        OBJECTIVES[c["objective"]],
        c["years"],
        c["priority"],
        c["greedy"],
        c["optimised"],
        c["value"],
        c["unspent_greedy"],
    )


def coverage_sentence(view: dict | None) -> str:
    """Say when each plan first joins the coverage view's places ("" without a view).

    ``view`` is :attr:`ranker.plan.phasing.Plan.coverage` (from
    :func:`ranker.plan.coverage.coverage_view`).
    """
    if not view:
        return ""
    names, rule, year_of = view["endpoints"], view["rule"], view["connected_year"]
    funded, possible = view["funded_set"], view["possible"]
    who = (
        f"All {len(names)} places named in connects"
        if rule == "all places" and len(names) > 6
        else (
            "The places named in connects (" + listing(names) + ")"
            if rule == "all places"
            else listing(names)
        )
    )
    if not possible:
        return (
            f"{who} cannot be joined by electrified corridors: even all the corridors together "
            "do not link them (check connects)."
        )
    parts = []
    for plan in ("optimised", "greedy"):
        if plan not in year_of:
            continue
        y = year_of[plan]
        if y is None:
            parts.append(f"not within the plan under the {plan} plan")
        else:
            parts.append(
                f"in {y} under the {plan} plan (funded by then: {', '.join(funded[plan])})"
            )
    return f"{who} are first joined by electrified corridors " + " and ".join(parts) + "."


#: Corridor ids a plan warning names; the rest are counted.
IDS_NAMED = 8


def _ids(ids: list[str]) -> str:
    """``Corridor C1``, ``Corridors C1, C2``, past :data:`IDS_NAMED` ``... and 3 more``."""
    ids = list(ids)
    shown = ", ".join(ids[:IDS_NAMED])
    if len(ids) > IDS_NAMED:
        shown += f" and {len(ids) - IDS_NAMED} more"
    return f"Corridor {shown}" if len(ids) == 1 else f"Corridors {shown}"


def _s(r: dict) -> str:
    """The verb's ``s`` for one corridor."""
    return "s" if len(r["corridors"]) == 1 else ""


def _never_fundable(r: dict, namer: Namer) -> str:
    costs = "; ".join(f"{i} {money(c)}" for i, c in zip(r["corridors"], r["costs"], strict=True))
    return (
        f"{_ids(r['corridors'])} cost{_s(r)} more than the whole budget ({money(r['total'])}) "
        f"and can never be funded: {costs}."
    )


def _adds_nothing(r: dict, namer: Namer) -> str:
    one = len(r["corridors"]) == 1
    return (
        f"{_ids(r['corridors'])} add{_s(r)} nothing to the objective "
        f"({OBJECTIVES[r['objective']].quantity} of zero or less) and "
        f"{'is' if one else 'are'} left out of the optimised plan."
    )


def _time_limit(r: dict, namer: Namer) -> str:
    gap = r["gap"]
    within = (
        f"no more than {gap * 100:.3g} % below the best possible"
        if gap is not None
        else "the greedy plan, as no plan was proven better in time"
    )
    return (
        f"The optimiser stopped at its {r['time_limit_s']:g} s time limit; the optimised "
        f"plan is {within}. A rerun on a slower or busier computer may stop elsewhere and "
        "show a slightly different optimised plan."
    )


#: Kind of each plan warning (:data:`ranker.input_warnings.WARNING_KINDS`) to its words.
WORDS: dict[str, Callable[[dict, Namer], str]] = {
    "budget_zero": lambda r, n: (
        f"{BUDGET}: the budget is zero in every year, so nothing can be funded."
    ),
    "never_fundable": _never_fundable,
    "over_any_year": lambda r, n: (
        f"{_ids(r['corridors'])} cost{_s(r)} more than any single year's budget "
        f"({money(r['largest'])}) and can never be funded while budget_carry_over and "
        "allow_split are both off."
    ),
    "adds_nothing": _adds_nothing,
    "budget_years_missing": lambda r, n: (
        f"{BUDGET}: no row for {', '.join(map(str, r['years']))}; no corridor is funded in "
        f"{'that year' if len(r['years']) == 1 else 'those years'}, and discounting still "
        "counts every calendar year."
    ),
    "optimiser_plan_infeasible": lambda r, n: (
        "The optimiser's plan did not fit the budget (numerical trouble with very different "
        "costs); the greedy plan is shown as the optimised plan."
    ),
    "optimiser_time_limit": _time_limit,
    "optimiser_unfinished": lambda r, n: (
        f"The optimiser did not finish ({r['message']}); the optimised plan shown is the "
        + ("greedy plan." if r["shows_greedy"] else "best plan it found.")
    ),
    "endpoints_without_connects_column": lambda r, n: (
        "coverage_endpoints is set but the Corridors sheet has no connects column; the "
        "coverage view is left out."
    ),
    "no_connects": lambda r, n: (
        "No corridor has connects filled in, so the coverage view is left out."
    ),
    "endpoints_without_connects": lambda r, n: (
        "coverage_endpoints is set but no corridor has connects filled in; the coverage view "
        "is left out."
    ),
    "endpoints_not_planned": lambda r, n: (
        f"coverage_endpoints names {listing(r['places'])}, which no corridor in the plan "
        "connects (a corridor outside its must-meet limits is not planned); the coverage "
        "view is left out."
    ),
    "endpoints_too_few": lambda r, n: (
        f"coverage_endpoints names only {listing(r['places'])}; name two places or more for "
        "the coverage view."
    ),
}
