"""Refresh the guide's pictures from the demo: ``python docs/make_screenshots.py``.

Runs the demo into a temporary folder and renders its justification sheet in
headless Chromium (Debian's ``chromium``) at desktop width, writing PNGs to
``docs/img/``. Needs Chromium; the product itself never does.
"""

from __future__ import annotations

import shutil
import subprocess
import tempfile
from pathlib import Path

import ranker
from ranker.demo import write_demo

HERE = Path(__file__).resolve().parent
FLAGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--hide-scrollbars",
]


def shoot(html: Path, png: Path, *, height: int, profile: Path) -> None:
    """Screenshot the top ``height`` pixels of ``html`` at 1200 px width."""
    chromium = shutil.which("chromium") or shutil.which("chromium-browser")
    if chromium is None:
        raise SystemExit("chromium is not installed (apt-get install chromium)")
    subprocess.run(
        [
            chromium,
            *FLAGS,
            f"--user-data-dir={profile}",
            f"--screenshot={png}",
            f"--window-size=1200,{height}",
            html.as_uri(),
        ],
        check=True,
        capture_output=True,
        timeout=120,
    )


def section(html: Path, name: str) -> Path:
    """Write a copy of ``html`` holding only its head and the section ``id=name``."""
    text = html.read_text(encoding="utf-8")
    start = text.index(f'<section id="{name}">')
    end = text.index("</section>", start) + len("</section>")
    body = text.index("<body")
    page = text[:body] + "<body>" + text[start:end] + "</body></html>"
    path = html.with_name(f"{name}.html")
    path.write_text(page, encoding="utf-8")
    return path


def main() -> None:
    out = HERE / "img"
    out.mkdir(exist_ok=True)
    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        result = ranker.rank_workbook(write_demo(tmp), samples=10000)
        paths = ranker.write_outputs(result, tmp)
        html = Path(paths["html"])
        shoot(html, out / "justification-top.png", height=1500, profile=tmp / "p1")
        charts = section(html, "charts")
        shoot(charts, out / "justification-charts.png", height=1750, profile=tmp / "p2")
        print(out / "justification-top.png", out / "justification-charts.png")


if __name__ == "__main__":
    main()
