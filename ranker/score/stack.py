"""Stacks of decision matrices: their memory layout and weighted row sums.

Every kernel of :data:`ranker.score.methods.METHODS` takes either one
decision matrix, shape (n, k), scored under weights (k,) or a batch (s, k),
or a stack of matrices, shape (s, n, k), each scored under its own weight
row (s, k) or all under one (k,), each normalised on its own (along axis
-2). This module holds the two steps they share:

* :func:`criterion_major` lays a stack out so that each criterion's n values
  of one matrix are contiguous in memory. Normalising takes statistics
  along axis -2; with the alternatives contiguous those reductions run
  several times faster than over the (s, n, k) C layout, whose innermost
  axis holds only the k criteria. Elementwise numpy operations keep the
  layout, so one copy at the start serves the whole kernel. Callers that
  build large stacks (the Monte Carlo, the rank-reversal variants) fill an
  :func:`empty_stack`, which has this layout already.
* :func:`weighted_rows` is the final ``sum_j w_j v_ij``.
"""

from __future__ import annotations

import numpy as np

#: Stacks of matrices with fewer alternatives than this keep the C layout:
#: with so few rows the axis -2 reductions are cheap already (measured) [-].
CRITERION_MAJOR_FROM = 8


def criterion_major(matrix: np.ndarray) -> np.ndarray:
    """Return a stack (s, n, k) as a view of an (s, k, n) array; other input unchanged.

    Parameters
    ----------
    matrix : array_like, shape (n, k) or (s, n, k)
        One matrix or a stack [unit of each criterion].

    Returns
    -------
    ndarray of float, same shape and values
        For a stack of at least :data:`CRITERION_MAJOR_FROM` alternatives,
        laid out criterion by criterion (a copy unless it already was); a
        single matrix or a stack of fewer alternatives as given (as float)
        [unit of each criterion].

    Examples
    --------
    >>> x = criterion_major(np.ones((2, 10, 3)))
    >>> x.shape, x.strides
    ((2, 10, 3), (240, 8, 80))
    """
    x = np.asarray(matrix, dtype=float)
    if x.ndim != 3 or x.shape[1] < CRITERION_MAJOR_FROM:
        return x
    return np.ascontiguousarray(x.transpose(0, 2, 1)).transpose(0, 2, 1)


def empty_stack(count: int, n: int, k: int) -> np.ndarray:
    """Return an uninitialised stack (count, n, k) in the layout the kernels prefer.

    Criterion-major (see :func:`criterion_major`) from
    :data:`CRITERION_MAJOR_FROM` alternatives on, C layout below; filling it
    in place spares the kernel a copy.

    Examples
    --------
    >>> empty_stack(2, 10, 3).strides, empty_stack(2, 2, 3).strides
    ((240, 8, 80), (48, 24, 8))
    """
    if n < CRITERION_MAJOR_FROM:
        return np.empty((count, n, k))
    return np.empty((count, k, n)).transpose(0, 2, 1)


def weighted_rows(values: np.ndarray, weights: np.ndarray) -> np.ndarray:
    """Return ``sum_j w_j v_ij`` for every alternative i [-].

    Parameters
    ----------
    values : ndarray, shape (n, k) or (s, n, k)
        Per-criterion values of each alternative, one matrix or a stack [-].
    weights : ndarray, shape (k,) or (s, k)
        One weight vector, or one per row of the batch (2-D ``values``) or
        per matrix of the stack (3-D ``values``) [-].

    Returns
    -------
    ndarray
        2-D ``values``: ``weights @ values.T``, shape (n,) or (s, n);
        3-D ``values``: shape (s, n), matrix m summed with its own weights
        (or the one vector) [-].

    Examples
    --------
    >>> v = np.array([[[1.0, 2.0]], [[3.0, 4.0]]])
    >>> weighted_rows(v, np.array([[1.0, 0.0], [0.5, 0.5]]))
    array([[1. ],
           [3.5]])
    """
    w = np.asarray(weights, dtype=float)
    if values.ndim == 2:
        return w @ values.T
    # einsum beats batched matrix products on the criterion-major layout.
    return np.einsum("snk,k->sn" if w.ndim == 1 else "snk,sk->sn", values, w)
