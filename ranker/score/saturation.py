"""Value functions that saturate: credit stops at a level ("full credit at").

A benefit criterion earns no more credit above its level and a cost
criterion no more below it: each value is clipped to the level before any
normalisation, so that one corridor far beyond "enough" cannot stretch the
scale on which every other corridor is judged. The clipped matrix is what
every method, the stress tests and the plan score; the outputs show the
values as derived or given, with the level beside them.

This is the piecewise-linear value function with a plateau of value
function modelling (Keeney & Raiffa 1976, *Decisions with Multiple
Objectives*, Wiley, ch. 3, from memory); the level is the planner's.
"""

from __future__ import annotations

import math

import numpy as np

from .matrix import CriteriaMatrix


def full_credit_levels(criteria, assumptions: dict) -> dict[str, float]:
    """Return each included criterion's full-credit level (criteria without one left out).

    The ``Criteria`` sheet's ``full_credit_at`` wins; where it is blank,
    ``grid_headroom`` takes the assumption ``grid_headroom_full_credit_at``
    (default 2: headroom beyond twice the new peak load earns nothing more;
    0 turns it off).

    Parameters
    ----------
    criteria : list of CriterionSpec
        The included criteria.
    assumptions : dict
        Resolved assumptions.

    Returns
    -------
    dict of str to float
        Criterion key to level, in the criterion's own unit.
    """
    out = {}
    for c in criteria:
        level = getattr(c, "full_credit_at", None)
        if level is None and c.key == "grid_headroom":
            level = float(assumptions.get("grid_headroom_full_credit_at", 0.0)) or None
        if level is not None and math.isfinite(float(level)):
            out[c.key] = float(level)
    return out


def saturate_values(x: np.ndarray, level: np.ndarray, is_benefit: np.ndarray) -> np.ndarray:
    """Clip each column at its level: benefits from above, costs from below.

    Parameters
    ----------
    x : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    level : ndarray, shape (k,)
        Full-credit level per criterion; NaN for none [unit of each criterion].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better.

    Returns
    -------
    ndarray, shape (n, k)
        ``min(x, level)`` for a benefit, ``max(x, level)`` for a cost
        [unit of each criterion].

    Examples
    --------
    >>> saturate_values(np.array([[1.0, 5.0], [3.0, 1.0]]), np.array([2.0, 2.0]),
    ...                 np.array([True, False]))
    array([[1., 5.],
           [2., 2.]])
    """
    x = np.asarray(x, dtype=float)
    level = np.asarray(level, dtype=float)
    has = ~np.isnan(level)
    capped = np.where(np.asarray(is_benefit), np.minimum(x, level), np.maximum(x, level))
    return np.where(has, capped, x)


def saturate(matrix: CriteriaMatrix, criteria, levels: dict[str, float]) -> CriteriaMatrix:
    """Apply :func:`saturate_values` to a criteria matrix (columns by key).

    Returns
    -------
    CriteriaMatrix
        Same corridors and criteria; values clipped where a level is given.
    """
    if not levels:
        return matrix
    spec = {c.key: c for c in criteria}
    keys = matrix.keys
    level = np.array([levels.get(k, np.nan) for k in keys])
    benefit = np.array([spec[k].is_benefit if k in spec else True for k in keys])
    return matrix.with_values(saturate_values(matrix.values, level, benefit))


def saturated_counts(matrix: CriteriaMatrix, criteria, levels: dict[str, float]) -> dict[str, int]:
    """Criterion key to the number of corridors whose value is past its level [-]."""
    spec = {c.key: c for c in criteria}
    out = {}
    for key, level in levels.items():
        if key not in matrix.keys:
            continue
        col = matrix.column(key)
        past = col > level if spec[key].is_benefit else col < level
        out[key] = int(past.sum())
    return out
