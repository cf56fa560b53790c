"""The SVG drawing kit (ranker.report.svg), checked on its own.

* :func:`nice_ticks` against matplotlib's ``MaxNLocator(nbins, steps=[1, 2,
  2.5, 5, 10])`` on hand-picked axes (the module's documented reference),
  and its edge cases (empty, reversed, infinite limits);
* :func:`cividis` against matplotlib's ``cividis`` (Nuñez, Anderton and
  Renslow, PLoS ONE 13(7): e0199239, 2018) at the ends and the clipping;
* :func:`text_width`, :func:`fit_text`, :func:`tick_text` and the
  :class:`Canvas` marks, read back as XML.

The random cross-checks against matplotlib live beside the charts
(``tests/report/test_charts.py``).
"""

from __future__ import annotations

import math
import xml.etree.ElementTree as ET

import pytest

from ranker.report import svg

NS = "{http://www.w3.org/2000/svg}"


def _mpl_ticks(lo, hi, bins, integer=False):
    ticker = pytest.importorskip("matplotlib.ticker")
    loc = ticker.MaxNLocator(nbins=bins, steps=[1, 2, 2.5, 5, 10], integer=integer)
    span = hi - lo
    return [float(t) for t in loc.tick_values(lo, hi) if lo - 1e-9 * span <= t <= hi + 1e-9 * span]


@pytest.mark.parametrize(
    "lo, hi, bins, integer",
    [
        (0.0, 1.0, 5, False),  # the score axis
        (0.0, 0.37, 5, False),
        (-3.2, 7.9, 4, False),
        (0.0, 12.5e6, 5, False),  # money in USD
        (1e-5, 3e-5, 3, False),
        (2025.75, 2041.25, 8, True),  # budget years
        (-0.25, 3.25, 3, True),  # a count
        (0.0, 0.9, 6, True),  # integer ticks on a range under 1
    ],
)
def test_nice_ticks_equal_maxnlocator(lo, hi, bins, integer):
    got = svg.nice_ticks(lo, hi, bins=bins, integer=integer)
    want = _mpl_ticks(lo, hi, bins, integer)
    assert got == pytest.approx(want, rel=1e-9, abs=1e-9 * (hi - lo))


def test_nice_ticks_worked_by_hand():
    # Range 1 in at most 5 bins: raw step 0.2, so steps of 0.2 from 0 to 1.
    assert svg.nice_ticks(0.0, 1.0) == [0.0, 0.2, 0.4, 0.6, 0.8, 1.0]
    # 0..100 in 4 bins: raw 25 = 2.5 x 10, so 0, 25, 50, 75, 100.
    assert svg.nice_ticks(0.0, 100.0, bins=4) == [0.0, 25.0, 50.0, 75.0, 100.0]
    # Whole years 2026..2030 (5 bins of at least 1 year): every year.
    assert svg.nice_ticks(2025.5, 2030.5, bins=5, integer=True) == [
        2026.0, 2027.0, 2028.0, 2029.0, 2030.0,
    ]  # fmt: skip
    # No binary noise: 0.1 + 0.2 prints as 0.3.
    assert 0.3 in svg.nice_ticks(0.0, 0.5, bins=5)


def test_nice_ticks_degenerate_axes():
    assert svg.nice_ticks(2.0, 2.0) == [2.0]  # hi == lo: the one value
    assert svg.nice_ticks(3.0, 1.0) == [3.0]  # reversed limits
    assert svg.nice_ticks(math.nan, 1.0) == []
    assert svg.nice_ticks(0.0, math.inf) == [0.0]
    assert svg.nice_ticks(-math.inf, 0.0) == []


def test_cividis_ends_and_clipping_equal_matplotlib():
    matplotlib = pytest.importorskip("matplotlib")
    from matplotlib.colors import to_hex

    cmap = matplotlib.colormaps["cividis"]
    for v in (0.0, 1 / 256, 0.5, 255 / 256, 1.0):
        assert svg.cividis(v) == to_hex(cmap(v)), v
    # Below 0 and above 1 clip to the ends (matplotlib's under and over colours).
    assert svg.cividis(-0.5) == to_hex(cmap(0.0)) == to_hex(cmap(-0.5))
    assert svg.cividis(7.0) == to_hex(cmap(1.0)) == to_hex(cmap(7.0))


def test_cividis_table_and_non_finite():
    # The first and last entries of the published 256-colour table.
    assert svg.cividis(0.0) == "#00224e"
    assert svg.cividis(1.0) == "#fee838"
    assert len(svg._CIVIDIS) == 6 * 256
    assert svg.cividis(math.nan) == svg.cividis(0.0)  # no value: the bottom colour


def test_text_width_sums_advance_widths():
    # DejaVu Sans advances (hundredths of an em): "A" 69, "i" 28, space 32.
    assert svg.text_width("A", 100) == pytest.approx(69.0)
    assert svg.text_width("Ai A") == pytest.approx((69 + 28 + 32 + 69) / 100 * svg.FONT_PX)
    assert svg.text_width("") == 0.0
    # Outside ASCII: 0.8 em for Latin and Greek, 1 em for wide scripts.
    assert svg.text_width("é", 10) == pytest.approx(8.0)
    assert svg.text_width("中", 10) == pytest.approx(10.0)
    assert svg.FONT_PX == 12.0


def test_fit_text():
    assert svg.fit_text("Alpha", 1000.0) == "Alpha"  # fits: unchanged
    exact = svg.text_width("Alpha")
    assert svg.fit_text("Alpha", exact) == "Alpha"  # exactly as wide still fits
    cut = svg.fit_text("Alpha Bravo Charlie", 60.0)
    assert cut.endswith("…") and svg.text_width(cut) <= 60.0
    assert "Alpha Bravo Charlie".startswith(cut[:-1])
    assert svg.fit_text("Alpha Bravo", svg.text_width("Alpha …")) == "Alpha…"  # no space kept
    assert svg.fit_text("Alpha", 1.0) == "…"  # no room for any letter


@pytest.mark.parametrize(
    "value, want",
    [(0.2, "0.2"), (2030.0, "2030"), (1.5e6, "1.5e+06"), (0.0, "0"), (-0.25, "-0.25")],
)
def test_tick_text(value, want):
    assert svg.tick_text(value) == want


def test_canvas_draws_every_mark_as_well_formed_svg():
    c = svg.Canvas(100.4, 50.2, title='Scores & "ranks"')
    c.rect(1, 2, 30.555, -4, fill="#123456", stroke="#000", stroke_width=0.5, tip="<b>A</b>")
    c.rect(0, 0, 1, 1, fill="#fff", crisp=True)
    c.line(0, 0, 10, 10, stroke="#333", width=2)
    c.circle(5, 5, 2.5, fill="red", tip="C & D")
    c.diamond(10, 10, 3, fill="blue")
    c.text(4, 8, "Alpha <1>", anchor="end", rotate=-90, bold=True)
    root = ET.fromstring(c.svg())
    assert root.tag == NS + "svg"
    # Width and height rounded up to whole pixels.
    assert (root.get("width"), root.get("height"), root.get("viewBox")) == (
        "101",
        "51",
        "0 0 101 51",
    )
    assert root.get("aria-label") == 'Scores & "ranks"'
    assert root.find(NS + "title").text == 'Scores & "ranks"'
    rects = root.findall(NS + "rect")
    assert rects[0].get("width") == f"{30.555:.2f}"  # two decimals
    assert rects[0].get("height") == "0.00"  # a negative size is drawn empty
    assert rects[0].get("stroke-width") == "0.5"
    assert rects[0].find(NS + "title").text == "<b>A</b>"  # hover text, escaped
    assert rects[1].get("shape-rendering") == "crispEdges" and rects[1].find(NS + "title") is None
    line = root.find(NS + "line")
    assert (line.get("x2"), line.get("stroke-width")) == ("10.00", "2")
    circle = root.find(NS + "circle")
    assert (circle.get("r"), circle.find(NS + "title").text) == ("2.5", "C & D")
    # A diamond of half-diagonal 3 about (10, 10): top, right, bottom, left.
    assert root.find(NS + "polygon").get("points") == (
        "10.00,7.00 13.00,10.00 10.00,13.00 7.00,10.00"
    )
    text = root.find(NS + "text")
    assert text.text == "Alpha <1>"
    assert text.get("text-anchor") == "end" and text.get("font-weight") == "600"
    assert text.get("transform") == "rotate(-90 4.00 8.00)"
    assert text.get("font-size") == "12"


def test_empty_canvas():
    root = ET.fromstring(svg.Canvas(0, 0, title="").svg())
    assert root.get("viewBox") == "0 0 0 0" and len(root) == 1  # the title alone
