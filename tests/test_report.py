"""The build report: well-formed, self-contained HTML that shows the design's numbers.

External truth: the HTML must parse with balanced tags (HTML 5 void elements aside),
every inline SVG must be well-formed XML, and nothing may reach the network (no
http(s) link, no external image, script or stylesheet). When Chromium is installed
the page is rendered headless and the screenshot must not be blank; without Chromium
that test is skipped.
"""

from __future__ import annotations

import re
import xml.etree.ElementTree as ET
from html.parser import HTMLParser
from pathlib import Path

import pytest
from _browser import screenshot

from tests._demo import DEMO
from wheelgen.checks import analyse
from wheelgen.design import load_design
from wheelgen.findings import Finding
from wheelgen.layout.part_kinds import BOUGHT_KINDS
from wheelgen.parts import plan_parts
from wheelgen.workshop.cutting import cutting_rows, cutting_sheet_writer
from wheelgen.workshop.drilling import chart_holes
from wheelgen.workshop.parts_bill import parts_sheet_writer
from wheelgen.workshop.report import report_html, report_writer

SVG_NS = "http://www.w3.org/2000/svg"
VOID = {"area", "base", "br", "col", "embed", "hr", "img", "input", "link", "meta",
        "source", "track", "wbr"}  # fmt: skip


class _Collector(HTMLParser):
    """Checks nesting and gathers every attribute that could point elsewhere."""

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.stack: list[str] = []
        self.errors: list[str] = []
        self.tags: list[tuple[str, dict[str, str | None]]] = []
        self.ids: list[str] = []

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        d = dict(attrs)
        self.tags.append((tag, d))
        if d.get("id"):
            self.ids.append(str(d["id"]))
        if tag not in VOID:
            self.stack.append(tag)

    def handle_startendtag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        self.tags.append((tag, dict(attrs)))  # self-closed (SVG); nothing to pop

    def handle_endtag(self, tag: str) -> None:
        if not self.stack or self.stack[-1] != tag:
            self.errors.append(f"</{tag}> closes {self.stack[-1:]}")
            return
        self.stack.pop()


@pytest.fixture(scope="module")
def demo():
    design = load_design(DEMO)
    parts = plan_parts(design)
    analysis = analyse(design)
    return design, parts, analysis, report_html(design, parts, analysis.findings)


def test_html_is_well_formed(demo) -> None:
    page = demo[3]
    assert page.startswith("<!DOCTYPE html>")
    p = _Collector()
    p.feed(page)
    p.close()
    assert p.errors == []
    assert p.stack == []
    assert len(p.ids) == len(set(p.ids)), "ids must be unique in one page"
    svgs = re.findall(r"<svg\b.*?</svg>", page, flags=re.S)
    assert len(svgs) > 10
    for svg in svgs:
        ET.fromstring(svg)


def test_everything_is_embedded(demo) -> None:
    page = demo[3]
    p = _Collector()
    p.feed(page)
    for tag, attrs in p.tags:
        assert tag not in ("link", "script", "iframe", "object", "embed"), tag
        for key in ("src", "href", "xlink:href"):
            value = attrs.get(key)
            if value is None:
                continue
            assert value.startswith(("#", "data:")), f"<{tag} {key}={value[:60]}>"
        if tag == "img":
            assert str(attrs["src"]).startswith("data:image/svg+xml;base64,")
    # the only http URL allowed is the SVG namespace name, which is never fetched
    urls = set(re.findall(r"https?://[^\s\"'<>)]+", page))
    assert urls <= {SVG_NS}, urls
    assert "@import" not in page
    # url() only for references inside the page (an SVG marker), never a file or site
    assert all(u.startswith("#") for u in re.findall(r"url\(\s*['\"]?([^)'\"]*)", page))


def test_report_shows_the_numbers(demo) -> None:
    design, parts, analysis, page = demo
    assert design.title.replace("(", "").split()[0] in page
    assert f"<h1>{design.title}</h1>" in page
    for r in analysis.targets:
        assert r.target.arbor in page
    assert page.count('class="met"') == sum(1 for r in analysis.targets if r.met)
    for row in cutting_rows(parts):
        if row.over_pins is not None:
            assert f"{row.over_pins:.4f} over" in page
        if row.span_width is not None:
            assert f"{row.span_width:.4f} over {row.span_teeth}" in page
        assert f"{row.infeed:.4f}" in page
    for part in parts:
        if part.kind in BOUGHT_KINDS:  # counted in the bill by size, not drawn
            assert part.name in page
        else:
            assert f"<b>{part.name}</b>" in page
    for h in chart_holes(design, "front"):
        assert f"{h.x:.4f}" in page
    # the layout drawing shows the plates' real outline and the pillars
    assert "outline indicative" not in page
    assert "<title>plate outline</title>" in page
    assert "<title>pillar_1</title>" in page
    assert "Time-lapse: 1 second of the animation shows" in page
    assert "animateTransform" in page
    assert "Checked: no error-level findings." in page


def test_forced_build_says_unchecked(demo) -> None:
    design, parts, _, _ = demo
    bad = Finding("error", "test.forced", "wheel day_wheel", "a made-up error")
    page = report_html(design, parts, [bad])
    assert "UNCHECKED" in page and "a made-up error" in page


def test_writers_write_into_staging(tmp_path: Path, demo) -> None:
    design, parts, analysis, _ = demo
    written = []
    for writer in (cutting_sheet_writer, parts_sheet_writer, report_writer):
        paths = writer(design, parts, analysis.findings, tmp_path)
        for path in paths:
            assert path.is_relative_to(tmp_path) and path.stat().st_size > 0
        written += [p.relative_to(tmp_path).as_posix() for p in paths]
    # the demo's one triangular wheel gets the drawing of its form cutter
    assert written == [
        "cutting.csv",
        "cutters/moon_disc.svg",
        "parts.csv",
        "report.html",
    ]


def test_report_lists_every_file_with_its_size(tmp_path: Path, demo) -> None:
    design, parts, analysis, page = demo
    assert "listed when <code>wheelgen build</code> writes the report" in page
    # a staging folder as the build leaves it for the sheet writers
    wheel = next(p for p in parts if p.kind == "wheel")
    (tmp_path / "step").mkdir()
    (tmp_path / "step" / f"{wheel.name}.step").write_bytes(b"x" * 12_345)
    (tmp_path / "step" / "assembly.step").write_bytes(b"x" * 2_000_000)
    (tmp_path / "dxf").mkdir()
    (tmp_path / "dxf" / f"{wheel.name}.dxf").write_bytes(b"x" * 999)
    (tmp_path / ".work").mkdir()  # a working folder: not a build file
    (tmp_path / ".work" / "junk").write_bytes(b"x" * 5)
    (path,) = report_writer(design, parts, analysis.findings, tmp_path)
    text = path.read_text()
    section = text[text.index('<section id="files">') :]
    # derived: 1 kB = 1000 bytes, 3 significant digits
    assert "12.3 kB" in section and "999 B" in section and "2.00 MB" in section
    assert "step/assembly.step" in section and ".work" not in section
    # together: 12345 + 2000000 + 999 = 2013344 bytes
    assert "3 files, 2.01 MB in all" in section


def test_report_renders_in_headless_chromium(tmp_path: Path, demo) -> None:
    page = tmp_path / "report.html"
    page.write_text(demo[3], encoding="utf-8")
    shot = tmp_path / "shot.png"
    why = screenshot(page, shot)
    if why:
        pytest.skip(why)
    from PIL import Image

    img = Image.open(shot).convert("L")
    hist = img.histogram()
    total = sum(hist)
    dark = sum(hist[:200]) / total
    # a blank page is all white; the top of the report holds the title, the job table
    # and the start of the layout drawing
    assert dark > 0.01, f"only {dark:.2%} of the screenshot is not white"
    assert len([v for v in hist if v]) > 20, "too few grey levels: nothing drawn"
