"""Build input workbooks in code for the workbook tests (invented data only).

``valid_sheets()`` is a small complete input for an invented region; tests
change one cell and check the message the reader gives. ``write_book`` writes
any such dict of sheets; ``fill_template`` fills the real template.
"""

from __future__ import annotations

import copy
import io
import re
import zipfile
from collections.abc import Callable
from pathlib import Path

import openpyxl

from ranker.workbook.template import write_template

Rows = list[list[object]]


def valid_sheets() -> dict[str, Rows]:
    """Return a small complete, valid input (invented corridors and places)."""
    return copy.deepcopy(_VALID)


_VALID: dict[str, Rows] = {
    "Corridors": [
        [
            "corridor_id",
            "name",
            "connects",
            "length_mi",
            "trucks_per_day",
            "climb_ft",
            "descent_ft",
            "grid_headroom_mw",
            "freight_tons",
        ],
        ["C1", "Amberline", "Northport-Lakeside", 120.0, 4200, 1500, 1200, 12.0, 8.5],
        ["C2", "Birchway", "Lakeside-Hillcrest", 85.5, 3100, 3000, None, 4.0, 6.0],
        ["C3", "Cobalt Run", "Hillcrest-Northport", 140.0, 5200, 500, 500, 20.0, 9.1],
    ],
    "Jurisdictions": [
        ["jurisdiction", "name", "readiness"],
        ["NA", "Norland", 80],
        ["SO", "Sorvia", 55],
    ],
    "Corridor miles": [
        ["corridor_id", "jurisdiction", "miles"],
        ["C1", "NA", 70.0],
        ["C1", "SO", 50.0],
        ["C2", "NA", 85.5],
        ["C3", "SO", 140.0],
    ],
    "Assumptions": [
        ["key", "value", "unit", "note"],
        ["discount_rate", 0.05, "[1/yr]", ""],
        ["methods", "topsis, vikor", "[-]", ""],
        ["allow_split", "yes", "[-]", ""],
        ["horizon_years", 20, "[years]", ""],
    ],
    "Criteria": [
        [
            "criterion",
            "label",
            "direction",
            "include",
            "uncertainty_pct",
            "at_least",
            "at_most",
            "weight",
            "weight:board:rank",
        ],
        ["policy_readiness", "Policy readiness", "benefit", "yes", 10, None, None, 20, 3],
        ["capital_cost", "Capital cost", "cost", "yes", None, None, None, 30, 1],
        ["charging_revenue", "Charging revenue", "benefit", "yes", None, None, None, 20, 2],
        ["grid_headroom", "Grid headroom", "benefit", "no", None, None, None, 10, None],
        ["freight_tons", "Freight tonnage", "benefit", "yes", None, 5, None, 20, 4],
    ],
    "Adoption": [
        ["year", "electric_share"],
        [2030, 0.05],
        [2027, "1%"],
        [2035, 0.2],
    ],
    "Pairwise": [
        ["criterion", "policy_readiness", "capital_cost", "charging_revenue", "freight_tons"],
        ["policy_readiness", 1, "1/3", 1, 2],
        ["capital_cost", None, 1, 3, 3],
        ["charging_revenue", None, None, 1, 1],
        ["freight_tons", None, None, None, 1],
    ],
    "Budget": [
        ["year", "capital_usd"],
        [2027, "$20,000,000"],
        [2028, 15e6],
    ],
    "Scenarios": [
        ["scenario", "key", "value"],
        ["cheap_power", "energy_cost_usd_per_kwh", 0.08],
        ["cheap_power", "methods", "topsis"],
        ["slow", "bass_q", 0.2],
    ],
}


def write_book(
    path: Path,
    sheets: dict[str, Rows],
    *,
    edit: Callable[[openpyxl.Workbook], None] | None = None,
) -> Path:
    """Write ``sheets`` (name to rows, row 1 the header) to ``path``.

    ``edit`` may change the workbook (merge cells, hide rows, format) before
    it is saved.
    """
    wb = openpyxl.Workbook()
    wb.remove(wb.active)
    for name, rows in sheets.items():
        ws = wb.create_sheet(name)
        for r, row in enumerate(rows, start=1):
            for c, value in enumerate(row, start=1):
                if value is not None:
                    ws.cell(row=r, column=c, value=value)
    if edit is not None:
        edit(wb)
    wb.save(path)
    return Path(path)


def book_with(
    path: Path,
    changes: dict[tuple[str, str], object] | None = None,
    *,
    drop: tuple[str, ...] = (),
    edit=None,
    sheets: dict | None = None,
) -> Path:
    """Write the valid input with some cells changed: ``{("Corridors", "D3"): "abc"}``."""
    data = valid_sheets() if sheets is None else sheets
    for name in drop:
        data.pop(name)
    changes = changes or {}

    def apply(wb):
        for (sheet, coord), value in changes.items():
            wb[sheet][coord].value = value
        if edit is not None:
            edit(wb)

    return write_book(path, data, edit=apply)


def fill_template(path: Path, tables: dict[str, Rows]) -> Path:
    """Write the real template, then append data rows (no header) to its sheets."""
    write_template(path)
    wb = openpyxl.load_workbook(path)
    for name, rows in tables.items():
        ws = wb[name]
        start = ws.max_row + 1 if ws.max_row > 1 or ws["A1"].value else 1
        for r, row in enumerate(rows, start=start):
            for c, value in enumerate(row, start=1):
                ws.cell(row=r, column=c, value=value)
    wb.save(path)
    return Path(path)


def rewrite_part(path: Path, member: str, change: Callable[[bytes], bytes]) -> Path:
    """Rewrite one zip member of an .xlsx in place (for malformed inputs)."""
    src = Path(path).read_bytes()
    out = io.BytesIO()
    with (
        zipfile.ZipFile(io.BytesIO(src)) as zin,
        zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as zout,
    ):
        for info in zin.infolist():
            data = zin.read(info.filename)
            if info.filename == member:
                data = change(data)
            zout.writestr(info.filename, data)
    Path(path).write_bytes(out.getvalue())
    return Path(path)


def sheet_member(path: Path, title: str) -> str:
    """Zip member holding the sheet ``title`` (openpyxl numbers them in order)."""
    wb = openpyxl.load_workbook(path, read_only=True)
    try:
        index = wb.sheetnames.index(title) + 1
    finally:
        wb.close()
    return f"xl/worksheets/sheet{index}.xml"


def set_cell_xml(path: Path, title: str, coord: str, cell_xml: str) -> Path:
    """Replace the XML of one existing cell, e.g. to store a formula with no value."""
    member = sheet_member(path, title)

    def change(data: bytes) -> bytes:
        pattern = re.compile(rb'<c r="' + coord.encode() + rb'"[^>]*?(?:/>|>.*?</c>)', re.S)
        new, n = pattern.subn(cell_xml.encode(), data, count=1)
        assert n == 1, f"cell {coord} not found in {member}"
        return new

    return rewrite_part(path, member, change)
