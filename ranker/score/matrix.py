"""The criteria matrix as plain numpy: corridors by criteria, each in its own unit.

``ranker check`` builds, screens and weighs it without pandas; ``ranker run``
turns it into the DataFrame its scoring and outputs read (:meth:`frame`).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

if TYPE_CHECKING:  # annotations only
    import pandas as pd


@dataclass(frozen=True)
class CriteriaMatrix:
    """Corridors by criteria.

    Attributes
    ----------
    ids : list
        Corridor ids, one per row, in sheet order.
    keys : list of str
        Criterion keys, one per column, in the order of the Criteria sheet.
    values : ndarray, shape (len(ids), len(keys))
        Each criterion's value of each corridor [unit of the criterion];
        NaN where missing.

    Examples
    --------
    >>> m = CriteriaMatrix(["A", "B"], ["cost"], np.array([[2.0], [3.0]]))
    >>> m.column("cost"), m.take(np.array([False, True])).ids
    (array([2., 3.]), ['B'])
    """

    ids: list
    keys: list[str]
    values: np.ndarray

    def __len__(self) -> int:
        return len(self.ids)

    @property
    def columns(self) -> list[str]:
        """The criterion keys (as a DataFrame's columns)."""
        return self.keys

    def column(self, key: str) -> np.ndarray:
        """Return criterion ``key`` of every corridor [its unit]."""
        return self.values[:, self.keys.index(key)]

    def select(self, keys: list[str]) -> np.ndarray:
        """Return the columns ``keys``, in that order, shape (n, len(keys))."""
        return self.values[:, [self.keys.index(k) for k in keys]]

    def take(self, rows: np.ndarray) -> CriteriaMatrix:
        """Return the corridors ``rows`` (a bool mask or positions), in matrix order."""
        picked = np.arange(len(self.ids))[rows]
        return CriteriaMatrix(
            [self.ids[i] for i in picked.tolist()], self.keys, self.values[picked]
        )

    def with_values(self, values: np.ndarray) -> CriteriaMatrix:
        """Return the same corridors and criteria holding ``values``."""
        return CriteriaMatrix(self.ids, self.keys, values)

    def frame(self) -> pd.DataFrame:
        """Return the matrix as a DataFrame: index ``corridor_id``, one column per key."""
        import pandas as pd

        index = pd.Index(self.ids, dtype=object, name="corridor_id")
        return pd.DataFrame(dict(zip(self.keys, self.values.T, strict=True)), index=index)

    @classmethod
    def of(cls, frame: pd.DataFrame) -> CriteriaMatrix:
        """Return the matrix of a DataFrame (index the corridors, columns the criteria)."""
        return cls(list(frame.index), [str(k) for k in frame.columns], frame.to_numpy(dtype=float))


__all__ = ["CriteriaMatrix"]
