"""The JSON summary of the contract (ranker.report.summary), built from small runs.

Checked against outside references where one exists: the input's SHA-256
against :mod:`hashlib`, the installed version against
:func:`importlib.metadata.version`, the TOPSIS scores against pymcdm's TOPSIS
(vector normalisation, the default ``topsis_normalization``; Hwang & Yoon
1981 pp. 128-134), the weights against the points typed (40, 40, 20 points
are shares 0.4, 0.4, 0.2), and the whole against strict JSON (no NaN).
"""

from __future__ import annotations

import hashlib
import json
from importlib.metadata import version
from types import SimpleNamespace

import numpy as np
import pandas as pd
import pytest

from ranker import rank_workbook
from ranker.report.summary import (
    ACCEPTABILITY_COLUMNS,
    SHOWN_CORRIDORS,
    folded_acceptability,
    has_samples,
    summary_json,
)
from tests.conftest import DIRECT_CORRIDORS, make_workbook

pytestmark = pytest.mark.filterwarnings("ignore:Alternatives with indices")

#: The fields the contract names (SPEC, "JSON summary"); more may be added.
CONTRACT = {
    "tool_version",
    "input_sha256",
    "weight_set",
    "weights",
    "primary_method",
    "ranking",
    "robustness",
    "changes",
    "excluded",
    "warnings",
    "outputs",
}
RANKING_FIELDS = {"corridor_id", "name", "rank", "scores", "ranks", "criteria"}
RANKING_FIELDS |= {"rank_acceptability", "tier"}


@pytest.fixture(scope="module")
def run(tmp_path_factory):
    path = make_workbook(tmp_path_factory.mktemp("summary") / "in.xlsx")
    return path, rank_workbook(path, samples=300, seed=11)


def test_documented_limits():
    assert ACCEPTABILITY_COLUMNS == 25
    assert SHOWN_CORRIDORS == 40


def test_contract_fields_and_strict_json(run):
    path, result = run
    out = summary_json(result)
    assert CONTRACT <= set(out)
    json.dumps(out, allow_nan=False)  # strict JSON: no NaN or infinity anywhere
    assert out["input_sha256"] == hashlib.sha256(path.read_bytes()).hexdigest()
    assert out["tool_version"] == version("ranker")
    assert out["weight_set"] == "default" and out["primary_method"] == "topsis"
    # 40, 40 and 20 points on the Criteria sheet.
    assert out["weights"] == pytest.approx({"cost_musd": 0.4, "freight_share": 0.4, "risk": 0.2})
    assert out["excluded"] == []
    assert set(out["changes"]) >= {"previous", "inputs", "criteria", "moved"}


def test_ranking_entries(run):
    from pymcdm.methods import TOPSIS
    from pymcdm.normalizations import vector_normalization

    _, result = run
    ranking = summary_json(result)["ranking"]
    assert all(set(e) >= RANKING_FIELDS for e in ranking)
    ranks = [e["rank"] for e in ranking]
    assert ranks == sorted(ranks)  # sorted by rank
    given = {r["corridor_id"]: r for r in DIRECT_CORRIDORS}
    keys = ["cost_musd", "freight_share", "risk"]
    for e in ranking:
        row = given[e["corridor_id"]]
        assert e["name"] == row["name"]
        assert e["criteria"] == {k: pytest.approx(row[k]) for k in keys}
    ids = [e["corridor_id"] for e in ranking]
    matrix = np.array([[given[c][k] for k in keys] for c in ids], dtype=float)
    theirs = TOPSIS(vector_normalization)(matrix, np.array([0.4, 0.4, 0.2]), np.array([-1, 1, -1]))
    ours = [e["scores"]["topsis"] for e in ranking]
    np.testing.assert_allclose(ours, theirs, rtol=0, atol=1e-9)
    assert [e["ranks"]["topsis"] for e in ranking] == ranks


def test_rank_acceptability_rows_sum_to_one(run):
    _, result = run
    out = summary_json(result)
    n = len(out["ranking"])
    for e in out["ranking"]:
        row = e["rank_acceptability"]
        assert len(row) == n and sum(row) == pytest.approx(1.0, abs=1e-12)
        assert out["rank_acceptability"][e["corridor_id"]] == row
    wins = np.array(out["robustness"]["pairwise_wins"])
    assert wins.shape == (n, n)
    assert out["robustness"]["pairwise_ids"] == [e["corridor_id"] for e in out["ranking"]]
    assert out["robustness"]["samples"] == 300


def test_robustness_records_carry_their_sentences(run):
    _, result = run
    rob = summary_json(result)["robustness"]
    for record in rob["rank_reversal"]:
        keys = list(record)
        assert "facts" not in record  # its numbers stay inside the details
        assert keys.index("sentence") == keys.index("details") + 1
        assert isinstance(record["sentence"], str) and record["sentence"]
    assert all(t["sentence"] for t in rob["tipping_points"])
    assert all("sentence" in r for r in rob["rank_intervals"])
    assert all("reason" in r and "basis" not in r for r in rob["closeness"])


def test_without_samples(tmp_path):
    result = rank_workbook(make_workbook(tmp_path / "in.xlsx"), samples=0)
    out = summary_json(result)
    assert out["rank_acceptability"] == {}
    assert all(e["rank_acceptability"] == [] for e in out["ranking"])
    assert out["robustness"]["samples"] == 0
    json.dumps(out, allow_nan=False)


def test_one_corridor_has_no_stress_test(tmp_path):
    path = make_workbook(tmp_path / "in.xlsx", corridors=DIRECT_CORRIDORS[:1])
    out = summary_json(rank_workbook(path, samples=50))
    assert out["robustness"] == {"samples": 50, "rank_reversal": [], "tipping_points": []}
    assert [e["corridor_id"] for e in out["ranking"]] == ["A"]
    # A lone corridor is its own ideal and anti-ideal: TOPSIS closeness 0.5 (the
    # kernel's documented rule where d+ = d- = 0).
    assert out["ranking"][0]["scores"]["topsis"] == 0.5
    json.dumps(out, allow_nan=False)


# -- the small helpers -----------------------------------------------------------


def _acceptability(n_ranks):
    rng = np.random.default_rng(n_ranks)
    shares = rng.dirichlet(np.ones(n_ranks), size=3)
    cols = [f"rank {k + 1}" for k in range(n_ranks)]
    return pd.DataFrame(shares, index=["A", "B", "C"], columns=cols)


@pytest.mark.parametrize("n_ranks", [1, 25, 26])
def test_folded_acceptability_keeps_up_to_26_columns(n_ranks):
    # Up to columns + 1 ranks, folding would only rename the last column.
    table = _acceptability(n_ranks)
    assert folded_acceptability(table) is table


@pytest.mark.parametrize("n_ranks", [27, 40])
def test_folded_acceptability_folds_the_tail(n_ranks):
    table = _acceptability(n_ranks)
    out = folded_acceptability(table)
    assert list(out.columns) == [f"rank {k + 1}" for k in range(25)] + ["rank 26 or later"]
    pd.testing.assert_frame_equal(out.iloc[:, :25], table.iloc[:, :25])
    np.testing.assert_allclose(out["rank 26 or later"], table.iloc[:, 25:].sum(axis=1))
    np.testing.assert_allclose(out.sum(axis=1), 1.0)  # rows still sum to 1
    assert table.shape[1] == n_ranks  # the input is not changed


def test_folded_acceptability_other_width():
    out = folded_acceptability(_acceptability(6), columns=3)
    assert list(out.columns) == ["rank 1", "rank 2", "rank 3", "rank 4 or later"]


def test_has_samples():
    assert has_samples(None) is False
    assert has_samples(SimpleNamespace(acceptability=pd.DataFrame())) is False
    assert has_samples(SimpleNamespace(acceptability=_acceptability(2))) is True
