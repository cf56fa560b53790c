"""ranker.input_warnings: the warning kinds of the analyses, declared once.

Every record is made by :func:`warning`, which refuses a kind that is not
declared and fields other than the kind's own; every declared kind is worded
by the report (:mod:`ranker.report.words.inputs` or
:mod:`ranker.report.words.plan`), and no kind is also a stress-stage kind
(:data:`ranker.stress.WARNING_KINDS`), so a record's words are never
ambiguous.
"""

from __future__ import annotations

import json

import pytest

from ranker.input_warnings import WARNING_KINDS, warning
from ranker.stress import WARNING_KINDS as STRESS_KINDS


def test_a_record_carries_its_kind_and_exactly_its_fields():
    rec = warning("small_share", criterion="risk", share=0.4)
    assert rec == {"kind": "small_share", "criterion": "risk", "share": 0.4}
    assert json.loads(json.dumps(rec)) == rec  # JSON-ready


def test_unknown_kind_and_wrong_fields_are_refused():
    with pytest.raises(ValueError, match="unknown warning kind 'no_such_kind'"):
        warning("no_such_kind")
    with pytest.raises(ValueError, match="carries"):
        warning("small_share", criterion="risk")  # a field missing
    with pytest.raises(ValueError, match="carries"):
        warning("small_share", criterion="risk", share=0.4, extra=1)  # one too many


def test_kinds_are_declared_once_with_distinct_field_names():
    assert not set(WARNING_KINDS) & set(STRESS_KINDS)
    for kind, fields in WARNING_KINDS.items():
        assert "kind" not in fields, kind
        assert len(set(fields)) == len(fields), kind


def test_every_kind_has_words_and_an_unknown_kind_has_none():
    from ranker.report import narrative
    from ranker.report.words import inputs, plan

    assert set(WARNING_KINDS) <= set(inputs.WORDS) | set(plan.WORDS)
    with pytest.raises((KeyError, ValueError)):
        narrative.input_warnings([{"kind": "no_such_kind"}])
