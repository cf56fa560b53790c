"""Policy readiness: mileage-weighted mean of the jurisdictions' readiness along a corridor."""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..errors import Problems
from ..input_warnings import warning
from ..workbook.tables import CORRIDOR_MILES, CORRIDORS, JURISDICTIONS, Inputs, floats
from .needs import show_value


def readiness_mileage_weighted(
    corridor_code: np.ndarray, miles: np.ndarray, readiness: np.ndarray, *, n_corridors: int
) -> tuple[np.ndarray, np.ndarray]:
    """Compute each corridor's mileage-weighted mean readiness [0-100].

    Parameters
    ----------
    corridor_code : array_like of int, shape (m,)
        Corridor position ``0 .. n_corridors - 1`` of each jurisdiction row.
    miles : array_like, shape (m,)
        Miles of the corridor in the row's jurisdiction [mi].
    readiness : array_like, shape (m,)
        Readiness of the row's jurisdiction [0-100].
    n_corridors : int
        Number of corridors.

    Returns
    -------
    readiness : ndarray, shape (n_corridors,)
        ``sum(miles * readiness) / sum(miles)``; NaN where no miles [0-100].
    total_miles : ndarray, shape (n_corridors,)
        ``sum(miles)`` [mi].

    References
    ----------
    .. [1] Common practice: a length-weighted average of a quantity that is
       uniform within each jurisdiction's segment.

    Examples
    --------
    >>> readiness_mileage_weighted([0, 0, 1], [30.0, 10.0, 5.0], [80.0, 40.0, 50.0],
    ...                            n_corridors=2)[0]
    array([70., 50.])
    """
    code = np.asarray(corridor_code, dtype=np.intp)
    mi = np.asarray(miles, float)
    total = np.bincount(code, weights=mi, minlength=n_corridors)
    weighted = np.bincount(code, weights=mi * np.asarray(readiness, float), minlength=n_corridors)
    with np.errstate(divide="ignore", invalid="ignore"):
        mean = weighted / total
    return np.where(total > 0, mean, np.nan), total


@dataclass
class Readiness:
    """Policy readiness of every corridor, with its mileage check.

    Attributes
    ----------
    columns : dict of str to ndarray
        ``policy_readiness`` [0-100], ``jurisdiction_miles`` [mi],
        ``jurisdictions`` [-] and ``miles_gap`` [-] (relative to
        ``length_mi``; NaN where the length is not given).
    warnings : list of dict
        Corridors whose miles are off by more than the warning tolerance, as
        ``miles_gap`` records (:data:`ranker.input_warnings.WARNING_KINDS`).
    """

    columns: dict[str, np.ndarray]
    warnings: list[dict] = field(default_factory=list)


def policy_readiness(
    inputs: Inputs,
    *,
    miles_warn_tolerance: float,
    miles_error_tolerance: float,
    problems: Problems,
) -> Readiness:
    """Derive ``policy_readiness`` from the Jurisdictions and Corridor miles sheets.

    Unknown jurisdiction codes and corridor ids, empty or negative miles,
    corridors without miles and miles that miss ``length_mi`` by more than
    ``miles_error_tolerance`` (relative) are recorded in ``problems``, each
    naming its cells; gaps above ``miles_warn_tolerance`` give a warning.

    Parameters
    ----------
    inputs : Inputs
        Typed workbook; ``jurisdictions`` and ``corridor_miles`` present.
    miles_warn_tolerance, miles_error_tolerance : float
        Relative gaps between summed miles and ``length_mi`` [-].
    problems : Problems
        Collector the caller raises.

    Returns
    -------
    Readiness
        Values are NaN for corridors with problems.

    Examples
    --------
    >>> from pathlib import Path
    >>> import pandas as pd
    >>> from ranker.errors import Problems
    >>> from ranker.workbook.tables import Inputs
    >>> inp = Inputs(path=Path("x.xlsx"), sha256="0", criteria=[], weight_sets=[],
    ...     corridors=pd.DataFrame({"length_mi": [40.0]}, index=pd.Index(["A"], name="corridor_id")),
    ...     jurisdictions=pd.DataFrame({"readiness": [80.0, 40.0]}, index=["J1", "J2"]),
    ...     corridor_miles=pd.DataFrame({"corridor_id": ["A", "A"], "jurisdiction": ["J1", "J2"],
    ...                                  "miles": [30.0, 10.0]}))
    >>> policy_readiness(inp, miles_warn_tolerance=0.02, miles_error_tolerance=0.1,
    ...                  problems=Problems()).columns["policy_readiness"]
    array([70.])
    """
    corridors = list(inputs.corridors.index)
    rows = inputs.corridor_miles  # row keys are positions
    jur = inputs.jurisdictions
    n = len(corridors)

    def at(sheet, key, row):
        return inputs.where(sheet, key, row)

    row_ids, row_codes = list(rows["corridor_id"]), list(rows["jurisdiction"])
    raw_miles = list(rows["miles"])
    position = {cid: i for i, cid in enumerate(corridors)}
    code = np.array([position.get(cid, -1) for cid in row_ids], dtype=np.intp)
    codes = list(jur.index)
    listed = set(codes)
    known_j = np.array([j in listed for j in row_codes], dtype=bool)
    miles = floats(raw_miles)
    for r in np.flatnonzero(code < 0).tolist():
        problems.add(
            at(CORRIDOR_MILES, "corridor_id", r),
            f"corridor {row_ids[r]!r} is not on the Corridors sheet",
            "use a corridor_id of the Corridors sheet or delete the row",
        )
    known = ", ".join(map(str, codes[:12])) + (" ..." if len(codes) > 12 else "")
    for r in np.flatnonzero(~known_j).tolist():
        problems.add(
            at(CORRIDOR_MILES, "jurisdiction", r),
            f"jurisdiction {row_codes[r]!r} is not on the Jurisdictions sheet",
            f"use one of {known} or add it to Jurisdictions",
        )
    for r in np.flatnonzero(~(miles >= 0)).tolist():
        problems.add(
            at(CORRIDOR_MILES, "miles", r),
            f"miles is {show_value(raw_miles[r])}",
            "type the miles in that jurisdiction (>= 0)",
        )

    typed = list(jur["readiness"])
    readiness = dict(zip(codes, floats(typed).tolist(), strict=True))
    used = dict.fromkeys(j for j, k in zip(row_codes, known_j.tolist(), strict=True) if k)
    for j in used:
        if not 0 <= readiness[j] <= 100:
            problems.add(
                at(JURISDICTIONS, "readiness", j),
                f"readiness of {j!r} is {show_value(typed[codes.index(j)])}",
                "type a readiness from 0 to 100",
            )

    # Miles count towards the length check whatever their jurisdiction's state; only rows
    # with a known jurisdiction and a valid readiness enter the mean.
    counted = (code >= 0) & (miles >= 0)
    total = np.bincount(code[counted], weights=miles[counted], minlength=n)
    r_row = np.array([readiness.get(j, np.nan) for j in row_codes], dtype=float)
    good = counted & known_j & np.isfinite(r_row)
    mean, _ = readiness_mileage_weighted(code[good], miles[good], r_row[good], n_corridors=n)
    mean[np.bincount(code[counted & ~good], minlength=n) > 0] = np.nan
    pairs = {(int(code[r]), row_codes[r]) for r in np.flatnonzero(good).tolist()}
    count = np.bincount(np.array([c for c, _ in pairs], dtype=np.intp), minlength=n).astype(float)
    has_rows = np.bincount(code[code >= 0], minlength=n) > 0
    for i in np.flatnonzero(~has_rows).tolist():
        problems.add(
            at(CORRIDORS, "corridor_id", corridors[i]),
            f"corridor {corridors[i]!r} has no rows on the Corridor miles sheet",
            "add its miles by jurisdiction (corridor_id, jurisdiction, miles) or give "
            "policy_readiness as a Corridors column",
        )
    for i in np.flatnonzero(has_rows & (total <= 0)).tolist():
        problems.add(
            at(CORRIDORS, "corridor_id", corridors[i]),
            f"the miles of corridor {corridors[i]!r} on Corridor miles add up to 0",
            "type the miles of each jurisdiction it crosses",
        )

    warnings: list[dict] = []
    gap = np.full(n, np.nan)
    if "length_mi" in inputs.corridors.columns:
        length = floats(inputs.corridors["length_mi"])
        ok = (length > 0) & (total > 0)
        gap[ok] = np.abs(total[ok] - length[ok]) / length[ok]
        flagged = np.flatnonzero(gap > miles_warn_tolerance)
        if flagged.size:
            row_code = np.where(counted, code, -1)
            for i in flagged:
                cid = corridors[i]
                cells = [
                    at(CORRIDOR_MILES, "miles", r) for r in np.flatnonzero(row_code == i).tolist()
                ]
                if gap[i] > miles_error_tolerance:
                    what = (
                        f"the miles of corridor {cid!r} add up to {total[i]:g} but its "
                        f"length_mi ({at(CORRIDORS, 'length_mi', cid)}) is {length[i]:g} "
                        f"(gap {gap[i]:.1%})"
                    )
                    problems.add(
                        ", ".join(cells),
                        what + f", more than miles_error_tolerance {miles_error_tolerance:.1%}",
                        "correct the miles or the length so that they agree",
                    )
                    mean[i] = np.nan
                else:
                    warnings.append(
                        warning(
                            "miles_gap",
                            cells=cells,
                            corridor=str(cid),
                            miles=float(total[i]),
                            length_mi=float(length[i]),
                            length_cell=at(CORRIDORS, "length_mi", cid),
                            gap=float(gap[i]),
                            tolerance=float(miles_warn_tolerance),
                        )
                    )
    return Readiness(
        columns={
            "policy_readiness": mean,
            "jurisdiction_miles": total,
            "jurisdictions": count,
            "miles_gap": gap,
        },
        warnings=warnings,
    )
