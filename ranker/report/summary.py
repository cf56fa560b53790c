"""The JSON summary of the contract, built from a Result."""

from __future__ import annotations

import pandas as pd

from ..plain import plain

#: Rank columns shown in the workbook and the heatmap before later ranks are folded.
ACCEPTABILITY_COLUMNS = 25
#: Corridors shown in each chart and given a card on the justification sheet;
#: every corridor is in the workbook.
SHOWN_CORRIDORS = 40


def folded_acceptability(acceptability: pd.DataFrame, columns: int = ACCEPTABILITY_COLUMNS):
    """Keep ranks 1..columns and fold the rest into one "later" column (rows still sum to 1)."""
    if acceptability.shape[1] <= columns + 1:
        return acceptability
    kept = acceptability.iloc[:, :columns].copy()
    kept[f"rank {columns + 1} or later"] = acceptability.iloc[:, columns:].sum(axis=1)
    return kept


def has_samples(robustness) -> bool:
    """True where a Monte Carlo analysis ran (samples > 0)."""
    return robustness is not None and robustness.acceptability.size > 0


def _with_sentence(record: dict, sentence: str) -> dict:
    """A check's JSON record with its sentence after ``details`` (its numbers stay inside)."""
    out = {}
    for key, value in record.items():
        if key != "facts":
            out[key] = value
        if key == "details":
            out["sentence"] = sentence
    return out


def _plan_json(result) -> dict | None:
    """The plan's JSON with its differences in words after ``budget``, its warnings in words."""
    from .narrative import coverage_sentence, plan_differences, plan_warnings

    if result.plan is None:
        return None
    out = {}
    for key, value in result.plan.to_json().items():
        out[key] = value
        if key == "budget":
            out["differences"] = plan_differences(result)
    if out.get("coverage"):
        out["coverage"] = {**out["coverage"], "sentence": coverage_sentence(result)}
    out["warnings"] = plan_warnings(result)
    return out


def summary_json(result) -> dict:
    """Return the JSON summary of ``result`` (every contract field, plus more)."""
    from ..changes import json_changes
    from ..files import shown
    from .narrative import assumptions_used, futures, vikor_note

    s = result.scores
    rob = result.robustness
    acceptability = rob.acceptability if has_samples(rob) else None
    ranking = []
    for cid, row in result.ranking.iterrows():
        entry = {
            "corridor_id": str(cid),
            "name": str(row["name"]),
            "rank": int(row["rank"]),
            "tier": int(row["tier"]),
            "scores": {m: float(s.scores.at[cid, m]) for m in s.scores.columns},
            "ranks": {m: int(s.ranks.at[cid, m]) for m in s.ranks.columns},
            "criteria": {k: float(result.matrix.at[cid, k]) for k in result.matrix.columns},
        }
        ranking.append(entry)
    robustness = {"samples": result.samples}
    if rob is not None:
        from .narrative import (
            closeness,
            rank_intervals,
            reversal_sentences,
            stakeholders,
            stress_warnings,
            tipping_sentences,
        )

        robustness.update(rob.to_json(worded_later=("rank_intervals", "closeness")))
        robustness["samples"] = result.samples
        for record, sentence in zip(
            robustness["tipping_points"], tipping_sentences(result), strict=True
        ):
            record["sentence"] = sentence
        robustness["rank_intervals"] = [
            plain(r) for r in rank_intervals(result).to_dict(orient="records")
        ]
        robustness["stakeholders"] = stakeholders(result)
        robustness["warnings"] = stress_warnings(result)
        robustness["closeness"] = [plain(r) for r in closeness(result).to_dict(orient="records")]
        robustness["rank_reversal"] = [
            _with_sentence(record, sentence)
            for record, sentence in zip(
                robustness["rank_reversal"], reversal_sentences(result), strict=True
            )
        ]
    else:
        robustness.update({"rank_reversal": [], "tipping_points": []})
    out = {
        "tool_version": result.tool_version,
        "input_sha256": result.inputs.sha256,
        "input_file": shown(result.inputs.path.name),
        "weight_set": result.weight_set,
        "weights": {k: float(v) for k, v in result.weights.items()},
        "weights_chosen": {k: float(v) for k, v in result.chosen_weights.items()},
        "weight_notes": {k: v for k, v in result.weight_notes().items() if v},
        "weight_overrides": dict(result.overrides),
        "primary_method": result.primary_method,
        "methods": {
            "used": list(s.scores.columns),
            "primary": result.primary_method,
            "kendall": s.agreement["kendall"].to_dict() if "kendall" in s.agreement else {},
            "spearman": s.agreement["spearman"].to_dict() if "spearman" in s.agreement else {},
            "movers": s.agreement.get("movers", []),
            "vikor": {**s.vikor, "note": vikor_note(s.vikor)} if s.vikor else s.vikor,
        },
        "seed": result.seed,
        "ranking": ranking,
        "criteria": {
            c.key: {
                "label": c.label,
                "direction": c.direction,
                "source": result.provenance.get(c.key, "given"),
                "full_credit_at": result.full_credit.get(c.key),
            }
            for c in result.criteria
        },
        "weights_sets": [
            {
                "name": w.name,
                "how": w.how,
                "reference_only": bool(w.reference_only),
                "weights": w.weights,
                "consistency": w.consistency,
            }
            for w in result.weight_sets
        ],
        "robustness": robustness,
        "diagnostics": result.diagnostics,
        "rank_acceptability": {},
        "excluded": result.excluded,
        "ties": s.ties,
        "futures": futures(result),
        "plan": _plan_json(result),
        "warnings": list(result.warnings),
        "started": result.started,
        "changes_since_last_run": list(result.changes),
        "changes": json_changes(result.change_record),
        "assumptions": assumptions_used(result),
        "outputs": dict(result.outputs),
    }
    out = plain(out)
    # Shares are finite by construction; attached after plain() to keep large runs fast.
    rows = {}
    if acceptability is not None:
        table = acceptability.loc[result.ranking.index]
        rows = dict(zip(map(str, table.index), table.to_numpy(dtype=float).tolist(), strict=True))
    for entry in out["ranking"]:
        entry["rank_acceptability"] = rows.get(entry["corridor_id"], [])
    out["rank_acceptability"] = rows
    return out
