"""Scores of one-corridor variants of a problem, in closed form where the method allows.

The clone and leave-one-out checks of :mod:`ranker.stress.reversal` score
``n`` variants of an ``n``-corridor problem, each differing from it by one
corridor added or removed. For TOPSIS on vector-normalised values [1]_ a
variant changes only each criterion's norm (``N'_c^2 = N_c^2 + x_vc^2`` for
a copy of corridor v, ``N_c^2 - x_vc^2`` for its removal) and, sometimes,
the ideal or anti-ideal: with ``r = x / N`` the normalised base matrix and
``f_c = N_c / N'_c``, every remaining corridor's distances are

``d+_l^2 = sum_c w_c^2 f_c^2 (r_lc - r*_c)^2`` (and ``d-`` with the anti-ideal),

as long as the ideal and anti-ideal values ``r*_c`` are those of the base
problem. That holds for every copy (it repeats an existing row), and for the
removal of a corridor that is not alone in holding a column's best or worst
value. So all those variants are scored by two matrix products, ``(V, k) @
(k, n)``, instead of normalising ``V`` matrices; the others are left to the
kernel. The scores equal the kernel's to rounding (proved in
``tests/stress/test_variants.py``); the tie rule (1e-12, relative) absorbs
that.

References
----------
.. [1] C.-L. Hwang and K. Yoon, "Multiple Attribute Decision Making: Methods
   and Applications", Lecture Notes in Economics and Mathematical Systems 186,
   Springer, 1981, pp. 128-134.
"""

from __future__ import annotations

import numpy as np

from ranker.score.topsis import topsis


class TopsisVariants:
    """Closed-form TOPSIS (vector normalisation) scores of copy and removal variants.

    Parameters
    ----------
    x : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weights : ndarray, shape (k,)
        Weights [-].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better.
    """

    def __init__(self, x, weights, is_benefit):
        self.x2 = x * x
        self.norm2 = self.x2.sum(axis=0)
        r = x / np.sqrt(np.where(self.norm2 == 0, 1.0, self.norm2))
        hi, lo = r.max(axis=0), r.min(axis=0)
        benefit = np.asarray(is_benefit, dtype=bool)
        self.to_ideal = ((r - np.where(benefit, hi, lo)) ** 2).T.copy()  # (k, n)
        self.to_anti = ((r - np.where(benefit, lo, hi)) ** 2).T.copy()
        self.w2 = np.asarray(weights, dtype=float) ** 2
        weighted = self.w2 > 0
        # Removing a corridor moves a column's best or worst value when it holds
        # that value alone (a weighted column), or empties the column's norm.
        alone = np.zeros(len(x), dtype=bool)
        for c in np.nonzero(weighted)[0]:
            for value in (hi[c], lo[c]):
                at = np.nonzero(r[:, c] == value)[0]
                if at.size == 1:
                    alone[at] = True
        alone |= ((self.norm2 - self.x2 <= 0) & weighted).any(axis=1)
        self.removal_moves_ideal = alone

    def _scores(self, norm2_variant):
        f2 = np.where(
            norm2_variant > 0, self.norm2 / np.where(norm2_variant > 0, norm2_variant, 1.0), 1.0
        )
        a = self.w2 * f2  # w_c^2 f_c^2, one row per variant
        d_plus = np.sqrt(np.maximum(a @ self.to_ideal, 0.0))
        d_minus = np.sqrt(np.maximum(a @ self.to_anti, 0.0))
        total = d_plus + d_minus
        return np.divide(d_minus, total, out=np.full_like(total, 0.5), where=total > 0)

    def with_copy(self, v: np.ndarray) -> np.ndarray:
        """Scores (len(v), n + 1) of the base corridors and, last, the copy of corridor v [-]."""
        g = self._scores(self.norm2[None, :] + self.x2[v])
        return np.concatenate([g, g[np.arange(len(v)), v][:, None]], axis=1)

    def without(self, v: np.ndarray) -> np.ndarray:
        """Scores (len(v), n) of the base corridors with corridor v removed (its own entry unused) [-].

        Valid only where ``removal_moves_ideal[v]`` is False.
        """
        return self._scores(self.norm2[None, :] - self.x2[v])


def topsis_variants(scorer, x, weights):
    """A :class:`TopsisVariants` for a TOPSIS scorer on vector-normalised values, else None."""
    if scorer.kernel is not topsis or scorer.options.get("normalization", "vector") != "vector":
        return None
    return TopsisVariants(np.asarray(x, dtype=float), weights, scorer.is_benefit)
