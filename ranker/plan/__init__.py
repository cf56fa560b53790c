"""Phased build plan: which corridors to fund in which year of a budget.

The public entry point is :func:`build_plan`, returning a :class:`Plan`:
a greedy plan in rank order, an optimised plan (mixed-integer program
solved by HiGHS, :mod:`ranker.plan.highs`), the numbers behind their differences, a
coverage view of the network joined, and how often each corridor is funded
in year one across score samples.
"""

#: Public names and their modules, loaded on first use: the plan works on DataFrames, and
#: ``ranker check`` reads the objectives' names (:mod:`ranker.plan.objectives`) without pandas.
_PUBLIC = {"Plan": "phasing", "build_plan": "phasing", "parse_connects": "coverage"}


def __getattr__(name: str):
    if name in _PUBLIC:
        from importlib import import_module

        return getattr(import_module(f".{_PUBLIC[name]}", __name__), name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


__all__ = ["Plan", "build_plan", "parse_connects"]
