"""ranker: rank freight corridors for heavy-duty electric truck charging.

The public API is small: :func:`rank_workbook` does what ``ranker run`` does
and returns one :class:`Result` whose tables are pandas DataFrames;
:func:`write_outputs` writes the results workbook and the justification
sheet; :func:`write_template` writes the blank input workbook.

Planning-level estimates only: confirm grid capacity with the utility;
design and installation follow local codes and licensed engineers.
"""

__version__ = "0.1.0"

from .errors import InputError, Problem  # noqa: E402
from .pipeline import DEFAULT_SAMPLES, DEFAULT_SEED, Result, rank_inputs, rank_workbook  # noqa: E402


def write_outputs(result, out_dir=None, *, stem=None):
    """Write ``<stem>-ranked.xlsx`` and ``<stem>-ranked.html``; return their paths.

    See :func:`ranker.report.write_outputs`.
    """
    from .report import write_outputs as _write

    return _write(result, out_dir, stem=stem)


def write_template(path):
    """Write the blank input workbook to ``path``; see :mod:`ranker.workbook.template`."""
    from .workbook.template import write_template as _write

    return _write(path)


__all__ = [
    "DEFAULT_SAMPLES",
    "DEFAULT_SEED",
    "InputError",
    "Problem",
    "Result",
    "__version__",
    "rank_inputs",
    "rank_workbook",
    "write_outputs",
    "write_template",
]
