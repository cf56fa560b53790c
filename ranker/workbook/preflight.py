"""Check the input file itself before any spreadsheet code opens it.

:func:`check_file` refuses, naming the file: a missing file, a folder, a
device or pipe, an empty file, an ``.xls``, ``.csv``, ``.ods``, ``.xlsb``, a
web page or random bytes, an encrypted workbook (OLE compound file,
signature D0CF11E0), a damaged zip, a file over the size limits of
:data:`LIMITS`, a zip member that would unpack far larger than it is stored,
a shared-strings part too large to read whole (sizes come from the zip
directory, so nothing is unpacked first), a member encrypted inside the zip
or packed by a method spreadsheet programs never use, any XML part that
declares entities or hides its prolog behind more than ``prolog_bytes``
(spreadsheet programs never write either; this stops "billion laughs"
expansion even before defusedxml, which openpyxl parses with, would), and a
member whose data is damaged or not the size the directory says (every
member is unpacked once, a chunk at a time, after the size checks).

It also maps each contract sheet to its XML part and scans that part for
what read-only openpyxl cannot see: merged ranges, hidden rows and columns,
and whether any formula is present.
"""

from __future__ import annotations

import io
import re
import zipfile
import zlib
from dataclasses import dataclass, field
from pathlib import Path

import openpyxl
from defusedxml import ElementTree as SafeET
from openpyxl.utils import get_column_letter, range_boundaries

from ranker.errors import InputError, Problems
from ranker.workbook.schema import SHEETS, normalize_sheet_name

#: The hidden sheet where a results workbook keeps its run's state
#: (``ranker.report.workbook.STATE_SHEET``); a planner's sheet may not take the name.
STATE_SHEET = "ranker_state"

#: True when openpyxl parses with defusedxml (it does whenever defusedxml is
#: installed); the entity pre-scan of :func:`check_file` guards either way.
DEFUSED = bool(openpyxl.DEFUSEDXML)


@dataclass(frozen=True)
class Limits:
    """Size limits of an input workbook.

    Attributes
    ----------
    file_bytes : int
        Largest file on disk [B].
    unzipped_bytes : int
        Largest total of the zip members' uncompressed sizes [B].
    member_ratio : float
        Largest uncompressed/compressed ratio of one member once it is
        bigger than ``ratio_from_bytes`` [-].
    ratio_from_bytes : int
        Members smaller than this are not ratio-checked [B].
    members : int
        Most members in the zip [-].
    rows : int
        Most rows of one contract sheet, header included [-].
    columns : int
        Most columns of one contract sheet [-].
    shared_strings_bytes : int
        Largest uncompressed shared-strings part (the text of every cell of
        every sheet, which is read whole before any sheet) [B].
    prolog_bytes : int
        Longest XML prolog (what comes before the first element) of one part;
        spreadsheet programs write well under a hundred bytes [B].
    """

    file_bytes: int = 50 * 1024**2
    unzipped_bytes: int = 500 * 1024**2
    member_ratio: float = 100.0
    ratio_from_bytes: int = 1024**2
    members: int = 10_000
    rows: int = 100_000
    columns: int = 200
    shared_strings_bytes: int = 32 * 1024**2
    prolog_bytes: int = 1024**2


#: The limits in force.
LIMITS = Limits()

_OLE = bytes.fromhex("D0CF11E0A1B11AE1")
_XML_PARTS = (".xml", ".rels", ".vml")
_FORMULA = re.compile(rb"<(?:\w++:)?+f[\s>/]")
_MERGE = re.compile(rb'<(?:\w++:)?+mergeCell\s[^>]*?ref="([A-Za-z]+\d+(?::[A-Za-z]+\d+)?)"')
_HIDDEN_ROW_TAG = re.compile(rb'<(?:\w++:)?+row\s[^>]*\bhidden="[^>]*>')
_COL_TAG = re.compile(rb"<(?:\w++:)?+col\s[^>]*>")
_ATTR = re.compile(rb'(\w+)="([^"]*)"')
_NS_MAIN = "{http://schemas.openxmlformats.org/spreadsheetml/2006/main}"
_NS_REL = "{http://schemas.openxmlformats.org/officeDocument/2006/relationships}"
_NS_PKG = "{http://schemas.openxmlformats.org/package/2006/relationships}"
_NS_CT = "{http://schemas.openxmlformats.org/package/2006/content-types}"
_SHARED_STRINGS_CT = (
    "application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"
)
_UNSAFE = "rebuild the workbook from a fresh template and paste the values in"
RESAVE = "open it in Excel or LibreOffice and save it as Excel Workbook (.xlsx)"


@dataclass
class _Part:
    """Where one sheet lives in the zip, and what its XML shows cheaply."""

    title: str
    member: str
    hidden: bool = False
    has_formulas: bool = False
    merges: list[str] = field(default_factory=list)
    hidden_rows: set[int] = field(default_factory=set)
    hidden_cols: set[int] = field(default_factory=set)
    #: The last row holding a stored value (None: rows without numbers, so unknown).
    last_value_row: int | None = 0
    #: Formula cells saved without a value: {(row, column): formula text}.
    unsaved: dict[tuple[int, int], str] = field(default_factory=dict)
    #: Totals rows of spreadsheet tables on the sheet: {row: range of the row}.
    totals_rows: dict[int, str] = field(default_factory=dict)


@dataclass
class _Preflight:
    warnings: list[str]
    parts: dict[str, _Part]
    #: The input's bytes, read once: every later stage works from this snapshot.
    data: bytes = b""


def check_file(path: Path, *, limits: Limits = LIMITS) -> list[str]:
    """Check the file before it is opened as a workbook.

    Parameters
    ----------
    path : Path
        The input workbook.
    limits : Limits, optional
        Size limits (default :data:`LIMITS`).

    Returns
    -------
    list of str
        Warnings (for a macro-enabled workbook).

    Raises
    ------
    InputError
        Naming the file, for a missing, unreadable, wrong-format, encrypted,
        oversized or unsafe file.

    Examples
    --------
    >>> check_file(Path("missing.xlsx"))  # doctest: +SKIP
    InputError: missing.xlsx: file not found; ...
    """
    return preflight(Path(path), limits).warnings


def fail(path: Path, what: str, fix: str) -> InputError:
    return InputError.one(path.name, what, fix)


def preflight(path: Path, limits: Limits) -> _Preflight:
    if not path.exists():
        raise fail(path, "file not found", "check the file name and the folder")
    if path.is_dir():
        raise fail(path, "is a folder, not a file", "give the path of the .xlsx workbook")
    if not path.is_file():  # a device, a pipe or a socket: reading it may never end
        raise fail(
            path,
            "is not a regular file (a device, pipe or socket)",
            "give the path of the .xlsx workbook saved on disk",
        )
    size = path.stat().st_size
    if size > limits.file_bytes:
        raise fail(
            path,
            f"file is {size / 1024**2:,.1f} MB, over the {limits.file_bytes / 1024**2:,.0f} MB limit",
            "remove unused sheets, pictures and formatting, or split the corridors into two runs",
        )
    if size == 0:
        raise fail(path, "file is empty (0 bytes)", "save the workbook again from Excel")
    try:
        with path.open("rb") as fh:
            data = fh.read(limits.file_bytes + 1)  # the one read of the input's bytes
    except OSError as exc:
        raise fail(
            path,
            f"cannot be opened ({exc.strerror})",
            "close it in other programs and check you may read it",
        ) from None
    if len(data) > limits.file_bytes:  # it grew while being read
        raise fail(
            path,
            f"file is over the {limits.file_bytes / 1024**2:,.0f} MB limit",
            "remove unused sheets, pictures and formatting, or split the corridors into two runs",
        )
    if not data:
        raise fail(path, "file is empty (0 bytes)", "save the workbook again from Excel")
    return preflight_bytes(path, data, limits)


def preflight_bytes(path: Path, data: bytes, limits: Limits) -> _Preflight:
    """Check a snapshot of the input's bytes; ``path`` only names it in messages."""
    head = data[:8]
    if head == _OLE:
        raise fail(
            path,
            "is password-protected or in the old Excel 97-2003 (.xls) format",
            "remove the password (File > Info > Protect Workbook) and save as Excel Workbook (.xlsx)",
        )
    if not zipfile.is_zipfile(io.BytesIO(data)):
        raise fail(path, _not_zip_what(path, head), RESAVE)
    try:
        with zipfile.ZipFile(io.BytesIO(data)) as zf:
            pre = _check_zip(path, zf, limits)
    except (zipfile.BadZipFile, zlib.error, EOFError, ValueError):
        raise fail(path, "is damaged (the zip container cannot be read)", RESAVE) from None
    pre.data = data
    return pre


def _not_zip_what(path: Path, head: bytes) -> str:
    ext = path.suffix.lower()
    if head[:2] == b"PK":
        return "is damaged or incomplete (its zip container cannot be read)"
    if head[:5].lower() in (b"<?xml", b"<html", b"<!doc") or head[:2] == b"\xff\xfe":
        # Spreadsheet programs save web pages and XML Spreadsheet 2003 under .xls too.
        return "is an XML or web page file (perhaps XML Spreadsheet 2003), not an .xlsx workbook"
    if ext in (".csv", ".txt", ".tsv"):
        return f"is a text file ({ext}), not an Excel workbook"
    if ext == ".xls":
        return "is not in the .xlsx format"
    try:
        head.decode("ascii")
        text = True
    except UnicodeDecodeError:
        text = False
    if text:
        return "is a text file (perhaps CSV), not an Excel workbook"
    return "is not an Excel workbook (.xlsx): its contents are not a workbook"


def _check_zip(path: Path, zf: zipfile.ZipFile, limits: Limits) -> _Preflight:
    infos = zf.infolist()
    if len(infos) > limits.members:
        raise fail(
            path, f"holds {len(infos):,} parts, over the limit of {limits.members:,}", RESAVE
        )
    total = 0
    for info in infos:
        total += info.file_size
        ratio = info.file_size / max(info.compress_size, 1)
        if info.file_size > limits.ratio_from_bytes and ratio > limits.member_ratio:
            raise fail(
                path,
                f"part {info.filename} would unpack more than {limits.member_ratio:,.0f} times "
                "larger than it is stored; refused as a possible decompression bomb",
                _UNSAFE,
            )
    if total > limits.unzipped_bytes:
        raise fail(
            path,
            f"would unpack to {total / 1024**2:,.0f} MB, over the "
            f"{limits.unzipped_bytes / 1024**2:,.0f} MB limit",
            "remove unused sheets, pictures and formatting, or split the corridors into two runs",
        )
    _check_methods(path, infos)
    names = {i.filename for i in infos}
    _check_kind(path, zf, names)
    for info in infos:
        if info.filename.lower().endswith(_XML_PARTS):
            _scan_prolog(path, zf, info.filename, limits)
    _check_shared_strings(path, zf, names, limits)
    _unpack_all(path, zf, infos)
    out: list[str] = []
    if "xl/vbaProject.bin" in names or path.suffix.lower() in (".xlsm", ".xltm"):
        out.append(
            f"{path.name}: the workbook is macro-enabled; its macros were neither run nor kept "
            "(the outputs hold values only)"
        )
    parts = _sheet_parts(path, zf, names)
    return _Preflight(out, parts)


#: Compression methods spreadsheet programs write (zipfile also reads bzip2 and lzma).
_METHODS = (zipfile.ZIP_STORED, zipfile.ZIP_DEFLATED)


def _check_methods(path: Path, infos: list[zipfile.ZipInfo]) -> None:
    """Refuse members that are encrypted or packed in a way no spreadsheet program uses."""
    for info in infos:
        if info.flag_bits & 0x1:
            raise fail(
                path,
                f"part {info.filename} is encrypted inside the zip, which spreadsheet "
                "programs never do",
                RESAVE,
            )
        if info.compress_type not in _METHODS:
            raise fail(
                path,
                f"part {info.filename} is packed with zip method {info.compress_type}, which "
                "spreadsheet programs do not write",
                RESAVE,
            )


def _unpack_all(path: Path, zf: zipfile.ZipFile, infos: list[zipfile.ZipInfo]) -> None:
    """Unpack every member once, in chunks, checking its checksum; keep nothing.

    Runs after the size checks, so at most ``limits.unzipped_bytes`` are
    unpacked and at most one chunk is held; a member that is damaged, or
    longer or shorter than the zip directory says, is refused here rather
    than deep inside a later reader.
    """
    for info in infos:
        try:
            with zf.open(info) as fh:
                while fh.read(1024**2):
                    pass
        except (zipfile.BadZipFile, zlib.error, EOFError, ValueError):
            raise _damaged(path, info.filename) from None


def _damaged(path: Path, member: str) -> InputError:
    return fail(path, f"is damaged (part {member} cannot be unpacked)", RESAVE)


def _check_kind(path: Path, zf: zipfile.ZipFile, names: set[str]) -> None:
    if "mimetype" in names:
        with zf.open("mimetype") as fh:
            mime = fh.read(100)
        if b"opendocument" in mime:
            raise fail(
                path,
                "is an OpenDocument spreadsheet (.ods), not .xlsx",
                "in LibreOffice use File > Save As > Excel 2007-365 (.xlsx)",
            )
    if "xl/workbook.bin" in names:
        raise fail(
            path,
            "is an Excel binary workbook (.xlsb)",
            "in Excel use File > Save As > Excel Workbook (.xlsx)",
        )
    if "[Content_Types].xml" not in names or "xl/workbook.xml" not in names:
        what = "is a zip file but not an Excel workbook"
        if "word/document.xml" in names:
            what = "is a Word document, not an Excel workbook"
        elif "ppt/presentation.xml" in names:
            what = "is a PowerPoint file, not an Excel workbook"
        raise fail(path, what, "give the .xlsx workbook made from `ranker template`")
    with zf.open("xl/workbook.xml") as fh:
        head = fh.read(2000)
    if b"purl.oclc.org/ooxml/spreadsheetml" in head:
        raise fail(
            path,
            "is saved as Strict Open XML, which cannot be read",
            "in Excel use File > Save As > Excel Workbook (.xlsx), not Strict Open XML",
        )


def _scan_prolog(path: Path, zf: zipfile.ZipFile, member: str, limits: Limits) -> None:
    """Refuse DOCTYPE/ENTITY declarations: Excel never writes them.

    The prolog is read in chunks up to the first element, in UTF-8 or, after a
    byte-order mark or a zero byte, UTF-16; a prolog longer than
    ``limits.prolog_bytes`` is refused too, so no padding can push a
    declaration out of sight.
    """
    try:
        prolog = _read_prolog(path, zf, member, limits)
    except (zipfile.BadZipFile, zlib.error, EOFError):
        raise _damaged(path, member) from None
    if b"<!DOCTYPE" in prolog or b"<!ENTITY" in prolog:
        raise fail(
            path,
            f"part {member} declares XML entities, which spreadsheet programs never write; "
            "refused for safety",
            _UNSAFE,
        )


def _read_prolog(path: Path, zf: zipfile.ZipFile, member: str, limits: Limits) -> bytes:
    prolog = b""
    with zf.open(member) as fh:
        while True:
            chunk = fh.read(16384)
            if not chunk:
                break
            prolog += chunk
            text = _as_utf8(prolog)
            m = re.search(rb"<[A-Za-z_]", text)
            if m:
                return text[: m.start()]
            if len(prolog) > limits.prolog_bytes:
                raise fail(
                    path,
                    f"part {member} starts with more than {limits.prolog_bytes:,} bytes before "
                    "its first element, which spreadsheet programs never write; refused for "
                    "safety",
                    _UNSAFE,
                )
    return _as_utf8(prolog)


def _as_utf8(data: bytes) -> bytes:
    """Re-encode the start of a UTF-16 XML part as UTF-8 (other data is returned as is)."""
    head = data[:4]
    if head[:2] in (b"\xff\xfe", b"\xfe\xff"):
        codec, data = ("utf-16-le" if head[:2] == b"\xff\xfe" else "utf-16-be"), data[2:]
    elif head[:2] == b"<\x00":
        codec = "utf-16-le"
    elif head[:2] == b"\x00<":
        codec = "utf-16-be"
    else:
        return data
    return data[: len(data) // 2 * 2].decode(codec, errors="replace").encode("utf-8")


def _check_shared_strings(path: Path, zf: zipfile.ZipFile, names: set[str], limits: Limits):
    """Refuse a shared-strings part too large to read whole (sizes from the zip directory)."""
    members = {"xl/sharedStrings.xml"} & names
    if "[Content_Types].xml" in names:
        types = _xml(path, zf, "[Content_Types].xml")
        for o in types.iter(f"{_NS_CT}Override"):
            if o.get("ContentType") == _SHARED_STRINGS_CT:
                members.add(o.get("PartName", "").lstrip("/"))
    for member in sorted(members & names):
        size = zf.getinfo(member).file_size
        if size > limits.shared_strings_bytes:
            raise fail(
                path,
                f"part {member} (the text of the cells) would unpack to "
                f"{size / 1024**2:,.0f} MB, over the "
                f"{limits.shared_strings_bytes / 1024**2:,.0f} MB limit",
                "delete unused sheets and text, or split the corridors into two runs",
            )


def _xml(path: Path, zf: zipfile.ZipFile, member: str):
    try:
        return SafeET.fromstring(zf.read(member))
    except Exception:  # noqa: BLE001 - any XML fault in the package is the file's fault
        raise fail(path, f"is damaged (part {member} is not valid XML)", RESAVE) from None


def _sheet_parts(path: Path, zf: zipfile.ZipFile, names: set[str]):
    """Map each contract sheet to its XML part and scan that part cheaply."""
    book = _xml(path, zf, "xl/workbook.xml")
    rels: dict[str, tuple[str, str]] = {}
    rels_name = "xl/_rels/workbook.xml.rels"
    if rels_name in names:
        for rel in _xml(path, zf, rels_name).iter(f"{_NS_PKG}Relationship"):
            target = rel.get("Target", "")
            target = target.lstrip("/") if target.startswith("/") else "xl/" + target
            rels[rel.get("Id", "")] = (target, rel.get("Type", ""))
    wanted = {normalize_sheet_name(n): n for n in SHEETS}
    parts: dict[str, _Part] = {}
    titles: dict[str, list[str]] = {}
    problems = Problems()
    for sheet in book.iter(f"{_NS_MAIN}sheet"):
        title = sheet.get("name", "")
        state = sheet.get("state", "visible")
        if title.strip().lower() == STATE_SHEET and (
            state != "veryHidden" or title != STATE_SHEET
        ):
            problems.add(
                title,
                f"a sheet of the workbook is named {title!r}, the name ranker keeps for its own "
                "hidden record of the last run",
                "rename that sheet (for example to 'my state')",
            )
        canon = wanted.get(normalize_sheet_name(title))
        if canon is None:
            continue
        titles.setdefault(canon, []).append(title)
        rel = rels.get(sheet.get(f"{_NS_REL}id", ""), ("", ""))
        member, kind = rel
        if kind.endswith("/chartsheet") or "chartsheets/" in member:
            problems.add(
                title,
                "is a chart sheet, not a sheet of cells",
                f"put the table on an ordinary worksheet named {canon} and give the chart "
                "sheet another name",
            )
            continue
        if member not in names or canon in parts:
            continue
        part = _Part(title, member, hidden=state != "visible")
        _scan_sheet(zf.read(member), part)
        part.totals_rows = _totals_rows(path, zf, names, member)
        parts[canon] = part
    for canon, found in titles.items():
        if len(found) > 1:
            shown = " and ".join(repr(t) for t in found)
            problems.add(
                found[1],
                f"the sheets {shown} both match the name {canon}, so which one is read would "
                "depend on the order of the tabs",
                "delete one of them, or rename it so that it no longer reads as " + canon,
            )
    problems.raise_if_any()
    return parts


def _totals_rows(path: Path, zf: zipfile.ZipFile, names: set[str], member: str) -> dict:
    """Return {row: range} of the totals rows of the spreadsheet tables on one sheet."""
    folder, _, file = member.rpartition("/")
    rels_name = f"{folder}/_rels/{file}.rels"
    if rels_name not in names:
        return {}
    out: dict[int, str] = {}
    for rel in _xml(path, zf, rels_name).iter(f"{_NS_PKG}Relationship"):
        if not rel.get("Type", "").endswith("/table"):
            continue
        target = rel.get("Target", "")
        target = target.lstrip("/") if target.startswith("/") else _join(folder, target)
        if target not in names:
            continue
        table = _xml(path, zf, target)
        try:
            count = int(table.get("totalsRowCount", "0") or 0)
            c1, r1, c2, r2 = range_boundaries(table.get("ref", ""))
        except (ValueError, TypeError):
            continue
        for row in range(max(r2 - count + 1, r1 + 1), r2 + 1):
            out[row] = f"{get_column_letter(c1)}{row}:{get_column_letter(c2)}{row}"
    return out


def _join(folder: str, target: str) -> str:
    """Resolve a relationship target relative to the folder of its source part."""
    parts = folder.split("/") if folder else []
    for piece in target.split("/"):
        if piece == "..":
            if parts:
                parts.pop()
        elif piece and piece != ".":
            parts.append(piece)
    return "/".join(parts)


#: A formula cell with no value, or an empty one, that is not a text result (t="str"
#: with an empty value is a saved empty text): an unsaved formula.
_UNSAVED = re.compile(
    rb'<(?:\w++:)?+c\b(?P<a>(?:(?!t="str")[^>/])*)>\s*'
    rb"<(?:\w++:)?+f\b[^>]*?(?:/>|>(?P<f>[^<]*)</(?:\w++:)?+f>)\s*"
    rb"(?:<(?:\w++:)?+v\s*/>|<(?:\w++:)?+v>\s*</(?:\w++:)?+v>)?\s*</(?:\w++:)?+c>"
)
_CELL_REF = re.compile(rb'\sr="([A-Za-z]{1,3})(\d+)"')


def _unsaved_formulas(xml: bytes) -> dict[tuple[int, int], str]:
    """Find the formula cells stored without a value (``<f>`` and no or an empty ``<v>``).

    An empty ``<v>`` of a text cell (``t="str"``) is a saved empty result. One
    regular-expression search of the sheet's XML, instead of a second parse of
    every row; only the cells it finds reach Python.
    """
    from html import unescape

    from openpyxl.utils import column_index_from_string

    out: dict[tuple[int, int], str] = {}
    for m in _UNSAVED.finditer(xml):
        ref = _CELL_REF.search(m.group("a"))
        if ref is None:
            continue
        text = unescape((m.group("f") or b"").decode("utf-8", "replace")).strip()
        pos = (int(ref.group(2)), column_index_from_string(ref.group(1).decode().upper()))
        out[pos] = f"={text}" if text else "(a shared formula)"
    return out


#: A row's start tag, and a stored value (a ``<v>`` with content, or an inline string).
_ROW_START = re.compile(rb"<(?:\w++:)?+row\b([^>]*)>")
_VALUE_TAG = re.compile(rb"<(?:\w++:)?+v(?:\s[^>]*)?>[^<]|<(?:\w++:)?+is>")
_ROW_NUMBER = re.compile(rb'\sr="(\d+)"')


def _row_before(block: bytes, end: int, limit: int | None = None) -> tuple[bool, int | None]:
    """Find the last row start tag that starts before ``end`` and ends by ``limit``
    (default ``end``): (found, its number or None)."""
    limit = end if limit is None else limit
    at = max(block.rfind(b"<row", 0, limit), block.rfind(b":row", 0, limit))
    while at >= 0:
        start = at if block[at : at + 1] == b"<" else block.rfind(b"<", 0, at)
        if start < end:
            m = _ROW_START.match(block, max(start, 0))
            if m is not None and m.end() <= limit:
                n = _ROW_NUMBER.search(m.group(1))
                return True, int(n.group(1)) if n else None
        at = max(block.rfind(b"<row", 0, at), block.rfind(b":row", 0, at))
    return False, None


def last_value_row(chunks) -> int | None:
    """Return the last row of a sheet's XML that holds a stored value (0 for none).

    ``chunks`` is an iterable of byte strings read in order (a whole part may
    be one chunk). None when that row's tag carries no number, so the answer
    cannot be told without parsing. Empty cells (formatted only) and formulas
    whose saved result is empty text hold no value. The value search runs in
    the regular-expression engine and the row is found by searching back
    from the last value, so a million rows cost well under a second.
    """
    from collections import deque

    last: int | None = 0
    row: int | None = 0  # the last row tag starting before the block kept (0: none)
    block = b""
    for chunk in [*chunks, b""]:
        block += chunk
        # Near a chunk's end a tag may be cut; that stretch is searched again next time.
        stop = len(block) if not chunk else max(0, len(block) - 256)
        value = deque(_VALUE_TAG.finditer(block, 0, stop), maxlen=1)
        if value:
            found, number = _row_before(block, value[0].start())
            last = number if found else row  # its row tag lies before the block
        cut = max(stop - 256, 0)
        found, number = _row_before(block, cut, stop)
        if found:
            row = number
        block = block[cut:]
    return last


def _scan_sheet(xml: bytes, part: _Part) -> None:
    part.has_formulas = _FORMULA.search(xml) is not None
    part.last_value_row = last_value_row([xml])
    if part.has_formulas:
        part.unsaved = _unsaved_formulas(xml)
    part.merges = [m.group(1).decode().upper() for m in _MERGE.finditer(xml)]
    for m in _HIDDEN_ROW_TAG.finditer(xml):  # only the row tags that say hidden
        attrs = dict(_ATTR.findall(m.group(0)))
        if attrs.get(b"hidden") in (b"1", b"true") and attrs.get(b"r", b"").isdigit():
            part.hidden_rows.add(int(attrs[b"r"]))
    for m in _COL_TAG.finditer(xml):
        attrs = dict(_ATTR.findall(m.group(0)))
        if attrs.get(b"hidden") in (b"1", b"true"):
            try:
                lo, hi = int(attrs.get(b"min", b"0") or 0), int(attrs.get(b"max", b"0") or 0)
            except ValueError:  # a malformed column attribute hides nothing we can name
                continue
            part.hidden_cols.update(range(max(lo, 1), min(hi, 16384) + 1))
