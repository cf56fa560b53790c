"""The whole job, stage by stage: read, derive, weigh, screen, score, stress, plan.

Data flows one way: workbook -> typed tables -> criteria matrix -> scores ->
stress results -> plan. Reports are written from the :class:`Result` by
:mod:`ranker.report`; nothing here touches a file but the input it reads.
"""

from __future__ import annotations

import datetime as _dt
import numbers
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from functools import cached_property
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from .assumptions import resolve
from .errors import InputError, Problem, Problems
from .progress import stage
from .result import DEFAULT_SAMPLES, DEFAULT_SEED, Result
from .workbook.tables import CORRIDORS, CRITERIA, CriterionSpec, Inputs, floats

if TYPE_CHECKING:  # annotations only (pandas is loaded once a workbook has been read)
    import pandas as pd

    from .derive.run import Derivation
    from .score.matrix import CriteriaMatrix
    from .score.weights import ResolvedWeights

#: Most Monte Carlo samples a run takes (memory grows with samples x corridors).
MAX_SAMPLES = 1_000_000


def rank_workbook(
    path: str | Path,
    *,
    weights: str | None = None,
    weight_overrides: Mapping[str, float] | None = None,
    samples: int = DEFAULT_SAMPLES,
    seed: int = DEFAULT_SEED,
    progress: Callable[[int, int], None] | None = None,
) -> Result:
    """Rank the corridors of one input workbook, as ``ranker run`` does.

    Parameters
    ----------
    path : str or Path
        The filled-in input workbook (``.xlsx``).
    weights : str, optional
        Name of the weight set to use; default the first set.
    weight_overrides : mapping, optional
        Criterion key to its final share of the weight in percent; the other
        criteria keep their proportions (``--weight KEY=SHARE``).
    samples : int
        Monte Carlo samples for rank acceptability; 0 turns it off.
    seed : int
        Seed of the random stream.
    progress : callable, optional
        Called as ``progress(done, total)`` during the Monte Carlo; where it
        has a ``stage(name)`` method, that is called as each stage begins.

    Returns
    -------
    Result

    Raises
    ------
    InputError
        When the workbook or an option is at fault; every problem is listed.
    """
    from .workbook.read import read_workbook

    started = _dt.datetime.now(_dt.timezone.utc).replace(microsecond=0).isoformat()
    inputs = read_workbook(Path(path), frames=False)
    return rank_inputs(
        inputs,
        weights=weights,
        weight_overrides=weight_overrides,
        samples=samples,
        seed=seed,
        progress=progress,
        started=started,
    )


def rank_inputs(
    inputs: Inputs,
    *,
    weights: str | None = None,
    weight_overrides: Mapping[str, float] | None = None,
    samples: int = DEFAULT_SAMPLES,
    seed: int = DEFAULT_SEED,
    progress: Callable[[int, int], None] | None = None,
    started: str | None = None,
) -> Result:
    """Rank already-read inputs; see :func:`rank_workbook`.

    Every stage returns its warnings as records; they are put in words here,
    through :mod:`ranker.report.narrative`, in the order the stages ran.
    """
    from .input_warnings import warning
    from .report.narrative import input_warnings, inputs_namer, robustness_warnings
    from .score import score_matrix

    if samples < 0:
        raise InputError.one("--samples", f"{samples} is negative", "give 0 or more samples")
    if samples > MAX_SAMPLES:
        raise InputError.one(
            "--samples",
            f"{samples:,} is over the limit of {MAX_SAMPLES:,}",
            f"give at most {MAX_SAMPLES:,} samples",
        )
    if not isinstance(seed, numbers.Integral) or seed < 0:
        raise InputError.one("--seed", f"seed is {seed!r}", "use a whole number, 0 or more")
    started = started or _dt.datetime.now(_dt.timezone.utc).replace(microsecond=0).isoformat()
    stage(progress, "deriving the criteria")
    p = prepare(inputs)
    inputs.as_frames()  # the tables as DataFrames, for scoring and the outputs
    # Every stage scores the saturated matrix; the outputs show the values as derived.
    assumptions, matrix, kept = p.assumptions, p.scored, p.kept
    warnings = list(p.warnings)
    included = inputs.included
    namer = inputs_namer(inputs)  # corridor names and criterion labels for the words
    chosen = choose_weight_set(p.weight_sets, weights)
    used, overrides = apply_overrides(chosen, weight_overrides, included)
    if overrides:
        from .score.override import small_share_warnings

        warnings.extend(input_warnings(small_share_warnings(overrides), namer))

    stage(progress, "scoring")
    scores = score_matrix(matrix.loc[kept], included, used, assumptions)
    warnings.extend(input_warnings(scores.warnings, namer))
    diagnostics = _diagnostics(matrix.loc[kept], scores)
    warnings.extend(input_warnings(diagnostic_warnings(diagnostics), namer))

    robustness = None
    if len(kept) >= 2 and not any(w > 0 for w in scores.weights.values()):
        warnings.extend(input_warnings([warning("robustness_skipped_no_weight")], namer))
    elif len(kept) >= 2:
        stage(progress, "robustness: samples, rank-reversal checks, tipping points")
        robustness = _stress(
            matrix.loc[kept],
            included,
            scores,
            used,
            p.weight_sets,
            assumptions,
            inputs,
            samples,
            seed,
            progress,
        )
        warnings.extend(robustness_warnings(robustness.warnings, namer))
    else:
        warnings.extend(input_warnings([warning("robustness_skipped_one_corridor")], namer))

    futures = None
    if inputs.scenarios is not None and len(inputs.scenarios):
        stage(progress, "futures of the Scenarios sheet")
        futures = _futures(inputs, used, scores)

    plan = None
    if inputs.budget is not None and len(inputs.budget):
        stage(progress, "build plan under the budget")
        plan = _plan(inputs, assumptions, matrix.loc[kept], scores, p.derivation, robustness)
        warnings.extend(input_warnings(plan.warnings, namer))

    from .geo.network import network_warnings

    result = Result(
        inputs=inputs,
        assumptions=assumptions,
        weight_set=chosen.name,
        weights=effective_weights(included, scores),
        chosen_weights=used,
        overrides=overrides,
        weight_sets=p.weight_sets,
        criteria=included,
        matrix=p.matrix,
        scored_matrix=matrix,
        full_credit=dict(p.full_credit),
        diagnostics=diagnostics,
        provenance=p.provenance,
        derivation=p.derivation,
        excluded=p.excluded,
        scores=scores,
        robustness=robustness,
        futures=futures,
        plan=plan,
        warnings=warnings,
        samples=samples,
        seed=seed,
        started=started,
    )
    # The positions are found once, by Result.network, for these warnings and the outputs.
    result.warnings = _unique(
        warnings + input_warnings(network_warnings(result.network, inputs), namer)
    )
    return result


@dataclass
class Prepared:
    """What every run needs before scoring: the matrix, the screen, the weight sets.

    The numbers are plain numpy (``ranker check`` stops here without pandas);
    :attr:`matrix`, :attr:`kept` and :attr:`scored` are the DataFrame views
    ``ranker run`` scores, built on first use.
    """

    assumptions: dict
    #: Corridors by included criteria, as given or derived.
    values: CriteriaMatrix
    provenance: dict[str, str]
    derivation: Derivation | None
    #: Per corridor (row of ``values``), whether it meets every must-meet limit.
    kept_rows: np.ndarray
    excluded: list[dict]
    weight_sets: list[ResolvedWeights]
    #: Every warning so far in words (the reader's own, then the stages' records worded).
    warnings: list[str]
    #: What every method scores: values past a full-credit level clipped to it.
    scored_values: CriteriaMatrix | None = None
    #: Criterion key to its full-credit level (:mod:`ranker.score.saturation`).
    full_credit: dict | None = None

    @cached_property
    def matrix(self) -> pd.DataFrame:
        """:attr:`values` as a DataFrame, index ``corridor_id``."""
        return self.values.frame()

    @cached_property
    def kept(self) -> pd.Index:
        """The corridor ids meeting every limit, in matrix order."""
        return self.matrix.index[self.kept_rows]

    @cached_property
    def scored(self) -> pd.DataFrame | None:
        """:attr:`scored_values` as a DataFrame (the matrix itself where nothing is clipped)."""
        if self.scored_values is None:
            return None
        return self.matrix if self.scored_values is self.values else self.scored_values.frame()


def prepare(inputs: Inputs) -> Prepared:
    """Resolve assumptions, build the criteria matrix, screen, and resolve weight sets.

    Shared by ``ranker check`` (which stops here) and ``ranker run``.
    """
    from .derive.run import energy_cap_warnings
    from .report.narrative import input_warnings, inputs_namer, word_consistency
    from .score.saturation import full_credit_levels, saturate, saturated_counts
    from .score.screen import screen
    from .score.weights import resolve_weight_sets

    assumptions = resolve(inputs.assumptions)
    if not inputs.included:
        raise InputError.one(
            CRITERIA, "no criterion is included", "set include to yes for at least one criterion"
        )
    matrix, provenance, derivation = build_matrix(inputs, assumptions)
    has_budget = inputs.budget is not None and len(inputs.budget)
    if (
        has_budget
        and "capital_cost" not in matrix.keys
        and "capital_cost" not in inputs.corridors.columns
    ):
        raise InputError.one(
            "Budget",
            "a build plan needs each corridor's capital cost",
            "include capital_cost on Criteria (derived or as a Corridors column), "
            "or remove the Budget sheet",
        )
    kept, excluded = screen(matrix, inputs.included, inputs)
    levels = full_credit_levels(inputs.included, assumptions)
    scored = saturate(matrix, inputs.included, levels)
    # Objective (entropy, CRITIC) sets describe the corridors actually scored.
    sets = resolve_weight_sets(inputs, scored.take(kept), assumptions)
    word_consistency(sets)
    warnings = list(inputs.warnings)  # the reader's own, about the file: already words
    namer = inputs_namer(inputs)
    if derivation is not None:
        warnings.extend(input_warnings(derivation.warnings, namer))
    for s in sets:
        warnings.extend(input_warnings(s.warnings, namer))
    if derivation is not None:
        warnings.extend(
            input_warnings(energy_cap_warnings(derivation.ids, derivation.columns), namer)
        )
    counts = saturated_counts(matrix.take(kept), inputs.included, levels)
    warnings.extend(input_warnings(full_credit_warnings(counts, levels, inputs.included), namer))
    return Prepared(
        assumptions,
        matrix,
        provenance,
        derivation,
        kept,
        excluded,
        sets,
        _unique(warnings),
        scored_values=scored,
        full_credit=levels,
    )


def check_workbook(path: str | Path) -> str:
    """Validate a workbook as ``ranker check`` does; return a one-line summary.

    Reads every sheet, checks the assumptions, derives the built-in criteria
    (which checks their raw inputs), resolves every weight set and applies
    the screening rules, without scoring.

    Raises
    ------
    InputError
        Every problem found.
    """
    from .workbook.read import read_workbook

    inputs = read_workbook(Path(path), frames=False)
    p = prepare(inputs)
    excluded, sets, warnings = p.excluded, p.weight_sets, p.warnings
    derived = sum(1 for v in p.provenance.values() if v == "derived")
    text = (
        f"{len(inputs.corridors)} corridors ({len({e['corridor_id'] for e in excluded})} "
        f"screened out), {len(inputs.included)} criteria ({derived} derived), "
        f"{len(sets)} weight sets: {', '.join(s.name for s in sets)}."
    )
    if warnings:
        text += "\n" + "\n".join(f"warning: {w}" for w in warnings)
    return text


def build_matrix(inputs: Inputs, assumptions: dict):
    """Assemble the criteria matrix: given columns, then derived built-ins.

    Returns
    -------
    matrix : CriteriaMatrix
        Corridors by included criteria, in each criterion's unit.
    provenance : dict of str to str
        ``"given"`` or ``"derived"`` per criterion.
    derivation : Derivation or None
    """
    from .derive import BUILT_IN, derive_criteria
    from .score.matrix import CriteriaMatrix

    corridors = inputs.corridors
    ids = list(corridors.index)
    problems = Problems()
    provenance: dict[str, str] = {}
    given: dict[str, np.ndarray] = {}
    to_derive: list[str] = []
    for spec in inputs.included:
        if spec.key in corridors.columns:
            column = floats(corridors[spec.key])
            for cid in [ids[i] for i in np.flatnonzero(np.isnan(column)).tolist()]:
                problems.add(
                    inputs.where(CORRIDORS, spec.key, cid),
                    f"criterion {spec.key} is empty for corridor {cid}",
                    "type a number, or set include to no for this criterion on Criteria",
                )
            given[spec.key] = column
            provenance[spec.key] = "given"
        elif spec.key in BUILT_IN:
            to_derive.append(spec.key)
            provenance[spec.key] = "derived"
        else:
            problems.add(
                inputs.where(CRITERIA, "criterion", spec.key),
                f"criterion {spec.key} is neither a Corridors column nor a built-in criterion",
                "add a numeric column of that name to Corridors, or use one of "
                + ", ".join(BUILT_IN),
            )
    problems.raise_if_any()
    derivation = derive_criteria(inputs, assumptions, to_derive) if to_derive else None
    keys = [spec.key for spec in inputs.included]
    columns = [given[k] if k in given else derivation.value(k) for k in keys]
    values = np.column_stack(columns) if columns else np.empty((len(ids), 0))
    return CriteriaMatrix(ids, keys, values.astype(float)), provenance, derivation


def choose_weight_set(sets: list, name: str | None):
    """Return the weight set named ``name`` (default: the first board set)."""
    from .workbook.schema import normalize_key

    board = [s for s in sets if not s.reference_only]
    if name is None:
        return board[0] if board else sets[0]
    for s in sets:
        if s.name.lower() == normalize_key(name):
            return s
    raise InputError.one(
        "--weights",
        f"no weight set named {name!r}",
        "use one of " + ", ".join(s.name for s in sets),
    )


def apply_overrides(
    chosen,
    overrides: Mapping[str, float] | None,
    included: list[CriterionSpec],
) -> tuple[dict[str, float], dict[str, float]]:
    """Set some criteria's final shares of the chosen set; the others keep their proportions.

    ``overrides`` maps a criterion key to its final share in percent
    (``--weight capital_cost=40``: capital cost gets 40 % of the weight),
    for every kind of set; see :func:`ranker.score.override.apply_shares`.
    Returns the final weights (summing to 1) and the shares as given [%].
    """
    from .score.override import apply_shares

    if not overrides:
        return dict(chosen.weights), {}
    keys = [c.key for c in included]
    return apply_shares(chosen.weights, overrides, keys), dict(overrides)


def _diagnostics(matrix: pd.DataFrame, scores) -> dict:
    """Spread share per criterion and strongly rank-correlated pairs (ranker.score.diagnostics)."""
    import pandas as pd

    from .score.diagnostics import rank_correlations, spread_shares, strong_pairs

    used = [k for k in scores.weights if k in matrix.columns]
    shares = spread_shares(scores.weighted[used]) if used else pd.Series(dtype=float)
    pairs = strong_pairs(rank_correlations(matrix[used])) if len(matrix) > 2 else []
    return {"spread_share": {k: float(v) for k, v in shares.items()}, "correlated": pairs}


def diagnostic_warnings(diagnostics: dict) -> list[dict]:
    """Return the records of one criterion carrying most of the spread, and of strongly
    rank-correlated pairs (:mod:`ranker.score.diagnostics`).

    Parameters
    ----------
    diagnostics : dict
        ``spread_share`` (criterion to its share of the spread [-]) and
        ``correlated`` (pairs ``{"a", "b", "rho"}`` beyond the threshold), as
        :attr:`ranker.result.Result.diagnostics` holds them.

    Returns
    -------
    list of dict
        ``dominant_spread`` for each share above
        :data:`~ranker.score.diagnostics.DOMINANT_SHARE`, then ``correlated_pair``
        for each pair (:data:`ranker.input_warnings.WARNING_KINDS`).
    """
    from .input_warnings import warning
    from .score.diagnostics import DOMINANT_SHARE, STRONG_RHO

    out = [
        warning("dominant_spread", criterion=key, share=float(share), limit=DOMINANT_SHARE)
        for key, share in diagnostics.get("spread_share", {}).items()
        if share > DOMINANT_SHARE
    ]
    out += [
        warning("correlated_pair", a=p["a"], b=p["b"], rho=float(p["rho"]), limit=STRONG_RHO)
        for p in diagnostics.get("correlated", [])
    ]
    return out


def full_credit_warnings(
    counts: Mapping[str, int], levels: Mapping[str, float], included: list[CriterionSpec]
) -> list[dict]:
    """Return a ``full_credit_binds`` record for each criterion whose full-credit level
    caps at least one corridor (:mod:`ranker.score.saturation`).

    Parameters
    ----------
    counts : mapping of str to int
        Criterion key to the corridors past its level [-].
    levels : mapping of str to float
        Criterion key to its full-credit level (criterion's unit).
    included : list of CriterionSpec
        The included criteria (their direction says above or below).
    """
    from .input_warnings import warning

    spec = {c.key: c for c in included}
    return [
        warning(
            "full_credit_binds",
            criterion=key,
            count=int(count),
            level=float(levels[key]),
            benefit=bool(spec[key].is_benefit),
        )
        for key, count in counts.items()
        if count
    ]


def effective_weights(included: list[CriterionSpec], scores) -> dict[str, float]:
    """Return the weights used in scoring for every included criterion [-].

    A criterion left out of scoring (the same value for every corridor) has
    weight 0 and the rest keep the shares :func:`ranker.score.score_matrix`
    rescaled them to, so these weights reproduce every score.
    """
    return {c.key: float(scores.weights.get(c.key, 0.0)) for c in included}


def _stress(matrix, included, scores, used, sets, assumptions, inputs, samples, seed, progress):
    from .score import METHODS
    from .stress import stress_test

    method = METHODS[str(assumptions["primary_method"])]
    options = method.kernel_options(assumptions)
    keep = [c.key for c in included if c.key in scores.weights]
    uncertainty = {c.key: c.uncertainty_pct for c in included if c.uncertainty_pct}
    board_sets = {s.name: {k: s.weights[k] for k in keep} for s in sets if not s.reference_only}
    return stress_test(
        matrix[keep],
        {k: scores.weights[k] for k in keep},
        {c.key: c.is_benefit for c in included if c.key in keep},
        kernel=method.kernel,
        higher_is_better=method.higher_is_better,
        kernel_options=options,
        samples=samples,
        seed=seed,
        sampling=str(assumptions["weight_sampling"]),
        concentration=float(assumptions["weight_concentration"]),
        uncertainty_pct={k: v for k, v in uncertainty.items() if k in keep} or None,
        weight_sets=board_sets if len(board_sets) > 1 else None,
        progress=progress,
        tier_confidence=float(assumptions["tier_confidence"]),
    )


def _futures(inputs: Inputs, used, scores):
    from .score import score_matrix
    from .score.screen import screen
    from .stress import futures

    scenarios: dict[str, dict] = {}
    for _, row in inputs.scenarios.iterrows():
        scenarios.setdefault(str(row["scenario"]), {})[str(row["key"])] = row["value"]

    def rerank(overrides: dict) -> pd.Series:
        from .score.saturation import full_credit_levels, saturate

        try:
            assumptions = resolve(inputs.assumptions, overrides)
            matrix, _, _ = build_matrix(inputs, assumptions)
            kept, _ = screen(matrix, inputs.included, inputs)
            levels = full_credit_levels(inputs.included, assumptions)
            scored = saturate(matrix, inputs.included, levels).take(kept).frame()
            # A future is ranked by the primary method alone: the others' scores and
            # their agreement would be computed only to be dropped.
            primary = {**assumptions, "methods": (assumptions["primary_method"],)}
            return score_matrix(scored, inputs.included, used, primary).rank
        except InputError as exc:  # name the Scenarios cells, not the Assumptions sheet
            from .workbook.scenario_cells import in_scenario

            name = next((n for n, o in scenarios.items() if o == overrides), "")
            raise in_scenario(inputs, name, overrides, exc) from None

    return futures(scenarios, rerank, scores.rank)


def _plan(inputs, assumptions, matrix, scores, derivation, robustness):
    from .plan import build_plan

    if "capital_cost" in matrix.columns:
        capital = matrix["capital_cost"]
    else:  # prepare() made sure the column exists
        capital = inputs.corridors.loc[matrix.index, "capital_cost"].astype(float)
    primary = str(assumptions["primary_method"])
    score = scores.scores[primary]
    if primary == "vikor":
        score = 1.0 - score  # VIKOR's Q is lower-is-better; the plan wants more is better
    truck_miles = None
    if derivation is not None and "electric_trucks_per_day" in derivation.sizing.columns:
        sizing = derivation.sizing.loc[matrix.index]
        truck_miles = (
            sizing["electric_trucks_per_day"]
            * inputs.corridors.loc[matrix.index, "length_mi"]
            * 365.0
        )
    connects = inputs.corridors["connects"] if "connects" in inputs.corridors.columns else None
    endpoints = assumptions.get("coverage_endpoints") or None
    sample_scores = None if robustness is None else robustness.weight_sample_scores()
    return build_plan(
        capital,
        score,
        scores.rank,
        inputs.budget,
        carry_over=bool(assumptions["budget_carry_over"]),
        allow_split=bool(assumptions["allow_split"]),
        objective=str(assumptions["plan_objective"]),
        truck_miles=truck_miles,
        discount_rate=float(assumptions["discount_rate"]),
        connects=connects.loc[matrix.index] if connects is not None else None,
        endpoints=list(endpoints) if endpoints else None,
        sample_scores=sample_scores,
        names=inputs.corridors["name"].astype(str).to_dict(),
    )


def _unique(items: list[str]) -> list[str]:
    seen: dict[str, None] = {}
    for item in items:
        seen.setdefault(str(item), None)
    return list(seen)


__all__ = ["Result", "rank_workbook", "rank_inputs", "Problem", "InputError"]
