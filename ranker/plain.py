"""Turn analysis results into plain JSON types: one cleaner for every JSON output."""

from __future__ import annotations

import math

import numpy as np


def plain(value):
    """Return ``value`` as plain JSON types.

    Dicts (keys become text), lists and tuples are walked; numpy scalars and
    arrays become Python numbers and lists; pandas Series become dicts and
    DataFrames lists of records; NaN, infinity, None and ``pd.NA`` become None.

    Examples
    --------
    >>> plain({1: np.float64("nan"), "x": (np.int64(3), np.bool_(True))})
    {'1': None, 'x': [3, True]}
    """
    if isinstance(value, dict):
        return {str(k): plain(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [plain(v) for v in value]
    if isinstance(value, np.ndarray):
        return plain(value.tolist())
    if type(value).__module__.startswith("pandas"):
        return _plain_pandas(value)
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


def _plain_pandas(value):
    import pandas as pd

    if isinstance(value, pd.DataFrame):
        return plain(value.to_dict(orient="records"))
    if isinstance(value, pd.Series):
        return plain(value.to_dict())
    return None if value is pd.NA or value is pd.NaT else value
