"""Drilling charts: hole positions, sizes and fits; the outline, pillar and mounting
holes; the 1:1 SVG with its check bar; the sheet writer."""

import csv
import dataclasses
import io
import math
import re
import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pytest

from tests._demo import DEMO, DEMO_TEXT
from wheelgen.design import DesignError
from wheelgen.design.loader import load_design, loads_design
from wheelgen.design.names import xml_text
from wheelgen.findings import Finding
from wheelgen.frame.plan import plan_frame
from wheelgen.workshop.drilling import drilling_csv, drilling_sheet_writer, drilling_svg

DATA = Path(__file__).parent / "data" / "layout"
NS = "{http://www.w3.org/2000/svg}"


def rows(design, plate):
    return list(csv.DictReader(io.StringIO(drilling_csv(design, plate))))


@pytest.mark.parametrize("plate", ["back", "front"])
def test_hole_distance_is_the_working_centre_distance(plate):
    design = load_design(DATA / "shifted_pair.toml")
    holes = {r["member"]: r for r in rows(design, plate)}
    p, g = holes["p"], holes["g"]
    # the datum is the drive arbor "p"
    assert (float(p["x_mm"]), float(p["y_mm"])) == (0.0, 0.0)
    d = math.hypot(float(g["x_mm"]), float(g["y_mm"]))
    # KHK / SDP D785 shifted pair: a = 56.4999 mm, printed to 0.1 um; the chart must
    # keep it to 1 um
    assert d == pytest.approx(56.4999, abs=1e-3)
    assert math.degrees(
        math.atan2(float(g["y_mm"]), float(g["x_mm"]))
    ) == pytest.approx(30.0, abs=1e-4)


def test_pivot_holes_carry_the_fit():
    design = load_design(DATA / "shifted_pair.toml")
    holes = {r["member"]: r for r in rows(design, "back")}
    # H7 at 5 mm (3-6 range): +12/0 um; at 6 mm (3-6, "up to and including"): +12/0
    # (ISO 286-2, table of hole limit deviations H7)
    assert holes["p"]["fit"] == "H7"
    assert (float(holes["p"]["low_mm"]), float(holes["p"]["high_mm"])) == (5.0, 5.012)
    assert (float(holes["g"]["low_mm"]), float(holes["g"]["high_mm"])) == (6.0, 6.012)
    assert holes["p"]["role"] == "pivot"


def test_demo_front_plate_holds_the_fixed_stud():
    design = load_design(DEMO)
    front = {r["member"]: r for r in rows(design, "front")}
    assert "stud" in front and front["stud"]["role"] == "held"
    assert "main" not in front  # main turns in the stud's bore there
    back = {r["member"]: r for r in rows(design, "back")}
    assert back["main"]["role"] == "pivot"


def test_chart_lists_pillar_and_mounting_holes_with_a_position_tolerance():
    design = load_design(DEMO)
    plan = plan_frame(design)
    for plate in ("back", "front"):
        chart = rows(design, plate)
        pillars = [r for r in chart if r["role"] == "pillar"]
        assert len(pillars) == len(plan.pillars) >= 3
        # a turned pillar's spigot (5 mm for M3) sits in an H7 hole: +12/0 um at 5 mm
        # (ISO 286-2, H7, over 3 up to 6 mm)
        assert {(r["diameter_mm"], r["fit"], r["high_mm"]) for r in pillars} == {
            ("5.0000", "H7", "5.0120")
        }
        mounting = [r for r in chart if r["role"] == "mounting"]
        cocks = [c for c in plan.cocks if c.plate == plate]
        assert len(mounting) == 2 * len(cocks) == 2
        # ISO 273 medium series clearance hole for M3: 3.4 mm
        assert {r["diameter_mm"] for r in mounting} == {"3.4000"}
        # derived: milled, the centre tolerance is 0.02 mm; each hole gets half
        assert {r["position_tolerance_mm"] for r in chart} == {"0.0100"}
        numbers = [int(r["hole"]) for r in chart]
        assert numbers == list(range(1, len(chart) + 1))


def _svg(design, plate):
    return ET.fromstring(drilling_svg(design, plate))


@pytest.mark.parametrize("plate", ["back", "front"])
def test_svg_is_one_to_one_with_outline_and_check_bar(plate):
    design = load_design(DEMO)
    root = _svg(design, plate)
    w, h = root.get("width"), root.get("height")
    assert w.endswith("mm") and h.endswith("mm")
    box = [float(v) for v in root.get("viewBox").split()]
    assert box[2:] == pytest.approx([float(w[:-2]), float(h[:-2])])
    bar = root.find(f"{NS}g[@id='{plate}-check-bar']")
    lengths = [
        abs(float(ln.get("x2")) - float(ln.get("x1"))) for ln in bar.iter(f"{NS}line")
    ]
    assert max(lengths) == pytest.approx(50.0)  # the 50 mm check bar, 1:1
    outline = root.find(f"{NS}path[@id='{plate}-outline']")
    pts = [
        tuple(map(float, p.split(",")))
        for p in re.findall(r"-?[\d.]+,-?[\d.]+", outline.get("d"))
    ]
    # the outline drawn is the plan's, shifted to the datum (the main arbor at 0, 0)
    xs, ys = [p[0] for p in pts], [p[1] for p in pts]
    loop = plan_frame(design).outline_loop(0.02)
    assert max(xs) - min(xs) == pytest.approx(float(np.ptp(loop[:, 0])), abs=1e-3)
    assert max(ys) - min(ys) == pytest.approx(float(np.ptp(loop[:, 1])), abs=1e-3)
    text = drilling_svg(design, plate)
    assert "\u00b10.010 mm" in text


@pytest.mark.parametrize("plate", ["back", "front"])
def test_mesh_lines_on_both_plates(plate):
    # every mesh between two axes fixed in the frame is drawn on both plates, even
    # where one of the axes does not pass that plate (moon: back only)
    design = load_design(DEMO)
    titles = [
        t.text
        for t in _svg(design, plate).iter(f"{NS}title")
        if t.text and "mesh" in t.text
    ]
    pairs = {t.split(":")[0] for t in titles}
    assert pairs == {
        "mesh day_wheel-lay_pinion",
        "mesh lay_wheel-hour_wheel",
        "mesh moon_driver-moon_lay_wheel",
        "mesh moon_lay_pinion-moon_wheel",
    }
    # the distance on the line is the working centre distance (72 mm, derived:
    # m (96 + 48) / 2)
    day = next(t for t in titles if t.startswith("mesh day_wheel"))
    assert day.endswith("72.0000 mm")


def test_control_characters_in_the_title_keep_the_svg_well_formed():
    # the loader refuses such a title; a script may still build a Design by hand
    hostile = DEMO_TEXT.replace('title = "Harbour', 'title = "\\u0007Harbour')
    with pytest.raises(DesignError, match="control character U\\+0007"):
        loads_design(hostile, "demo.toml")
    design = dataclasses.replace(
        loads_design(DEMO_TEXT, "demo.toml"),
        title="\x07Harbour\x01\x1b[31m <&> \"'\ufffe",
    )
    root = ET.fromstring(drilling_svg(design, "front"))  # raises if ill-formed
    assert "Harbour" in "".join(root.itertext())
    assert xml_text("a\x00b\x0bc\td") == "abc\td"  # XML 1.0 keeps tab, LF, CR only


def test_sheet_writer_writes_both_plates(tmp_path):
    design = load_design(DATA / "shifted_pair.toml")
    paths = drilling_sheet_writer(design, (), [], tmp_path)
    assert sorted(p.relative_to(tmp_path).as_posix() for p in paths) == [
        "drilling/back.csv",
        "drilling/back.svg",
        "drilling/front.csv",
        "drilling/front.svg",
    ]
    bad = [Finding("error", "x", "y", "z")]
    paths = drilling_sheet_writer(design, (), bad, tmp_path)
    assert "UNCHECKED" in (tmp_path / "drilling" / "front.csv").read_text()
