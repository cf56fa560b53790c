"""docs/input-errors.md is generated from the corpus and must match it."""

from __future__ import annotations

from .corpus import CASES
from .make_error_doc import DOC, render


def test_error_doc_matches_corpus():
    text = render()
    assert DOC.read_text(encoding="utf-8") == text, (
        "docs/input-errors.md is stale: run python -m tests.workbook.make_error_doc"
    )
    for case in CASES:
        assert f"(`{case.name}`)" in text
