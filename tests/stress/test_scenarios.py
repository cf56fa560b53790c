"""Futures through a re-ranking callback (a fake pipeline stands in here)."""

from __future__ import annotations

import pandas as pd
import pytest

from ranker.report.words import Namer
from ranker.report.words.futures import futures_words
from ranker.stress import futures

BASE = pd.Series({"A": 1, "B": 2, "C": 3, "D": 4})


def fake_rerank(overrides: dict) -> pd.Series:
    """Move corridors around depending on an invented assumption."""
    price = overrides.get("energy_price", 0.15)
    if price > 0.2:
        return pd.Series({"A": 3, "B": 1, "C": 2, "D": 4})
    if overrides.get("screen_out_d"):
        return pd.Series({"A": 1, "B": 2, "C": 3})
    return BASE.copy()


def test_rank_range_and_biggest_mover():
    calls = []

    def rerank(o):
        calls.append(o)
        return fake_rerank(o)

    out = futures(
        {
            "cheap": {"energy_price": 0.10},
            "dear": {"energy_price": 0.30},
            "strict": {"screen_out_d": True},
        },
        rerank,
        BASE,
    )
    assert calls == [{"energy_price": 0.10}, {"energy_price": 0.30}, {"screen_out_d": True}]
    rows = {c["corridor_id"]: c for c in out["corridors"]}
    assert (rows["A"]["best_rank"], rows["A"]["worst_rank"], rows["A"]["range"]) == (1, 3, 2)
    assert rows["A"]["most_moved_by"] == "dear" and rows["A"]["largest_move"] == -2
    assert rows["B"]["largest_move"] == 1 and rows["D"]["range"] == 0
    assert rows["D"]["most_moved_by"] is None
    assert out["missing"] == {"strict": ["D"]}
    assert out["top"]["dear"] == ["B"]
    said = futures_words(out, Namer({"A": "North Spur"}))
    words = {c["corridor_id"]: c["sentence"] for c in said["corridors"]}
    assert words["D"] == "Corridor D stays 4th in every future."
    assert words["A"] == (
        "North Spur (A) ranges from 1st to 3rd (base 1st); the 'dear' future moves it most, "
        "to 3rd."
    )
    assert words["B"] == (
        "Corridor B ranges from 1st to 2nd (base 2nd); the 'dear' future moves it most, to 1st."
    )
    # Only D keeps its rank; 'dear' changes the first corridor, the other two do not.
    assert said["sentence"] == (
        "Across 3 future(s), 1 of 4 corridors keep their rank and the first corridor is "
        "unchanged in 2 of them."
    )


def test_no_scenarios():
    out = futures({}, fake_rerank, BASE)
    assert out["scenarios"] == [] and all(c["range"] == 0 for c in out["corridors"])
    said = futures_words(out)
    assert said["sentence"] == "No futures were given."
    assert all(c["sentence"].endswith("has no scenario rank.") for c in said["corridors"])


def test_bad_callback_answers_are_named():
    with pytest.raises(TypeError, match="Series"):
        futures({"x": {}}, lambda o: {"A": 1}, BASE)
    with pytest.raises(ValueError, match="non-numeric"):
        futures({"x": {}}, lambda o: pd.Series({"A": "first"}), BASE)
