"""What the terminal prints after a run: tiers, the decision, and honest shares."""

from __future__ import annotations

import re

import pytest

from ranker import rank_workbook
from ranker.cli import main
from ranker.report.narrative import terminal_lines
from ranker.report.words import share_text
from ranker.report.workbook import CAUTION

LINE = re.compile(r"^\s+(\d+)\. .* \((\w+)\)  tier (\d+)  score ")


def _corridor_lines(lines):
    return [m.groups() for m in map(LINE.match, lines) if m]


def test_every_corridor_line_gives_the_tier_of_the_ranking(direct_workbook, tmp_path):
    result = rank_workbook(direct_workbook, samples=2000, seed=7)
    lines = terminal_lines(result)
    printed = _corridor_lines(lines)
    assert len(printed) == len(result.ranking)
    for (rank, cid, tier), (rid, row) in zip(printed, result.ranking.iterrows(), strict=True):
        assert (cid, int(rank), int(tier)) == (rid, int(row["rank"]), int(row["tier"]))
    # The decision summary and the tier rule follow, as on the justification sheet.
    text = "\n".join(lines)
    assert "Fund first" in text
    assert "Tiers: every corridor of a higher tier" in text
    assert "2,000 samples" in text
    assert lines[-1].strip() == CAUTION  # planning-level only, as every output says


def test_without_samples_the_terminal_says_the_order_was_not_tested(direct_workbook, capsys):
    code = main(["run", str(direct_workbook), "--samples", "0"])
    out = capsys.readouterr().out
    assert code == 0
    assert "not tested against uncertainty" in out
    assert "of samples" not in out  # no share is quoted when nothing was sampled
    assert len(_corridor_lines(out.splitlines())) == 4


def test_first_rank_shares_are_never_rounded_to_never_or_always(direct_workbook):
    result = rank_workbook(direct_workbook, samples=2000, seed=7)
    first = result.robustness.first_rank
    for line in terminal_lines(result):
        m = LINE.match(line)
        if not m:
            continue
        share = float(first[m.group(2)])
        if share == 0:
            assert "never first in the samples" in line
        else:
            assert f"first in {share_text(share)} of samples" in line
            assert "first in 0%" not in line


@pytest.mark.parametrize(
    ("share", "text"),
    [
        (0.0, "0%"),
        (0.0001, "<1%"),
        (0.0049, "<1%"),
        (0.005, "<1%"),  # 0.5 rounds to even (0): still not "0%" for a share above 0
        (0.0051, "1%"),
        (0.234, "23%"),
        (0.995, ">99%"),  # rounds to 100 but is not every sample
        (0.9999, ">99%"),
        (1.0, "100%"),
    ],
)
def test_share_text_keeps_zero_and_one_for_never_and_always(share, text):
    assert share_text(share) == text
