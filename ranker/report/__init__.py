"""Write the outputs of a run: the results workbook and the justification sheet."""

from __future__ import annotations

from pathlib import Path

from ..errors import InputError
from ..files import check_replaceable, make_out_dir, shown, write_all_atomic


def is_results_workbook(path: Path) -> bool:
    """True where ``path`` is a results workbook ranker wrote (it carries its result sheets)."""
    from ..files import written_by_ranker
    from .workbook import SHEETS_PROPERTY

    path = Path(path)
    if path.suffix.lower() != ".xlsx" or not written_by_ranker(path):
        return False
    try:
        import zipfile

        with zipfile.ZipFile(path) as z:
            return SHEETS_PROPERTY.encode() in z.read("docProps/custom.xml")
    except (OSError, KeyError, zipfile.BadZipFile):
        return False


def output_paths(input_path: Path, out_dir: Path | None = None, *, stem: str | None = None):
    """Return the (workbook, html) paths a run of ``input_path`` writes.

    ``X.xlsx`` gives ``X-ranked.xlsx`` and ``X-ranked.html``. A results
    workbook ranker wrote (``X-ranked.xlsx``) gives itself and its sibling
    ``X-ranked.html``: it is refreshed in place, not copied to
    ``X-ranked-ranked.xlsx``.
    """
    folder = Path(out_dir) if out_dir is not None else Path(input_path).resolve().parent
    if stem is None and is_results_workbook(Path(input_path)):
        base = Path(input_path).stem
        return folder / f"{base}.xlsx", folder / f"{base}.html"
    stem = stem or Path(input_path).stem
    return folder / f"{stem}-ranked.xlsx", folder / f"{stem}-ranked.html"


def previous_run(input_path: Path, xlsx: Path) -> tuple[Path | None, dict | None]:
    """Return the results workbook to compare with and the state it carries.

    Running a results workbook compares with the state that workbook
    carries; running an input compares with the results workbook it is
    about to replace, when ranker wrote it.
    """
    from ..files import written_by_ranker
    from .workbook import read_state

    for candidate in (Path(input_path), Path(xlsx)):
        if candidate.suffix.lower() == ".xlsx" and candidate.exists():
            if candidate == Path(input_path) and not is_results_workbook(candidate):
                continue
            if not written_by_ranker(candidate):
                continue
            state = read_state(candidate)
            if state is not None:
                return candidate, state
    return None, None


def changes_since(previous_xlsx: Path, result) -> list[str]:
    """Compare ``result`` with the run that wrote ``previous_xlsx`` (if any); see describe."""
    from ..changes import compare, describe
    from .workbook import compact_state

    where, previous = previous_run(result.inputs.path, Path(previous_xlsx))
    record = compare(previous, compact_state(result), result)
    record["previous"] = shown(where) if where is not None else None
    result.change_record = record
    return describe(record)


def write_outputs(result, out_dir: str | Path | None = None, *, stem: str | None = None) -> dict:
    """Write ``<stem>-ranked.xlsx`` and ``<stem>-ranked.html`` atomically.

    Parameters
    ----------
    result : Result
        What :func:`ranker.rank_workbook` returned.
    out_dir : str or Path, optional
        Output folder; default the input's folder. Created when missing.
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
    in_place = is_results_workbook(Path(result.inputs.path))
    if xlsx.resolve() == Path(result.inputs.path).resolve() and not in_place:
        raise InputError.one(
            shown(xlsx), "the output would replace the input", "choose another folder with --out"
        )
    check_replaceable(xlsx)
    check_replaceable(html)
    result.outputs = {"workbook": shown(xlsx), "html": shown(html)}
    result.changes = changes_since(xlsx, result)
    files = {xlsx: build_workbook(result), html: build_html(result).encode("utf-8", "replace")}
    created = make_out_dir(xlsx.parent)
    try:
        write_all_atomic(files)
    except BaseException:
        if created:
            try:
                xlsx.parent.rmdir()  # only when still empty
            except OSError:
                pass
        raise
    return dict(result.outputs)
