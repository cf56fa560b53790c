"""The sheet-XML scan patterns match exactly what their plain forms match.

The patterns of :mod:`ranker.workbook.preflight` and :mod:`ranker.report.carry`
take an optional namespace prefix possessively (``(?:\\w++:)?+``) so the
regular-expression engine does not backtrack into a tag name at every ``<`` of
a million-row sheet. An XML name holds at most one colon, so nothing can be
matched differently; these tests compare every pattern with its plain form
(``(?:\\w+:)?``) on random tag soup and on a realistic sheet.
"""

from __future__ import annotations

import re

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.report import carry
from ranker.workbook import preflight

PATTERNS = {
    "formula": preflight._FORMULA,
    "merge": preflight._MERGE,
    "hidden_row": preflight._HIDDEN_ROW_TAG,
    "col": preflight._COL_TAG,
    "unsaved": preflight._UNSAVED,
    "row_start": preflight._ROW_START,
    "value": preflight._VALUE_TAG,
    "cell": carry._CELL,
}

TOKENS = [
    "<",
    ">",
    "/",
    ":",
    "x:",
    "ab:",
    " ",
    '"',
    "=",
    "1",
    "A",
    'r="B7"',
    't="str"',
    "c",
    "col",
    "f",
    "v",
    "is",
    "row",
    "mergeCell",
    'hidden="1"',
    'ref="A1:B2"',
    "<c ",
    "<x:c ",
    "<f>",
    "</f>",
    "<v>",
    "</v>",
    "<v/>",
    '<row r="3">',
    "</c>",
    "<x:row ",
    "<is>",
    "<x:v>",
    "<x:is>",
    "text",
]


def _plain(pattern: re.Pattern) -> re.Pattern:
    text = pattern.pattern.replace(rb"(?:\w++:)?+", rb"(?:\w+:)?")
    assert text != pattern.pattern  # each one was made possessive
    return re.compile(text)


def _spans(pattern: re.Pattern, data: bytes) -> list[tuple]:
    return [(m.span(), m.groups()) for m in pattern.finditer(data)]


@pytest.mark.parametrize("key", sorted(PATTERNS))
@settings(max_examples=150, deadline=None)
@given(st.lists(st.sampled_from(TOKENS), max_size=40))
def test_same_matches_as_the_plain_pattern(key, tokens):
    data = "".join(tokens).encode()
    assert _spans(PATTERNS[key], data) == _spans(_plain(PATTERNS[key]), data)


def test_same_matches_on_a_sheet():
    rows = [
        f'<row r="{r}" hidden="1"><c r="A{r}" t="s"><v>{r}</v></c>'
        f'<c r="Z{r}" t="str"><f t="shared" si="0"/><v></v></c>'
        f'<c r="Y{r}"><f>A{r}*2</f></c></row>'
        for r in range(1, 300)
    ]
    xml = (
        '<x:worksheet><cols><col min="2" max="3" hidden="1"/></cols><sheetData>'
        + "".join(rows)
        + '</sheetData><mergeCells><mergeCell ref="A1:B2"/></mergeCells></x:worksheet>'
    ).encode()
    for key, pattern in PATTERNS.items():
        assert _spans(pattern, xml) == _spans(_plain(pattern), xml), key
