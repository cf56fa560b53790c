"""The stress stage's warnings in words (records of :data:`ranker.stress.WARNING_KINDS`)."""

from __future__ import annotations

from .basic import Namer, listing


def stress_warning(rec: dict, namer: Namer) -> str:
    """One warning of the stress stage in words."""
    kind = rec["kind"]
    if kind == "weights_rescaled":
        return f"The weights summed to {rec['total']:.6g}; they were rescaled to sum to 1."
    if kind == "one_corridor":
        return "Only one corridor: there is nothing to compare it with."
    if kind == "two_corridors":
        return (
            "Only two corridors: transitivity (test 2) cannot fail and removing one "
            "leaves nothing to reorder."
        )
    if kind == "one_criterion":
        return (
            f"Only one criterion ({namer.criterion(rec['criterion'])}): weights cannot change "
            "the order, so there are no weight tipping points."
        )
    if kind == "constant_criterion":
        return (
            f"Criterion {namer.criterion(rec['criterion'])} has the same value for every "
            "corridor: it cannot separate them, and its weight only dilutes the others."
        )
    if kind == "identical":
        text = (
            f"{listing([namer.corridor(c) for c in rec['corridors']])} have identical "
            "values on every criterion: they always tie."
        )
        return text[0].upper() + text[1:]
    if kind == "dominates":
        return (
            f"{namer.corridor(rec['corridor'], start=True)} is at least as good as every "
            "other corridor on every criterion: it dominates them, and sound "
            "methods rank it first under any weights."
        )
    if kind == "zero_weight_dirichlet":
        zero = listing([namer.criterion(c) for c in rec["criteria"]])
        return (
            f"Weight 0 on {zero}: Dirichlet sampling keeps it at 0; use "
            "uniform sampling to explore it."
        )
    if kind == "uncertainty_100":
        return (
            "An uncertainty_pct of 100 or more lets values change sign in the Monte Carlo samples."
        )
    if kind == "monte_carlo_off":
        return (
            "Monte Carlo is off (samples = 0): no rank acceptability, central weights "
            "or confidence factors; 'practically tied' uses the 1% gap rule."
        )
    if kind == "confidence_draws_capped":
        return (
            f"Confidence factors use {rec['draws']:,} value draws (capped to bound run time), "
            f"not {rec['samples']:,}."
        )
    raise ValueError(f"no words for a stress warning of kind {kind!r}")


def stress_warnings(records: list[dict], namer: Namer | None = None) -> list[str]:
    """Every warning of the stress stage in words, in order."""
    namer = namer or Namer()
    return [stress_warning(r, namer) for r in records]
