"""Charts for the justification sheet, as inline SVG drawn by :mod:`.svg`.

Colours come from the Okabe-Ito colour-blind-safe palette (Okabe and Ito,
"Color Universal Design", 2008); the heatmap uses ``cividis``, designed to
read the same for common colour-vision deficiencies (Nuñez, Anderton and
Renslow, PLoS ONE 13(7), 2018). Every bar, cell and marker carries its exact
value as hover text, so a number read off a chart can be traced to the tables.
"""

from __future__ import annotations

import math

import numpy as np
import pandas as pd

from .svg import FONT_PX, Canvas, cividis, fit_text, nice_ticks, text_width, tick_text

OKABE_ITO = [
    "#0072B2",
    "#E69F00",
    "#009E73",
    "#CC79A7",
    "#56B4E9",
    "#D55E00",
    "#F0E442",
    "#000000",
]

WIDTH = 760.0  # drawing width [px]; the page scales it down to fit
ROW = 24.0  # height of one band [px]
AXIS = "#5a5a5a"
LABEL_SHARE = 0.42  # most of the width that row labels may take [-]


def row_labels(labels: list[str]) -> tuple[list[str], float]:
    """Shorten row labels to the label column; return them and the plot's left edge [px]."""
    shown = [fit_text(t, WIDTH * LABEL_SHARE) for t in labels]
    widest = max((text_width(t) for t in shown), default=0.0)
    return shown, min(widest * 1.04, WIDTH * LABEL_SHARE) + 14.0


class BandChart:
    """Rows of labels on the left, a horizontal value axis at the bottom.

    Row ``i`` (0 at the top) is centred at :meth:`y`; values map linearly
    from ``[xmin, xmax]`` to the plot's width by :meth:`x`.
    """

    def __init__(
        self,
        labels: list[str],
        *,
        xmin: float,
        xmax: float,
        xlabel: str,
        title: str,
        right: float = 16.0,
        integer: bool = False,
        legend: list[tuple[str, str, bool]] | None = None,
    ) -> None:
        self.labels, self.left = row_labels(labels)
        self.right = WIDTH - right
        self.top = 8.0
        self.bottom = self.top + ROW * len(labels)
        self.xmin, self.xmax = xmin, xmax if xmax > xmin else xmin + 1.0
        self.ticks = nice_ticks(
            self.xmin,
            self.xmax,
            bins=min(10, max(2, int(self.xmax - self.xmin))) if integer else 5,
            integer=integer,
        )
        room = self.right - self.left
        self.legend = [(fit_text(t, room - 40), c, f) for t, c, f in legend or []]
        rows, self._legend_rows = _legend_layout(self.legend, room)
        height = self.bottom + 44.0 + (22.0 * rows + 6.0 if rows else 0.0)
        self.canvas = Canvas(WIDTH, height, title=title)
        self.xlabel = xlabel

    def x(self, value: float) -> float:
        """Horizontal position of ``value`` [px]."""
        span = self.xmax - self.xmin
        return self.left + (value - self.xmin) / span * (self.right - self.left)

    def y(self, row: float) -> float:
        """Vertical centre of row ``row`` [px]."""
        return self.top + ROW * (row + 0.5)

    def bar(
        self,
        row: int,
        start: float,
        end: float,
        *,
        fill: str,
        stroke: str | None = None,
        offset: float = 0.0,
        height: float = 0.7,
        tip: str,
    ) -> None:
        """Draw a bar from ``start`` to ``end`` in ``row``; ``offset``/``height`` in rows."""
        x0, x1 = sorted((self.x(start), self.x(end)))
        h = height * ROW
        self.canvas.rect(
            x0,
            self.y(row + offset) - h / 2,
            x1 - x0,
            h,
            fill=fill,
            stroke=stroke,
            stroke_width=1.5 if stroke else 1.0,
            tip=tip,
        )

    def svg(self) -> str:
        """Draw the axes, labels and legend under the marks and return the SVG."""
        c = self.canvas
        marks, c.parts = c.parts, []
        for t in self.ticks:
            xt = self.x(t)
            c.line(xt, self.top, xt, self.bottom, stroke="#e6e6e6")
        c.parts += marks
        c.line(self.left, self.top, self.left, self.bottom, stroke=AXIS)
        c.line(self.left, self.bottom, self.right, self.bottom, stroke=AXIS)
        for t in self.ticks:
            xt = self.x(t)
            c.line(xt, self.bottom, xt, self.bottom + 4, stroke=AXIS)
            c.text(xt, self.bottom + 13, tick_text(t), anchor="middle", size=FONT_PX - 1)
        for i, label in enumerate(self.labels):
            c.text(self.left - 8, self.y(i), label, anchor="end")
        c.text((self.left + self.right) / 2, self.bottom + 32, self.xlabel, anchor="middle")
        y = self.bottom + 56
        for row in self._legend_rows:
            x = (self.left + self.right - row[0]) / 2
            for (label, colour, filled), width in row[1]:
                c.rect(
                    x,
                    y - 6,
                    16,
                    12,
                    fill=colour if filled else "none",
                    stroke=None if filled else colour,
                    stroke_width=1.5,
                )
                c.text(x + 22, y, label)
                x += width
            y += 22
        return c.svg()


def _legend_layout(items, width):
    """Split legend items into centred rows that fit ``width`` [px]."""
    rows: list[tuple[float, list]] = []
    current: list = []
    used = 0.0
    for item in items:
        w = 22 + text_width(item[0]) + 18
        if current and used + w > width:
            rows.append((used, current))
            current, used = [], 0.0
        current.append((item, w))
        used += w
    if current:
        rows.append((used, current))
    return len(rows), rows


def score_bars(labels: list[str], scores: np.ndarray, *, method: str) -> str:
    """Horizontal bars of each corridor's score, rank 1 at the top."""
    scores = np.asarray(scores, dtype=float)
    top = max(1e-9, float(np.nanmax(scores))) if scores.size else 1.0
    chart = BandChart(
        labels,
        xmin=0.0,
        xmax=top * 1.15,
        xlabel=f"{method} score [-] (higher is better)",
        title=f"Score by corridor ({method})",
    )
    for i, (label, s) in enumerate(zip(labels, scores, strict=True)):
        chart.bar(i, 0.0, s, fill=OKABE_ITO[0], tip=f"{label}: {method} score {s:.4f}")
        chart.canvas.text(chart.x(s) + 4, chart.y(i), f"{s:.3f}", size=FONT_PX - 1)
    return chart.svg()


def contribution_bars(
    contributions: pd.DataFrame, labels: list[str], criterion_labels: dict[str, str]
) -> str:
    """Stacked bars of each criterion's weighted-sum contribution per corridor."""
    values = contributions.to_numpy(dtype=float)
    total = float(np.nanmax(values.sum(axis=1))) if values.size else 1.0
    names = [criterion_labels.get(k, k) for k in contributions.columns]
    colours = [OKABE_ITO[i % len(OKABE_ITO)] for i in range(len(names))]
    chart = BandChart(
        labels,
        xmin=0.0,
        xmax=max(total, 1e-9) * 1.05,
        xlabel="weighted-sum score [-], split by criterion",
        title="What each criterion contributes to each corridor's weighted-sum score",
        legend=[(n, c, True) for n, c in zip(names, colours, strict=True)],
    )
    for i, label in enumerate(labels):
        left = 0.0
        for j, name in enumerate(names):
            v = values[i, j]
            chart.bar(
                i,
                left,
                left + v,
                fill=colours[j],
                stroke="#ffffff",
                tip=f"{label}: {name} contributes {v:.4f}",
            )
            left += v
    return chart.svg()


def acceptability_heatmap(acceptability: pd.DataFrame, labels: list[str]) -> str:
    """Heatmap of the rank acceptability matrix (share of samples per rank)."""
    data = acceptability.to_numpy(dtype=float)
    n, k = data.shape
    ticks = [str(c).replace("rank ", "") for c in acceptability.columns]
    shown, left = row_labels(labels)
    bar_w = 80.0  # colour bar with its ticks and title
    cell_w = min(48.0, (WIDTH - left - bar_w) / max(k, 1))
    rotate = k > 15
    tick_room = max(text_width(t, FONT_PX - 1) for t in ticks) + 8 if rotate else 18.0
    top = 8.0
    bottom = top + ROW * n
    width = left + cell_w * k + bar_w
    c = Canvas(width, bottom + tick_room + 30, title="Rank acceptability heatmap")
    annotate = n <= 20 and k <= 26  # numbers stay legible
    for i in range(n):
        for j in range(k):
            v = data[i, j]
            x, y = left + j * cell_w, top + i * ROW
            tip = f"{labels[i]}: rank {ticks[j]} in {v:.2%}"
            c.rect(x, y, cell_w, ROW, fill=cividis(v), tip=tip, crisp=True)
            if annotate and v >= 0.005:
                c.text(
                    x + cell_w / 2,
                    y + ROW / 2,
                    f"{v:.0%}",
                    anchor="middle",
                    size=FONT_PX - 2,
                    fill="#000000" if v > 0.55 else "#ffffff",
                )
    for i, label in enumerate(shown):
        c.text(left - 8, top + ROW * (i + 0.5), label, anchor="end")
    for j, t in enumerate(ticks):
        x = left + (j + 0.5) * cell_w
        if rotate:
            c.text(x, bottom + 6, t, anchor="end", size=FONT_PX - 1, rotate=-90)
        else:
            c.text(x, bottom + 11, t, anchor="middle", size=FONT_PX - 1)
    c.text(left + cell_w * k / 2, bottom + tick_room + 14, "rank taken [-]", anchor="middle")
    # Colour bar: 64 bands of the exact map colours, 0 at the bottom.
    bx, bands = left + cell_w * k + 14, 64
    for b in range(bands):
        h = (bottom - top) / bands
        c.rect(bx, bottom - (b + 1) * h, 12, h, fill=cividis((b + 0.5) / bands), crisp=True)
    for t in nice_ticks(0.0, 1.0):
        y = bottom - t * (bottom - top)
        c.line(bx + 12, y, bx + 16, y, stroke=AXIS)
        c.text(bx + 19, y, tick_text(t), size=FONT_PX - 1)
    c.text(
        bx + 52,
        (top + bottom) / 2,
        "share of weight samples [-]",
        anchor="middle",
        size=FONT_PX - 1,
        rotate=-90,
    )
    return c.svg()


def tipping_chart(tips: list[dict], criterion_labels: dict[str, str]) -> str:
    """For the most sensitive weights: current weight and where the top corridor changes."""
    rows = [t for t in tips if t.get("kind") == "top"]
    if not rows:
        return ""
    rows = sorted(rows, key=lambda t: abs(t["weight_at"] - t["current_weight"]))[:8]
    labels = [criterion_labels.get(t["criterion"], t["criterion"]) for t in rows]
    chart = BandChart(
        labels,
        xmin=0.0,
        xmax=1.0,
        xlabel="weight on the criterion [-]  (circle: now; diamond: the top corridor changes)",
        title="The weights closest to changing the top corridor",
    )
    for i, (label, t) in enumerate(zip(labels, rows, strict=True)):
        now, at, y = t["current_weight"], t["weight_at"], chart.y(i)
        chart.canvas.line(chart.x(now), y, chart.x(at), y, stroke="#999999", width=1.5)
        chart.canvas.circle(chart.x(now), y, 4.5, fill=OKABE_ITO[0], tip=f"{label}: now {now:.3f}")
        chart.canvas.diamond(
            chart.x(at), y, 5.5, fill=OKABE_ITO[5], tip=f"{label}: top changes at {at:.3f}"
        )
    return chart.svg()


def plan_gantt(greedy: pd.DataFrame, optimised: pd.DataFrame, labels: dict[str, str]) -> str:
    """Gantt-style chart: the years each corridor is paid for, optimised and greedy plans."""
    funded_sets = [
        set(p.dropna(subset=["year_funded"])["corridor_id"]) for p in (optimised, greedy)
    ]
    funded = [
        cid for cid in optimised["corridor_id"] if cid in funded_sets[0] or cid in funded_sets[1]
    ]
    if not funded:
        return ""
    spans = []  # (row, start, end, plan index)
    for p, plan in enumerate((optimised, greedy)):
        rows = plan.set_index("corridor_id")
        for i, cid in enumerate(funded):
            if cid not in rows.index or pd.isna(rows.at[cid, "year_funded"]):
                continue
            start = rows.at[cid, "year_started"]
            start = rows.at[cid, "year_funded"] if pd.isna(start) else start
            spans.append((i, float(start), float(rows.at[cid, "year_funded"]) + 1.0, p))
    lo = math.floor(min(s[1] for s in spans))
    hi = math.ceil(max(s[2] for s in spans))
    names = [labels.get(c, c) for c in funded]
    chart = BandChart(
        names,
        xmin=lo - 0.25,
        xmax=hi + 0.25,
        xlabel="year funded [year]",
        title="Years in which each corridor is paid for",
        integer=True,
        legend=[
            ("optimised plan", OKABE_ITO[0], True),
            ("greedy plan (by rank)", OKABE_ITO[1], False),
        ],
    )
    plan_names = ("optimised", "greedy")
    for i, start, end, p in spans:
        colour = OKABE_ITO[p]
        chart.bar(
            i,
            start,
            end,
            fill=colour if p == 0 else "none",
            stroke=colour,
            offset=-0.18 if p == 0 else 0.18,
            height=0.34,
            tip=f"{names[i]}: {plan_names[p]} plan pays {start:.0f} to {end - 1:.0f}",
        )
    return chart.svg()
