"""Phased build plan: which corridors to fund in which year of a budget.

The public entry point is :func:`build_plan`, returning a :class:`Plan`:
a greedy plan in rank order, an optimised plan (mixed-integer program
solved with :func:`scipy.optimize.milp`), the differences in plain words, a
coverage view of the network joined, and how often each corridor is funded
in year one across score samples.
"""

from .checks import PlanInputError
from .coverage import parse_connects
from .phasing import Plan, build_plan

__all__ = ["Plan", "PlanInputError", "build_plan", "parse_connects"]
