"""The results workbook and the justification sheet, on the demo scenario.

Golden checks: the sheet's ranked table equals the JSON ranking, every corridor
has a card, every included criterion appears in the charts' legends, every
result sheet and chart is there, and user text is never markup or formula.
"""

from __future__ import annotations

import re
import shutil
import subprocess
from pathlib import Path

import pytest
from openpyxl import load_workbook

import ranker
from ranker.demo import write_demo

RESULT_SHEETS = [
    "Ranking",
    "Criteria matrix",
    "Normalised",
    "Weights used",
    "Methods",
    "Sizing",
    "Adoption path",
    "Robustness",
    "Tiers",
    "Weight ranges",
    "Futures",
    "Phasing",
    "Run info",
]


@pytest.fixture(scope="module")
def demo_run(tmp_path_factory):
    out = tmp_path_factory.mktemp("demo")
    path = write_demo(out)
    result = ranker.rank_workbook(path, samples=2000, seed=11)
    paths = ranker.write_outputs(result, out)
    return result, paths


def test_every_result_sheet_and_chart(demo_run):
    result, paths = demo_run
    wb = load_workbook(paths["workbook"])
    for name in RESULT_SHEETS:
        assert name in wb.sheetnames, name
    # every input sheet is kept, before the result sheets
    for name in result.inputs.sheet_names:
        assert name in wb.sheetnames
    assert wb.sheetnames.index("Ranking") > max(
        wb.sheetnames.index(n) for n in result.inputs.sheet_names
    )
    assert len(wb["Ranking"]._charts) == 1
    assert len(wb["Normalised"]._charts) == 1
    for name in RESULT_SHEETS:
        ws = wb[name]
        assert ws.freeze_panes is not None or name == "Run info"
        assert ws.tables, f"{name} has no Excel table"
    assert wb["ranker_state"].sheet_state == "veryHidden"


def test_robustness_title_says_the_samples_as_the_sheet_does(demo_run, tmp_path):
    """The Robustness sheet's title counts the samples as every output does (2,000, not
    2000) and says what they shake, in the words of the tiers' rule; without samples it
    says there were none."""
    from ranker.report.narrative import tier_rule

    result, paths = demo_run
    title = load_workbook(paths["workbook"], read_only=True)["Robustness"]["A1"].value
    assert title == "How sure is the order? 2,000 samples (weights and values shaken), seed 11"
    assert "2,000 samples (weights and values shaken)" in tier_rule(result)
    none = ranker.rank_workbook(result.inputs.path, samples=0)
    out = ranker.write_outputs(none, tmp_path)
    title = load_workbook(out["workbook"], read_only=True)["Robustness"]["A1"].value
    assert title == "How sure is the order? No Monte Carlo samples (--samples 0)"


def test_workbook_ranking_equals_json(demo_run):
    result, paths = demo_run
    summary = result.to_json()
    wb = load_workbook(paths["workbook"], read_only=True)
    rows = [r for r in wb["Ranking"].iter_rows(min_row=4, values_only=True) if r[0]]
    assert [(r[0], r[1]) for r in rows] == [
        (x["corridor_id"], x["rank"]) for x in summary["ranking"]
    ]


def test_json_tiers_follow_the_pairwise_shares(demo_run):
    """Tiers and shares as the contract pins them, and the tier rule holds on the shares."""
    result, paths = demo_run
    summary = result.to_json()
    ids = [e["corridor_id"] for e in summary["ranking"]]
    tiers = [e["tier"] for e in summary["ranking"]]
    wins = summary["robustness"]["pairwise_wins"]
    assert summary["robustness"]["pairwise_ids"] == ids  # 13 corridors: all of them
    assert len(wins) == len(ids) and all(len(row) == len(ids) for row in wins)
    assert tiers[0] == 1 and all(0 <= b - a <= 1 for a, b in zip(tiers, tiers[1:], strict=False))
    confidence = summary["robustness"]["tier_confidence"]
    assert confidence == 0.9  # the documented default of tier_confidence
    for i in range(len(ids)):
        assert wins[i][i] == 0.0
        for j in range(len(ids)):
            assert wins[i][j] + wins[j][i] <= 1.0 + 1e-12
            if tiers[i] < tiers[j]:
                assert wins[i][j] >= confidence
    # Each cut that is not a tier boundary has some pair across it below the level.
    for p in range(len(ids) - 1):
        if tiers[p] == tiers[p + 1]:
            across = [wins[i][j] for i in range(p + 1) for j in range(p + 1, len(ids))]
            assert min(across) < confidence
    wb = load_workbook(paths["workbook"], read_only=True)
    rows = [r for r in wb["Tiers"].iter_rows(min_row=7, values_only=True) if r[0]]
    assert [r[0] for r in rows] == ids
    assert [r[1] for r in rows] == tiers
    sheet = [list(r[2 : 2 + len(ids)]) for r in rows]
    assert (
        max(
            abs(a - b)
            for ra, rb in zip(sheet, wins, strict=True)
            for a, b in zip(ra, rb, strict=True)
        )
        < 1e-12
    )


def test_html_golden(demo_run):
    result, paths = demo_run
    html = open(paths["html"], encoding="utf-8").read()
    summary = result.to_json()
    table = html.split('<table class="ranked">')[1].split("</table>")[0]
    names = re.findall(r"<tr><td class=\"num\">(\d+)</td><td>([^<]+) <span", table)
    assert [(int(r), n) for r, n in names] == [(x["rank"], x["name"]) for x in summary["ranking"]]
    assert html.count('<article class="card">') == len(summary["ranking"])
    for c in result.criteria:
        assert c.label in html.split('id="charts"')[1].split('id="corridors"')[0], c.label
    # the demo has a budget, scenarios and several weight sets: each gets its section
    assert 'id="plan"' in html and "greedy plan (by rank)" in html
    assert "Futures" in html and "Do the weight sets agree?" in html
    for words in (
        "Planning-level estimates only",
        "Confirm grid capacity",
        "licensed engineers",
        result.inputs.sha256,
        "Approved by",
    ):
        assert words in html
    # self-contained: nothing is fetched (namespace names are not requests)
    assert not re.search(r"(src|href)\s*=\s*[\"']?(https?:)?//", html)
    assert "<script" not in html and "<link" not in html


def test_hostile_names_stay_text(tmp_path, workbooks):
    rows = [dict(r) for r in workbooks.corridors]
    rows[0]["name"] = "<img src=x onerror=alert(1)>"
    rows[1]["name"] = '=HYPERLINK("http://x","y")'
    path = workbooks.make(tmp_path / "hostile.xlsx", corridors=rows)
    wb = load_workbook(path)
    wb["Corridors"]["B3"].data_type = "s"  # typed as text, as a planner's '= would be
    wb.save(path)
    result = ranker.rank_workbook(path, samples=0)
    paths = ranker.write_outputs(result, tmp_path)
    html = open(paths["html"], encoding="utf-8").read()
    assert "<img src=x" not in html
    assert "&lt;img src=x onerror=alert(1)&gt;" in html
    wb = load_workbook(paths["workbook"])
    values = [
        c
        for row in wb["Ranking"].iter_rows()
        for c in row
        if c.value and "HYPERLINK" in str(c.value)
    ]
    assert values and all(c.data_type == "s" for c in values)


CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
FLAGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--host-resolver-rules=MAP * ~NOTFOUND",
]


def _chromium(tmp_path, *args, timeout=90):
    profile = tmp_path / "profile"
    return subprocess.run(
        [CHROMIUM, *FLAGS, f"--user-data-dir={profile}", "--enable-logging=stderr", *args],
        capture_output=True,
        text=True,
        timeout=timeout,
    )


@pytest.mark.slow
@pytest.mark.skipif(CHROMIUM is None, reason="Debian's chromium is not installed")
def test_chromium_renders_and_prints(demo_run, tmp_path):
    import matplotlib.image as mpimg

    _, paths = demo_run
    url = "file://" + paths["html"]
    shot = tmp_path / "shot.png"
    run = _chromium(tmp_path, f"--screenshot={shot}", "--window-size=1280,2400", url)
    assert shot.exists(), run.stderr[-2000:]
    pixels = mpimg.imread(shot)
    assert pixels.std() > 0.05  # not blank
    assert "Uncaught" not in run.stderr
    pdf = tmp_path / "sheet.pdf"
    _chromium(tmp_path, f"--print-to-pdf={pdf}", "--no-pdf-header-footer", url)
    pages = len(re.findall(rb"/Type\s*/Page[^s]", pdf.read_bytes()))
    assert pages >= 2


@pytest.mark.slow
@pytest.mark.skipif(CHROMIUM is None, reason="Debian's chromium is not installed")
def test_chromium_hostile_name_triggers_nothing(tmp_path, workbooks):
    rows = [dict(r) for r in workbooks.corridors]
    rows[0]["name"] = "<img src=x onerror=alert(1)>"
    path = workbooks.make(tmp_path / "hostile.xlsx", corridors=rows)
    result = ranker.rank_workbook(path, samples=0)
    paths = ranker.write_outputs(result, tmp_path)
    run = _chromium(tmp_path, "--dump-dom", "file://" + paths["html"])
    assert "<img" not in run.stdout
    assert "&lt;img src=x onerror=alert(1)&gt;" in run.stdout
    assert "alert" not in run.stderr.replace("onerror=alert(1)", "")


def test_brief_says_why_the_first_ranked_corridor_waits(demo_run):
    """The demo's plan funds cheaper tier-1 corridors first; page one says so, with figures
    recomputed here from the plan tables (score per million USD of capital)."""
    from ranker.report.narrative import first_ranked_waits

    result, paths = demo_run
    first = result.ranking.index[0]
    greedy = result.plan.greedy.set_index("corridor_id")
    optimised = result.plan.optimised.set_index("corridor_id")
    was, now = greedy.at[first, "year_funded"], optimised.at[first, "year_funded"]
    sentence = first_ranked_waits(result)
    if not now > was:  # the plan keeps rank order for the first corridor: nothing to explain
        assert sentence == ""
        return
    instead = optimised[optimised["year_funded"] == was]
    per = instead["score"].sum() / instead["capital_usd"].sum() * 1e6
    own = optimised.at[first, "score"] / optimised.at[first, "capital_usd"] * 1e6
    assert per > own
    assert f"waits until {int(now)}" in sentence and f"money of {int(was)}" in sentence
    assert f"{per:.3g} score per million USD against its {own:.3g}" in sentence
    html = Path(paths["html"]).read_text(encoding="utf-8")
    brief = html[html.index("Board brief") : html.index("A. The ranked order")]
    assert "waits until" in brief
