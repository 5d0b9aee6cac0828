"""The 1:1 drawings of arbors, tubes and collars, read back from their files.

The SVG is parsed as XML and the DXF with ezdxf (and, where installed, FreeCAD's DXF
importer): the drawing must be at true size (the page in mm equals its user units,
the check bar 50 of them), show every length at its diameter, and carry every change
of diameter from the back end and every fitted limit of the part as text.
"""

from __future__ import annotations

import xml.etree.ElementTree as ET
from pathlib import Path

import pytest

from tests._demo import DEMO_TEXT
from wheelgen.design import loads_design
from wheelgen.layout.part_kinds import ArborPart, CollarPart, SleevePart
from wheelgen.parts import plan_parts
from wheelgen.workshop._svg import fmt
from wheelgen.workshop.turned_drawing import SCALE_BAR_MM, sheet_svg, turned_sheet

NS = "{http://www.w3.org/2000/svg}"


@pytest.fixture(scope="module")
def turned():
    design = loads_design(DEMO_TEXT, "demo.toml")
    return [
        p
        for p in plan_parts(design)
        if isinstance(p, (ArborPart, SleevePart, CollarPart))
    ]


def _texts(root: ET.Element) -> list[str]:
    return [t.text or "" for t in root.iter(f"{NS}text")]


def test_every_turned_part_is_drawn_at_true_size(turned) -> None:
    for part in turned:
        root = ET.fromstring(sheet_svg(turned_sheet(part)))
        width_mm = float(root.get("width").removesuffix("mm"))
        height_mm = float(root.get("height").removesuffix("mm"))
        _, _, vw, vh = (float(v) for v in root.get("viewBox").split())
        assert (width_mm, height_mm) == pytest.approx((vw, vh)), part.name
        assert f"{fmt(SCALE_BAR_MM)} mm" in " ".join(_texts(root))


def _outline(root: ET.Element) -> list[tuple[float, float, float, float]]:
    group = next(g for g in root.iter(f"{NS}g") if g.get("id") == "outline")
    return [
        tuple(float(line.get(k)) for k in ("x1", "y1", "x2", "y2"))
        for line in group.iter(f"{NS}line")
    ]


def test_each_length_is_drawn_at_its_diameter(turned) -> None:
    for part in turned:
        if isinstance(part, CollarPart):
            continue
        root = ET.fromstring(sheet_svg(turned_sheet(part)))
        lines = _outline(root)
        for s in part.sections:
            r = s.diameter / 2
            # the top edge of the length: a line at -r (the page's y runs down)
            assert any(
                abs(y0 + r) < 1e-3 and abs(y1 + r) < 1e-3
                and min(x0, x1) <= s.z0 + 1e-3 and max(x0, x1) >= s.z1 - 1e-3
                for x0, y0, x1, y1 in lines
            ), (part.name, s)  # fmt: skip


def test_every_change_of_diameter_and_every_limit_is_written(turned) -> None:
    for part in turned:
        root = ET.fromstring(sheet_svg(turned_sheet(part)))
        text = " ".join(_texts(root))
        if isinstance(part, CollarPart):
            assert f"{part.bore_low:.3f} / {part.bore_high:.3f}" in text
            assert part.member in text
            continue
        figures = set(_texts(root))
        for s in part.sections:
            assert fmt(s.z0, 2) in figures and fmt(s.z1, 2) in figures, s
            if s.zone:
                assert f"{s.zone}  {s.low:.3f} / {s.high:.3f}" in text, s
        assert f"{fmt(part.length, 2)} overall" in figures
        if isinstance(part, SleevePart):
            assert f"H7  {part.bore_low:.3f} / {part.bore_high:.3f}" in text
        for note in part.notes:
            assert note in text


def test_the_dxf_holds_the_same_drawing(turned, tmp_path: Path) -> None:
    ezdxf = pytest.importorskip("ezdxf")
    pytest.importorskip("cadquery")  # the DXF writer lives in the export layer
    from wheelgen.export.dxf import write_sheet_dxf

    part = next(p for p in turned if p.name == "main")
    sheet = turned_sheet(part)
    path = write_sheet_dxf(sheet, tmp_path / "main.dxf")
    doc = ezdxf.readfile(path)
    audit = doc.audit()
    assert not audit.errors and not audit.fixes
    msp = doc.modelspace()
    texts = {e.dxf.text for e in msp.query("TEXT")}
    assert {t.text for t in sheet.texts} == texts
    outline = [e for e in msp.query("LINE") if e.dxf.layer == "OUTLINE"]
    for s in part.sections:
        r = s.diameter / 2
        assert any(
            abs(e.dxf.start.y - r) < 1e-9 and abs(e.dxf.end.y - r) < 1e-9
            and e.dxf.start.x <= s.z0 + 1e-9 and e.dxf.end.x >= s.z1 - 1e-9
            for e in outline
        ), s  # fmt: skip
    # the same bytes on a second write
    again = write_sheet_dxf(sheet, tmp_path / "again.dxf")
    assert again.read_bytes() == path.read_bytes()


@pytest.mark.slow
def test_freecad_reads_the_drawing(turned, tmp_path: Path) -> None:
    from tests._dxf_readback import freecad_available, read_with_freecad

    if not freecad_available():
        pytest.skip("freecadcmd is not installed")
    pytest.importorskip("cadquery")
    from wheelgen.export.dxf import write_sheet_dxf

    part = next(p for p in turned if p.name == "lay")
    path = write_sheet_dxf(turned_sheet(part), tmp_path / "lay.dxf")
    layers = read_with_freecad([path], tmp_path)[path]
    outline = [pt for label, edges in layers.items() if "OUTLINE" in label
               for _, pts in edges for pt in pts]  # fmt: skip
    xs, ys = [x for x, _ in outline], [y for _, y in outline]
    # the part's side view: from its back end to its length, its largest diameter
    big = max(s.diameter for s in part.sections)
    assert (min(xs), max(xs)) == pytest.approx((0.0, part.length), abs=1e-6)
    assert (min(ys), max(ys)) == pytest.approx((-big / 2, big / 2), abs=1e-6)
