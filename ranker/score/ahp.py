"""Analytic hierarchy process: weights and consistency of a pairwise matrix.

``a[i, j]`` says how much more important criterion i is than criterion j on
Saaty's 1-9 scale; the matrix is reciprocal (``a[j, i] = 1 / a[i, j]``).

References
----------
.. [1] T. L. Saaty, "The Analytic Hierarchy Process", McGraw-Hill, 1980.
.. [2] T. L. Saaty, "How to make a decision: The analytic hierarchy
   process", European Journal of Operational Research 48(1):9-26, 1990.
   doi:10.1016/0377-2217(90)90057-I
.. [3] W. W. Koczkodaj, "A new definition of consistency of pairwise
   comparisons", Mathematical and Computer Modelling 18(7):79-84, 1993.
"""

from __future__ import annotations

from itertools import combinations

import numpy as np

#: Random consistency index by matrix size, per published table.
RANDOM_INDEX: dict[str, dict[int, float]] = {
    "Saaty (1980)": {
        1: 0.0,
        2: 0.0,
        3: 0.58,
        4: 0.90,
        5: 1.12,
        6: 1.24,
        7: 1.32,
        8: 1.41,
        9: 1.45,
        10: 1.49,
    },
}

#: The table used unless another is named.
DEFAULT_RI_TABLE = "Saaty (1980)"

#: Largest consistency ratio accepted, Saaty (1980).
CR_LIMIT = 0.10

#: Saaty's fundamental scale and its reciprocals [-].
SAATY_SCALE = np.array([1.0 / v for v in range(9, 1, -1)] + [float(v) for v in range(1, 10)])


def principal_eigenvector(a: np.ndarray) -> tuple[np.ndarray, float]:
    """Return the priority vector and principal eigenvalue of a pairwise matrix.

    Parameters
    ----------
    a : ndarray, shape (n, n)
        Positive reciprocal matrix [-].

    Returns
    -------
    w : ndarray, shape (n,)
        Principal right eigenvector scaled to sum 1 [-].
    lambda_max : float
        Principal (Perron) eigenvalue, >= n [-].

    References
    ----------
    .. [1] T. L. Saaty, "The Analytic Hierarchy Process", McGraw-Hill, 1980
       (eigenvector method).

    Examples
    --------
    >>> a = np.array([[1, 3, 5], [1/3, 1, 2], [1/5, 1/2, 1]])
    >>> w, lam = principal_eigenvector(a)
    >>> w.round(4), round(lam, 4)
    (array([0.6483, 0.2297, 0.122 ]), 3.0037)
    """
    a = np.asarray(a, dtype=float)
    values, vectors = np.linalg.eig(a)
    i = int(np.argmax(values.real))
    w = np.abs(vectors[:, i].real)  # the Perron vector has one sign
    return w / w.sum(), float(values[i].real)


def consistency_ratio(
    lambda_max: float, n: int, *, ri_table: str = DEFAULT_RI_TABLE
) -> tuple[float, float | None, float | None]:
    """Compute the consistency index and ratio, ``CI = (lambda - n)/(n - 1)``, ``CR = CI/RI``.

    Parameters
    ----------
    lambda_max : float
        Principal eigenvalue [-].
    n : int
        Matrix size [-].
    ri_table : str
        Key of :data:`RANDOM_INDEX` [-].

    Returns
    -------
    ci : float
        Consistency index; 0 for n <= 2 [-].
    ri : float or None
        Random index; None where the table has no entry for n [-].
    cr : float or None
        Consistency ratio; 0 for n <= 2, None where RI is unknown [-].

    References
    ----------
    .. [1] T. L. Saaty, "The Analytic Hierarchy Process", McGraw-Hill, 1980.

    Examples
    --------
    >>> ci, ri, cr = consistency_ratio(3.0037, 3)
    >>> round(cr, 4)
    0.0032
    """
    if n <= 2:
        return 0.0, 0.0, 0.0
    ci = (lambda_max - n) / (n - 1)  # CI of [1]
    ri = RANDOM_INDEX[ri_table].get(n)
    return ci, ri, (None if ri is None else ci / ri)  # CR of [1]


def ahp_weights(a: np.ndarray, *, ri_table: str = DEFAULT_RI_TABLE) -> dict:
    """Derive AHP weights and consistency from a complete pairwise matrix.

    Parameters
    ----------
    a : ndarray, shape (n, n)
        Positive reciprocal matrix [-].
    ri_table : str
        Key of :data:`RANDOM_INDEX` [-].

    Returns
    -------
    dict
        ``weights`` (ndarray, sums to 1, [-]), ``lambda_max``, ``ci``, ``ri``,
        ``cr`` (floats or None, [-]).

    Examples
    --------
    >>> round(ahp_weights(np.array([[1, 3, 5], [1/3, 1, 2], [1/5, 1/2, 1]]))["cr"], 4)
    0.0032
    """
    w, lam = principal_eigenvector(a)
    ci, ri, cr = consistency_ratio(lam, len(w), ri_table=ri_table)
    return {"weights": w, "lambda_max": lam, "ci": ci, "ri": ri, "cr": cr}


def triple_inconsistency(a: np.ndarray) -> list[tuple[float, int, int, int]]:
    """Rate every triple of criteria by Koczkodaj's inconsistency index.

    For i < j < k the triple is consistent when ``a_ik = a_ij a_jk``; its
    index is ``min(|1 - a_ik / (a_ij a_jk)|, |1 - a_ij a_jk / a_ik|)``.

    Parameters
    ----------
    a : ndarray, shape (n, n)
        Positive reciprocal matrix [-].

    Returns
    -------
    list of (index, i, j, k)
        Every triple, worst first [-].

    References
    ----------
    .. [1] W. W. Koczkodaj, Mathematical and Computer Modelling
       18(7):79-84, 1993.

    Examples
    --------
    >>> triple_inconsistency(np.array([[1, 2, 4], [1/2, 1, 2], [1/4, 1/2, 1]]))
    [(0.0, 0, 1, 2)]
    """
    a = np.asarray(a, dtype=float)
    out = []
    for i, j, k in combinations(range(a.shape[0]), 3):
        t = a[i, j] * a[j, k] / a[i, k]
        out.append((float(min(abs(1 - 1 / t), abs(1 - t))), i, j, k))  # index of [1]
    out.sort(key=lambda x: -x[0])
    return out


def nearest_on_scale(value: float) -> float:
    """Return the value of Saaty's 1-9 scale (or its reciprocal) nearest in ratio.

    Parameters
    ----------
    value : float
        A positive judgment [-].

    Returns
    -------
    float
        One of 1/9, ..., 1/2, 1, 2, ..., 9 [-].

    Examples
    --------
    >>> nearest_on_scale(2.6)
    3.0
    """
    return float(SAATY_SCALE[np.argmin(np.abs(np.log(SAATY_SCALE) - np.log(value)))])


def revise_triple(
    a: np.ndarray, triple: tuple[int, int, int], *, ri_table: str = DEFAULT_RI_TABLE
) -> dict:
    """Find the judgment of a triple whose change most lowers the consistency ratio.

    Each of the triple's three judgments is replaced in turn by the value the
    other two imply (``a_ik = a_ij a_jk``), rounded to Saaty's scale, with its
    reciprocal; the one giving the lowest CR (CI where RI is unknown) is
    returned.

    Parameters
    ----------
    a : ndarray, shape (n, n)
        Positive reciprocal matrix [-].
    triple : (int, int, int)
        Positions i < j < k [-].
    ri_table : str
        Key of :data:`RANDOM_INDEX` [-].

    Returns
    -------
    dict
        ``row``, ``col`` (positions of the judgment ``a[row, col]``),
        ``current``, ``suggested`` [-] and ``cr_after`` (CR once changed, or
        CI where RI is unknown, [-]).

    Examples
    --------
    >>> a = np.array([[1, 3, 1/5], [1/3, 1, 3], [5, 1/3, 1]])
    >>> r = revise_triple(a, (0, 1, 2))
    >>> (r["row"], r["col"], r["suggested"])
    (0, 2, 9.0)
    """
    a = np.asarray(a, dtype=float)
    i, j, k = triple
    implied = {(i, j): a[i, k] / a[j, k], (j, k): a[i, k] / a[i, j], (i, k): a[i, j] * a[j, k]}
    best: dict | None = None
    for (r, c), value in implied.items():
        trial = a.copy()
        trial[r, c] = nearest_on_scale(value)
        trial[c, r] = 1.0 / trial[r, c]
        res = ahp_weights(trial, ri_table=ri_table)
        score = res["cr"] if res["cr"] is not None else res["ci"]
        if best is None or score < best["cr_after"]:
            best = {
                "row": r,
                "col": c,
                "current": float(a[r, c]),
                "suggested": float(trial[r, c]),
                "cr_after": float(score),
            }
    assert best is not None
    return best
