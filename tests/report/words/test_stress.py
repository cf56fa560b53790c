"""Every stress warning record has words, and the words quote its fields."""

from __future__ import annotations

import numpy as np
import pytest

from ranker.report.words import Namer
from ranker.report.words.stress import stress_warning, stress_warnings
from ranker.score.topsis import topsis
from ranker.stress import WARNING_KINDS, stress_test

SAMPLE = {
    "total": 1.5,
    "criterion": "cost",
    "corridors": ["A", "B"],
    "corridor": "A",
    "criteria": ["cost", "risk"],
    "draws": 1234,
    "samples": 10000,
}


@pytest.mark.parametrize("kind", sorted(WARNING_KINDS))
def test_every_kind_has_words_that_quote_its_fields(kind):
    namer = Namer({"A": "Alpha link"}, {"cost": "Capital cost", "risk": "Delivery risk"})
    rec = {"kind": kind, **{f: SAMPLE[f] for f in WARNING_KINDS[kind]}}
    text = stress_warning(rec, namer)
    assert text and text[0].isupper() and text.endswith(".")
    quoted = {
        "total": "1.5",
        "criterion": "Capital cost",
        "corridors": "Alpha link (A) and corridor B",
        "corridor": "Alpha link (A)",
        "criteria": "Capital cost and Delivery risk",
        "draws": "1,234",
        "samples": "10,000",
    }
    for field in WARNING_KINDS[kind]:
        assert quoted[field] in text, (kind, field, text)


def test_an_unknown_kind_is_refused():
    with pytest.raises(ValueError, match="no words"):
        stress_warning({"kind": "mystery"}, Namer())


def test_the_stress_stage_only_returns_known_kinds_with_their_fields():
    import pandas as pd

    m = pd.DataFrame(
        {"k0": [1.0, 1.0, 3.0], "k1": [2.0, 2.0, 2.0]},
        index=pd.Index(["A", "B", "C"], name="corridor_id"),
    )
    r = stress_test(m, {"k0": 2.0, "k1": 0.0}, {"k0": True, "k1": True}, kernel=topsis, samples=0)
    kinds = [w["kind"] for w in r.warnings]
    assert {"weights_rescaled", "constant_criterion", "identical", "dominates"} <= set(kinds)
    for w in r.warnings:
        assert set(w) == {"kind", *WARNING_KINDS[w["kind"]]}
    assert len(stress_warnings(r.warnings)) == len(r.warnings)
    assert np.isclose(next(w for w in r.warnings if w["kind"] == "weights_rescaled")["total"], 2.0)
