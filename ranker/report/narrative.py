"""Every sentence the outputs print, each generated from the analyses' numbers and records.

The one door the terminal, the results workbook, the justification sheet and
the JSON use for words; the pieces and the words of each analysis are in
:mod:`ranker.report.words`. No sentence claims what the numbers do not show:
how sure the order is follows the tiers' shares of samples, agreement words
follow Kendall's tau.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from .words import Namer, listing, share_text
from .words.basic import fmt, method_label
from .words.methods import (
    first_tier_sentence,
    vikor_note,  # noqa: F401 (the one door for words)
)

if TYPE_CHECKING:  # annotations only: the warnings' words need no pandas (ranker check)
    import pandas as pd


def recommendation(result) -> list[str]:
    """Return the decision summary: the order by tiers, how sure, the nearest change.

    Every statement quotes the share of samples behind it (see
    :mod:`ranker.stress.tiers`); without samples it says the order was not
    tested against uncertainty.
    """
    groups = tier_groups(result)
    rob = result.robustness
    t = getattr(rob, "tiers", None)
    sampled = t is not None and t.samples > 0
    label = method_labels([result.primary_method])[result.primary_method]
    out = []
    first = groups[0]
    if len(first["names"]) == 1:
        out.append(f"Fund first: {first['names'][0]}.")
    else:
        unsettled = "the evidence does not settle" if sampled else "equal scores leave open"
        out.append(f"Fund first, in an order {unsettled}: {listing(first['names'])}.")
    if len(groups) > 1:
        nxt = groups[1]
        if len(nxt["names"]) == 1:
            out.append(f"Next: {nxt['names'][0]}.")
        else:
            out.append(
                f"Next, in an order the evidence does not settle: {listing(nxt['names'])}."
                if sampled
                else f"Next, with equal scores: {listing(nxt['names'])}."
            )
    out[0] = out[0][:-1] + f" ({label}, weight set '{result.weight_set}')."
    if sampled:
        out.append(how_sure(result, groups))
    else:
        out.append(
            "The order was not tested against uncertainty (no Monte Carlo samples), so how "
            "sure it is was not measured."
        )
    change = nearest_change(result)
    if change:
        out.append(change)
    return out


def how_sure(result, groups=None) -> str:
    """Quote the shares behind the first tier and, inside the next, the closest pair."""
    groups = groups or tier_groups(result)
    rob = result.robustness
    t = rob.tiers
    size = len(groups[0]["ids"])
    text = ""
    if len(groups) > 1:
        share = float(t.cut_share[size - 1])
        who = groups[0]["names"][0] if size == 1 else f"Each of these {size}"
        text = (
            f"{who} ranks above every corridor outside the first tier in at least "
            f"{share_text(share)} of {t.samples:,} samples"
        )
    else:
        text = f"No corridor is set apart from the rest in {t.samples:,} samples"
    inside = _closest_inside(result, groups[1] if len(groups) > 1 else groups[0])
    if inside:
        text += f"; {inside}"
    return text + "."


def _closest_inside(result, group) -> str:
    """The closest neighbouring pair inside a tier, with its share ("" when none)."""
    if len(group["ids"]) < 2:
        return ""
    t = result.robustness.tiers
    position = {cid: p for p, cid in enumerate(result.ranking.index)}
    pairs = [(position[a], a, b) for a, b in zip(group["ids"], group["ids"][1:], strict=False)]
    p, a, b = min(pairs, key=lambda q: t.neighbour_wins[q[0]])
    names = result.ranking["name"].astype(str)
    return (
        f"inside tier {group['tier']}, {names[a]} ranks above {names[b]} in only "
        f"{share_text(float(t.neighbour_wins[p]))} of samples"
    )


def nearest_change(result) -> str:
    """Name the smallest one-weight change that alters the first tier ("" when none)."""
    rob = result.robustness
    change = getattr(rob, "first_tier_change", None)
    if not change:
        if rob is not None and len(tier_groups(result)) > 1:
            return "No single weight change from 0 to 1 alters the first tier."
        return ""
    labels = {c.key: c.label for c in result.criteria}
    names = result.ranking["name"].astype(str)
    moved = "rose" if change["direction"] == "above" else "fell"
    points = 100 * change["distance"]
    entering = listing([names.get(c, c) for c in change["entering"]])
    leaving = listing([names.get(c, c) for c in change["leaving"]])
    return (
        f"The nearest change that would alter the first tier: if the weight on "
        f"{labels.get(change['criterion'], change['criterion'])} {moved} from "
        f"{100 * change['current']:.1f}% to {100 * change['weight_at']:.1f}% of the total "
        f"({points:.1f} points), " + _swap_words(entering, leaving, len(change["leaving"]), result)
    )


def _swap_words(entering: str, leaving: str, count: int, result) -> str:
    size = len(tier_groups(result)[0]["ids"])
    if size == 1:
        return f"{entering} would take first place from {leaving}."
    return f"{entering} would rank among the first {size} in place of {leaving}."


def methods_on_first_tier(result) -> str:
    """For the brief: do the other methods rank the first tier's corridors within its size?

    "" when only one method ran or every corridor is in the first tier.
    """
    s = result.scores
    p = result.primary_method
    others = [m for m in s.scores.columns if m != p]
    groups = tier_groups(result)
    if not others or len(groups) < 2:
        return ""
    first = groups[0]
    size = len(first["ids"])
    labels = method_labels(list(s.scores.columns))
    outside = {
        labels[m]: [
            (name, int(s.ranks[m][cid]))
            for cid, name in zip(first["ids"], first["names"], strict=True)
            if int(s.ranks[m][cid]) > size
        ]
        for m in others
    }
    return first_tier_sentence(outside, size)


def agreement_sentence(result) -> str:
    """Say how far the methods agree, from Kendall's tau with the primary method."""
    s = result.scores
    tau = s.agreement.get("kendall")
    methods = list(s.scores.columns)
    if tau is None or len(methods) < 2:
        return "Only one method was run."
    p = result.primary_method
    labels = method_labels(methods)
    parts = []
    for m in methods:
        if m == p:
            continue
        t = float(tau.at[p, m]) if m in tau.columns and p in tau.index else float("nan")
        same_top = s.ranks[m].idxmin() == s.rank.idxmin()
        parts.append(
            f"{labels[m]} (Kendall's tau {t:.2f}; "
            f"{'same' if same_top else 'a different'} first corridor)"
        )
    return f"Other methods against {labels[p]}: " + "; ".join(parts) + "."


def strongest_weakest(result, cid) -> tuple[str, str]:
    """Name a corridor's strongest and weakest criteria, in words and numbers."""
    import pandas as pd

    from ..score.normalize import normalize_minmax

    keys = [c.key for c in result.criteria if c.key in result.scores.weights]
    # Positions on the values as scored (past a full-credit level, at the level).
    source = result.scored_matrix if result.scored_matrix is not None else result.matrix
    scored = source.loc[result.scores.rank.index, keys]
    if cid not in scored.index or not keys:
        return "", ""
    benefit = np.array([c.is_benefit for c in result.criteria if c.key in keys])
    # Position on each criterion between the worst (0) and best (1) scored corridor.
    position = normalize_minmax(scored.to_numpy(dtype=float), benefit)
    share = pd.Series(position[scored.index.get_loc(cid)], index=keys)
    labels = {c.key: c.label for c in result.criteria}

    def describe(key: str) -> str:
        value = result.matrix.at[cid, key]
        return f"{labels.get(key, key)} ({fmt(value)}; {share[key]:.0%} of the way from worst to best)"

    return describe(share.idxmax()), describe(share.idxmin())


def reversal_sentences(result) -> list[str]:
    """Plain-word results of the rank-reversal checks."""
    rob = result.robustness
    if rob is None:
        return []
    from .words.checks import check_sentence

    namer = _namer(result)
    return [check_sentence(c, namer) for c in rob.rank_reversal]


def consistency_text(c: dict | None) -> str:
    """Describe an AHP consistency result in words and numbers ("" where none)."""
    if not c:
        return ""

    def num(key):
        v = c.get(key)
        if v is None:
            return "n/a"
        # CI and CR are never below 0 (lambda_max >= n, Saaty 1980); a tiny
        # negative is rounding in the eigenvalue, printed as 0.
        return f"{0.0 if abs(v) < 5e-5 else v:.4f}"

    text = f"lambda_max {num('lambda_max')}, CI {num('ci')}, CR {num('cr')}"
    cr = c.get("cr")
    if cr is None:
        text += " (no random index for this many criteria, so no consistency ratio)"
    elif cr > 0.10:
        text += " - above 0.10, so the judgments are not consistent enough (Saaty 1980)"
    else:
        text += " - at most 0.10, acceptable (Saaty 1980)"
    if c.get("revisit"):
        from .words.inputs import revisit_text

        text += f"; {revisit_text(c['revisit'], c['worst_triple'])}"
    return text


def method_labels(methods) -> dict:
    """Method key to its label for people (TOPSIS, Weighted sum, VIKOR (Q))."""
    return {m: method_label(m) for m in methods}


def _shown(value) -> str:
    """A default as the note quotes it: ``288,000`` rather than ``288000.0``."""
    if isinstance(value, float) and value.is_integer() and abs(value) < 1e15:
        return f"{value:,.0f}"
    if isinstance(value, float):
        return f"{value:,.6g}"
    return str(value)


def assumptions_used(result) -> list[dict]:
    """Every assumption with the value used, whether it is the default, and the default.

    ``set_by`` is ``"default"`` where the value cell was blank or holds the
    default itself, ``"changed"`` where the planner typed another value;
    ``default`` holds the default beside a changed value (empty otherwise).
    ``note`` describes the default and its source, so it is labelled that
    way beside a changed value.
    """
    from ..assumptions import ASSUMPTIONS

    def cell_value(value):  # as the table's cell holds it: a list joined, yes or no
        if isinstance(value, tuple):
            return ", ".join(value)
        if isinstance(value, bool):
            return "yes" if value else "no"
        return value

    given = set(result.inputs.assumptions)
    rows = []
    for k, a in ASSUMPTIONS.items():
        if k not in result.assumptions:
            continue
        value = cell_value(result.assumptions[k])
        default = cell_value(a.default)
        changed = k in given and value != default
        rows.append(
            {
                "key": k,
                "value": value,
                "unit": a.unit,
                "set_by": "changed" if changed else "default",
                "default": default if changed else "",
                "note": f"The default ({_shown(default)}): {a.note}" if changed else a.note,
            }
        )
    return rows


def tier_rule(result) -> str:
    """Say how the tiers were cut, with the share and the samples behind them."""
    rob = result.robustness
    t = getattr(rob, "tiers", None)
    if t is None or not t.samples:
        return (
            "The order was not tested against uncertainty (no Monte Carlo samples): "
            "tiers only group corridors with equal scores."
        )
    return (
        f"Tiers: every corridor of a higher tier ranks above every corridor of a lower "
        f"tier in at least {t.confidence:.0%} of {shaken_samples(result, t.samples)}; "
        "inside a tier the order is not settled by the evidence."
    )


def shaken_samples(result, samples: int) -> str:
    """``10,000 samples (weights and values shaken)``: the samples and what they vary.

    Values are shaken where a criterion has an ``uncertainty_pct`` (Criteria).
    """
    values = any(c.uncertainty_pct for c in result.criteria)
    return f"{samples:,} samples (weights{' and values' if values else ''} shaken)"


def tier_groups(result) -> list[dict]:
    """Each tier with its corridors in order: ``{"tier", "ids", "names"}``."""
    ranking = result.ranking
    out: list[dict] = []
    for cid, tier, name in zip(ranking.index, ranking["tier"], ranking["name"], strict=True):
        tier = int(tier)
        if not out or out[-1]["tier"] != tier:
            out.append({"tier": tier, "ids": [], "names": []})
        out[-1]["ids"].append(str(cid))
        out[-1]["names"].append(str(name))
    return out


def pairwise_note(result) -> str:
    """Explain the pairwise winning matrix as the workbook shows it."""
    rob = result.robustness
    t = getattr(rob, "tiers", None)
    shown = 0 if rob is None or rob.pairwise_wins is None else rob.pairwise_wins.shape[0]
    text = (
        "Row corridor ranks above column corridor in this share of the samples "
        "(pairwise winning share)."
    )
    if t is not None and shown < len(result.ranking):
        text += f" First {shown} corridors of the order; tiers cover every corridor."
    return text


def _corridor_names(corridors) -> dict:
    """Corridor id to its name as text, from a SheetRows or a DataFrame of Corridors."""
    return dict(zip(corridors.index, map(str, corridors["name"]), strict=True))


def _namer(result) -> Namer:
    return Namer(
        _corridor_names(result.inputs.corridors), {c.key: c.label for c in result.criteria}
    )


def inputs_namer(inputs) -> Namer:
    """Corridor names and included criteria's labels of the inputs, for the warnings'
    words before the run's :class:`~ranker.result.Result` exists."""
    return Namer(_corridor_names(inputs.corridors), {c.key: c.label for c in inputs.included})


def tipping_sentence(record: dict, namer) -> str:
    """Say one tipping point: the corridor actually passed at that weight and the ranks there.

    Parameters
    ----------
    record : dict
        A record of :func:`ranker.stress.tipping.tipping_records`.
    namer : Namer
        Corridor names and criterion labels.
    """
    from ranker.stress.tipping import at_end

    from .words import ordinal, weight_text

    label = namer.criterion(record["criterion"])
    now = weight_text(record["current_weight"])
    t = record["weight_at"]
    if record["direction"] == "above" and at_end(t, 1):
        when = f"If {label} takes all of the weight (it has {now} now), "
    elif record["direction"] == "below" and at_end(t, -1):
        when = f"If the weight on {label} falls to 0 (it is {now} now), "
    else:
        at = weight_text(t, record["current_weight"], ends=True)
        moves = "rises above" if record["direction"] == "above" else "falls below"
        when = f"If the weight on {label} {moves} {at} (it is {now} now), "
    who = namer.corridor(record["corridor_id"])
    other = namer.corridor(record["other_id"])
    r, after = int(record.get("rank_before", 1)), int(record.get("rank_after", 0))
    o_now = int(record.get("other_rank_before", 0))
    o_after = int(record.get("other_rank_after", -1))
    if record["kind"] == "top":
        if o_after == after:  # the two tie there (Sweep.level)
            return when + f"{other} draws level with {who} for first place."
        return when + f"{other} takes first place from {who}."
    if o_after == after:
        return when + f"{who} moves up from {ordinal(r)} to {ordinal(after)}, level with {other}."
    verb = "moves up" if after < r else "drops"
    link = "passing" if after < r else "behind"
    text = when + f"{who} {verb} from {ordinal(r)} to {ordinal(after)}, {link} {other}"
    if o_now and o_after and o_now != (r - 1 if after < r else r + 1):
        # Someone else crossed first: say where the passed corridor stands.
        text += f" ({ordinal(o_now)} now, {ordinal(o_after)} at that weight)"
    return text + "."


#: Most tipping sentences on one corridor's card.
CARD_TIPS = 3


def card_tips(result, ids) -> dict:
    """At most :data:`CARD_TIPS` tipping sentences for each corridor of ``ids``, nearest
    first, none alike: ``{corridor id: [sentence, ...]}``.

    Nearest by the weight change needed; one per criterion and direction
    (a second crossing further along the same sweep says nothing new). One
    pass over the tipping points serves every corridor asked for.
    """
    rob = result.robustness
    mine: dict = {cid: [] for cid in ids}
    if rob is None:
        return mine
    for t in rob.tipping_points:
        for cid in {t.get("corridor_id"), t.get("other_id")}:
            if cid in mine:
                mine[cid].append(t)
    namer = _namer(result)
    out = {}
    for cid, tips in mine.items():
        tips.sort(key=lambda t: abs(t["weight_at"] - t["current_weight"]))
        said, seen = [], set()
        for t in tips:
            key = (t["criterion"], t["direction"])
            if key in seen:
                continue
            seen.add(key)
            said.append(tipping_sentence(t, namer))
            if len(said) == CARD_TIPS:
                break
        out[cid] = said
    return out


def rank_intervals(result, table: pd.DataFrame | None = None) -> pd.DataFrame:
    """The rank-interval table of the run (or those of its rows in ``table``) with each
    row in words (``sentence``)."""
    from .words.tipping import with_interval_sentences

    rows = result.robustness.rank_intervals if table is None else table
    return with_interval_sentences(rows, _namer(result))


def closeness(result) -> pd.DataFrame:
    """The neighbour-closeness table of the run with each flag's reason in words."""
    from .words.closeness import with_reasons

    rob = result.robustness
    sampled = rob.tiers is not None and rob.tiers.samples and len(rob.closeness)
    return with_reasons(rob.closeness, _namer(result), rob.tier if sampled else None)


def stakeholders(result) -> dict | None:
    """The weight-set comparison of the run with its sentences (None without weight sets)."""
    from .words.futures import stakeholder_words

    rob = result.robustness
    if rob is None or not rob.stakeholders:
        return None
    return stakeholder_words(rob.stakeholders, _namer(result))


def futures(result) -> dict | None:
    """The futures of the run with their sentences (None without a Scenarios sheet)."""
    from .words.futures import futures_words

    return futures_words(result.futures, _namer(result)) if result.futures else None


def stress_warnings(result) -> list[str]:
    """The stress stage's warnings of the run in words."""
    rob = result.robustness
    return [] if rob is None else robustness_warnings(rob.warnings, _namer(result))


def robustness_warnings(records: list[dict], namer: Namer | None = None) -> list[str]:
    """The stress stage's warning records in words, in order
    (:data:`ranker.stress.WARNING_KINDS`)."""
    from .words.stress import stress_warnings as words

    return words(records, namer)


def input_warnings(records: list[dict], namer: Namer | None = None) -> list[str]:
    """Warning records of every stage but the stress stage in words, in order
    (:data:`ranker.input_warnings.WARNING_KINDS`: derive, score, plan, map).

    ``namer`` gives the corridor names and criterion labels some words quote.
    """
    from .words.inputs import input_warnings as words

    return words(records, namer)


def plan_warnings(result) -> list[str]:
    """The build plan's warnings in words ([] without a plan)."""
    plan = result.plan
    return [] if plan is None else input_warnings(plan.warnings, _namer(result))


def word_consistency(weight_sets) -> None:
    """Write each pairwise set's judgment to revisit into its ``consistency["suggestion"]``.

    The score stage returns the numbers (``revisit``, ``worst_triple``) and
    leaves ``suggestion`` None; the outputs quote these words.
    """
    from .words.inputs import revisit_text

    for w in weight_sets:
        c = w.consistency
        if c and c.get("revisit"):
            c["suggestion"] = revisit_text(c["revisit"], c["worst_triple"])


def tipping_sentences(result, records: list[dict] | None = None) -> list[str]:
    """Every tipping point of the run (or the ``records`` given) in words, in their order."""
    rob = result.robustness
    if rob is None:
        return []
    namer = _namer(result)
    return [
        tipping_sentence(t, namer) for t in (rob.tipping_points if records is None else records)
    ]


def plan_differences(result) -> list[str]:
    """How the optimised plan differs from the greedy one, in words ([] without a plan)."""
    from .words.plan import plan_differences as words

    if result.plan is None:
        return []
    return words(result.plan.comparison, result.inputs.corridors["name"].astype(str).to_dict())


def coverage_sentence(result) -> str:
    """When each plan first joins the coverage view's places ("" without a view)."""
    from .words.plan import coverage_sentence as words

    return "" if result.plan is None else words(result.plan.coverage)


def funded_by_year(result) -> list[str]:
    """One line per budget year of the optimised plan: ``2027: A, B`` ([] without a plan)."""
    plan = result.plan
    if plan is None:
        return []
    names = result.inputs.corridors["name"].astype(str)
    funded = plan.optimised.dropna(subset=["year_funded"])
    out = []
    for year, rows in funded.groupby("year_funded", sort=True):
        who = [names.get(c, c) for c in rows["corridor_id"]]
        out.append(f"{int(year)}: {', '.join(who)}")
    return out


def first_ranked_waits(result) -> str:
    """Say why the optimised plan funds the first-ranked corridor later than rank order would.

    Returns "" when there is no plan or the first-ranked corridor is funded in the
    year the greedy plan (rank order) funds it. Otherwise names the corridors the
    optimised plan funds in that year instead and compares score per million USD
    (the sum of their scores over the sum of their capital) with the first-ranked
    corridor's [-/million USD].
    """
    import pandas as pd

    plan = result.plan
    if plan is None or not len(result.ranking):
        return ""
    first = result.ranking.index[0]
    greedy = plan.greedy.set_index("corridor_id")
    optimised = plan.optimised.set_index("corridor_id")
    if first not in greedy.index or first not in optimised.index:
        return ""
    was, now = greedy.at[first, "year_funded"], optimised.at[first, "year_funded"]
    if pd.isna(was) or (not pd.isna(now) and now <= was):
        return ""
    instead = optimised[optimised["year_funded"] == was]
    if not len(instead):
        return ""
    names = result.inputs.corridors["name"].astype(str)
    per = instead["score"].sum() / instead["capital_usd"].sum() * 1e6
    own = optimised.at[first, "score"] / optimised.at[first, "capital_usd"] * 1e6
    when = "is not funded within the budget years" if pd.isna(now) else f"waits until {int(now)}"
    tier = int(result.ranking.at[first, "tier"])
    settled = (
        "; its tier's order is not settled by the evidence"
        if (result.ranking["tier"] == tier).sum() > 1
        else ""
    )
    return (
        f"The first-ranked corridor, {names.get(first, first)}, {when}: the money of "
        f"{int(was)} buys {listing([names.get(c, c) for c in instead.index])} instead, "
        f"{per:.3g} score per million USD against its {own:.3g}{settled}. "
        "Appendix C and the Phasing sheet of the results workbook explain every move."
    )


def provenance_line(result) -> str:
    """One line: tool, input file and its hash, run time, samples and seed."""
    return (
        f"ranker {result.tool_version}; input {result.inputs.path.name} (SHA-256 "
        f"{result.inputs.sha256[:12]}...); run {result.started}; {result.samples:,} samples, "
        f"seed {result.seed}; full detail in the appendices and the results workbook."
    )


def spread_sentence(result) -> str:
    """Say each criterion's share of the spread of the weighted scores, largest first."""
    shares = result.diagnostics.get("spread_share", {})
    if not shares:
        return ""
    labels = {c.key: c.label for c in result.criteria}
    parts = [
        f"{labels.get(k, k)} {share_text(v)}"
        for k, v in sorted(shares.items(), key=lambda kv: -kv[1])
    ]
    return (
        "Share of the spread of the weighted scores (how much each criterion separates the "
        "corridors): " + "; ".join(parts) + "."
    )


#: Rows of the ranking printed on the terminal; the outputs hold them all.
PRINTED_ROWS = 30


def terminal_lines(result, rows: int = PRINTED_ROWS) -> list[str]:
    """The ranking as the terminal prints it: weights, one line per corridor, the decision.

    Each corridor line gives its rank, tier, score and, with samples, the share
    of samples in which it ranks first (``<1%`` for a share that rounds to 0,
    ``never first in the samples`` when it never does). The decision summary (:func:`recommendation`)
    and the tier rule follow, so the terminal says what the justification sheet
    says, including "not tested against uncertainty" without samples, and the
    caution every output carries ends it.
    """
    from .summary import has_samples

    method = result.primary_method
    labels = {c.key: c.label for c in result.criteria}
    shown = ", ".join(f"{labels.get(k, k)} {w:.1%}" for k, w in result.weights.items())
    given = ", ".join(f"{k}={v:g}%" for k, v in result.overrides.items())
    out = [
        f"Ranking by {method}, weight set '{result.weight_set}':",
        f"  weights: {shown}" + (f" (after --weight {given})" if given else ""),
    ]
    ranking = result.ranking
    first = result.robustness.first_rank if has_samples(result.robustness) else None
    tiered = "tier" in ranking.columns
    for cid, row in ranking.iloc[:rows].iterrows():
        tier = f"  tier {int(row['tier'])}" if tiered else ""
        sure = ""
        if first is not None:
            share = float(first[cid])
            sure = (
                "  never first in the samples"
                if share == 0
                else f"  first in {share_text(share)} of samples"
            )
        out.append(
            f"  {row['rank']:>3}. {row['name']} ({cid}){tier}  "
            f"score {row[f'score_{method}']:.3f}{sure}"
        )
    if len(ranking) > rows:
        out.append(f"  ... and {len(ranking) - rows} more in the results workbook")
    for e in result.excluded:
        out.append(
            f"  excluded: {e['corridor_id']} ({e['criterion']} {e['value']:.4g} "
            f"against limit {e['limit']:.4g})"
        )
    if tiered and len(ranking):
        out.extend(f"  {line}" for line in recommendation(result))
        t = getattr(result.robustness, "tiers", None)
        if t is not None and t.samples:  # without samples the summary already says so
            out.append(f"  {tier_rule(result)}")
    from .workbook import CAUTION

    out.append(f"  {CAUTION}")
    return out
