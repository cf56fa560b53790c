"""One function per result sheet of the results workbook.

To add a sheet, write ``def my_sheet(writer, result)`` here and append it to
:data:`WRITERS`; it is then written after the others on every run. In the
results workbook a table's body is written as XML text, not cell objects
(``SheetWriter(text_bodies=True)``): a sheet never reads or changes a body's
cells after ``writer.table`` (it shades rows with ``fills=``), and the save
refuses a cell made inside a body.
"""

from __future__ import annotations

import pandas as pd
from openpyxl.utils import get_column_letter

from ..files import shown
from ..workbook.schema import BUILTIN_CRITERIA
from .live_sheet import live_sheet
from .narrative import (
    assumptions_used,
    consistency_text,
    coverage_sentence,
    futures,
    plan_differences,
    plan_warnings,
    rank_intervals,
    reversal_sentences,
    shaken_samples,
    stakeholders,
    tipping_sentences,
    vikor_note,
)
from .summary import SHOWN_CORRIDORS, folded_acceptability, has_samples
from .workbook import (
    CAUTION,
    HEADER_FONT,
    WARN_FILL,
    bar_chart,
    colour_scale,
    put,
    safe_value,
)

#: Scored corridors above which the detail tables keep only the first corridors by rank:
#: the tables of one row per corridor and criterion (tipping points, weight ranges) and
#: the wide per-corridor detail (normalised matrices, sizing, acceptability, central
#: weights). Up to this many, every table holds every corridor [-].
LARGE_NETWORK = 2000
#: Corridors, the first by rank, that those tables keep above :data:`LARGE_NETWORK` [-].
DETAIL_CORRIDORS = 500
#: Where each summarised table's full data is, for the sheet's note.
JSON_HAS_ALL = "the JSON summary of ranker run --json lists every corridor"


def detail_corridors(result) -> set | None:
    """Return the corridors the detail tables keep (None: every corridor).

    Above :data:`LARGE_NETWORK` scored corridors a table of one row per
    corridor and criterion says nothing a planner reads row by row (at 10,000
    corridors and 8 criteria, 80,000 rows), and writing those tables was most
    of the results workbook's time; they keep the first
    :data:`DETAIL_CORRIDORS` corridors by rank, and the sheet says so.
    """
    ids = result.ranking.index
    if len(ids) <= LARGE_NETWORK:
        return None
    return set(ids[:DETAIL_CORRIDORS])


def summary_note(result, tables: str, full: str) -> str:
    """Say which tables of a sheet were cut to the first corridors by rank, and where all are."""
    return (
        f"With {len(result.ranking):,} scored corridors (more than {LARGE_NETWORK:,}), "
        f"{tables} list only the first {DETAIL_CORRIDORS:,} corridors by rank; {full}."
    )


def _kept(frame, keep: set | None, column: str | None = None):
    """Rows of ``frame`` for the corridors in ``keep`` (all rows when None), order kept."""
    if keep is None:
        return frame
    ids = frame.index if column is None else frame[column]
    return frame[ids.isin(keep)]


def chart_height(bars: int) -> float:
    """Height of a bar chart in cm for ``bars`` bars [cm]."""
    return min(24.0, 3.0 + 0.55 * bars)


def tiers_sheet(writer, result) -> None:
    """The Tiers sheet (:mod:`ranker.report.tiers_sheet`)."""
    from .tiers_sheet import tiers_sheet as write

    write(writer, result)


def criterion_unit(key: str) -> str:
    """Return the unit of a criterion for headers ("" where unknown)."""
    return BUILTIN_CRITERIA[key].unit if key in BUILTIN_CRITERIA else ""


def ranking_sheet(writer, result) -> None:
    """Rank, corridor, tier, scores and ranks per method, first-rank acceptability, flags."""
    ws = writer.sheet("Ranking", "Corridor ranking", CAUTION)
    table = result.ranking.copy()
    rob = result.robustness
    if has_samples(rob):
        table["first_rank_acceptability"] = rob.first_rank.reindex(table.index)
    flags = {cid: [] for cid in table.index}
    for group in result.scores.ties:
        for cid in group:
            flags[cid].append("tied")
    table["flags"] = [", ".join(dict.fromkeys(flags[c])) for c in table.index]
    units = {c: "[-]" for c in table.columns if c.startswith("score_")}
    units["first_rank_acceptability"] = "[-]"
    formats = {c: "0.000" for c in units}
    top, left, bottom, right = writer.table(
        ws, table, units=units, formats=formats, index_label="corridor_id"
    )
    primary = f"score_{result.primary_method}"
    col = left + list(table.reset_index().columns).index(primary)
    last = min(bottom, top + SHOWN_CORRIDORS)  # a chart of thousands of bars helps nobody
    bar_chart(
        ws,
        title=f"Score by corridor ({result.primary_method}), first {last - top}",
        y_title="score [-]",
        cats=(left + 2, top + 1, left + 2, last),
        data=(col, top, col, last),
        anchor=f"B{bottom + 3}",
        height=chart_height(last - top),
    )


def criteria_sheet(writer, result) -> None:
    """Criteria matrix with units and a derived/given mark; excluded corridors listed."""
    ws = writer.sheet("Criteria matrix", "Criteria by corridor, in each criterion's unit")
    m = result.matrix.copy()
    m.insert(0, "name", result.inputs.corridors.loc[m.index, "name"])
    excluded = {e["corridor_id"] for e in result.excluded}
    m["status"] = ["excluded" if c in excluded else "scored" for c in m.index]
    units = {c.key: criterion_unit(c.key) for c in result.criteria if criterion_unit(c.key)}
    notes = {
        c.key: f"{c.label}; {c.direction}; {result.provenance.get(c.key, 'given')}"
        for c in result.criteria
    }
    top, left, bottom, right = writer.table(
        ws, m, units=units, notes=notes, index_label="corridor_id"
    )
    row = bottom + 2
    put(ws, row, 1, "criterion").font = HEADER_FONT
    for j, h in enumerate(["label", "direction", "source", "unit"]):
        put(ws, row, 2 + j, h).font = HEADER_FONT
    for i, c in enumerate(result.criteria, start=1):
        for j, v in enumerate(
            [c.key, c.label, c.direction, result.provenance.get(c.key), criterion_unit(c.key)]
        ):
            put(ws, row + i, 1 + j, v)
    if result.excluded:
        row += len(result.criteria) + 2
        put(ws, row, 1, "Excluded before scoring").font = HEADER_FONT
        ex = pd.DataFrame(result.excluded)
        writer.table(ws, ex, top=row + 1, name="excluded")


def normalised_sheet(writer, result) -> None:
    """Normalised and weighted matrices of the primary method, and contributions."""
    keep = detail_corridors(result)
    note = ""
    if keep is not None:
        note = summary_note(
            result,
            "the three tables",
            "every corridor's criteria are on the Criteria matrix sheet and its scores on "
            "Ranking and Methods",
        )
    ws = writer.sheet(
        "Normalised", f"Normalised and weighted matrices ({result.primary_method})", note
    )
    s = result.scores
    _, _, bottom, _ = writer.table(
        ws, _kept(s.normalized, keep), index_label="corridor_id", name="normalised"
    )
    put(ws, bottom + 2, 1, "Weighted (normalised x weight)").font = HEADER_FONT
    _, _, bottom, _ = writer.table(
        ws, _kept(s.weighted, keep), top=bottom + 3, index_label="corridor_id", name="weighted"
    )
    put(
        ws,
        bottom + 2,
        1,
        "Weighted-sum contribution of each criterion (adds up to the weighted-sum score)",
    ).font = HEADER_FONT
    contrib = _kept(s.contributions.loc[result.ranking.index], keep)
    top, left, bottom2, right = writer.table(
        ws, contrib, top=bottom + 3, index_label="corridor_id", name="contributions"
    )
    if len(contrib.columns):
        last = min(bottom2, top + SHOWN_CORRIDORS)
        bar_chart(
            ws,
            title="Weighted contribution of each criterion",
            y_title="score [-]",
            cats=(left, top + 1, left, last),
            data=(left + 1, top, right, last),
            anchor=f"B{bottom2 + 3}",
            stacked=True,
            height=chart_height(last - top),
        )


def weights_sheet(writer, result) -> None:
    """Every weight set, how it was obtained, overrides and consistency."""
    ws = writer.sheet("Weights used", f"Weights: set '{result.weight_set}' used in this run")
    keys = [c.key for c in result.criteria]
    frame = pd.DataFrame(index=pd.Index(keys, name="criterion"))
    frame["label"] = [c.label for c in result.criteria]
    frame["used [-]"] = [result.weights.get(k, 0.0) for k in keys]
    frame["full credit at"] = [result.full_credit.get(k) for k in keys]
    spread = result.diagnostics.get("spread_share", {})
    frame["share of the score spread [-]"] = [spread.get(k, 0.0) for k in keys]
    notes = result.weight_notes()
    if any(notes.values()):
        frame["chosen [-]"] = [result.chosen_weights.get(k, 0.0) for k in keys]
        frame["why they differ"] = [notes.get(k, "") for k in keys]
    for w in result.weight_sets:
        frame[f"{w.name} [-]"] = [w.weights.get(k, float("nan")) for k in keys]
        if w.how == "points" or "rank" in w.how:
            frame[f"{w.name} (as typed)"] = [w.given.get(k, float("nan")) for k in keys]
    _, _, bottom, _ = writer.table(
        ws,
        frame,
        index_label="criterion",
        formats={c: "0.000" for c in frame.columns if "[-]" in c},
    )
    row = bottom + 2
    put(ws, row, 1, "set").font = HEADER_FONT
    for j, h in enumerate(["how obtained", "reference only", "consistency"]):
        put(ws, row, 2 + j, h).font = HEADER_FONT
    for i, w in enumerate(result.weight_sets, start=1):
        cons = ""
        if w.consistency:
            cons = consistency_text(w.consistency)
        for j, v in enumerate([w.name, w.how, "yes" if w.reference_only else "no", cons]):
            put(ws, row + i, 1 + j, v)
    if result.overrides:
        row += len(result.weight_sets) + 2
        put(
            ws, row, 1, "Final shares set on the command line (--weight KEY=SHARE) [%]"
        ).font = HEADER_FONT
        put(ws, row, 2, "the other criteria kept their proportions; see used [-] above")
        for i, (k, v) in enumerate(result.overrides.items(), start=1):
            put(ws, row + i, 1, k)
            put(ws, row + i, 2, v)


def methods_sheet(writer, result) -> None:
    """Scores and ranks per method and the agreement between methods."""
    s = result.scores
    ws = writer.sheet("Methods", "Scores and ranks by method, and how far the methods agree")
    frame = pd.concat([s.scores.add_prefix("score_"), s.ranks.add_prefix("rank_")], axis=1)
    frame = frame.loc[result.ranking.index]
    _, _, bottom, _ = writer.table(ws, frame, index_label="corridor_id", name="method_scores")
    for label, key in (
        ("Kendall's tau between methods' orders", "kendall"),
        ("Spearman's rho between methods' orders", "spearman"),
    ):
        if key in s.agreement and len(s.agreement[key]):
            put(ws, bottom + 2, 1, label).font = HEADER_FONT
            _, _, bottom, _ = writer.table(
                ws, s.agreement[key], top=bottom + 3, index_label="method", name=key
            )
    if s.vikor:
        v = s.vikor
        put(
            ws, bottom + 2, 1, f"VIKOR compromise (v = {v.get('v')}), Opricovic and Tzeng (2004)"
        ).font = HEADER_FONT
        put(ws, bottom + 3, 1, vikor_note(v))
        put(
            ws,
            bottom + 4,
            1,
            "acceptable advantage: "
            + ("yes" if v.get("acceptable_advantage") else "no")
            + "; acceptable stability: "
            + ("yes" if v.get("acceptable_stability") else "no")
            + "; compromise set: "
            + ", ".join(v.get("compromise_set", [])),
        )
        bottom += 4
    movers = s.agreement.get("movers", [])
    put(
        ws, bottom + 2, 1, "Corridors that move more than one place between methods"
    ).font = HEADER_FONT
    if movers:
        writer.table(ws, pd.DataFrame(movers), top=bottom + 3, name="movers")
    else:
        put(ws, bottom + 3, 1, "none")


def sizing_sheet(writer, result) -> None:
    """Derivation detail: sizing, energy and cost parts per corridor; adoption path."""
    d = result.derivation
    if d is None:
        return
    keep = detail_corridors(result)
    note = ""
    if keep is not None:
        note = summary_note(
            result,
            "the sizing rows",
            "the Criteria matrix sheet lists every corridor's derived criteria",
        )
    ws = writer.sheet(
        "Sizing", "How the derived criteria were computed, corridor by corridor", note
    )
    sizing = _kept(d.sizing, keep).copy()
    sizing.insert(0, "name", result.inputs.corridors.loc[sizing.index, "name"])
    writer.table(
        ws, sizing, units=d.units, notes=d.notes, index_label="corridor_id", name="sizing"
    )
    if d.adoption is not None and len(d.adoption):
        ws2 = writer.sheet("Adoption path", "Electric share of heavy trucks, year by year")
        writer.table(
            ws2,
            d.adoption.set_index("year") if "year" in d.adoption else d.adoption,
            units=d.units,
            notes=d.notes,
            index_label="year",
            name="adoption",
        )


def robustness_sheet(writer, result) -> None:
    """Acceptability matrix (colour scale), tipping points, rank-reversal results."""
    rob = result.robustness
    if rob is None:
        return
    keep = detail_corridors(result)
    ws = writer.sheet(
        "Robustness",
        "How sure is the order? "
        + (
            f"{shaken_samples(result, rob.samples)}, seed {rob.seed}"
            if rob.samples
            else "No Monte Carlo samples (--samples 0)"
        ),
        ""
        if keep is None
        else summary_note(result, "the acceptability and tipping-point tables", JSON_HAS_ALL),
    )
    row = 4
    if has_samples(rob):
        # Rows picked before they are put in rank order: the whole n-by-n matrix is
        # never copied (at 10,000 corridors, 800 MB).
        acc = folded_acceptability(rob.acceptability.loc[_kept(result.ranking, keep).index])
        top, left, bottom, right = writer.table(
            ws,
            acc,
            index_label="corridor_id",
            name="acceptability",
            formats={c: "0%" for c in acc.columns},
        )
        colour_scale(
            ws, f"{get_column_letter(left + 1)}{top + 1}:{get_column_letter(right)}{bottom}"
        )
        row = bottom + 2
    else:
        put(ws, row, 1, "Monte Carlo turned off (--samples 0).")
        row += 2
    put(ws, row, 1, "Weight tipping points").font = HEADER_FONT
    # Only the rows written are worded (at 10,000 corridors wording them all was
    # most of this sheet's time).
    records = rob.tipping_points
    if keep is not None:
        records = [t for t in records if t.get("corridor_id") in keep]
    tips = pd.DataFrame(records)
    if len(tips):
        tips["sentence"] = tipping_sentences(result, records)
    if len(tips):
        _, _, row, _ = writer.table(ws, tips, top=row + 1, name="tipping")
    else:
        put(ws, row + 1, 1, "No weight change within 0..1 alters the order.")
        row += 1
    row += 2
    put(ws, row, 1, "Rank-reversal checks").font = HEADER_FONT
    checks = pd.DataFrame(
        [
            {"check": c.get("check"), "passed": c.get("passed"), "result": sentence}
            for c, sentence in zip(rob.rank_reversal, reversal_sentences(result), strict=True)
        ]
    )
    if len(checks):
        # A failed check's row is shaded (its "passed" cell reads "no").
        fills = [WARN_FILL if safe_value(p) == "no" else None for p in checks["passed"]]
        writer.table(ws, checks, top=row + 1, name="reversal", fills=fills)


def more_robustness_sheet(writer, result) -> None:
    """Weight intervals per corridor, central weights, confidence, stakeholders, futures."""
    rob = result.robustness
    if rob is None:
        return
    keep = detail_corridors(result)
    ws = writer.sheet(
        "Weight ranges",
        "Over which weights does each corridor keep its rank?",
        ""
        if keep is None
        else summary_note(result, "the weight-range and central-weight tables", JSON_HAS_ALL),
    )
    bottom = 2
    intervals = _kept(rob.rank_intervals, keep, "corridor_id")
    if len(intervals):
        _, _, bottom, _ = writer.table(
            ws, rank_intervals(result, intervals), name="rank_intervals"
        )
    if has_samples(rob):
        put(
            ws,
            bottom + 2,
            1,
            "Central weights (mean weights of the samples in which the corridor "
            "ranks first) and confidence factors (SMAA-2)",
        ).font = HEADER_FONT
        central = rob.central_weights.copy()
        central["confidence_factor"] = rob.confidence.reindex(central.index)
        central = central.loc[[c for c in result.ranking.index if c in central.index]]
        central = _kept(central, keep)
        _, _, bottom, _ = writer.table(
            ws, central, top=bottom + 3, index_label="corridor_id", name="central_weights"
        )
    st = stakeholders(result)
    if st:
        put(ws, bottom + 2, 1, "Rank by weight set, and the consensus order").font = HEADER_FONT
        put(ws, bottom + 3, 1, st.get("sentence", ""))
        ranks = pd.DataFrame(st["ranks"])
        consensus = pd.DataFrame(st["consensus"]).set_index("corridor_id")
        table = ranks.join(consensus, how="left").loc[consensus.index]
        _, _, bottom, _ = writer.table(
            ws, table, top=bottom + 4, index_label="corridor_id", name="stakeholders"
        )
    f = futures(result)
    if f:
        ws2 = writer.sheet("Futures", "Rank under each future of the Scenarios sheet")
        put(ws2, 3, 1, f.get("sentence", ""))
        table = pd.DataFrame(f["corridors"]).set_index("corridor_id")
        ranks = pd.DataFrame(f["ranks"])
        table = table.join(ranks, how="left")
        writer.table(ws2, table, top=4, index_label="corridor_id", name="futures")


def budget_sentence(plan) -> str:
    """Say how far the first year's money goes and how many years the plan spans."""
    greedy = plan.greedy
    first = float(plan.budget["capital_usd"].iloc[0])
    costs = greedy["capital_usd"].astype(float).cumsum()
    fits = int((costs <= first + 1e-6).sum())
    funded = greedy["year_funded"].dropna()
    years = sorted({int(y) for y in funded})
    span = f"{years[0]} to {years[-1]}" if years else "no year"
    left = int(greedy["year_funded"].isna().sum())
    who = (
        "none of the corridors"
        if fits == 0
        else "the first corridor"
        if fits == 1
        else f"the first {fits} corridors"
    )
    return (
        f"The first year's {first / 1e6:,.1f} million USD pays for {who} by rank; all "
        f"{len(greedy)} corridors together cost "
        f"{float(greedy['capital_usd'].sum()) / 1e6:,.1f} million USD. The greedy plan funds "
        f"corridors from {span}"
        + (
            f", and {left} {'stays' if left == 1 else 'stay'} unfunded within the budget."
            if left
            else "."
        )
    )


def plan_sheet(writer, result) -> None:
    """Phased build plan: year by corridor, spend, remaining budget."""
    plan = result.plan
    if plan is None:
        return
    ws = writer.sheet(
        "Phasing", f"Build plan under the Budget sheet (objective: {plan.objective})"
    )
    _, _, bottom, _ = writer.table(
        ws, plan.budget.set_index("year"), index_label="year", name="plan_budget"
    )
    put(ws, bottom + 2, 1, "Spend by year and corridor").font = HEADER_FONT
    _, _, bottom, _ = writer.table(ws, plan.schedule, top=bottom + 3, name="plan_schedule")
    lines = [budget_sentence(plan), f"Optimality gap of the optimised plan: {plan.gap:.2%}."]
    lines += plan_differences(result)
    coverage = coverage_sentence(result)
    if coverage:
        lines.append(coverage)
    lines += [f"warning: {w}" for w in plan_warnings(result)]
    for i, sentence in enumerate(lines, start=bottom + 2):
        put(ws, i, 1, sentence)
    bottom += len(lines) + 2
    corridors = plan.optimised.set_index("corridor_id").add_prefix("optimised_")
    corridors = corridors.join(
        plan.greedy.set_index("corridor_id")[["year_funded"]].rename(
            columns={"year_funded": "greedy_year_funded"}
        )
    )
    if plan.year_one_share is not None:
        corridors["funded_in_year_one_share"] = plan.year_one_share.reindex(corridors.index)
    writer.table(ws, corridors, top=bottom + 1, index_label="corridor_id", name="plan_corridors")


#: Lines of each part of "what changed" on the Run info sheet (the JSON summary has all).
RUN_INFO_CHANGES = 2000


def run_info_changes(result) -> list[str]:
    """The "changes since the last run" lines of the Run info sheet."""
    from ..changes import describe

    previous = result.change_record.get("previous")
    if not previous:
        return ["no earlier results workbook to compare with"]
    lines = describe(
        result.change_record,
        limit=RUN_INFO_CHANGES,
        more="the JSON summary of ranker run --json lists all",
    )
    return [f"compared with {previous}"] + lines


def run_info_sheet(writer, result) -> None:
    """Version, input SHA-256, seed, samples, timestamp, assumptions, every warning."""
    ws = writer.sheet("Run info", "Run information")
    info = [
        ("tool", f"ranker {result.tool_version}"),
        ("input file", shown(result.inputs.path.name)),
        ("input SHA-256", result.inputs.sha256),
        ("run started (UTC)", result.started),
        ("weight set", result.weight_set),
        (
            "weight overrides",
            ", ".join(f"{k}={v:g}%" for k, v in result.overrides.items()) or "none",
        ),
        ("primary method", result.primary_method),
        ("methods", ", ".join(result.scores.scores.columns)),
        ("Monte Carlo samples", result.samples),
        ("seed", result.seed),
        ("caution", CAUTION),
    ]
    for i, (k, v) in enumerate(info, start=4):
        put(ws, i, 1, k).font = HEADER_FONT
        put(ws, i, 2, v)
    row = 4 + len(info) + 1
    put(ws, row, 1, "Changes since the last run").font = HEADER_FONT
    changes = run_info_changes(result)
    for i, line in enumerate(changes, start=row + 1):
        put(ws, i, 1, line)
    row += len(changes) + 2
    put(ws, row, 1, "Warnings").font = HEADER_FONT
    for i, w in enumerate(result.warnings or ["none"], start=row + 1):
        put(ws, i, 1, w)
    row = row + 2 + max(1, len(result.warnings))
    put(ws, row, 1, "Assumptions used").font = HEADER_FONT
    table = pd.DataFrame(assumptions_used(result)).rename(
        columns={"set_by": "default or changed", "note": "meaning and source of the default"}
    )
    writer.table(ws, table, top=row + 1, name="assumptions_used")
    ws.column_dimensions["A"].width = 26
    ws.column_dimensions["B"].width = 70


def contents_sheet(writer, result) -> None:
    """The first result sheet: a link to every result sheet and what each holds.

    Written after the others (it lists them), then moved in front of them.
    """
    from openpyxl.worksheet.hyperlink import Hyperlink

    listed = list(writer.names)
    ws = writer.sheet("Contents", "Contents: the result sheets of this run", CAUTION)
    put(ws, 4, 1, "sheet").font = HEADER_FONT
    put(ws, 4, 2, "what it holds").font = HEADER_FONT
    for i, name in enumerate(listed, start=5):
        cell = put(ws, i, 1, name)
        cell.hyperlink = Hyperlink(ref=cell.coordinate, location=f"'{name}'!A1", display=name)
        cell.style = "Hyperlink"
        put(ws, i, 2, writer.titles.get(name, ""))
    row = 5 + len(listed) + 1
    ours = set(listed) | {ws.title}
    kept = [n for n in writer.wb.sheetnames if n not in ours and not n.startswith("ranker_")]
    put(
        ws,
        row,
        1,
        "Your sheets come first, as you left them: "
        + (", ".join(kept) or "none")
        + ". Edit them and run this workbook again to refresh these result sheets.",
    )
    ws.freeze_panes = "A5"
    ws.column_dimensions["A"].width = 24
    ws.column_dimensions["B"].width = 90
    wb = writer.wb
    if listed:
        wb.move_sheet(ws, offset=wb.index(wb[listed[0]]) - wb.index(ws))
    writer.names.remove(ws.title)
    writer.names.insert(0, ws.title)


#: Result sheets in the order they are written.
WRITERS = [
    ranking_sheet,
    criteria_sheet,
    normalised_sheet,
    weights_sheet,
    live_sheet,
    methods_sheet,
    sizing_sheet,
    robustness_sheet,
    tiers_sheet,
    more_robustness_sheet,
    plan_sheet,
    run_info_sheet,
]

__all__ = [
    "DETAIL_CORRIDORS",
    "LARGE_NETWORK",
    "WRITERS",
    "contents_sheet",
    "criterion_unit",
    "detail_corridors",
]
