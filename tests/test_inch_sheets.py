"""Sheets and drawings added after the first inch work speak the design's units: the
sectional elevation's labels and scale, the assembly order's heights and end shake,
the print sheet and the triangular form cutter's drawing and columns.

Each inch figure is checked against the same figure of the design written in
millimetres (tests/data/inch_motion_work.toml and its twin inch_motion_work_mm.toml,
the same lengths; derived: 1 in = 25.4 mm exactly, the definition of the
international inch, 1959), to the places each sheet writes.
"""

from __future__ import annotations

import csv
import io
import re
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest

from wheelgen.design import load_design
from wheelgen.design.units import lengths_of
from wheelgen.parts import plan_parts
from wheelgen.workshop.assembly import assembly_csv
from wheelgen.workshop.elevation import elevation_svg

DATA = Path(__file__).parent / "data"
INCH = 25.4  # mm, exactly
NS = "{http://www.w3.org/2000/svg}"
NUMBER = re.compile(r"-?\d+\.\d+|-?\d+")


@pytest.fixture(scope="module")
def twins():
    inch = load_design(DATA / "inch_motion_work.toml")
    mm = load_design(DATA / "inch_motion_work_mm.toml")
    return (inch, plan_parts(inch)), (mm, plan_parts(mm))


def _texts(svg: str) -> list[str]:
    return [t.text or "" for t in ET.fromstring(svg).iter(f"{NS}text")]


def _labels(svg: str) -> dict[str, tuple[float, float]]:
    out = {}
    for text in _texts(svg):
        if "\u2013" in text:
            name, span = text.split("  ", 1)
            lo, hi = span.split(" \u2013 ")
            out[name] = (float(lo), float(hi))
    return out


def test_elevation_labels_and_scale_are_in_inches(twins):
    (inch, ip), (mm, mp) = twins
    a = elevation_svg(ip, lengths=lengths_of(inch))
    b = elevation_svg(mp, lengths=lengths_of(mm))
    la, lb = _labels(a), _labels(b)
    assert la.keys() == lb.keys() and la
    for name, (lo, hi) in la.items():
        # inches to 0.0001 in, millimetres to 0.01 mm
        assert lo * INCH == pytest.approx(lb[name][0], abs=0.005 + 0.00005 * INCH)
        assert hi * INCH == pytest.approx(lb[name][1], abs=0.005 + 0.00005 * INCH)
    assert "z (in)" in _texts(a) and "z (mm)" in _texts(b)
    # the inch scale is numbered every half inch: its numbers are 0.5 in apart,
    # 12.7 mm on the 1:1 page (derived: 0.5 x 25.4)
    root = ET.fromstring(a)
    ticks = {
        t.text: float(t.get("y"))
        for t in root.iter(f"{NS}text")
        if t.get("fill") == "#1f5f8b" and t.text and NUMBER.fullmatch(t.text)
    }
    assert {"0", "0.5", "1"} <= ticks.keys()
    assert ticks["0"] - ticks["0.5"] == pytest.approx(12.7, abs=1e-3)
    assert ticks["0"] - ticks["1"] == pytest.approx(25.4, abs=1e-3)


def test_the_built_elevation_says_inches(twins, tmp_path):
    from wheelgen.workshop.elevation import elevation_writer

    (inch, ip), _ = twins
    (path,) = elevation_writer(inch, ip, [], tmp_path)
    text = path.read_text(encoding="utf-8")
    assert "labelled in inches" in text and "z (in)" in text
    assert " mm<" not in text


def _steps(design, parts) -> list[dict[str, str]]:
    return list(csv.DictReader(io.StringIO(assembly_csv(design, parts))))


def test_assembly_heights_and_end_shake_are_in_inches(twins):
    (inch, ip), (mm, mp) = twins
    a, b = _steps(inch, ip), _steps(mm, mp)
    assert [(s["part"], s["action"]) for s in a] == [
        (s["part"], s["action"]) for s in b
    ]
    seen = 0
    for sa, sb in zip(a, b, strict=True):
        assert " mm" not in sa["note"]
        found_a = re.findall(r"(-?\d+\.\d+) in\b", sa["note"])
        found_b = re.findall(r"(-?\d+\.\d+) mm\b", sb["note"])
        assert len(found_a) == len(found_b), sa["note"]
        for x, y in zip(found_a, found_b):
            assert float(x) * INCH == pytest.approx(
                float(y), abs=0.005 + 0.00005 * INCH
            )
            seen += 1
    assert seen >= 6
    lay = next(s for s in a if s["part"] == "lay")
    # derived: the process's end shake, 0.1 mm in the mm twin, is 0.0039 in
    assert lay["note"].endswith("end shake 0.0039 in")
    pinion = next(s for s in a if s["part"] == "minute_wheel")
    assert re.search(r"back face \d\.\d{4} in from the back end of lay", pinion["note"])


# -- a printed design in inches ---------------------------------------------------

# The motion work printed: its [process] table in inches and, for the twin, the same
# sizes in mm (derived: x 25.4): a 1/64 in nozzle, 0.004 in clearance, a 6 x 4 in bed.
_PRINT_IN = 'nozzle = "1/64 in"\nclearance = "0.004 in"\nbed = ["6 in", "4 in"]\n'
_PRINT_MM = "nozzle = 0.396875\nclearance = 0.1016\nbed = [152.4, 101.6]\n"


def _printed(name: str, process: str):
    from wheelgen.design import loads_design

    text = (DATA / name).read_text(encoding="utf-8")
    text = text.replace('process = "mill"', 'process = "print"')
    text = re.sub(r"\[process\]\n(.*\n)*?\n", f"[process]\n{process}\n", text, count=1)
    design = loads_design(text, name)
    assert design.process.kind == "print"
    return design, plan_parts(design)


def _box_stl(path: Path, w: float, d: float, h: float) -> None:
    """A w x d x h mm box as a binary STL (12 triangles), the print sheet's input."""
    import numpy as np

    from wheelgen.workshop.stl_file import STL_DTYPE

    c = np.array(
        [[x, y, z] for x in (0, w) for y in (0, d) for z in (0, h)], dtype=float
    )
    faces = [(0, 1, 3), (0, 3, 2), (4, 6, 7), (4, 7, 5), (0, 4, 5), (0, 5, 1),
             (2, 3, 7), (2, 7, 6), (0, 2, 6), (0, 6, 4), (1, 5, 7), (1, 7, 3)]  # fmt: skip
    rec = np.zeros(len(faces), dtype=STL_DTYPE)
    rec["v"] = c[np.array(faces)]
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_bytes(b"\0" * 80 + np.uint32(len(faces)).tobytes() + rec.tobytes())


@pytest.fixture(scope="module")
def printed(tmp_path_factory):
    from wheelgen.workshop.print_plan import print_layout
    from wheelgen.workshop.print_plan import printed as is_printed

    out = []
    for name, process in (
        ("inch_motion_work.toml", _PRINT_IN),
        ("inch_motion_work_mm.toml", _PRINT_MM),
    ):
        design, parts = _printed(name, process)
        folder = tmp_path_factory.mktemp("print")
        for k, p in enumerate(x for x in parts if is_printed(x)):
            # boxes of our own sizes (mm), the hour wheel wider than the 6 in bed
            w = 160.0 if p.name == "hour_wheel" else 10.0 + 3.0 * k
            _box_stl(folder / "stl" / f"{p.name}.stl", w, 8.0 + k, 2.0 + 0.5 * k)
        out.append((design, parts, print_layout(design, parts, folder)))
    return out


def test_the_print_sheet_is_in_inches(printed):
    from wheelgen.workshop.print_plan import print_csv

    (inch, _, li), (mm, _, lm) = printed
    a = list(csv.DictReader(io.StringIO(print_csv(li.rows, lengths_of(inch)))))
    b = list(csv.DictReader(io.StringIO(print_csv(lm.rows, lengths_of(mm)))))
    assert list(a[0]) == [
        "part", "kind", "orientation", "bed", "x_in", "y_in", "width_in", "depth_in",
        "height_in", "note",
    ]  # fmt: skip
    assert [r["part"] for r in a] == [r["part"] for r in b]
    placed = 0
    for ra, rb in zip(a, b, strict=True):
        assert ra["bed"] == rb["bed"]
        for key in ("x", "y", "width", "depth", "height"):
            if rb[f"{key}_mm"]:
                va, vb = float(ra[f"{key}_in"]), float(rb[f"{key}_mm"])
                assert va * INCH == pytest.approx(vb, abs=0.005 + 0.00005 * INCH)
                assert len(ra[f"{key}_in"].split(".")[1]) == 4  # to 0.0001 in
                placed += 1
    assert placed > 20
    first = next(r for r in a if r["bed"] == "1")
    assert first["x_in"] == "0.1969"  # derived: the 5 mm spacing from the edge
    hour = next(r for r in a if r["part"] == "hour_wheel")
    assert hour["note"] == "larger than the 6 x 4 in plate: on no plate"
    assert hour["width_in"] == "6.2992"  # derived: 160 / 25.4


def test_the_report_print_section_is_in_inches(printed):
    from wheelgen.workshop.report import _print_sheet

    (inch, parts, layout), (mm, mparts, mlayout) = printed
    html = _print_sheet(inch, parts, layout)
    assert "(mm)" not in html.replace("radial clearance (mm)", "")
    assert "height (in)" in html and "hole \u00d8 (in)" in html
    assert "6 \u00d7 4 in" in html and "0.1969 in apart" in html
    # the coupon's labels stay hundredths of a millimetre; the table says so and
    # gives the inch figure: 0.004 in = 0.1016 mm, label 10 (derived)
    assert "label (0.01 mm)" in html
    assert "0.0040 in (0.10 mm)" in html and "label 10)" in html
    metric = _print_sheet(mm, mparts, mlayout)
    assert "(in)" not in metric and "152.4 \u00d7 101.6 mm" in metric


# -- triangular teeth: the form cutter ----------------------------------------------


@pytest.fixture(scope="module")
def triangular():
    """The motion work with its first pair cut as triangular teeth (32 DP)."""
    from wheelgen.design import loads_design

    text = (DATA / "inch_motion_work.toml").read_text(encoding="utf-8")
    for wheel in ("cannon_pinion", "minute_wheel"):
        old = f'name = "{wheel}"\n'
        text = text.replace(old, old + 'form = "triangular"\n')
    design = loads_design(text, "triangular.toml")
    return design, plan_parts(design)


def test_the_cutting_sheets_cutter_and_feed_columns_are_in_inches(triangular):
    from wheelgen.workshop.cutting import cutting_csv, cutting_rows

    design, parts = triangular
    rows = cutting_rows(parts)
    text = cutting_csv(rows, lengths_of(design))
    sheet = {r["wheel"]: r for r in csv.DictReader(io.StringIO(text))}
    assert "_mm" not in text.splitlines()[0]
    for row in rows:
        got = sheet[row.wheel]
        assert float(got["infeed_in"]) == pytest.approx(row.infeed / INCH, abs=5e-5)
        assert float(got["thinning_in"]) == pytest.approx(row.thinning / INCH, abs=5e-5)
        if row.cutter is None:
            assert got["cutter_tip_width_in"] == ""
            continue
        for key, mm in (
            ("cutter_tip_width_in", row.cutter.tip_width),
            ("cutter_tip_radius_in", row.cutter.tip_radius),
            ("cutter_shoulder_radius_in", row.cutter.shoulder_radius),
        ):
            assert float(got[key]) == pytest.approx(mm / INCH, abs=5e-5)
            assert len(got[key].split(".")[1]) == 4


def test_the_form_cutter_drawing_is_in_inches_at_true_size(triangular):
    from wheelgen.workshop.cutter_drawing import cutter_svg
    from wheelgen.workshop.cutting import cutting_rows

    design, parts = triangular
    spec = next(p.tooth for p in parts if p.name == "minute_wheel")
    row = next(r for r in cutting_rows(parts) if r.wheel == "minute_wheel")
    cut = row.cutter
    assert cut is not None
    inch = cutter_svg("minute_wheel", spec, cut, lengths_of(design))
    metric = cutter_svg("minute_wheel", spec, cut)
    # the same profile on the same page: the drawing stays 1:1 in mm
    profile = re.compile(r'<polygon id="minute_wheel-profile-1to1" points="[^"]*"')
    assert profile.search(inch).group(0) == profile.search(metric).group(0)
    texts = " ".join(_texts(inch))
    assert "32 diametral pitch" in texts and " mm" not in texts
    assert "the check bar must measure 1/2 in" in texts
    # every size of the metric drawing is there in inches (to the places each writes)
    metric_texts = re.sub(r"module [\d.]+ mm", "", " ".join(_texts(metric)))
    mm_sizes = [float(x) for x in re.findall(r"(\d+\.\d+) mm", metric_texts)]
    in_sizes = [float(x) for x in re.findall(r"(\d+\.\d+) in\b", texts)]
    assert len(mm_sizes) == len(in_sizes) >= 8
    for a, b in zip(in_sizes, mm_sizes):
        assert a * INCH == pytest.approx(b, abs=0.005 + 0.00005 * INCH)
    # the 1/2 in check bar is 12.7 mm long on the page (derived: 25.4 / 2)
    bar = ET.fromstring(inch).find(f".//{NS}g[@id='minute_wheel-check-bar']")
    first = bar.find(f"{NS}line")
    assert float(first.get("x2")) - float(first.get("x1")) == pytest.approx(12.7)


def test_the_build_writes_the_cutter_drawing_in_inches(triangular, tmp_path):
    from wheelgen.workshop.cutting import cutting_sheet_writer

    design, parts = triangular
    written = cutting_sheet_writer(design, parts, [], tmp_path)
    drawing = tmp_path / "cutters" / "cannon_pinion.svg"
    assert drawing in written
    text = drawing.read_text(encoding="utf-8")
    assert "32 diametral pitch" in text and "1/2 in" in text
