"""Write the outputs of a run: the results workbook and the justification sheet."""

from __future__ import annotations

from pathlib import Path

from ..errors import InputError
from ..files import check_out_dir, check_replaceable, write_all_atomic


def output_paths(input_path: Path, out_dir: Path | None = None, *, stem: str | None = None):
    """Return the (workbook, html) paths a run of ``input_path`` writes."""
    folder = Path(out_dir) if out_dir is not None else Path(input_path).resolve().parent
    stem = stem or Path(input_path).stem
    return folder / f"{stem}-ranked.xlsx", folder / f"{stem}-ranked.html"


def changes_since(previous_xlsx: Path, result) -> list[str]:
    """Compare ``result`` with the run that wrote ``previous_xlsx`` (if any)."""
    from ..changes import compare
    from ..files import written_by_ranker
    from .workbook import compact_state, read_state

    if not previous_xlsx.exists() or not written_by_ranker(previous_xlsx):
        return []
    previous = read_state(previous_xlsx)
    if previous is None:
        return []
    return compare(previous, compact_state(result))


def write_outputs(result, out_dir: str | Path | None = None, *, stem: str | None = None) -> dict:
    """Write ``<stem>-ranked.xlsx`` and ``<stem>-ranked.html`` atomically.

    Parameters
    ----------
    result : Result
        What :func:`ranker.rank_workbook` returned.
    out_dir : str or Path, optional
        Output folder; default the input's folder.
    stem : str, optional
        File stem; default the input's.

    Returns
    -------
    dict
        ``{"workbook": path, "html": path}`` as strings; also stored in
        ``result.outputs``.

    Raises
    ------
    InputError
        When the folder cannot take the files, or a file of that name exists
        that ranker did not write.
    """
    from .html import build_html
    from .workbook import build_workbook

    xlsx, html = output_paths(result.inputs.path, out_dir, stem=stem)
    check_out_dir(xlsx.parent)
    if xlsx.resolve() == Path(result.inputs.path).resolve():
        raise InputError.one(
            str(xlsx), "the output would replace the input", "choose another folder with --out"
        )
    check_replaceable(xlsx)
    check_replaceable(html)
    result.outputs = {"workbook": str(xlsx), "html": str(html)}
    result.changes = changes_since(xlsx, result)
    files = {xlsx: build_workbook(result), html: build_html(result).encode("utf-8")}
    write_all_atomic(files)
    return dict(result.outputs)
