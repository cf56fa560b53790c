"""Plain-language pieces for the sentences a board reads."""

from __future__ import annotations

import math

import numpy as np


class Namer:
    """Say corridors and criteria the way the planner named them.

    Parameters
    ----------
    names : dict of str to str, optional
        Corridor id to name.
    labels : dict of str to str, optional
        Criterion key to label.
    """

    def __init__(self, names: dict[str, str] | None = None, labels: dict[str, str] | None = None):
        self.names = dict(names or {})
        self.labels = dict(labels or {})

    def corridor(self, cid: object, *, start: bool = False) -> str:
        """``North Spur (C2)``, or ``corridor C2`` when it has no other name."""
        name = self.names.get(str(cid))
        if name and str(name).strip() and str(name) != str(cid):
            return f"{name} ({cid})"
        return f"{'Corridor' if start else 'corridor'} {cid}"

    def criterion(self, key: str) -> str:
        """The criterion's label, or its key with spaces."""
        label = self.labels.get(key)
        return str(label) if label else key.replace("_", " ")


def ordinal(n: int) -> str:
    """1 -> ``1st``, 2 -> ``2nd``, 11 -> ``11th``."""
    n = int(n)
    suffix = "th" if 10 <= n % 100 <= 20 else {1: "st", 2: "nd", 3: "rd"}.get(n % 10, "th")
    return f"{n}{suffix}"


def weight_text(value: float, reference: float | None = None, *, ends: bool = False) -> str:
    """Format a weight with two decimals, more where needed to differ from ``reference``.

    With ``ends``, a weight strictly between 0 and 1 also takes the decimals
    needed not to read as 0 or 1 (0.996 is ``0.996``, not ``1.00``).
    """
    for decimals in range(2, 7):
        text = f"{value:.{decimals}f}"
        same = reference is not None and text == f"{reference:.{decimals}f}"
        edge = ends and 0.0 < value < 1.0 and float(text) in (0.0, 1.0)
        if not same and not edge:
            return text
    return f"{value:.6f}"


def share_text(share: float) -> str:
    """0.234 -> ``23%``; a non-zero share that rounds to 0 says ``<1%``, one below 1
    that rounds to 100 says ``>99%`` (neither "never" nor "always" unless it is so)."""
    if share is None or (isinstance(share, float) and math.isnan(share)):
        return "n/a"
    text = f"{100 * share:.0f}"
    if share > 0 and text == "0":
        return "<1%"
    if share < 1 and text == "100":
        return ">99%"
    return f"{text}%"


def listing(items: list[str]) -> str:
    """``a``, ``a and b``, ``a, b and c``."""
    items = list(items)
    if len(items) <= 1:
        return "".join(items)
    return ", ".join(items[:-1]) + " and " + items[-1]


def money(usd: float) -> str:
    """Write an amount of money for a sentence ("4.2 million USD") [USD].

    Examples
    --------
    >>> money(4_200_000), money(350_000)
    ('4.2 million USD', '350,000 USD')
    """
    if abs(usd) >= 1e6:
        return (
            f"{usd / 1e6:,.3g} million USD" if abs(usd) < 1e9 else f"{usd / 1e9:,.3g} billion USD"
        )
    return f"{usd:,.0f} USD"


def number(x: float) -> str:
    """Write a number with three significant figures for a sentence."""
    if not np.isfinite(x):
        return "no limit"
    if x != 0 and (abs(x) >= 1e5 or abs(x) < 1e-3):
        return f"{x:.3g}"
    return f"{x:,.3g}" if abs(x) < 1000 else f"{x:,.0f}"


def fmt(value) -> str:
    """Format a number for a sentence: thousands separators, 3 significant digits."""
    try:
        v = float(value)
    except (TypeError, ValueError):
        return str(value)
    if not np.isfinite(v):
        return "n/a"
    if abs(v) >= 1e6:
        return f"{v / 1e6:,.1f} million"
    if abs(v) >= 1000 or v.is_integer():
        return f"{v:,.0f}"
    if abs(v) >= 10:
        return f"{v:.1f}"
    return f"{v:.3g}"


def method_label(key: str) -> str:
    """A scoring method's label for people (TOPSIS, Weighted sum, VIKOR (Q)); the key
    itself for a method the registry does not know."""
    from ...score.methods import METHODS

    return METHODS[key].label if key in METHODS else key
