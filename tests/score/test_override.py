"""``--weight KEY=SHARE``: one meaning for points, rank and pairwise sets."""

from __future__ import annotations

import json

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.cli import main
from ranker.errors import InputError
from ranker.score.override import apply_shares, parse_shares, small_share_warnings
from tests.conftest import DIRECT_CRITERIA, make_workbook

KEYS = ["cost_musd", "freight_share", "risk"]


def _criteria_with_sets():
    rows = []
    for row, rank in zip(DIRECT_CRITERIA, (2, 1, 3), strict=True):
        rows.append({**row, "weight:ordered:rank": rank})
    return rows


# Pairwise judgments (AHP 1-9 scale), consistent: cost 2x freight, 4x risk.
PAIRWISE = [
    {"criterion": "cost_musd", "cost_musd": 1, "freight_share": 2, "risk": 4},
    {"criterion": "freight_share", "freight_share": 1, "risk": 2},
    {"criterion": "risk", "risk": 1},
]


@pytest.fixture
def three_kinds(tmp_path):
    path = make_workbook(tmp_path / "kinds.xlsx", criteria=_criteria_with_sets())
    from openpyxl import load_workbook

    wb = load_workbook(path)
    ws = wb["Pairwise"]
    ws.delete_rows(1, ws.max_row)
    ws.cell(row=1, column=1, value="criterion")
    for j, k in enumerate(KEYS, start=2):
        ws.cell(row=1, column=j, value=k)
    for i, row in enumerate(PAIRWISE, start=2):
        for j, k in enumerate(["criterion", *KEYS], start=1):
            if k in row:
                ws.cell(row=i, column=j, value=row[k])
    wb.save(path)
    return path


def _run(path, capsys, *extra):
    code = main(["run", str(path), "--json", "--samples", "0", *extra])
    out = capsys.readouterr()
    assert code == 0, out.err
    return json.loads(out.out)


def test_same_final_share_for_points_rank_and_pairwise(three_kinds, capsys):
    """The named criterion gets exactly its share; the others keep their ratios (to 1e-12)."""
    for name in ("default", "ordered", "pairwise"):
        plain = _run(three_kinds, capsys, "--weights", name)["weights"]
        tuned = _run(three_kinds, capsys, "--weights", name, "--weight", "risk=35")["weights"]
        assert tuned["risk"] == pytest.approx(0.35, abs=1e-12), name
        assert sum(tuned.values()) == pytest.approx(1.0, abs=1e-12)
        ratio = plain["cost_musd"] / plain["freight_share"]
        assert tuned["cost_musd"] / tuned["freight_share"] == pytest.approx(ratio, rel=1e-12)
        scale = (1 - 0.35) / (1 - plain["risk"])
        assert tuned["cost_musd"] == pytest.approx(plain["cost_musd"] * scale, abs=1e-12)


@pytest.mark.parametrize(
    "flags, message",
    [
        (["risk=140"], "outside 0-100"),
        (["risk=-5"], "outside 0-100"),
        (["risk=60", "cost_musd=50"], "sum to 110"),
        (["risk=20", "risk=30"], "given twice"),
        (["speed=20"], "not an included criterion"),
        (["risk=abc"], "is not KEY=SHARE"),
    ],
)
def test_bad_shares_exit_2(three_kinds, capsys, flags, message):
    argv = ["run", str(three_kinds), "--samples", "0"]
    for f in flags:
        argv += ["--weight", f]
    assert main(argv) == 2
    err = capsys.readouterr().err
    assert message in err and "Traceback" not in err


def test_small_share_warns_that_it_is_percent(three_kinds, capsys):
    summary = _run(three_kinds, capsys, "--weight", "risk=0.4")
    assert summary["weights"]["risk"] == pytest.approx(0.004, abs=1e-12)
    assert (
        "--weight risk=0.4 is read as 0.4 % of the weight (not 40 %); write risk=40 for 40 %"
        in (summary["warnings"])
    )


def test_small_shares_are_records_of_the_shares_at_or_below_one():
    """Shares of 0 and above 1 are meant as percent; 0 < share <= 1 may be a fraction."""
    assert small_share_warnings({"a": 0.0, "b": 0.5, "c": 1.0, "d": 1.5, "e": 40.0}) == [
        {"kind": "small_share", "criterion": "b", "share": 0.5},
        {"kind": "small_share", "criterion": "c", "share": 1.0},
    ]


def test_percent_sign_is_the_same_share():
    assert parse_shares(["a=40%"]) == parse_shares(["a=40"]) == {"a": 40.0}


def test_every_criterion_named_must_sum_to_100():
    with pytest.raises(InputError, match="not 100"):
        apply_shares({"a": 0.5, "b": 0.5}, {"a": 30.0, "b": 30.0}, ["a", "b"])
    assert apply_shares({"a": 0.5, "b": 0.5}, {"a": 30.0, "b": 70.0}, ["a", "b"]) == {
        "a": 0.3,
        "b": 0.7,
    }


@settings(max_examples=200, deadline=None)
@given(
    st.lists(st.floats(0.01, 10.0), min_size=3, max_size=6),
    st.floats(0.0, 100.0),
)
def test_shares_keep_proportions(raw, share):
    keys = [f"k{i}" for i in range(len(raw))]
    total = sum(raw)
    weights = {k: v / total for k, v in zip(keys, raw, strict=True)}
    out = apply_shares(weights, {"k0": share}, keys)
    assert out["k0"] == pytest.approx(share / 100, abs=1e-12)
    assert sum(out.values()) == pytest.approx(1.0, abs=1e-12)
    if share < 100:
        for k in keys[2:]:
            assert out[k] / out["k1"] == pytest.approx(weights[k] / weights["k1"], rel=1e-9)
