"""1:1 SVG templates of flat parts: page in millimetres, scale bar, outline, marks.

The writer works from the numeric profile and needs no CAD kernel. The DXF writer's
tests are in test_export_dxf.py.
"""

from __future__ import annotations

import math
import re
import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pytest

from wheelgen.export.svg_template import SCALE_BAR_MM, write_svg
from wheelgen.layout.part_kinds import WheelPart
from wheelgen.layout.wheel_profile import plate_profile
from wheelgen.teeth.forms import outline_for
from wheelgen.teeth.spec import ToothSpec

ROOT = Path(__file__).resolve().parents[1]


def _profile(z=24, module=1.0, **kw):
    part = WheelPart("wheel_a", ToothSpec(z, module), 3.0, 4.0, **kw)
    return part, plate_profile(part, outline_for(part.tooth))


@pytest.fixture(scope="module")
def svg_root(tmp_path_factory):
    part, prof = _profile(z=40, module=1.5)
    path = write_svg(prof, tmp_path_factory.mktemp("svg") / "w.svg", part.name, 40, 1.5)
    again = write_svg(prof, path.with_name("again.svg"), part.name, 40, 1.5)
    assert path.read_bytes() == again.read_bytes()
    return prof, ET.fromstring(path.read_text())


NS = {"s": "http://www.w3.org/2000/svg"}


def test_svg_page_is_millimetres_one_unit_per_mm(svg_root):
    _, root = svg_root
    w, h = root.get("width"), root.get("height")
    assert w.endswith("mm") and h.endswith("mm")
    vb = [float(v) for v in root.get("viewBox").split()]
    assert vb[2] == pytest.approx(float(w[:-2])) and vb[3] == pytest.approx(
        float(h[:-2])
    )


def test_svg_scale_bar_is_50_mm_with_ticks(svg_root):
    _, root = svg_root
    bar = root.find(".//s:g[@id='scale-bar']", NS)
    lines = bar.findall("s:line", NS)
    main = lines[0]
    length = float(main.get("x2")) - float(main.get("x1"))
    assert length == SCALE_BAR_MM == 50.0
    ticks = sorted(float(t.get("x1")) for t in lines[1:])
    assert np.allclose(np.diff(ticks), 10.0) and len(ticks) == 6


def test_svg_outline_pitch_circle_and_labels(svg_root):
    prof, root = svg_root
    d = root.find(".//s:g[@id='outline']/s:path", NS).get("d")
    first = d.split("Z")[0]
    pts = np.array([[float(v) for v in p.split(",")] for p in first[1:].split()])
    r = np.hypot(pts[:, 0], pts[:, 1])
    # derived: tip radius m (z/2 + 1) = 31.5 mm, root radius m (z/2 - 1.25) = 28.125 mm
    assert r.max() == pytest.approx(31.5, abs=1e-4)
    assert r.min() == pytest.approx(28.125, abs=0.005)
    pitch = root.find("s:circle[@id='pitch']", NS)
    assert float(pitch.get("r")) == pytest.approx(30.0)  # derived: m z / 2
    text = " ".join(t.text for t in root.iter("{http://www.w3.org/2000/svg}text"))
    assert "wheel_a" in text and "teeth 40" in text and "module 1.5 mm" in text
    assert re.search(r"50 mm", text)
    cross = root.findall(".//s:g[@id='centre']/s:line", NS)
    assert len(cross) == 2
    assert math.isclose(float(cross[0].get("y1")), 0.0)


def test_svg_marks_a_pin_standing_on_the_face(tmp_path):
    # derived: a pin at (8, 0) mm of diameter 1.5 mm is drawn where it stands, y up on paper
    part, prof = _profile(z=40, module=1.5)
    path = write_svg(
        prof, tmp_path / "p.svg", part.name, 40, 1.5, pins=[(8.0, 3.0, 1.5)]
    )
    root = ET.fromstring(path.read_text())
    mark = root.find(".//s:g[@id='pins']/s:circle", NS)
    assert float(mark.get("cx")) == pytest.approx(8.0)
    assert float(mark.get("cy")) == pytest.approx(-3.0)  # SVG y runs down
    assert float(mark.get("r")) == pytest.approx(0.75)
    plain = write_svg(prof, tmp_path / "q.svg", part.name, 40, 1.5)
    assert ET.fromstring(plain.read_text()).find(".//s:g[@id='pins']", NS) is None
