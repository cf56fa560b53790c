"""Charts for the justification sheet, drawn with matplotlib as inline SVG.

Colours come from the Okabe-Ito colour-blind-safe palette (Okabe and Ito,
"Color Universal Design", 2008); the heatmap uses matplotlib's ``cividis``,
designed to read the same for common colour-vision deficiencies
(Nuñez, Anderton and Renslow, PLoS ONE 13(7), 2018).
"""

from __future__ import annotations

import io
import re

import numpy as np
import pandas as pd

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


def _figure(width: float, height: float):
    """Return a new figure and its axes, drawn by the SVG backend.

    Uses matplotlib's object API rather than pyplot, so no global figure
    manager (and no GUI backend) is ever loaded.
    """
    import matplotlib
    from matplotlib.backends.backend_svg import FigureCanvasSVG
    from matplotlib.figure import Figure

    matplotlib.rcParams.update(
        {
            "font.size": 9,
            "svg.fonttype": "none",
            "axes.spines.top": False,
            "axes.spines.right": False,
            "svg.hashsalt": "ranker",
        }
    )
    fig = Figure(figsize=(width, height))
    FigureCanvasSVG(fig)
    return fig, fig.add_subplot()


_COUNTER = [0]


def reset_ids() -> None:
    """Start chart ids afresh (once per document, so documents are reproducible)."""
    _COUNTER[0] = 0


def _svg(fig) -> str:
    buf = io.StringIO()
    fig.savefig(buf, format="svg", bbox_inches="tight", metadata={"Date": None})
    text = buf.getvalue()
    text = text[text.index("<svg") :]
    text = re.sub(r"<metadata>.*?</metadata>", "", text, flags=re.S)
    # Prefix ids so several inline SVGs on one page never share one.
    _COUNTER[0] += 1
    p = f"c{_COUNTER[0]}-"
    text = re.sub(r'id="([^"]+)"', lambda m: f'id="{p}{m.group(1)}"', text)
    return re.sub(r"url\(#([^)]+)\)", lambda m: f"url(#{p}{m.group(1)})", text).replace(
        'xlink:href="#', f'xlink:href="#{p}'
    )


def _height(n: int) -> float:
    return max(2.2, 0.32 * n + 1.0)


def score_bars(labels: list[str], scores: np.ndarray, *, method: str) -> str:
    """Horizontal bars of each corridor's score, rank 1 at the top."""
    fig, ax = _figure(7.0, _height(len(labels)))
    y = np.arange(len(labels))
    ax.barh(y, scores, color=OKABE_ITO[0])
    ax.set_yticks(y, labels)
    ax.invert_yaxis()
    ax.set_xlabel(f"{method} score [-] (higher is better)")
    for yi, s in zip(y, scores, strict=True):
        ax.text(s, yi, f" {s:.3f}", va="center", fontsize=8)
    ax.set_xlim(0, max(1e-9, float(np.nanmax(scores))) * 1.15)
    return _svg(fig)


def contribution_bars(
    contributions: pd.DataFrame, labels: list[str], criterion_labels: dict[str, str]
) -> str:
    """Stacked bars of each criterion's weighted-sum contribution per corridor."""
    fig, ax = _figure(7.0, _height(len(labels)) + 0.6)
    y = np.arange(len(labels))
    left = np.zeros(len(labels))
    for i, key in enumerate(contributions.columns):
        vals = contributions[key].to_numpy(dtype=float)
        ax.barh(
            y,
            vals,
            left=left,
            color=OKABE_ITO[i % len(OKABE_ITO)],
            label=criterion_labels.get(key, key),
            edgecolor="white",
            linewidth=0.5,
        )
        left += vals
    ax.set_yticks(y, labels)
    ax.invert_yaxis()
    ax.set_xlabel("weighted-sum score [-], split by criterion")
    if ax.get_legend_handles_labels()[0]:
        ax.legend(loc="upper center", bbox_to_anchor=(0.5, -0.18), ncol=3, frameon=False)
    return _svg(fig)


def acceptability_heatmap(acceptability: pd.DataFrame, labels: list[str]) -> str:
    """Heatmap of the rank acceptability matrix (share of samples per rank)."""
    n = len(labels)
    fig, ax = _figure(min(9.0, 1.2 + 0.45 * n), _height(n))
    data = acceptability.to_numpy(dtype=float)
    im = ax.imshow(data, cmap="cividis", vmin=0, vmax=1, aspect="auto")
    ax.set_yticks(np.arange(n), labels)
    ticks = [str(c).replace("rank ", "") for c in acceptability.columns]
    ax.set_xticks(np.arange(data.shape[1]), ticks, rotation=90 if data.shape[1] > 15 else 0)
    ax.set_xlabel("rank taken [-]")
    annotate = n <= 20 and data.shape[1] <= 26  # numbers stay legible
    for i in range(n if annotate else 0):
        for j in range(data.shape[1]):
            if data[i, j] >= 0.005:
                ax.text(
                    j,
                    i,
                    f"{data[i, j]:.0%}",
                    ha="center",
                    va="center",
                    fontsize=7,
                    color="black" if data[i, j] > 0.55 else "white",
                )
    cbar = fig.colorbar(im, ax=ax, fraction=0.04)
    cbar.set_label("share of weight samples [-]")
    ax.spines[:].set_visible(False)
    return _svg(fig)


def tipping_chart(tips: list[dict], criterion_labels: dict[str, str]) -> str:
    """For the most sensitive weights: current weight and where the top corridor changes."""
    rows = [t for t in tips if t.get("kind") == "top"]
    if not rows:
        return ""
    rows = sorted(rows, key=lambda t: abs(t["weight_at"] - t["current_weight"]))[:8]
    fig, ax = _figure(7.0, _height(len(rows)))
    y = np.arange(len(rows))
    for yi, t in zip(y, rows, strict=True):
        ax.plot([t["current_weight"], t["weight_at"]], [yi, yi], color="#999999", lw=1.5)
        ax.plot(t["current_weight"], yi, "o", color=OKABE_ITO[0])
        ax.plot(t["weight_at"], yi, "D", color=OKABE_ITO[5])
    ax.set_yticks(y, [criterion_labels.get(t["criterion"], t["criterion"]) for t in rows])
    ax.invert_yaxis()
    ax.set_xlim(0, 1)
    ax.set_xlabel("weight on the criterion [-]  (circle: now; diamond: the top corridor changes)")
    return _svg(fig)


def plan_gantt(greedy: pd.DataFrame, optimised: pd.DataFrame, labels: dict[str, str]) -> str:
    """Gantt-style chart: the years each corridor is paid for, optimised and greedy plans."""
    funded = [
        cid
        for cid in optimised["corridor_id"]
        if cid in set(optimised.dropna(subset=["year_funded"])["corridor_id"])
        or cid in set(greedy.dropna(subset=["year_funded"])["corridor_id"])
    ]
    if not funded:
        return ""
    fig, ax = _figure(7.0, _height(len(funded)) + 0.4)
    y = np.arange(len(funded))
    for plan, colour, offset, height, fill in (
        (optimised, OKABE_ITO[0], -0.18, 0.34, True),
        (greedy, OKABE_ITO[1], 0.18, 0.34, False),
    ):
        rows = plan.set_index("corridor_id")
        for yi, cid in zip(y, funded, strict=True):
            if cid not in rows.index or pd.isna(rows.at[cid, "year_funded"]):
                continue
            start = rows.at[cid, "year_started"]
            start = rows.at[cid, "year_funded"] if pd.isna(start) else start
            end = rows.at[cid, "year_funded"] + 1
            ax.barh(
                yi + offset,
                end - start,
                left=start,
                height=height,
                color=colour if fill else "none",
                edgecolor=colour,
                linewidth=1.5,
            )
    ax.set_yticks(y, [labels.get(c, c) for c in funded])
    ax.invert_yaxis()
    ax.set_xlabel("year funded [year]")
    ax.xaxis.get_major_locator().set_params(integer=True)
    from matplotlib.patches import Patch

    ax.legend(
        handles=[
            Patch(color=OKABE_ITO[0], label="optimised plan"),
            Patch(facecolor="none", edgecolor=OKABE_ITO[1], label="greedy plan (by rank)"),
        ],
        loc="upper center",
        bbox_to_anchor=(0.5, -0.15),
        ncol=2,
        frameon=False,
    )
    return _svg(fig)
