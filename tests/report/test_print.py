"""The justification sheet in print: a one-page board brief, and the demo in at most 12 pages.

Printed by Chromium (``--print-to-pdf``) on US Letter and on ISO A4
(ISO 216); pages are counted from the PDF's page objects (``/Type /Page``,
PDF 1.7, ISO 32000-1, section 7.7.3.3). The brief ends on page one when,
printed alone (everything after its section cut), it takes exactly one page:
the sheet's print style breaks the page right after it.
"""

from __future__ import annotations

import re
import shutil
import subprocess

import pytest

import ranker
from ranker.demo import write_demo

CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
FLAGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--host-resolver-rules=MAP * ~NOTFOUND",
]
#: Most printed pages for the demo's 13 corridors.
MOST_PAGES = 12

pytestmark = [
    pytest.mark.slow,
    pytest.mark.skipif(CHROMIUM is None, reason="Debian's chromium is not installed"),
]


@pytest.fixture(scope="module")
def demo_html(tmp_path_factory):
    out = tmp_path_factory.mktemp("print")
    result = ranker.rank_workbook(write_demo(out))
    paths = ranker.write_outputs(result, out)
    return out, open(paths["html"], encoding="utf-8").read()


def _pages(folder, html: str, size: str) -> int:
    page = folder / f"sheet-{size}.html"
    page.write_text(html.replace("</head>", f"<style>@page {{ size: {size}; }}</style></head>"))
    pdf = folder / f"sheet-{size}.pdf"
    subprocess.run(
        [
            CHROMIUM,
            *FLAGS,
            f"--user-data-dir={folder / 'profile'}",
            f"--print-to-pdf={pdf}",
            "--no-pdf-header-footer",
            f"file://{page}",
        ],
        capture_output=True,
        timeout=120,
        check=False,
    )
    return len(re.findall(rb"/Type\s*/Page[^s]", pdf.read_bytes()))


@pytest.mark.parametrize("size", ["letter", "A4"])
def test_demo_prints_in_at_most_twelve_pages(demo_html, size):
    folder, html = demo_html
    pages = _pages(folder, html, size)
    assert 2 <= pages <= MOST_PAGES


@pytest.mark.parametrize("size", ["letter", "A4"])
def test_the_brief_stands_alone_on_page_one(demo_html, size):
    folder, html = demo_html
    brief = html.split('<section id="brief"')[1].split("</section>")[0]
    # What a board member must find on that page.
    for words in ("Fund first", "Tier", "nearest change", "Funded, by year", "Caution", "SHA-256"):
        assert words in brief, words
    alone = html.split("</section>")[0] + "</section></body></html>"
    assert _pages(folder, alone, size) == 1
    assert ".brief { break-after: page; }" in html
