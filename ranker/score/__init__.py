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
from .scoring import Scores, method_order, score_matrix
from .screen import screen
from .weights import ResolvedWeights, resolve_weight_sets

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
