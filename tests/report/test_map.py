"""The network map: every corridor once, exact values as hover text, labels in the frame."""

from __future__ import annotations

import json
import re
import shutil
import subprocess
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest

import ranker
from ranker.demo import write_demo
from ranker.geo.export import corridor_properties
from ranker.report.map import coverage_maps, network_map
from ranker.report.svg import text_width

NS = {"s": "http://www.w3.org/2000/svg"}


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    out = tmp_path_factory.mktemp("demo")
    path = write_demo(out)
    result = ranker.rank_workbook(path, samples=500, seed=3)
    paths = ranker.write_outputs(result, out)
    return result, paths


def _svg(demo):
    result, _ = demo
    svg, skipped = network_map(result, corridor_properties(result))
    return result, ET.fromstring(svg), skipped


def test_every_placed_corridor_drawn_once_with_its_values(demo):
    result, root, _ = _svg(demo)
    paths = root.findall(".//s:path[@class='corridor']", NS)
    ids = [p.get("data-corridor") for p in paths]
    assert sorted(ids) == sorted(result.inputs.corridors.index)
    for p in paths:
        cid = p.get("data-corridor")
        tip = p.find("s:title", NS).text
        if cid in result.ranking.index:
            rank = int(result.ranking.loc[cid, "rank"])
            score = result.ranking.loc[cid, f"score_{result.primary_method}"]
            assert f"rank {rank}" in tip and f"{score:.4f}" in tip
            assert p.get("stroke-dasharray") is None
        else:  # screened out: dashed, and the rule is in the hover text
            assert p.get("stroke-dasharray") and "screened out" in tip


def test_width_follows_trucks_per_day(demo):
    result, root, _ = _svg(demo)
    trucks = result.inputs.corridors["trucks_per_day"]
    widths = {
        p.get("data-corridor"): float(p.get("stroke-width"))
        for p in root.findall(".//s:path[@class='corridor']", NS)
    }
    order = sorted(widths, key=lambda c: trucks[c])
    assert [widths[c] for c in order] == sorted(widths.values())
    assert widths[trucks.idxmax()] == pytest.approx(8.0)


def test_labels_inside_the_frame_and_apart(demo):
    _, root, skipped = _svg(demo)
    frame = root.find("s:rect", NS)
    fx, fy = float(frame.get("x")), float(frame.get("y"))
    fw, fh = float(frame.get("width")), float(frame.get("height"))
    boxes = []
    for t in root.findall(".//s:text[@class='place-label']", NS):
        x, y, size = float(t.get("x")), float(t.get("y")), float(t.get("font-size"))
        w = text_width(t.text, size)
        x1 = {"start": x, "end": x - w, "middle": x - w / 2}[t.get("text-anchor")]
        box = (x1, y - 0.6 * size, x1 + w, y + 0.6 * size)
        assert fx <= box[0] and box[2] <= fx + fw and fy <= box[1] and box[3] <= fy + fh
        boxes.append(box)
    for i, a in enumerate(boxes):
        for b in boxes[i + 1 :]:
            assert a[2] <= b[0] or b[2] <= a[0] or a[3] <= b[1] or b[3] <= a[1]
    assert len(boxes) + len(skipped) == 9


def test_scale_bar_lengths_match_the_projection(demo):
    """The km bar's drawn length equals its label times the map's px per metre."""
    result, root, _ = _svg(demo)
    from ranker.report.charts import WIDTH
    from ranker.report.map import MAX_H, Frame

    frame = Frame(result.network, x0=1.0, y0=1.0, width=WIDTH - 2.0, max_height=MAX_H)
    texts = [t.text for t in root.findall(".//s:text", NS)]
    km = next(t for t in texts if t.endswith(" km"))
    mi = next(t for t in texts if t.endswith(" mi"))
    lines = root.findall("s:line", NS)
    lengths = sorted({round(float(ln.get("x2")) - float(ln.get("x1")), 2) for ln in lines} - {0.0})
    want_km = float(km.split()[0]) * 1000 * frame.scale
    want_mi = float(mi.split()[0]) * 1609.344 * frame.scale
    assert any(abs(v - want_km) < 0.02 for v in lengths)
    assert any(abs(v - want_mi) < 0.02 for v in lengths)


def test_coverage_maps_one_per_plan_year(demo):
    result, _ = demo
    root = ET.fromstring(coverage_maps(result))
    years = [int(y) for y in result.plan.budget["year"]]
    captions = [t.text for t in root.findall(".//s:text", NS) if t.text.startswith("by ")]
    assert [int(c.split()[1].rstrip(":")) for c in captions] == years


def test_map_section_in_the_sheet(demo):
    _, paths = demo
    html = Path(paths["html"]).read_text(encoding="utf-8")
    assert '<section id="map">' in html and html.count('class="corridor"') >= 14


CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run",
         "--disable-background-networking", "--host-resolver-rules=MAP * ~NOTFOUND"]  # fmt: skip

PROBE = """<script>
const svg = document.querySelector('#map svg');
const frame = svg.querySelector('rect').getBoundingClientRect();
const out = {width: document.documentElement.clientWidth,
  svg: svg.getBoundingClientRect().toJSON(), frame: frame.toJSON(),
  ids: [...svg.querySelectorAll('path.corridor')].map(p => p.dataset.corridor),
  labels: [...svg.querySelectorAll('text.place-label')].map(t => t.getBoundingClientRect().toJSON())};
document.body.setAttribute('data-probe', JSON.stringify(out));
</script>"""


@pytest.mark.slow
@pytest.mark.skipif(CHROMIUM is None, reason="Debian's chromium is not installed")
@pytest.mark.parametrize("paper, width_px", [("Letter", 733), ("A4", 703)])
def test_map_in_chromium_fits_the_printed_page(demo, tmp_path, paper, width_px):
    """Laid out at the printable width (Letter 8.5 in, A4 210 mm, less 12 mm margins each side,
    at CSS's 96 px/in), the map fits the width, every corridor is drawn once and every place
    name lies inside the frame."""
    result, paths = demo
    page = tmp_path / "probe.html"
    html = Path(paths["html"]).read_text(encoding="utf-8")
    page.write_text(html.replace("</body>", PROBE + "</body>"), encoding="utf-8")
    run = subprocess.run(
        [CHROMIUM, *FLAGS, f"--user-data-dir={tmp_path / 'p'}", f"--window-size={width_px},1000",
         "--dump-dom", page.as_uri()],
        capture_output=True, text=True, timeout=120,
    )  # fmt: skip
    m = re.search(r"data-probe=\"([^\"]*)\"", run.stdout)
    assert m, run.stderr[-2000:]
    probe = json.loads(m.group(1).replace("&quot;", '"').replace("&amp;", "&"))
    assert probe["svg"]["right"] <= probe["width"] + 0.5
    assert probe["svg"]["height"] <= 900  # shorter than the printable height of either page
    assert sorted(probe["ids"]) == sorted(result.inputs.corridors.index)
    f = probe["frame"]
    assert probe["labels"]
    for b in probe["labels"]:
        assert f["left"] <= b["left"] and b["right"] <= f["right"]
        assert f["top"] <= b["top"] and b["bottom"] <= f["bottom"]
    pdf = tmp_path / "sheet.pdf"
    subprocess.run(
        [CHROMIUM, *FLAGS, f"--user-data-dir={tmp_path / 'p'}", f"--print-to-pdf={pdf}",
         "--no-pdf-header-footer", Path(paths["html"]).as_uri()],
        capture_output=True, timeout=120,
    )  # fmt: skip
    assert pdf.exists() and pdf.stat().st_size > 10_000
