"""Printed designs: orientation, build plates, the fit test coupon, no milling words.

Every check measures the written files: the plates' 3MF packages are unzipped and
their vertices read, the coupon's STL is read back, and a slicer (where installed)
must accept each plate. Expected values are derived from the design's numbers:

- a part lies inside the plate when every vertex is at least the spacing from its
  edges; two parts keep the spacing when their footprints' boxes are that far apart
  on x or on y (derived: the layout places boxes);
- a flat wheel stands as high as its face width, a rod lying down as high as its
  diameter, an upright pillar as high as its length (derived: the orientation rule);
- the coupon's holes are the nominal diameter plus twice each radial clearance, its
  pins the nominal less twice; a hole's radius is the nearest vertex of the plate to
  its axis, a pin's the farthest vertex of the pin (a chordal mesh lies on the circle
  at its vertices, docs: export/mesh.py).
"""

from __future__ import annotations

import re
import shutil
import subprocess
import xml.etree.ElementTree as ET
import zipfile
from pathlib import Path

import numpy as np
import pytest

from wheelgen.design import load_design
from wheelgen.design.errors import DesignError
from wheelgen.design.loader import loads_design
from wheelgen.layout.part_kinds import ArborPart, PillarPart, WheelPart
from wheelgen.parts import plan_parts
from wheelgen.workshop.fit_coupon import fit_test_plan
from wheelgen.workshop.print_plan import PART_SPACING, orientation, pack_beds
from wheelgen.workshop.stl_file import read_stl

DATA = Path(__file__).resolve().parent / "data"
NS = {"m": "http://schemas.microsoft.com/3dmanufacturing/core/2015/02"}
# the classroom design with a stock rod for the 3 mm arbors and a smaller bed
EXTRA = '\n[[stock]]\nkind = "rod"\noutside = 3.0\n'
BED = (150.0, 140.0)


def _design_text() -> str:
    text = (DATA / "frame" / "print_week.toml").read_text(encoding="utf-8")
    text = text.replace(
        "clearance = 0.2\n", f"clearance = 0.2\nbed = [{BED[0]}, {BED[1]}]\n"
    )
    return text + EXTRA


@pytest.fixture(scope="module")
def built(tmp_path_factory: pytest.TempPathFactory):
    from wheelgen.export.build import BuildOptions, build_design

    folder = tmp_path_factory.mktemp("print")
    src = folder / "classroom.toml"
    src.write_text(_design_text(), encoding="utf-8")
    design = load_design(src)
    out = folder / "out"
    build_design(design, out, BuildOptions(use_cache=False))
    return design, plan_parts(design), out


def _plates(out: Path) -> dict[int, dict[str, np.ndarray]]:
    plates = {}
    for path in sorted((out / "bed").glob("bed-*.3mf")):
        number = int(re.fullmatch(r"bed-(\d+)\.3mf", path.name).group(1))
        with zipfile.ZipFile(path) as zf:
            root = ET.fromstring(zf.read("3D/3dmodel.model"))
        objects = {}
        for obj in root.iterfind(".//m:object", NS):
            v = np.array(
                [
                    [float(e.get(k)) for k in ("x", "y", "z")]
                    for e in obj.iterfind(".//m:vertex", NS)
                ]
            )
            objects[obj.get("name")] = v
        items = root.findall(".//m:build/m:item", NS)
        assert len(items) == len(objects)
        plates[number] = objects
    return plates


def test_bed_key_is_read_bounded_and_documented() -> None:
    text = _design_text()
    design = loads_design(text, "w.toml")
    assert design.process.bed == BED
    plain = loads_design(text.replace(f"bed = [{BED[0]}, {BED[1]}]\n", ""), "w.toml")
    assert plain.process.bed == (200.0, 200.0)  # the documented default
    for bad in ("[10.0, 200.0]", "[200.0]", "[200.0, nan]", '"big"'):
        with pytest.raises(DesignError) as info:
            loads_design(text.replace(f"[{BED[0]}, {BED[1]}]", bad), "w.toml")
        message = str(info.value)
        assert "'bed'" in message and "20 to 2000 mm" in message, message
    doc = (Path(__file__).parents[1] / "docs" / "format.md").read_text()
    assert "| `bed` | two numbers, each 20..2000 | `[200.0, 200.0]` |" in doc


def test_orientation_rule() -> None:
    design = loads_design(_design_text(), "w.toml")
    parts = {p.name: p for p in plan_parts(design)}
    assert orientation(parts["week_wheel"], design) == "flat"
    assert orientation(parts["back_plate"], design) == "flat"
    assert orientation(parts["pillar_1"], design) == "upright"  # 24 mm, 10 across
    assert orientation(parts["week"], design) == "lying"  # 37.8 mm, 4 across
    assert orientation(parts["lay"], design) == "stock rod"  # the 3 mm rod is stock
    short = ArborPart("stub", diameter=4.0, length=12.0)
    assert orientation(short, design) == "upright"


@pytest.mark.parametrize("seed", range(5))
def test_pack_beds_keeps_inside_and_apart(seed: int) -> None:
    rng = np.random.default_rng(seed)
    sizes = [
        (f"p{k}", float(w), float(d))
        for k, (w, d) in enumerate(rng.uniform(2, 90, size=(25, 2)))
    ]
    sizes.append(("huge", 300.0, 20.0))
    slots = pack_beds(sizes, (200.0, 150.0))
    assert [s.name for s in slots] == [n for n, _, _ in sizes]
    assert next(s for s in slots if s.name == "huge").bed == 0
    on = [s for s in slots if s.bed > 0]
    for s in on:
        assert s.x >= PART_SPACING - 1e-9 and s.y >= PART_SPACING - 1e-9
        assert s.x + s.width <= 200 - PART_SPACING + 1e-9
        assert s.y + s.depth <= 150 - PART_SPACING + 1e-9
    for i, a in enumerate(on):
        for b in on[i + 1 :]:
            if a.bed != b.bed:
                continue
            apart_x = max(b.x - (a.x + a.width), a.x - (b.x + b.width))
            apart_y = max(b.y - (a.y + a.depth), a.y - (b.y + b.depth))
            assert max(apart_x, apart_y) >= PART_SPACING - 1e-9, (a, b)


@pytest.mark.cad
@pytest.mark.slow
def test_plates_hold_every_printed_part_inside_and_apart(built) -> None:
    design, parts, out = built
    plates = _plates(out)
    assert plates, "no build plate written"
    seen: list[str] = []
    for number, objects in plates.items():
        boxes = []
        for name, v in objects.items():
            lo, hi = v.min(axis=0), v.max(axis=0)
            assert lo[2] == pytest.approx(0.0, abs=1e-6), name  # on the plate
            assert lo[0] >= PART_SPACING - 1e-6 and lo[1] >= PART_SPACING - 1e-6, name
            assert hi[0] <= BED[0] - PART_SPACING + 1e-6, name
            assert hi[1] <= BED[1] - PART_SPACING + 1e-6, name
            boxes.append((name, lo, hi))
        for i, (na, la, ha) in enumerate(boxes):
            for nb, lb, hb in boxes[i + 1 :]:
                gap = max(lb[0] - ha[0], la[0] - hb[0], lb[1] - ha[1], la[1] - hb[1])
                assert gap >= PART_SPACING - 1e-6, (number, na, nb, gap)
        seen += list(objects)
    by_name = {p.name: p for p in parts}
    printed = {p.name for p in parts if p.kind not in ("screw", "bearing", "bush")}
    assert set(seen) == printed - {"crank", "lay"}  # the 3 mm arbors are stock rod
    heights = {
        name: float(v[:, 2].max())
        for objects in plates.values()
        for name, v in objects.items()
    }
    for name, h in heights.items():
        part = by_name[name]
        if isinstance(part, WheelPart):
            assert h == pytest.approx(part.face_width, abs=1e-3), name
        elif isinstance(part, PillarPart):
            assert h == pytest.approx(part.length, abs=1e-3), name
        elif isinstance(part, ArborPart):
            # lying: as high as its largest diameter (a collar or shoulder), measured
            # on its own STL about its axis
            v, _ = read_stl(out / "stl" / f"{name}.stl")
            largest = 2 * float(np.hypot(v[:, 0], v[:, 1]).max())
            assert largest >= part.diameter - 1e-6
            # the mesh is within its 0.01 mm chord tolerance of the circle: lying, no
            # vertex need be at the very top
            assert h == pytest.approx(largest, abs=0.011), name
    sheet = (out / "print.csv").read_text()
    assert "lay,arbor,not printed: cut from stock rod" in sheet


@pytest.mark.cad
@pytest.mark.slow
def test_slicer_accepts_every_plate(built, tmp_path: Path) -> None:
    slicer = shutil.which("prusa-slicer")
    if slicer is None:
        pytest.skip("prusa-slicer is not installed")
    _, _, out = built
    w, h = BED
    for path in sorted((out / "bed").glob("bed-*.3mf")):
        gcode = tmp_path / (path.stem + ".gcode")
        run = subprocess.run(
            [slicer, "--export-gcode", "--bed-shape", f"0x0,{w:g}x0,{w:g}x{h:g},0x{h:g}",
             str(path), "--output", str(gcode)],
            capture_output=True, text=True, timeout=600,
        )  # fmt: skip
        assert run.returncode == 0, run.stdout + run.stderr
        assert gcode.stat().st_size > 1000


@pytest.mark.cad
@pytest.mark.slow
def test_fit_test_coupon_measured(built) -> None:
    design, parts, out = built
    plan = fit_test_plan(design, parts)
    c = design.process.clearance
    # derived: the design's clearance and two 0.05 mm steps either side of it
    assert plan.clearances == pytest.approx((c - 0.1, c - 0.05, c, c + 0.05, c + 0.1))
    assert plan.nominal == 3.0  # the most common arbor diameter of the design
    v, _ = read_stl(out / "stl" / "fit-test.stl")
    t = plan.thickness
    # a hole's wall is a prism side: its vertices are its rims, on the plate's faces
    inside_plate = v[v[:, 2] <= t + 1e-6]
    holes = [(plan.ref_x, plan.nominal), *zip(plan.xs, plan.hole_diameters)]
    for x, dia in holes:
        near = inside_plate[inside_plate[:, 1] < plan.plate_depth]
        r = np.hypot(near[:, 0] - x, near[:, 1] - plan.hole_y).min()
        assert 2 * r == pytest.approx(dia, abs=2e-3), (x, dia)
    pins = [(plan.ref_x, plan.nominal), *zip(plan.xs, plan.pin_diameters)]
    up = v[v[:, 2] > t + plan.relief + 0.1]
    for x, dia in pins:
        mine = up[np.hypot(up[:, 0] - x, up[:, 1] - plan.pin_y) < plan.nominal]
        assert len(mine) > 8
        r = np.hypot(mine[:, 0] - x, mine[:, 1] - plan.pin_y).max()
        assert 2 * r == pytest.approx(dia, abs=2e-3), (x, dia)
        assert mine[:, 2].max() == pytest.approx(t + plan.pin_length, abs=1e-6)
    # every label stands proud of both plates, under its hole or pin
    for y0 in (0.0, plan.pin_plate_y):
        for x in (plan.ref_x, *plan.xs):
            top = v[
                (np.abs(v[:, 0] - x) < plan.digit_height)
                & (v[:, 1] > y0 + 1.0)
                & (v[:, 1] < y0 + 3.0 + plan.digit_height)
            ]
            assert top[:, 2].max() == pytest.approx(t + plan.relief, abs=1e-6), (x, y0)
    assert plan.labels == ("10", "15", "20", "25", "30")


@pytest.mark.cad
@pytest.mark.slow
def test_printed_build_has_no_milling_words(built) -> None:
    _, _, out = built
    assert not (out / "cutting.csv").exists()
    words = re.compile(
        r"dividing|indexing|form cutter|turn from larger|end mill|hob |fly cutter",
        re.IGNORECASE,
    )
    for path in [out / "report.html", *out.glob("*.csv")]:
        found = words.findall(path.read_text(encoding="utf-8"))
        assert not found, (path.name, found)
    page = (out / "report.html").read_text(encoding="utf-8")
    assert "Print sheet" in page and "bed/bed-1.3mf" in page


def test_without_part_files_the_sheet_gives_orientations_only() -> None:
    from wheelgen.workshop.print_plan import print_layout

    design = loads_design(_design_text(), "w.toml")
    parts = plan_parts(design)
    layout = print_layout(design, parts, None)
    assert layout.plates == ()
    rows = {r.part: r for r in layout.rows}
    assert rows["week_wheel"].orientation == "flat" and rows["week_wheel"].bed is None
    assert "no STL written" in rows["week_wheel"].note
    assert rows["lay"].note == "cut to length from the stock rod"
    bought = [p.name for p in parts if p.kind in ("screw", "bearing", "bush")]
    assert bought and not set(bought) & set(rows)  # bought parts are not printed


def test_stock_rod_takes_only_its_outside() -> None:
    text = _design_text()
    design = loads_design(text, "w.toml")
    (rod,) = [s for s in design.stock if s.kind == "rod"]
    assert rod.outside == 3.0
    for extra, key in (("inside = 2.0\n", "inside"), ("width = 2.0\n", "width")):
        with pytest.raises(DesignError) as info:
            loads_design(text + extra, "w.toml")
        assert f"'{key}' on a rod" in str(info.value)
    tube = text.replace('kind = "rod"\n', "")  # a tube needs its inside
    with pytest.raises(DesignError) as info:
        loads_design(tube, "w.toml")
    assert "'inside' is missing" in str(info.value)


def test_a_part_larger_than_the_bed_is_a_warning() -> None:
    from wheelgen.checks import run_checks
    from wheelgen.checks.bed_check import flat_footprint

    path = DATA / "display" / "week_and_month.toml"
    text = path.read_text(encoding="utf-8")
    design = loads_design(text, "w.toml")
    plates = [p for p in plan_parts(design) if p.kind == "plate"]
    w, d = flat_footprint(plates[0])
    # derived: 200 mm less 5 mm at each edge is 190; the longer side exceeds it
    assert max(w, d) > 190
    found = [f for f in run_checks(design) if f.check == "process.bed"]
    assert {f.subject for f in found} == {f"plate {p.name}" for p in plates}
    assert all(f.level == "warning" and "200 x 200 mm" in f.message for f in found)
    assert "[process]" not in text
    big = text + "\n[process]\nbed = [250.0, 250.0]\n"
    assert not [
        f for f in run_checks(loads_design(big, "w.toml")) if f.check == "process.bed"
    ]


def test_fit_test_pins_stay_printable() -> None:
    from wheelgen.design.process_limits import PRINT_WALL_LINES

    text = _design_text().replace("clearance = 0.2\n", "clearance = 3.0\n")
    design = loads_design(text, "w.toml")
    plan = fit_test_plan(design, plan_parts(design))
    # derived: 3 mm arbors, 3.1 mm the largest clearance: pins would go through zero
    assert plan.nominal > 3.0
    assert min(plan.pin_diameters) >= PRINT_WALL_LINES * design.process.nozzle - 1e-9


def test_fit_test_labels_are_all_different_and_none_reads_zero() -> None:
    # derived: a clearance of 0.1016 mm (0.004 in) less two 0.05 mm steps is 0.0016 mm,
    # which would be labelled 0 like the plain hole and pin; that step is left out
    text = _design_text().replace("clearance = 0.2\n", "clearance = 0.1016\n")
    design = loads_design(text, "w.toml")
    plan = fit_test_plan(design, plan_parts(design))
    assert plan.labels == ("5", "10", "15", "20")
    assert len(set(plan.labels)) == len(plan.labels)
