"""The Examples sections of ranker.stress run as written (numpydoc docstrings)."""

from __future__ import annotations

import doctest
import importlib

import pytest

MODULES = ["batch", "acceptability", "tipping", "reversal", "consensus", "scenarios"]


@pytest.mark.parametrize("name", MODULES + ["run"])
def test_docstring_examples(name):
    module = importlib.import_module("ranker.stress" + (f".{name}" if name else ""))
    result = doctest.testmod(module, optionflags=doctest.NORMALIZE_WHITESPACE)
    assert result.attempted > 0 and result.failed == 0
