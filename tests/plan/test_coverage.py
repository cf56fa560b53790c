"""Coverage view: places joined by funded corridors, year by year."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import sparse
from scipy.sparse.csgraph import connected_components

from ranker.plan import build_plan, parse_connects
from ranker.plan.coverage import first_joined
from ranker.report.words.plan import coverage_sentence


@pytest.mark.parametrize(
    ("text", "pair"),
    [
        ("Northport-Lakeside", ("Northport", "Lakeside")),
        ("  Northport  -  Lakeside ", ("Northport", "Lakeside")),
        ("Northport\u2013Lakeside", ("Northport", "Lakeside")),
        ("Port-Ville - Lakeside", ("Port-Ville", "Lakeside")),
        ("Port\u2010Ville-Lakeside", ("Port\u2010Ville", "Lakeside")),  # a hyphen in a name
        ("North  port-Lakeside", ("North port", "Lakeside")),
        ("", None),
        ("   ", None),
        (float("nan"), None),
        (None, None),
    ],
)
def test_parse_connects(text, pair):
    assert parse_connects(text) == pair


@pytest.mark.parametrize(
    ("text", "match"),
    [
        ("Northport", "A-B"),
        ("A-B-C", "A-B"),
        ("Northport-", "A-B"),
        ("Lakeside-lakeside", "A-B"),
    ],
)
def test_parse_connects_errors(text, match):
    with pytest.raises(ValueError, match=match):
        parse_connects(text)


@pytest.mark.parametrize(
    "text",
    [
        "Northport-Lakeside",
        "  Northport  -  Lakeside ",
        "Port-Ville - Lake Town",
        "North \u2013 South",
        "Port\u2010Ville-Lake",
        "Port\u2011Ville-Lake",
        "North  port-Lake",
        "A -B",
        "Northport",
        "A-B-C",
        "-B",
        "A-a",
        "A\u2212B",
    ],
)
def test_the_plan_reads_connects_as_the_reader_checks_it(text):
    """One rule: what the reader accepts the coverage view splits the same way; no other text.

    The view then makes runs of spaces inside a name one (docs/phasing.md).
    """
    from ranker.workbook.schema import split_connects

    try:
        want = split_connects(text)
    except ValueError:
        with pytest.raises(ValueError):
            parse_connects(text)
    else:
        assert parse_connects(text) == tuple(" ".join(name.split()) for name in want)


def _hand_plan(endpoints=None, connects=None):
    """A small hand graph: Northport - Lakeside - Eastvale - Ridgeton, plus a
    Northport - Ridgeton shortcut. 10 a year, no carry-over; each corridor
    costs 10, so rank order puts one corridor in each year: C1 2027, C2 2028,
    C3 2029, C4 2030."""
    ids = ["C1", "C2", "C3", "C4"]
    connects = connects or [
        "Northport-Lakeside",
        "Lakeside-Eastvale",
        "Eastvale-Ridgeton",
        "Northport-Ridgeton",
    ]
    return build_plan(
        pd.Series([10.0] * 4, index=ids),
        pd.Series([0.9, 0.8, 0.7, 0.6], index=ids),
        pd.Series([1, 2, 3, 4], index=ids),
        pd.DataFrame({"year": [2027, 2028, 2029, 2030], "capital_usd": [10.0] * 4}),
        carry_over=False,
        connects=pd.Series(connects, index=ids),
        endpoints=endpoints,
    )


def test_hand_graph_named_endpoints():
    p = _hand_plan(endpoints=["northport", "Eastvale"])  # case does not matter
    cov = p.coverage
    assert cov["endpoints"] == ["Northport", "Eastvale"]
    assert cov["connected_year"] == {"greedy": 2028, "optimised": 2028}
    assert cov["funded_set"]["greedy"] == ["C1", "C2"]
    assert coverage_sentence(cov).startswith(
        "Northport and Eastvale are first joined by electrified "
        "corridors in 2028 under the optimised plan"
    )


def test_hand_graph_all_places_by_default():
    """With no endpoints named, all four places must be joined: by 2029 (C1-C3)."""
    cov = _hand_plan().coverage
    assert cov["rule"] == "all places"
    assert cov["connected_year"]["greedy"] == 2029
    assert coverage_sentence(cov).startswith(
        "The places named in connects (Northport, Lakeside, Eastvale and Ridgeton)"
    )


def test_never_joined():
    p = _hand_plan(
        connects=["Northport-Lakeside", "Eastvale-Ridgeton", "", "Lakeside-Northport"],
        endpoints=["Northport", "Ridgeton"],
    )
    assert p.coverage["possible"] is False
    assert p.coverage["connected_year"] == {"greedy": None, "optimised": None}
    assert "cannot be joined" in coverage_sentence(p.coverage)


def test_an_endpoint_no_planned_corridor_connects_leaves_the_view_out():
    """The reader refuses a place no corridor names (its cell); one that only corridors
    screened out of the plan name cannot be joined, and the plan says why."""
    p = _hand_plan(endpoints=["Northport", "Southgate"])
    assert p.coverage is None
    assert p.warnings[-1] == {"kind": "endpoints_not_planned", "places": ["Southgate"]}


def test_bad_connects_is_a_value_error():
    with pytest.raises(
        ValueError, match="connects of corridor C2, 'Lakeside': write the two places"
    ):
        _hand_plan(connects=["Northport-Lakeside", "Lakeside", "Eastvale-Ridgeton", ""])


def test_endpoints_without_connects_warn():
    ids = ["C1"]
    p = build_plan(
        pd.Series([1.0], index=ids),
        pd.Series([1.0], index=ids),
        pd.Series([1], index=ids),
        pd.DataFrame({"year": [2027], "capital_usd": [1.0]}),
        endpoints=["Northport"],
    )
    assert p.coverage is None
    assert p.warnings == [{"kind": "endpoints_without_connects_column"}]


@pytest.mark.parametrize(
    ("endpoints", "record"),
    [
        (None, {"kind": "no_connects"}),
        (["Northport", "Lakeside"], {"kind": "endpoints_without_connects"}),
    ],
)
def test_blank_connects_leave_the_view_out(endpoints, record):
    p = _hand_plan(endpoints=endpoints, connects=["", " ", "", ""])
    assert p.coverage is None
    assert p.warnings == [record]


def test_one_endpoint_named_twice_is_too_few():
    p = _hand_plan(endpoints=["Northport", " northport "])
    assert p.coverage is None
    assert p.warnings == [{"kind": "endpoints_too_few", "places": ["Northport"]}]


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.integers(2, 7), st.integers(1, 10), st.integers(1, 4), st.integers(0, 2**32 - 1))
def test_first_joined_against_union_find(n_nodes, m, years, seed):
    """Against scipy's connected components on the graph of each year (the library)."""
    rng = np.random.default_rng(seed)
    edges = rng.integers(0, n_nodes, (m, 2))
    edges[rng.random(m) < 0.1] = -1
    completed = rng.integers(-1, years, m)
    ends = np.unique(rng.choice(n_nodes, size=rng.integers(2, n_nodes + 1), replace=False))
    expect = -1
    for t in range(years):
        live = [
            tuple(e) for e, c in zip(edges, completed, strict=True) if e[0] >= 0 and 0 <= c <= t
        ]
        pairs = np.array(live, dtype=int).reshape(-1, 2)
        graph = sparse.csr_matrix(
            (np.ones(len(pairs)), (pairs[:, 0], pairs[:, 1])), shape=(n_nodes, n_nodes)
        )
        _, label = connected_components(graph, directed=False)
        if len({label[e] for e in ends}) == 1:
            expect = t
            break
    assert first_joined(edges, n_nodes, ends, completed, years) == expect


def test_first_joined_against_networkx():
    """The same on random graphs with networkx's connected components."""
    nx = pytest.importorskip("networkx")
    rng = np.random.default_rng(3)
    for _ in range(50):
        n_nodes = int(rng.integers(2, 9))
        edges = rng.integers(0, n_nodes, (int(rng.integers(1, 12)), 2))
        g = nx.Graph()
        g.add_nodes_from(range(n_nodes))
        g.add_edges_from(map(tuple, edges))
        ends = np.array([0, n_nodes - 1])
        joined = nx.has_path(g, 0, n_nodes - 1)
        got = first_joined(edges, n_nodes, ends, np.zeros(len(edges), int), 1)
        assert got == (0 if joined else -1)
