"""Policy readiness: mileage-weighted mean of the jurisdictions' readiness along a corridor."""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ..errors import Problems
from ..input_warnings import warning
from ..workbook.tables import CORRIDOR_MILES, CORRIDORS, JURISDICTIONS, Inputs
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
    corridors = inputs.corridors.index
    rows = inputs.corridor_miles.reset_index(drop=True)  # row keys are positions
    jur = inputs.jurisdictions
    n = len(corridors)

    def at(sheet, key, row):
        return inputs.where(sheet, key, row)

    code = pd.Index(corridors).get_indexer(rows["corridor_id"])
    known_j = rows["jurisdiction"].isin(jur.index).to_numpy()
    miles = pd.to_numeric(rows["miles"], errors="coerce").to_numpy(dtype=float)
    for r in rows.index[code < 0]:
        problems.add(
            at(CORRIDOR_MILES, "corridor_id", r),
            f"corridor {rows.at[r, 'corridor_id']!r} is not on the Corridors sheet",
            "use a corridor_id of the Corridors sheet or delete the row",
        )
    known = ", ".join(map(str, jur.index[:12])) + (" ..." if len(jur) > 12 else "")
    for r in rows.index[~known_j]:
        problems.add(
            at(CORRIDOR_MILES, "jurisdiction", r),
            f"jurisdiction {rows.at[r, 'jurisdiction']!r} is not on the Jurisdictions sheet",
            f"use one of {known} or add it to Jurisdictions",
        )
    for r in rows.index[~(miles >= 0)]:
        problems.add(
            at(CORRIDOR_MILES, "miles", r),
            f"miles is {show_value(rows.at[r, 'miles'])}",
            "type the miles in that jurisdiction (>= 0)",
        )

    readiness = pd.to_numeric(jur["readiness"], errors="coerce")
    used = pd.Index(rows["jurisdiction"][known_j].unique())
    for j in used[~readiness.reindex(used).between(0, 100).to_numpy()]:
        problems.add(
            at(JURISDICTIONS, "readiness", j),
            f"readiness of {j!r} is {show_value(jur.at[j, 'readiness'])}",
            "type a readiness from 0 to 100",
        )

    # Miles count towards the length check whatever their jurisdiction's state; only rows
    # with a known jurisdiction and a valid readiness enter the mean.
    counted = (code >= 0) & (miles >= 0)
    total = np.bincount(code[counted], weights=miles[counted], minlength=n)
    r_row = readiness.reindex(rows["jurisdiction"]).to_numpy(dtype=float)
    good = counted & known_j & np.isfinite(r_row)
    mean, _ = readiness_mileage_weighted(code[good], miles[good], r_row[good], n_corridors=n)
    mean[np.bincount(code[counted & ~good], minlength=n) > 0] = np.nan
    pairs = pd.DataFrame({"c": code[good], "j": rows["jurisdiction"].to_numpy()[good]})
    count = np.bincount(pairs.drop_duplicates()["c"], minlength=n).astype(float)
    has_rows = np.bincount(code[code >= 0], minlength=n) > 0
    for cid in corridors[~has_rows]:
        problems.add(
            at(CORRIDORS, "corridor_id", cid),
            f"corridor {cid!r} has no rows on the Corridor miles sheet",
            "add its miles by jurisdiction (corridor_id, jurisdiction, miles) or give "
            "policy_readiness as a Corridors column",
        )
    for cid in corridors[has_rows & (total <= 0)]:
        problems.add(
            at(CORRIDORS, "corridor_id", cid),
            f"the miles of corridor {cid!r} on Corridor miles add up to 0",
            "type the miles of each jurisdiction it crosses",
        )

    warnings: list[dict] = []
    gap = np.full(n, np.nan)
    if "length_mi" in inputs.corridors:
        length = pd.to_numeric(inputs.corridors["length_mi"], errors="coerce").to_numpy(float)
        ok = (length > 0) & (total > 0)
        gap[ok] = np.abs(total[ok] - length[ok]) / length[ok]
        flagged = np.flatnonzero(gap > miles_warn_tolerance)
        if flagged.size:
            row_code = np.where(counted, code, -1)
            for i in flagged:
                cid = corridors[i]
                cells = [at(CORRIDOR_MILES, "miles", r) for r in rows.index[row_code == i]]
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
