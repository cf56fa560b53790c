"""Scoring stage: screen corridors, resolve weight sets, score and rank.

Public entry points:

* :func:`screen` - keep out corridors outside the must-meet limits;
* :func:`resolve_weight_sets` - every named weight set (points, rank order,
  AHP, objective references);
* :func:`score_matrix` - scores and ranks by every requested method, with
  what explains them (:class:`Scores`);
* :data:`METHODS` - the registry of scoring methods (pure numpy kernels that
  also take batches of weights, for the robustness analysis);
* :func:`rank_scores` - ranks with ties sharing (1, 2, 2, 4).
"""

from .methods import METHODS, Method
from .ranks import TIE_RTOL, rank_scores
from .screen import screen
from .weights import ResolvedWeights, resolve_weight_sets

#: Names of :mod:`ranker.score.scoring`, loaded on first use: it works on DataFrames, and
#: ``ranker check`` (which screens and weighs but does not score) runs without pandas.
_SCORING = ("Scores", "method_order", "score_matrix")


def __getattr__(name: str):
    if name in _SCORING:
        from . import scoring

        return getattr(scoring, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


__all__ = [
    "METHODS",
    "Method",
    "ResolvedWeights",
    "Scores",
    "TIE_RTOL",
    "method_order",
    "rank_scores",
    "resolve_weight_sets",
    "score_matrix",
    "screen",
]
