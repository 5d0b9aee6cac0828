"""The report's drawings read: labels that do not cover each other, a train diagram
no wider than the page, drilling charts whose text stays readable.

The text boxes are estimated from the SVG alone (not from the code that placed them):
a line of n characters in a sans-serif face of size s is about 0.55 s per character
wide (common practice, no source: the mean advance of lower-case letters, digits and
the underscore in the usual sans-serif faces lies between 0.5 and 0.6 em), bold a
little wider; it stands 0.75 s above its baseline and 0.2 s below.
"""

from __future__ import annotations

import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pytest

from tests._demo import DEMO
from wheelgen.design import load_design
from wheelgen.kinematics import solve_rates
from wheelgen.layout import arbor_positions
from wheelgen.workshop.drilling import drilling_svg
from wheelgen.workshop.layout_drawing import layout_svg
from wheelgen.workshop.train_diagram import PAGE_WIDTH, train_diagram_svg

ROOT = Path(__file__).resolve().parent.parent
DATA = ROOT / "tests" / "data"
SVG = "{http://www.w3.org/2000/svg}"
DESIGNS = [
    DEMO,
    *sorted(DATA.glob("*.toml")),
    *sorted((DATA / "frame").glob("*.toml")),
    *sorted((DATA / "display").glob("*.toml")),
]
EM = 0.55  # width of one character, of the font size (module docstring)


def _loads(path: Path):
    """The design and its arbors' places; the test skips a sample made to fail a
    check elsewhere (it has no drawing to judge)."""
    try:
        design = load_design(path)
        positions = arbor_positions(design)
    except Exception:
        pytest.skip("the design does not lay out")
    return design, positions


def _boxes(svg: str) -> list[tuple[str, tuple[float, float, float, float]]]:
    """Every text's box (x0, y0, x1, y1) in the SVG's user units, y down."""
    root = ET.fromstring(svg)
    parent = {c: p for p in root.iter() for c in p}

    def inherited(e: ET.Element, key: str, default: str) -> str:
        while e is not None:
            if e.get(key) is not None:
                return e.get(key)
            e = parent.get(e)
        return default

    out = []
    for t in root.iter(f"{SVG}text"):
        text = "".join(t.itertext())
        size = float(inherited(t, "font-size", "16"))
        bold = inherited(t, "font-weight", "normal") == "bold"
        w = len(text) * size * EM * (1.05 if bold else 1.0)
        x, y = float(t.get("x", 0)), float(t.get("y", 0))
        x0 = {"start": x, "middle": x - w / 2, "end": x - w}[
            t.get("text-anchor", "start")
        ]
        assert t.get("transform") is None  # a turned label would need its own box
        out.append((text, (x0, y - 0.75 * size, x0 + w, y + 0.2 * size)))
    return out


def _overlaps(boxes):
    found = []
    for i, (ta, a) in enumerate(boxes):
        for tb, b in boxes[i + 1 :]:
            if a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]:
                found.append((ta, tb))
    return found


@pytest.mark.parametrize("path", DESIGNS, ids=lambda p: p.stem)
def test_no_two_labels_of_the_layout_drawing_overlap(path: Path) -> None:
    design, positions = _loads(path)
    svg = layout_svg(design, positions)
    boxes = _boxes(svg)
    assert len(boxes) >= len(design.arbors)
    assert _overlaps(boxes) == []
    x, y, w, h = (float(v) for v in ET.fromstring(svg).get("viewBox", "").split())
    for text, (x0, y0, x1, y1) in boxes:  # and every one on the drawing
        assert x <= x0 and x1 <= x + w and y <= y0 and y1 <= y + h, text


@pytest.mark.parametrize("path", DESIGNS, ids=lambda p: p.stem)
def test_train_diagram_fits_the_page(path: Path) -> None:
    design, _ = _loads(path)
    svg = train_diagram_svg(design, solve_rates(design))
    root = ET.fromstring(svg)
    _, _, w, h = (float(v) for v in root.get("viewBox", "").split())
    # the report's text column is 62 em of 16 px (report.STYLESHEET)
    assert w <= PAGE_WIDTH <= 62 * 16
    assert float(root.get("width", "0")) == pytest.approx(w)
    boxes = _boxes(svg)
    for text, (x0, y0, x1, y1) in boxes:
        assert x0 >= 0 and x1 <= w and y0 >= 0 and y1 <= h, text
    # no arrow label sits on another label or on a box's text
    assert _overlaps(boxes) == []


def test_the_demo_train_diagram_is_narrower_than_the_page() -> None:
    design = load_design(DESIGNS[0])
    root = ET.fromstring(train_diagram_svg(design, solve_rates(design)))
    # it used to run to twice the page's width in a single row
    assert float(root.get("width", "0")) <= PAGE_WIDTH


@pytest.mark.parametrize("path", DESIGNS, ids=lambda p: p.stem)
def test_drilling_chart_text_stays_readable(path: Path) -> None:
    design, _ = _loads(path)
    if design.frame is None:
        pytest.skip("the design has no plates to drill")
    for plate in ("back", "front"):
        svg = drilling_svg(design, plate)
        svg = svg[svg.index("<svg") :]
        root = ET.fromstring(svg)
        width_mm = float(root.get("viewBox", "").split()[2])
        # the 1:1 chart prints at its size in mm; on screen the report shows it at the
        # text column's width at most: 62 em of 16 px is 992 px, 96 px to the inch
        scale = min(1.0, 992 / (width_mm * 96 / 25.4))
        boxes = _boxes(svg)
        for text, (x0, y0, x1, y1) in boxes:
            size_mm = (y1 - y0) / 0.95
            # at least 2.5 mm on paper (about 7 pt); the hole numbers and list at
            # least 9 px on the screen (common practice, no source: below that a
            # figure is read only with a magnifier)
            assert size_mm >= 2.5, text
            if text[:1].isdigit():
                assert size_mm * 96 / 25.4 * scale >= 9.0, (text, scale)
            assert 0 <= x0 and x1 <= width_mm, text  # inside the sheet
        assert _overlaps(boxes) == []


@pytest.mark.slow
@pytest.mark.parametrize(
    "path", [DESIGNS[0], DATA / "frame" / "print_week.toml"], ids=lambda p: p.stem
)
def test_nothing_runs_past_the_page_in_a_browser(path: Path, tmp_path: Path) -> None:
    from _browser import screenshot
    from PIL import Image

    from wheelgen.checks import run_checks
    from wheelgen.parts import plan_parts
    from wheelgen.workshop.report import report_html

    design = load_design(path)
    page = tmp_path / "report.html"
    page.write_text(report_html(design, plan_parts(design), run_checks(design)))
    shot = tmp_path / "report.png"
    why = screenshot(page, shot, "1200,20000")
    if why:
        pytest.skip(why)
    pixels = np.asarray(Image.open(shot).convert("L"))
    # the text column is 62 em of 16 px, centred: (1200 - 992) / 2 = 104 px each side
    # is margin, less the body's 1 em padding; nothing may be drawn there
    assert (pixels[:, :80] < 240).sum() == 0
    assert (pixels[:, 1120:] < 240).sum() == 0
