"""Every Examples section of ranker.derive runs and prints what it says."""

from __future__ import annotations

import doctest
import importlib
import pkgutil

import pytest

import ranker.derive

# write_docs is a command (no functions of its own); the package file only re-exports.
MODULES = [
    f"ranker.derive.{m.name}"
    for m in pkgutil.iter_modules(ranker.derive.__path__)
    if m.name != "write_docs"
]


@pytest.mark.parametrize("name", MODULES)
def test_examples_run(name):
    module = importlib.import_module(name)
    result = doctest.testmod(module, optionflags=doctest.NORMALIZE_WHITESPACE)
    assert result.attempted > 0 and result.failed == 0
