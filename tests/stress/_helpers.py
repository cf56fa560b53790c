"""Shared builders for the stress tests (invented matrices only, never check values)."""

from __future__ import annotations

import warnings

import numpy as np
import pandas as pd


def frame(values, *, prefix="C", columns=None) -> pd.DataFrame:
    """A criteria matrix with corridor ids C0, C1, ... and criteria k0, k1, ..."""
    values = np.asarray(values, dtype=float)
    cols = columns or [f"k{j}" for j in range(values.shape[1])]
    index = pd.Index([f"{prefix}{i}" for i in range(values.shape[0])], name="corridor_id")
    return pd.DataFrame(values, index=index, columns=cols)


def skc_topsis_pipeline():
    """scikit-criteria's TOPSIS on vector-scaled values (the textbook TOPSIS)."""
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        from skcriteria.agg.topsis import TOPSIS
        from skcriteria.pipelines import mkpipe
        from skcriteria.preprocessing.scalers import VectorScaler

        return mkpipe(VectorScaler(target="matrix"), TOPSIS())


def skc_dm(matrix, weights, is_benefit, ids):
    """A scikit-criteria decision matrix."""
    import skcriteria as skc

    objectives = [max if b else min for b in is_benefit]
    return skc.mkdm(
        np.asarray(matrix, dtype=float), objectives, weights=list(weights), alternatives=list(ids)
    )
