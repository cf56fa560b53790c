"""Fuzzing cell values and types on every sheet, end to end through ``ranker run``.

Starting from the reader's small valid input (all nine contract sheets), a
few cells anywhere (header rows and one row and column past the end
included) get text, numbers, NaN-ish words, dates, booleans, huge and
negative numbers or formula-like text stored as text. Whatever they hold,
``ranker run`` exits 0 (both outputs written) or 2 (every problem a
``where: what; fix`` line, nothing written), never 1 and never a
traceback, and the input is byte-identical afterwards. Seeded; bounded.
"""

from __future__ import annotations

import datetime as dt
import tempfile
from pathlib import Path

from hypothesis import HealthCheck, event, given, seed, settings
from hypothesis import strategies as st

from ._cli import assert_no_output, assert_no_traceback, assert_refused, listing, run, sha256
from .cases import valid_sheets, write_book

VALID = valid_sheets()
FORMULA_START = ("=", "+", "-", "@")

WORDS = st.sampled_from(
    [
        "",
        " ",
        "NaN",
        "nan",
        "-NaN",
        "inf",
        "-inf",
        "Infinity",
        "#N/A",
        "#DIV/0!",
        "#VALUE!",
        "null",
        "None",
        "1e400",
        "-1e400",
        "1e-400",
        "0x1F",
        "1_000",
        "١٢٣",  # Arabic-Indic digits
        "12%",
        "-5%",
        "$52,000",
        "(1,200)",
        "85,5",
        "1/3",
        "3/0",
        "yes",
        "no",
        "TRUE",
        "benefit",
        "cost",
        "C1",
        "c1 ",
        "NA",
        "SO",
        "weight",
        "weight:x",
        "weight:x:rank",
        "criterion",
        "capital_cost",
        "policy_readiness",
        "freight_tons",
        "grid_headroom",
        "discount_rate",
        "horizon_years",
        "methods",
        "primary_method",
        "vikor",
        "topsis, weighted_product",
        "2030",
        "0",
        "-0",
        "\u00a0",
        "C1\u200b",
    ]
)
FORMULA_TEXT = st.sampled_from(
    [
        "=1+1",
        "=A1",
        "=1/0",
        "+A1",
        "-2+3",
        "@SUM(A1:A2)",
        "=cmd|' /C calc'!A0",
        '=HYPERLINK("http://example.invalid","open")',
        "=",
        "+",
        "-",
        "@",
    ]
)
TEXT = st.text(alphabet=st.characters(blacklist_categories=("Cs", "Cc")), max_size=20)
NUMBERS = st.one_of(
    st.integers(min_value=-(10**18), max_value=10**18),
    st.floats(allow_nan=False, allow_infinity=False),
    st.sampled_from([0, -1, 1e308, -1e308, 5e-324, 2**63, -(2**63), 1e15 + 0.5, 0.1]),
)
DATES = st.one_of(
    st.datetimes(min_value=dt.datetime(1900, 3, 1), max_value=dt.datetime(9999, 1, 1)),
    st.dates(min_value=dt.date(1900, 3, 1), max_value=dt.date(9999, 1, 1)),
    st.times(),
)
VALUES = st.one_of(WORDS, FORMULA_TEXT, TEXT, NUMBERS, DATES, st.booleans(), st.none())


def _like(original):
    """Values of the original cell's kind: what a planner's slip or a paste would leave."""
    if isinstance(original, str):
        return st.one_of(
            TEXT,
            FORMULA_TEXT,
            WORDS,
            st.sampled_from([original.upper(), f"  {original} ", original + "x"]),
        )
    if isinstance(original, (int, float)) and not isinstance(original, bool):
        return st.one_of(
            st.floats(min_value=0, max_value=10).map(lambda f: original * f),
            st.floats(min_value=-2, max_value=0).map(lambda f: original * f),
            st.integers(min_value=-3, max_value=3).map(lambda k: original * 10.0**k),
            NUMBERS,
            st.just(str(original)),
            st.just(f"{original:,}"),
        )
    return VALUES


def edits(sheets: list[str], most: int = 3):
    """1 to ``most`` (sheet, row, column, value) edits on the named sheets: mostly of the
    cell's own kind (so the run often gets past the reader), else anything at all."""

    @st.composite
    def draw(draw_):
        out = []
        for _ in range(draw_(st.integers(min_value=1, max_value=most))):
            sheet = draw_(st.sampled_from(sheets))
            rows = VALID[sheet]
            r = draw_(st.integers(min_value=1, max_value=len(rows) + 1))
            c = draw_(st.integers(min_value=1, max_value=len(rows[0]) + 1))
            row = rows[r - 1] if r <= len(rows) else []
            original = row[c - 1] if c <= len(row) else None
            kind = _like(original) if r > 1 else VALUES
            value = draw_(st.one_of(kind, kind, VALUES))
            out.append((sheet, r, c, value))
        return out

    return draw()


def _as_text(wb) -> None:
    for ws in wb.worksheets:
        for row in ws.iter_rows():
            for cell in row:
                if isinstance(cell.value, str) and cell.value.startswith(FORMULA_START):
                    cell.data_type = "s"


def _apply(changes) -> dict:
    data = valid_sheets()
    for sheet, r, c, value in changes:
        rows = data[sheet]
        while len(rows) < r:
            rows.append([])
        row = rows[r - 1]
        while len(row) < c:
            row.append(None)
        row[c - 1] = value
    return data


def check_end_to_end(changes) -> None:
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        out = folder / "out"
        out.mkdir()
        path = write_book(folder / "fuzz.xlsx", _apply(changes), edit=_as_text)
        digest = sha256(path)
        outcome = run("run", path, "--samples", "0", "--quiet", "--out", out)
        assert_no_traceback(outcome)
        assert outcome.code in (0, 2), outcome.err
        event(f"exit {outcome.code}")
        if outcome.code == 2:
            assert_refused(outcome)
            assert_no_output(out, [])
        else:
            assert listing(out) == ["fuzz-ranked.html", "fuzz-ranked.xlsx"]
        assert sha256(path) == digest
        assert listing(folder) == ["fuzz.xlsx", "out"]


FUZZ = settings(
    max_examples=20,
    deadline=None,
    database=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large],
)


@seed(20261201)
@FUZZ
@given(edits(["Corridors", "Corridor miles", "Jurisdictions"]))
def test_fuzz_corridor_sheets(changes):
    check_end_to_end(changes)


@seed(20261202)
@FUZZ
@given(edits(["Criteria", "Pairwise"]))
def test_fuzz_criteria_sheets(changes):
    check_end_to_end(changes)


@seed(20261203)
@FUZZ
@given(edits(["Assumptions", "Scenarios", "Budget", "Adoption"]))
def test_fuzz_assumption_sheets(changes):
    check_end_to_end(changes)


@seed(20261204)
@FUZZ
@given(edits(sorted(VALID), most=5))
def test_fuzz_any_sheet(changes):
    check_end_to_end(changes)


# --- legal values at their limits: the run must get through every stage --------------------


def _assumption_value(a):
    """A legal value of assumption ``a``, often at or next to a bound."""
    if a.kind in ("float", "int"):
        lo = a.low if a.low is not None else -1e12
        hi = a.high if a.high is not None else 1e12
        edges = [lo, hi, 0.0, 1.0, 1e-9, 1e9, 1e15, (lo + hi) / 2]
        picks = [
            v
            for v in edges
            if lo <= v <= hi and not (a.low_open and v == a.low) and not (a.low == 0 and v < 0)
        ]
        number = st.sampled_from(picks) | st.floats(min_value=lo, max_value=hi)
        if a.low_open:
            number = number.filter(lambda v: v > a.low)
        if a.kind == "int":
            return number.map(lambda v: int(round(v))).filter(
                lambda v: lo <= v <= hi and not (a.low_open and v <= a.low)
            )
        return number
    if a.kind == "choice":
        return st.sampled_from(a.choices)
    if a.kind == "list":
        return st.lists(st.sampled_from(a.choices), min_size=1, unique=True).map(", ".join)
    if a.kind == "bool":
        return st.sampled_from(["yes", "no"])
    return st.sampled_from(["", "Northport, Hillcrest", "Lakeside"])


def _assumptions():
    from ranker.assumptions import ASSUMPTIONS

    return st.lists(
        st.sampled_from(sorted(ASSUMPTIONS)).flatmap(
            lambda k: st.tuples(st.just(k), _assumption_value(ASSUMPTIONS[k]))
        ),
        min_size=1,
        max_size=4,
        unique_by=lambda kv: kv[0],
    )


# (sheet, column) -> (rows, strategy) of legal numbers; length_mi and the miles stay as they
# are so that they still add up.
_JUDGMENTS = st.sampled_from([1 / 9, 1 / 3, 1, 3, 9, "1/9", "1/3", 2, 0.5])
_LEGAL_NUMBERS = {
    ("Corridors", 5): ((2, 4), st.sampled_from([0, 1, 10**9]) | st.floats(0, 1e9)),
    ("Corridors", 6): ((2, 4), st.sampled_from([0, 1e7]) | st.floats(0, 1e7)),
    ("Corridors", 7): ((2, 4), st.sampled_from([0, 1e7]) | st.floats(0, 1e7)),
    ("Corridors", 8): ((2, 4), st.sampled_from([0, 1e-300, 1e9]) | st.floats(0, 1e9)),
    ("Corridors", 9): ((2, 4), st.sampled_from([5, 1e-300, 1e300]) | st.floats(5, 1e300)),
    ("Jurisdictions", 3): ((2, 3), st.sampled_from([0, 100]) | st.floats(0, 100)),
    ("Criteria", 5): ((2, 6), st.sampled_from([0, 99.9]) | st.floats(0, 99.9)),
    ("Criteria", 8): ((2, 6), st.sampled_from([0, 1e-9, 1e12]) | st.floats(0, 1e12)),
    ("Budget", 2): ((2, 3), st.sampled_from([0, 1, 1e15]) | st.floats(0, 1e15)),
    ("Adoption", 2): ((2, 4), st.sampled_from([0, 1]) | st.floats(0, 1)),
    ("Pairwise", 3): ((2, 2), _JUDGMENTS),
    ("Pairwise", 4): ((2, 3), _JUDGMENTS),
    ("Pairwise", 5): ((2, 4), _JUDGMENTS),
}


@st.composite
def legal_edits(draw):
    out = []
    for key, value in draw(_assumptions()):
        out.append(("Assumptions", key, value))
    for _ in range(draw(st.integers(min_value=0, max_value=4))):
        sheet, col = draw(st.sampled_from(sorted(_LEGAL_NUMBERS)))
        (first, last), values = _LEGAL_NUMBERS[(sheet, col)]
        row = draw(st.integers(min_value=first, max_value=last))
        out.append((sheet, (row, col), draw(values)))
    return out


def _apply_legal(changes) -> dict:
    data = valid_sheets()
    rows = data["Assumptions"]
    for sheet, where, value in changes:
        if sheet == "Assumptions":
            keys = [r[0] for r in rows]
            if where in keys:
                rows[keys.index(where)][1] = value
            else:
                rows.append([where, value, "", ""])
        else:
            r, c = where
            data[sheet][r - 1][c - 1] = value
    return data


@seed(20261205)
@settings(
    max_examples=20,
    deadline=None,
    database=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large],
)
@given(legal_edits())
def test_fuzz_legal_values_at_their_limits(changes):
    """Assumptions anywhere in their allowed ranges, corridors' numbers large or small."""
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        out = folder / "out"
        out.mkdir()
        path = write_book(folder / "edge.xlsx", _apply_legal(changes))
        digest = sha256(path)
        outcome = run("run", path, "--samples", "20", "--quiet", "--out", out)
        assert_no_traceback(outcome)
        assert outcome.code in (0, 2), outcome.err
        event(f"exit {outcome.code}")
        if outcome.code == 2:
            assert_refused(outcome)
            assert_no_output(out, [])
        else:
            assert listing(out) == ["edge-ranked.html", "edge-ranked.xlsx"]
        assert sha256(path) == digest
