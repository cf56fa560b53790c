"""Generated documentation stays in step with the code it describes."""

from __future__ import annotations

import importlib.util
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def _load(name: str):
    spec = importlib.util.spec_from_file_location(name, ROOT / "docs" / f"{name}.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_assumptions_page_matches_the_table():
    doc = _load("make_assumptions_doc")
    assert doc.PAGE.read_text(encoding="utf-8") == doc.render(), (
        "docs/assumptions.md is stale: run python docs/make_assumptions_doc.py"
    )


def test_every_key_is_on_the_page():
    from ranker.assumptions import ASSUMPTIONS

    text = (ROOT / "docs" / "assumptions.md").read_text(encoding="utf-8")
    for key in ASSUMPTIONS:
        assert f"`{key}`" in text
