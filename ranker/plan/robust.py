"""Robustness of the plan: how often each corridor is funded in year one.

The greedy plan is re-run on every Monte Carlo sample of the scores (the
priority order of a sample is its scores, highest first, ties in input
order). A corridor counts as funded in year one when it receives money in
the first plan year: paid in full, or, with splitting, started. The kernel
runs all samples at once, in chunks that bound the memory used.

References
----------
.. [1] R. Lahdelma and P. Salminen, "SMAA-2: Stochastic multicriteria
   acceptability analysis for group decision making", Operations Research
   49(3):444-454, 2001 (acceptability as the share of samples).
"""

from __future__ import annotations

import numpy as np

from .greedy import greedy_kernel

#: Samples run together; bounds memory at about 3 * CHUNK * n integers.
CHUNK = 2048


def year_one_share(
    cost: np.ndarray,
    sample_scores: np.ndarray,
    budget: np.ndarray,
    *,
    carry_over: bool,
    allow_split: bool,
) -> np.ndarray:
    """Share of samples in which the greedy plan funds each corridor in year one [-].

    Parameters
    ----------
    cost : ndarray, shape (n,)
        Capital cost per corridor [USD].
    sample_scores : ndarray, shape (s, n)
        Sampled scores, higher is better; to pass sampled ranks, pass
        ``-ranks`` [-].
    budget : ndarray, shape (T,)
        Capital available in each plan year [USD].
    carry_over : bool
        Whether unspent money is added to the next year.
    allow_split : bool
        Whether a corridor too expensive for one year may be started.

    Returns
    -------
    ndarray, shape (n,)
        Share of samples in [0, 1] [-].

    References
    ----------
    .. [1] R. Lahdelma and P. Salminen, "SMAA-2: Stochastic multicriteria
       acceptability analysis for group decision making", Operations
       Research 49(3):444-454, 2001.

    Examples
    --------
    >>> s = np.array([[0.9, 0.5, 0.1], [0.1, 0.5, 0.9]])
    >>> year_one_share(np.array([5.0, 5.0, 5.0]), s, np.array([5.0]),
    ...                carry_over=True, allow_split=False)
    array([0.5, 0. , 0.5])
    """
    samples = np.asarray(sample_scores, dtype=float)
    s, n = samples.shape
    count = np.zeros(n)
    for lo in range(0, s, CHUNK):
        block = samples[lo : lo + CHUNK]
        order = np.argsort(-block, axis=1, kind="stable")
        run = greedy_kernel(
            cost, order, budget, carry_over=carry_over, allow_split=allow_split, n_years=1
        )
        count += (run.started == 0).sum(axis=0)
    return count / s
