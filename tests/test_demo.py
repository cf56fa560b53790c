"""The invented demo scenario: a valid workbook whose every criterion is derived."""

from __future__ import annotations

import ranker
from ranker.demo import write_demo
from ranker.workbook.read import read_workbook


def test_demo_workbook_reads_and_derives_every_built_in(tmp_path):
    path = write_demo(tmp_path)
    inputs = read_workbook(path)
    assert len(inputs.corridors) >= 10
    result = ranker.rank_workbook(path, samples=0)
    assert set(result.provenance.values()) == {"derived"}
    assert set(result.provenance) == {
        "policy_readiness",
        "capital_cost",
        "charging_revenue",
        "grid_headroom",
        "terrain_penalty",
    }
