"""Inputs that only the later stages catch, and edge cases that must still run.

Each :class:`Stage` is run end to end through the command line
(``ranker run`` and ``ranker check``) by ``test_stages.py``, and listed with
the message the planner sees in ``docs/input-errors.md`` by
``tests/workbook/make_error_doc.py``. Every scenario is invented.

A builder gets an empty folder holding an empty ``out`` folder, writes the
input there and returns ``(input path, extra options for run)``; the runner
adds ``--out <folder>/out`` unless the options name ``--out`` themselves.
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path
from typing import NamedTuple

from ._cli import sibling

_wbfill = sibling("workbook.wbfill")
valid_sheets = _wbfill.valid_sheets
write_book = _wbfill.write_book
INPUT = "input.xlsx"


class Stage(NamedTuple):
    """One end-to-end case.

    ``code`` is the exit code of ``run``; for 2, some problem's place contains
    ``where`` and standard error contains ``says``; for 0, some warning
    contains ``says``. ``check`` is the exit code of ``ranker check`` (which
    takes no run options). A non-empty ``bug`` (or ``check_bug``) names a
    known fault: the test is then a strict expected failure with that reason.
    """

    name: str
    about: str
    build: Callable[[Path], tuple[Path, list[str]]]
    code: int
    where: str
    says: str
    check: int
    bug: str = ""
    check_bug: str = ""


STAGES: list[Stage] = []


def stage(name, about, code, where, says, check=None, *, bug="", check_bug=""):
    """Register the decorated builder."""

    def register(fn):
        STAGES.append(
            Stage(
                name,
                about,
                fn,
                code,
                where,
                says,
                code if check is None else check,
                bug,
                check_bug,
            )
        )
        return fn

    return register


def _drop_column(rows: list[list], key: str) -> None:
    i = rows[0].index(key)
    for row in rows:
        if len(row) > i:
            del row[i]


def _valid(folder: Path, change=None, *extra: str) -> tuple[Path, list[str]]:
    data = valid_sheets()
    if change is not None:
        change(data)
    return write_book(folder / INPUT, data), list(extra)


# Four invented corridors with three criteria given directly (no derivation).
DIRECT_HEADER = ["corridor_id", "name", "cost_musd", "freight_share", "risk"]
DIRECT_ROWS = [
    ["A", "Alder link", 12.0, 0.30, 3],
    ["B", "Brook link", 8.0, 0.20, 2],
    ["C", "Cedar link", 15.0, 0.45, 4],
    ["D", "Dune link", 10.0, 0.25, 1],
]
CRITERIA_HEADER = ["criterion", "label", "direction", "include", "weight", "weight:growth"]
CRITERIA_ROWS = [
    ["cost_musd", "Cost", "cost", "yes", 40, 10],
    ["freight_share", "Freight share", "benefit", "yes", 40, 70],
    ["risk", "Delivery risk", "cost", "yes", 20, 20],
]


def direct(folder: Path, rows=None, criteria=None, *extra: str) -> tuple[Path, list[str]]:
    """Write a Corridors + Criteria workbook of directly given criteria."""
    sheets = {
        "Corridors": [DIRECT_HEADER, *(DIRECT_ROWS if rows is None else rows)],
        "Criteria": [CRITERIA_HEADER, *(CRITERIA_ROWS if criteria is None else criteria)],
    }
    return write_book(folder / INPUT, sheets), list(extra)


# --- raw inputs of the built-in criteria ----------------------------------------------


@stage(
    "derived_inputs_missing",
    "capital_cost and charging_revenue are included but Corridors has no trucks_per_day column.",
    2,
    "Corridors",
    "trucks_per_day",
)
def _no_trucks(folder):
    return _valid(folder, lambda d: _drop_column(d["Corridors"], "trucks_per_day"))


@stage(
    "derived_length_missing",
    "Built-in criteria are included but Corridors has no length_mi column.",
    2,
    "Corridors",
    "length_mi",
)
def _no_length(folder):
    return _valid(folder, lambda d: _drop_column(d["Corridors"], "length_mi"))


@stage(
    "derived_headroom_missing",
    "grid_headroom is included but Corridors has no grid_headroom_mw column.",
    2,
    "Corridors",
    "grid_headroom_mw",
)
def _no_headroom(folder):
    def change(d):
        _drop_column(d["Corridors"], "grid_headroom_mw")
        d["Criteria"][4][3] = "yes"  # grid_headroom
        d["Criteria"][4][8] = 5  # its rank in weight:board:rank
        d.pop("Pairwise")

    return _valid(folder, change)


@stage(
    "readiness_without_miles",
    "policy_readiness is included but the workbook has no Corridor miles sheet.",
    2,
    "Corridor miles",
    "policy_readiness",
)
def _no_miles_sheet(folder):
    return _valid(folder, lambda d: d.pop("Corridor miles"))


@stage(
    "readiness_corridor_without_miles",
    "One corridor has no rows on the Corridor miles sheet.",
    2,
    "Corridors!A4",
    "C3",
)
def _corridor_without_miles(folder):
    return _valid(folder, lambda d: d.__setitem__("Corridor miles", d["Corridor miles"][:4]))


@stage(
    "miles_do_not_add_up",
    "A corridor's miles by jurisdiction add up to 70 but its length is 120.",
    2,
    "Corridor miles!C2",
    "miles_error_tolerance",
)
def _miles_gap(folder):
    return _valid(folder, lambda d: d["Corridor miles"][1].__setitem__(2, 20.0))


@stage(
    "screened_out_all",
    "An at_least limit excludes every corridor.",
    2,
    "Criteria!F6",
    "every corridor fails",
)
def _screened_all(folder):
    return _valid(folder, lambda d: d["Criteria"][5].__setitem__(5, 100))


def _no_capital_cost(d):
    d["Criteria"][2][3] = "no"
    d["Pairwise"] = [
        ["criterion", "policy_readiness", "charging_revenue", "freight_tons"],
        ["policy_readiness", 1, 1, 2],
        ["charging_revenue", None, 1, 1],
        ["freight_tons", None, None, 1],
    ]


@stage(
    "budget_without_capital_cost",
    "A Budget sheet is given but capital_cost is not included.",
    2,
    "Budget",
    "capital cost",
)
def _budget_no_capital(folder):
    return _valid(folder, _no_capital_cost)


# --- run options ----------------------------------------------------------------------


@stage(
    "weights_unknown_set",
    "--weights names a set the workbook does not have.",
    2,
    "--weights",
    "no weight set named 'nosuch'",
    check=0,
)
def _weights_unknown(folder):
    return _valid(folder, None, "--weights", "nosuch")


@stage(
    "weight_not_key_value",
    "--weight is given without =SHARE.",
    2,
    "--weight",
    "is not KEY=SHARE",
    check=0,
)
def _weight_no_value(folder):
    return _valid(folder, None, "--weight", "capital_cost")


@stage(
    "weight_not_a_number",
    "--weight gives a word as the share.",
    2,
    "--weight",
    "is not KEY=SHARE",
    check=0,
)
def _weight_word(folder):
    return _valid(folder, None, "--weight", "capital_cost=high")


@stage(
    "weight_unknown_criterion",
    "--weight names a criterion that is not included.",
    2,
    "--weight",
    "capitol_cost is not an included criterion",
    check=0,
)
def _weight_unknown(folder):
    return _valid(folder, None, "--weight", "capitol_cost=3")


@stage(
    "weight_negative",
    "--weight gives a negative share.",
    2,
    "--weight",
    "is outside 0-100 %",
    check=0,
)
def _weight_negative(folder):
    return _valid(folder, None, "--weight", "capital_cost=-1")


@stage(
    "weight_not_finite",
    "--weight gives nan.",
    2,
    "--weight",
    "is outside 0-100 %",
    check=0,
)
def _weight_nan(folder):
    return _valid(folder, None, "--weight", "capital_cost=nan")


@stage(
    "weights_all_zero",
    "--weight sets every criterion's share to 0.",
    2,
    "--weight",
    "the shares sum to 0 %, not 100 %",
    check=0,
)
def _weights_zero(folder):
    keys = ["policy_readiness", "capital_cost", "charging_revenue", "freight_tons"]
    extra = [a for k in keys for a in ("--weight", f"{k}=0")]
    return _valid(folder, None, *extra)


@stage(
    "samples_negative",
    "--samples is negative.",
    2,
    "--samples",
    "negative",
    check=0,
)
def _samples_negative(folder):
    return _valid(folder, None, "--samples", "-5")


@stage(
    "seed_negative",
    "--seed is negative.",
    2,
    "--seed",
    "seed is -1",
    check=0,
)
def _seed_negative(folder):
    return _valid(folder, None, "--seed", "-1")


@stage(
    "samples_beyond_memory",
    "--samples asks for ten trillion Monte Carlo samples.",
    2,
    "--samples",
    "samples",
    check=0,
)
def _samples_huge(folder):
    return direct(folder, None, None, "--samples", str(10**13))


# --- the output folder ----------------------------------------------------------------


@stage(
    "output_folder_under_a_file",
    "--out names a folder inside a file.",
    2,
    "notes.txt",
    "is a file, not a folder",
    check=0,
)
def _out_under_file(folder):
    (folder / "notes.txt").write_text("my notes")
    path, extra = _valid(folder)
    return path, [*extra, "--out", str(folder / "notes.txt" / "out")]


@stage(
    "weight_share_over_100",
    "--weight gives a share above 100 %.",
    2,
    "--weight",
    "is outside 0-100 %",
    check=0,
)
def _weight_over(folder):
    return _valid(folder, None, "--weight", "capital_cost=140")


@stage(
    "weight_repeated",
    "--weight names the same criterion twice.",
    2,
    "--weight",
    "capital_cost is given twice",
    check=0,
)
def _weight_twice(folder):
    return _valid(folder, None, "--weight", "capital_cost=20", "--weight", "capital_cost=30")


@stage(
    "weight_shares_over_100",
    "Shares of several --weight flags sum above 100 %.",
    2,
    "--weight",
    "above 100 %",
    check=0,
)
def _weight_sum(folder):
    return _valid(folder, None, "--weight", "capital_cost=60", "--weight", "charging_revenue=50")


@stage(
    "output_folder_is_file",
    "--out names a file.",
    2,
    "notes.txt",
    "is a file, not a folder",
    check=0,
)
def _out_file(folder):
    (folder / "notes.txt").write_text("my notes")
    path, extra = _valid(folder)
    return path, [*extra, "--out", str(folder / "notes.txt")]


@stage(
    "output_not_ranker_file",
    "A file named like the output exists and ranker did not write it.",
    2,
    "input-ranked.html",
    "was not written by ranker",
    check=0,
)
def _out_foreign(folder):
    (folder / "out" / "input-ranked.html").write_text("<p>the board's own notes</p>")
    return _valid(folder)


# --- legal edge cases: they run, with a warning ----------------------------------------


@stage(
    "one_corridor",
    "The workbook lists a single corridor.",
    0,
    "",
    "robustness analysis skipped",
)
def _one(folder):
    return direct(folder, DIRECT_ROWS[:1])


@stage(
    "screened_to_one",
    "An at_least limit leaves a single corridor.",
    0,
    "",
    "Only one corridor remains after screening",
)
def _screened_one(folder):
    return _valid(folder, lambda d: d["Criteria"][5].__setitem__(5, 9.0))


@stage(
    "two_corridors",
    "The workbook lists two corridors.",
    0,
    "",
    "Only two corridors",
)
def _two(folder):
    return direct(folder, DIRECT_ROWS[:2])


@stage(
    "duplicate_corridors",
    "Two corridors have different ids but identical values.",
    0,
    "",
    "identical values on every criterion",
)
def _duplicates(folder):
    return direct(folder, [*DIRECT_ROWS, ["A2", "Alder link", 12.0, 0.30, 3]])


@stage(
    "criteria_all_constant",
    "Every criterion has the same value for every corridor.",
    0,
    "",
    "same value for every corridor",
)
def _constant(folder):
    return direct(folder, [[r[0], r[1], 10.0, 0.3, 2] for r in DIRECT_ROWS])


@stage(
    "differing_criteria_weigh_nothing",
    "The only criterion that differs between corridors has weight 0.",
    0,
    "",
    "has weight 0; all corridors tie",
)
def _zero_weight(folder):
    criteria = [CRITERIA_ROWS[0], CRITERIA_ROWS[1], ["risk", "Delivery risk", "cost", "yes", 0, 0]]
    return direct(folder, [[r[0], r[1], 10.0, 0.3, r[4]] for r in DIRECT_ROWS], criteria)


@stage(
    "plan_unaffordable_corridor",
    "With a Budget sheet, one corridor's capital cost is ten trillion USD (typed in cents).",
    0,
    "",
    "can never be funded",
)
def _unaffordable(folder):
    sheets = {
        "Corridors": [
            ["corridor_id", "name", "capital_cost", "freight_share"],
            ["A", "Alder link", 13.14e6, 0.3],
            ["B", "Brook link", 1e13, 0.5],
            ["C", "Cedar link", 15.73e6, 0.2],
        ],
        "Criteria": [
            ["criterion", "label", "direction", "include", "weight"],
            ["capital_cost", "Capital cost", "cost", "yes", 50],
            ["freight_share", "Freight share", "benefit", "yes", 50],
        ],
        "Budget": [["year", "capital_usd"], [2027, 20e6], [2028, 15e6]],
    }
    return write_book(folder / INPUT, sheets), []
