"""``python -m ranker.derive.write_docs FILE.md`` rewrites the generated tables, nothing else.

Each block between ``<!-- BEGIN name -->`` and ``<!-- END name -->`` becomes
what its registry writes (:data:`ranker.derive.glossary.BLOCKS`); the prose
around the blocks is left byte for byte, and a second run changes nothing.
"""

from __future__ import annotations

import importlib
import subprocess
import sys

from ranker.derive.glossary import BLOCKS, generated_block

PROSE = "# Derivation\n\nHand-written text stays as it is: ü, 1 < 2.\n\n"


def _doc(blocks: dict[str, str]) -> str:
    parts = [PROSE]
    for name, body in blocks.items():
        parts.append(
            f"## {name}\n\n<!-- BEGIN {name} -->\n{body}<!-- END {name} -->\n\nAfter {name}.\n\n"
        )
    return "".join(parts)


def _run(path):
    return subprocess.run(
        [sys.executable, "-m", "ranker.derive.write_docs", str(path)],
        capture_output=True,
        text=True,
        timeout=120,
    )


def test_rewrites_every_block_and_keeps_the_prose(tmp_path):
    path = tmp_path / "derivation.md"
    path.write_text(_doc({name: "| stale | table |\n" for name in BLOCKS}), encoding="utf-8")
    proc = _run(path)
    assert proc.returncode == 0, proc.stderr
    text = path.read_text(encoding="utf-8")
    for name, make in BLOCKS.items():
        assert generated_block(text, name) == make()
    assert text == _doc({name: make() for name, make in BLOCKS.items()})
    assert "stale" not in text


def test_a_second_run_changes_nothing(tmp_path):
    path = tmp_path / "derivation.md"
    path.write_text(_doc({name: "old\n" for name in BLOCKS}), encoding="utf-8")
    assert _run(path).returncode == 0
    once = path.read_bytes()
    assert _run(path).returncode == 0
    assert path.read_bytes() == once


def test_importing_the_module_writes_nothing(tmp_path, monkeypatch):
    # Only ``python -m`` rewrites: importing it (as the docs tests do) has no effect.
    path = tmp_path / "derivation.md"
    path.write_text("untouched", encoding="utf-8")
    monkeypatch.setattr(sys, "argv", ["x", str(path)])
    importlib.reload(importlib.import_module("ranker.derive.write_docs"))
    assert path.read_text(encoding="utf-8") == "untouched"
