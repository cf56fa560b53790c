"""The registry of built-in criteria is the one list every stage reads."""

from __future__ import annotations

import doctest

import pandas as pd

import ranker.builtin
from ranker.builtin import BUILTIN_CRITERIA, STAGES
from ranker.derive import BUILT_IN, CRITERION_COLUMN, NEEDS
from ranker.derive.glossary import COLUMNS, needs_markdown
from ranker.derive.needs import SIZED
from ranker.workbook.schema import FIELD_UNITS, SHEETS
from ranker.workbook.template import write_template


def test_the_five_criteria_of_the_contract():
    # SPEC.md, "Built-in criteria": key and direction, in this order.
    assert {k: c.direction for k, c in BUILTIN_CRITERIA.items()} == {
        "policy_readiness": "benefit",
        "capital_cost": "cost",
        "charging_revenue": "benefit",
        "grid_headroom": "benefit",
        "terrain_penalty": "cost",
    }


def test_every_need_names_a_sheet_and_field_of_the_schema():
    for c in BUILTIN_CRITERIA.values():
        assert c.stage in STAGES
        for sheet, fields in c.needs:
            assert sheet in SHEETS, (c.key, sheet)
            known = {f.key for f in SHEETS[sheet].fields}
            assert set(fields) <= known, (c.key, sheet, set(fields) - known)


def test_derived_tables_follow_the_registry():
    assert BUILT_IN == {k: c.direction for k, c in BUILTIN_CRITERIA.items()}
    assert CRITERION_COLUMN == {k: c.column for k, c in BUILTIN_CRITERIA.items()}
    assert NEEDS == {k: c.needs for k, c in BUILTIN_CRITERIA.items()}
    assert set(SIZED) == {"capital_cost", "charging_revenue", "grid_headroom"}
    for k, c in BUILTIN_CRITERIA.items():
        assert FIELD_UNITS[k] == c.unit
        assert COLUMNS[k][0] == c.unit
        assert c.column in COLUMNS
        assert f"| `{k}` |" in needs_markdown()


def test_template_lists_the_registry_in_order(tmp_path):
    path = tmp_path / "t.xlsx"
    write_template(path)
    frame = pd.read_excel(path, sheet_name="Criteria")
    assert list(frame["criterion"]) == list(BUILTIN_CRITERIA)
    assert list(frame["label"]) == [c.label for c in BUILTIN_CRITERIA.values()]


def test_examples_run():
    result = doctest.testmod(ranker.builtin)
    assert result.attempted > 0 and result.failed == 0
