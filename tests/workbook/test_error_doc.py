"""docs/input-errors.md is generated from the corpus and the end-to-end cases and must match."""

from __future__ import annotations

from .corpus import CASES
from .make_error_doc import DOC, _hardening, end_to_end, render


def test_error_doc_matches_corpus():
    text = render()
    assert DOC.read_text(encoding="utf-8") == text, (
        "docs/input-errors.md is stale: run python -m tests.workbook.make_error_doc"
    )
    for case in CASES:
        assert f"(`{case.name}`)" in text
    stages, hostile = end_to_end()
    assert len(stages) >= 20 and len(hostile) >= 15
    for entry in [*stages, *hostile]:
        assert f"(`{entry.name}`)" in text
    odd = _hardening()[3]
    for case in odd.ODD:
        assert f"(`{case.name}`)" in text
    for title, _ in odd.CLASSES.values():
        assert title in text
