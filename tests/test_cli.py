"""The command line: exit codes, --json, overrides, refusal to replace foreign files."""

from __future__ import annotations

import hashlib
import json
import os
import subprocess
import sys
from html import escape

import pytest
from openpyxl import load_workbook
from openpyxl.utils import get_column_letter

from ranker.cli import main, parse_overrides
from ranker.errors import InputError


def _sha(path):
    return hashlib.sha256(path.read_bytes()).hexdigest()


def test_run_json_matches_workbook_ranking(direct_workbook, capsys):
    """The JSON's ranking equals the Ranking sheet of the results workbook."""
    before = _sha(direct_workbook)
    code = main(["run", str(direct_workbook), "--json", "--samples", "500"])
    out = capsys.readouterr().out
    assert code == 0
    summary = json.loads(out)  # standard output holds the JSON and nothing else
    for key in (
        "tool_version",
        "input_sha256",
        "weight_set",
        "weights",
        "primary_method",
        "ranking",
        "robustness",
        "excluded",
        "warnings",
        "outputs",
    ):
        assert key in summary
    assert summary["input_sha256"] == before
    assert abs(sum(summary["weights"].values()) - 1) < 1e-12
    ranks = [r["rank"] for r in summary["ranking"]]
    assert ranks == sorted(ranks)
    for row in summary["ranking"]:
        assert abs(sum(row["rank_acceptability"]) - 1) < 1e-9
    wb = load_workbook(summary["outputs"]["workbook"], read_only=True)
    rows = list(wb["Ranking"].iter_rows(min_row=4, values_only=True))
    sheet = [(r[0], r[1]) for r in rows if r[0] is not None]
    assert sheet == [(r["corridor_id"], r["rank"]) for r in summary["ranking"]]
    assert _sha(direct_workbook) == before  # the input is never modified


def test_weight_override_is_a_final_share_and_recorded(direct_workbook, capsys):
    code = main(
        ["run", str(direct_workbook), "--json", "--samples", "0", "--weight", "cost_musd=80"]
    )
    summary = json.loads(capsys.readouterr().out)
    assert code == 0
    # points 40, 40, 20: cost gets 80 %, the others share 20 % as 40 : 20
    assert summary["weights"]["cost_musd"] == pytest.approx(0.8, abs=1e-12)
    assert summary["weights"]["freight_share"] == pytest.approx(0.2 * 40 / 60, abs=1e-12)
    assert summary["weights"]["risk"] == pytest.approx(0.2 * 20 / 60, abs=1e-12)
    assert summary["weight_overrides"] == {"cost_musd": 80.0}


def test_weight_set_by_name(direct_workbook, capsys):
    code = main(["run", str(direct_workbook), "--json", "--samples", "0", "--weights", "growth"])
    summary = json.loads(capsys.readouterr().out)
    assert code == 0 and summary["weight_set"] == "growth"
    assert summary["weights"]["freight_share"] == pytest.approx(0.7)


def test_unknown_weight_set_is_input_error(direct_workbook, capsys):
    code = main(["run", str(direct_workbook), "--weights", "nosuch", "--samples", "0"])
    err = capsys.readouterr().err
    assert code == 2
    assert "--weights: no weight set named 'nosuch'" in err and "default" in err
    assert "Traceback" not in err


def test_refuses_to_replace_foreign_file(direct_workbook, capsys):
    foreign = direct_workbook.with_name("direct-ranked.html")
    foreign.write_text("<p>someone's notes</p>")
    code = main(["run", str(direct_workbook), "--samples", "0", "--quiet"])
    err = capsys.readouterr().err
    assert code == 2
    assert "was not written by ranker" in err
    assert foreign.read_text() == "<p>someone's notes</p>"
    assert not direct_workbook.with_name("direct-ranked.xlsx").exists()


def test_rerun_of_the_results_workbook_refreshes_it_in_place(direct_workbook, capsys):
    """Run, edit a weight in the results workbook, run that workbook: two outputs, edit kept."""
    assert main(["run", str(direct_workbook), "--samples", "0", "--json"]) == 0
    first = {r["corridor_id"]: r["rank"] for r in json.loads(capsys.readouterr().out)["ranking"]}
    out = direct_workbook.with_name("direct-ranked.xlsx")
    wb = load_workbook(out)
    ws = wb["Criteria"]
    heads = [c.value for c in ws[1]]
    col = heads.index("weight") + 1
    rows = {ws.cell(row=r, column=1).value: r for r in range(2, ws.max_row + 1)}
    cell = ws.cell(row=rows["risk"], column=col)
    assert cell.value == 20
    cell.value = 400  # risk (a cost) now dominates the weights
    wb.save(out)
    capsys.readouterr()
    assert main(["run", str(out), "--samples", "0", "--json"]) == 0
    summary = json.loads(capsys.readouterr().out)
    folder = sorted(p.name for p in direct_workbook.parent.iterdir())
    assert folder == ["direct-ranked.html", "direct-ranked.xlsx", "direct.xlsx"]
    assert summary["outputs"]["workbook"] == str(out)
    again = load_workbook(out)
    assert again["Criteria"].cell(row=rows["risk"], column=col).value == 400  # edit kept
    assert again.sheetnames.count("Ranking") == 1
    assert not any(name.startswith("Ranking (") for name in again.sheetnames)
    changes = summary["changes"]
    assert changes["previous"] == str(out)
    where = f"Criteria!{get_column_letter(col)}{rows['risk']}"
    assert {
        "cell": where,
        "label": "weight on Delivery risk in set default",
        "old": 20,
        "new": 400,
        "unit": "points",
    } in changes["inputs"]
    line = f"{where}, weight on Delivery risk in set default: 20 -> 400 points"
    run_info = [c.value for row in again["Run info"].iter_rows() for c in row if c.value]
    assert line in run_info  # the same list in the workbook ...
    html = out.with_suffix(".html").read_text(encoding="utf-8")
    assert escape(line) in html  # ... and on the justification sheet
    now = {r["corridor_id"]: r["rank"] for r in summary["ranking"]}
    moved = {m["corridor_id"]: (m["old_rank"], m["new_rank"]) for m in changes["moved"]}
    assert moved == {c: (first[c], now[c]) for c in now if first[c] != now[c]}
    assert moved  # the edit does move corridors
    for m in changes["moved"]:
        assert set(m) >= {"corridor_id", "old_rank", "new_rank", "old_tier", "new_tier"}


def test_running_the_input_again_compares_with_its_results(direct_workbook, capsys):
    assert main(["run", str(direct_workbook), "--samples", "0", "--quiet"]) == 0
    assert (
        main(["run", str(direct_workbook), "--samples", "0", "--json", "--weight", "risk=60"]) == 0
    )
    changes = json.loads(capsys.readouterr().out)["changes"]
    assert changes["previous"] == str(direct_workbook.with_name("direct-ranked.xlsx"))
    assert {
        "cell": "--weight",
        "label": "share of Delivery risk",
        "old": None,
        "new": 60.0,
        "unit": "%",
    } in changes["inputs"]
    assert sorted(p.name for p in direct_workbook.parent.iterdir()) == [
        "direct-ranked.html",
        "direct-ranked.xlsx",
        "direct.xlsx",
    ]


def test_missing_input_file(tmp_path, capsys):
    code = main(["check", str(tmp_path / "nothing.xlsx")])
    assert code == 2
    assert "nothing.xlsx" in capsys.readouterr().err


def test_check_ok(direct_workbook, capsys):
    assert main(["check", str(direct_workbook)]) == 0
    assert "no problems found" in capsys.readouterr().out


def test_template_refuses_existing(tmp_path, capsys):
    path = tmp_path / "t.xlsx"
    assert main(["template", str(path)]) == 0
    assert main(["template", str(path)]) == 2


def test_parse_overrides():
    assert parse_overrides(["a=1", "B = 2.5"]) == {"a": 1.0, "b": 2.5}
    assert parse_overrides(["a=40%"]) == {"a": 40.0}
    assert parse_overrides(["a=40"]) == {"a": 40.0}
    with pytest.raises(InputError, match="--weight: 'a' is not KEY=SHARE"):
        parse_overrides(["a"])


def test_internal_error_is_one_line_with_log(direct_workbook, capsys, monkeypatch):
    import ranker.cli as cli

    def boom(args, overrides):
        raise RuntimeError("unexpected")

    monkeypatch.setattr(cli, "run_once", boom)
    code = main(["run", str(direct_workbook)])
    err = capsys.readouterr().err
    assert code == 1
    assert err.count("\n") == 1 and "full log in" in err


def test_changes_name_tier_moves_and_the_samples(direct_workbook, capsys):
    """A corridor that keeps its rank but changes tier is listed with both tiers."""
    assert main(["run", str(direct_workbook), "--samples", "0", "--json"]) == 0
    before = {r["corridor_id"]: r for r in json.loads(capsys.readouterr().out)["ranking"]}
    assert main(["run", str(direct_workbook), "--samples", "400", "--json"]) == 0
    summary = json.loads(capsys.readouterr().out)
    now = {r["corridor_id"]: r for r in summary["ranking"]}
    expected = [
        {
            "corridor_id": c,
            "name": now[c]["name"],
            "old_rank": before[c]["rank"],
            "new_rank": now[c]["rank"],
            "old_tier": before[c]["tier"],
            "new_tier": now[c]["tier"],
        }
        for c in now
        if (before[c]["rank"], before[c]["tier"]) != (now[c]["rank"], now[c]["tier"])
    ]
    assert summary["changes"]["moved"] == sorted(
        expected, key=lambda m: (m["new_rank"], m["corridor_id"])
    )
    assert {
        "cell": "--samples",
        "label": "Monte Carlo samples",
        "old": 0,
        "new": 400,
        "unit": "samples",
    } in summary["changes"]["inputs"]


@pytest.mark.parametrize("given, want", [(None, "1"), ("3", "3")])
def test_one_blas_thread_unless_set(tmp_path, given, want):
    """The command line asks the linear-algebra library for one thread before numpy
    loads (its threads slow the thin products down on a busy machine), unless the
    user set OPENBLAS_NUM_THREADS."""
    code = (
        "import os, sys\n"
        "from ranker import cli\n"
        "assert 'numpy' not in sys.modules\n"
        f"cli.main(['check', {str(tmp_path / 'missing.xlsx')!r}])\n"
        "print(os.environ['OPENBLAS_NUM_THREADS'])\n"
    )
    env = {k: v for k, v in os.environ.items() if k != "OPENBLAS_NUM_THREADS"}
    if given:
        env["OPENBLAS_NUM_THREADS"] = given
    out = subprocess.run(
        [sys.executable, "-c", code], env=env, capture_output=True, text=True, check=True
    )
    assert out.stdout.strip().splitlines()[-1] == want


def test_the_command_line_leaves_its_objects_out_of_the_exit_collection(direct_workbook):
    """The real command line freezes the collector at its end; a call from code does not.

    Frozen objects are skipped by the collection at interpreter exit (the
    ``gc.freeze`` documentation); a program or test calling ``main(argv)``
    keeps its collector as it was, so repeated calls free their cycles.
    """
    import gc

    before = gc.get_freeze_count()
    assert main(["check", str(direct_workbook)]) == 0
    assert gc.get_freeze_count() == before
    probe = (
        "import atexit, gc, sys\n"
        "atexit.register(lambda: print('frozen', gc.get_freeze_count() > 0))\n"
        "from ranker.cli import main\n"
        "sys.argv = ['ranker', 'check', sys.argv[1]]\n"
        "sys.exit(main())\n"
    )
    out = subprocess.run(
        [sys.executable, "-c", probe, str(direct_workbook)], capture_output=True, text=True
    )
    assert out.returncode == 0, out.stderr
    assert out.stdout.strip().endswith("frozen True")
