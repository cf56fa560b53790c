"""The run's warnings outside the stress stage, as records: every kind declared once.

A stage that meets doubtful-but-legal input (or a limit of its own, like the
optimiser's time limit) returns a record ``{"kind", ...}`` made by
:func:`warning`, with the numbers and ids the reader needs (plain ``str``,
``int``, ``float``, ``bool``, ``None``, lists of them: JSON-ready). The words
are written by :mod:`ranker.report.words.inputs` (the plan's kinds by
:mod:`ranker.report.words.plan`), reached through
:func:`ranker.report.narrative.input_warnings`; the stress stage's own kinds
are :data:`ranker.stress.WARNING_KINDS`. The reader's warnings about the file
itself (hidden sheets, formula cells) are sentences written at the edge.
"""

from __future__ import annotations

#: Kind of each warning record and the fields it carries.
WARNING_KINDS: dict[str, tuple[str, ...]] = {
    # -- derive: adoption and readiness inputs (ranker.derive.needs, adoption, readiness) --
    # The Adoption sheet wins over the adoption_model typed in ``cell``.
    "adoption_sheet_used": ("cell", "model"),
    # bass_start_year (typed in ``cell``) after target_year [year].
    "bass_start_late": ("cell", "bass_start_year", "target_year"),
    # The Adoption table covers first_year-last_year; ``years`` held at its end values.
    "adoption_held_flat": ("first_year", "last_year", "years"),
    # A corridor's Corridor miles (``cells``) add up to ``miles`` [mi] against its
    # length_mi (``length_cell``) [mi]: relative ``gap`` above ``tolerance`` [-].
    "miles_gap": ("cells", "corridor", "miles", "length_mi", "length_cell", "gap", "tolerance"),
    # -- score: weight sets (ranker.score.weights, override) --------------------------------
    # A criterion of the Pairwise sheet that is known but not scored in this run.
    "pairwise_not_scored": ("criterion",),
    # More criteria than the random-index table ``ri_table`` covers (``largest``).
    "pairwise_no_random_index": ("ri_table", "largest", "criteria"),
    # Consistency ratio ``cr`` above ``cr_limit`` [-]; the most inconsistent
    # ``triple`` (three keys) and the judgment to ``revisit`` (dict or None, as
    # :attr:`ranker.score.weights.ResolvedWeights.consistency` holds it).
    "pairwise_inconsistent": ("cr", "cr_limit", "ri_table", "triple", "revisit"),
    # Criteria shifted to start at 0 for the entropy reference set only.
    "entropy_shifted": ("criteria",),
    # Fewer than two corridors: no entropy or CRITIC reference set.
    "objective_sets_need_two": (),
    # ``--weight criterion=share`` with a share of 1 or less [%].
    "small_share": ("criterion", "share"),
    # -- score: the matrix (ranker.score.scoring) ------------------------------------------
    # Same ``value`` for every corridor: left out, its ``weight`` [-] shared among the others.
    "criterion_left_out": ("criterion", "value", "weight"),
    "all_criteria_constant": (),
    "differing_criteria_weigh_nothing": (),
    # A method's ``normalisation`` assumes values >= 0; ``criteria`` have negative values.
    "normalisation_needs_non_negative": ("method", "normalisation", "criteria"),
    # Weighted product: ``criteria`` with values <= 0, shifted.
    "weighted_product_shifted": ("criteria",),
    # -- derive: revenue (ranker.derive.run.energy_cap_warnings) ---------------------------
    # The ports cap the energy sold: ``corridors`` (ids, earliest first) from ``from_years``
    # [year] on, through ``last_year`` [year] (None when not known).
    "energy_capped": ("corridors", "from_years", "last_year"),
    # -- score: full credit and diagnostics (ranker.pipeline) -------------------------------
    # ``count`` corridors past the full-credit ``level`` (criterion's unit) of ``criterion``;
    # ``benefit``: True above the level, False below it.
    "full_credit_binds": ("criterion", "count", "level", "benefit"),
    # ``criterion`` carries ``share`` [-] of the spread of the weighted scores, above ``limit``.
    "dominant_spread": ("criterion", "share", "limit"),
    # Criteria ``a`` and ``b`` with Spearman ``rho`` [-] beyond +-``limit``.
    "correlated_pair": ("a", "b", "rho", "limit"),
    # -- the run (ranker.pipeline) ---------------------------------------------------------
    "robustness_skipped_no_weight": (),
    "robustness_skipped_one_corridor": (),
    # -- plan: the budget and the optimiser (ranker.plan.phasing) -------------------------
    "budget_zero": (),
    # ``corridors`` (ids) cost ``costs`` [USD] each, more than the ``total`` budget [USD].
    "never_fundable": ("corridors", "costs", "total"),
    # ``corridors`` cost more than the ``largest`` year's budget [USD], with neither
    # budget_carry_over nor allow_split.
    "over_any_year": ("corridors", "largest"),
    # ``corridors`` add zero or less to the ``objective`` (key of ranker.plan.OBJECTIVES).
    "adds_nothing": ("corridors", "objective"),
    # No Budget row for ``years`` between the first and the last.
    "budget_years_missing": ("years",),
    "optimiser_plan_infeasible": (),
    # Stopped at ``time_limit_s`` [s]; ``gap`` [-] of the plan shown (None: not bounded).
    "optimiser_time_limit": ("time_limit_s", "gap"),
    # Stopped with the solver's ``message``; ``shows_greedy``: the greedy plan is shown.
    "optimiser_unfinished": ("message", "shows_greedy"),
    # -- plan: the coverage view (ranker.plan.phasing, coverage) --------------------------
    "endpoints_without_connects_column": (),
    "no_connects": (),
    "endpoints_without_connects": (),
    # ``places`` of coverage_endpoints that no planned corridor connects.
    "endpoints_not_planned": ("places",),
    # coverage_endpoints names fewer than two ``places``.
    "endpoints_too_few": ("places",),
    # -- the map (ranker.geo.network) ------------------------------------------------------
    "places_unused": (),
    # ``corridors`` (ids, sheet order) without a position.
    "corridors_unplaced": ("corridors",),
}


def warning(kind: str, **fields) -> dict:
    """Return the record ``{"kind": kind, **fields}``, checking the fields of its kind.

    Raises
    ------
    ValueError
        For a kind not in :data:`WARNING_KINDS`, or fields other than its own.

    Examples
    --------
    >>> warning("small_share", criterion="risk", share=0.4)
    {'kind': 'small_share', 'criterion': 'risk', 'share': 0.4}
    """
    if kind not in WARNING_KINDS:
        raise ValueError(f"unknown warning kind {kind!r}; known: {sorted(WARNING_KINDS)}")
    if set(fields) != set(WARNING_KINDS[kind]):
        raise ValueError(
            f"a {kind!r} warning carries {list(WARNING_KINDS[kind])}, not {sorted(fields)}"
        )
    return {"kind": kind, **fields}
