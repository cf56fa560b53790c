"""The blank template: sheets, notes, validations, pre-filled tables, round trip."""

from __future__ import annotations

import shutil
import zipfile

import openpyxl
import pytest
from defusedxml import ElementTree as SafeET

from ranker.assumptions import ASSUMPTIONS
from ranker.workbook import SHEETS, read_workbook, write_template
from ranker.workbook.schema import BUILTIN_CRITERIA, INSTRUCTIONS
from ranker.workbook.template import LIST_MAX, MESSAGE_MAX, TITLE_MAX

from .wbfill import book_with, fill_template


@pytest.fixture(scope="module")
def template(tmp_path_factory):
    path = tmp_path_factory.mktemp("tpl") / "blank.xlsx"
    write_template(path)
    return path


@pytest.fixture(scope="module")
def book(template):
    return openpyxl.load_workbook(template)


def test_sheet_order(book):
    assert book.sheetnames == [INSTRUCTIONS, *SHEETS]
    assert book.active.title == INSTRUCTIONS


def test_instructions_cover_steps_and_cautions(book):
    text = " ".join(str(c.value) for row in book[INSTRUCTIONS].iter_rows() for c in row if c.value)
    for needed in (
        "ranker check",
        "ranker run",
        "weight",
        "planning-level",
        "utility",
        "licensed engineers",
        "local codes",
        "Corridors",
        "Criteria",
    ):
        assert needed in text, needed
    for name in SHEETS:
        assert name in text


def test_every_header_has_a_note_with_its_unit(book):
    for name, sch in SHEETS.items():
        ws = book[name]
        if sch.layout == "matrix":
            assert ws["A1"].comment is not None
            continue
        for col, f in enumerate(sch.fields, start=1):
            cell = ws.cell(row=1, column=col)
            assert cell.value == f.key
            assert cell.comment is not None, (name, f.key)
            assert f.key in cell.comment.text
            if f.unit:
                assert f.unit in cell.comment.text


def test_headers_frozen_and_widths(book):
    for name, sch in SHEETS.items():
        ws = book[name]
        assert ws.freeze_panes in ("A2", "B2"), name
        for col, f in enumerate(sch.fields, start=1):
            letter = openpyxl.utils.get_column_letter(col)
            assert ws.column_dimensions[letter].width == f.width


def test_number_formats(book):
    ws = book["Corridors"]
    assert ws.column_dimensions["D"].number_format == "#,##0.0"  # length_mi
    assert book["Adoption"].column_dimensions["B"].number_format == "0.0%"


def test_validations_are_valid_lists(book):
    """Excel limits: titles 32, prompt/error 255, list formula 255 characters, quoted."""
    seen = {}
    for ws in book.worksheets:
        for dv in ws.data_validations.dataValidation:
            assert dv.type == "list"
            assert dv.formula1.startswith('"') and dv.formula1.endswith('"')
            assert len(dv.formula1) <= LIST_MAX
            assert '"' not in dv.formula1[1:-1]
            for text, limit in (
                (dv.errorTitle, TITLE_MAX),
                (dv.promptTitle, TITLE_MAX),
                (dv.error, MESSAGE_MAX),
                (dv.prompt, MESSAGE_MAX),
            ):
                assert text is None or len(text) <= limit
            assert str(dv.sqref).strip()
            seen.setdefault(ws.title, []).append((str(dv.sqref), dv.formula1))
    assert ("C2:C500", '"benefit,cost"') in seen["Criteria"]
    assert ("D2:D500", '"yes,no"') in seen["Criteria"]
    assert any(f == '"topsis,weighted_sum,weighted_product,vikor"' for _, f in seen["Assumptions"])


def test_parts_are_well_formed_xml(template):
    with zipfile.ZipFile(template) as zf:
        for name in zf.namelist():
            if name.endswith((".xml", ".rels", ".vml")):
                SafeET.fromstring(zf.read(name))


def test_assumptions_list_every_key_with_an_empty_value_and_the_default_beside(book):
    ws = book["Assumptions"]
    assert [c.value for c in ws[1]][:6] == ["key", "value", "default", "unit", "note", "group"]
    rows = list(ws.iter_rows(min_row=2, values_only=True))
    assert [r[0] for r in rows] == list(ASSUMPTIONS)
    for r in rows:
        a = ASSUMPTIONS[r[0]]
        default = ", ".join(a.default) if isinstance(a.default, tuple) else a.default
        if isinstance(default, bool):
            default = "yes" if default else "no"
        default = None if default == "" else default  # an empty default is a blank cell
        # the value cell is empty: only a value the planner types counts as theirs
        assert (r[1], r[2], r[3], r[4], r[5]) == (None, default, a.unit, a.note, a.group)
    groups = [r[5] for r in rows]
    # grouped: each group's rows are contiguous
    assert len(set(groups)) == len(
        [g for i, g in enumerate(groups) if i == 0 or groups[i - 1] != g]
    )


def test_criteria_prefilled_with_builtins_at_equal_weight(book):
    ws = book["Criteria"]
    header = [c.value for c in ws[1]]
    assert header[-1] == "weight"
    rows = list(ws.iter_rows(min_row=2, values_only=True))
    assert [(r[0], r[2], r[3]) for r in rows] == [
        (k, c.direction, "yes") for k, c in BUILTIN_CRITERIA.items()
    ]
    assert [r[1] for r in rows] == [c.label for c in BUILTIN_CRITERIA.values()]
    weights = {r[-1] for r in rows}
    assert len(weights) == 1 and weights.pop() > 0


def test_blank_template_only_lacks_corridors(template):
    with pytest.raises(Exception) as err:
        read_workbook(template)
    assert [p.where for p in err.value.problems] == ["Corridors!A2"]


def test_round_trip(tmp_path):
    """Fill the real template in code; the reader returns the typed tables."""
    path = fill_template(
        tmp_path / "filled.xlsx",
        {
            "Corridors": [
                ["C01", "Amberline", "Northport-Lakeside", "1,200", 4200, 1500, None, 12.5],
                ["C02", "Birchway", None, 85.5, "3,100", None, None, 4],
            ],
            "Jurisdictions": [["NA", "Norland", 80], ["SO", "Sorvia", "55%"]],
            "Corridor miles": [["C01", "NA", 1200], ["C02", "so", 85.5]],
            "Adoption": [[2030, "12%"], [2027, 0.01]],
            "Budget": [[2027, "$20,000,000"]],
            "Scenarios": [["dear", "port_cost_usd", "$420,000"]],
        },
    )
    inputs = read_workbook(path)
    c = inputs.corridors
    assert list(c.index) == ["C01", "C02"]
    assert c.loc["C01", "length_mi"] == 1200.0 and c.loc["C02", "trucks_per_day"] == 3100.0
    assert c.loc["C01", "connects"] == "Northport-Lakeside"
    assert [s.key for s in inputs.criteria] == list(BUILTIN_CRITERIA)
    assert inputs.weight_sets[0].name == "default"
    assert sum(inputs.weight_sets[0].values.values()) == pytest.approx(100)
    assert inputs.jurisdictions.loc["SO", "readiness"] == 55.0  # 55% on a 0-100 field is 55
    assert list(inputs.corridor_miles["jurisdiction"]) == ["NA", "SO"]  # case matched
    assert list(inputs.adoption["year"]) == [2027, 2030]
    assert list(inputs.adoption["electric_share"]) == [0.01, 0.12]
    assert inputs.budget["capital_usd"].tolist() == [2e7]
    assert inputs.scenarios["value"].tolist() == [420000.0]
    assert inputs.pairwise is None  # the template's matrix holds no judgment
    # the template's value cells are empty: no assumption counts as the planner's
    assert inputs.assumptions == {}
    assert inputs.warnings == []
    assert inputs.where("Corridors", "length_mi", "C02") == "Corridors!D3"
    assert inputs.sheet_names[0] == INSTRUCTIONS


def test_write_is_atomic(tmp_path):
    write_template(tmp_path / "a.xlsx")
    assert [p.name for p in tmp_path.iterdir()] == ["a.xlsx"]


def _soffice(args, cwd):
    import os
    import subprocess

    env = {**os.environ, "HOME": str(cwd)}  # a private LibreOffice profile
    return subprocess.run(
        ["soffice", "--headless", *args],
        cwd=cwd,
        env=env,
        capture_output=True,
        text=True,
        timeout=180,
        check=False,
    )


@pytest.mark.slow
@pytest.mark.skipif(shutil.which("soffice") is None, reason="LibreOffice is not installed")
def test_libreoffice_opens_and_resaves_the_template(tmp_path):
    """LibreOffice keeps every sheet, header note and validation list, and computes formulas."""
    write_template(tmp_path / "blank.xlsx")
    _soffice(["--convert-to", "ods", "--outdir", "ods", "blank.xlsx"], tmp_path)
    _soffice(
        ["--convert-to", "xlsx:Calc MS Excel 2007 XML", "--outdir", "back", "ods/blank.ods"],
        tmp_path,
    )
    book = openpyxl.load_workbook(tmp_path / "back" / "blank.xlsx")
    assert book.sheetnames == [INSTRUCTIONS, *SHEETS]
    for name, sch in SHEETS.items():
        notes = [c for c in book[name][1] if c.comment is not None]
        assert len(notes) == max(1, len(sch.fields) + (name == "Criteria")), name
    lists = {(str(d.sqref), d.formula1) for d in book["Criteria"].data_validations.dataValidation}
    assert {("C2:C500", '"benefit,cost"'), ("D2:D500", '"yes,no"')} <= lists
    # a workbook whose formulas were never calculated reads once LibreOffice has saved it
    book_with(tmp_path / "formulas.xlsx", {("Corridors", "D3"): "=D2*2"})
    _soffice(
        ["--convert-to", "xlsx:Calc MS Excel 2007 XML", "--outdir", "saved", "formulas.xlsx"],
        tmp_path,
    )
    inputs = read_workbook(tmp_path / "saved" / "formulas.xlsx")
    assert inputs.corridors.loc["C2", "length_mi"] == 240.0
