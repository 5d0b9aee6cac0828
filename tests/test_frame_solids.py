"""The frame as built: plates, pillars and cocks measured in the files a build writes.

The worked example (a cock beyond a wheel, four turned pillars) and a milled design
with a pin-and-slot coupling (two cocks, a given rectangle) are built once; their plate
files are read back as a user's programs read them (the kernel's STEP reader, ezdxf,
an XML parser, the STL bytes) and measured against the drilling chart. The assembly is
read back and no two of its solids, frame parts (plate, pillar, cock, screw, bearing)
included, may share volume. Every expected position comes from the drilling chart (CSV) the same
build wrote, so the files are checked against one another and against the chart.
"""

from __future__ import annotations

import csv
import math
import re
import shutil
import subprocess
import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pytest

pytest.importorskip("cadquery")

from tests._assembly import placed_solids, shared_volumes  # noqa: E402
from wheelgen.design import load_design  # noqa: E402
from wheelgen.export.build import BuildOptions, build_design  # noqa: E402
from wheelgen.layout.part_kinds import BOUGHT_KINDS  # noqa: E402
from wheelgen.parts import plan_parts  # noqa: E402

pytestmark = pytest.mark.cad

DATA = Path(__file__).parent / "data"
FRAME_KINDS = {"plate", "pillar", "cock", "screw", "bearing"}
NS = "{http://www.w3.org/2000/svg}"


def _build(design_path: Path, out: Path, formats=None, jobs: int = 1):
    design = load_design(design_path)
    options = BuildOptions(
        formats=formats or BuildOptions().formats, use_cache=False, jobs=jobs
    )
    build_design(design, out, options)
    return design


@pytest.fixture(scope="module")
def example(tmp_path_factory):
    out = tmp_path_factory.mktemp("frame") / "two_stage"
    design = _build(DATA / "two_stage.toml", out)
    return design, out


@pytest.fixture(scope="module")
def coupling(tmp_path_factory):
    out = tmp_path_factory.mktemp("frame") / "coupling"
    design = _build(DATA / "frame" / "mill_coupling.toml", out, ("step",))
    return design, out


@pytest.fixture(scope="module")
def printed(tmp_path_factory):
    out = tmp_path_factory.mktemp("frame") / "printed"
    design = _build(DATA / "frame" / "print_week.toml", out, ("step", "stl"))
    return design, out


def _chart(out: Path, plate: str) -> list[dict[str, str]]:
    return list(
        csv.DictReader(open(out / "drilling" / f"{plate}.csv", encoding="utf-8"))
    )


def _datum(design) -> tuple[float, float]:
    from wheelgen.layout.train_layout import plan_layout

    return plan_layout(design).position(design.drive.arbor)


@pytest.mark.parametrize("plate", ["back", "front"])
def test_every_hole_of_the_chart_is_in_the_plate_solid(example, plate):
    import cadquery as cq
    from OCP.BRepClass3d import BRepClass3d_SolidClassifier
    from OCP.gp import gp_Pnt
    from OCP.TopAbs import TopAbs_IN, TopAbs_OUT

    design, out = example
    solid = cq.importers.importStep(str(out / "step" / f"{plate}_plate.step")).val()
    assert solid.isValid() and len(solid.Solids()) == 1
    bb = solid.BoundingBox()
    assert bb.zlen == pytest.approx(design.frame.thickness, abs=1e-6)
    mid = bb.zmin + bb.zlen / 2
    dx, dy = _datum(design)

    def where(x: float, y: float):
        c = BRepClass3d_SolidClassifier(solid.wrapped, gp_Pnt(x, y, mid), 1e-7)
        return c.State()

    rows = _chart(out, plate)
    assert len(rows) >= 4 + 2  # four pillars and the pivots at least
    for r in rows:
        x, y = float(r["x_mm"]) + dx, float(r["y_mm"]) + dy
        low, high = float(r["low_mm"]), float(r["high_mm"])
        assert where(x, y) == TopAbs_OUT, r
        for k in range(8):
            a = math.radians(45 * k)
            # derived: the hole's wall lies between its limits: inside the smallest
            # size there is no metal, outside the largest there is
            inner = low / 2 - 0.002
            outer = high / 2 + 0.002
            assert where(x + inner * math.cos(a), y + inner * math.sin(a)) == TopAbs_OUT
            assert where(x + outer * math.cos(a), y + outer * math.sin(a)) == TopAbs_IN
    # nothing else is drilled: the solid's round holes are exactly the chart's
    circles = {
        (round(e.Center().x, 3), round(e.Center().y, 3))
        for e in solid.faces("<Z").Edges()
        if e.geomType() == "CIRCLE" and e.IsClosed()  # a whole circle: a hole
    }
    listed = {
        (round(float(r["x_mm"]) + dx, 3), round(float(r["y_mm"]) + dy, 3)) for r in rows
    }
    assert circles == listed


def test_plate_dxf_has_its_outline_and_holes_on_their_layers(example):
    import ezdxf

    design, out = example
    doc = ezdxf.readfile(out / "dxf" / "back_plate.dxf")
    assert doc.header["$INSUNITS"] == 4  # millimetres
    msp = doc.modelspace()
    layers = {e.dxf.layer for e in msp}
    assert {"OUTLINE", "PIVOTS", "PILLARS", "MOUNTING", "CENTRES"} <= layers
    dx, dy = _datum(design)
    circles = {
        (round(e.dxf.center.x - dx, 3), round(e.dxf.center.y - dy, 3)): (
            e.dxf.layer,
            2 * e.dxf.radius,
        )
        for e in msp.query("CIRCLE")
    }
    expected = {
        "pivot": "PIVOTS",
        "held": "PIVOTS",
        "pillar": "PILLARS",
        "mounting": "MOUNTING",
    }
    rows = _chart(out, "back")
    assert len(circles) == len(rows)
    for r in rows:
        layer, d = circles[(round(float(r["x_mm"]), 3), round(float(r["y_mm"]), 3))]
        assert layer == expected[r["role"]]
        assert float(r["low_mm"]) - 1e-9 <= d <= float(r["high_mm"]) + 1e-9
    # the outline closes: every end of a line or arc meets another's, once
    ends = []
    for e in msp.query("LINE[layer=='OUTLINE']"):
        ends += [(e.dxf.start.x, e.dxf.start.y), (e.dxf.end.x, e.dxf.end.y)]
    for e in msp.query("ARC[layer=='OUTLINE']"):
        ends += [(p.x, p.y) for p in (e.start_point, e.end_point)]
    keys = [(round(x, 5), round(y, 5)) for x, y in ends]
    assert all(keys.count(k) == 2 for k in keys)


def test_plate_svg_is_true_size_with_a_scale_bar(example):
    design, out = example
    root = ET.parse(out / "svg" / "back_plate.svg").getroot()
    w, h = root.get("width"), root.get("height")
    box = [float(v) for v in root.get("viewBox").split()]
    assert w.endswith("mm") and box[2:] == pytest.approx([float(w[:-2]), float(h[:-2])])
    bar = root.find(f"{NS}g[@id='scale-bar']")
    lengths = [
        abs(float(ln.get("x2")) - float(ln.get("x1"))) for ln in bar.iter(f"{NS}line")
    ]
    assert max(lengths) == pytest.approx(50.0)
    holes = list(root.find(f"{NS}g[@id='holes']").iter(f"{NS}circle"))
    assert len(holes) == len(_chart(out, "back"))
    # the outline spans the plate's size: the STL's extent
    from wheelgen.export.mesh import read_stl

    verts, _ = read_stl(out / "stl" / "back_plate.stl")
    d = [
        float(v)
        for v in re.findall(
            r"-?\d+\.?\d*", root.find(f"{NS}g[@id='outline']/{NS}path").get("d")
        )
    ]
    xs, ys = d[0::2], d[1::2]
    assert max(xs) - min(xs) == pytest.approx(float(np.ptp(verts[:, 0])), abs=0.02)
    assert max(ys) - min(ys) == pytest.approx(float(np.ptp(verts[:, 1])), abs=0.02)
    assert float(np.ptp(verts[:, 2])) == pytest.approx(design.frame.thickness, abs=1e-5)


@pytest.mark.skipif(shutil.which("chromium") is None, reason="chromium not installed")
def test_browser_draws_the_plate_at_true_size(example, tmp_path):
    # at 96 CSS pixels to the inch a millimetre is 96 / 25.4 pixels: the page's
    # width in pixels must be the SVG's width in mm times that
    _, out = example
    root = ET.parse(out / "svg" / "back_plate.svg").getroot()
    width_mm = float(root.get("width")[:-2])
    page = tmp_path / "page.html"
    page.write_text(
        "<!DOCTYPE html><html><body style='margin:0'>"
        f"<img src='{(out / 'svg' / 'back_plate.svg').as_uri()}'"
        " onload='document.title = this.naturalWidth'>"
        "</body></html>"
    )
    done = subprocess.run(
        ["chromium", "--headless", "--no-sandbox", "--disable-gpu", "--dump-dom",
         "--allow-file-access-from-files", "--virtual-time-budget=10000",
         page.as_uri()],
        capture_output=True, text=True, timeout=120,
    )  # fmt: skip
    found = re.search(r"<title>(\d+)</title>", done.stdout)
    if found is None:
        pytest.skip("chromium gave no page: " + done.stderr[-300:])
    assert int(found.group(1)) == pytest.approx(width_mm * 96 / 25.4, abs=1.0)


@pytest.mark.slow
@pytest.mark.parametrize("which", ["example", "coupling", "printed"])
def test_no_two_parts_share_volume(which, request):
    design, out = request.getfixturevalue(which)
    parts = plan_parts(design)
    assert {"plate", "pillar", "screw"} <= {p.kind for p in parts}
    path = out / "step" / "assembly.step"
    names = {s.name for s in placed_solids(path)}
    # every part is in the assembly, the bought screws too, each where the plan puts it
    assert names == {p.name for p in parts}
    assert {p.name for p in parts if p.kind in BOUGHT_KINDS} <= names
    assert shared_volumes(path) == []


def test_cock_and_pillar_solids(coupling):
    import cadquery as cq

    design, out = coupling
    from wheelgen.frame.plan import plan_frame

    plan = plan_frame(design)
    for c in plan.cocks:
        solid = cq.importers.importStep(str(out / "step" / f"{c.name}.step")).val()
        assert solid.isValid() and len(solid.Solids()) == 1
        bb = solid.BoundingBox()
        # derived: the bar runs from the pivot's round end (-w/2) to its far end
        # (length + w/2) and the cock stands bar plus foot high
        assert bb.xmin == pytest.approx(-c.width / 2, abs=1e-6)
        assert bb.xmax == pytest.approx(c.length + c.width / 2, abs=1e-6)
        assert bb.zlen == pytest.approx(
            (c.bar_z1 - c.bar_z0) + (c.foot_z1 - c.foot_z0), abs=1e-6
        )
    lim = plan.limits
    solid = cq.importers.importStep(str(out / "step" / "pillar_1.step")).val()
    bb = solid.BoundingBox()
    # M2.5: spigots of 4 mm through the 2.5 mm plates, body 4 + 3 = 7 mm for 30 mm
    assert (lim.spigot, lim.pillar_diameter) == (4.0, 7.0)
    assert bb.zlen == pytest.approx(30.0 + 2 * 2.5, abs=1e-6)
    assert bb.xlen == pytest.approx(7.0, abs=1e-6)
    body = math.pi * 3.5**2 * 30.0 + 2 * math.pi * 2.0**2 * 2.5
    hole = math.pi * (lim.screw.tap_drill / 2) ** 2 * lim.pillar_hole_depth
    assert solid.Volume() == pytest.approx(body - hole, rel=1e-4)


def test_bill_lists_frame_parts_and_counts_screws(example):
    import cadquery as cq

    design, out = example
    rows = list(csv.DictReader(open(out / "parts.csv", encoding="utf-8")))
    by = {r["part"]: r for r in rows}
    plate = by["back_plate"]
    assert (plate["kind"], plate["stock"], plate["sheet_thickness_mm"]) == (
        "plate", "sheet", "2.000",
    )  # fmt: skip
    solid = cq.importers.importStep(str(out / "step" / "back_plate.step")).val()
    # the bill's estimate from the flat outline agrees with the solid's volume
    assert float(plate["volume_mm3"]) == pytest.approx(solid.Volume(), rel=2e-4)
    pillars = [r for r in rows if r["kind"] == "pillar"]
    assert len(pillars) == 4 and {r["stock_outside_mm"] for r in pillars} == {"8.000"}
    (cock,) = [r for r in rows if r["kind"] == "cock"]
    assert "in line with the front plate's" in cock["note"]
    screws = [r for r in rows if r["kind"] == "screw"]
    # four pillar screws (M3 x 5 in the spigots) and the cock's two (M3 x 8)
    assert {(r["part"], r["quantity"]) for r in screws} == {
        ("M3 x 5 screw", "4"),
        ("M3 x 8 screw", "2"),
    }


def test_printed_plate_holds_the_bearing(printed):
    # the crank runs in a 3 x 7 x 3 ball bearing (the design's stock list): the plates
    # have a 7 mm hole for it, the bearing is in the assembly, flush with the back
    # plate's outer face, and the printed plate's mesh is as thick as the plate
    from wheelgen.export.mesh import read_stl

    design, out = printed
    solids = {s.name: s for s in placed_solids(out / "step" / "assembly.step")}
    bearings = [n for n in solids if n.startswith("crank_") and n.endswith("_bearing")]
    assert len(bearings) == 2
    back = solids["crank_back_bearing"]
    x0, y0, z0, x1, y1, z1 = back.box
    assert (x1 - x0, z0, z1) == pytest.approx((7.0, -3.0, 0.0), abs=1e-4)
    verts, _ = read_stl(out / "stl" / "back_plate.stl")
    assert float(np.ptp(verts[:, 2])) == pytest.approx(3.0, abs=1e-5)
