"""The one input exception type, and the collection the reader raises.

Every problem a planner can fix names where it is (``Sheet!Cell``, ``Sheet``
or the file) and how to fix it. The command line turns these into exit code 2.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass


@dataclass(frozen=True)
class Problem:
    """One problem in the input: where, what is wrong, how to fix it.

    Attributes
    ----------
    where : str
        ``Sheet!Cell`` (``Corridors!D7``), ``Sheet`` or a file name.
    what : str
        What is wrong, naming what was found.
    fix : str
        How to fix it, naming what is allowed.
    """

    where: str
    what: str
    fix: str

    def __str__(self) -> str:
        return f"{self.where}: {self.what}; {self.fix}"


class InputError(Exception):
    """The input is at fault; carries every problem found, not just the first.

    Parameters
    ----------
    problems : iterable of Problem
        At least one problem.
    """

    def __init__(self, problems: Iterable[Problem]):
        self.problems = list(problems)
        if not self.problems:
            raise ValueError("InputError needs at least one problem")
        super().__init__("\n".join(str(p) for p in self.problems))

    @classmethod
    def one(cls, where: str, what: str, fix: str) -> InputError:
        """Build an error holding a single problem."""
        return cls([Problem(where, what, fix)])


class Problems:
    """Collect problems while reading, then raise them all at once."""

    def __init__(self) -> None:
        self.items: list[Problem] = []

    def add(self, where: str, what: str, fix: str) -> None:
        """Record one problem."""
        self.items.append(Problem(where, what, fix))

    def extend(self, error: InputError) -> None:
        """Record every problem of an already raised error."""
        self.items.extend(error.problems)

    def __bool__(self) -> bool:
        return bool(self.items)

    def raise_if_any(self) -> None:
        """Raise :class:`InputError` if anything was recorded."""
        if self.items:
            raise InputError(self.items)
