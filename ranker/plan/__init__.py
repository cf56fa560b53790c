"""Phased build plan: which corridors to fund in which year of a budget.

The public entry point is :func:`build_plan`, returning a :class:`Plan`:
a greedy plan in rank order, an optimised plan (mixed-integer program
solved by HiGHS, :mod:`ranker.plan.highs`), the numbers behind their differences, a
coverage view of the network joined, and how often each corridor is funded
in year one across score samples.
"""

from .coverage import parse_connects
from .phasing import Plan, build_plan

__all__ = ["Plan", "build_plan", "parse_connects"]
