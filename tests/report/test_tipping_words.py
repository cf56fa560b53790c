"""Every tipping sentence states exactly what re-scoring just past its weight shows.

The sentence names the corridor actually passed at that weight and the ranks
there; the check re-scores the demo through the public scoring API
(``ranker.score.score_matrix``) 2e-6 either side of each stated weight. The
one-at-a-time sweep is that of Triantaphyllou & Sanchez (1997), *Decision
Sciences* 28(1):151-194.
"""

from __future__ import annotations

import re

import numpy as np
import pytest

import ranker
from ranker.demo import write_demo
from ranker.report import narrative
from ranker.report.words import ordinal
from ranker.score import score_matrix
from ranker.stress.tipping import sweep_weights


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    path = write_demo(tmp_path_factory.mktemp("tips"))
    return ranker.rank_workbook(path, samples=0)


def _ranks(result, weights):
    kept = result.scores.rank.index
    keys = list(weights)
    return score_matrix(
        result.scored_matrix.loc[kept, keys], result.criteria, dict(weights), result.assumptions
    ).rank


def test_every_sentence_is_the_swap_rescoring_shows(demo):
    rob = demo.robustness
    keys = [k for k, v in demo.weights.items() if k in demo.scores.weights]
    w = np.array([demo.weights[k] for k in keys])
    sentences = narrative.tipping_sentences(demo)
    assert rob.tipping_points and len(sentences) == len(rob.tipping_points)
    for t, text in zip(rob.tipping_points, sentences, strict=True):
        c = keys.index(t["criterion"])
        sign = 1.0 if t["direction"] == "above" else -1.0
        past = sweep_weights(w, c, [t["weight_at"] + sign * 2e-6])[0]
        short = sweep_weights(w, c, [t["weight_at"] - sign * 2e-6])[0]
        after = _ranks(demo, dict(zip(keys, past, strict=True)))
        before = _ranks(demo, dict(zip(keys, short, strict=True)))
        i, j = t["corridor_id"], t["other_id"]
        assert np.sign(before[i] - before[j]) != np.sign(after[i] - after[j]), text
        assert after[i] == t["rank_after"] and after[j] == t["other_rank_after"], text
        if t["kind"] == "top":
            assert after[j] == 1 and "takes first place" in text
        else:
            # The sentence states both ranks of the moving corridor.
            assert f"from {ordinal(t['rank_before'])} to {ordinal(t['rank_after'])}" in text
            stated = re.search(r"\((\d+)\w\w now, (\d+)\w\w at that weight\)", text)
            if stated:  # the passed corridor's rank where the sentence says it is
                assert int(stated.group(2)) == after[j]
            else:
                assert abs(demo.scores.rank[j] - demo.scores.rank[i]) == 1


def test_cards_carry_at_most_three_different_nearest_first(demo):
    every = narrative.card_tips(demo, list(demo.ranking.index))
    for cid in demo.ranking.index:
        tips = every[cid]
        assert len(tips) <= 3
        assert len(set(tips)) == len(tips)
        mine = [
            t for t in demo.robustness.tipping_points if cid in (t["corridor_id"], t["other_id"])
        ]
        mine.sort(key=lambda t: abs(t["weight_at"] - t["current_weight"]))
        if mine:  # the nearest one always leads
            assert tips[0] == narrative.tipping_sentence(mine[0], narrative._namer(demo))
