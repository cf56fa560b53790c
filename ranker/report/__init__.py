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
    """Write ``<stem>-ranked.xlsx``, ``<stem>-ranked.html`` and, with positions, ``.geojson``.

    The three files are written atomically together; without positions
    (no ``Places`` or ``Geometry``) no GeoJSON file is written, and one an
    earlier run wrote is removed.

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
    check_out_dir(xlsx.parent)
    if xlsx.resolve() == Path(result.inputs.path).resolve():
        raise InputError.one(
            str(xlsx), "the output would replace the input", "choose another folder with --out"
        )
    check_replaceable(xlsx)
    check_replaceable(html)
    geojson = geojson_path(xlsx)
    if result.network is not None:
        check_replaceable(geojson)
    result.outputs = {"workbook": str(xlsx), "html": str(html)}
    if result.network is not None:
        result.outputs["geojson"] = str(geojson)
    result.changes = changes_since(xlsx, result)
    files = {xlsx: build_workbook(result), html: build_html(result).encode("utf-8")}
    if result.network is not None:
        from ..geo.export import ranked_geojson

        files[geojson] = ranked_geojson(result)
    write_all_atomic(files)
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
