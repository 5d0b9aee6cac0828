"""A coupling pin sweeps a ring about its wheel's axis: wheels and arbors must clear it."""

from pathlib import Path

import pytest

from tests._demo import DEMO
from wheelgen.checks.engine import analyse
from wheelgen.checks.layout_checks import layout_findings
from wheelgen.design.loader import load_design, loads_design
from wheelgen.layout import plan_layout
from wheelgen.layout.collisions import pin_sweeps

DATA = Path(__file__).parent / "data" / "layout"

# pin_third_wheel.toml: pin radius 8 mm, pin diameter 2 mm, so the pin sweeps radii 7 to
# 9 mm about arbor "p" (derived: r -/+ d/2). The third wheel "wt" has 30 teeth, m 1, x =
# 0: tip radius 16 mm (ISO 21771:2007 d_a = d + 2 m (h_aP* + x), h_aP* = 1 from the ISO
# 53 basic rack, docs/references.md section 8). It touches the ring when its axis stands
# 9 + 16 = 25 mm from "p" (derived: outer ring radius + tip radius).
RING_OUTER = 9.0
THIRD_TIP = 16.0
TOUCH = RING_OUTER + THIRD_TIP


def _layout_errors(design, check=None):
    return [
        f
        for f in layout_findings(design, analyse(design))
        if f.level == "error"
        and f.check.startswith("layout.")
        and (check is None or f.check == check)
    ]


def third(
    distance: float,
    extra: str = "",
    height: float = 5.5,
    along: str = "-y",
    fixed: bool = False,
):
    """pin_third_wheel.toml with "t" ``distance`` mm from "p" towards -Y or -X."""
    text = (DATA / "pin_third_wheel.toml").read_text()
    at = [0.0, -distance] if along == "-y" else [-distance, 0.0]
    text = text.replace("THIRD_AT", repr(at))
    text = text.replace("height = 5.5", f"height = {height!r}")
    if fixed:
        text = text.replace('name = "t"\n', 'name = "t"\nfixed = true\n')
    return loads_design(text + extra, "pin_third_wheel.toml")


def test_demo_pin_sweep_and_no_errors():
    design = load_design(DEMO)
    (sweep,) = pin_sweeps(plan_layout(design))
    # derived: pin radius 8, diameter 1.5 -> 7.25 to 8.75 mm; moon_wheel's front face
    # 9 + 2 = 11 mm, moon_disc's front face 13 + 1.5 = 14.5 mm (the pin's end)
    assert (sweep.inner, sweep.outer) == pytest.approx((7.25, 8.75))
    assert (sweep.z0, sweep.z1) == pytest.approx((11.0, 14.5))
    assert _layout_errors(design) == []


def test_third_wheel_in_the_pin_path_fails_naming_both():
    # axis 0.1 mm closer than touching: overlap 0.1 mm (derived: TOUCH - 24.9)
    (f,) = _layout_errors(third(TOUCH - 0.1), "layout.pin_collision")
    assert f.subject == "pin of cp / wheel wt"
    assert '"cp"' in f.message and "wheel wt" in f.message
    # the outline's polyline (0.002 mm chords) may sit a hair inside the tip circle
    assert float(f.measured.split()[0]) == pytest.approx(0.1, abs=2e-3)
    # heights: wt spans 5.5 to 7 mm, inside the pin's 5 to 10 mm (derived: wp's front
    # face 2 + 3, ws's front face 8 + 2)
    assert "between heights 5.5 and 7 mm" in f.message


def test_third_wheel_0_1_mm_clear_passes():
    assert _layout_errors(third(TOUCH + 0.1)) == []


def test_third_wheel_in_front_of_the_pin_end_passes():
    # the pin ends at ws's front face, 10 mm; wt from 10.5 to 12 mm is clear of it
    assert _layout_errors(third(TOUCH - 0.1, height=10.5)) == []


ARBOR_X = """
[[arbor]]
name = "x"
at = [0.0, 9.5]
diameter = 2.0
"""


def test_arbor_through_the_ring_fails_naming_both():
    errors = _layout_errors(third(TOUCH + 0.1, ARBOR_X), "layout.pin_collision")
    (f,) = errors
    assert f.subject == "pin of cp / arbor x"
    # derived: arbor x spans 9.5 - 1 = 8.5 to 10.5 mm from "p"; the ring ends at 9 mm,
    # so it reaches 9 - 8.5 = 0.5 mm in
    assert float(f.measured.split()[0]) == pytest.approx(0.5, abs=1e-9)


def slot_arbor(diameter: float):
    text = (DATA / "pin_slot_arbor.toml").read_text()
    return loads_design(
        text.replace("SLOT_ARBOR", repr(diameter)), "pin_slot_arbor.toml"
    )


def test_pin_must_clear_the_slot_wheels_arbor():
    # The slot wheel's arbor carries it inside the pin's heights (8 to 10 mm of 5 to
    # 10 mm), so only the radial room keeps them apart: the arbor reaches offset + D/2
    # from the pin's axis, the ring starts at r - d/2 = 7 mm (derived).
    assert _layout_errors(slot_arbor(8.0), "layout.pin_collision") == []  # 3 + 4 = 7
    (f,) = _layout_errors(slot_arbor(9.0), "layout.pin_collision")
    assert f.subject == "pin of cp / arbor s"
    assert float(f.measured.split()[0]) == pytest.approx(0.5, abs=1e-9)  # 7.5 - 7


def test_still_wheel_is_refined_by_its_outline():
    # Held still, "wt" keeps its outline at angle 0: a tooth centred on +X, one every
    # 12 deg (derived: 360 / 30), so +Y, 7.5 pitches on, is the middle of a tooth space.
    # With its axis 24 mm from "p" the tip circle reaches 1 mm into the ring
    # (derived: 9 - (24 - 16)).
    # From -X the pin's axis lies on +X from "t": the tooth there reaches the full 1 mm.
    (f,) = _layout_errors(third(24.0, along="-x", fixed=True), "layout.pin_collision")
    assert float(f.measured.split()[0]) == pytest.approx(1.0, abs=2e-3)
    # From -Y it lies on +Y, a tooth space: less deep than the tip circle, but the tip
    # corners beside the space stand less than half a pitch (6 deg) off the centre
    # line, so within sqrt(24^2 + 16^2 - 2 * 24 * 16 * cos 6 deg) = 8.259 mm of "p":
    # deeper than 9 - 8.259 = 0.741 mm (derived: law of cosines)
    (f,) = _layout_errors(third(24.0, fixed=True), "layout.pin_collision")
    assert 0.741 < float(f.measured.split()[0]) < 0.99
    # turning, it sweeps its whole tip circle whichever way it stands
    (f,) = _layout_errors(third(24.0), "layout.pin_collision")
    assert float(f.measured.split()[0]) == pytest.approx(1.0, abs=2e-3)


def carried(radius: float):
    text = (DATA / "pin_carried.toml").read_text()
    text = text.replace("CARRIED_AT", repr([radius, 0.0]))
    return loads_design(text, "pin_carried.toml")


def test_carried_wheel_sweeps_past_the_pin():
    # "t" circles "c" (50 mm from "p") at `radius`: nearest 50 - radius to "p", so "wt"
    # (tip radius 16 mm) touches the ring (outer radius 9 mm) at radius 50 - 25 = 25 mm
    # (derived), although at carrier angle 0 it stands sqrt(25^2 + 50^2) = 55.9 mm away.
    (f,) = _layout_errors(carried(25.1), "layout.pin_collision")
    assert f.subject == "pin of cp / wheel wt"
    assert float(f.measured.split()[0]) == pytest.approx(0.1, abs=2e-3)
    assert _layout_errors(carried(24.9)) == []


def test_coupled_axes_are_held_by_one_plate_each_whatever_the_offset():
    # derived: with 3 mm arbors 3 mm apart (more than the 3 mm sum of their radii) the
    # pin wheel still reaches across the slot wheel's axis, so neither shaft may run
    # plate to plate: each is held by one plate and neither cuts the other's wheel
    design = slot_arbor(3.0)
    found = layout_findings(design, analyse(design))
    split = plan_layout(design).stacking.one_plate
    assert {arbor for arbor, _, _ in split} == {"p", "s"}
    assert [f for f in found if f.check == "layout.cuts_arbor"] == []
