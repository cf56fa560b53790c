"""The warnings of the derive and score stages, as records: every kind declared once.

A stage that meets doubtful-but-legal input appends a record ``{"kind", ...}``
made by :func:`warning`, with the numbers and ids the reader needs (plain
``str``, ``int``, ``float``, lists of them: JSON-ready). The words are written
by :mod:`ranker.report.words.inputs`, reached through
:func:`ranker.report.narrative.input_warnings`; the stress stage's own kinds
are :data:`ranker.stress.WARNING_KINDS`.
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
    # -- the run (ranker.pipeline) ---------------------------------------------------------
    "robustness_skipped_no_weight": (),
    "robustness_skipped_one_corridor": (),
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
