"""Hostile and foreign files, built by code: entity expansion, zip bombs, lookalikes.

``HOSTILE`` holds :class:`~.cases.Stage` entries (run by ``test_hostile.py``
and listed in ``docs/input-errors.md``); the helpers build the parts by hand
where a spreadsheet program never would. Sizes are chosen to pass every
check but the one each case is aimed at.
"""

from __future__ import annotations

import io
import os
import struct
import zipfile
from collections.abc import Iterable
from pathlib import Path

from .cases import Stage, valid_sheets, write_book

HOSTILE: list[Stage] = []
MiB = 1024**2
SST_TYPE = "application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"
SST_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings"
VBA_TYPE = "application/vnd.ms-office.vbaProject"
VBA_REL = "http://schemas.microsoft.com/office/2006/relationships/vbaProject"
MAIN_NS = b'xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"'

#: Nine nested entities, each ten of the one before: 10**9 copies of "lol".
LAUGHS = (
    b'<!DOCTYPE lolz [<!ENTITY lol "lol">'
    + b"".join(
        b'<!ENTITY lol%d "%s">' % (i, (b"&lol%d;" % (i - 1) if i > 1 else b"&lol;") * 10)
        for i in range(1, 10)
    )
    + b"]>"
)


def hostile(name, about, code, where, says, *, bug=""):
    """Register the decorated builder (``builder(folder) -> path``)."""

    def register(fn):
        def build(folder: Path):
            return fn(folder), []

        HOSTILE.append(Stage(name, about, build, code, where, says, code, bug))
        return fn

    return register


def valid(folder: Path, name: str = "input.xlsx") -> Path:
    """The small valid input of the reader's tests."""
    return write_book(folder / name, valid_sheets())


def rebuild(
    path: Path,
    *,
    change: dict[str, callable] | None = None,
    add: dict[str, bytes | Iterable[bytes]] | None = None,
    types: dict[str, str] | None = None,
    rels: dict[str, tuple[str, str]] | None = None,
    method: int = zipfile.ZIP_DEFLATED,
) -> Path:
    """Rewrite the .xlsx at ``path``: change members, add members (streamed from
    an iterable of chunks), register their content types (part name to type) and
    workbook relationships (id to (type, target))."""
    change, add, types, rels = change or {}, add or {}, types or {}, rels or {}
    src = Path(path).read_bytes()
    out = io.BytesIO()
    with (
        zipfile.ZipFile(io.BytesIO(src)) as zin,
        zipfile.ZipFile(out, "w", method) as zout,
    ):
        for info in zin.infolist():
            data = zin.read(info.filename)
            if info.filename == "[Content_Types].xml" and types:
                extra = "".join(
                    f'<Override PartName="/{part}" ContentType="{ct}"/>'
                    for part, ct in types.items()
                )
                data = data.replace(b"</Types>", extra.encode() + b"</Types>")
            if info.filename == "xl/_rels/workbook.xml.rels" and rels:
                extra = "".join(
                    f'<Relationship Id="{rid}" Type="{t}" Target="{target}"/>'
                    for rid, (t, target) in rels.items()
                )
                data = data.replace(b"</Relationships>", extra.encode() + b"</Relationships>")
            if info.filename in change:
                data = change[info.filename](data)
            zout.writestr(info.filename, data)
        for member, body in add.items():
            with zout.open(member, "w", force_zip64=True) as fh:
                for chunk in [body] if isinstance(body, bytes) else body:
                    fh.write(chunk)
    Path(path).write_bytes(out.getvalue())
    return Path(path)


def with_shared_strings(path: Path, body: bytes | Iterable[bytes]) -> Path:
    """Add a shared-strings part (its ``<si>`` items in ``body``), used by Corridors!B2."""

    def first_name_shared(data: bytes) -> bytes:
        return data.replace(
            b'<c r="B2" t="inlineStr"><is><t>Amberline</t></is></c>',
            b'<c r="B2" t="s"><v>0</v></c>',
            1,
        )

    def chunks():
        yield b'<?xml version="1.0" encoding="UTF-8"?>\n<sst ' + MAIN_NS + b">"
        yield from [body] if isinstance(body, bytes) else body
        yield b"</sst>"

    return rebuild(
        path,
        change={"xl/worksheets/sheet1.xml": first_name_shared},
        add={"xl/sharedStrings.xml": chunks()},
        types={"xl/sharedStrings.xml": SST_TYPE},
        rels={"rIdStrings": (SST_REL, "sharedStrings.xml")},
    )


def _entries(data: bytearray, member: str):
    """Offsets of the local header and the central directory entry of ``member``."""
    with zipfile.ZipFile(io.BytesIO(bytes(data))) as zf:
        local = zf.getinfo(member).header_offset
    at = data.find(b"PK\x01\x02")
    while at != -1:
        n = struct.unpack_from("<H", data, at + 28)[0]
        if bytes(data[at + 46 : at + 46 + n]).decode() == member:
            return local, at
        at = data.find(b"PK\x01\x02", at + 4)
    raise KeyError(member)


def patch_entry(path: Path, member: str, *, size=None, flags=None, method=None) -> Path:
    """Overwrite the declared uncompressed size, flag bits or method of ``member``
    in both its local header and its central directory entry (APPNOTE 4.3.7, 4.3.12)."""
    data = bytearray(Path(path).read_bytes())
    local, central = _entries(data, member)
    for value, lo, ce, fmt in ((size, 22, 24, "<I"), (flags, 6, 8, "<H"), (method, 8, 10, "<H")):
        if value is not None:
            struct.pack_into(fmt, data, local + lo, value)
            struct.pack_into(fmt, data, central + ce, value)
    Path(path).write_bytes(bytes(data))
    return Path(path)


def corridors_member() -> str:
    return "xl/worksheets/sheet1.xml"  # write_book writes Corridors first


# --- XML entity expansion --------------------------------------------------------------


@hostile(
    "laughs_in_shared_strings",
    "The shared strings declare nested entities (a 'billion laughs' attack).",
    2,
    "laughs.xlsx",
    "declares XML entities",
)
def _laughs_sst(folder):
    path = valid(folder, "laughs.xlsx")

    def body():
        yield b"<si><t>&lol9;</t></si>"

    path = with_shared_strings(path, body())
    return rebuild(
        path,
        change={
            "xl/sharedStrings.xml": lambda b: b.replace(b"\n<sst", b"\n" + LAUGHS + b"<sst", 1)
        },
    )


@hostile(
    "laughs_after_padding",
    "A sheet hides its entity declarations after a megabyte of comment.",
    2,
    "padded.xlsx",
    "before its first element",
)
def _laughs_padded(folder):
    path = valid(folder, "padded.xlsx")
    pad = b"<!--" + os.urandom(600 * 1024).hex().encode() + b"-->"

    def change(data: bytes) -> bytes:
        data = data.replace(b"<worksheet", pad + LAUGHS + b"<worksheet", 1)
        return data.replace(b"<t>Amberline</t>", b"<t>&lol9;</t>", 1)

    return rebuild(path, change={corridors_member(): change})


@hostile(
    "laughs_in_utf16",
    "A sheet is saved in UTF-16 and declares nested entities.",
    2,
    "wide.xlsx",
    "declares XML entities",
)
def _laughs_utf16(folder):
    path = valid(folder, "wide.xlsx")

    def change(data: bytes) -> bytes:
        data = data.replace(b'encoding="UTF-8"', b'encoding="UTF-16"')
        data = data.replace(b"<worksheet", LAUGHS + b"<worksheet", 1)
        data = data.replace(b"<t>Amberline</t>", b"<t>&lol9;</t>", 1)
        return b"\xff\xfe" + data.decode("utf-8").encode("utf-16-le")

    return rebuild(path, change={corridors_member(): change})


@hostile(
    "external_entity",
    "A sheet declares an external entity pointing at a local file.",
    2,
    "outside.xlsx",
    "declares XML entities",
)
def _xxe(folder):
    path = valid(folder, "outside.xlsx")
    dtd = b'<!DOCTYPE x [<!ENTITY e SYSTEM "file:///etc/passwd">]>'

    def change(data: bytes) -> bytes:
        data = data.replace(b"<worksheet", dtd + b"<worksheet", 1)
        return data.replace(b"<t>Amberline</t>", b"<t>&e;</t>", 1)

    return rebuild(path, change={corridors_member(): change})


# --- oversized parts and zip bombs -----------------------------------------------------


def _mixed_strings(total: int):
    """Shared-string items of random hex and a run of letters: deflate packs them about
    50 to 1, under the per-part ratio limit, so only the size limit can stop them."""
    item = 1024
    for _ in range(total // (item * 256)):
        yield b"".join(
            b"<si><t>" + os.urandom(10).hex().encode() + b"a" * (item - 35) + b"</t></si>"
            for _ in range(256)
        )


@hostile(
    "shared_strings_oversized",
    "The shared strings would unpack to 40 MB while stored 50 times smaller.",
    2,
    "wordy.xlsx",
    "the text of the cells",
)
def _sst_big(folder):
    return with_shared_strings(valid(folder, "wordy.xlsx"), _mixed_strings(40 * MiB))


@hostile(
    "shared_strings_bomb",
    "The shared strings would unpack to 100 MB of one repeated item.",
    2,
    "strings-bomb.xlsx",
    "decompression bomb",
)
def _sst_bomb(folder):
    item = b"<si><t>x</t></si>" * 4096
    return with_shared_strings(
        valid(folder, "strings-bomb.xlsx"), (item for _ in range(100 * MiB // len(item)))
    )


@hostile(
    "bomb_repeated_byte",
    "A part holds 128 MB of one repeated byte, stored in an eighth of a megabyte.",
    2,
    "bomb.xlsx",
    "decompression bomb",
)
def _bomb(folder):
    block = b"A" * MiB
    return rebuild(
        valid(folder, "bomb.xlsx"), add={"xl/media/image1.bin": (block for _ in range(128))}
    )


@hostile(
    "bomb_declared_huge",
    "The zip directory declares a part of 4 GB (the sizes are forged).",
    2,
    "declared.xlsx",
    "decompression bomb",
)
def _declared_huge(folder):
    path = rebuild(valid(folder, "declared.xlsx"), add={"xl/media/image1.bin": b"B" * 4096})
    return patch_entry(path, "xl/media/image1.bin", size=0xFFFF0000)


@hostile(
    "bomb_declared_small",
    "The zip directory declares 4 kB for a part that unpacks to 64 MB.",
    2,
    "liar.xlsx",
    "cannot be unpacked",
)
def _declared_small(folder):
    block = b"C" * MiB
    path = rebuild(
        valid(folder, "liar.xlsx"), add={"xl/media/image1.bin": (block for _ in range(64))}
    )
    return patch_entry(path, "xl/media/image1.bin", size=4096)


@hostile(
    "zip_too_many_parts",
    "The zip holds more than 10,000 parts.",
    2,
    "crowded.xlsx",
    "parts, over the limit",
)
def _many(folder):
    return rebuild(
        valid(folder, "crowded.xlsx"),
        add={f"xl/media/m{i}.bin": b"" for i in range(10_001)},
        method=zipfile.ZIP_STORED,
    )


@hostile(
    "zip_member_encrypted",
    "A part is encrypted inside the zip (zip encryption, not Excel's).",
    2,
    "zipcrypt.xlsx",
    "encrypted inside the zip",
)
def _zipcrypto(folder):
    return patch_entry(valid(folder, "zipcrypt.xlsx"), corridors_member(), flags=0x1)


@hostile(
    "zip_method_unknown",
    "A part is packed with Deflate64, which no spreadsheet program writes.",
    2,
    "deflate64.xlsx",
    "zip method 9",
)
def _deflate64(folder):
    return patch_entry(valid(folder, "deflate64.xlsx"), corridors_member(), method=9)


@hostile(
    "zip_data_corrupt",
    "The packed bytes of a sheet are damaged while the zip directory is intact.",
    2,
    "scrambled.xlsx",
    "cannot be unpacked",
)
def _corrupt(folder):
    path = valid(folder, "scrambled.xlsx")
    data = bytearray(path.read_bytes())
    local, _ = _entries(data, corridors_member())
    n, x = struct.unpack_from("<HH", data, local + 26)
    start = local + 30 + n + x
    for i in range(start + 10, start + 40):
        data[i] ^= 0x5A
    path.write_bytes(bytes(data))
    return path


# --- lookalikes ---------------------------------------------------------------------------


@hostile(
    "web_page_named_xls",
    "A web page saved by a spreadsheet program was named .xls.",
    2,
    "export.xls",
    "web page",
)
def _html_xls(folder):
    path = folder / "export.xls"
    path.write_text("<html><body><table><tr><td>C1</td></tr></table></body></html>")
    return path


@hostile(
    "xml_spreadsheet_2003",
    "An XML Spreadsheet 2003 file was named .xlsx.",
    2,
    "legacy.xlsx",
    "XML Spreadsheet 2003",
)
def _xml2003(folder):
    path = folder / "legacy.xlsx"
    path.write_text(
        '<?xml version="1.0"?><Workbook xmlns="urn:schemas-microsoft-com:office:spreadsheet"/>'
    )
    return path


@hostile(
    "zip_magic_only",
    "Random bytes behind a zip signature were named .xlsx.",
    2,
    "fake.xlsx",
    "damaged or incomplete",
)
def _pk(folder):
    path = folder / "fake.xlsx"
    path.write_bytes(b"PK\x03\x04" + os.urandom(2048))
    return path


@hostile(
    "device_as_input",
    "The path is a link to a device that never stops giving bytes.",
    2,
    "endless.xlsx",
    "not a regular file",
)
def _device(folder):
    path = folder / "endless.xlsx"
    path.symlink_to("/dev/zero")
    return path


def macro_workbook(folder: Path, name: str = "macros.xlsm") -> Path:
    """The valid input saved as a macro-enabled workbook with a VBA project."""
    path = valid(folder, name)
    project = (
        bytes.fromhex("D0CF11E0A1B11AE1")
        + b'Attribute VB_Name = "Module1"\nSub Auto_Open()\nShell "calc"\nEnd Sub\n'
        + bytes(512)
    )
    main_type = b"application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"
    return rebuild(
        path,
        change={
            "[Content_Types].xml": lambda b: b.replace(
                main_type, b"application/vnd.ms-excel.sheet.macroEnabled.main+xml"
            )
        },
        add={"xl/vbaProject.bin": project},
        types={"xl/vbaProject.bin": VBA_TYPE},
        rels={"rIdVBA": (VBA_REL, "vbaProject.bin")},
    )


@hostile(
    "macro_enabled",
    "A macro-enabled workbook (.xlsm) with a VBA project: read, macros neither run nor kept.",
    0,
    "",
    "macro-enabled",
)
def _xlsm(folder):
    return macro_workbook(folder)
