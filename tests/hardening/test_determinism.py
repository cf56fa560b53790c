"""Same input and seed, same results: run after run, and in fresh processes.

The invented demo scenario is ranked with 500 Monte Carlo samples twice in
this process and once in a new interpreter with another hash seed (so any
dependence on set order from ``PYTHONHASHSEED`` shows). The JSON
summaries must be equal but for ``started`` and ``outputs``; every cell of
every result sheet, and the justification page, equal but for the run's
timestamp.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest
from openpyxl import load_workbook

from ranker.demo import write_demo
from ranker.report.workbook import SHEETS_PROPERTY

from ._cli import run

REPO = Path(__file__).resolve().parents[2]
SAMPLES = "500"
VARYING = ("started", "outputs")


@pytest.fixture(scope="module")
def demo(tmp_path_factory) -> Path:
    return write_demo(tmp_path_factory.mktemp("demo"))


def _in_process(demo: Path, out: Path) -> dict:
    out.mkdir()
    outcome = run("run", demo, "--samples", SAMPLES, "--json", "--out", out)
    assert outcome.code == 0, outcome.err
    return json.loads(outcome.out)


def _fresh_process(demo: Path, out: Path, hash_seed: str) -> dict:
    out.mkdir()
    path = os.pathsep.join(p for p in (str(REPO), os.environ.get("PYTHONPATH", "")) if p)
    env = {**os.environ, "PYTHONPATH": path, "PYTHONHASHSEED": hash_seed}
    done = subprocess.run(
        [sys.executable, "-m", "ranker", "run", str(demo), "--samples", SAMPLES, "--json"]
        + ["--out", str(out)],
        capture_output=True,
        text=True,
        env=env,
        cwd=out,
        timeout=180,
        check=False,
    )
    assert done.returncode == 0, done.stderr
    assert "Traceback" not in done.stderr
    return json.loads(done.stdout)  # standard output holds the JSON and nothing else


def _stable(summary: dict) -> dict:
    return {k: v for k, v in summary.items() if k not in VARYING}


def _result_cells(summary: dict) -> dict:
    """Every cell value of every result sheet, the run's timestamp replaced."""
    path = summary["outputs"]["workbook"]
    stamp = summary["started"]
    wb = load_workbook(path)
    names = next(p.value for p in wb.custom_doc_props.props if p.name == SHEETS_PROPERTY)
    cells = {}
    for name in str(names).split("\n"):
        for row in wb[name].iter_rows():
            for c in row:
                v = c.value
                if isinstance(v, str):
                    v = v.replace(stamp, "<started>")
                cells[(name, c.coordinate)] = v
    assert any(v == "<started>" for (sheet, _), v in cells.items() if sheet == "Run info")
    return cells


def _page(summary: dict) -> str:
    text = Path(summary["outputs"]["html"]).read_text(encoding="utf-8")
    assert summary["started"] in text
    return text.replace(summary["started"], "<started>")


def test_same_results_run_after_run(demo, tmp_path):
    first = _in_process(demo, tmp_path / "first")
    assert first["robustness"]["samples"] == int(SAMPLES)
    assert len(first["ranking"]) >= 10
    second = _in_process(demo, tmp_path / "second")
    assert _stable(first) == _stable(second)
    assert _result_cells(first) == _result_cells(second)
    assert _page(first) == _page(second)
    # the seed is really used: another one moves the rank acceptabilities, not the ranking
    (tmp_path / "other").mkdir()
    other = run(
        "run", demo, "--samples", SAMPLES, "--seed", "1", "--json", "--out", tmp_path / "other"
    )
    third = json.loads(other.out)
    ids = [r["corridor_id"] for r in first["ranking"]]
    assert [r["corridor_id"] for r in third["ranking"]] == ids
    assert [r["rank_acceptability"] for r in third["ranking"]] != [
        r["rank_acceptability"] for r in first["ranking"]
    ]


def test_same_results_in_a_fresh_process(demo, tmp_path):
    """A new interpreter with a fixed hash seed (this one's is random) gives the same."""
    here = _in_process(demo, tmp_path / "here")
    fresh = _fresh_process(demo, tmp_path / "fresh", "4242")
    assert _stable(fresh) == _stable(here)
    assert _result_cells(fresh) == _result_cells(here)
    assert _page(fresh) == _page(here)
