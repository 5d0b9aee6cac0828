"""Drilling charts: hole positions, sizes and fits; the 1:1 SVG; the sheet writer."""

import csv
import io
import math
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest

from wheelgen.checks.findings import Finding
from wheelgen.design.loader import load_design
from wheelgen.layout import drilling_sheet_writer
from wheelgen.layout.drilling import drilling_csv, drilling_svg

DATA = Path(__file__).parent / "data" / "layout"
DEMO = Path(__file__).parent.parent / "designs" / "harbour_tide_clock.toml"


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
    # KHK / SDP D785 shifted pair: a = 56.4999 mm (check-values.md s6), printed to
    # 0.1 um; the chart must keep it to 1 um
    assert d == pytest.approx(56.4999, abs=1e-3)
    assert math.degrees(
        math.atan2(float(g["y_mm"]), float(g["x_mm"]))
    ) == pytest.approx(30.0, abs=1e-4)


def test_pivot_holes_carry_the_fit():
    design = load_design(DATA / "shifted_pair.toml")
    holes = {r["member"]: r for r in rows(design, "back")}
    # H7 at 5 mm (3-6 range): +12/0 um; at 6 mm (3-6, "up to and including"): +12/0
    # (ISO 286-2, check-values.md s7)
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


def test_svg_is_one_to_one_in_millimetres():
    design = load_design(DATA / "shifted_pair.toml")
    root = ET.fromstring(drilling_svg(design, "front"))
    w, h = root.get("width"), root.get("height")
    assert w.endswith("mm") and h.endswith("mm")
    box = [float(v) for v in root.get("viewBox").split()]
    assert box[2:] == pytest.approx([float(w[:-2]), float(h[:-2])])
    ns = "{http://www.w3.org/2000/svg}"
    circles = root.iter(f"{ns}circle")
    radii = sorted(float(c.get("r")) for c in circles)
    # holes 5 and 6 mm; pitch circles 18 and 36 mm (derived: m z / 2)
    assert radii == pytest.approx([2.5, 3.0, 18.0, 36.0])
    assert len(list(root.iter(f"{ns}line"))) >= 1


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


def test_layout_never_imports_the_cad_kernel():
    code = (
        "import sys, wheelgen.layout, wheelgen.layout.drilling;"
        "from wheelgen.design.loader import load_design;"
        f"wheelgen.layout.plan_parts(load_design({str(DEMO)!r}));"
        "assert 'cadquery' not in sys.modules, 'cadquery imported'"
    )
    subprocess.run([sys.executable, "-c", code], check=True)
