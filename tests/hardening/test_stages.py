"""What only the later stages catch, and the edge cases that must run, end to end.

Each case of ``cases.STAGES`` goes through ``ranker run`` and ``ranker check``:
a refusal is exit 2 with a ``where: what; fix`` message naming the place and
nothing written; a legal edge case is exit 0 with its warning and both
outputs; the input is byte-identical afterwards either way.
"""

from __future__ import annotations

import pytest

from ._cli import assert_no_output, assert_no_traceback, assert_refused, listing, run, sha256
from .cases import STAGES

OUTPUTS = ["input-ranked.html", "input-ranked.xlsx"]
LEGAL = [s for s in STAGES if s.code == 0]


def build(case, tmp_path):
    """Build a case's input in ``tmp_path``; return (input, run options with --out)."""
    (tmp_path / "out").mkdir(exist_ok=True)
    path, extra = case.build(tmp_path)
    if "--out" not in extra:
        extra = [*extra, "--out", str(tmp_path / "out")]
    return path, extra


@pytest.mark.parametrize("case", STAGES, ids=[s.name for s in STAGES])
def test_run(case, tmp_path):
    path, extra = build(case, tmp_path)
    digest = sha256(path)
    before = listing(tmp_path / "out")
    outcome = run("run", path, "--samples", "200", *extra)  # a case's own --samples wins
    assert_no_traceback(outcome)
    if case.code == 2:
        assert_refused(outcome, case.where)
        assert case.says in outcome.err, outcome.err
        assert_no_output(tmp_path / "out", before)
    else:
        assert outcome.code == 0, outcome.err
        assert any(case.says in w for w in outcome.warnings), outcome.err
        assert set(OUTPUTS) <= set(listing(tmp_path / "out"))
    assert sha256(path) == digest  # the input is never modified


@pytest.mark.parametrize("case", STAGES, ids=[s.name for s in STAGES])
def test_check(case, tmp_path):
    path, _ = build(case, tmp_path)
    digest = sha256(path)
    outcome = run("check", path)
    assert_no_traceback(outcome)
    assert outcome.code == case.check, outcome.err
    if case.check == 2:
        assert_refused(outcome, case.where)
    assert sha256(path) == digest


@pytest.mark.parametrize("case", LEGAL, ids=[s.name for s in LEGAL])
def test_no_python_warning_reaches_the_terminal(case, tmp_path):
    """A library's warning would print on the planner's terminal as a source line."""
    path, extra = build(case, tmp_path)
    outcome = run("run", path, *extra)
    assert outcome.code == 0, outcome.err
    assert outcome.caught == [], outcome.caught
