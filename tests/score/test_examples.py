"""The Examples sections of ranker.score run as written (numpydoc docstrings)."""

from __future__ import annotations

import doctest
import importlib

import pytest

MODULES = [
    "agreement",
    "ahp",
    "normalize",
    "objective_weights",
    "override",
    "rank_weights",
    "ranks",
    "scoring",
    "screen",
    "stack",
    "topsis",
    "vikor",
    "weighted_product",
    "weighted_sum",
    "weights",
]


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name):
    module = importlib.import_module(f"ranker.score.{name}")
    result = doctest.testmod(module, optionflags=doctest.NORMALIZE_WHITESPACE)
    assert result.attempted > 0 and result.failed == 0
