"""``ranker run --watch``: re-run on save, survive half-written files, say what changed."""

from __future__ import annotations

import argparse
import threading
import time

from openpyxl import load_workbook

from ranker.cli import run_once
from ranker.watch import watch


def _args(path, out):
    return argparse.Namespace(
        input=path,
        out=out,
        weights=None,
        weight=[],
        samples=0,
        seed=None,
        json=False,
        quiet=False,
        watch=True,
    )


def test_watch_reruns_on_save_and_reports_changes(direct_workbook, tmp_path, capsys):
    results = []

    def recording(args, overrides):
        results.append(run_once(args, overrides))
        return results[-1]

    done = threading.Event()

    def run():
        watch(
            _args(direct_workbook, tmp_path), {}, recording, max_runs=2, poll_s=0.05, settle_s=0.1
        )
        done.set()

    thread = threading.Thread(target=run)
    thread.start()
    for _ in range(200):
        if results:
            break
        time.sleep(0.05)
    # a half-written save first: not a zip yet, so no run
    original = direct_workbook.read_bytes()
    direct_workbook.write_bytes(original[:100])
    time.sleep(0.4)
    assert len(results) == 1
    wb = load_workbook(__import__("io").BytesIO(original))
    for row in wb["Criteria"].iter_rows(min_row=2):
        if row[0].value == "cost_musd":
            row[[c.value for c in wb["Criteria"][1]].index("weight")].value = 90
    wb.save(direct_workbook)
    assert done.wait(30)
    thread.join()
    assert len(results) == 2
    out = capsys.readouterr().out
    assert "What changed since the last run" in out
    assert "weight on Cost in set default: 40 -> 90 points" in out


def test_watching_a_results_workbook_does_not_rerun_on_its_own_refresh(direct_workbook, tmp_path):
    """Running X-ranked.xlsx rewrites it; that write must not count as a save."""
    assert run_once(_args(direct_workbook, None), {}) is not None
    ranked = direct_workbook.with_name("direct-ranked.xlsx")
    runs = []

    def recording(args, overrides):
        runs.append(run_once(args, overrides))
        return runs[-1]

    done = threading.Event()

    def run():
        watch(_args(ranked, None), {}, recording, max_runs=2, poll_s=0.05, settle_s=0.05)
        done.set()

    thread = threading.Thread(target=run, daemon=True)
    thread.start()
    for _ in range(400):
        if runs:
            break
        time.sleep(0.05)
    assert len(runs) == 1
    done.wait(1.5)  # without the guard, the refresh itself starts a second run at once
    assert len(runs) == 1 and not done.is_set()
    wb = load_workbook(ranked)
    wb.save(ranked)  # the planner saves: now it runs again
    assert done.wait(60)
    assert len(runs) == 2
