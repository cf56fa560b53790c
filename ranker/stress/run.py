"""The stress stage's orchestration: validate, run every analysis, gather the records.

:func:`stress_test` runs the analyses of this package on one criteria matrix
with a method kernel passed in and returns a :class:`Robustness`; the
package's ``__init__`` only re-exports it. See the package docstring for the
analyses and ``docs/robustness.md`` for their rules.
"""

from __future__ import annotations

import math
import threading
from collections.abc import Callable
from dataclasses import dataclass, field, replace

import numpy as np
import pandas as pd

from ranker.plain import plain

from .acceptability import WEIGHT_SAMPLERS, rank_acceptability
from .batch import Scorer, rank_batch
from .closeness import COLUMNS as CLOSENESS_COLUMNS
from .closeness import adjacent_pairs, closeness_table, same_tier_flags
from .consensus import compare_weight_sets, consensus_json
from .reversal import all_checks
from .tiers import (
    TIER_CONFIDENCE,
    RankStore,
    Tiers,
    nearest_first_tier_change,
    tiers_from_ranks,
    tiers_without_samples,
)
from .tipping import INTERVAL_COLUMNS, sweep_criterion, tipping_records

__all__ = ["WARNING_KINDS", "Robustness", "stress_test"]

#: Kinds of :attr:`Robustness.warnings` records and the fields each carries.
WARNING_KINDS = {
    "weights_rescaled": ("total",),
    "one_corridor": (),
    "two_corridors": (),
    "one_criterion": ("criterion",),
    "constant_criterion": ("criterion",),
    "identical": ("corridors",),
    "dominates": ("corridor",),
    "zero_weight_dirichlet": ("criteria",),
    "uncertainty_100": (),
    "monte_carlo_off": (),
    "confidence_draws_capped": ("draws", "samples"),
}

#: Progress units besides the Monte Carlo samples: one per other analysis.
_STAGES = 4


@dataclass
class Robustness:
    """Everything the stress tests found, ready for the reports.

    Attributes
    ----------
    samples : int
        Monte Carlo samples drawn (0 = off) [-].
    seed : int
        Seed of the random streams [-].
    acceptability : DataFrame
        Index ``corridor_id``, columns ``rank 1`` .. ``rank n``: share of
        samples in which the corridor took that rank [-]; rows and columns
        sum to 1. Empty when Monte Carlo is off.
    first_rank : Series
        First-rank acceptability ``b_i^1`` [-].
    central_weights : DataFrame
        Corridor x criterion: mean weights of the samples in which the
        corridor ranked first [-]; NaN where it never did.
    confidence : Series
        Share of value draws in which the corridor ranks first under its
        central weights [-]; NaN where it never ranked first.
    rank_reversal : list of dict
        ``{"check", "passed", "details", "facts", "count", ...}`` per check
        (:meth:`ranker.stress.reversal.Check.to_json`; the words are
        :func:`ranker.report.words.checks.check_sentence`).
    tipping_points : list of dict
        ``{"criterion", "current_weight", "kind", "corridor_id", "other_id",
        "weight_at", "direction", ...}`` per crossing (the words are
        :func:`ranker.report.narrative.tipping_sentence`).
    rank_intervals : DataFrame
        One row per criterion and corridor: the weight interval over which
        its rank holds (columns :data:`ranker.stress.tipping.INTERVAL_COLUMNS`).
    stakeholders : dict or None
        Ranks per weight set, disagreements, consensus order (Borda primary,
        Copeland beside it); None without weight sets.
    closeness : DataFrame
        Adjacent pairs: gap [-], practically_tied, reason, ...
    warnings : list of dict
        Doubtful-but-legal input and notes the reader needs, as records
        ``{"kind", ...}`` (:data:`WARNING_KINDS`); the words are
        :func:`ranker.report.words.stress.stress_warnings`.
    """

    samples: int
    seed: int
    acceptability: pd.DataFrame
    first_rank: pd.Series
    central_weights: pd.DataFrame
    confidence: pd.Series
    rank_reversal: list[dict]
    tipping_points: list[dict]
    rank_intervals: pd.DataFrame
    stakeholders: dict | None
    closeness: pd.DataFrame
    warnings: list[dict] = field(default_factory=list)
    #: The weight vectors drawn for the Monte Carlo, shape (samples, k) [-], in the
    #: matrix's criterion order; None when it was off. Later stages (the build plan)
    #: re-use them so every analysis sees the same samples.
    weight_draws: np.ndarray | None = None
    #: Tier per corridor (index ``corridor_id``), 1 = first (:mod:`ranker.stress.tiers`).
    tier: pd.Series | None = None
    #: Share of samples in which the a-th corridor of the order ranks above the
    #: b-th, for the first :data:`ranker.stress.tiers.TOP_MATRIX` corridors of the
    #: order at the chosen weights; diagonal 0 [-]. Ids in :attr:`pairwise_ids`.
    pairwise_wins: np.ndarray | None = None
    #: Corridor ids of the rows and columns of :attr:`pairwise_wins`, in order.
    pairwise_ids: list[str] = field(default_factory=list)
    #: The tiers with the shares behind them (neighbour and cut shares).
    tiers: Tiers | None = None
    #: The smallest one-weight change that alters the first tier's corridors:
    #: ``criterion`` (key), ``current``, ``weight_at``, ``distance`` [-],
    #: ``direction``, ``entering``, ``leaving`` (corridor ids); None if none in [0, 1].
    first_tier_change: dict | None = None
    #: The method kernel and the matrix the samples were scored on (for
    #: :meth:`weight_sample_scores`); not part of the JSON.
    scorer: Scorer | None = field(default=None, repr=False)
    values: np.ndarray | None = field(default=None, repr=False)

    def weight_sample_scores(self) -> np.ndarray | None:
        """Score the matrix under each weight draw, higher is better; (samples, n) [-].

        The same weight draws as the rank acceptability, on the values as
        given (the build plan's year-one robustness uses them); rows follow
        the matrix's corridor order. None when Monte Carlo was off. Computed on
        demand: at 10,000 corridors x 10,000 samples the table is 800 MB.
        """
        if self.weight_draws is None or self.scorer is None:
            return None
        return self.scorer.weights(self.values, self.weight_draws)

    def to_json(self, *, worded_later: tuple[str, ...] = ()) -> dict:
        """Return a JSON-ready summary (plain types; NaN as null).

        The tables named in ``worded_later`` (``rank_intervals``,
        ``closeness``) are left as None in their place, for a caller that
        writes them with their words (:func:`ranker.report.summary.summary_json`)
        instead of converting every row twice.
        """

        def records(frame, key):
            return None if key in worded_later else [plain(r) for r in frame.to_dict("records")]

        return plain(
            {
                "samples": int(self.samples),
                "seed": int(self.seed),
                "rank_reversal": self.rank_reversal,
                "tipping_points": self.tipping_points,
                "acceptability": {
                    str(i): [float(v) for v in row] for i, row in self.acceptability.iterrows()
                },
                "first_rank": {str(k): float(v) for k, v in self.first_rank.items()},
                "central_weights": {
                    str(i): {str(c): float(v) for c, v in row.items()}
                    for i, row in self.central_weights.iterrows()
                },
                "confidence": {str(k): float(v) for k, v in self.confidence.items()},
                "rank_intervals": records(self.rank_intervals, "rank_intervals"),
                "stakeholders": self.stakeholders,
                "closeness": records(self.closeness, "closeness"),
                "warnings": list(self.warnings),
                "pairwise_wins": (
                    None
                    if self.pairwise_wins is None or not self.samples
                    else np.round(self.pairwise_wins, 12).tolist()
                ),
                "pairwise_ids": list(self.pairwise_ids),
                "tier_confidence": None if self.tiers is None else self.tiers.confidence,
                "first_tier_change": self.first_tier_change,
            }
        )


def _vector(mapping, keys, what, *, allow_missing=False) -> np.ndarray:
    """Read {criterion: number} into an array in column order (finite, 0 or more)."""
    out = np.zeros(len(keys))
    for i, key in enumerate(keys):
        if key not in mapping:
            if not allow_missing:
                raise ValueError(f"no {what} for criterion '{key}'")
            continue
        try:
            value = float(mapping[key])
        except (TypeError, ValueError):
            raise ValueError(f"{what} of '{key}' is {mapping[key]!r}, not a number") from None
        if not math.isfinite(value) or value < 0:
            raise ValueError(f"{what} of '{key}' is {value}; use 0 or more")
        out[i] = value
    return out


def _validate(
    matrix,
    weights,
    is_benefit,
    samples,
    seed,
    sampling,
    concentration,
    uncertainty_pct,
    weight_sets,
):
    """Guard a library caller's arguments (the workbook reader has checked a run's input
    and names its cells); raises ValueError."""
    if not isinstance(matrix, pd.DataFrame) or matrix.shape[0] == 0 or matrix.shape[1] == 0:
        raise ValueError("no corridors or no criteria to stress-test")
    keys = [str(c) for c in matrix.columns]
    ids = [str(i) for i in matrix.index]
    if len(set(ids)) < len(ids):
        raise ValueError("a corridor_id appears more than once")
    values = matrix.apply(pd.to_numeric, errors="coerce").to_numpy(dtype=float)
    bad = np.argwhere(~np.isfinite(values))
    if len(bad):
        r, c = bad[0]
        raise ValueError(f"corridor {ids[r]} has no usable value for '{keys[c]}'")
    w = _vector(weights, keys, "weight")
    missing = [k for k in keys if k not in is_benefit]
    if missing:
        raise ValueError(f"no direction for {', '.join(missing)}")
    if not isinstance(samples, int | np.integer) or samples < 0:
        raise ValueError(f"samples is {samples!r}; use a whole number, 0 or more")
    if not isinstance(seed, int | np.integer) or seed < 0:
        raise ValueError(f"seed is {seed!r}; use a whole number, 0 or more")
    if sampling not in WEIGHT_SAMPLERS:
        raise ValueError(f"weight_sampling is {sampling!r}; use one of {sorted(WEIGHT_SAMPLERS)}")
    if not (
        isinstance(concentration, int | float)
        and math.isfinite(concentration)
        and concentration > 0
    ):
        raise ValueError(f"weight_concentration is {concentration!r}; use a number above 0")
    spread = _vector(uncertainty_pct or {}, keys, "uncertainty_pct", allow_missing=True) / 100.0
    sets = {}
    for name, ws in (weight_sets or {}).items():
        v = _vector(ws, keys, f"weight (set '{name}')", allow_missing=True)
        if v.sum() <= 0:
            raise ValueError(f"weight set '{name}' has no positive weight")
        sets[str(name)] = v / v.sum()
    if w.sum() <= 0:
        raise ValueError("every weight is zero")
    benefit = np.array([bool(is_benefit[k]) for k in keys])
    return ids, keys, values, w, benefit, spread, sets


def _input_warnings(x, ids, keys, w, spread, sampling, scorer):
    """Doubtful-but-legal input, as records ``{"kind", ...}`` of :data:`WARNING_KINDS`.

    Returns the records and the pairs of corridor indices with identical values.
    """
    warns: list[dict] = []
    n, k = x.shape
    if n == 1:
        warns.append({"kind": "one_corridor"})
    elif n == 2:
        warns.append({"kind": "two_corridors"})
    if k == 1:
        warns.append({"kind": "one_criterion", "criterion": keys[0]})
    for c in range(k):
        if n > 1 and np.all(x[:, c] == x[0, c]):
            warns.append({"kind": "constant_criterion", "criterion": keys[c]})
    groups: dict[bytes, list[int]] = {}
    for i in range(n):
        groups.setdefault(x[i].tobytes(), []).append(i)
    identical = set()
    for members in groups.values():
        if len(members) > 1:
            warns.append({"kind": "identical", "corridors": [ids[i] for i in members]})
            identical.update(frozenset((a, b)) for a in members for b in members if a < b)
    better = np.where(scorer.is_benefit, 1.0, -1.0)
    y = x * better
    # Corridor i dominates every other one when it is at least as good on every
    # criterion (so it holds every column's best value) and strictly better
    # somewhere than each other (so no other corridor equals it everywhere).
    best = np.nonzero((y == y.max(axis=0)).all(axis=1))[0] if n > 1 else []
    for i in best:
        if (y == y[i]).all(axis=1).sum() == 1:
            warns.append({"kind": "dominates", "corridor": ids[i]})
    if sampling == "dirichlet" and np.any(w == 0) and k > 1:
        zero = [keys[c] for c in np.nonzero(w == 0)[0]]
        warns.append({"kind": "zero_weight_dirichlet", "criteria": zero})
    if np.any(spread >= 1.0):
        warns.append({"kind": "uncertainty_100"})
    return warns, identical


class Beside:
    """Run ``fn(*args)`` on a thread of its own; :meth:`result` waits for it.

    A daemon thread, so a run that is stopped (an error, Ctrl-C, SIGTERM)
    does not wait for it; an exception in ``fn`` is raised by :meth:`result`.
    """

    def __init__(self, fn: Callable, *args):
        self._out = None
        self._error: BaseException | None = None
        self._thread = threading.Thread(target=self._run, args=(fn, args), daemon=True)
        self._thread.start()

    def _run(self, fn, args) -> None:
        try:
            self._out = fn(*args)
        except BaseException as exc:  # noqa: BLE001 - handed to the caller by result()
            self._error = exc

    def result(self):
        """Wait for ``fn`` and return what it returned, or raise what it raised."""
        self._thread.join()
        if self._error is not None:
            raise self._error
        return self._out


def stress_test(
    matrix: pd.DataFrame,
    weights: dict[str, float],
    is_benefit: dict[str, bool],
    *,
    kernel: Callable[..., np.ndarray],
    higher_is_better: bool = True,
    kernel_options: dict | None = None,
    samples: int = 10000,
    seed: int = 20261201,
    sampling: str = "dirichlet",
    concentration: float = 50.0,
    uncertainty_pct: dict[str, float] | None = None,
    weight_sets: dict[str, dict[str, float]] | None = None,
    progress: Callable[[int, int], None] | None = None,
    tier_confidence: float = TIER_CONFIDENCE,
) -> Robustness:
    """Run every robustness analysis on one ranking.

    Parameters
    ----------
    matrix : DataFrame
        Index ``corridor_id``, one column per criterion, in the criteria's
        own units.
    weights : dict of str to float
        Criterion to weight [-]; renormalised to sum to 1.
    is_benefit : dict of str to bool
        Criterion to True where more is better.
    kernel : callable
        ``kernel(matrix, weights, is_benefit, **kernel_options) -> scores``
        with matrix (n, k), weights (k,) or (s, k), scores (n,) or (s, n);
        and with a stack of matrices (s, n, k), weights (s, k) or (k,),
        scores (s, n), each matrix scored on its own [-]. Every kernel of
        :data:`ranker.score.METHODS` does both (for example
        :func:`ranker.score.topsis.topsis`).
    higher_is_better : bool
        False for a score where lower is better (VIKOR's Q).
    kernel_options : dict, optional
        Keyword options for the kernel (``{"normalization": "vector"}``).
    samples : int
        Monte Carlo samples [-]; 0 turns Monte Carlo off.
    seed : int
        Seed of the random streams [-]; the same seed gives the same result.
    sampling : str
        ``dirichlet`` (around the chosen weights) or ``uniform`` (simplex).
    concentration : float
        Dirichlet concentration per criterion, > 0 [-].
    uncertainty_pct : dict of str to float, optional
        Criterion to +- spread of its values in the samples [%].
    weight_sets : dict of str to dict, optional
        Stakeholder weight sets to compare, name to {criterion: weight} [-].
    progress : callable, optional
        ``progress(done, total)``: units are Monte Carlo samples plus one
        per other analysis.
    tier_confidence : float
        Share of samples a higher tier must win against every lower
        corridor, in (0.5, 1] [-] (see :mod:`ranker.stress.tiers`).

    Returns
    -------
    Robustness

    Raises
    ------
    ValueError
        For a missing or negative weight, a non-numeric value, an unknown
        sampling, a bad concentration or a negative uncertainty (a run's
        input was checked, with its cells named, by :mod:`ranker.workbook`).

    References
    ----------
    .. [1] R. Lahdelma and P. Salminen, "SMAA-2: Stochastic multicriteria
       acceptability analysis for group decision making", Operations
       Research 49(3):444-454, 2001.
    .. [2] X. Wang and E. Triantaphyllou, "Ranking irregularities when
       evaluating alternatives by using some ELECTRE methods", Omega
       36(1):45-63, 2008.

    Examples
    --------
    >>> from ranker.score.topsis import topsis
    >>> m = pd.DataFrame({"cost": [3.0, 2.0, 4.0], "trucks": [10.0, 6.0, 12.0]},
    ...                  index=pd.Index(["A", "B", "C"], name="corridor_id"))
    >>> r = stress_test(m, {"cost": 0.5, "trucks": 0.5}, {"cost": False, "trucks": True},
    ...                 kernel=topsis, samples=500)
    >>> r.acceptability.shape, round(float(r.acceptability.to_numpy().sum()), 6)
    ((3, 3), 3.0)
    """
    ids, keys, x, w, benefit, spread, sets = _validate(
        matrix,
        weights,
        is_benefit,
        samples,
        seed,
        sampling,
        concentration,
        uncertainty_pct,
        weight_sets,
    )
    samples = int(samples)
    scorer = Scorer(kernel, benefit, higher_is_better, dict(kernel_options or {}))
    warns = []
    if abs(w.sum() - 1.0) > 1e-9:
        warns.append({"kind": "weights_rescaled", "total": float(w.sum())})
    w = w / w.sum()
    input_warns, identical = _input_warnings(x, ids, keys, w, spread, sampling, scorer)
    warns.extend(input_warns)
    n, k = x.shape
    total = samples + _STAGES
    done = 0

    def tick(units=1):
        nonlocal done
        done += units
        if progress is not None:
            progress(min(done, total), total)

    g0 = scorer.weights(x, w)[0]
    if not np.all(np.isfinite(g0)):
        bad = [ids[i] for i in np.nonzero(~np.isfinite(g0))[0][:5]]
        raise ValueError(f"the scoring kernel returned no finite score for {', '.join(bad)}")
    r0 = rank_batch(g0)
    pairs = adjacent_pairs(g0)
    order = np.lexsort((np.arange(n), r0))  # the order of the ranking table
    store = RankStore(order, samples) if samples else None
    # The rank-reversal checks need nothing of the samples: they run on a second
    # thread (numpy lets go of the interpreter in its loops, so a second core helps)
    # while the samples are drawn and scored; their own scorer, nothing shared.
    checks_job = Beside(all_checks, replace(scorer), x, w, ids)
    ss_w, ss_v, ss_c = np.random.SeedSequence(seed).spawn(3)
    index = pd.Index(ids, name="corridor_id")
    draws = None
    if samples:
        draws = WEIGHT_SAMPLERS[sampling](
            w, samples, rng=np.random.default_rng(ss_w), concentration=float(concentration)
        )
        acc = rank_acceptability(
            scorer,
            x,
            draws,
            spread=spread,
            rng_values=np.random.default_rng(ss_v),
            rng_confidence=np.random.default_rng(ss_c),
            pairs=pairs,
            progress=(lambda d, t: progress(d, total)) if progress else None,
            on_ranks=store.add,
        )
        done = samples
        warns.extend(acc.notes)  # records too (ranker.stress.acceptability)
        acceptability = pd.DataFrame(  # no copy: (n x n) is 800 MB at 10,000 corridors
            acc.acceptability,
            index=index,
            columns=[f"rank {r}" for r in range(1, n + 1)],
            copy=False,
        )
        first = pd.Series(acc.first_rank, index=index, name="first_rank")
        central = pd.DataFrame(acc.central_weights, index=index, columns=keys)
        confidence = pd.Series(acc.confidence, index=index, name="confidence")
        closeness_mc = {
            "swap_share": acc.pair_swap_share,
            "gap_low": acc.pair_diff_low,
            "gap_high": acc.pair_diff_high,
        }
    else:
        warns.append({"kind": "monte_carlo_off"})
        acceptability = pd.DataFrame(index=index, columns=[], dtype=float)
        first = pd.Series(np.nan, index=index, name="first_rank")
        central = pd.DataFrame(np.nan, index=index, columns=keys)
        confidence = pd.Series(np.nan, index=index, name="confidence")
        closeness_mc = {}
    if store is not None:
        tiers = tiers_from_ranks(store.ranks, float(tier_confidence))
        del store
    else:
        tiers = tiers_without_samples(r0[order])
    tier = pd.Series(0, index=index, name="tier", dtype=int)
    tier.iloc[order] = tiers.tier
    change = nearest_first_tier_change(scorer, x, w, order[tiers.tier == 1])
    if change is not None:
        change = {
            **change,
            "criterion": keys[change["criterion"]],
            "entering": [ids[i] for i in change["entering"]],
            "leaving": [ids[i] for i in change["leaving"]],
        }
    sweeps = [sweep_criterion(scorer, x, w, c) for c in range(k)] if k > 1 else []
    checks = checks_job.result()
    tick()
    records, rows = tipping_records(sweeps, ids, keys)
    intervals = pd.DataFrame(rows, columns=INTERVAL_COLUMNS)
    tick()
    stakeholders = None
    if weight_sets:
        stakeholders = consensus_json(compare_weight_sets(scorer, x, sets), ids)
    tick()
    closeness = (
        closeness_table(g0, r0, pairs, ids, identical=identical, **closeness_mc)
        if n > 1
        else pd.DataFrame(columns=CLOSENESS_COLUMNS)
    )
    if len(closeness) and tiers.samples:
        closeness = same_tier_flags(closeness, tier)
    tick()
    return Robustness(
        samples=samples,
        seed=int(seed),
        acceptability=acceptability,
        first_rank=first,
        central_weights=central,
        confidence=confidence,
        rank_reversal=[c.to_json() for c in checks],
        tipping_points=records,
        rank_intervals=intervals,
        stakeholders=stakeholders,
        closeness=closeness,
        warnings=warns,
        weight_draws=draws,
        tier=tier,
        pairwise_wins=tiers.pairwise_wins,
        pairwise_ids=[ids[i] for i in order[: tiers.pairwise_wins.shape[0]]],
        tiers=tiers,
        first_tier_change=change,
        scorer=scorer,
        values=x,
    )
