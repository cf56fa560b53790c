"""The justification sheet's template helpers (ranker.report.html)."""

from __future__ import annotations

import re

from ranker.report.html import _environment
from ranker.report.words import share_text


def test_shares_in_the_sheet_are_said_as_everywhere_else():
    env = _environment()
    template = env.from_string("{{ x|share }}")
    for x in (0.0, 0.003, 0.005, 0.4423, 0.996, 1.0):
        assert template.render(x=x) == share_text(x).replace("<", "&lt;").replace(">", "&gt;")
    assert template.render(x=0.003) == "&lt;1%"  # not a rounded 0% for a share above 0


def test_the_sheet_template_formats_no_share_by_hand():
    """Every share of samples on the sheet goes through the filter (no "%.0f%%")."""
    from ranker.report.html import template_folder

    text = (template_folder() / "sheet.html.j2").read_text(encoding="utf-8")
    assert not re.search(r'"%\.0f%%"\|format\(100 \*', text)
