"""DXF and 1:1 SVG of flat parts: layers, exact geometry, scale, same bytes every run.

These writers work from the numeric profile and need no CAD kernel.
"""

from __future__ import annotations

import math
import re
import subprocess
import sys
import textwrap
import xml.etree.ElementTree as ET
from pathlib import Path

import ezdxf
import numpy as np
import pytest

from wheelgen.export.dxf import write_dxf
from wheelgen.export.svg_template import SCALE_BAR_MM, write_svg
from wheelgen.layout.part_plan import WheelPart
from wheelgen.layout.wheel_profile import plate_profile
from wheelgen.teeth.spec import ToothSpec, outline_for

ROOT = Path(__file__).resolve().parents[1]


def _profile(z=24, module=1.0, **kw):
    part = WheelPart("wheel_a", ToothSpec(z, module), 3.0, 4.0, **kw)
    return part, plate_profile(part, outline_for(part.tooth))


@pytest.fixture(scope="module")
def dxf_doc(tmp_path_factory):
    part, prof = _profile(spokes=4, rim=2.0, round_radius=0.5)
    path = write_dxf(prof, tmp_path_factory.mktemp("dxf") / "w.dxf", part.name)
    return prof, ezdxf.readfile(path)


def test_dxf_layers_hold_outline_bore_holes_and_centre(dxf_doc):
    prof, doc = dxf_doc
    assert doc.header["$INSUNITS"] == 4  # millimetres
    msp = doc.modelspace()
    by_layer: dict[str, list] = {}
    for e in msp:
        by_layer.setdefault(e.dxf.layer, []).append(e)
    assert set(by_layer) == {"OUTLINE", "BORE", "HOLES", "CENTRE"}
    assert len(by_layer["OUTLINE"]) == 24 * len(prof.outline.tooth)
    (bore,) = by_layer["BORE"]
    assert bore.dxftype() == "CIRCLE" and bore.dxf.radius == pytest.approx(2.0)
    assert [e.dxftype() for e in by_layer["CENTRE"]] == ["LINE", "LINE"]
    # four windows, each closed: every end point meets another start point
    holes = by_layer["HOLES"]
    assert len(holes) == 4 * len(prof.holes[1].segments)


def test_dxf_flanks_are_splines_through_the_exact_points(dxf_doc):
    prof, doc = dxf_doc
    splines = doc.modelspace().query("SPLINE")
    exact = [s.points for s in prof.outline.segments() if s.kind == "spline"]
    assert len(splines) == len(exact)
    for sp, pts in zip(splines, exact):
        fit = np.array([tuple(p)[:2] for p in sp.fit_points])
        assert np.abs(fit - pts).max() < 1e-12


def test_dxf_arcs_have_the_tip_and_root_radii(dxf_doc):
    prof, doc = dxf_doc
    radii = {
        round(a.dxf.radius, 9) for a in doc.modelspace().query('ARC[layer=="OUTLINE"]')
    }
    # derived: tip radius m z / 2 + m = 13 mm (ISO 53 addendum 1 m)
    assert 13.0 in radii
    for arc in doc.modelspace().query('ARC[layer=="OUTLINE"]'):
        # every outline arc runs counter-clockwise from start to end, < 180 deg
        span = (arc.dxf.end_angle - arc.dxf.start_angle) % 360
        assert 0 < span < 180


_SCRIPT = textwrap.dedent(
    """
    import sys
    from pathlib import Path
    from wheelgen.export.dxf import write_dxf
    from wheelgen.layout.part_plan import WheelPart
    from wheelgen.layout.wheel_profile import plate_profile
    from wheelgen.teeth.spec import ToothSpec, outline_for
    part = WheelPart("w", ToothSpec(30, 1.0), 3.0, 4.0, spokes=5, rim=2.0, round_radius=0.5)
    write_dxf(plate_profile(part, outline_for(part.tooth)), Path(sys.argv[1]), "w")
    """
)


def test_dxf_bytes_identical_across_processes_and_hash_seeds(tmp_path):
    outs = []
    for seed in ("0", "123", "random"):
        out = tmp_path / f"{seed}.dxf"
        env = {"PYTHONHASHSEED": seed, "PATH": "/usr/bin:/bin", "PYTHONPATH": str(ROOT)}
        subprocess.run([sys.executable, "-c", _SCRIPT, str(out)], check=True, env=env)
        outs.append(out.read_bytes())
    assert outs[0] == outs[1] == outs[2]


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
