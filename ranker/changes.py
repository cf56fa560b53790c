"""What changed between two runs: weights, values, and who moved.

Both sides are JSON summaries (:func:`ranker.report.summary.summary_json`);
the previous one is read back from the previous results workbook.
"""

from __future__ import annotations


def compare(previous: dict | None, current: dict) -> list[str]:
    """Return plain sentences describing what changed since ``previous``.

    An empty list means nothing changed that moves the outputs; None as
    ``previous`` means there was no earlier run to compare with.
    """
    if not previous:
        return []
    out: list[str] = []
    if previous.get("weight_set") != current.get("weight_set"):
        out.append(
            f"Weight set changed from '{previous.get('weight_set')}' to "
            f"'{current.get('weight_set')}'."
        )
    pw, cw = previous.get("weights", {}), current.get("weights", {})
    for key in sorted(set(pw) | set(cw)):
        a, b = pw.get(key), cw.get(key)
        if a is None:
            out.append(f"Criterion {key} was added (weight {b:.3f}).")
        elif b is None:
            out.append(f"Criterion {key} was removed (weight was {a:.3f}).")
        elif abs(a - b) > 5e-4:
            out.append(f"Weight on {key} changed from {a:.3f} to {b:.3f}.")
    before = {r["corridor_id"]: r for r in previous.get("ranking", [])}
    now = {r["corridor_id"]: r for r in current.get("ranking", [])}
    for cid in sorted(set(now) - set(before)):
        out.append(
            f"{now[cid]['name']} ({cid}) is new in the ranking, at rank {now[cid]['rank']}."
        )
    for cid in sorted(set(before) - set(now)):
        out.append(f"{before[cid]['name']} ({cid}) is no longer ranked.")
    changed_values = []
    for cid in sorted(set(now) & set(before)):
        a, b = before[cid].get("criteria", {}), now[cid].get("criteria", {})
        for key in sorted(set(a) & set(b)):
            x, y = a[key], b[key]
            if x is None or y is None:
                continue
            if abs(x - y) > 1e-9 * max(1.0, abs(x), abs(y)):
                changed_values.append(f"{key} of {cid} {x:.4g} -> {y:.4g}")
    if changed_values:
        shown = "; ".join(changed_values[:8])
        more = f" (and {len(changed_values) - 8} more)" if len(changed_values) > 8 else ""
        out.append(f"Criterion values changed: {shown}{more}.")
    moved = []
    for cid in sorted(set(now) & set(before), key=lambda c: now[c]["rank"]):
        r0, r1 = before[cid]["rank"], now[cid]["rank"]
        if r0 != r1:
            moved.append(f"{now[cid]['name']} {'up' if r1 < r0 else 'down'} from {r0} to {r1}")
    if moved:
        out.append("Moved: " + "; ".join(moved) + ".")
    elif before and now and not out:
        out.append("The order is unchanged.")
    elif before and now:
        out.append("No corridor changed rank.")
    return out
