"""The demo scenario: an invented freight region, built on the blank template.

Everything here is made up: the Tessaly Basin region, its six
jurisdictions, its fourteen corridors, the positions of its nine places
(set in open ocean) and every number. It exists to show
the tool working end to end; it is never used as a check value.
"""

from __future__ import annotations

import io
import os
import tempfile
from pathlib import Path

from openpyxl import load_workbook
from openpyxl.packaging.custom import StringProperty

from .files import MARKER, check_replaceable, write_all_atomic
from .workbook.tables import (
    ASSUMPTIONS,
    BUDGET,
    CORRIDOR_MILES,
    CORRIDORS,
    CRITERIA,
    JURISDICTIONS,
    PAIRWISE,
    PLACES,
    SCENARIOS,
)
from .workbook.template import fill_sheet

DEMO_NAME = "tessaly-basin.xlsx"

JURISDICTION_ROWS = [
    ("QRW", "Quarrow Province", 78),
    ("ZLM", "Zelmont County", 64),
    ("TBF", "Tibbenfeld District", 45),
    ("VRH", "Varnholt Territory", 38),
    ("ELK", "Elskirk Shire", 71),
    ("DRM", "Drummaven Reach", 29),
]

# The invented places, placed in open ocean (no real town lies under them):
# place, latitude [deg], longitude [deg]. Laid out so that each corridor's
# road length is 1.08 to 1.53 times the straight-line (geodesic) distance
# between its ends, more on the mountain corridors.
PLACE_ROWS = [
    ("Port Quarrow", -38.3188, -127.3302),
    ("Zelmont Junction", -36.8428, -127.4740),
    ("Tibben Cross", -37.1104, -128.8884),
    ("Hallow Ridge", -37.4461, -129.8494),
    ("Varnholt Yards", -38.6003, -130.1679),
    ("Lake Oster", -37.5580, -127.5143),
    ("Elskirk Gap", -38.9655, -128.4905),
    ("Marrowby", -37.9892, -129.2371),
    ("Cinder Flats", -37.0810, -131.3470),
]

# id, name, connects, length_mi, trucks_per_day, climb_ft, descent_ft, headroom_mw,
# miles by jurisdiction
CORRIDOR_ROWS = [
    (
        "TB-01",
        "Port Quarrow to Zelmont Junction",
        "Port Quarrow-Zelmont Junction",
        118,
        5200,
        900,
        700,
        14.0,
        {"QRW": 80, "ZLM": 38},
    ),
    (
        "TB-02",
        "Zelmont Junction to Tibben Cross",
        "Zelmont Junction-Tibben Cross",
        96,
        3900,
        1500,
        1300,
        6.5,
        {"ZLM": 51, "TBF": 45},
    ),
    (
        "TB-03",
        "Tibben Cross over Hallow Ridge",
        "Tibben Cross-Hallow Ridge",
        74,
        2100,
        4200,
        2600,
        2.0,
        {"TBF": 40, "VRH": 34},
    ),
    (
        "TB-04",
        "Hallow Ridge to Varnholt Yards",
        "Hallow Ridge-Varnholt Yards",
        88,
        2300,
        1900,
        3400,
        3.5,
        {"VRH": 88},
    ),
    (
        "TB-05",
        "Port Quarrow coastal freight loop",
        "Port Quarrow-Lake Oster",
        62,
        6100,
        300,
        300,
        22.0,
        {"QRW": 62},
    ),
    (
        "TB-06",
        "Lake Oster to Elskirk Gap",
        "Lake Oster-Elskirk Gap",
        131,
        2800,
        2600,
        2100,
        9.0,
        {"QRW": 21, "ELK": 110},
    ),
    (
        "TB-07",
        "Elskirk Gap to Marrowby",
        "Elskirk Gap-Marrowby",
        104,
        1800,
        3100,
        2900,
        4.0,
        {"ELK": 64, "DRM": 40},
    ),
    (
        "TB-08",
        "Marrowby to Cinder Flats",
        "Marrowby-Cinder Flats",
        142,
        1200,
        800,
        1100,
        1.5,
        {"DRM": 142},
    ),
    (
        "TB-09",
        "Zelmont Junction to Lake Oster",
        "Zelmont Junction-Lake Oster",
        57,
        4400,
        600,
        500,
        11.0,
        {"ZLM": 35, "QRW": 22},
    ),
    (
        "TB-10",
        "Tibben Cross to Cinder Flats",
        "Tibben Cross-Cinder Flats",
        165,
        1600,
        1200,
        1400,
        5.0,
        {"TBF": 70, "DRM": 95},
    ),
    (
        "TB-11",
        "Varnholt Yards to Elskirk Gap",
        "Varnholt Yards-Elskirk Gap",
        112,
        2000,
        2200,
        2000,
        7.5,
        {"VRH": 48, "ELK": 64},
    ),
    (
        "TB-12",
        "Port Quarrow inland connector",
        "Port Quarrow-Tibben Cross",
        139,
        3300,
        1800,
        1600,
        8.0,
        {"QRW": 44, "ZLM": 40, "TBF": 55},
    ),
    (
        "TB-13",
        "Drummaven mountain bypass",
        "Marrowby-Hallow Ridge",
        77,
        900,
        5200,
        4800,
        1.0,
        {"DRM": 42, "VRH": 35},
    ),
    (
        "TB-14",
        "Elskirk Gap northern spur",
        "Elskirk Gap-Port Quarrow",
        93,
        2500,
        1400,
        1700,
        12.0,
        {"ELK": 58, "QRW": 35},
    ),
]

CRITERIA_ROWS = [
    # criterion, label, direction, include, uncertainty_pct, at_least, at_most, weights
    (
        "policy_readiness",
        "Policy readiness",
        "benefit",
        "yes",
        5,
        30,
        None,
        {"weight": 20, "weight:freight": 10, "weight:utility:rank": 3},
    ),
    (
        "capital_cost",
        "Capital cost",
        "cost",
        "yes",
        20,
        None,
        None,
        {"weight": 25, "weight:freight": 20, "weight:utility:rank": 2},
    ),
    (
        "charging_revenue",
        "Charging revenue (NPV)",
        "benefit",
        "yes",
        25,
        None,
        None,
        {"weight": 25, "weight:freight": 40, "weight:utility:rank": 4},
    ),
    (
        "grid_headroom",
        "Grid headroom ratio",
        "benefit",
        "yes",
        10,
        None,
        None,
        {"weight": 20, "weight:freight": 10, "weight:utility:rank": 1},
    ),
    (
        "terrain_penalty",
        "Terrain energy penalty",
        "cost",
        "yes",
        10,
        None,
        None,
        {"weight": 10, "weight:freight": 20, "weight:utility:rank": 5},
    ),
]

ASSUMPTION_VALUES = {
    "analysis_year": 2027,
    "target_year": 2035,
    "methods": "topsis, weighted_sum, weighted_product, vikor",
}

# Saaty 1-9 judgments of a planning committee: row criterion against column criterion.
PAIRWISE_ROWS = {
    "policy_readiness": {
        "capital_cost": "1/2",
        "charging_revenue": 1,
        "grid_headroom": "1/2",
        "terrain_penalty": 3,
    },
    "capital_cost": {"charging_revenue": 2, "grid_headroom": 1, "terrain_penalty": 4},
    "charging_revenue": {"grid_headroom": "1/2", "terrain_penalty": 3},
    "grid_headroom": {"terrain_penalty": 4},
}

#: Yearly capital for charging [USD]: less each year than the first two corridors by rank
#: cost together, and less in total than all of them, so the plan spreads over six years
#: and the optimised plan differs from the greedy one.
BUDGET_ROWS = [
    (2027, 7.5e6),
    (2028, 8.0e6),
    (2029, 8.5e6),
    (2030, 9.0e6),
    (2031, 9.5e6),
    (2032, 10.0e6),
]

SCENARIO_ROWS = [
    ("slow adoption", "bass_q", 0.2),
    ("slow adoption", "bass_p", 0.005),
    ("fast adoption", "bass_q", 0.5),
    ("fast adoption", "bass_p", 0.02),
    # About 1.45x the port and 1.65x the site defaults (200,000 and 530,000 USD).
    ("dear chargers", "port_cost_usd", 290000),
    ("dear chargers", "site_cost_usd", 880000),
]


def build_demo_bytes() -> bytes:
    """Return the demo input workbook's bytes, built on the blank template."""
    from .workbook.template import write_template

    with tempfile.TemporaryDirectory() as tmp:
        blank = Path(tmp) / "blank.xlsx"
        write_template(blank)
        wb = load_workbook(blank)
    fill_demo(wb)
    wb.custom_doc_props.append(StringProperty(name=MARKER, value="demo input"))
    buf = io.BytesIO()
    wb.save(buf)
    return buf.getvalue()


def fill_demo(wb) -> None:
    """Fill a blank input workbook (the template, opened with openpyxl) with the demo data."""
    fill_sheet(
        wb[JURISDICTIONS],
        [{"jurisdiction": c, "name": n, "readiness": r} for c, n, r in JURISDICTION_ROWS],
    )
    corridors, miles = [], []
    for cid, name, connects, length, trucks, climb, descent, headroom, by in CORRIDOR_ROWS:
        corridors.append(
            {
                "corridor_id": cid,
                "name": name,
                "length_mi": length,
                "trucks_per_day": trucks,
                "climb_ft": climb,
                "descent_ft": descent,
                "grid_headroom_mw": headroom,
                "connects": connects,
            }
        )
        miles.extend({"corridor_id": cid, "jurisdiction": j, "miles": m} for j, m in by.items())
    fill_sheet(wb[CORRIDORS], corridors)
    fill_sheet(wb[CORRIDOR_MILES], miles)
    fill_sheet(
        wb[CRITERIA],
        [
            {
                "criterion": k,
                "label": lab,
                "direction": d,
                "include": inc,
                "uncertainty_pct": u,
                "at_least": lo,
                "at_most": hi,
                **w,
            }
            for k, lab, d, inc, u, lo, hi, w in CRITERIA_ROWS
        ],
    )
    ws = wb[ASSUMPTIONS]
    for row in ws.iter_rows(min_row=2):
        key = str(row[0].value or "").strip().lower()
        if key in ASSUMPTION_VALUES:
            row[1].value = ASSUMPTION_VALUES[key]
    keys = [c[0] for c in CRITERIA_ROWS]
    pw = wb[PAIRWISE]
    pw.delete_rows(1, pw.max_row)
    pw.cell(row=1, column=1, value="criterion")
    for j, k in enumerate(keys):
        pw.cell(row=1, column=j + 2, value=k)
        pw.cell(row=j + 2, column=1, value=k)
        pw.cell(row=j + 2, column=j + 2, value=1)
    for i, k in enumerate(keys):
        for other, v in PAIRWISE_ROWS.get(k, {}).items():
            pw.cell(row=i + 2, column=keys.index(other) + 2, value=v)
    fill_sheet(wb[PLACES], [{"place": p, "lat": lat, "lon": lon} for p, lat, lon in PLACE_ROWS])
    fill_sheet(wb[BUDGET], [{"year": y, "capital_usd": c} for y, c in BUDGET_ROWS])
    fill_sheet(wb[SCENARIOS], [{"scenario": s, "key": k, "value": v} for s, k, v in SCENARIO_ROWS])


def write_demo(out_dir: Path) -> Path:
    """Write the demo input workbook into ``out_dir``; return its path."""
    path = Path(out_dir) / DEMO_NAME
    check_replaceable(path)
    write_all_atomic({path: build_demo_bytes()})
    return path


if __name__ == "__main__":  # rebuild sample_inputs/ from the repo root
    target = Path(os.environ.get("RANKER_DEMO_DIR", "sample_inputs"))
    print(write_demo(target))
