"""Scores of one-corridor variants of a problem, in closed form where the method allows.

The rank-reversal checks of :mod:`ranker.stress.reversal` (test 1, clones,
leave-one-out) score ``n`` variants of an ``n``-corridor problem, each
differing from it by one corridor replaced, added or removed. For TOPSIS on vector-normalised values [1]_ a
variant changes only each criterion's norm (``N'_c^2 = N_c^2 + x_vc^2`` for
a copy of corridor v, ``N_c^2 - x_vc^2`` for its removal) and, sometimes,
the ideal or anti-ideal: with ``r = x / N`` the normalised base matrix and
``f_c = N_c / N'_c``, every remaining corridor's distances are

``d+_l^2 = sum_c w_c^2 f_c^2 (r_lc - r*_c)^2`` (and ``d-`` with the anti-ideal),

as long as the ideal and anti-ideal values ``r*_c`` are those of the base
problem. That holds for every copy (it repeats an existing row), and for the
removal of a corridor that is not alone in holding a column's best or worst
value; a replacement shifts the ideal and anti-ideal by known amounts
(:meth:`TopsisVariants.with_replaced`). So all those variants are scored by two matrix products, ``(V, k) @
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

from .batch import ELEMENT_BUDGET


def _product(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """``a @ b`` a block of rows at a time, each block at most ``ELEMENT_BUDGET`` entries.

    OpenBLAS runs products that small on one thread; its threads, on a
    machine busy with other work, made these passes several times slower
    (the same reason :meth:`ranker.stress.batch.Scorer.weights` chunks).
    Each block is the same product, so the entries equal ``a @ b``'s.
    """
    out = np.empty((a.shape[0], b.shape[1]))
    step = max(1, ELEMENT_BUDGET // max(1, b.shape[1]))
    for start in range(0, a.shape[0], step):
        np.matmul(a[start : start + step], b, out=out[start : start + step])
    return out


def _closeness(dp2: np.ndarray, dm2: np.ndarray) -> np.ndarray:
    """Closeness ``d- / (d+ + d-)`` from squared distances, 0.5 where both are 0 [-].

    Works in place on the two arrays (they are the products just computed),
    so a pass of variants allocates no further (variants x corridors) array.
    """
    d_plus = np.sqrt(np.maximum(dp2, 0.0, out=dp2), out=dp2)
    d_minus = np.sqrt(np.maximum(dm2, 0.0, out=dm2), out=dm2)
    total = np.add(d_plus, d_minus, out=d_plus)
    with np.errstate(invalid="ignore"):
        out = np.divide(d_minus, total, out=d_minus)
    if not total.all():
        out[total == 0] = 0.5
    return out


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
    layout : ndarray of int, shape (n,), optional
        Corridor indices in the order the score columns come out in (the
        swap counter's best-first layout); default the input order. Variants
        are always named by corridor index.
    """

    def __init__(self, x, weights, is_benefit, layout=None):
        self.x = x
        self.x2 = x * x
        self.norm2 = self.x2.sum(axis=0)
        r = x / np.sqrt(np.where(self.norm2 == 0, 1.0, self.norm2))
        hi, lo = r.max(axis=0), r.min(axis=0)
        benefit = np.asarray(is_benefit, dtype=bool)
        layout = np.arange(len(x)) if layout is None else np.asarray(layout, dtype=np.int64)
        self.layout = layout
        self.column = np.empty_like(layout)  # corridor index -> output column
        self.column[layout] = np.arange(layout.size)
        self.to_ideal = ((r[layout] - np.where(benefit, hi, lo)) ** 2).T.copy()  # (k, n)
        self.to_anti = ((r[layout] - np.where(benefit, lo, hi)) ** 2).T.copy()
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
        # For replacements: each column's best and worst value without corridor v.
        self.r, self.r_out, self.benefit = r, r[layout], benefit
        self.ideal, self.anti = np.where(benefit, hi, lo), np.where(benefit, lo, hi)
        order = np.sort(r, axis=0)
        # With one corridor there is no other: the new row alone sets both.
        second_lo = order[1] if len(x) > 1 else np.full(r.shape[1], np.inf)
        second_hi = order[-2] if len(x) > 1 else np.full(r.shape[1], -np.inf)
        self.hi_without = np.where((r == hi) & ((r == hi).sum(axis=0) == 1), second_hi, hi)
        self.lo_without = np.where((r == lo) & ((r == lo).sum(axis=0) == 1), second_lo, lo)

    def _scores(self, norm2_variant):
        f2 = np.where(
            norm2_variant > 0, self.norm2 / np.where(norm2_variant > 0, norm2_variant, 1.0), 1.0
        )
        a = self.w2 * f2  # w_c^2 f_c^2, one row per variant
        return _closeness(_product(a, self.to_ideal), _product(a, self.to_anti))

    def with_copy(self, v: np.ndarray) -> np.ndarray:
        """Scores (len(v), n + 1) of the base corridors and, last, the copy of corridor v [-]."""
        g = self._scores(self.norm2[None, :] + self.x2[v])
        return np.concatenate([g, g[np.arange(len(v)), self.column[v]][:, None]], axis=1)

    def without(self, v: np.ndarray) -> np.ndarray:
        """Scores (len(v), n) of the base corridors with corridor v removed (its own entry unused) [-].

        Valid only where ``removal_moves_ideal[v]`` is False.
        """
        return self._scores(self.norm2[None, :] - self.x2[v])

    def with_replaced(self, v: np.ndarray, rows: np.ndarray) -> np.ndarray:
        """Scores (len(v), n) with corridor v[m] replaced by ``rows[m]`` (units of x) [-].

        The norms change by ``x'^2 - x^2``; the ideal and anti-ideal are those
        of the other corridors and the new row. Where they stay, the two
        matrix products give every distance; where the new row moves one,
        that variant's distances are taken to the moved point directly.
        """
        nv = self.norm2[None, :] - self.x2[v] + rows * rows
        base = np.sqrt(np.where(self.norm2 == 0, 1.0, self.norm2))
        f2 = np.where(nv > 0, self.norm2 / np.where(nv > 0, nv, 1.0), 1.0)
        a = self.w2 * f2
        new = rows / base  # the new row in base units
        hi = np.maximum(self.hi_without[v], new)
        lo = np.minimum(self.lo_without[v], new)
        ideal = np.where(self.benefit, hi, lo)
        anti = np.where(self.benefit, lo, hi)
        # Where the new row moves an ideal or anti-ideal value, that column's
        # terms are left out of the matrix product and added directly as
        # ``a_c (r_lc - p_c)^2`` with the moved point p (expanding the square
        # would cancel digits exactly where a distance is near 0).
        weighted = self.w2 > 0
        moved_ideal = (ideal != self.ideal) & weighted
        moved_anti = (anti != self.anti) & weighted
        dp2 = _product(np.where(moved_ideal, 0.0, a), self.to_ideal)
        dm2 = _product(np.where(moved_anti, 0.0, a), self.to_anti)
        for out, moved, point in ((dp2, moved_ideal, ideal), (dm2, moved_anti, anti)):
            for c in np.nonzero(moved.any(axis=0))[0]:
                m = np.nonzero(moved[:, c])[0]
                out[m] += a[m, c, None] * (self.r_out[None, :, c] - point[m, c, None]) ** 2
        rows_m, at = np.arange(len(v)), self.column[v]
        dp2[rows_m, at] = (a * (new - ideal) ** 2).sum(axis=1)
        dm2[rows_m, at] = (a * (new - anti) ** 2).sum(axis=1)
        out = _closeness(dp2, dm2)
        # A column of zeros that the new row fills has no base scale: score those
        # variants as they are (the worsening rule never does this).
        empty = ((self.norm2 == 0) & (nv > 0) & (self.w2 > 0)).any(axis=1)
        for m in np.nonzero(empty)[0]:
            y = self.x.copy()
            y[v[m]] = rows[m]
            out[m] = topsis(y, np.sqrt(self.w2), self.benefit)[self.layout]
        return out


def topsis_variants(scorer, x, weights, layout=None):
    """A :class:`TopsisVariants` for a TOPSIS scorer on vector-normalised values, else None."""
    if scorer.kernel is not topsis or scorer.options.get("normalization", "vector") != "vector":
        return None
    return TopsisVariants(np.asarray(x, dtype=float), weights, scorer.is_benefit, layout)
