"""The hand-drawn SVG charts against matplotlib, the library they replace.

Each chart is read back the way a person reads it: the tick labels give the
value axis (a straight-line fit of tick position against tick value), the
row labels give each bar's row. The bars read back that way must be the bars
matplotlib draws from the same data (its patches' extents in data
coordinates), the ticks must be the ticks matplotlib's ``MaxNLocator`` picks,
and the colours must be matplotlib's ``cividis``.
"""

from __future__ import annotations

import string
import xml.etree.ElementTree as ET

import matplotlib
import numpy as np
import pandas as pd
import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st
from matplotlib.colors import to_hex
from matplotlib.figure import Figure
from matplotlib.font_manager import FontProperties
from matplotlib.textpath import TextToPath
from matplotlib.ticker import MaxNLocator

from ranker.report import charts, svg

NS = "{http://www.w3.org/2000/svg}"


def _read(text: str):
    """Return (axis fit, row label centres, rects with their hover text) of a band chart."""
    root = ET.fromstring(text)
    ticks, labels = [], {}
    for t in root.iter(NS + "text"):
        x, y = float(t.get("x")), float(t.get("y"))
        if t.get("text-anchor") == "middle" and t.get("font-size") == "11":
            ticks.append((float(t.text), x))
        elif t.get("text-anchor") == "end":
            labels[t.text] = y
    values, px = np.array(ticks).T
    slope, icept = np.polyfit(values, px, 1)  # px = slope * value + icept
    rects = []
    for r in root.iter(NS + "rect"):
        title = r.find(NS + "title")
        if title is None:
            continue
        x0 = (float(r.get("x")) - icept) / slope
        x1 = (float(r.get("x")) + float(r.get("width")) - icept) / slope
        yc = float(r.get("y")) + float(r.get("height")) / 2
        rects.append({"x0": x0, "x1": x1, "y": yc, "tip": title.text, "fill": r.get("fill")})
    return (slope, icept), labels, rects


def _row_of(y: float, labels: dict[str, float]) -> str:
    return min(labels, key=lambda k: abs(labels[k] - y))


def _mpl_bars(rows, starts, widths):
    """matplotlib's own barh patches for the same data: {(row, x0, x1)}."""
    fig = Figure()
    ax = fig.add_subplot()
    patches = ax.barh(rows, widths, left=starts)
    return sorted(
        (float(p.get_y() + p.get_height() / 2), float(p.get_x()), float(p.get_x() + p.get_width()))
        for p in patches
    )


def test_score_bars_are_matplotlibs_bars():
    # Random data (no published figure needed: the reference is matplotlib
    # drawing the same numbers).
    rng = np.random.default_rng(1)
    scores = np.sort(rng.uniform(0.05, 0.95, 9))[::-1]
    labels = [f"{i + 1}. corridor {chr(65 + i)}" for i in range(9)]
    _, rowpos, rects = _read(charts.score_bars(labels, scores, method="topsis"))
    ours = sorted((labels.index(_row_of(r["y"], rowpos)), r["x0"], r["x1"]) for r in rects)
    ref = _mpl_bars(np.arange(9), np.zeros(9), scores)
    assert [o[0] for o in ours] == [round(r[0]) for r in ref]
    np.testing.assert_allclose([o[1:] for o in ours], [r[1:] for r in ref], atol=2e-4)
    # Rank 1 is the top bar, as matplotlib's inverted y axis draws it.
    assert [r["y"] for r in sorted(rects, key=lambda r: r["x1"], reverse=True)] == sorted(
        r["y"] for r in rects
    )


def test_contribution_stacks_are_matplotlibs_stacks():
    rng = np.random.default_rng(2)
    contrib = pd.DataFrame(rng.uniform(0, 0.2, (6, 4)), columns=list("abcd"))
    labels = [f"{i + 1}. corridor {i}" for i in range(6)]
    names = {"a": "Readiness", "b": "Cost", "c": "Revenue", "d": "Headroom"}
    _, rowpos, rects = _read(charts.contribution_bars(contrib, labels, names))
    ours = sorted((labels.index(_row_of(r["y"], rowpos)), r["x0"], r["x1"]) for r in rects)
    ref = []
    left = np.zeros(6)
    for key in contrib.columns:
        ref += _mpl_bars(np.arange(6), left.copy(), contrib[key].to_numpy())
        left += contrib[key].to_numpy()
    ref.sort()
    np.testing.assert_allclose(np.array(ours), np.array(ref), atol=2e-4)
    text = charts.contribution_bars(contrib, labels, names)
    assert all(n in text for n in names.values())  # the legend names every criterion


def test_plan_gantt_spans_are_the_plans_years():
    opt = pd.DataFrame(
        {
            "corridor_id": ["A", "B", "C"],
            "year_funded": [2027, 2029, np.nan],
            "year_started": [np.nan, 2028, np.nan],
        }
    )
    greedy = pd.DataFrame(
        {
            "corridor_id": ["A", "B", "C"],
            "year_funded": [2028, np.nan, 2027],
            "year_started": [2027, np.nan, np.nan],
        }
    )
    labels = {"A": "1. Alpha", "B": "2. Beta", "C": "3. Gamma"}
    _, rowpos, rects = _read(charts.plan_gantt(greedy, opt, labels))
    got = sorted(
        (_row_of(r["y"], rowpos), round(r["x0"], 3), round(r["x1"], 3), r["fill"] == "none")
        for r in rects
    )
    # A year funded covers [year, year + 1); a carried-over build starts earlier.
    assert got == [
        ("1. Alpha", 2027, 2028, False),
        ("1. Alpha", 2027, 2029, True),
        ("2. Beta", 2028, 2030, False),
        ("3. Gamma", 2027, 2028, True),
    ]


def test_tipping_markers_sit_at_the_weights():
    tips = [
        {"kind": "top", "criterion": "cost", "current_weight": 0.3, "weight_at": 0.45},
        {"kind": "top", "criterion": "grid", "current_weight": 0.2, "weight_at": 0.05},
        {"kind": "pair", "criterion": "grid", "current_weight": 0.2, "weight_at": 0.9},
    ]
    text = charts.tipping_chart(tips, {"cost": "Capital cost", "grid": "Grid headroom"})
    (slope, icept), rowpos, _ = _read(text)
    root = ET.fromstring(text)
    circles = {
        c.find(NS + "title").text.split(":")[0]: (float(c.get("cx")) - icept) / slope
        for c in root.iter(NS + "circle")
    }
    assert circles == pytest.approx({"Capital cost": 0.3, "Grid headroom": 0.2}, abs=1e-4)
    assert len(list(root.iter(NS + "polygon"))) == 2  # the pair tip is not a top change
    assert charts.tipping_chart(tips[2:], {}) == ""


def test_heatmap_cells_take_cividis_of_their_share():
    acc = pd.DataFrame(
        [[0.7, 0.3, 0.0], [0.3, 0.5, 0.2], [0.0, 0.2, 0.8]],
        columns=["rank 1", "rank 2", "rank 3"],
    )
    root = ET.fromstring(charts.acceptability_heatmap(acc, ["A", "B", "C"]))
    cmap = matplotlib.colormaps["cividis"]
    cells = [r for r in root.iter(NS + "rect") if r.find(NS + "title") is not None]
    assert len(cells) == 9
    for r, v in zip(cells, acc.to_numpy().ravel(), strict=True):
        assert r.get("fill") == to_hex(cmap(v))


@settings(max_examples=300, deadline=None)
@given(st.floats(0, 1))
def test_cividis_equals_matplotlib(v):
    # matplotlib's cividis (Nuñez, Anderton and Renslow 2018), 256 entries.
    assert svg.cividis(v) == to_hex(matplotlib.colormaps["cividis"](v))


def _mpl_ticks(lo, hi, bins, integer=False):
    loc = MaxNLocator(nbins=bins, steps=[1, 2, 2.5, 5, 10], integer=integer)
    ticks = loc.tick_values(lo, hi)
    span = hi - lo
    return [t for t in ticks if lo - 1e-9 * span <= t <= hi + 1e-9 * span]


@settings(max_examples=400, deadline=None)
@given(
    st.floats(-1e6, 1e6),
    st.floats(1e-3, 1e6),
    st.integers(2, 10),
)
def test_nice_ticks_equal_matplotlib_maxnlocator(lo, span, bins):
    hi = lo + span
    # Where the range divides exactly into a round step, float rounding alone
    # decides between two steps (in matplotlib too); leave those ties out.
    raw = span / bins
    mant = raw / 10 ** np.floor(np.log10(raw))
    assume(min(abs(mant - m) for m in (1, 2, 2.5, 5, 10)) > 1e-6)
    np.testing.assert_allclose(
        svg.nice_ticks(lo, hi, bins=bins), _mpl_ticks(lo, hi, bins), rtol=1e-9, atol=1e-9 * span
    )


@settings(max_examples=200, deadline=None)
@given(st.integers(1990, 2080), st.integers(1, 40))
def test_integer_ticks_equal_matplotlib_for_years(start, years):
    lo, hi = start - 0.25, start + years + 0.25
    bins = min(10, max(2, int(hi - lo)))
    assert svg.nice_ticks(lo, hi, bins=bins, integer=True) == _mpl_ticks(lo, hi, bins, True)


def test_ascii_widths_are_dejavu_sans():
    # The table is DejaVu Sans's advance widths; matplotlib ships the font.
    t2p, font = TextToPath(), FontProperties(family="DejaVu Sans", size=100)
    for ch in string.ascii_letters + string.digits + string.punctuation:
        w = t2p.get_text_width_height_descent(ch, font, ismath=False)[0]
        assert svg.text_width(ch, 100) == pytest.approx(w, abs=1.0), ch


@settings(max_examples=200, deadline=None)
@given(st.text(alphabet=string.ascii_letters + string.digits + " .,()-/'&é", max_size=40))
def test_label_widths_err_wide(text):
    # Kerning only narrows a string, so the sum of advances is an upper bound.
    w = TextToPath().get_text_width_height_descent(
        text or " ", FontProperties(family="DejaVu Sans", size=12), ismath=False
    )[0]
    assert svg.text_width(text or " ") >= w - 0.5


def test_long_labels_are_shortened_with_an_ellipsis():
    long = "A corridor name far longer than any board would want to read in a chart " * 3
    text = charts.score_bars([long, "short"], np.array([0.5, 0.4]), method="topsis")
    _, rowpos, _ = _read(text)
    shown = next(k for k in rowpos if k.startswith("A corridor"))
    assert shown.endswith("…") and svg.text_width(shown) <= charts.WIDTH * charts.LABEL_SHARE
    assert long.strip() in text  # the hover text keeps the full name


@settings(max_examples=200, deadline=None)
@given(st.text(max_size=120), st.floats(20.0, 400.0))
def test_shortened_text_is_the_longest_prefix_that_fits(text, width):
    got = svg.fit_text(text, width)
    if svg.text_width(text) <= width:
        assert got == text
        return
    # Reference: try every prefix (quadratic, fine for short text).
    room = width - svg.text_width("…")
    cut = max(c for c in range(len(text) + 1) if svg.text_width(text[:c]) <= room)
    assert got == text[:cut].rstrip() + "…"
    assert svg.text_width(got) <= width + 1e-9


def test_a_long_criterion_label_stays_inside_the_legend():
    contrib = pd.DataFrame({"a": [0.2, 0.1], "b": [0.1, 0.3]})
    names = {"a": "Readiness " * 40, "b": "Cost"}
    root = ET.fromstring(charts.contribution_bars(contrib, ["1. A", "2. B"], names))
    legend = [t.text for t in root.iter(NS + "text") if t.text and t.text.startswith("Readiness")]
    assert legend and all(svg.text_width(t) <= charts.WIDTH for t in legend)


def test_a_name_of_excel_s_longest_cell_is_shortened_quickly():
    # 32,767 characters is the most an Excel cell holds (common practice).
    got = svg.fit_text("Corridor " * 3641, 300.0)
    assert got.endswith("…") and len(got) < 60


def test_text_is_escaped_and_the_drawing_is_well_formed():
    bad = '<script>alert("x")</script> & "quotes"'
    text = charts.score_bars([bad], np.array([0.3]), method="topsis")
    root = ET.fromstring(text)  # well-formed XML
    assert not list(root.iter(NS + "script"))
    assert any(bad in (t.text or "") for t in root.iter(NS + "text"))
