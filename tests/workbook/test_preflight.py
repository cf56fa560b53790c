"""The check of the input file before any spreadsheet code opens it (ranker.workbook.preflight).

Checked on small workbooks built here with openpyxl and on hand-made bytes:
every refusal names the file and says what is wrong and how to fix it
(``file.xlsx: what; fix``); the snapshot of the bytes is the file's own
(SHA-256 from :mod:`hashlib`); the cheap XML scan of a sheet finds what
openpyxl writes (merged ranges, hidden rows and columns, formulas without a
saved value), and :func:`last_value_row` agrees with the sheet's XML parsed
by :mod:`xml.etree.ElementTree` (OOXML, ECMA-376 Part 1, 18.3.1.73 ``row``
and 18.3.1.4 ``c``: a value is a ``<v>`` with text or an inline ``<is>``).
"""

from __future__ import annotations

import hashlib
import io
import re
import xml.etree.ElementTree as ET
import zipfile
from pathlib import Path

import numpy as np
import openpyxl
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from openpyxl.worksheet.table import Table

from ranker.errors import InputError
from ranker.workbook import preflight as P

SHAPE = re.compile(r"^[\w.\- ]+: [^;]+; .+$")
NAME = Path("plan.xlsx")


def _book(**sheets) -> bytes:
    wb = openpyxl.Workbook()
    wb.remove(wb.active)
    for title, rows in (sheets or {"Corridors": [["corridor_id", "name"], ["C1", "A"]]}).items():
        ws = wb.create_sheet(title)
        for row in rows:
            ws.append(row)
    buf = io.BytesIO()
    wb.save(buf)
    return buf.getvalue()


def _refused(data: bytes, limits=P.LIMITS, name=NAME) -> str:
    with pytest.raises(InputError) as err:
        P.preflight_bytes(name, data, limits)
    (p,) = err.value.problems
    assert p.where == name.name
    assert SHAPE.match(str(p)), str(p)
    return p.what


def _rezip(data: bytes, change) -> bytes:
    """Copy a zip, letting ``change(name, bytes)`` return new bytes (or None to drop)."""
    out = io.BytesIO()
    with zipfile.ZipFile(io.BytesIO(data)) as src, zipfile.ZipFile(out, "w") as dst:
        for info in src.infolist():
            body = change(info.filename, src.read(info))
            if body is not None:
                dst.writestr(info.filename, body, compress_type=zipfile.ZIP_DEFLATED)
    return out.getvalue()


def test_documented_limits_and_names():
    lim = P.Limits()
    assert (lim.file_bytes, lim.unzipped_bytes) == (50 * 1024**2, 500 * 1024**2)
    assert (lim.member_ratio, lim.ratio_from_bytes, lim.members) == (100.0, 1024**2, 10_000)
    assert (lim.rows, lim.columns) == (100_000, 200)
    assert (lim.shared_strings_bytes, lim.prolog_bytes) == (32 * 1024**2, 1024**2)
    assert P.LIMITS == lim
    assert P.STATE_SHEET == "ranker_state"


def test_fail_names_the_file():
    err = P.fail(Path("/some/folder/plan.xlsx"), "is broken", "save it again")
    assert str(err) == "plan.xlsx: is broken; save it again"


# -- the file on disk --------------------------------------------------------------------


def test_preflight_reads_the_bytes_once(tmp_path):
    path = tmp_path / "plan.xlsx"
    path.write_bytes(_book())
    pre = P.preflight(path, P.LIMITS)
    assert hashlib.sha256(pre.data).hexdigest() == hashlib.sha256(path.read_bytes()).hexdigest()
    assert pre.warnings == [] and set(pre.parts) == {"Corridors"}
    assert P.check_file(path) == []


@pytest.mark.parametrize(
    "make, what",
    [
        (lambda p: None, "file not found"),
        (lambda p: p.mkdir(), "is a folder, not a file"),
        (lambda p: p.write_bytes(b""), "file is empty (0 bytes)"),
    ],
)
def test_preflight_refuses_what_is_not_a_file(tmp_path, make, what):
    path = tmp_path / "plan.xlsx"
    make(path)
    with pytest.raises(InputError) as err:
        P.check_file(path)
    assert str(err.value).startswith(f"plan.xlsx: {what}; ")


def test_preflight_refuses_a_file_over_the_limit(tmp_path):
    path = tmp_path / "plan.xlsx"
    path.write_bytes(_book())
    with pytest.raises(InputError, match=r"^plan.xlsx: file is 0.0 MB, over the 0 MB limit; "):
        P.preflight(path, P.Limits(file_bytes=100))


def test_macro_enabled_warning(tmp_path):
    path = tmp_path / "plan.xlsm"
    path.write_bytes(_book())
    assert P.check_file(path) == [
        "plan.xlsm: the workbook is macro-enabled; its macros were neither run nor kept (the "
        "outputs hold values only)"
    ]


# -- the bytes ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "head, name, words",
    [
        (bytes.fromhex("D0CF11E0A1B11AE1") + b"\0" * 100, "plan.xlsx", "password-protected"),
        (b"<?xml version='1.0'?><Workbook/>", "plan.xls", "an XML or web page file"),
        (b"<html><body>table</body></html>", "plan.xlsx", "an XML or web page file"),
        (b"corridor_id,name\nC1,A\n", "plan.csv", "is a text file (.csv)"),
        (b"corridor_id;name\n", "plan.xlsx", "is a text file (perhaps CSV)"),
        (b"\x00\x01\x02\xff" * 20, "plan.xls", "is not in the .xlsx format"),
        (b"\x00\x01\x02\xff" * 20, "plan.xlsx", "its contents are not a workbook"),
        (b"PK\x03\x04 then nothing", "plan.xlsx", "damaged or incomplete"),
    ],
)
def test_bytes_that_are_not_a_workbook(head, name, words):
    assert words in _refused(head, name=Path(name))


def test_zips_that_are_not_an_xlsx():
    def zipped(**members):
        buf = io.BytesIO()
        with zipfile.ZipFile(buf, "w") as zf:
            for n, body in members.items():
                zf.writestr(n.replace("__", "/").replace("_DOT_", "."), body)
        return buf.getvalue()

    assert "OpenDocument" in _refused(
        zipped(mimetype=b"application/vnd.oasis.opendocument.spreadsheet")
    )
    assert "a Word document" in _refused(zipped(word__document_DOT_xml=b"<w/>"))
    assert "is a zip file but not an Excel workbook" in _refused(zipped(readme_DOT_txt=b"hi"))
    buf = io.BytesIO(_book())  # a workbook with a binary workbook part beside it
    with zipfile.ZipFile(buf, "a") as zf:
        zf.writestr("xl/workbook.bin", b"\0")
    assert "Excel binary workbook (.xlsb)" in _refused(buf.getvalue())


def test_strict_open_xml_is_refused():
    strict = _rezip(
        _book(),
        lambda n, b: (
            b.replace(
                b"http://schemas.openxmlformats.org/spreadsheetml/2006/main",
                b"http://purl.oclc.org/ooxml/spreadsheetml/main",
            )
            if n == "xl/workbook.xml"
            else b
        ),
    )
    assert "Strict Open XML" in _refused(strict)


def test_entity_declaration_is_refused():
    bomb = _rezip(
        _book(),
        lambda n, b: (
            b'<?xml version="1.0"?><!DOCTYPE x [<!ENTITY a "b">]>' + b
            if n == "xl/worksheets/sheet1.xml"
            else b
        ),
    )
    assert _refused(bomb) == (
        "part xl/worksheets/sheet1.xml declares XML entities, which spreadsheet programs never "
        "write; refused for safety"
    )


def test_entity_declaration_in_utf16_is_refused():
    def to_utf16(n, b):
        if n != "xl/worksheets/sheet1.xml":
            return b
        text = '<?xml version="1.0" encoding="UTF-16"?><!DOCTYPE x [<!ENTITY a "b">]>' + b.decode()
        return b"\xff\xfe" + text.encode("utf-16-le")

    assert "declares XML entities" in _refused(_rezip(_book(), to_utf16))


def test_long_prolog_is_refused():
    # 40,000 bytes of padding before the first element, against a limit of 1,000.
    padded = _rezip(
        _book(),
        lambda n, b: b" " * 40_000 + b if n == "xl/worksheets/sheet1.xml" else b,
    )
    what = _refused(padded, P.Limits(prolog_bytes=1000))
    assert what.startswith("part xl/worksheets/sheet1.xml starts with more than 1,000 bytes")
    assert P.preflight_bytes(NAME, padded, P.LIMITS).parts  # under the default limit


SST = "application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"


@pytest.mark.parametrize("part", ["xl/sharedStrings.xml", "xl/text/cells.xml"])
def test_large_shared_strings_are_refused(part):
    # The part is found by its name or by its content type, whatever it is called.
    text = b'<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">'
    text += b"<si><t>" + b"x" * 5000 + b"</t></si></sst>"
    override = f'<Override PartName="/{part}" ContentType="{SST}"/></Types>'.encode()

    def add(n, b):
        return b.replace(b"</Types>", override) if n == "[Content_Types].xml" else b

    buf = io.BytesIO(_rezip(_book(), add))
    with zipfile.ZipFile(buf, "a") as zf:
        zf.writestr(part, text)
    what = _refused(buf.getvalue(), P.Limits(shared_strings_bytes=1000))
    assert what == (
        f"part {part} (the text of the cells) would unpack to 0 MB, over the 0 MB limit"
    )


def test_member_and_ratio_limits():
    assert _refused(_book(), P.Limits(members=3)).startswith("holds ")
    big = _rezip(_book(), lambda n, b: b + b" " * 200_000 if n == "xl/styles.xml" else b)
    with zipfile.ZipFile(io.BytesIO(big)) as zf:
        info = zf.getinfo("xl/styles.xml")  # the sizes the zip directory states
    ratio = info.file_size / info.compress_size
    what = _refused(big, P.Limits(ratio_from_bytes=100_000, member_ratio=ratio * 0.99))
    assert what == (
        f"part xl/styles.xml would unpack more than {ratio * 0.99:,.0f} times larger than it is "
        "stored; refused as a possible decompression bomb"
    )
    # Just under the ratio, or a member under ratio_from_bytes, passes.
    assert P.preflight_bytes(
        NAME, big, P.Limits(ratio_from_bytes=100_000, member_ratio=ratio * 1.01)
    )
    assert P.preflight_bytes(
        NAME, big, P.Limits(ratio_from_bytes=info.file_size, member_ratio=1.0)
    )


def test_packing_methods():
    def repack(method=zipfile.ZIP_DEFLATED):
        out = io.BytesIO()
        with zipfile.ZipFile(io.BytesIO(_book())) as src, zipfile.ZipFile(out, "w") as dst:
            for info in src.infolist():
                kind = method if info.filename == "xl/styles.xml" else zipfile.ZIP_DEFLATED
                dst.writestr(info.filename, src.read(info), compress_type=kind)
        return out.getvalue()

    assert P.preflight_bytes(NAME, repack(zipfile.ZIP_STORED), P.LIMITS).parts
    assert _refused(repack(zipfile.ZIP_BZIP2)) == (
        "part xl/styles.xml is packed with zip method 12, which spreadsheet programs do not write"
    )


# -- the sheets ----------------------------------------------------------------------------


def test_sheet_scan_finds_merges_hidden_cells_and_unsaved_formulas():
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Corridors"
    for row in [["corridor_id", "name", "length_mi"], ["C1", "A", 10], ["C2", "B", "=C2*2"]]:
        ws.append(row)
    ws.merge_cells("A5:B5")
    ws.row_dimensions[3].hidden = True
    ws.column_dimensions["C"].hidden = True
    budget = wb.create_sheet("budget")  # matched ignoring case
    budget.append(["year", "capital_usd"])
    budget.append([2030, 1])
    budget.append(["total", 1])
    budget.sheet_state = "hidden"
    table = Table(displayName="money", ref="A1:B3", totalsRowCount=1)
    budget.add_table(table)
    wb.create_sheet("My notes")  # not a contract sheet: not scanned
    buf = io.BytesIO()
    wb.save(buf)
    parts = P.preflight_bytes(NAME, buf.getvalue(), P.LIMITS).parts
    assert set(parts) == {"Corridors", "Budget"}
    c = parts["Corridors"]
    assert (c.title, c.hidden, c.has_formulas) == ("Corridors", False, True)
    assert c.merges == ["A5:B5"]
    assert c.hidden_rows == {3} and c.hidden_cols == {3}
    assert c.unsaved == {(3, 3): "=C2*2"}  # openpyxl saves a formula without its value
    assert c.last_value_row == 3
    b = parts["Budget"]
    assert (b.title, b.hidden, b.has_formulas) == ("budget", True, False)
    assert b.totals_rows == {3: "A3:B3"}


def test_sheet_names_the_reader_refuses():
    wb = openpyxl.Workbook()
    wb.active.title = "Corridors"
    wb.create_sheet("corridors ")  # reads as Corridors too
    wb.create_sheet("Ranker_State")
    buf = io.BytesIO()
    wb.save(buf)
    with pytest.raises(InputError) as err:
        P.preflight_bytes(NAME, buf.getvalue(), P.LIMITS)
    got = {p.where: p for p in err.value.problems}
    assert set(got) == {"corridors ", "Ranker_State"}
    assert "both match the name Corridors" in got["corridors "].what
    assert "the name ranker keeps for its own hidden record" in got["Ranker_State"].what
    for p in err.value.problems:
        assert p.what and p.fix


# -- the last row holding a value -----------------------------------------------------------


def _sheet_xml(rows, prefix=""):
    """A worksheet part: rows of cells, each 'v' (a value), 'e' (empty v), 'f' (formula
    with an empty text result), 'i' (an inline string) or 's' (styled, no value)."""
    p = f"{prefix}:" if prefix else ""
    ns = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
    xmlns = f'xmlns:{prefix}="{ns}"' if prefix else f'xmlns="{ns}"'
    out = [f'<?xml version="1.0"?><{p}worksheet {xmlns}><{p}sheetData>']
    for r, cells in rows:
        out.append(f'<{p}row r="{r}">')
        for j, kind in enumerate(cells):
            ref = f'r="{chr(65 + j)}{r}"'
            out.append(
                {
                    "v": f"<{p}c {ref}><{p}v>{r * 10 + j}</{p}v></{p}c>",
                    "e": f"<{p}c {ref}><{p}v></{p}v></{p}c>",
                    "f": f'<{p}c {ref} t="str"><{p}f>A1&amp;""</{p}f><{p}v></{p}v></{p}c>',
                    "i": f'<{p}c {ref} t="inlineStr"><{p}is><{p}t>x</{p}t></{p}is></{p}c>',
                    "s": f'<{p}c {ref} s="1"/>',
                }[kind]
            )
        out.append(f"</{p}row>")
    out.append(f"</{p}sheetData></{p}worksheet>")
    return "".join(out).encode()


def _etree_last_row(xml: bytes) -> int:
    """The last row whose cells hold a value, from the parsed XML."""
    last = 0
    for row in ET.fromstring(xml).iter():
        if not row.tag.endswith("}row"):
            continue
        for c in row:
            v = c.find("{*}v")
            if (v is not None and v.text) or c.find("{*}is") is not None:
                last = int(row.get("r"))
    return last


@settings(max_examples=60, deadline=None, derandomize=True)
@given(
    st.lists(st.lists(st.sampled_from("vvveefis"), min_size=1, max_size=6), max_size=40),
    st.integers(0, 10_000),
    st.sampled_from(["", "x"]),
)
def test_last_value_row_equals_the_parsed_xml(kinds, seed, prefix):
    # Every row ends with a value here, so no row without one follows the last value.
    rng = np.random.default_rng(seed)
    numbers = sorted(rng.choice(500, len(kinds), replace=False) + 1)
    rows = [(r, [*cells, "v"]) for r, cells in zip(numbers, kinds, strict=True)]
    xml = _sheet_xml(rows, prefix)
    want = _etree_last_row(xml)
    assert want == (numbers[-1] if rows else 0)
    assert P.last_value_row([xml]) == want
    # Cut into chunks anywhere, tags split across them.
    cuts = sorted(set(rng.integers(0, len(xml), size=6).tolist()))
    chunks = [xml[a:b] for a, b in zip([0, *cuts], [*cuts, len(xml)], strict=True)]
    assert P.last_value_row(chunks) == want


@settings(max_examples=200, deadline=None, derandomize=True)
@given(
    st.lists(st.lists(st.sampled_from("vvefis"), min_size=1, max_size=6), max_size=40),
    st.integers(0, 10_000),
    st.sampled_from(["", "x"]),
    st.sampled_from([1, 7, 64, 300, 1000]),
)
def test_last_value_row_with_empty_rows_after_any_chunking(kinds, seed, prefix, size):
    """Rows without a value may follow the last value (formatted rows far below): the
    answer is still the parsed XML's, however the part is cut into chunks (a value
    found again in the overlap kept between chunks takes its own row, not a later one)."""
    rng = np.random.default_rng(seed)
    numbers = sorted(rng.choice(200_000, len(kinds), replace=False) + 1)
    rows = list(zip(numbers, kinds, strict=True))
    xml = _sheet_xml(rows, prefix)
    want = _etree_last_row(xml)
    assert P.last_value_row([xml[a : a + size] for a in range(0, len(xml), size)]) == want
    cuts = sorted(set(rng.integers(0, len(xml) + 1, size=8).tolist()))
    chunks = [xml[a:b] for a, b in zip([0, *cuts], [*cuts, len(xml)], strict=True)]
    assert P.last_value_row(chunks) == want


@pytest.mark.parametrize("prefix", ["", "x"])
@pytest.mark.parametrize("tail", [0, 100, 300, 600])
@pytest.mark.parametrize("cells", [1, 6, 12])
def test_last_value_row_not_taken_from_a_later_empty_row(tail, cells, prefix):
    """A formatted empty row far below the last value, then other parts of the sheet
    (conditional formats) after the data: the last value's own row counts, not the
    empty row's, for any chunking (found on a valid workbook refused as too long)."""
    p = f"{prefix}:" if prefix else ""
    xml = _sheet_xml([(3, "v"), (5, "v" * cells)], prefix).decode()
    padding = f"<{p}conditionalFormatting sqref='K2:K5'>{' ' * tail}</{p}conditionalFormatting>"
    empty = f'<{p}row r="150000" ht="30" customHeight="1"/>'
    xml = xml.replace(f"</{p}sheetData>", empty + f"</{p}sheetData>")
    xml = xml.replace(f"</{p}worksheet>", padding + f"</{p}worksheet>").encode()
    assert _etree_last_row(xml) == 5
    assert P.last_value_row([xml]) == 5
    for size in (1, 50, 257, 1000):
        assert P.last_value_row([xml[a : a + size] for a in range(0, len(xml), size)]) == 5


def test_last_value_row_edges():
    assert P.last_value_row([]) == 0
    assert P.last_value_row([_sheet_xml([])]) == 0
    assert P.last_value_row([_sheet_xml([(4, "ss"), (9, "f")])]) == 0  # formatting only
    assert P.last_value_row([_sheet_xml([(2, "v"), (7, "e")])]) == 2
    # A row tag without its number: the answer cannot be told without parsing.
    xml = _sheet_xml([(2, "v")]).replace(b'<row r="2">', b"<row>")
    assert P.last_value_row([xml]) is None
