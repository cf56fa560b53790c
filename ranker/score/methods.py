"""The registry of scoring methods, chosen by key.

Adding a method: write a pure kernel ``kernel(matrix, weights, is_benefit,
**options) -> scores`` (weights of shape (k,) or (s, k)) and a normaliser
``normalizer(matrix, is_benefit, **options) -> ndarray`` returning the matrix
the kernel works on, then add one :class:`Method` to :data:`METHODS`. The
assumption table (``ranker/assumptions.py``) must list the key among the
choices of ``methods`` and ``primary_method``.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass, field

import numpy as np

from .normalize import normalize
from .topsis import topsis
from .vikor import vikor, vikor_regret
from .weighted_product import weighted_product, weighted_product_normalized
from .weighted_sum import weighted_sum


@dataclass(frozen=True)
class Method:
    """One scoring method.

    Attributes
    ----------
    key : str
        Key used in the ``methods`` and ``primary_method`` assumptions.
    label : str
        Name for people.
    higher_is_better : bool
        False where the best score is the lowest (VIKOR's Q).
    kernel : callable
        ``kernel(matrix, weights, is_benefit, **options)`` returning scores of
        shape (n,) or (s, n).
    normalization_key : str or None
        Assumption key holding the normalisation the kernel takes as
        ``normalization=``; None where the method fixes its own.
    normalizer : callable
        ``normalizer(matrix, is_benefit, **options)``: the normalised matrix
        the kernel combines (for the outputs).
    options : mapping of str to str
        Further kernel keyword to assumption key (``{"v": "vikor_v"}``).
    """

    key: str
    label: str
    higher_is_better: bool
    kernel: Callable[..., np.ndarray]
    normalization_key: str | None
    normalizer: Callable[..., np.ndarray]
    options: Mapping[str, str] = field(default_factory=dict)

    def kernel_options(self, assumptions: Mapping[str, object]) -> dict:
        """Return the kernel's keyword options read from resolved assumptions."""
        opts = {kw: assumptions[key] for kw, key in self.options.items()}
        if self.normalization_key is not None:
            opts["normalization"] = assumptions[self.normalization_key]
        return opts

    def normalizer_options(self, assumptions: Mapping[str, object]) -> dict:
        """Return the normaliser's keyword options (the normalisation key only)."""
        if self.normalization_key is None:
            return {}
        return {"normalization": assumptions[self.normalization_key]}


def _normalized(matrix, is_benefit, *, normalization):
    return normalize(matrix, is_benefit, normalization)


def _vikor_normalized(matrix, is_benefit):
    return vikor_regret(matrix, is_benefit)


#: Method key to :class:`Method`, in the order the outputs list them.
METHODS: dict[str, Method] = {
    "topsis": Method(
        key="topsis",
        label="TOPSIS",
        higher_is_better=True,
        kernel=topsis,
        normalization_key="topsis_normalization",
        normalizer=_normalized,
    ),
    "weighted_sum": Method(
        key="weighted_sum",
        label="Weighted sum",
        higher_is_better=True,
        kernel=weighted_sum,
        normalization_key="weighted_sum_normalization",
        normalizer=_normalized,
    ),
    "weighted_product": Method(
        key="weighted_product",
        label="Weighted product",
        higher_is_better=True,
        kernel=weighted_product,
        normalization_key=None,
        normalizer=weighted_product_normalized,
    ),
    "vikor": Method(
        key="vikor",
        label="VIKOR (Q)",
        higher_is_better=False,
        kernel=vikor,
        normalization_key=None,
        normalizer=_vikor_normalized,
        options={"v": "vikor_v"},
    ),
}
