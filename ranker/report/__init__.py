"""Write the outputs of a run: the results workbook and the justification sheet.

The writers are :mod:`.outputs` (the entry point), :mod:`.workbook` and
:mod:`.sheets` (the results workbook), :mod:`.html` (the justification
sheet), and :mod:`.narrative` with :mod:`.words` for every sentence.
"""

from __future__ import annotations

from .outputs import (
    changes_since,
    drop_stale,
    geojson_path,
    is_results_workbook,
    output_paths,
    previous_run,
    write_outputs,
)

__all__ = [
    "changes_since",
    "drop_stale",
    "geojson_path",
    "is_results_workbook",
    "output_paths",
    "previous_run",
    "write_outputs",
]
