"""The network map of the justification sheet, as inline SVG (no tiles, no network access).

Corridors are drawn on the Lambert azimuthal equal-area projection centred
on the network (:mod:`ranker.geo.projection`): coloured by tier (by rank
band where the run sets no tiers), as wide as their heavy-truck traffic,
dashed where a must-meet rule screened them out. Places are dots with their
names placed clear of each other where the frame allows. A scale bar in
miles and kilometres, a north arrow (pointing to true north at its own
position) and a legend complete it. With a build plan, small maps show
which corridors are paid for, and which places they join, by each year.
Every line and dot carries its exact values as hover text.

Colours are the Okabe-Ito colour-blind-safe palette (Okabe and Ito, "Color
Universal Design", 2008).
"""

from __future__ import annotations

import math
from html import escape

import numpy as np
import pandas as pd

from ..constants import M_PER_MI
from ..geo.geodesic import line_length_mi
from ..geo.projection import laea, network_centre
from ..geo.tiers import corridor_tiers
from .charts import AXIS, WIDTH
from .narrative import coverage_sentence
from .svg import FONT_PX, Canvas, fit_text, text_width

#: Colours of tiers 1, 2, 3, ... (Okabe-Ito, without yellow and black).
GROUP_COLOURS = ["#0072B2", "#E69F00", "#009E73", "#CC79A7", "#56B4E9", "#D55E00"]
SCREENED = "#8c8c8c"
BUILT = "#0072B2"
NOT_YET = "#d3d8de"
PAD = 14.0  # space inside the frame around the network [px]
MIN_H, MAX_H = 240.0, 340.0  # height of the map frame [px]
LINE_MIN, LINE_MAX = 1.5, 8.0  # stroke width of the least and most travelled corridor [px]


class Frame:
    """Projected coordinates fitted into a box of the drawing."""

    def __init__(
        self,
        network,
        *,
        x0: float,
        y0: float,
        width: float,
        max_height: float,
        margin: float = 120.0,
    ):
        pts = network.points()
        self.lon0, self.lat0 = network_centre(pts)
        xs, ys = self.project(np.array([p[0] for p in pts]), np.array([p[1] for p in pts]))
        self.xmin, self.xmax = float(xs.min()), float(xs.max())
        self.ymin, self.ymax = float(ys.min()), float(ys.max())
        span_x = max(self.xmax - self.xmin, 1.0)
        span_y = max(self.ymax - self.ymin, 1.0)
        inner_w = width - 2 * PAD - margin  # room either side for place names
        scale = inner_w / span_x
        extra = 40.0 if margin > 20 else 0.0  # room above and below for names
        height = span_y * scale + 2 * PAD + extra
        if height > max_height:
            scale = (max_height - 2 * PAD - extra) / span_y
            height = max_height
        self.scale = scale  # px per projected metre
        self.x0, self.y0, self.width = x0, y0, width
        self.height = max(height, MIN_H if max_height >= MIN_H else max_height)
        self.cx = x0 + width / 2 - (self.xmin + self.xmax) / 2 * scale
        self.cy = y0 + self.height / 2 + (self.ymin + self.ymax) / 2 * scale

    def project(self, lon, lat):
        """Projected metres of (lon, lat) [deg] on this map's projection."""
        return laea(lon, lat, lon0=self.lon0, lat0=self.lat0)

    def px(self, lon, lat) -> tuple[np.ndarray, np.ndarray]:
        """Drawing coordinates [px] of (lon, lat) [deg]."""
        x, y = self.project(lon, lat)
        return self.cx + x * self.scale, self.cy - y * self.scale

    def path(self, parts) -> str:
        """SVG path data of a line's parts."""
        out = []
        for run in parts:
            x, y = self.px(np.array([p[0] for p in run]), np.array([p[1] for p in run]))
            out.append("M" + " L".join(f"{a:.1f} {b:.1f}" for a, b in zip(x, y, strict=True)))
        return " ".join(out)

    def inside(self, box) -> bool:
        """True where the box (x1, y1, x2, y2) [px] lies inside the frame."""
        x1, y1, x2, y2 = box
        return (
            x1 >= self.x0 + 2
            and y1 >= self.y0 + 2
            and x2 <= self.x0 + self.width - 2
            and y2 <= self.y0 + self.height - 2
        )


def colour_groups(result) -> tuple[dict, list[tuple[str, str]], str]:
    """Return corridor id -> colour, the legend's (label, colour) rows and what colour means.

    By tier where the run sets tiers; otherwise by rank band (thirds of the
    ranked corridors), and the legend says so.
    """
    ranking = result.ranking
    tiers = corridor_tiers(result)
    colours: dict[str, str] = {}
    if tiers is not None:
        groups = sorted({int(t) for t in tiers.dropna()})
        for cid, t in tiers.items():
            if pd.notna(t):
                colours[cid] = GROUP_COLOURS[(int(t) - 1) % len(GROUP_COLOURS)]
        legend = [(f"tier {g}", GROUP_COLOURS[(g - 1) % len(GROUP_COLOURS)]) for g in groups]
        return colours, legend, "tier"
    ranks = ranking["rank"].astype(int)
    n = len(ranks)
    size = max(1, math.ceil(n / 3))
    legend = []
    for g, lo in enumerate(range(1, n + 1, size)):
        hi = min(lo + size - 1, n)
        colour = GROUP_COLOURS[g % len(GROUP_COLOURS)]
        legend.append((f"rank {lo}" if lo == hi else f"ranks {lo}-{hi}", colour))
        for cid, r in ranks.items():
            if lo <= r <= hi:
                colours[cid] = colour
    return colours, legend, "rank band"


def _widths(trucks: pd.Series | None, ids) -> dict:
    """Stroke width per corridor [px], linear in heavy trucks per day."""
    if trucks is None:
        return {cid: 2.5 for cid in ids}
    t = pd.to_numeric(trucks.reindex(list(ids)), errors="coerce")
    top = float(t.max()) if t.notna().any() else 0.0
    out = {}
    for cid, v in t.items():
        if not math.isfinite(v) or top <= 0:
            out[cid] = LINE_MIN
        else:
            out[cid] = LINE_MIN + (LINE_MAX - LINE_MIN) * v / top
    return out


def _fmt(v, unit="", digits=0) -> str:
    if v is None or (isinstance(v, float) and not math.isfinite(v)):
        return "not given"
    return f"{v:,.{digits}f}{unit}"


def corridor_tip(cid, props: dict, methods: list[str], primary: str) -> str:
    """Hover text of one corridor: every number the GeoJSON carries for it."""
    head = f"{props['name']} ({cid})"
    if props["excluded"]:
        lines = [head, f"screened out: {props['excluded_rule']}"]
    else:
        lines = [
            head,
            f"rank {props['rank']}" + (f", tier {props['tier']}" if props["tier"] else ""),
        ]
        lines.append(f"{primary} score {props[f'score_{primary}']:.4f}")
        lines += [f"{m} score {props[f'score_{m}']:.4f}" for m in methods if m != primary]
        if props.get("first_rank_share") is not None:
            lines.append(f"ranks first in {props['first_rank_share']:.1%} of samples")
    if "build_year" in props:
        y = props["build_year"]
        lines.append(f"paid for by {y} (optimised plan)" if y else "not funded in the plan")
    lines.append(f"heavy trucks per day: {_fmt(props.get('trucks_per_day'))}")
    lines.append(f"length typed: {_fmt(props.get('length_mi'), ' mi', 1)}")
    lines.append(
        f"line drawn: {_fmt(props.get('line_length_mi'), ' mi', 1)} ({props['position']})"
    )
    if props.get("connects"):
        lines.append(f"connects {props['connects']}")
    return "\n".join(lines)


def _path(canvas, d, *, colour, width, dashed=False, tip="", cid="", opacity=1.0):
    dash = f' stroke-dasharray="{2.2 * width + 3:.1f} {1.4 * width + 3:.1f}"' if dashed else ""
    alpha = f' stroke-opacity="{opacity:g}"' if opacity < 1 else ""
    title = f"<title>{escape(tip)}</title>" if tip else ""
    data = f' data-corridor="{escape(str(cid))}"' if cid else ""
    canvas.parts.append(
        f'<path class="corridor"{data} d="{d}" fill="none" stroke="{colour}" '
        f'stroke-width="{width:.2f}" stroke-linecap="round" stroke-linejoin="round"'
        f"{dash}{alpha}>{title}</path>"
    )


def _nice_length(limit: float) -> float:
    """Largest 1, 2 or 5 times a power of ten not above ``limit``."""
    if limit <= 0:
        return 0.0
    p = 10.0 ** math.floor(math.log10(limit))
    return max(s * p for s in (1.0, 2.0, 5.0) if s * p <= limit)


def scale_bar(canvas: Canvas, frame: Frame, x: float, y: float) -> None:
    """Draw two bars, kilometres over miles, about a fifth of the frame wide.

    The map's scale is true at its centre (equal-area: distances along and
    across a meridian scale inversely, within a fraction of a percent over a
    regional network).
    """
    m_per_px = 1.0 / frame.scale
    for unit, metres, row in (("km", 1000.0, 0), ("mi", M_PER_MI, 1)):
        length = _nice_length(frame.width * 0.2 * m_per_px / metres)
        if length <= 0:
            continue
        w = length * metres / m_per_px
        yy = y + row * 16.0
        canvas.line(x, yy, x + w, yy, stroke="#1b1b1b", width=2)
        canvas.line(x, yy - 4, x, yy + 4, stroke="#1b1b1b", width=1)
        canvas.line(x + w, yy - 4, x + w, yy + 4, stroke="#1b1b1b", width=1)
        canvas.text(x + w + 6, yy, f"{length:g} {unit}", size=10.5)


def north_arrow(canvas: Canvas, frame: Frame, x: float, y: float) -> None:
    """Draw an arrow to true north at (x, y) [px]: its direction is projected, not assumed."""
    m = (x - frame.cx) / frame.scale, (frame.cy - y) / frame.scale
    lon, lat = _inverse(frame, *m)
    x1, y1 = frame.px(np.array([lon]), np.array([lat]))
    x2, y2 = frame.px(np.array([lon]), np.array([min(lat + 0.05, 89.99)]))
    ang = math.atan2(float(x2[0] - x1[0]), float(y1[0] - y2[0]))  # clockwise from up
    s, c = math.sin(ang), math.cos(ang)

    def rot(dx, dy):
        return f"{x + dx * c - dy * s:.2f},{y + dx * s + dy * c:.2f}"

    pts = " ".join(rot(dx, dy) for dx, dy in ((0, -14), (6, 8), (0, 3), (-6, 8)))
    canvas.parts.append(
        f'<polygon points="{pts}" fill="#1b1b1b"><title>North (true north here)</title></polygon>'
    )
    canvas.text(x - 20 * s, y - 22 * c, "N", anchor="middle", size=11, bold=True)


def _inverse(frame: Frame, x: float, y: float) -> tuple[float, float]:
    """(lon, lat) [deg] of projected metres (x, y): spherical LAEA inverse (Snyder 1987, sec. 24)."""
    from ..geo.projection import AUTHALIC_RADIUS_M as R

    rho = math.hypot(x, y)
    if rho < 1e-9:
        return frame.lon0, frame.lat0
    c = 2 * math.asin(min(rho / (2 * R), 1.0))
    phi1, lam0 = math.radians(frame.lat0), math.radians(frame.lon0)
    phi = math.asin(math.cos(c) * math.sin(phi1) + y * math.sin(c) * math.cos(phi1) / rho)
    lam = lam0 + math.atan2(
        x * math.sin(c), rho * math.cos(phi1) * math.cos(c) - y * math.sin(phi1) * math.sin(c)
    )
    return math.degrees(lam), math.degrees(phi)


def _overlaps(a, b) -> bool:
    return not (a[2] <= b[0] or b[2] <= a[0] or a[3] <= b[1] or b[3] <= a[1])


def place_labels(canvas, frame, places, *, size=FONT_PX, dots=True) -> list[str]:
    """Draw the places' dots and names, each name where it collides with nothing.

    Tries eight spots around each dot (right, left, above, below, then the
    corners), in order of the place's name; a name that fits nowhere inside
    the frame is left off (the dot's hover text still names it). Returns the
    places whose names were left off.
    """
    if places is None or not len(places):
        return []
    x, y = frame.px(places["lon"].to_numpy(float), places["lat"].to_numpy(float))
    r = 3.5
    taken = [(a - r, b - r, a + r, b + r) for a, b in zip(x, y, strict=True)]
    skipped = []
    order = np.argsort([str(n) for n in places["name"]], kind="stable")
    for i in order:
        name = str(places["name"].iloc[i])
        lat, lon = float(places["lat"].iloc[i]), float(places["lon"].iloc[i])
        if dots:
            canvas.parts.append(
                f'<circle class="place" cx="{x[i]:.2f}" cy="{y[i]:.2f}" r="{r:g}" fill="#fff" '
                f'stroke="#1b1b1b" stroke-width="1.2"><title>{escape(name)}: '
                f"{lat:.5f}, {lon:.5f} (lat, lon)</title></circle>"
            )
        label = fit_text(name, 170.0, size)
        w, h = text_width(label, size), size * 1.2
        spots = (
            (x[i] + r + 3, y[i] - h / 2, "start"),
            (x[i] - r - 3 - w, y[i] - h / 2, "end"),
            (x[i] - w / 2, y[i] - r - 2 - h, "middle"),
            (x[i] - w / 2, y[i] + r + 2, "middle"),
            (x[i] + r, y[i] - r - h, "start"),
            (x[i] - r - w, y[i] - r - h, "end"),
            (x[i] + r, y[i] + r, "start"),
            (x[i] - r - w, y[i] + r, "end"),
        )
        for bx, by, anchor in spots:
            box = (bx, by, bx + w, by + h)
            if frame.inside(box) and not any(_overlaps(box, t) for t in taken):
                taken.append(box)
                tx = {"start": bx, "end": bx + w, "middle": bx + w / 2}[anchor]
                canvas.parts.append(
                    f'<text class="place-label" x="{tx:.2f}" y="{by + h / 2:.2f}" '
                    f'text-anchor="{anchor}" dominant-baseline="central" font-size="{size:g}" '
                    f'fill="#1b1b1b" stroke="#fff" stroke-width="3" paint-order="stroke">'
                    f"{escape(label)}</text>"
                )
                break
        else:
            skipped.append(name)
    return skipped


def network_map(result, props: dict, *, max_height: float = MAX_H) -> tuple[str, list[str]]:
    """Return the map's SVG and the places whose names did not fit.

    Parameters
    ----------
    result : Result
        A run whose workbook gives positions.
    props : dict
        Corridor id -> properties, as :func:`ranker.geo.export.corridor_properties`
        returns them (the same numbers as the GeoJSON file).
    max_height : float
        Tallest the frame may be [px].
    """
    network = result.network
    frame = Frame(network, x0=1.0, y0=1.0, width=WIDTH - 2.0, max_height=max_height)
    colours, legend, meaning = colour_groups(result)
    corridors = result.inputs.corridors
    trucks = corridors["trucks_per_day"] if "trucks_per_day" in corridors else None
    widths = _widths(trucks, network.lines)
    legend_h = 64.0
    canvas = Canvas(WIDTH, frame.height + 2 + legend_h, title="Map of the corridors")
    canvas.rect(1, 1, frame.width, frame.height, fill="#f7f9fb", stroke="#c9d1d9")
    methods = list(result.scores.scores.columns)
    primary = result.primary_method
    ranks = {cid: p["rank"] for cid, p in props.items()}
    drawn = [cid for cid in props if cid in network.lines]
    screened = [cid for cid in drawn if props[cid]["excluded"]]
    kept = sorted(
        (cid for cid in drawn if not props[cid]["excluded"]), key=lambda c: -(ranks[c] or 0)
    )
    for cid in screened + kept:  # rank 1 drawn last, on top
        tip = corridor_tip(cid, props[cid], methods, primary)
        _path(
            canvas,
            frame.path(network.lines[cid]),
            colour=SCREENED if props[cid]["excluded"] else colours.get(cid, SCREENED),
            width=widths[cid],
            dashed=props[cid]["excluded"],
            tip=tip,
            cid=cid,
        )
    skipped = place_labels(canvas, frame, network.places)
    scale_bar(canvas, frame, 14.0, frame.height - 26.0)
    north_arrow(canvas, frame, frame.width - 24.0, 34.0)
    _legend(canvas, frame.height + 14.0, legend, meaning, widths, trucks, bool(screened))
    return canvas.svg(), skipped


def _legend(canvas, y, legend, meaning, widths, trucks, any_screened) -> None:
    x = 8.0
    canvas.text(x, y, f"Colour: {meaning}", size=11, fill=AXIS)
    x += text_width(f"Colour: {meaning}", 11) + 12
    for label, colour in legend:
        canvas.line(x, y, x + 22, y, stroke=colour, width=4)
        canvas.text(x + 27, y, label, size=11)
        x += 27 + text_width(label, 11) + 14
    if any_screened:
        canvas.parts.append(
            f'<line x1="{x:.2f}" y1="{y:.2f}" x2="{x + 26:.2f}" y2="{y:.2f}" stroke="{SCREENED}" '
            'stroke-width="3" stroke-dasharray="9.6 7.2"/>'
        )
        canvas.text(x + 31, y, "screened out", size=11)
    y2 = y + 24.0
    x = 8.0
    if trucks is None:
        canvas.text(x, y2, "Width: no trucks_per_day given", size=11, fill=AXIS)
        return
    canvas.text(x, y2, "Width: heavy trucks per day", size=11, fill=AXIS)
    x += text_width("Width: heavy trucks per day", 11) + 12
    t = pd.to_numeric(trucks.reindex(list(widths)), errors="coerce").dropna()
    if not len(t) or float(t.max()) <= 0:
        return
    top = float(t.max())
    for v in (top / 4, top / 2, top):
        w = LINE_MIN + (LINE_MAX - LINE_MIN) * v / top
        canvas.line(x, y2, x + 26, y2, stroke="#5a5a5a", width=w)
        canvas.text(x + 31, y2, f"{v:,.0f}", size=11)
        x += 31 + text_width(f"{v:,.0f}", 11) + 16
    canvas.text(
        8.0,
        y2 + 20,
        "Places: dots; names left off where they would overlap.",
        size=10.5,
        fill=AXIS,
    )


def coverage_maps(result) -> str:
    """Small maps, one per plan year: corridors paid for by then, and the places they join.

    Uses the optimised plan. Returns ``""`` without a plan.
    """
    plan = result.plan
    network = result.network
    if plan is None or network is None:
        return ""
    years = [int(y) for y in plan.budget["year"]]
    done = {}
    for rec in plan.optimised.to_dict("records"):
        y = rec.get("year_funded")
        if y is not None and not pd.isna(y):
            done[rec["corridor_id"]] = int(y)
    per_row = min(max(len(years), 1), 6)
    cell_w = (WIDTH - 8.0 * (per_row - 1)) / per_row
    frames, rows = [], math.ceil(len(years) / per_row)
    probe = Frame(network, x0=0, y0=0, width=cell_w, max_height=cell_w * 0.9, margin=8.0)
    cell_h = probe.height
    canvas = Canvas(
        WIDTH, rows * (cell_h + 34.0), title="Corridors paid for, and places joined, by year"
    )
    ends = network.ends
    for k, year in enumerate(years):
        x0 = (k % per_row) * (cell_w + 8.0)
        y0 = (k // per_row) * (cell_h + 34.0)
        f = Frame(network, x0=x0, y0=y0, width=cell_w, max_height=cell_w * 0.9, margin=8.0)
        frames.append(f)
        canvas.rect(x0, y0, f.width, f.height, fill="#f7f9fb", stroke="#c9d1d9")
        built = [cid for cid in network.lines if done.get(cid, 10**9) <= year]
        joined: set[str] = set()
        for cid in network.lines:
            is_built = cid in built
            _path(
                canvas,
                f.path(network.lines[cid]),
                colour=BUILT if is_built else NOT_YET,
                width=3.0 if is_built else 1.6,
                tip=f"{cid}: "
                + (f"paid for by {done[cid]}" if is_built else f"not yet paid for in {year}"),
            )
            if is_built and cid in ends:
                joined.update(ends[cid])
        places = network.places
        if len(places):
            xs, ys = f.px(places["lon"].to_numpy(float), places["lat"].to_numpy(float))
            for p, a, b in zip(places.index, xs, ys, strict=True):
                on = p in joined
                canvas.parts.append(
                    f'<circle cx="{a:.2f}" cy="{b:.2f}" r="2.6" fill="{"#1b1b1b" if on else "#fff"}" '
                    f'stroke="#1b1b1b" stroke-width="1"><title>{escape(str(places.loc[p, "name"]))}: '
                    f"{'joined' if on else 'not joined'} by {year}</title></circle>"
                )
        caption = (
            f"by {year}: {len(built)} corridor{'s' if len(built) != 1 else ''}, "
            f"{len(joined)} of {len(places)} places"
        )
        canvas.text(x0 + 2, y0 + f.height + 14, caption, size=11)
    return canvas.svg()


def map_context(result) -> dict | None:
    """Everything the sheet's map section shows, or None when the workbook gives no positions."""
    if result.network is None:
        return None
    from ..geo.export import corridor_properties

    props = corridor_properties(result)
    svg, skipped = network_map(result, props)
    network = result.network
    n_geo = sum(1 for s in network.source.values() if s.startswith("line"))
    _, _, meaning = colour_groups(result)
    lengths = {cid: line_length_mi(parts) for cid, parts in network.lines.items()}
    return {
        "svg": svg,
        "coverage": coverage_maps(result),
        "coverage_sentence": coverage_sentence(result) if result.plan is not None else "",
        "drawn": len(network.lines),
        "total": len(result.inputs.corridors),
        "from_geometry": n_geo,
        "missing": network.missing,
        "skipped_labels": skipped,
        "colour_meaning": meaning,
        "geojson": result.inputs.path.stem + "-ranked.geojson",
        "shortest_mi": min(lengths.values()),
        "longest_mi": max(lengths.values()),
    }
