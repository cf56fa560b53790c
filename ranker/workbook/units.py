"""Turn what planners type into typed values, and convert metric twins.

Every parser takes one cell's value as openpyxl gives it (``None``, ``str``,
``int``, ``float``, ``bool``, ``datetime``) and either returns the typed value
or raises :class:`CellValueError` carrying *what* is wrong and *how to fix
it*; the reader adds *where*. Nothing here knows about sheets.

Percent signs follow the field's unit (``percent=``):

- ``"share"`` (unit ``[-]`` or ``[1/yr]``, a fraction of one): ``12%`` is 0.12.
- ``"points"`` (unit ``[%]`` or ``[0-100]``, a number of percentage points):
  ``12%`` is 12, and a cell formatted as a percentage that holds 0.12 is 12.
- ``"reject"`` (every unit with a dimension, such as ``[USD]`` or ``[mi]``):
  a percent sign is an error.

Conversion factors are exact by definition: 1 international mile is
1609.344 m and 1 international foot is 0.3048 m [1]_.

References
----------
.. [1] NIST, "Guide for the Use of the International System of Units (SI)",
   NIST Special Publication 811, 2008 edition, Appendix B.8.
"""

from __future__ import annotations

import datetime as _dt
import difflib
import math
import re

#: Spreadsheet error values a formula can leave in a cell.
SPREADSHEET_ERRORS = (
    "#DIV/0!",
    "#N/A",
    "#NAME?",
    "#NULL!",
    "#NUM!",
    "#REF!",
    "#VALUE!",
    "#SPILL!",
    "#CALC!",
    "#GETTING_DATA",
)

_TRUE = frozenset({"yes", "y", "true", "1", "x"})
_FALSE = frozenset({"no", "n", "false", "0"})

# 1,234,567.89 -- commas only as thousands separators
_GROUPED = re.compile(r"^\d{1,3}(,\d{3})+(\.\d*)?$")
# 5.200 or 1.200.000 -- points as thousands separators (typed or pasted as text)
_DOT_GROUPED = re.compile(r"^[1-9]\d{0,2}(\.\d{3})+$")
_PLAIN = re.compile(r"^(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$")
_UNIT_AFTER = re.compile(r"^[\d.,]+\s*[A-Za-z/%°]+[A-Za-z/]*$")


class CellValueError(ValueError):
    """A cell holds something its field cannot take.

    Parameters
    ----------
    what : str
        What is wrong, naming what was found.
    fix : str
        How to fix it, naming what is allowed.
    """

    def __init__(self, what: str, fix: str):
        super().__init__(f"{what}; {fix}")
        self.what = what
        self.fix = fix


class TooLarge(CellValueError):
    """A number beyond :data:`LARGEST` in size: wrong whatever the field."""


def is_blank(value: object) -> bool:
    """Return True for an empty cell: ``None`` or only whitespace."""
    return value is None or (isinstance(value, str) and not value.strip())


def show(value: object) -> str:
    """Return a short quoted rendering of a cell value for messages."""
    if isinstance(value, str):
        text = value.strip()
        return repr(text if len(text) <= 40 else text[:37] + "...")
    if isinstance(value, (_dt.datetime, _dt.date, _dt.time)):
        return f"the date/time {value.isoformat()}"
    return repr(value)


def _date_error(value: object) -> CellValueError:
    return CellValueError(
        f"holds {show(value)} where a number belongs",
        "type a plain number; if the spreadsheet turns it into a date, format the cell as Number "
        "first",
    )


#: The largest magnitude any input number may have [-]. Far above any quantity a
#: corridor plan uses (1e15 USD is ten times the world's yearly output), and far
#: enough below the float limit (about 1.8e308) that sums, squares and
#: normalisations of a few thousand such numbers stay finite and exact enough.
LARGEST = 1e15


def _finite(x: float, value: object) -> float:
    if not math.isfinite(x):
        raise CellValueError(
            f"holds {show(value)}, which is not a finite number",
            "type an ordinary number",
        )
    if abs(x) > LARGEST:
        raise TooLarge(
            f"holds {show(value)}, larger than any quantity a corridor plan uses (the limit "
            f"is {LARGEST:.0e} in size), so the arithmetic could overflow",
            "check the value and its unit, and type it in the unit the header names",
        )
    return float(x)


def parse_number(
    value: object,
    *,
    percent: str = "reject",
    pct_format: bool = False,
    fraction: bool = False,
    unit: str = "",
) -> float:
    """Parse a number as planners type it.

    Accepts numbers, and text such as ``1,200``, ``$52,000``, ``-3.5``,
    ``1e6``, ``12%`` (see the module note for percent signs) and, where
    ``fraction`` is set, ``1/3``. Refuses dates, booleans, spreadsheet
    errors, NaN, infinities and numbers with a unit typed after them.

    Parameters
    ----------
    value : object
        The cell's value (not blank) [-].
    percent : {"share", "points", "reject"}
        What a percent sign means for this field.
    pct_format : bool
        True where the cell is formatted as a percentage, so the number
        stored is a fraction of one (Excel stores ``12%`` as 0.12).
    fraction : bool
        Whether ``a/b`` is accepted.
    unit : str
        The field's unit for messages, like ``[mi]``.

    Returns
    -------
    float
        The number, in the field's unit [-].

    Examples
    --------
    >>> parse_number("$52,000")
    52000.0
    >>> parse_number("12%", percent="share")
    0.12
    >>> parse_number("1/3", fraction=True)
    0.3333333333333333
    """
    if isinstance(value, bool):
        raise CellValueError(
            f"holds {'TRUE' if value else 'FALSE'} where a number belongs", "type a number"
        )
    if isinstance(value, (_dt.datetime, _dt.date, _dt.time, _dt.timedelta)):
        raise _date_error(value)
    if isinstance(value, (int, float)):
        x = _finite(float(value), value)
        if pct_format and percent == "points":
            return x * 100.0
        if pct_format and percent == "reject":
            # The planner sees 50 % where 0.5 is stored; neither reading is safe.
            raise CellValueError(
                f"is formatted as a percentage, so it shows {x * 100:g}% while the value "
                f"stored is {x:g}, but this field is in {unit or 'its own unit'}",
                f"format the cell as Number and type the value in {unit or 'the unit the header names'}",
            )
        return x
    if not isinstance(value, str):
        raise CellValueError(f"holds {show(value)} where a number belongs", "type a number")
    return _parse_text_number(value, percent=percent, fraction=fraction, unit=unit)


def _parse_text_number(value: str, *, percent: str, fraction: bool, unit: str) -> float:
    text = value.strip().replace("\u2212", "-").replace("\u00a0", "").replace("\u202f", "")
    if text.upper() in SPREADSHEET_ERRORS:
        raise CellValueError(
            f"shows the spreadsheet error {text}",
            "correct the formula or type the value",
        )
    if text.lower() in {"nan", "inf", "-inf", "+inf", "infinity", "-infinity"}:
        raise CellValueError(f"holds {show(value)}, which is not a finite number", "type a number")
    sign = 1.0
    if text.startswith("(") and text.endswith(")"):  # accounting negative: (1,200)
        sign, text = -1.0, text[1:-1].strip()
    if text and text[0] in "+-":
        sign, text = (-sign if text[0] == "-" else sign), text[1:].strip()
    if text.upper().startswith("USD"):
        text = text[3:].strip()
    elif text.upper().endswith("USD"):
        text = text[:-3].strip()
    if text.startswith("$"):
        text = text[1:].strip()
        if text[:1] == "-":
            sign, text = -sign, text[1:].strip()
    if text and text[0] in "€£¥":
        raise CellValueError(
            f"holds {show(value)} in a currency other than US dollars",
            "type the amount in USD as a plain number",
        )
    is_pct = text.endswith("%")
    if is_pct:
        text = text[:-1].strip()
    if fraction and "/" in text:
        x = _parse_fraction(text, value)
    else:
        x = _parse_decimal(text, value, unit)
    x = sign * x
    if is_pct:
        if percent == "share":
            x /= 100.0
        elif percent != "points":
            raise CellValueError(
                f"holds the percentage {show(value)} but this field is in {unit or 'its own unit'}",
                f"type a plain number in {unit or 'the unit the header names'}",
            )
    return _finite(x, value)


def _parse_decimal(text: str, value: str, unit: str) -> float:
    if _GROUPED.match(text):
        return float(text.replace(",", ""))
    if _DOT_GROUPED.match(text):  # 5.200: 5.2 here, 5,200 where a point groups thousands
        whole = text.replace(".", "")
        if text.count(".") > 1:
            raise CellValueError(
                f"holds the text {show(value)}, with points as thousands separators",
                f"type the number without separators, such as {whole}",
            )
        raise CellValueError(
            f"holds the text {show(value)}, which reads as {float(text):g} with a decimal "
            f"point but as {whole} where a point separates thousands",
            f"type the number without separators, such as {whole} or {float(text):g}",
        )
    if _PLAIN.match(text):
        return float(text)
    if re.match(r"^\d+,\d{1,2}$", text) or re.match(r"^\d{1,3}(\.\d{3})+,\d+$", text):
        raise CellValueError(
            f"holds {show(value)} with a comma as decimal mark",
            "use a point for decimals, such as 1.5, and commas only between thousands",
        )
    if _UNIT_AFTER.match(text):
        raise CellValueError(
            f"holds {show(value)}: a number with a unit typed after it",
            f"type the number only; the header gives the unit{' ' + unit if unit else ''}",
        )
    raise CellValueError(f"holds {show(value)} where a number belongs", "type a number")


def _parse_fraction(text: str, value: str) -> float:
    parts = [p.strip() for p in text.split("/")]
    if len(parts) != 2 or not all(_PLAIN.match(p) for p in parts):
        raise CellValueError(
            f"holds {show(value)}, which is not a number or a fraction",
            "type a number such as 3 or a fraction such as 1/3",
        )
    num, den = float(parts[0]), float(parts[1])
    if den == 0:
        raise CellValueError(
            f"holds {show(value)}, a division by zero", "type a fraction like 1/3"
        )
    return num / den


def parse_int(value: object, *, unit: str = "") -> int:
    """Parse a whole number (a year, a count).

    Parameters
    ----------
    value : object
        The cell's value (not blank) [-].
    unit : str
        The field's unit for messages [-].

    Returns
    -------
    int
        The whole number [-].

    Examples
    --------
    >>> parse_int("2,030")
    2030
    >>> parse_int("2,030", unit="[year]")
    Traceback (most recent call last):
    ...
    ranker.workbook.units.CellValueError: holds the text '2,030' ...
    """
    if unit == "[year]" and isinstance(value, str) and re.search(r"\d[,.\s]\d", value.strip()):
        raise CellValueError(
            f"holds the text {show(value)}; a year is written without separators",
            "type the year as a plain number, such as 2030",
        )
    x = parse_number(value, unit=unit)
    if x != math.floor(x):
        raise CellValueError(
            f"holds {show(value)}, which is not a whole number", "type a whole number"
        )
    return int(x)


def parse_bool(value: object) -> bool:
    """Parse yes/no, true/false, 1/0 (any case) or a TRUE/FALSE cell.

    Examples
    --------
    >>> parse_bool(" Yes "), parse_bool(0)
    (True, False)
    """
    if isinstance(value, bool):
        return value
    if isinstance(value, (int, float)) and value in (0, 1):
        return bool(value)
    if isinstance(value, str):
        word = value.strip().lower()
        if word in _TRUE:
            return True
        if word in _FALSE:
            return False
    raise CellValueError(f"holds {show(value)}", "type yes or no")


def parse_text(value: object) -> str:
    """Return the cell as stripped text; whole numbers lose their ``.0``.

    Examples
    --------
    >>> parse_text(101.0), parse_text("  C1 ")
    ('101', 'C1')
    """
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, float):
        if math.isfinite(value) and value == math.floor(value) and abs(value) < 1e15:
            return str(int(value))
        return repr(value)
    if isinstance(value, (_dt.datetime, _dt.date)):
        return value.isoformat()
    return " ".join(str(value).split())


def nearest(word: str, options, *, cutoff: float = 0.6) -> str | None:
    """Return the option nearest to ``word`` or None if nothing is close."""
    near = difflib.get_close_matches(word, list(options), n=1, cutoff=cutoff)
    return near[0] if near else None


def parse_choice(value: object, choices: tuple[str, ...]) -> str:
    """Parse one word out of ``choices`` (any case, surrounding spaces ignored).

    Examples
    --------
    >>> parse_choice(" Benefit", ("benefit", "cost"))
    'benefit'
    """
    word = parse_text(value).lower()
    if word in choices:
        return word
    hint = nearest(word, choices)
    fix = f"type one of: {', '.join(choices)}"
    if hint:
        fix = f"did you mean {hint}? {fix}"
    raise CellValueError(f"holds {show(value)}", fix)


def parse_words(value: object, choices: tuple[str, ...]) -> tuple[str, ...]:
    """Parse a comma-separated list of words out of ``choices``.

    Examples
    --------
    >>> parse_words("TOPSIS, vikor", ("topsis", "vikor"))
    ('topsis', 'vikor')
    """
    words = [w.strip().lower() for w in parse_text(value).replace(";", ",").split(",")]
    words = [w for w in words if w]
    if not words:
        raise CellValueError("holds no words", f"type one or more of: {', '.join(choices)}")
    bad = [w for w in words if w not in choices]
    if bad:
        hint = nearest(bad[0], choices)
        fix = f"type words from: {', '.join(choices)}, separated by commas"
        if hint:
            fix = f"did you mean {hint}? {fix}"
        raise CellValueError(f"names {bad[0]!r}, which is not allowed", fix)
    if len(set(words)) != len(words):
        raise CellValueError(f"holds {show(value)} with a word twice", "name each word once")
    return tuple(words)


def describe_range(low: float | None, high: float | None, *, low_open: bool = False) -> str:
    """Say a closed (or left-open) range in words, for messages.

    Examples
    --------
    >>> describe_range(0, 1, low_open=True)
    'more than 0 and at most 1'
    """

    def fmt(x: float) -> str:
        return f"{x:,.10g}"

    if low is not None and high is not None:
        if low_open:
            return f"more than {fmt(low)} and at most {fmt(high)}"
        return f"from {fmt(low)} to {fmt(high)}"
    if low is not None:
        return f"more than {fmt(low)}" if low_open else f"at least {fmt(low)}"
    if high is not None:
        return f"at most {fmt(high)}"
    return "any number"


def check_range(
    x: float, low: float | None, high: float | None, *, low_open: bool = False, unit: str = ""
) -> None:
    """Raise :class:`CellValueError` unless ``low <= x <= high`` (``low < x`` if open)."""
    bad = (low is not None and (x < low or (low_open and x == low))) or (
        high is not None and x > high
    )
    if bad:
        allowed = describe_range(low, high, low_open=low_open)
        raise CellValueError(
            f"holds {x:,.10g}, outside the allowed range",
            f"type a value {allowed}{(' ' + unit) if unit else ''}",
        )
