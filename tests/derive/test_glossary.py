"""The derivation document's generated tables match the registries they come from."""

from __future__ import annotations

from pathlib import Path

import pytest

from ranker.assumptions import ASSUMPTIONS
from ranker.derive.glossary import (
    BLOCKS,
    COLUMNS,
    DERIVATION_GROUPS,
    assumptions_markdown,
    generated_block,
)

DOC = Path(__file__).resolve().parents[2] / "docs" / "derivation.md"


@pytest.mark.parametrize("name", sorted(BLOCKS))
def test_doc_block_matches_its_registry(name):
    """Regenerate with: python -m ranker.derive.write_docs docs/derivation.md"""
    assert generated_block(DOC.read_text(encoding="utf-8"), name) == BLOCKS[name]()


def test_assumption_table_lists_every_key_of_the_derivation_groups():
    table = assumptions_markdown()
    keys = [a.key for a in ASSUMPTIONS.values() if a.group in DERIVATION_GROUPS]
    assert keys and all(f"| `{k}` |" in table for k in keys)
    assert len(table.splitlines()) == len(keys) + 2


def test_every_derivation_assumption_names_its_basis():
    """Each default with a value to defend says where it comes from (REFERENCES' rule)."""
    basis = (
        "common practice",
        "from memory",
        "computed",
        "(19",
        "(20",
        "CFR",
        "CharIN",
        "NACFE",
        "Kersting",
        "US DOE",
        "Wright",
        "McFadden",
        "Weibull",
        "OMB",
    )
    plain = {
        "analysis_year",
        "adoption_model",
        "queue_metric",
        "miles_warn_tolerance",
        "miles_error_tolerance",
    }
    for a in ASSUMPTIONS.values():
        if a.group in DERIVATION_GROUPS and a.key not in plain and a.kind != "choice":
            assert any(b in a.note for b in basis), a.key


def test_glossary_units_use_the_one_bracket_notation():
    assert all(u.startswith("[") and u.endswith("]") for u, _ in COLUMNS.values())
