"""Rewrite the generated tables of ``docs/derivation.md``.

Usage::

    python -m ranker.derive.write_docs docs/derivation.md
"""

from __future__ import annotations

import sys
from pathlib import Path

from .glossary import update_doc

if __name__ == "__main__":
    update_doc(Path(sys.argv[1]))
