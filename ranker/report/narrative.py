"""Sentences for the justification sheet, each generated from the numbers.

No sentence claims what the numbers do not show: certainty words follow the
first-rank acceptability, agreement words follow Kendall's tau.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from .summary import has_samples


def certainty_word(share: float) -> str:
    """Describe a first-rank acceptability in words (thresholds: common practice)."""
    if share >= 0.9:
        return "very likely"
    if share >= 0.7:
        return "likely"
    if share >= 0.5:
        return "more likely than not"
    return "not clearly"


def recommendation(result) -> list[str]:
    """Return the two-sentence recommendation for the decision summary."""
    ranking = result.ranking
    names = ranking["name"].astype(str).tolist()
    top = names[0]
    first = ranking.index[0]
    s1 = f"Fund {top} first"
    if len(names) > 1:
        s1 += f", then {names[1]}" + (f" and {names[2]}" if len(names) > 2 else "")
    label = method_labels([result.primary_method])[result.primary_method]
    s1 += f" ({label}, weight set '{result.weight_set}')."
    rob = result.robustness
    if has_samples(rob):
        share = float(rob.first_rank.get(first, 0.0))
        s2 = (
            f"{top} ranks first in {share:.0%} of {rob.samples:,} weight samples around these "
            f"weights, so it is {certainty_word(share)} the best choice"
        )
        others = rob.first_rank.drop(first, errors="ignore")
        if len(others) and others.max() > 0.05:
            rival = others.idxmax()
            s2 += (
                f"; {result.inputs.corridors.at[rival, 'name']} is its nearest rival "
                f"({others.max():.0%})."
            )
        else:
            s2 += "."
    else:
        s2 = "No Monte Carlo analysis was run, so how sure the order is was not measured."
    return [s1, s2]


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
    from ..score.normalize import normalize_minmax

    keys = [c.key for c in result.criteria if c.key in result.scores.weights]
    scored = result.matrix.loc[result.scores.rank.index, keys]
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


def fmt(value) -> str:
    """Format a number for a sentence: thousands separators, 3 significant digits."""
    try:
        v = float(value)
    except (TypeError, ValueError):
        return str(value)
    if not np.isfinite(v):
        return "n/a"
    if abs(v) >= 1e6:
        return f"{v / 1e6:,.1f} million"
    if abs(v) >= 1000 or v.is_integer():
        return f"{v:,.0f}"
    if abs(v) >= 10:
        return f"{v:.1f}"
    return f"{v:.3g}"


def reversal_sentences(result) -> list[str]:
    """Plain-word results of the rank-reversal checks."""
    rob = result.robustness
    if rob is None:
        return []
    out = []
    for c in rob.rank_reversal:
        sentence = c.get("sentence") or (
            f"{c.get('check')}: {'passed' if c.get('passed') else 'failed'}."
        )
        out.append(sentence)
    return out


def consistency_text(c: dict | None) -> str:
    """Describe an AHP consistency result in words and numbers ("" where none)."""
    if not c:
        return ""

    def num(key):
        v = c.get(key)
        return "n/a" if v is None else f"{v:.4f}"

    text = f"lambda_max {num('lambda_max')}, CI {num('ci')}, CR {num('cr')}"
    cr = c.get("cr")
    if cr is None:
        text += " (no random index for this many criteria, so no consistency ratio)"
    elif cr > 0.10:
        text += " - above 0.10, so the judgments are not consistent enough (Saaty 1980)"
    else:
        text += " - at most 0.10, acceptable (Saaty 1980)"
    if c.get("suggestion"):
        text += f"; {c['suggestion']}"
    return text


def method_labels(methods) -> dict:
    """Method key to its label for people (TOPSIS, Weighted sum, VIKOR (Q))."""
    from ..score import METHODS

    return {m: METHODS[m].label if m in METHODS else m for m in methods}


def assumptions_used(result) -> list[dict]:
    """Every assumption with the value used, whether it is the default, and the default.

    ``set_by`` is ``"default"`` where the value cell was blank or holds the
    default itself, ``"changed"`` where the planner typed another value;
    ``default`` holds the default beside a changed value (empty otherwise).
    ``note`` describes the default and its source, so it is labelled that
    way beside a changed value.
    """
    from ..assumptions import ASSUMPTIONS

    def plain(value):
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
        value = plain(result.assumptions[k])
        default = plain(a.default)
        changed = k in given and value != default
        rows.append(
            {
                "key": k,
                "value": value,
                "unit": a.unit,
                "set_by": "changed" if changed else "default",
                "default": default if changed else "",
                "note": f"The default ({default}): {a.note}" if changed else a.note,
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
        f"tier in at least {t.confidence:.0%} of {t.samples:,} samples (weights"
        + (" and values" if _values_shaken(result) else "")
        + " shaken); inside a tier the order is not settled by the evidence."
    )


def _values_shaken(result) -> bool:
    return any(c.uncertainty_pct for c in result.criteria)


def tier_groups(result) -> list[dict]:
    """Each tier with its corridors in order: ``{"tier", "ids", "names"}``."""
    ranking = result.ranking
    out: list[dict] = []
    for cid, row in ranking.iterrows():
        tier = int(row["tier"])
        if not out or out[-1]["tier"] != tier:
            out.append({"tier": tier, "ids": [], "names": []})
        out[-1]["ids"].append(str(cid))
        out[-1]["names"].append(str(row["name"]))
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
