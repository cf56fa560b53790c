"""Every broken input of the reader's corpus, end to end through the command line.

``ranker run`` (with ``--out``, and a second time without it) and
``ranker check`` must each exit 2 with every line of standard error a
``where: what; fix`` problem (one naming the place the corpus names) or the
closing count, no traceback, the input byte-identical, and no output or
temporary file left in the output folder or beside the input.
"""

from __future__ import annotations

import pytest

from ._cli import assert_no_output, assert_refused, listing, run, sha256, sibling

CASES = sibling("workbook.corpus").CASES


def test_the_whole_corpus_is_here():
    assert len(CASES) >= 100


@pytest.mark.parametrize("case", CASES, ids=[c.name for c in CASES])
def test_corpus_case(case, tmp_path):
    src, out = tmp_path / "in", tmp_path / "out"
    src.mkdir()
    out.mkdir()
    path = case.builder(src)
    digest, beside = sha256(path), listing(src)

    ran = run("run", path, "--samples", "0", "--out", out)
    assert_refused(ran, case.where)
    assert_no_output(out, [])

    ran_here = run("run", path, "--samples", "0", "--quiet")  # outputs would go beside it
    assert_refused(ran_here, case.where)
    assert ran_here.problems == ran.problems

    checked = run("check", path)
    assert_refused(checked, case.where)
    assert checked.problems == ran.problems  # check finds what run finds, no more, no less

    assert sha256(path) == digest
    assert listing(src) == beside
