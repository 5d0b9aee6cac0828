"""Wheels, arbors and sleeves that get in each other's way; meshing faces; plates."""

import math
from pathlib import Path

import pytest

from tests._demo import DEMO
from wheelgen.checks.engine import analyse
from wheelgen.checks.layout_checks import layout_findings
from wheelgen.design.loader import load_design, loads_design

DATA = Path(__file__).parent / "data" / "layout"

# Tip radii at m = 1, x = 0: r_a = m (z / 2 + h_a).
# Involute: ISO 21771:2007 d_a = d + 2 m (h_aP* + x) with h_aP* = 1 (ISO 53:1998 basic
# rack, docs/references.md section 8): 30 and 20 teeth give 16 + 11 = 27 mm.
# Triangular: the tooth is cut off by the tip circle 0.6 m above the pitch circle (the
# format's default addendum for triangular teeth), so 15.6 + 10.6 = 26.2 mm.
TIP_SUMS = {"involute": 16.0 + 11.0, "triangular": 15.6 + 10.6}


def pair(form: str, distance: float):
    text = (DATA / "pair.toml").read_text()
    design = loads_design(
        text.replace("FORM", form).replace("DISTANCE", repr(distance)), "p.toml"
    )
    return [
        f
        for f in layout_findings(design, analyse(design))
        if f.check.startswith("layout.")
    ]


@pytest.mark.parametrize("form", ["involute", "triangular"])
def test_wheels_0_1_mm_apart_pass(form):
    assert not [f for f in pair(form, TIP_SUMS[form] + 0.1) if f.level == "error"]


@pytest.mark.parametrize("form", ["involute", "triangular"])
def test_wheels_overlapping_by_0_1_mm_fail_naming_both(form):
    near = TIP_SUMS[form] - 0.1
    (f,) = [f for f in pair(form, near) if f.check == "layout.wheel_collision"]
    assert f.level == "error"
    assert f.subject == "wheel wa / wheel wb"
    assert float(f.measured.split()[0]) == pytest.approx(0.1, abs=2e-3)


def fixed(x: float, y: float):
    text = (DATA / "fixed_wheel.toml").read_text().replace("X, Y", f"{x!r}, {y!r}")
    design = loads_design(text, "f.toml")
    return [f for f in layout_findings(design, analyse(design)) if f.level == "error"]


def test_fixed_wheel_is_refined_by_its_outline():
    # a 1 mm arbor 13 mm from the axis of a fixed 12-tooth m 2 wheel (tip radius 14 mm,
    # root radius 9.5 mm, derived: m (z/2 + 1), m (z/2 - 1.25)); the tip circles overlap.
    # In the middle of a tooth space (15 deg, the tooth sits on +X) it is clear ...
    r = 13.0
    t = math.radians(15.0)
    assert fixed(r * math.cos(t), r * math.sin(t)) == []
    # ... on a tooth (0 deg) it cuts the wheel
    (f,) = fixed(r, 0.0)
    assert (
        f.check == "layout.cuts_arbor"
        and "wheel wf" in f.subject
        and "arbor x" in f.subject
    )


def test_meshing_faces_must_overlap_80_percent():
    text = (DATA / "pair.toml").read_text().replace("FORM", "involute")
    text = text.replace("DISTANCE", "25.0") + '\n[[mesh]]\npair = ["wa", "wb"]\n'
    ok = loads_design(text, "m.toml")
    assert not [
        f for f in layout_findings(ok, analyse(ok)) if f.check == "layout.face_overlap"
    ]
    # wb raised by 1 mm of its 3 mm face: 67 % overlap (derived: 2 / 3)
    low = loads_design(
        text.replace("height = 2.0\n\n[[mesh", "height = 3.0\n\n[[mesh"), "m.toml"
    )
    (f,) = [
        f
        for f in layout_findings(low, analyse(low))
        if f.check == "layout.face_overlap"
    ]
    assert f.measured == "67%" and f.level == "warning"


def test_wheel_outside_the_plates_is_an_error():
    text = (DATA / "pair.toml").read_text().replace("FORM", "involute")
    text = text.replace("DISTANCE", "40.0").replace(
        "height = 2.0\n\n[[wheel]]", "height = 18.0\n\n[[wheel]]"
    )
    design = loads_design(text, "o.toml")
    (f,) = [
        f
        for f in layout_findings(design, analyse(design))
        if f.check == "layout.outside_plates"
    ]
    assert f.subject == "wheel wa"


def test_demo_layout_findings_name_real_problems():
    design = load_design(DEMO)
    findings = layout_findings(design, analyse(design))
    assert not [
        f
        for f in findings
        if f.check in ("layout.loop", "layout.hidden_seat", "layout.sleeve_wall")
    ]


def planet(post_y: float):
    text = (DATA / "planet.toml").read_text().replace("POST_Y", repr(post_y))
    return loads_design(text, "planet.toml")


# The planet wheel (30 teeth, m 1, tip radius 16 mm, ISO 21771 as above) rides 25 mm
# from the centre, so it sweeps out to 41 mm (derived: 25 + 16); the post is 1 mm in
# radius. At carrier angle 0 the planet is on +X, far from a post on +Y: only the sweep
# finds the clash.
@pytest.mark.parametrize(("post_y", "depth"), [(42.5, None), (41.5, 0.5)])
def test_carried_wheel_sweeps_round_its_carrier(post_y, depth):
    design = planet(post_y)
    found = [
        f
        for f in layout_findings(design, analyse(design))
        if f.check == "layout.cuts_arbor"
    ]
    if depth is None:
        assert found == []
    else:
        (f,) = found
        assert "wheel planet_wheel" in f.subject and "arbor post" in f.subject
        assert float(f.measured.split()[0]) == pytest.approx(depth, abs=1e-3)


def test_carrier_wheel_gets_a_running_bore_for_the_carried_arbor():
    # the layout's own parts, before the arbors are finished as made (collars for end
    # shake lengthen them: tests/test_turning.py)
    from wheelgen.layout.train_parts import train_parts

    parts = {p.name: p for p in train_parts(planet(42.5))}
    # planet arbor 3 mm (default): hole in the middle of H7, 3.000..3.010 mm (ISO 286-2,
    # docs/references.md section 9), at the arbor's 'at' in the carrier's frame
    assert parts["carrier"].holes == ((25.0, 0.0, pytest.approx(3.005)),)
    assert parts["planet"].placement.z == pytest.approx(2.0)  # down through the carrier
    assert parts["planet"].length == pytest.approx(9.0)  # 2 .. 11
    assert parts["stud"].placement.z == pytest.approx(8.0)  # on through the front plate
