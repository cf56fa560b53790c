"""The pre-flight check: format, size limits, entity expansion, decompression bombs."""

from __future__ import annotations

import zipfile

import defusedxml
import openpyxl
import pytest

from ranker.errors import InputError
from ranker.workbook import LIMITS, Limits, check_file, read_workbook
from ranker.workbook import preflight as R

from .corpus import CASES
from .wbfill import book_with

BUILDERS = {c.name: c.builder for c in CASES}


def test_openpyxl_parses_with_defusedxml():
    assert openpyxl.DEFUSEDXML is True
    assert openpyxl.xml.DEFUSEDXML is True
    assert R.DEFUSED is True


def test_documented_limits():
    assert LIMITS == Limits(
        file_bytes=50 * 1024**2,
        unzipped_bytes=500 * 1024**2,
        member_ratio=100.0,
        ratio_from_bytes=1024**2,
        members=10_000,
        rows=100_000,
        columns=200,
    )


def test_valid_workbook_passes(tmp_path):
    assert check_file(book_with(tmp_path / "ok.xlsx")) == []


def _no_openpyxl(monkeypatch):
    def refuse(*a, **k):
        raise AssertionError("openpyxl must not be reached")

    monkeypatch.setattr(R.openpyxl, "load_workbook", refuse)


def test_entity_expansion_refused_before_parsing(tmp_path, monkeypatch):
    """A 'billion laughs' sheet (10**9 copies of 'lol') is refused without expanding it."""
    path = BUILDERS["file_entity_expansion"](tmp_path)
    _no_openpyxl(monkeypatch)
    with pytest.raises(
        InputError,
        match=r"^laughs.xlsx: part xl/worksheets/sheet1.xml declares "
        r"XML entities",
    ):
        read_workbook(path)


def test_entity_expansion_also_refused_by_openpyxl_itself(tmp_path):
    """The second layer: openpyxl parses sheets through defusedxml, which forbids entities."""
    path = BUILDERS["file_entity_expansion"](tmp_path)
    with pytest.raises(ValueError) as err:
        openpyxl.load_workbook(path)
    cause = err.value.__cause__ or err.value.__context__
    assert isinstance(cause, defusedxml.EntitiesForbidden)


def test_decompression_bomb_refused_before_unpacking(tmp_path, monkeypatch):
    path = book_with(tmp_path / "bomb.xlsx")
    with zipfile.ZipFile(path, "a", zipfile.ZIP_DEFLATED) as zf:
        with zf.open("xl/worksheets/sheet99.xml", "w") as fh:
            for _ in range(16):
                fh.write(bytes(1024**2))
    opened = []
    real_open = zipfile.ZipFile.open

    def spy(self, name, *a, **k):
        opened.append(getattr(name, "filename", name))
        return real_open(self, name, *a, **k)

    monkeypatch.setattr(zipfile.ZipFile, "open", spy)
    _no_openpyxl(monkeypatch)
    with pytest.raises(
        InputError,
        match=r"part xl/worksheets/sheet99.xml would unpack more than "
        r"100 times larger than it is stored; refused",
    ):
        read_workbook(path)
    assert "xl/worksheets/sheet99.xml" not in opened


@pytest.mark.parametrize(
    ("limits", "what"),
    [
        (Limits(unzipped_bytes=10_000), r"would unpack to 0 MB, over the 0 MB limit"),
        (Limits(members=5), r"holds \d+ parts, over the limit of 5"),
        (Limits(file_bytes=1000), r"file is 0.0 MB, over the 0 MB limit"),
    ],
)
def test_file_limits(tmp_path, limits, what):
    path = book_with(tmp_path / "in.xlsx")
    with pytest.raises(InputError, match=what) as err:
        read_workbook(path, limits=limits)
    assert err.value.problems[0].where == "in.xlsx"


def test_row_and_column_limits(tmp_path):
    path = book_with(tmp_path / "in.xlsx")
    with pytest.raises(InputError, match=r"^Corridors: has data beyond row 3, over the limit"):
        read_workbook(path, limits=Limits(rows=3))
    with pytest.raises(InputError, match=r"^Corridors: has data in column I, over the limit of 8"):
        read_workbook(path, limits=Limits(columns=8))


def test_macro_warning_from_check_file(tmp_path):
    path = book_with(tmp_path / "m.xlsm")
    assert check_file(path) == [
        "m.xlsm: the workbook is macro-enabled; its macros were neither "
        "run nor kept (the outputs hold values only)"
    ]


def test_every_file_case_is_refused_by_check_file_alone(tmp_path):
    for case in CASES:
        if case.name.startswith("file_") and case.name != "file_damaged_sheet":
            folder = tmp_path / case.name
            folder.mkdir()
            with pytest.raises(InputError) as err:
                check_file(case.builder(folder))
            assert case.where in err.value.problems[0].where, case.name
