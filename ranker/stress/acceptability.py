"""Rank acceptability by Monte Carlo (SMAA-2).

Weights are drawn around the chosen set (or over the whole weight simplex),
criterion values are shaken by their stated uncertainty, and every draw is
ranked. The shares of draws in which each corridor takes each rank form the
rank acceptability matrix ``b_i^r`` of SMAA-2 [1]_; the mean weights of the
draws a corridor wins are its central weight vector, and the share of value
draws it still wins under its central weights is its confidence factor.

Documented rules
----------------
* ``dirichlet`` sampling: ``w ~ Dirichlet(alpha)`` with
  ``alpha_c = concentration * w_c * k`` (k criteria), so the mean draw is the
  chosen set and each weight's variance is ``w_c (1 - w_c) / (concentration
  k + 1)``. A criterion with weight 0 stays at 0 (its alpha would be 0).
* ``uniform`` sampling: ``Dirichlet(1, ..., 1)``, uniform over the simplex
  ("no stated preference", SMAA's missing-preference case in [1]_).
* Value uncertainty: a criterion with ``uncertainty_pct = p`` has each value
  replaced by ``x (1 + p/100 u)``, ``u ~ U(-1, 1)`` drawn independently per
  corridor, criterion and sample; values are not clipped.
* Ties: a corridor tied with others spreads its draw evenly over the ranks
  the tied group occupies (see :mod:`ranker.stress.batch`), so each row and
  each column of the acceptability matrix sums to 1.
* Counting: each sample adds its share to the (corridor, rank) cells it
  fills, entry by entry (``numpy.add.at``) into one (n x n) table, so the
  work per chunk is proportional to the chunk, not to the table; a corridor
  without ties adds exactly 1, so the shares of untied samples are exact
  counts divided by the number of samples.
* Samples are scored in chunks so that no kernel call builds more than
  :data:`ranker.stress.batch.ELEMENT_BUDGET` elements per intermediate
  array; the weight draws are made once up front and the value draws come
  from their own stream, so the result does not depend on the chunking.

References
----------
.. [1] R. Lahdelma and P. Salminen, "SMAA-2: Stochastic multicriteria
   acceptability analysis for group decision making", Operations Research
   49(3):444-454, 2001. doi:10.1287/opre.49.3.444.11220
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from ranker.score.stack import empty_stack

from .batch import Scorer, beat_thresholds, chunk_size, first_share, rank_bounds

#: Element budget for the confidence-factor draws: draws x winners x n x k [-].
CONFIDENCE_BUDGET = 100_000_000
#: Elements of the score-difference table sorted at once for its percentiles [-].
PERCENTILE_BUDGET = 8_000_000


def weights_dirichlet(
    weights: np.ndarray, samples: int, *, rng: np.random.Generator, concentration: float
) -> np.ndarray:
    """Draw weight vectors from a Dirichlet centred on ``weights`` [-].

    ``alpha_c = concentration * w_c * k``; criteria with zero weight stay 0.

    Parameters
    ----------
    weights : ndarray, shape (k,)
        Chosen weights summing to 1 [-].
    samples : int
        Number of draws [-].
    rng : numpy.random.Generator
        Random stream.
    concentration : float
        Concentration per criterion, > 0 [-].

    Returns
    -------
    ndarray, shape (samples, k)
        Rows sum to 1 [-].
    """
    w = np.asarray(weights, dtype=float)
    alpha = concentration * w * w.size
    out = np.zeros((samples, w.size))
    live = alpha > 0
    gamma = rng.standard_gamma(alpha[live], size=(samples, int(live.sum())))
    out[:, live] = gamma / gamma.sum(axis=1, keepdims=True)
    return out


def weights_uniform(
    weights: np.ndarray, samples: int, *, rng: np.random.Generator, concentration: float
) -> np.ndarray:
    """Draw weight vectors uniformly over the whole simplex (Dirichlet(1, ..., 1)) [-].

    ``weights`` only gives the number of criteria; ``concentration`` is unused.
    """
    gamma = rng.standard_gamma(np.ones(np.size(weights)), size=(samples, np.size(weights)))
    return gamma / gamma.sum(axis=1, keepdims=True)


#: Sampling key to weight sampler ``f(weights, samples, *, rng, concentration)``.
WEIGHT_SAMPLERS: dict[str, Callable[..., np.ndarray]] = {
    "dirichlet": weights_dirichlet,
    "uniform": weights_uniform,
}


def perturb_values(
    matrix: np.ndarray, spread: np.ndarray, count: int, *, rng: np.random.Generator
) -> np.ndarray:
    """Shake criterion values uniformly by +-spread (a fraction) [same unit as matrix].

    Parameters
    ----------
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    spread : ndarray, shape (k,)
        Relative half-width per criterion, ``uncertainty_pct / 100`` [-].
    count : int
        Number of shaken copies [-].
    rng : numpy.random.Generator
        Random stream; only criteria with spread > 0 draw from it.

    Returns
    -------
    ndarray, shape (count, n, k)
        ``x (1 + spread u)``, ``u ~ U(-1, 1)`` [same unit as matrix].
    """
    out = empty_stack(count, *matrix.shape)  # the layout the kernels prefer
    out[...] = matrix
    live = np.nonzero(spread > 0)[0]
    if live.size:
        u = rng.random((count, matrix.shape[0], live.size)) * 2.0 - 1.0
        for c, j in enumerate(live):  # one contiguous criterion slab at a time
            out[:, :, j] *= 1.0 + spread[j] * u[:, :, c]
    return out


@dataclass
class Acceptability:
    """Result of :func:`rank_acceptability`.

    Attributes
    ----------
    acceptability : ndarray, shape (n, n)
        ``[i, r]`` share of samples where corridor i took rank r+1 [-].
    first_rank : ndarray, shape (n,)
        First-rank acceptability ``b_i^1`` [-].
    central_weights : ndarray, shape (n, k)
        Mean weights of the samples corridor i won; NaN where it never won [-].
    confidence : ndarray, shape (n,)
        Share of value draws corridor i wins under its central weights; NaN
        where it never won [-].
    pair_swap_share : ndarray, shape (p,)
        Per given pair (a ahead of b), share of samples where b beats a [-].
    pair_diff_low, pair_diff_high : ndarray, shape (p,)
        5th and 95th percentile of the oriented score difference g_a - g_b [-].
    samples : int
        Samples drawn [-].
    confidence_draws : int
        Value draws behind each confidence factor [-].
    notes : list of dict
        What the reader should know, as records (``confidence_draws_capped``
        with ``draws`` and ``samples``; see :data:`ranker.stress.WARNING_KINDS`).
    """

    acceptability: np.ndarray
    first_rank: np.ndarray
    central_weights: np.ndarray
    confidence: np.ndarray
    pair_swap_share: np.ndarray
    pair_diff_low: np.ndarray
    pair_diff_high: np.ndarray
    samples: int
    confidence_draws: int
    notes: list[dict] = field(default_factory=list)


def add_rank_shares(
    counts: np.ndarray, slots: np.ndarray, low: np.ndarray, high: np.ndarray, share: np.ndarray
) -> None:
    """Add each sample's rank shares to the flat (corridor x rank) table, in place [samples].

    Entry ``(j, i)`` of the chunk puts corridor ``i`` at positions ``low``
    to ``high`` of sample ``j``; each position gets ``share = 1 / (high -
    low + 1)`` (the tie rule of :mod:`ranker.stress.batch`). An untied
    entry adds exactly 1 to cell ``slots[i] + low - 1``.

    Parameters
    ----------
    counts : ndarray, shape (n * n,)
        Running table, ``counts[i * n + r]`` for corridor i at rank r + 1 [samples].
    slots : ndarray of int, shape (1, n)
        ``i * n`` per corridor [-].
    low, high : ndarray of int, shape (c, n)
        Best and worst tied position, 1 = best [-].
    share : ndarray, shape (c, n)
        ``1 / (high - low + 1)`` [-].
    """
    tied = high > low
    # Corridor by corridor (the transpose), so the additions walk the table in order.
    plain = (slots + low - 1).T[~tied.T]
    np.add.at(counts, plain, 1.0)
    if tied.any():
        j, i = np.nonzero(tied)
        size = (high - low + 1)[j, i]
        start = np.repeat(slots[0, i] + low[j, i] - 1, size)
        offset = np.arange(size.sum()) - np.repeat(np.cumsum(size) - size, size)
        np.add.at(counts, start + offset, np.repeat(share[j, i], size))


def _scores_for(scorer, matrix, weights, spread, rng):
    """Score one chunk of samples: weights (c, k), values shaken where spread > 0.

    Shaken values are drawn and scored a stack of :func:`chunk_size` (n, k)
    matrices at a time; the stream gives the same values however they are cut.
    """
    if not np.any(spread > 0):
        return scorer.weights(matrix, weights)
    n, k = matrix.shape
    out = np.empty((weights.shape[0], n))
    step = chunk_size(n, k)
    for start in range(0, weights.shape[0], step):
        w = weights[start : start + step]
        out[start : start + len(w)] = scorer.stack(
            perturb_values(matrix, spread, len(w), rng=rng), w
        )
    return out


def rank_acceptability(
    scorer: Scorer,
    matrix: np.ndarray,
    weight_samples: np.ndarray,
    *,
    spread: np.ndarray | None = None,
    rng_values: np.random.Generator | None = None,
    rng_confidence: np.random.Generator | None = None,
    pairs: np.ndarray | None = None,
    progress: Callable[[int, int], None] | None = None,
    on_ranks: Callable[[int, np.ndarray], None] | None = None,
) -> Acceptability:
    """Compute SMAA-2 rank acceptabilities, central weights and confidence factors.

    Parameters
    ----------
    scorer : Scorer
        The method kernel with its directions and options.
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weight_samples : ndarray, shape (s, k)
        Weight draws, rows summing to 1 [-] (see :data:`WEIGHT_SAMPLERS`).
    spread : ndarray, shape (k,), optional
        Relative value uncertainty per criterion, ``uncertainty_pct / 100``
        [-]; None or zeros for exact values.
    rng_values, rng_confidence : numpy.random.Generator, optional
        Streams for the value draws of the samples and of the confidence
        factors; required when ``spread`` has a positive entry.
    pairs : ndarray of int, shape (p, 2), optional
        Corridor index pairs (a, b), a ahead of b, whose score difference is
        tracked over the samples (for the closeness analysis).
    progress : callable, optional
        ``progress(done, total)`` after each chunk [samples].
    on_ranks : callable, optional
        ``on_ranks(start, ranks)`` with the competition ranks (c, n) of
        samples ``start .. start + c - 1`` (for :mod:`ranker.stress.tiers`).

    Returns
    -------
    Acceptability

    References
    ----------
    .. [1] R. Lahdelma and P. Salminen, "SMAA-2: Stochastic multicriteria
       acceptability analysis for group decision making", Operations
       Research 49(3):444-454, 2001.

    Examples
    --------
    >>> from ranker.score.weighted_sum import weighted_sum
    >>> sc = Scorer(weighted_sum, np.array([True, True]))
    >>> m = np.array([[1.0, 0.0], [0.0, 1.0]])
    >>> w = np.array([[0.9, 0.1], [0.2, 0.8], [0.7, 0.3], [0.6, 0.4]])
    >>> rank_acceptability(sc, m, w).first_rank
    array([0.75, 0.25])
    """
    x = np.asarray(matrix, dtype=float)
    n, k = x.shape
    w_all = np.asarray(weight_samples, dtype=float)
    s = w_all.shape[0]
    spread = np.zeros(k) if spread is None else np.asarray(spread, dtype=float)
    pairs = np.zeros((0, 2), dtype=int) if pairs is None else np.asarray(pairs, dtype=int)
    counts = np.zeros(n * n)  # [i * n + r]: samples (shares) with corridor i at rank r + 1
    first_sum = np.zeros(n)
    central_sum = np.zeros((n, k))
    # Pair x sample, so that each pair's percentiles come from one contiguous row.
    diffs = np.empty((len(pairs), s), dtype=np.float32)
    swaps = np.zeros(len(pairs))
    slots = (np.arange(n) * n)[None, :]
    # A chunk of samples is (c, n) scores; shaken values are stacked in smaller pieces.
    step = chunk_size(n, 1)
    for start in range(0, s, step):
        w = w_all[start : start + step]
        g = _scores_for(scorer, x, w, spread, rng_values)
        low, high = rank_bounds(g)
        if on_ranks is not None:
            on_ranks(start, low)
        share = 1.0 / (high - low + 1)
        add_rank_shares(counts, slots, low, high, share)
        # Only the first-placed corridors of each sample add to b^1 and the central weights.
        row, col = np.nonzero(low == 1)
        first = share[row, col]
        first_sum += np.bincount(col, first, n)
        central_sum += np.stack([np.bincount(col, first * w[row, j], n) for j in range(k)], axis=1)
        if len(pairs):
            ga, gb = g[:, pairs[:, 0]], g[:, pairs[:, 1]]
            diffs[:, start : start + len(w)] = (ga - gb).T
            swaps += (gb > beat_thresholds(ga)).sum(axis=0)
        if progress is not None:
            progress(min(s, start + step), s)
    acc = counts.reshape(n, n)
    if s:
        acc /= s  # in place: at 10,000 corridors the table is 800 MB
    with np.errstate(invalid="ignore", divide="ignore"):
        central = np.where(first_sum[:, None] > 0, central_sum / first_sum[:, None], np.nan)
    notes: list[str] = []
    confidence, draws = _confidence(scorer, x, central, spread, rng_confidence, s, notes)
    if len(pairs) and s:
        low_q, high_q = np.empty(len(pairs)), np.empty(len(pairs))
        block = max(1, PERCENTILE_BUDGET // s)  # bounds the sorting copy's memory
        for start in range(0, len(pairs), block):
            part = np.percentile(diffs[start : start + block], [5.0, 95.0], axis=1)
            low_q[start : start + block], high_q[start : start + block] = part
    else:
        low_q = high_q = np.full(len(pairs), np.nan)
    return Acceptability(
        acceptability=acc,
        first_rank=acc[:, 0].copy(),
        central_weights=central,
        confidence=confidence,
        pair_swap_share=swaps / s if s else np.full(len(pairs), np.nan),
        pair_diff_low=np.asarray(low_q, dtype=float),
        pair_diff_high=np.asarray(high_q, dtype=float),
        samples=s,
        confidence_draws=draws,
        notes=notes,
    )


def _confidence(scorer, x, central, spread, rng, samples, notes):
    """Share of value draws in which each winner still wins under its central weights."""
    n, k = x.shape
    winners = np.nonzero(~np.isnan(central[:, 0]))[0]
    confidence = np.full(n, np.nan)
    if not winners.size:
        return confidence, 0
    cw = central[winners]
    rows = np.arange(winners.size)
    if not np.any(spread > 0):
        # Exact values: the factor is 1 or 0 (a shared first place counts its share).
        low, high = rank_bounds(scorer.weights(x, cw))
        won = np.where(low[rows, winners] == 1, 1.0 / (high - low + 1)[rows, winners], 0.0)
        confidence[winners] = won
        return confidence, 1
    per_draw = winners.size * n * k
    draws = int(min(samples, max(200, CONFIDENCE_BUDGET // per_draw)))
    if draws < samples:
        notes.append({"kind": "confidence_draws_capped", "draws": draws, "samples": samples})
    wins = np.zeros(winners.size)
    step = chunk_size(n, k)
    for start in range(0, draws, step):
        c = min(step, draws - start)
        mats = perturb_values(x, spread, c, rng=rng)
        # Every winner's central weights score the same value draws.
        for r, scores in enumerate(scorer.stack_each(mats, cw)):
            wins[r] += first_share(scores, winners[r]).sum()
    confidence[winners] = wins / draws
    return confidence, draws
