"""Every broken input of the corpus: InputError naming the place and a fix, input untouched."""

from __future__ import annotations

import hashlib
import re

import pytest

from ranker.errors import InputError
from ranker.workbook import read_workbook
from ranker.workbook.schema import SHEETS

from .corpus import CASES

PLACE = re.compile(
    r"^(?P<sheet>[A-Za-z ]+)(!(?:[A-Z]{1,3}\d+(?::[A-Z]{1,3}\d+)?|\d+:\d+|[A-Z]{1,3}:[A-Z]{1,3}))?$"
)


def _digest(path):
    return hashlib.sha256(path.read_bytes()).hexdigest() if path.is_file() else None


def test_corpus_is_large_and_named_once():
    assert len(CASES) >= 50
    assert len({c.name for c in CASES}) == len(CASES)
    assert all(c.builder.__doc__ for c in CASES)


@pytest.mark.parametrize("case", CASES, ids=[c.name for c in CASES])
def test_broken_input(case, tmp_path):
    path = case.builder(tmp_path)
    before = _digest(path)
    listing = sorted(p.name for p in tmp_path.iterdir())
    try:
        read_workbook(path)
    except InputError as err:
        problems = err.problems
    else:
        pytest.fail(f"{case.name}: no InputError")
    assert any(case.where in p.where for p in problems), [str(p) for p in problems]
    for p in problems:
        assert p.what and p.fix, str(p)
        m = PLACE.match(p.where)
        assert p.where == path.name or (m and m["sheet"] in SHEETS), p.where
    assert _digest(path) == before  # the input is byte-identical afterwards
    assert sorted(p.name for p in tmp_path.iterdir()) == listing  # nothing written beside it
