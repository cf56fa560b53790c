"""Rank intervals in words (ranker.report.words.tipping), from hand-made rows.

The interval of a weight over which a corridor keeps its rank is the
one-at-a-time sensitivity of Triantaphyllou & Sanchez (1997), Decision
Sciences 28(1):151-194; the sentence quotes the row's numbers and nothing
else, so each expected sentence is written from the row by hand.
"""

from __future__ import annotations

import pandas as pd

from ranker.report.words import Namer
from ranker.report.words.tipping import interval_sentence, with_interval_sentences

NAMER = Namer({"A": "Alpha link", "B": "B"}, {"cost_musd": "Cost"})


def _row(cid="A", criterion="cost_musd", rank=2, now=0.4, lo=0.25, hi=0.55):
    return {
        "criterion": criterion,
        "corridor_id": cid,
        "rank": rank,
        "current_weight": now,
        "weight_low": lo,
        "weight_high": hi,
    }


def test_interval_sentence_quotes_the_bounds():
    assert interval_sentence(_row(), NAMER) == (
        "Alpha link (A) stays 2nd while the weight on Cost is between 0.25 and 0.55; "
        "it is 0.40 now."
    )


def test_interval_sentence_whole_range():
    # lo <= 0 and hi >= 1: the rank holds over every weight.
    text = interval_sentence(_row(rank=1, lo=0.0, hi=1.0), NAMER)
    assert text == "Alpha link (A) stays 1st whatever the weight on Cost (0 to 1)."


def test_interval_sentence_one_open_end_is_not_whole_range():
    text = interval_sentence(_row(rank=3, lo=0.0, hi=0.9), NAMER)
    assert text == (
        "Alpha link (A) stays 3rd while the weight on Cost is between 0.00 and 0.90; "
        "it is 0.40 now."
    )


def test_interval_sentence_bound_near_the_weight_gets_more_decimals():
    # 0.401 and 0.40 print alike at two decimals, so the bound takes three.
    text = interval_sentence(_row(now=0.4, lo=0.2, hi=0.401), NAMER)
    assert "between 0.20 and 0.401; it is 0.40 now." in text


def test_interval_sentence_unnamed_corridor_and_criterion():
    # A corridor named as its id is "Corridor B"; a criterion without a label is its key.
    text = interval_sentence(_row(cid="B", criterion="grid_headroom", rank=11), NAMER)
    assert text.startswith("Corridor B stays 11th while the weight on grid headroom is")


def test_with_interval_sentences_adds_a_last_column_and_keeps_the_table():
    table = pd.DataFrame([_row(), _row(cid="B", rank=1, lo=0.0, hi=1.0)])
    out = with_interval_sentences(table, NAMER)
    assert list(out.columns) == list(table.columns) + ["sentence"]
    assert out["sentence"].tolist() == [
        interval_sentence(_row(), NAMER),
        "Corridor B stays 1st whatever the weight on Cost (0 to 1).",
    ]
    assert "sentence" not in table.columns  # the input is not changed
    pd.testing.assert_frame_equal(out.drop(columns="sentence"), table)


def test_with_interval_sentences_empty_table():
    table = pd.DataFrame(columns=list(_row()))
    out = with_interval_sentences(table, NAMER)
    assert len(out) == 0 and list(out.columns)[-1] == "sentence"


def test_interval_ends_near_zero_or_one():
    # An end just short of 1 keeps the decimals that set it apart from 1; one within
    # the tipping search's tolerance (1e-6) of an end is that end.
    text = interval_sentence(_row(lo=0.004, hi=0.996), NAMER)
    assert "between 0.004 and 0.996;" in text
    text = interval_sentence(_row(lo=0.25, hi=1 - 4e-7), NAMER)
    assert "between 0.25 and 1.00;" in text
