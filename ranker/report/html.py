"""The justification sheet: one self-contained, printable HTML file."""

from __future__ import annotations

import functools
from importlib import resources
from pathlib import Path

import jinja2

from ..files import HTML_MARKER
from . import charts, narrative
from .map import map_context
from .sheets import criterion_unit
from .summary import SHOWN_CORRIDORS, folded_acceptability, has_samples
from .words import share_text
from .workbook import CAUTION


def template_folder():
    """Return the folder holding the HTML template and its stylesheet.

    The installed package carries it as ``ranker.templates``; a source
    checkout on ``sys.path`` without installing has it at ``templates/``.
    """
    try:
        return resources.files("ranker.templates")
    except ModuleNotFoundError:
        return Path(__file__).resolve().parents[2] / "templates"


@functools.cache
def _environment() -> jinja2.Environment:
    """The sheet's template environment, made once per process.

    Its templates are compiled on first use (about 0.05 s) and kept, so the
    re-runs of ``ranker run --watch`` do not compile them again. The
    templates are package files, not the planner's.
    """
    folder = template_folder()
    loader = jinja2.FunctionLoader(lambda name: (folder / name).read_text(encoding="utf-8"))
    env = jinja2.Environment(loader=loader, autoescape=True, undefined=jinja2.StrictUndefined)
    # Shares of samples as every output says them (<1% and >99%, never a rounded 0% or 100%).
    env.filters["share"] = share_text
    return env


def _cards(result, shown) -> list[dict]:
    d = result.derivation
    rob = result.robustness
    cards = []
    tips = narrative.card_tips(result, list(shown))
    for cid, row in result.ranking.loc[shown].iterrows():
        strong, weak = narrative.strongest_weakest(result, cid)
        facts = []
        if d is not None and cid in d.sizing.index:
            s = d.sizing.loc[cid]
            for key, label in (
                ("ports", "charging ports"),
                ("sites", "charging sites"),
                ("capital_cost_usd", "capital cost [USD]"),
                ("peak_load_mw", "new peak load [MW]"),
                ("grid_headroom_mw", "grid headroom [MW]"),
                ("revenue_npv_usd", "charging margin NPV [USD]"),
                ("governing_rule", "ports set by"),
            ):
                if key in s.index:
                    facts.append(
                        (label, narrative.fmt(s[key]) if key != "governing_rule" else s[key])
                    )
        cards.append(
            {
                "id": cid,
                "name": row["name"],
                "rank": int(row["rank"]),
                "tier": int(row["tier"]),
                "score": float(row[f"score_{result.primary_method}"]),
                "first": float(rob.first_rank.get(cid, 0.0)) if has_samples(rob) else None,
                "strong": strong,
                "weak": weak,
                "facts": facts,
                "changes": tips[cid],
            }
        )
    return cards


def build_html(result) -> str:
    """Return the justification sheet for ``result`` as HTML text."""
    full = result.ranking
    # Charts and cards show the leading corridors; every corridor is in the table.
    ranking = full.iloc[:SHOWN_CORRIDORS]
    labels = [f"{r['rank']}. {r['name']}" for _, r in ranking.iterrows()]
    crit_labels = {c.key: c.label for c in result.criteria}
    s = result.scores
    rob = result.robustness
    figures = {
        "scores": charts.score_bars(
            labels,
            ranking[f"score_{result.primary_method}"].to_numpy(),
            method=result.primary_method,
        ),
        "contributions": charts.contribution_bars(
            s.contributions.loc[ranking.index], labels, crit_labels
        ),
        "acceptability": (
            charts.acceptability_heatmap(
                folded_acceptability(rob.acceptability.loc[ranking.index]), labels
            )
            if has_samples(rob)
            else ""
        ),
        "plan": (
            charts.plan_gantt(
                result.plan.greedy,
                result.plan.optimised,
                {cid: f"{r['rank']}. {r['name']}" for cid, r in full.iterrows()},
            )
            if result.plan is not None
            else ""
        ),
        "tipping": charts.tipping_chart(rob.tipping_points, crit_labels)
        if rob is not None
        else "",
    }
    shown_note = (
        f"Charts and cards show the first {len(ranking)} of {len(full)} corridors; "
        "the table above and the results workbook list them all."
        if len(full) > len(ranking)
        else ""
    )
    assumptions = narrative.assumptions_used(result)
    methods = list(s.scores.columns)
    primary = result.primary_method
    others = [m for m in methods if m != primary]
    first = rob.first_rank if has_samples(rob) else None
    rows = []
    for cid, r in full.to_dict("index").items():
        rows.append(
            {
                "rank": int(r["rank"]),
                "id": cid,
                "name": r["name"],
                "score": float(r[f"score_{primary}"]),
                "other_ranks": [int(r[f"rank_{m}"]) for m in others],
                "scores": [float(r[f"score_{m}"]) for m in methods],
                "ranks": [int(r[f"rank_{m}"]) for m in methods],
                "first": float(first.get(cid, 0.0)) if first is not None else None,
                "tier": int(r["tier"]),
            }
        )
    # The map has its own appendix section: on the demo's brief (page one) it does not fit.
    map_section = map_context(result)
    brief_map = ""
    context = {
        "marker": HTML_MARKER,
        "r": result,
        "vikor_note": narrative.vikor_note(result.scores.vikor) if result.scores.vikor else "",
        "rows": rows,
        "methods": methods,
        "primary": primary,
        "others": others,
        "labels": narrative.method_labels(methods),
        "recommendation": narrative.recommendation(result),
        "brief": _brief(result),
        "spread": narrative.spread_sentence(result),
        # Slot for a map on the brief (SVG text, drawn where it fits); "" = none.
        "brief_map": brief_map,
        "changed": [a for a in assumptions if a["set_by"] == "changed"],
        "defaults": [a for a in assumptions if a["set_by"] != "changed"],
        "agreement": narrative.agreement_sentence(result),
        "reversal": narrative.reversal_sentences(result),
        "figures": figures,
        "cards": _cards(result, ranking.index),
        "shown_note": shown_note,
        "stakeholders": narrative.stakeholders(result),
        "futures": narrative.futures(result),
        "plan": _plan_context(result),
        "map": map_section,
        "criteria": [
            {
                "key": c.key,
                "label": c.label,
                "direction": c.direction,
                "unit": criterion_unit(c.key),
                "source": result.provenance.get(c.key, "given"),
                "weight": result.weights.get(c.key, 0.0),
                "weight_note": result.weight_notes().get(c.key, ""),
                "full_credit": result.full_credit.get(c.key),
            }
            for c in result.criteria
        ],
        "weight_sets": result.weight_sets,
        "consistency": narrative.consistency_text,
        "assumptions": assumptions,
        "caution": CAUTION,
        "excluded": [
            {
                **e,
                "name": str(result.inputs.corridors["name"].get(e["corridor_id"], "")),
                "label": crit_labels.get(e["criterion"], e["criterion"]),
            }
            for e in result.excluded
        ],
    }
    context["since_last_run"] = _since_last_run(result)
    return _environment().get_template("sheet.html.j2").render(**context)


#: Tiers listed on the brief; later ones are counted, and listed in the appendix.
BRIEF_TIERS = 4
#: Corridors named per tier on the brief.
BRIEF_NAMES = 8


def _brief(result) -> dict:
    """Numbers and lines of the one-page board brief."""
    groups = narrative.tier_groups(result)
    shown = []
    for g in groups[:BRIEF_TIERS]:
        names = g["names"][:BRIEF_NAMES]
        if len(g["names"]) > BRIEF_NAMES:
            names = [*names, f"and {len(g['names']) - BRIEF_NAMES} more"]
        shown.append({"tier": g["tier"], "names": names})
    rest = groups[BRIEF_TIERS:]
    more = (
        f"{sum(len(g['ids']) for g in rest)} more corridors in {len(rest)} further tiers "
        "(appendix A)."
        if rest
        else ""
    )
    return {
        "tiers": shown,
        "more": more,
        "rule": narrative.tier_rule(result),
        "methods": narrative.methods_on_first_tier(result),
        "funded": narrative.funded_by_year(result),
        "first_waits": narrative.first_ranked_waits(result),
        "provenance": narrative.provenance_line(result),
    }


#: Lines of each part of "what changed" on the justification sheet; the workbook has all.
CHANGE_LINES = 40


def _since_last_run(result) -> dict | None:
    """The "what changed since the last run" block: three lists of sentences, or None."""
    from ..changes import describe

    record = result.change_record
    if not record.get("previous"):
        return None
    parts = {}
    for part in ("inputs", "criteria", "moved"):
        only = {"previous": record["previous"], **{k: [] for k in ("inputs", "criteria", "moved")}}
        only[part] = record.get(part, [])
        lines = (
            describe(only, limit=CHANGE_LINES, more="in the results workbook")
            if only[part]
            else []
        )
        parts[part] = [x for x in lines if not x.startswith(("No corridor", "Nothing changed"))]
    return {"previous": record["previous"], **parts}


def _plan_context(result) -> dict | None:
    """Numbers and sentences of the build plan for the sheet."""
    plan = result.plan
    if plan is None:
        return None
    names = result.inputs.corridors["name"].astype(str)
    first_year = int(plan.budget["year"].min())
    funded_first = plan.optimised.dropna(subset=["year_funded"])
    funded_first = funded_first[funded_first["year_funded"] == first_year]
    share = plan.year_one_share
    return {
        "objective": plan.objective,
        "gap": plan.gap,
        "values": plan.objective_value,
        "differences": narrative.plan_differences(result),
        "coverage": narrative.coverage_sentence(result),
        "first_year": first_year,
        "first": [
            {
                "id": cid,
                "name": names.get(cid, cid),
                "share": float(share[cid]) if share is not None and cid in share else None,
            }
            for cid in funded_first["corridor_id"]
        ],
        "budget": plan.budget.to_dict(orient="records"),
        "warnings": narrative.plan_warnings(result),
    }
