"""Scores of a few corridors of one matrix under many weight vectors.

The tipping-point search (:mod:`ranker.stress.tipping`) needs, at each step,
the scores of one corridor and of the few partners it may cross, each under
its own weight vector; scoring every corridor of the matrix for that is
``n`` times the work. For a method whose score of a corridor depends on the
weights only through that corridor's own normalised row (the column
statistics do not depend on the weights), the rows can be scored alone:
:data:`ROW_SCORERS` maps such a kernel to a function doing exactly that.

* TOPSIS (Hwang & Yoon [1]_): the normalised matrix, the ideal and the
  anti-ideal depend on the values only, so
  ``d+_i = sqrt(sum_j w_j^2 (r_ij - r*_j)^2)`` and ``d-_i`` likewise, and
  ``C_i = d-_i / (d+_i + d-_i)`` (0.5 where both are 0), the formula of
  :func:`ranker.score.topsis.topsis` row by row.

A kernel without an entry is scored whole and the wanted columns taken
(:meth:`ranker.stress.batch.Scorer.rows`), so every kernel works.

References
----------
.. [1] C.-L. Hwang and K. Yoon, "Multiple Attribute Decision Making: Methods
   and Applications", Lecture Notes in Economics and Mathematical Systems 186,
   Springer, 1981, pp. 128-134.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from ranker.score.topsis import deviations, topsis, topsis_each


class TopsisRows:
    """TOPSIS scores of chosen rows of one matrix, one weight vector per row of choices.

    Parameters
    ----------
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    is_benefit : ndarray of bool, shape (k,)
        True where more is better.
    normalization : str
        As for :func:`ranker.score.topsis.topsis`.
    """

    def __init__(self, matrix, is_benefit, *, normalization: str = "vector"):
        self.to_ideal, self.to_anti = deviations(  # Steps 2-4 of [1]
            np.asarray(matrix, dtype=float), is_benefit, normalization
        )

    def __call__(self, weights: np.ndarray, cols: np.ndarray) -> np.ndarray:
        """Score corridors ``cols[m]`` under weight row ``weights[m]`` [-].

        Parameters
        ----------
        weights : ndarray, shape (m, k)
            One weight vector per row of ``cols`` [-].
        cols : ndarray of int, shape (m, p)
            Corridor indices [-].

        Returns
        -------
        ndarray, shape (m, p)
            Relative closeness, higher is better [-].
        """
        w2 = np.asarray(weights, dtype=float) ** 2
        d_plus = np.sqrt(np.maximum(np.einsum("mpk,mk->mp", self.to_ideal[cols], w2), 0.0))
        d_minus = np.sqrt(np.maximum(np.einsum("mpk,mk->mp", self.to_anti[cols], w2), 0.0))
        total = d_plus + d_minus  # Step 5 of [1]
        return np.divide(d_minus, total, out=np.full_like(total, 0.5), where=total > 0)

    def along(self, share: np.ndarray, c: int):
        """Scorer of chosen rows along one weight line, in closed form.

        On the line ``w(t) = t e_c + (1 - t) s`` (``s`` the other criteria's
        shares, ``s_c = 0``: the tipping sweep of
        :mod:`ranker.stress.tipping`) every squared distance is
        ``t^2 P_i + (1 - t)^2 Q_i`` with ``P_i`` the row's term of criterion
        ``c`` and ``Q_i = sum_j s_j^2 (r_ij - r*_j)^2``, so a row costs four
        numbers instead of ``2 k``. Equal to :meth:`__call__` at ``w(t)`` to
        rounding (``tests/stress/test_rows.py``).

        Returns
        -------
        TopsisLine
            Called as ``(t (m,), cols (m, p)) -> (m, p)``: relative
            closeness, higher is better [-].
        """
        s2 = np.asarray(share, dtype=float) ** 2
        terms = (self.to_ideal[:, c], self.to_ideal @ s2, self.to_anti[:, c], self.to_anti @ s2)
        return TopsisLine(terms)


class TopsisLine:
    """TOPSIS closeness of chosen rows along one weight line (:meth:`TopsisRows.along`).

    ``terms`` is ``(P+, Q+, P-, Q-)``, one entry per row; the squared
    distances at ``t`` are ``t^2 P + (1 - t)^2 Q``.
    """

    #: Largest magnitude of a score [-] (relative closeness lies in [0, 1]).
    bound = 1.0

    def __init__(self, terms: tuple):
        self.terms = terms

    def __call__(self, t: np.ndarray, cols: np.ndarray) -> np.ndarray:
        """Closeness of rows ``cols`` (m, p) at weights ``t`` (m,) [-]."""
        t = np.asarray(t, dtype=float)[:, None]
        a, b = t * t, (1.0 - t) ** 2
        p_plus, q_plus, p_minus, q_minus = (u[cols] for u in self.terms)
        d_plus = np.sqrt(np.maximum(a * p_plus + b * q_plus, 0.0))
        d_minus = np.sqrt(np.maximum(a * p_minus + b * q_minus, 0.0))
        total = d_plus + d_minus
        return np.divide(d_minus, total, out=np.full_like(total, 0.5), where=total > 0)

    def take(self, cols: np.ndarray) -> TopsisLine:
        """The same line over rows ``cols`` only: row ``j`` of the result is ``cols[j]``."""
        return TopsisLine(tuple(u[cols] for u in self.terms))


#: Kernel to ``factory(matrix, is_benefit, **options) -> scorer(weights, cols)``.
ROW_SCORERS: dict[Callable, Callable] = {topsis: TopsisRows}

#: Kernel to ``each(matrix, weights (r, k), is_benefit, **options)``, yielding
#: the kernel's scores of the whole matrix or stack under each weight row in
#: turn, value for value, with the work that does not depend on the weights
#: done once (:meth:`ranker.stress.batch.Scorer.stack_each`).
EACH_SCORERS: dict[Callable, Callable] = {topsis: topsis_each}
