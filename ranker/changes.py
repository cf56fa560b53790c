"""What changed since the last run, for people: inputs by cell, values, ranks.

A run stores its *state* in the results workbook (:func:`run_state`): the
value of every input it read, keyed by what the value is (an assumption, a
weight of a set, a field of a corridor), with the weights, ranks, tiers and
criterion values it found. The next run compares its own state with that one
(:func:`compare`) and says in plain words what differs (:func:`describe`):
first each changed input by cell and label, with old and new values in their
unit; then the criterion values that moved; then the corridors that changed
rank or tier.
"""

from __future__ import annotations

from .plain import plain

#: Relative difference below which two numbers count as equal [-].
SAME = 1e-12
#: State format; a state of another version is not compared field by field.
STATE_VERSION = 2


# -- the state a run leaves behind ----------------------------------------------------


def _plain(value):
    """A value as the state sheet stores it: words as typed, then plain JSON types."""
    if isinstance(value, tuple):
        return ", ".join(str(v) for v in value)
    if isinstance(value, bool):
        return "yes" if value else "no"
    return plain(value)


def input_values(result) -> dict[str, object]:
    """Return every input value of the run, keyed by what it is.

    Keys: ``a:KEY`` (assumption, the value used, default or typed),
    ``w:SET:CRITERION`` (a weight as typed), ``c:CRITERION:FIELD`` (a
    ``Criteria`` setting), ``r:CORRIDOR:FIELD`` (a ``Corridors`` number),
    ``b:YEAR`` (a ``Budget`` line), ``j:CODE`` (a jurisdiction's readiness),
    ``o:--weight:CRITERION``, ``o:--weights``, ``o:--samples`` and
    ``o:--seed`` (command-line choices).
    """
    inputs = result.inputs
    out: dict[str, object] = {}
    for key, value in result.assumptions.items():
        out[f"a:{key}"] = _plain(value)
    for ws in inputs.weight_sets:
        for key, value in ws.values.items():
            out[f"w:{ws.name}:{key}"] = _plain(value)
    for c in inputs.criteria:
        out[f"c:{c.key}:include"] = "yes" if c.include else "no"
        out[f"c:{c.key}:direction"] = c.direction
        for name in ("at_least", "at_most", "uncertainty_pct"):
            out[f"c:{c.key}:{name}"] = _plain(getattr(c, name))
    corridors = inputs.corridors
    numeric = [c for c in corridors.columns if c != "name" and corridors[c].dtype.kind in "fiu"]
    for col in numeric:
        for cid, value in zip(corridors.index, corridors[col].to_numpy(), strict=True):
            out[f"r:{cid}:{col}"] = _plain(value)
    for cid, name in zip(corridors.index, corridors["name"], strict=True):
        out[f"r:{cid}:name"] = str(name)
    if inputs.budget is not None:
        for year, usd in zip(inputs.budget["year"], inputs.budget["capital_usd"], strict=True):
            out[f"b:{int(year)}"] = _plain(usd)
    if inputs.jurisdictions is not None and "readiness" in inputs.jurisdictions:
        for code, value in inputs.jurisdictions["readiness"].items():
            out[f"j:{code}"] = _plain(value)
    out["o:--weights"] = result.weight_set
    out["o:--samples"] = int(result.samples)
    out["o:--seed"] = int(result.seed)
    for key, share in result.overrides.items():
        out[f"o:--weight:{key}"] = float(share)
    return out


def run_state(result) -> dict:
    """Return what a later run needs to say what changed (stored in the results workbook)."""
    ranking = result.ranking
    matrix = result.matrix.loc[ranking.index]
    values = matrix.to_dict(orient="index")
    tiers = ranking["tier"] if "tier" in ranking.columns else None
    rows = []
    for cid, name, rank in zip(ranking.index, ranking["name"], ranking["rank"], strict=True):
        row = {
            "corridor_id": str(cid),
            "name": str(name),
            "rank": int(rank),
            "criteria": {k: _plain(float(v)) for k, v in values[cid].items()},
        }
        if tiers is not None:
            row["tier"] = int(tiers[cid])
        rows.append(row)
    return {
        "version": STATE_VERSION,
        "weight_set": result.weight_set,
        "weights": {k: float(v) for k, v in result.weights.items()},
        "ranking": rows,
        "inputs": input_values(result),
    }


# -- naming a value for people ----------------------------------------------------------


def ordinal(n: int) -> str:
    """Return ``1st``, ``2nd``, ``3rd``, ``4th``, ``11th``, ``21st`` ..."""
    if 10 <= n % 100 <= 20:
        return f"{n}th"
    return f"{n}{ {1: 'st', 2: 'nd', 3: 'rd'}.get(n % 10, 'th') }"


def _unit(unit: str) -> str:
    u = (unit or "").strip().strip("[]").strip()
    return "" if u in ("-", "") else u


def _number(x: float, digits: int) -> str:
    if float(x).is_integer() and abs(x) < 1e15:
        return f"{x:,.0f}"
    if abs(x) >= 1000:
        return f"{x:,.{max(0, digits - 4)}f}"
    text = f"{x:.{digits}g}"
    if "e" in text:
        return f"{x:.{digits + 2}f}".rstrip("0").rstrip(".")
    return text


def format_pair(old, new, unit: str = "") -> str:
    """Return ``"288,000 -> 400,000 USD"``: both values in one scale, then the unit.

    Dollar amounts of a million or more are shown in millions
    (``"12.3 -> 15.3 million USD"``); digits are added until the two values
    read differently. Text is quoted; a missing value reads ``blank``.
    """
    u = _unit(unit)
    nums = [v for v in (old, new) if isinstance(v, (int, float)) and not isinstance(v, bool)]
    if len(nums) < 2 or old == new:

        def text(v):
            if v is None or v == "":
                return "blank"
            if isinstance(v, (int, float)) and not isinstance(v, bool):
                return _number(float(v), 4)
            return f"'{v}'"

        return f"{text(old)} -> {text(new)}" + (f" {u}" if u and nums else "")
    scale, suffix = 1.0, u
    if "USD" in u and max(abs(old), abs(new)) >= 1e6:
        scale, suffix = 1e6, "million " + u
    a, b = old / scale, new / scale
    if scale > 1:  # millions: the same decimals on both sides, as few as tell them apart
        for decimals in range(1, 10):
            sa, sb = f"{a:,.{decimals}f}", f"{b:,.{decimals}f}"
            if sa != sb:
                break
        return f"{sa} -> {sb} {suffix}"
    for digits in range(3, 13):
        sa, sb = _number(a, digits), _number(b, digits)
        if sa != sb:
            break
    return f"{sa} -> {sb}" + (f" {suffix}" if suffix else "")


def _where_and_label(key: str, result) -> tuple[str, str, str]:
    """Return (cell, label, unit) of an input value's key in the current run."""
    from .assumptions import ASSUMPTIONS
    from .report.sheets import criterion_unit
    from .workbook import tables as T
    from .workbook.schema import SHEETS

    inputs = result.inputs
    labels = _criterion_labels(inputs.criteria)
    kind, _, rest = key.partition(":")
    if kind == "a":
        a = ASSUMPTIONS.get(rest)
        short = a.note.split(";")[0].split(" (")[0].strip().rstrip(".") if a else ""
        short = short[:1].lower() + short[1:] if short else ""
        label = f"{rest} ({short})" if short else rest
        cell = inputs.where(T.ASSUMPTIONS, "value", rest)
        if cell == T.ASSUMPTIONS:
            cell = f"{T.ASSUMPTIONS} (default)"
        return cell, label, a.unit if a else ""
    if kind == "w":
        name, _, crit = rest.partition(":")
        ws = next((w for w in inputs.weight_sets if w.name == name), None)
        row = inputs.rows.get(T.CRITERIA, {}).get(crit)
        cell = f"{T.CRITERIA}!{ws.column}{row}" if ws and ws.column and row else T.CRITERIA
        several = len(inputs.weight_sets) > 1
        label = f"weight on {labels.get(crit, crit)}" + (f" in set {name}" if several else "")
        unit = "rank" if ws is not None and ws.kind == "rank" else "points"
        return cell, label, unit
    if kind == "c":
        crit, _, name = rest.partition(":")
        label = f"{name.replace('_', ' ')} of {labels.get(crit, crit)}"
        unit = "%" if name == "uncertainty_pct" else criterion_unit(crit)
        return inputs.where(T.CRITERIA, name, crit), label, unit
    if kind == "r":
        cid, _, name = rest.partition(":")
        fields = {f.key: f for f in SHEETS[T.CORRIDORS].fields}
        unit = fields[name].unit if name in fields else ""
        return inputs.where(T.CORRIDORS, name, cid), f"{name} of {cid}", unit
    if kind == "b":
        # The Budget rows are keyed by the years' sorted position (read_by_year).
        years = [] if inputs.budget is None else [int(y) for y in inputs.budget["year"]]
        at = years.index(int(rest)) if int(rest) in years else None
        where = inputs.where(T.BUDGET, "capital_usd", at) if at is not None else T.BUDGET
        return where, f"budget for {rest}", "USD"
    if kind == "j":
        return inputs.where(T.JURISDICTIONS, "readiness", rest), f"readiness of {rest}", ""
    if rest == "--weights":
        return "--weights", "weight set used", ""
    if rest == "--samples":
        return "--samples", "Monte Carlo samples", "samples"
    if rest == "--seed":
        return "--seed", "random seed", ""
    return "--weight", f"share of {labels.get(rest.partition(':')[2], rest)}", "%"


def _differ(a, b) -> bool:
    if isinstance(a, (int, float)) and isinstance(b, (int, float)):
        return abs(a - b) > SAME * max(1.0, abs(a), abs(b))
    return a != b


# -- comparing two states ---------------------------------------------------------------

_ORDER = {"o": 0, "a": 1, "c": 2, "w": 3, "r": 4, "b": 5, "j": 6}


def compare(previous: dict | None, current: dict, result=None) -> dict:
    """Return what changed from ``previous`` to ``current`` (two :func:`run_state` dicts).

    Parameters
    ----------
    previous : dict or None
        The state the last run left (None or empty: there was none).
    current : dict
        This run's state.
    result : Result, optional
        This run's result, to name each changed input by cell, label and unit
        (without it an input is named by its state key).

    Returns
    -------
    dict
        ``inputs`` (``cell``, ``label``, ``old``, ``new``, ``unit``),
        ``criteria`` (``corridor_id``, ``criterion``, ``old``, ``new``, and
        ``label``, ``unit``) and ``moved`` (``corridor_id``, ``name``,
        ``old_rank``, ``new_rank``, ``old_tier``, ``new_tier``); all empty
        when ``previous`` is None.
    """
    if not previous:
        return {"inputs": [], "criteria": [], "moved": []}
    old_in = _previous_inputs(previous)
    new_in = current.get("inputs") or {}
    before = {r["corridor_id"]: r for r in previous.get("ranking", [])}
    now = {r["corridor_id"]: r for r in current.get("ranking", [])}
    if old_in:
        old_ids, new_ids = _corridor_ids(old_in), _corridor_ids(new_in)
    else:  # an older state: only the ranked corridors are known
        old_ids, new_ids = set(before), set(now)
    inputs = [
        _input_change(key, old_in, new_in, result)
        for key in _changed_keys(old_in, new_in, old_ids)
    ]
    inputs += _corridors_added(new_ids - old_ids, new_in, now, result)
    inputs += _corridors_removed(old_ids - new_ids, old_in, before)
    both = [cid for cid in now if cid in before]  # in the current ranking's order
    labels = _criterion_labels(result.criteria) if result is not None else {}
    return {
        "inputs": inputs,
        "criteria": _value_changes(both, before, now, labels),
        "moved": _moves(both, before, now),
    }


def _criterion_labels(criteria) -> dict[str, str]:
    """Return each criterion's label (its key where it has none), by key."""
    return {c.key: c.label or c.key for c in criteria}


def _previous_inputs(previous: dict) -> dict[str, object]:
    """Return the previous state's input values, assumptions under their current keys.

    A previous state may name an assumption by its former key
    (:func:`ranker.assumptions.current_key`).
    """
    from .assumptions import current_key

    return {
        (f"a:{current_key(k[2:])}" if k.startswith("a:") else k): v
        for k, v in (previous.get("inputs") or {}).items()
    }


def _corridor_ids(values: dict[str, object]) -> set[str]:
    """Return the corridor ids of a state's input values (each has an ``r:ID:name`` key)."""
    return {k.split(":")[1] for k in values if k.startswith("r:") and k.endswith(":name")}


def _changed_keys(old_in: dict, new_in: dict, old_ids: set[str]) -> list[str]:
    """Return the keys of the input values that changed, in the order people read them.

    A value kept in both states counts when it differs (:func:`_differ`); a
    corridor's value only when the corridor was there before (a new
    corridor is one change of its own). A ``--weight`` choice counts when
    given in one run only. Sorted by kind (:data:`_ORDER`), then key.
    """

    def known_before(key: str) -> bool:
        return not key.startswith("r:") or key.split(":")[1] in old_ids

    kept = new_in.keys() & old_in.keys()
    changed = [k for k in kept if known_before(k) and _differ(old_in[k], new_in[k])]
    changed += [key for key in new_in.keys() ^ old_in.keys() if key.startswith("o:--weight:")]
    return sorted(changed, key=lambda k: (_ORDER.get(k[0], 9), k))


def _input_change(key: str, old_in: dict, new_in: dict, result) -> dict:
    """Return one changed input: its cell, label, old and new value and unit."""
    cell, label, unit = _where_and_label(key, result) if result is not None else (key, key, "")
    return {
        "cell": cell,
        "label": label,
        "old": old_in.get(key),
        "new": new_in.get(key),
        "unit": _unit(unit),
    }


def _corridors_added(ids: set[str], new_in: dict, now: dict, result) -> list[dict]:
    """Return one input change per corridor added, by id, named by its ``corridor_id`` cell."""
    out = []
    for cid in sorted(ids):
        name = new_in.get(f"r:{cid}:name", (now.get(cid) or {}).get("name", cid))
        cell = result.inputs.where("Corridors", "corridor_id", cid) if result else "Corridors"
        out.append(
            {"cell": cell, "label": f"corridor added: {name}", "old": None, "new": cid, "unit": ""}
        )
    return out


def _corridors_removed(ids: set[str], old_in: dict, before: dict) -> list[dict]:
    """Return one input change per corridor removed, by id (it has no cell any more)."""
    out = []
    for cid in sorted(ids):
        name = old_in.get(f"r:{cid}:name", (before.get(cid) or {}).get("name", cid))
        out.append(
            {
                "cell": "Corridors",
                "label": f"corridor removed: {name}",
                "old": cid,
                "new": None,
                "unit": "",
            }
        )
    return out


def _value_changes(both: list[str], before: dict, now: dict, labels: dict) -> list[dict]:
    """Return the criterion values that moved, for corridors ranked in both runs.

    A value missing (None) in either run is not compared.
    """
    from .report.sheets import criterion_unit

    out = []
    for cid in both:
        a, b = before[cid].get("criteria", {}), now[cid].get("criteria", {})
        for key in [k for k in b if k in a]:
            x, y = a[key], b[key]
            if x is None or y is None or not _differ(x, y):
                continue
            out.append(
                {
                    "corridor_id": cid,
                    "criterion": key,
                    "old": x,
                    "new": y,
                    "label": labels.get(key, key),
                    "unit": _unit(criterion_unit(key)),
                }
            )
    return out


def _moves(both: list[str], before: dict, now: dict) -> list[dict]:
    """Return the corridors whose rank or tier changed, best new rank first.

    A tier counts only when both runs give one.
    """
    out = []
    for cid in both:
        r0, r1 = before[cid]["rank"], now[cid]["rank"]
        t0, t1 = before[cid].get("tier"), now[cid].get("tier")
        if r0 != r1 or (t0 is not None and t1 is not None and t0 != t1):
            out.append(
                {
                    "corridor_id": cid,
                    "name": now[cid].get("name", cid),
                    "old_rank": r0,
                    "new_rank": r1,
                    "old_tier": t0,
                    "new_tier": t1,
                }
            )
    return sorted(out, key=lambda m: (m["new_rank"], m["corridor_id"]))


def describe(
    changes: dict, *, limit: int | None = None, more: str = "on the Run info sheet"
) -> list[str]:
    """Return the changes as plain sentences, inputs first, then values, then moves.

    ``limit`` caps the lines of each of the three parts, with one line
    saying how many more there are and where they are (``more``).
    """
    if changes.get("previous") is None and not any(
        changes.get(k) for k in ("inputs", "criteria", "moved")
    ):
        return []

    def capped(lines: list[str], what: str) -> list[str]:
        if limit is None or len(lines) <= limit:
            return lines
        return lines[:limit] + [f"... and {len(lines) - limit:,} more {what} ({more})"]

    inputs = []
    for c in changes.get("inputs", []):
        if c["label"].startswith(("corridor added", "corridor removed")):
            inputs.append(f"{c['cell']}: {c['label']}")
        else:
            pair = format_pair(c["old"], c["new"], c["unit"])
            inputs.append(f"{c['cell']}, {c['label']}: {pair}")
    values = [
        f"{c['label']} of {c['corridor_id']}: {format_pair(c['old'], c['new'], c['unit'])}"
        for c in changes.get("criteria", [])
    ]
    moved = []
    for m in changes.get("moved", []):
        line = f"{m['corridor_id']}: {ordinal(m['old_rank'])} -> {ordinal(m['new_rank'])}"
        if m.get("old_tier") is not None and m.get("new_tier") is not None:
            if m["old_tier"] != m["new_tier"]:
                line += f" (tier {m['old_tier']} -> {m['new_tier']})"
        moved.append(line)
    lines = capped(inputs, "changed inputs") + capped(values, "changed values")
    if moved:
        lines += capped(moved, "moves")
    elif lines:
        lines.append("No corridor changed rank.")
    else:
        lines.append("Nothing changed: the same inputs give the same order.")
    return lines


def json_changes(changes: dict) -> dict:
    """Return the ``changes`` field of the JSON summary."""
    return {
        "previous": changes.get("previous"),
        "inputs": list(changes.get("inputs", [])),
        "criteria": [
            {k: c[k] for k in ("corridor_id", "criterion", "old", "new", "label", "unit")}
            for c in changes.get("criteria", [])
        ],
        "moved": list(changes.get("moved", [])),
    }
