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
