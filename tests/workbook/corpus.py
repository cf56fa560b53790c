"""A corpus of broken inputs, each built by code, with the place its message must name.

``CASES`` is a list of ``(name, builder, where)``: ``builder(folder)`` writes
one broken input into ``folder`` and returns its path; the reader must raise
``InputError`` whose problems include one whose ``where`` contains ``where``.
Each builder's docstring says what the planner did; ``make_error_doc.py``
turns the corpus into ``docs/input-errors.md``.
"""

from __future__ import annotations

import datetime as dt
import random
import zipfile
from collections.abc import Callable
from pathlib import Path
from typing import NamedTuple

from .wbfill import book_with, rewrite_part, set_cell_xml, sheet_member, valid_sheets, write_book


class Case(NamedTuple):
    name: str
    builder: Callable[[Path], Path]
    where: str


CASES: list[Case] = []
INPUT = "input.xlsx"


def case(name: str, where: str, about: str):
    """Register the decorated builder under ``name``; ``about`` becomes its docstring."""

    def register(fn):
        fn.__doc__ = about
        CASES.append(Case(name, fn, where))
        return fn

    return register


def cells(name: str, where: str, about: str, changes: dict, **kw) -> None:
    """Register a case that changes cells of the valid input."""

    def build(folder: Path) -> Path:
        return book_with(folder / INPUT, changes, **kw)

    case(name, where, about)(build)


def sheets_case(name: str, where: str, about: str, change: Callable[[dict], None]) -> None:
    """Register a case that edits the rows of the valid input before writing."""

    def build(folder: Path) -> Path:
        data = valid_sheets()
        change(data)
        return write_book(folder / INPUT, data)

    case(name, where, about)(build)


def _valid(folder: Path, file: str = INPUT) -> Path:
    return write_book(folder / file, valid_sheets())


# --- the file itself ------------------------------------------------------------------


@case("file_missing", "missing.xlsx", "The path names no file.")
def _missing(folder):
    return folder / "missing.xlsx"


@case("file_is_folder", "folder.xlsx", "The path names a folder.")
def _folder(folder):
    (folder / "folder.xlsx").mkdir()
    return folder / "folder.xlsx"


@case("file_empty", "empty.xlsx", "The file has 0 bytes (an interrupted copy).")
def _empty(folder):
    (folder / "empty.xlsx").write_bytes(b"")
    return folder / "empty.xlsx"


@case("file_csv", "corridors.csv", "A CSV export was given instead of the workbook.")
def _csv(folder):
    (folder / "corridors.csv").write_text("corridor_id,name\nC1,Amberline\n")
    return folder / "corridors.csv"


@case("file_csv_named_xlsx", "renamed.xlsx", "A CSV file was renamed to .xlsx.")
def _csv_xlsx(folder):
    (folder / "renamed.xlsx").write_text("corridor_id,name\nC1,Amberline\n")
    return folder / "renamed.xlsx"


@case("file_random_bytes", "noise.xlsx", "The file holds bytes that are no workbook at all.")
def _noise(folder):
    rng = random.Random(7)
    (folder / "noise.xlsx").write_bytes(bytes(rng.randrange(128, 256) for _ in range(4096)))
    return folder / "noise.xlsx"


@case("file_legacy_xls", "old.xls", "An Excel 97-2003 .xls workbook was given.")
def _xls(folder):
    (folder / "old.xls").write_bytes(bytes.fromhex("D0CF11E0A1B11AE1") + bytes(504))
    return folder / "old.xls"


@case("file_password", "locked.xlsx", "The workbook is protected with a password (encrypted).")
def _encrypted(folder):
    (folder / "locked.xlsx").write_bytes(bytes.fromhex("D0CF11E0A1B11AE1") + bytes(1016))
    return folder / "locked.xlsx"


@case("file_plain_zip", "archive.xlsx", "A zip archive of other files was named .xlsx.")
def _zip(folder):
    with zipfile.ZipFile(folder / "archive.xlsx", "w") as zf:
        zf.writestr("readme.txt", "not a workbook")
    return folder / "archive.xlsx"


@case("file_word", "report.xlsx", "A Word document was renamed to .xlsx.")
def _word(folder):
    with zipfile.ZipFile(folder / "report.xlsx", "w") as zf:
        zf.writestr("[Content_Types].xml", "<Types/>")
        zf.writestr("word/document.xml", "<document/>")
    return folder / "report.xlsx"


@case("file_ods", "sheet.ods", "A LibreOffice .ods spreadsheet was given.")
def _ods(folder):
    with zipfile.ZipFile(folder / "sheet.ods", "w") as zf:
        zf.writestr("mimetype", "application/vnd.oasis.opendocument.spreadsheet")
        zf.writestr("content.xml", "<office:document-content/>")
    return folder / "sheet.ods"


@case("file_xlsb", "binary.xlsb", "An Excel binary workbook (.xlsb) was given.")
def _xlsb(folder):
    with zipfile.ZipFile(folder / "binary.xlsb", "w") as zf:
        zf.writestr("[Content_Types].xml", "<Types/>")
        zf.writestr("xl/workbook.bin", b"\x00" * 16)
    return folder / "binary.xlsb"


@case("file_truncated", "cut.xlsx", "The workbook was cut short (a failed download).")
def _cut(folder):
    p = _valid(folder, "cut.xlsx")
    p.write_bytes(p.read_bytes()[:2000])
    return p


@case("file_strict_ooxml", "strict.xlsx", "The workbook was saved as Strict Open XML.")
def _strict(folder):
    p = _valid(folder, "strict.xlsx")
    return rewrite_part(
        p,
        "xl/workbook.xml",
        lambda b: b.replace(
            b"http://schemas.openxmlformats.org/spreadsheetml/2006/main",
            b"http://purl.oclc.org/ooxml/spreadsheetml/main",
        ),
    )


@case(
    "file_entity_expansion",
    "laughs.xlsx",
    "A sheet's XML declares nested entities (a 'billion laughs' attack).",
)
def _laughs(folder):
    p = _valid(folder, "laughs.xlsx")
    dtd = (
        b'<!DOCTYPE lolz [<!ENTITY lol "lol">'
        + b"".join(
            b'<!ENTITY lol%d "%s">' % (i, (b"&lol%d;" % (i - 1) if i > 1 else b"&lol;") * 10)
            for i in range(1, 10)
        )
        + b"]>"
    )
    member = sheet_member(p, "Corridors")

    def change(data: bytes) -> bytes:
        data = data.replace(b"<worksheet", dtd + b"<worksheet", 1)
        return data.replace(b"<t>Amberline</t>", b"<t>&lol9;</t>")

    return rewrite_part(p, member, change)


@case(
    "file_decompression_bomb",
    "bomb.xlsx",
    "A part of the workbook would unpack a thousand times larger than stored.",
)
def _bomb(folder):
    p = _valid(folder, "bomb.xlsx")
    with zipfile.ZipFile(p, "a", zipfile.ZIP_DEFLATED) as zf:
        with zf.open("xl/media/image1.bin", "w") as fh:
            block = bytes(1024**2)
            for _ in range(8):
                fh.write(block)
    return p


@case("file_too_big", "huge.xlsx", "The file is larger than the 50 MB limit.")
def _huge(folder):
    p = folder / "huge.xlsx"
    with p.open("wb") as fh:
        fh.truncate(51 * 1024**2)
    return p


@case("file_damaged_sheet", "Criteria", "A sheet's XML inside the workbook is damaged.")
def _damaged(folder):
    p = _valid(folder)
    return rewrite_part(p, sheet_member(p, "Criteria"), lambda b: b[: len(b) // 2])


@case("sheet_too_many_rows", "Corridors", "A sheet has data beyond row 100,000.")
def _rows(folder):
    p = _valid(folder)
    row = b'<row r="100001"><c r="A100001" t="inlineStr"><is><t>C9</t></is></c></row>'
    return rewrite_part(
        p,
        sheet_member(p, "Corridors"),
        lambda b: b.replace(b"</sheetData>", row + b"</sheetData>"),
    )


cells(
    "sheet_too_many_columns",
    "Corridors",
    "A sheet has data past column 200.",
    {},
    edit=lambda wb: wb["Corridors"].cell(row=2, column=205, value=1),
)

# --- sheets and headers ---------------------------------------------------------------

cells(
    "sheet_no_corridors",
    "Corridors",
    "The Corridors sheet is missing.",
    {},
    drop=("Corridors", "Corridor miles"),
)
cells("sheet_no_criteria", "Criteria", "The Criteria sheet is missing.", {}, drop=("Criteria",))
cells(
    "sheet_misnamed",
    "Corridors",
    "The Corridors sheet was renamed 'Corridor list'.",
    {},
    edit=lambda wb: setattr(wb["Corridors"], "title", "Corridor list"),
)
cells(
    "header_missing_id",
    "Corridors!1:1",
    "The corridor_id header was typed as 'corridor'.",
    {("Corridors", "A1"): "corridor"},
)
cells(
    "header_missing_weight",
    "Criteria!1:1",
    "The Criteria sheet has no weight column.",
    {("Criteria", "H1"): "points", ("Criteria", "I1"): "rank"},
)
cells(
    "header_duplicate",
    "Corridors!J1",
    "Two columns of Corridors are headed 'name'.",
    {("Corridors", "J1"): "Name"},
)
cells(
    "header_both_twins",
    "Corridors!J1",
    "Both length_mi and length_km are given.",
    {("Corridors", "J1"): "length_km", ("Corridors", "J2"): 193.1},
)
cells(
    "header_both_climb_twins",
    "Corridors!J1",
    "Both climb_ft and climb_m are given.",
    {("Corridors", "J1"): "climb_m"},
)
cells(
    "header_miles_missing",
    "Corridor miles!1:1",
    "Corridor miles has no miles column.",
    {("Corridor miles", "C1"): "distance"},
)
cells(
    "header_weight_malformed",
    "Criteria!J1",
    "A weight column is headed 'weight:'.",
    {("Criteria", "J1"): "weight:", ("Criteria", "J2"): 1},
)
cells(
    "header_weight_set_twice",
    "Criteria!J1",
    "Two weight columns name the same set (weight and weight:default).",
    {("Criteria", "J1"): "weight:default", ("Criteria", "J2"): 1},
)
cells(
    "header_weight_reserved",
    "Criteria!J1",
    "A weight column is named weight:pairwise, a name the tool reserves.",
    {("Criteria", "J1"): "weight:pairwise", ("Criteria", "J2"): 1},
)

# --- Corridors ------------------------------------------------------------------------

cells(
    "corridor_id_twice",
    "Corridors!A4",
    "Two corridors share the id C1 (as C1 and c1).",
    {("Corridors", "A4"): "c1 "},
)
cells(
    "corridor_id_blank",
    "Corridors!A3",
    "A corridor row has no corridor_id.",
    {("Corridors", "A3"): None},
)
cells(
    "corridor_name_blank", "Corridors!B3", "A corridor has no name.", {("Corridors", "B3"): "  "}
)
cells(
    "corridor_text_number",
    "Corridors!D3",
    "A length holds the word 'about 90'.",
    {("Corridors", "D3"): "about 90"},
)
cells(
    "corridor_unit_typed",
    "Corridors!D2",
    "A length was typed as '120 mi'.",
    {("Corridors", "D2"): "120 mi"},
)
cells(
    "corridor_date_number",
    "Corridors!E3",
    "A truck count was turned into a date.",
    {("Corridors", "E3"): dt.datetime(2024, 3, 1)},
)
cells("corridor_negative", "Corridors!F2", "A climb is negative.", {("Corridors", "F2"): -40})
cells("corridor_zero_length", "Corridors!D2", "A corridor length is 0.", {("Corridors", "D2"): 0})
cells(
    "corridor_nan_text",
    "Corridors!G2",
    "A descent holds the text NaN.",
    {("Corridors", "G2"): "NaN"},
)
cells(
    "corridor_inf_text",
    "Corridors!H2",
    "A headroom holds the text inf.",
    {("Corridors", "H2"): "inf"},
)
cells(
    "corridor_comma_decimal",
    "Corridors!D3",
    "A length uses a decimal comma (85,5).",
    {("Corridors", "D3"): "85,5"},
)
cells(
    "corridor_bool_number",
    "Corridors!E2",
    "A truck count holds TRUE.",
    {("Corridors", "E2"): True},
)
cells(
    "corridor_formula_unsaved",
    "Corridors!D3",
    "A length is a formula written by a program that never calculated it.",
    {("Corridors", "D3"): "=D2*2"},
)
cells(
    "corridor_bad_connects",
    "Corridors!C2",
    "connects names one place only.",
    {("Corridors", "C2"): "Northport"},
)
cells(
    "corridor_merged",
    "Corridors!A3:B3",
    "Two cells of a corridor row are merged.",
    {},
    edit=lambda wb: wb["Corridors"].merge_cells("A3:B3"),
)
cells(
    "corridor_no_rows",
    "Corridors!A2",
    "The Corridors sheet has a header but no corridors.",
    {},
    sheets={
        **valid_sheets(),
        "Corridors": [valid_sheets()["Corridors"][0]],
        "Corridor miles": [["corridor_id", "jurisdiction", "miles"]],
    },
)


@case("corridor_nan_number", "Corridors", "A descent cell stores the number NaN.")
def _nan_xml(folder):
    p = _valid(folder)
    return set_cell_xml(p, "Corridors", "G2", '<c r="G2" t="n"><v>NaN</v></c>')


@case("corridor_formula_error", "Corridors!E3", "A truck count is a formula showing #DIV/0!.")
def _div0(folder):
    p = _valid(folder)
    return set_cell_xml(p, "Corridors", "E3", '<c r="E3" t="e"><f>1/0</f><v>#DIV/0!</v></c>')


# --- Criteria -------------------------------------------------------------------------

cells(
    "criterion_unknown",
    "Criteria!A3",
    "A criterion key is misspelt (capitol_cost).",
    {("Criteria", "A3"): "capitol_cost"},
)
cells(
    "criterion_text_column",
    "Criteria!A6",
    "A criterion names a Corridors column of text.",
    {("Corridors", "I3"): "high"},
)
cells(
    "criterion_twice",
    "Criteria!A6",
    "A criterion is listed twice.",
    {("Criteria", "A6"): "Capital Cost"},
)
cells(
    "criterion_direction_typo",
    "Criteria!C2",
    "A direction is misspelt (benfit).",
    {("Criteria", "C2"): "benfit"},
)
cells(
    "criterion_direction_blank",
    "Criteria!C6",
    "The direction of a criterion that is not built in is blank.",
    {("Criteria", "C6"): None},
)
cells(
    "criterion_include_word",
    "Criteria!D2",
    "include holds 'maybe'.",
    {("Criteria", "D2"): "maybe"},
)
cells(
    "criterion_none_included",
    "Criteria",
    "Every criterion has include = no.",
    {("Criteria", f"D{r}"): "no" for r in range(2, 7)},
)
cells(
    "criterion_uncertainty_negative",
    "Criteria!E2",
    "uncertainty_pct is negative.",
    {("Criteria", "E2"): -5},
)
cells(
    "criterion_limits_crossed",
    "Criteria!G6",
    "at_most is below at_least.",
    {("Criteria", "G6"): 2},
)
cells(
    "criterion_limit_text", "Criteria!F6", "at_least holds 'five'.", {("Criteria", "F6"): "five"}
)
cells(
    "criterion_given_blank",
    "Corridors!I3",
    "A criterion given as a Corridors column is blank for one corridor.",
    {("Corridors", "I3"): None},
)
cells("weight_negative", "Criteria!H3", "A weight is negative.", {("Criteria", "H3"): -10})
cells("weight_text", "Criteria!H4", "A weight holds 'high'.", {("Criteria", "H4"): "high"})
cells(
    "weight_all_zero",
    "Criteria!H2:H6",
    "Every weight in a set is 0.",
    {("Criteria", f"H{r}"): 0 for r in range(2, 7)},
)
cells(
    "weight_rank_blank",
    "Criteria!I2",
    "A rank is missing for an included criterion.",
    {("Criteria", "I2"): None},
)
cells("weight_rank_fraction", "Criteria!I3", "A rank is 1.5.", {("Criteria", "I3"): 1.5})
cells("weight_rank_zero", "Criteria!I3", "A rank is 0.", {("Criteria", "I3"): 0})

# --- Assumptions and Scenarios --------------------------------------------------------

cells(
    "assumption_unknown",
    "Assumptions!A2",
    "An assumption key is misspelt (discount_rat).",
    {("Assumptions", "A2"): "discount_rat"},
)
cells(
    "assumption_out_of_range",
    "Assumptions!B2",
    "discount_rate is 0.9 (above 0.5).",
    {("Assumptions", "B2"): 0.9},
)
cells(
    "assumption_word_for_number",
    "Assumptions!B5",
    "horizon_years holds 'twenty'.",
    {("Assumptions", "B5"): "twenty"},
)
cells(
    "assumption_not_whole",
    "Assumptions!B5",
    "horizon_years is 20.5.",
    {("Assumptions", "B5"): 20.5},
)
cells(
    "assumption_bad_list",
    "Assumptions!B3",
    "methods names an unknown method.",
    {("Assumptions", "B3"): "topsis, electre"},
)
cells(
    "assumption_bad_bool",
    "Assumptions!B4",
    "allow_split holds 'sometimes'.",
    {("Assumptions", "B4"): "sometimes"},
)
cells(
    "assumption_percent_usd",
    "Assumptions!B6",
    "port_cost_usd was typed as 12%.",
    {("Assumptions", "A6"): "port_cost_usd", ("Assumptions", "B6"): "12%"},
)
cells(
    "assumption_twice",
    "Assumptions!A6",
    "An assumption is listed twice.",
    {("Assumptions", "A6"): "discount_rate", ("Assumptions", "B6"): 0.04},
)
cells(
    "assumption_value_no_key",
    "Assumptions!A6",
    "A value was typed on a row with no key.",
    {("Assumptions", "B6"): 3},
)
cells(
    "scenario_unknown_key",
    "Scenarios!B4",
    "A scenario names an unknown key (bass_qq).",
    {("Scenarios", "B4"): "bass_qq"},
)
cells(
    "scenario_bad_value",
    "Scenarios!C4",
    "A scenario value is out of range.",
    {("Scenarios", "C4"): -1},
)
cells(
    "scenario_value_blank",
    "Scenarios!C2",
    "A scenario row has no value.",
    {("Scenarios", "C2"): None},
)
cells(
    "scenario_key_twice",
    "Scenarios!B3",
    "A scenario sets the same key twice.",
    {("Scenarios", "B3"): "energy_cost_usd_per_kwh"},
)

# --- Jurisdictions and Corridor miles -------------------------------------------------

cells(
    "readiness_over_100",
    "Jurisdictions!C2",
    "A readiness score is 120.",
    {("Jurisdictions", "C2"): 120},
)
cells(
    "jurisdiction_twice",
    "Jurisdictions!A3",
    "Two jurisdictions share a code.",
    {("Jurisdictions", "A3"): "NA"},
)
cells(
    "miles_unknown_corridor",
    "Corridor miles!A3",
    "Corridor miles names corridor C9.",
    {("Corridor miles", "A3"): "C9"},
)
cells(
    "miles_unknown_jurisdiction",
    "Corridor miles!B2",
    "Corridor miles names a code XX.",
    {("Corridor miles", "B2"): "XX"},
)
cells(
    "miles_both_twins",
    "Corridor miles!D1",
    "Corridor miles has both miles and km.",
    {("Corridor miles", "D1"): "km"},
)
cells(
    "miles_negative", "Corridor miles!C4", "A mileage is negative.", {("Corridor miles", "C4"): -3}
)
cells(
    "miles_pair_twice",
    "Corridor miles!A3",
    "A corridor and jurisdiction pair repeats.",
    {("Corridor miles", "B3"): "NA"},
)

# --- Adoption, Budget, Pairwise -------------------------------------------------------

cells(
    "adoption_share_points",
    "Adoption!B2",
    "A share was typed as 5 (meaning 5 %).",
    {("Adoption", "B2"): 5},
)
cells("adoption_year_twice", "Adoption!A4", "A year repeats.", {("Adoption", "A4"): 2030})
cells(
    "adoption_year_date",
    "Adoption!A2",
    "A year was turned into a date.",
    {("Adoption", "A2"): dt.datetime(2030, 1, 1)},
)
cells("budget_year_twice", "Budget!A3", "A budget year repeats.", {("Budget", "A3"): 2027})
cells("budget_negative", "Budget!B3", "A budget is negative.", {("Budget", "B3"): -5e6})
cells("budget_euro", "Budget!B2", "A budget was typed in euro.", {("Budget", "B2"): "€20,000,000"})
cells(
    "pairwise_date",
    "Pairwise!C2",
    "Excel turned the judgment 1/3 into a date.",
    {("Pairwise", "C2"): dt.datetime(2025, 1, 3)},
)
cells(
    "pairwise_off_scale",
    "Pairwise!D3",
    "A judgment is 12, beyond the 1-9 scale.",
    {("Pairwise", "D3"): 12},
)
cells(
    "pairwise_not_reciprocal",
    "Pairwise!C2",
    "Both cells of a pair are filled and disagree.",
    {("Pairwise", "B3"): 2},
)
cells(
    "pairwise_gap",
    "Pairwise!E3",
    "A pair of criteria has no judgment.",
    {("Pairwise", "E3"): None},
)
cells(
    "pairwise_unknown_key",
    "Pairwise!E1",
    "The matrix names a criterion not on Criteria.",
    {("Pairwise", "E1"): "tonnage", ("Pairwise", "A5"): "tonnage"},
)
cells(
    "pairwise_corner",
    "Pairwise!A1",
    "A1 holds a title instead of staying blank.",
    {("Pairwise", "A1"): "AHP matrix"},
)
cells("pairwise_diagonal", "Pairwise!C3", "A diagonal cell is 2.", {("Pairwise", "C3"): 2})
cells(
    "pairwise_missing_criterion",
    "Pairwise!1:1",
    "An included criterion has no row or column.",
    {
        ("Pairwise", "E1"): None,
        ("Pairwise", "A5"): None,
        ("Pairwise", "E2"): None,
        ("Pairwise", "E3"): None,
        ("Pairwise", "E4"): None,
        ("Pairwise", "E5"): None,
    },
)
