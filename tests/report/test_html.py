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


def test_the_template_is_compiled_once_and_each_sheet_is_its_own(tmp_path):
    """Two results in one process: the template compiled once, each sheet from its result."""
    from pathlib import Path

    import jinja2

    from ranker import rank_workbook
    from ranker.demo import write_demo
    from ranker.report.html import build_html

    demo = write_demo(tmp_path)
    compiled = []
    real = jinja2.Environment.compile

    def counted(self, *args, **kwargs):
        compiled.append(1)
        return real(self, *args, **kwargs)

    _environment.cache_clear()  # compile afresh here, whatever ran before
    jinja2.Environment.compile = counted
    try:
        first = build_html(rank_workbook(demo, samples=200))
        second = build_html(
            rank_workbook(demo, samples=200, weight_overrides={"terrain_penalty": 40})
        )
        again = build_html(rank_workbook(Path(demo), samples=200))
    finally:
        jinja2.Environment.compile = real
    assert len(compiled) == 3  # sheet.html.j2 and its two includes, once
    assert first != second
    assert first == again or _masked(first) == _masked(again)


def _masked(html: str) -> str:
    return re.sub(r"\d{4}-\d\d-\d\dT[\d:]+(\+00:00|Z)?", "T", html)
