"""Write the outputs of a run: the results workbook, the justification sheet, the GeoJSON.

:func:`write_outputs` is the entry point (``ranker run`` and
:func:`ranker.write_outputs`); the package's ``__init__`` only re-exports.
"""

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
    """Write ``<stem>-ranked.xlsx``, ``<stem>-ranked.html`` and, with positions, ``.geojson``.

    The three files are written atomically together; without positions
    (no ``Places`` or ``Geometry``) no GeoJSON file is written, and one an
    earlier run wrote is removed.

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
        ``{"workbook": path, "html": path}`` (plus ``"geojson"`` when
        written) as strings; also stored in
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
    geojson = geojson_path(xlsx)
    if result.network is not None:
        check_replaceable(geojson)
    result.outputs = {"workbook": shown(xlsx), "html": shown(html)}
    if result.network is not None:
        result.outputs["geojson"] = shown(geojson)
    result.changes = changes_since(xlsx, result)
    files = {xlsx: build_workbook(result), html: build_html(result).encode("utf-8", "replace")}
    if result.network is not None:
        from ..geo.export import ranked_geojson

        files[geojson] = ranked_geojson(result)
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
    if result.network is None:
        drop_stale(geojson)
    return dict(result.outputs)


def geojson_path(xlsx: Path) -> Path:
    """Return the GeoJSON path beside the results workbook ``<stem>-ranked.xlsx``."""
    return xlsx.with_suffix(".geojson")


def drop_stale(path: Path) -> None:
    """Remove a GeoJSON file an earlier run wrote, now that the workbook gives no positions."""
    from ..files import written_by_ranker

    if path.exists() and written_by_ranker(path):
        try:
            path.unlink()
        except OSError:
            pass
