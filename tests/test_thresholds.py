"""Documented thresholds, pinned as literals.

Each value below is stated in the documentation (the file and the words are
quoted beside it); a change to one must change the documentation and this
file together. A test that builds a case on each side of a threshold lives
with the module that applies it; this file stops a silent edit of the number.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from ranker.assumptions import ASSUMPTIONS, parse_default
from ranker.report.sheets import DETAIL_CORRIDORS, LARGE_NETWORK
from ranker.result import DEFAULT_SAMPLES, DEFAULT_SEED
from ranker.score.ahp import CR_LIMIT
from ranker.score.ranks import TIE_RTOL
from ranker.stress.reversal import WORSEN_FRACTION
from ranker.stress.tiers import TIER_CONFIDENCE, TOP_MATRIX
from ranker.stress.tipping import GRID_POINTS
from ranker.workbook.criteria import JUDGMENT_HIGH, JUDGMENT_LOW, RECIPROCAL_TOLERANCE

DOCS = Path(__file__).resolve().parents[1] / "docs"
SPEC_TIE = "Equal scores (to 1e-12 relative) share a rank"  # shared SPEC.md, scoring defaults


def _doc(name: str) -> str:
    return (DOCS / name).read_text(encoding="utf-8")


@pytest.mark.parametrize(
    "value, literal, doc, words",
    [
        # Ties: SPEC.md and docs/methods.md, "within 1e-12 relative".
        (TIE_RTOL, 1e-12, "methods.md", "within 1e-12 relative"),
        # AHP: Saaty (1980) consistency ratio limit 0.10; docs/methods.md "CR above 0.10".
        (CR_LIMIT, 0.10, "methods.md", "CR above 0.10"),
        # AHP judgments: Saaty's 1/9..9 scale, a mirror within 5 % of the reciprocal.
        (JUDGMENT_HIGH, 9.0, "methods.md", "1-9"),
        (RECIPROCAL_TOLERANCE, 0.05, "methods.md", "within 5 %"),
        # Rank-reversal test 1 worsens a corridor by 5 % of the criterion's range.
        (WORSEN_FRACTION, 0.05, "robustness.md", "5 % of that criterion's range"),
        # Tipping sweeps: 201 weights plus the current one.
        (GRID_POINTS, 201, "robustness.md", "201 weights plus the current one"),
        # The seed: docs/robustness.md "default 20261201".
        (DEFAULT_SEED, 20261201, "robustness.md", "default 20261201"),
        # Results workbook: detail tables summarised above 2,000 scored corridors.
        (LARGE_NETWORK, 2000, "performance.md", "more than 2,000 scored corridors"),
        (DETAIL_CORRIDORS, 500, "performance.md", "the first 500 corridors by rank"),
    ],
)
def test_documented_threshold_is_pinned(value, literal, doc, words):
    assert value == literal
    assert words in _doc(doc), f"docs/{doc} no longer says {words!r}"


def test_judgment_floor_admits_one_ninth_typed_to_two_decimals():
    # Saaty's scale ends at 1/9 = 0.111...; a planner typing 0.11 is accepted.
    assert JUDGMENT_LOW == 0.11 and JUDGMENT_LOW <= 1 / 9


def test_default_samples_and_tier_confidence():
    # SPEC.md: "--samples N ... (default 10000 ...)"; tiers at a confidence of 0.9 by
    # default (the tier_confidence assumption), the JSON matrix capped at 100 corridors.
    assert DEFAULT_SAMPLES == 10_000
    assert TIER_CONFIDENCE == 0.9
    assert parse_default(ASSUMPTIONS["tier_confidence"]) == 0.9
    assert TOP_MATRIX == 100


def test_spec_states_the_tie_rule():
    spec = Path(__file__).resolve().parents[2] / "shared" / "SPEC.md"
    if not spec.exists():
        pytest.skip("the planning folder's SPEC.md is not beside this checkout")
    assert SPEC_TIE in spec.read_text(encoding="utf-8")
