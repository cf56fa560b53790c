"""ranker: rank freight corridors for heavy-duty electric truck charging.

The public API is small: :func:`rank_workbook` does what ``ranker run`` does
and returns one :class:`Result` whose tables are pandas DataFrames;
:func:`write_outputs` writes the results workbook and the justification
sheet; :func:`write_template` writes the blank input workbook.

Planning-level estimates only: confirm grid capacity with the utility;
design and installation follow local codes and licensed engineers.
"""

from __future__ import annotations

__version__ = "0.1.0"

from .errors import InputError, Problem  # noqa: E402
from .result import DEFAULT_SAMPLES, DEFAULT_SEED, Result  # noqa: E402


def rank_workbook(
    path,
    *,
    weights: str | None = None,
    weight_overrides: dict[str, float] | None = None,
    samples: int = DEFAULT_SAMPLES,
    seed: int = DEFAULT_SEED,
    progress=None,
) -> Result:
    """Rank the corridors of one input workbook, as ``ranker run`` does.

    See :func:`ranker.pipeline.rank_workbook` for the parameters. The heavy
    libraries load on the first call, not on ``import ranker``.

    Examples
    --------
    >>> import ranker                                        # doctest: +SKIP
    >>> result = ranker.rank_workbook("corridors.xlsx", samples=2000)  # doctest: +SKIP
    >>> result.ranking.head()                                # doctest: +SKIP
    """
    from .pipeline import rank_workbook as _rank

    return _rank(
        path,
        weights=weights,
        weight_overrides=weight_overrides,
        samples=samples,
        seed=seed,
        progress=progress,
    )


def write_outputs(result: Result, out_dir=None, *, stem: str | None = None) -> dict:
    """Write ``<stem>-ranked.xlsx`` and ``<stem>-ranked.html``; return their paths.

    See :func:`ranker.report.write_outputs`.
    """
    from .report import write_outputs as _write

    return _write(result, out_dir, stem=stem)


def write_template(path) -> None:
    """Write the blank input workbook to ``path``; see :mod:`ranker.workbook.template`."""
    from .workbook.template import write_template as _write

    _write(path)


__all__ = [
    "DEFAULT_SAMPLES",
    "DEFAULT_SEED",
    "InputError",
    "Problem",
    "Result",
    "__version__",
    "rank_workbook",
    "write_outputs",
    "write_template",
]
