"""The README's walk-through, run as written in a fresh folder, works step by step."""

from __future__ import annotations

import json
import re
import shlex
from pathlib import Path

from openpyxl import load_workbook

from ranker.cli import main
from ranker.demo import fill_demo

README = Path(__file__).resolve().parents[1] / "README.md"


def _walk_through_commands() -> list[str]:
    text = README.read_text(encoding="utf-8")
    section = text[text.index("## Walk-through") : text.index("Other options:")]
    return re.findall(r"`(ranker [^`]+)`", section)


def test_the_walk_through_commands_are_the_ones_this_test_runs():
    assert _walk_through_commands() == [
        "ranker template corridors.xlsx",
        "ranker check corridors.xlsx",
        "ranker run corridors.xlsx",
        "ranker run corridors.xlsx --weights freight",
        "ranker run corridors.xlsx --weight capital_cost=40",
        "ranker run corridors-ranked.xlsx",
        "ranker run corridors.xlsx --watch",
    ]


def _ranker(command: str, capsys) -> tuple[int, str, str]:
    argv = shlex.split(command)[1:]
    code = main(argv)
    out = capsys.readouterr()
    return code, out.out, out.err


def test_walk_through_step_by_step(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    steps = iter(_walk_through_commands())
    # 1. Get the template.
    assert _ranker(next(steps), capsys)[0] == 0
    template = load_workbook("corridors.xlsx")
    assert template.sheetnames[0] == "How to fill in"
    assumptions = template["Assumptions"]
    assert [c.value for c in assumptions[1]][:3] == ["key", "value", "default"]
    assert all(row[1].value is None for row in assumptions.iter_rows(min_row=2))
    # 2. Fill it in (the invented demo data, typed into the template as a planner would).
    fill_demo(template)
    template.save("corridors.xlsx")
    # 3. Check it.
    code, out, err = _ranker(next(steps), capsys)
    assert code == 0, err
    assert "no problems found" in out
    # 4. Run it.
    code, out, err = _ranker(next(steps), capsys)
    assert code == 0, err
    assert "Ranking by topsis" in out and "weights: " in out
    assert sorted(p.name for p in tmp_path.iterdir()) == [
        "corridors-ranked.geojson",  # the demo gives positions (Places)
        "corridors-ranked.html",
        "corridors-ranked.xlsx",
        "corridors.xlsx",
    ]
    results = load_workbook("corridors-ranked.xlsx")
    assert "Contents" in results.sheetnames and "Live weights" in results.sheetnames
    # 5. Adjust weights and re-run: another set, then one share.
    code, out, err = _ranker(next(steps), capsys)
    assert code == 0, err
    assert "weight set 'freight'" in out
    code, out, err = _ranker(next(steps), capsys)
    assert code == 0, err
    assert "Capital cost 40.0%" in out
    # ... then an edit in the results workbook, and a run of that workbook.
    results = load_workbook("corridors-ranked.xlsx")
    criteria = results["Criteria"]
    heads = [c.value for c in criteria[1]]
    for row in criteria.iter_rows(min_row=2):
        if row[0].value == "capital_cost":
            row[heads.index("weight")].value = 60
    results.save("corridors-ranked.xlsx")
    command = next(steps)
    code, out, err = _ranker(command + " --json", capsys)
    assert code == 0, err
    summary = json.loads(out)
    assert sorted(p.name for p in tmp_path.iterdir()) == [
        "corridors-ranked.geojson",  # the demo gives positions (Places)
        "corridors-ranked.html",
        "corridors-ranked.xlsx",
        "corridors.xlsx",
    ]
    assert any(
        c["label"].startswith("weight on Capital cost") and c["new"] == 60
        for c in summary["changes"]["inputs"]
    )
    html = (tmp_path / "corridors-ranked.html").read_text(encoding="utf-8")
    assert "What changed since the last run" in html
    # --watch runs until Ctrl-C; tests/test_watch.py drives it with a run limit.
    assert next(steps).endswith("--watch")
