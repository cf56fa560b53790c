"""A small SVG drawing kit for the justification sheet's charts.

The sheet's five charts are horizontal band charts (one row per corridor or
criterion) and one heatmap. Drawing them as SVG text directly costs a few
milliseconds; drawing them with matplotlib cost about a second of each run
(importing it and laying out every text twice), so the kit below replaces it.
Its two non-trivial parts are proved equal to matplotlib in the tests:

* :func:`nice_ticks` picks the same tick values as matplotlib's
  ``MaxNLocator`` with steps (1, 2, 2.5, 5, 10) inside the axis limits;
* :func:`cividis` returns the same colours as matplotlib's ``cividis``
  colour map (the 256-entry table of Nuñez, Anderton and Renslow, "Optimizing
  colormaps with consideration for color vision deficiency to enable accurate
  interpretation of scientific data", PLoS ONE 13(7): e0199239, 2018).

Text widths are estimated from the advance widths of a wide sans serif
(common practice for laying out labels without a font engine); the estimate
errs wide so labels never run into the plot.
"""

from __future__ import annotations

import math
from html import escape

#: The cividis colour map, 256 entries of RRGGBB, from index 0 (value 0) up.
_CIVIDIS = (
    "00224e00234f00245100255300255400265600275800285900285b00295d002a5f002a61002b62002c64"
    "002c66002d68002e6a002e6c002f6d00306f0030700031700031710132710533710833700c34700f3570"
    "12357014367016377018376f1a386f1c396f1e3a6f203a6f213b6e233c6e243c6e263d6e273e6e293f6e"
    "2a3f6d2b406d2d416d2e416d2f426d31436d32436d33446d34456c35456c36466c38476c39486c3a486c"
    "3b496c3c4a6c3d4a6c3e4b6c3f4c6c404c6c414d6c424e6c434e6c444f6c45506c46516c47516c48526c"
    "49536c4a536c4b546c4c556c4d556c4e566c4f576c50576c51586d52596d535a6d545a6d555b6d555c6d"
    "565c6d575d6d585e6d595e6e5a5f6e5b606e5c616e5d616e5e626e5e636f5f636f60646f61656f62656f"
    "636670646770656870656870666970676a71686a71696b716a6c716b6d726c6d726c6e726d6f726e6f73"
    "6f70737071737172747272747273747374757474757575757676767777767777777878777979777a7a78"
    "7b7a787c7b787d7c787e7c787e7d787f7e78807f78817f78828079838179848279858279868379878478"
    "8885788985788a86788b87788c88788d88788e89788f8a78908b78918b78928c78928d78938e78948e77"
    "958f779690779791779892779992779a93769b94769c95769d95769e96769f9775a09875a19975a29975"
    "a39a74a49b74a59c74a69c74a79d73a89e73a99f73aaa073aba072aca172ada272aea371afa471b0a571"
    "b1a570b3a670b4a76fb5a86fb6a96fb7a96eb8aa6eb9ab6dbaac6dbbad6dbcae6cbdae6cbeaf6bbfb06b"
    "c0b16ac1b26ac2b369c3b369c4b468c5b568c6b667c7b767c8b866c9b965cbb965ccba64cdbb63cebc63"
    "cfbd62d0be62d1bf61d2c060d3c05fd4c15fd5c25ed6c35dd7c45cd9c55cdac65bdbc75adcc859ddc858"
    "dec958dfca57e0cb56e1cc55e2cd54e4ce53e5cf52e6d051e7d150e8d24fe9d34eead34cebd44bedd54a"
    "eed649efd748f0d846f1d945f2da44f3db42f5dc41f6dd3ff7de3ef8df3cf9e03afbe138fce236fde334"
    "fee434fee535fee636fee838"
)

#: Font size of all chart text [px]; the page's font family is inherited.
FONT_PX = 12.0

#: Advance widths of DejaVu Sans (the widest of the usual default sans serif
#: faces) for the printable ASCII characters from space (32) to tilde (126),
#: in hundredths of an em, rounded up; read from the font's own metrics (a
#: test checks them against matplotlib's copy of the font).
_ASCII_WIDTHS = (
    32, 41, 46, 84, 64, 96, 78, 28, 40, 40, 50, 84, 32, 37, 32, 34, 64, 64, 64,
    64, 64, 64, 64, 64, 64, 64, 34, 34, 84, 84, 84, 54, 100, 69, 69, 70, 77, 64,
    58, 78, 76, 30, 30, 66, 56, 87, 75, 79, 61, 79, 70, 64, 62, 74, 69, 99, 69,
    62, 69, 40, 34, 40, 84, 50, 50, 62, 64, 55, 64, 62, 36, 64, 64, 28, 28, 58,
    28, 98, 64, 62, 64, 64, 42, 53, 40, 64, 60, 82, 60, 60, 53, 64, 34, 64, 84,
)  # fmt: skip


def cividis(value: float) -> str:
    """Return the cividis colour of ``value`` in [0, 1] as ``#rrggbb``.

    Parameters
    ----------
    value : float
        Position on the colour map [-]; clipped to [0, 1].

    Returns
    -------
    str
        The colour, looked up as matplotlib does: entry ``floor(value * 256)``,
        the top value taking the last entry.

    References
    ----------
    .. [1] J. R. Nuñez, C. R. Anderton and R. S. Renslow, "Optimizing
       colormaps with consideration for color vision deficiency to enable
       accurate interpretation of scientific data", PLoS ONE 13(7): e0199239,
       2018.
    """
    v = 0.0 if not math.isfinite(value) else min(max(value, 0.0), 1.0)
    i = min(int(v * 256), 255)
    return "#" + _CIVIDIS[6 * i : 6 * i + 6]


def text_width(text: str, size: float = FONT_PX) -> float:
    """Estimate the drawn width of ``text`` at ``size`` [px].

    Parameters
    ----------
    text : str
        The text.
    size : float
        Font size [px].

    Returns
    -------
    float
        Advance width in DejaVu Sans without kerning [px]; narrower faces
        (Segoe UI, San Francisco, Roboto) draw the same text narrower.
    """
    return sum(map(_em, text)) / 100 * size


def _em(ch: str) -> int:
    """Advance width of one character in hundredths of an em [-]."""
    code = ord(ch)
    if 32 <= code <= 126:
        return _ASCII_WIDTHS[code - 32]
    return 80 if code < 0x2E80 else 100  # accented Latin, Greek, dashes; wide scripts


def fit_text(text: str, width: float, size: float = FONT_PX) -> str:
    """Return ``text``, shortened with an ellipsis to fit in ``width`` [px].

    One pass over the characters, so a name of any length costs its length.
    """
    if text_width(text, size) <= width:
        return text
    room = width - text_width("…", size)
    used, cut = 0, 0
    for ch in text:
        used += _em(ch)
        if used / 100 * size > room:
            break
        cut += 1
    return text[:cut].rstrip() + "…"


def nice_ticks(lo: float, hi: float, *, bins: int = 5, integer: bool = False) -> list[float]:
    """Return round tick values between ``lo`` and ``hi`` (both included if round).

    The step is the smallest of 1, 2, 2.5, 5 and 10 times a power of ten that
    divides the range into at most ``bins`` intervals (integer steps only when
    ``integer``), as matplotlib's ``MaxNLocator(nbins=bins, steps=[1, 2, 2.5,
    5, 10])`` chooses it; a test checks the two agree.

    Parameters
    ----------
    lo, hi : float
        Axis limits, ``lo < hi`` [axis unit].
    bins : int
        Most intervals between ticks [-].
    integer : bool
        Only whole-number ticks (years, counts).

    Returns
    -------
    list of float
        Tick values in increasing order [axis unit].
    """
    if not (math.isfinite(lo) and math.isfinite(hi)) or hi <= lo:
        return [lo] if math.isfinite(lo) else []
    raw = (hi - lo) / bins
    scale = 10.0 ** math.floor(math.log10(raw))
    steps = [s * scale for s in (0.1, 0.2, 0.25, 0.5, 1.0, 2.0, 2.5, 5.0, 10.0, 20.0)]
    if integer:
        steps = [s for s in steps if s < 1 or abs(s - round(s)) < 1e-3]
        steps = [max(1.0, s) for s in steps] if hi - lo >= 1 else steps
    start = next((i for i, s in enumerate(steps) if s >= raw * (1 - 1e-9)), len(steps) - 1)
    tol = 1e-9 * (hi - lo)
    for step in reversed(steps[: start + 1]):
        ticks = [k * step for k in range(math.floor(lo / step) - 1, math.ceil(hi / step) + 2)]
        if sum(lo <= t <= hi for t in ticks) >= 2:  # enough ticks strictly inside
            break
    return [_clean(t) for t in ticks if lo - tol <= t <= hi + tol]


def _clean(x: float) -> float:
    """Round away binary noise such as 0.30000000000000004."""
    return float(f"{x:.12g}")


def tick_text(value: float) -> str:
    """Format a tick value the short way (``0.2``, ``2030``, ``1.5e+06``)."""
    return f"{value:g}"


def _tip(tip: str | None) -> str:
    """The hover text of one mark, as its ``<title>`` child."""
    return f"<title>{escape(tip)}</title>" if tip else ""


class Canvas:
    """Collects SVG elements and writes one ``<svg>`` element.

    Coordinates are in px from the top left. Every text is escaped; the
    drawing inherits the page's font family.
    """

    def __init__(self, width: float, height: float, *, title: str) -> None:
        self.width = width
        self.height = height
        self.title = title
        self.parts: list[str] = []

    def rect(
        self,
        x: float,
        y: float,
        w: float,
        h: float,
        *,
        fill: str,
        stroke: str | None = None,
        stroke_width: float = 1.0,
        tip: str | None = None,
        crisp: bool = False,
    ) -> None:
        """Draw a rectangle; ``tip`` becomes its hover text; ``crisp`` aligns it to pixels."""
        line = f' stroke="{stroke}" stroke-width="{stroke_width:g}"' if stroke else ""
        if crisp:
            line += ' shape-rendering="crispEdges"'
        body = _tip(tip)
        self.parts.append(
            f'<rect x="{x:.2f}" y="{y:.2f}" width="{max(w, 0.0):.2f}" '
            f'height="{max(h, 0.0):.2f}" fill="{fill}"{line}>{body}</rect>'
        )

    def line(
        self, x1: float, y1: float, x2: float, y2: float, *, stroke: str, width: float = 1.0
    ) -> None:
        """Draw a straight line."""
        self.parts.append(
            f'<line x1="{x1:.2f}" y1="{y1:.2f}" x2="{x2:.2f}" y2="{y2:.2f}" '
            f'stroke="{stroke}" stroke-width="{width:g}"/>'
        )

    def circle(self, x: float, y: float, r: float, *, fill: str, tip: str | None = None) -> None:
        """Draw a filled circle."""
        body = _tip(tip)
        self.parts.append(
            f'<circle cx="{x:.2f}" cy="{y:.2f}" r="{r:g}" fill="{fill}">{body}</circle>'
        )

    def diamond(self, x: float, y: float, r: float, *, fill: str, tip: str | None = None) -> None:
        """Draw a filled diamond of half-diagonal ``r``."""
        body = _tip(tip)
        pts = f"{x:.2f},{y - r:.2f} {x + r:.2f},{y:.2f} {x:.2f},{y + r:.2f} {x - r:.2f},{y:.2f}"
        self.parts.append(f'<polygon points="{pts}" fill="{fill}">{body}</polygon>')

    def text(
        self,
        x: float,
        y: float,
        text: str,
        *,
        anchor: str = "start",
        size: float = FONT_PX,
        fill: str = "#1b1b1b",
        rotate: float = 0.0,
        bold: bool = False,
    ) -> None:
        """Write ``text`` with its baseline centred on ``y`` (dominant-baseline middle)."""
        turn = f' transform="rotate({rotate:g} {x:.2f} {y:.2f})"' if rotate else ""
        weight = ' font-weight="600"' if bold else ""
        self.parts.append(
            f'<text x="{x:.2f}" y="{y:.2f}" text-anchor="{anchor}" '
            f'dominant-baseline="central" font-size="{size:g}" fill="{fill}"'
            f"{weight}{turn}>{escape(text)}</text>"
        )

    def svg(self) -> str:
        """Return the drawing as one ``<svg>`` element."""
        w, h = math.ceil(self.width), math.ceil(self.height)
        return (
            f'<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 {w} {h}" width="{w}" '
            f'height="{h}" role="img" aria-label="{escape(self.title)}" '
            'font-family="inherit" style="overflow: visible">'
            f"<title>{escape(self.title)}</title>" + "".join(self.parts) + "</svg>"
        )
