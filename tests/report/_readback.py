"""Shared by the report tests: a workbook's cells read back, and LibreOffice's copy of it."""

from __future__ import annotations

import io
import shutil
import subprocess
from pathlib import Path

from openpyxl import load_workbook

#: LibreOffice's command, or None where Debian's libreoffice-calc is not installed.
SOFFICE = shutil.which("soffice") or shutil.which("libreoffice")


def stored_cells(data: bytes) -> dict:
    """Every stored cell of every sheet as openpyxl reads it back: value, type, number
    format, font, fill, border, alignment, protection, comment and hyperlink."""
    wb = load_workbook(io.BytesIO(data))
    out = {}
    for ws in wb.worksheets:
        for (r, c), cell in ws._cells.items():
            out[(ws.title, r, c)] = (
                repr(cell.value),
                cell.data_type,
                cell.number_format,
                repr(cell.font),
                repr(cell.fill),
                repr(cell.border),
                repr(cell.alignment),
                repr(cell.protection),
                cell.comment.text if cell.comment else None,
                cell.hyperlink.target if cell.hyperlink else None,
            )
    return out


def libreoffice_xlsx(files, tmp_path: Path, *, timeout: int = 600) -> list[Path]:
    """Open each file in LibreOffice headless and save it again as .xlsx (every formula
    recalculated); return the saved copies, in the order given."""
    out = tmp_path / "libreoffice"
    run = subprocess.run(
        [
            SOFFICE,
            "--headless",
            f"-env:UserInstallation=file://{tmp_path}/lo-profile",
            "--convert-to",
            "xlsx",
            "--outdir",
            str(out),
            *map(str, files),
        ],
        capture_output=True,
        text=True,
        timeout=timeout,
    )
    assert run.returncode == 0, run.stderr
    return [out / Path(f).name for f in files]
