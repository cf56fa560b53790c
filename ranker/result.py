"""The result of one run: what every report writer reads.

Kept free of heavy imports so that ``import ranker`` and ``ranker --help``
start fast; pandas loads when a table is first asked for.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property
from typing import TYPE_CHECKING

from . import __version__

if TYPE_CHECKING:  # annotations only
    import pandas as pd

    from .derive.run import Derivation
    from .plan.phasing import Plan
    from .score.scoring import Scores
    from .score.weights import ResolvedWeights
    from .stress import Robustness
    from .workbook.tables import CriterionSpec, Inputs

#: Seed used when none is given, so two runs of one input give identical outputs.
DEFAULT_SEED = 20261201
#: Monte Carlo samples when none are given.
DEFAULT_SAMPLES = 10_000


@dataclass
class Result:
    """Everything one run found; the report writers read only this.

    Attributes
    ----------
    inputs : Inputs
        The typed tables read from the workbook.
    assumptions : dict
        Every assumption key with the value used (defaults filled in).
    weight_set : str
        Name of the weight set used.
    weights : dict of str to float
        Weights used in scoring, one per included criterion, summing to 1:
        after ``--weight`` overrides, with a criterion left out of scoring
        (the same value for every corridor) at 0 and the others rescaled [-].
        Every score is reproduced from these and the matrix.
    chosen_weights : dict of str to float
        The chosen set after overrides, normalised to sum 1, before any
        criterion was left out [-].
    overrides : dict of str to float
        ``--weight KEY=VALUE`` overrides as given (points before renormalising).
    weight_sets : list of ResolvedWeights
        Every weight set (:class:`ranker.score.weights.ResolvedWeights`).
    criteria : list of CriterionSpec
        The included criteria, in sheet order.
    matrix : DataFrame
        Corridors (all, excluded ones too) by included criteria, in each
        criterion's own unit.
    scored_matrix : DataFrame or None
        The matrix every method scored: ``matrix`` with each value past its
        full-credit level clipped to the level (None: same as ``matrix``).
    full_credit : dict of str to float
        Criterion key to its full-credit level, in the criterion's unit
        (:mod:`ranker.score.saturation`); criteria without one left out.
    diagnostics : dict
        ``spread_share`` (criterion to its share of the spread of the weighted
        normalised values [-]) and ``correlated`` (pairs ``{"a", "b", "rho"}``
        of criteria with ``|Spearman rho| > 0.8``; :mod:`ranker.score.diagnostics`).
    provenance : dict of str to str
        Criterion to ``"derived"`` or ``"given"``.
    derivation : Derivation or None
        Intermediate numbers of the derived criteria.
    excluded : list of dict
        Corridors screened out, with the rule they failed.
    scores : Scores
        Scores and ranks of every method on the kept corridors.
    robustness : Robustness or None
        Stress-test results (None when fewer than two corridors are kept).
    futures : dict or None
        Ranks under each scenario of the ``Scenarios`` sheet.
    plan : Plan or None
        Phased build plan when a ``Budget`` sheet is given.
    warnings : list of str
        Every warning of every stage.
    samples, seed : int
        Monte Carlo settings used.
    started : str
        Start time, ISO 8601 in UTC.
    changes : list of str
        What changed since the last run, in plain sentences (empty without one).
    change_record : dict
        The same as data: ``previous`` (path or None), ``inputs``,
        ``criteria``, ``moved`` (:func:`ranker.changes.compare`).
    """

    inputs: Inputs
    assumptions: dict
    weight_set: str
    weights: dict[str, float]
    overrides: dict[str, float]
    weight_sets: list[ResolvedWeights]
    criteria: list[CriterionSpec]
    matrix: pd.DataFrame
    provenance: dict[str, str]
    derivation: Derivation | None
    excluded: list[dict]
    scores: Scores
    robustness: Robustness | None
    futures: dict | None
    plan: Plan | None
    warnings: list[str]
    samples: int
    seed: int
    started: str
    tool_version: str = __version__
    outputs: dict[str, str] = field(default_factory=dict)
    chosen_weights: dict[str, float] = field(default_factory=dict)
    scored_matrix: pd.DataFrame | None = None
    full_credit: dict[str, float] = field(default_factory=dict)
    diagnostics: dict = field(default_factory=dict)
    changes: list[str] = field(default_factory=list)
    change_record: dict = field(
        default_factory=lambda: {"previous": None, "inputs": [], "criteria": [], "moved": []}
    )

    def weight_notes(self) -> dict[str, str]:
        """Criterion to why its weight used differs from the chosen one ("" where not)."""
        dropped = set(getattr(self.scores, "dropped", []) or [])
        out = {}
        for key, used in self.weights.items():
            chosen = self.chosen_weights.get(key, used)
            if key in dropped:
                out[key] = "left out: the same value for every corridor"
            elif abs(chosen - used) > 1e-12:
                out[key] = "rescaled after a criterion was left out"
            else:
                out[key] = ""
        return out

    @property
    def primary_method(self) -> str:
        """Key of the method that decides rank."""
        return str(self.assumptions["primary_method"])

    @cached_property
    def ranking(self) -> pd.DataFrame:
        """Kept corridors sorted by rank: rank, name, tier, then score columns per method.

        ``tier`` is 1 for the first tier (:mod:`ranker.stress.tiers`); without
        a stress test (one corridor left) tiers follow exact ties of rank.
        Built once, on first use, for every writer that reads it; copy it
        before changing it.
        """
        import numpy as np
        import pandas as pd

        s = self.scores
        table = pd.DataFrame(
            {"rank": s.rank, "name": self.inputs.corridors.loc[s.rank.index, "name"]}
        )
        for method in s.scores.columns:
            table[f"score_{method}"] = s.scores[method]
            table[f"rank_{method}"] = s.ranks[method]
        table.index.name = "corridor_id"
        order = np.lexsort((np.arange(len(table)), table["rank"].to_numpy()))
        table = table.iloc[order]
        tier = getattr(self.robustness, "tier", None)
        if tier is not None and len(tier):
            column = tier.reindex(table.index).to_numpy()
        else:
            ranks = table["rank"].to_numpy()
            column = np.concatenate([[1], 1 + np.cumsum(ranks[1:] > ranks[:-1])])[: len(ranks)]
        table.insert(2, "tier", column.astype(int))
        return table

    @cached_property
    def network(self):
        """Positions of the corridors (:class:`ranker.geo.Network`), or None without any."""
        from .geo import corridor_network

        return corridor_network(self.inputs)

    def to_json(self) -> dict:
        """Return the JSON summary of the contract (plus added fields)."""
        from .report.summary import summary_json

        return summary_json(self)
