"""Shafts and what they pass through: a carrier wheel is bored for each arbor it carries.

The bore is the arbor's running bore (the process's fit), at the arbor's ``at`` in the
carrier's frame; spokes are turned so that an arm carries it, and a hole without a wall
of wheel round it is refused with the reason. Bores are opened by the running fit and
their sizes are on the cutting sheet and the bill of parts.
"""

from __future__ import annotations

import csv
import io
import math
from pathlib import Path

from tests._demo import DEMO_TEXT, demo_text
from wheelgen.checks import run_checks
from wheelgen.design import load_design, loads_design
from wheelgen.layout.part_kinds import WheelPart
from wheelgen.layout.wheel_profile import plate_profile
from wheelgen.parts import plan_parts
from wheelgen.teeth.forms import outline_for
from wheelgen.workshop.cutting import cutting_csv, cutting_rows
from wheelgen.workshop.parts_bill import bill_rows, parts_csv

EPICYCLIC = Path(__file__).parent / "data" / "layout" / "epicyclic_nested.toml"


def _wheel(design, name: str) -> WheelPart:
    (part,) = [p for p in plan_parts(design) if p.name == name]
    assert isinstance(part, WheelPart)
    return part


def test_the_demo_carrier_wheel_has_a_bore_for_the_planet():
    part = _wheel(loads_design(DEMO_TEXT, "demo.toml"), "hour_wheel")
    profile = plate_profile(part, outline_for(part.tooth))
    holes = [h for h in profile.holes if h.role == "arbor_hole"]
    assert len(holes) == 1 and holes[0].circle is not None
    x, y, r = holes[0].circle
    # derived: the planet rides 30.8 mm from the carrier's axis
    assert abs(math.hypot(x, y) - 30.8) < 1e-9
    # the running bore of the 2 mm planet arbor, H7: 2.000 to 2.010 mm (ISO 286-1:2010,
    # Table 1, IT7 over 1 up to 3 mm = 10 um)
    assert 2.000 < 2 * r < 2.010


def test_spokes_are_turned_so_that_an_arm_carries_the_planet():
    design = load_design(EPICYCLIC)
    part = _wheel(design, "carrier_wheel")
    ((x, y, _),) = part.holes
    assert math.isclose(
        part.spoke_angle_deg, math.degrees(math.atan2(y, x)), abs_tol=1e-9
    )
    assert not [f for f in run_checks(design) if f.check == "layout.carrier_hole"]


def _hole_findings(text: str):
    found = run_checks(loads_design(text, "demo.toml"))
    return [f for f in found if f.check == "layout.carrier_hole"]


SPOKED = (
    'name = "hour_wheel"\narbor = "hours"\nteeth = 72\nheight = 16.0',
    'name = "hour_wheel"\narbor = "hours"\nteeth = 72\nheight = 16.0\nspokes = 5\n'
    "rim = RIM",
)


def test_an_arm_too_narrow_for_the_hole_is_refused_with_the_reason():
    # derived: a 3 mm arm holds a 2.005 mm bore with 0.5 mm each side (>= 0.3 mm);
    # a 2 mm arm leaves nothing
    assert _hole_findings(demo_text((SPOKED[0], SPOKED[1].replace("RIM", "3.0")))) == []
    (found,) = _hole_findings(demo_text((SPOKED[0], SPOKED[1].replace("RIM", "2.0"))))
    assert found.level == "error"
    assert '"hour_wheel"' in found.message and '"planet"' in found.message
    assert "too narrow" in found.message


def test_a_hole_off_every_arm_is_refused():
    # a second planet a fifth of a turn and a bit round: no arm of five carries both
    text = demo_text(
        (SPOKED[0], SPOKED[1].replace("RIM", "3.0")),
        (
            'name = "moon_lay"',
            'name = "planet2"\ncarrier = "hour_wheel"\nat = [0.0, 30.8]\n'
            'diameter = 2.0\n\n[[arbor]]\nname = "moon_lay"',
        ),
    )
    found = _hole_findings(text)
    assert [f.subject for f in found] == ["wheel hour_wheel / arbor planet2"]
    assert "no arm" in found[0].message


def test_bores_are_opened_and_listed_on_the_sheets():
    design = loads_design(DEMO_TEXT, "demo.toml")
    parts = plan_parts(design)
    cutting = {
        r["wheel"]: r
        for r in csv.DictReader(io.StringIO(cutting_csv(cutting_rows(parts))))
    }
    bill = {
        r["part"]: r
        for r in csv.DictReader(io.StringIO(parts_csv(bill_rows(design, parts))))
    }
    # a 3 mm arbor, H7: 3.000 to 3.010 mm (ISO 286-1:2010, Table 1, IT7 up to 3 mm =
    # 10 um; EI = 0 for H): the bore is opened, not 3.000
    assert cutting["day_wheel"]["bore_mm"] == "3.005"
    assert cutting["day_wheel"]["bore_fit"] == "H7/g6 on 3 mm: 3.000 to 3.010 mm"
    assert bill["day_wheel"]["bore_mm"] == "3.005"
    assert cutting["hour_wheel"]["arbor_holes_mm"].startswith("2.005 at (")
    assert "for a carried arbor" in bill["hour_wheel"]["note"]
    # a printed wheel's bore is opened by twice the radial clearance
    printed = loads_design(
        demo_text(
            ('process = "mill"', 'process = "print"'),
            ('fit = "H7/g6"           # running fit of bores on arbors and tubes', ""),
        ),
        "print.toml",
    )
    day = _wheel(printed, "day_wheel")
    assert abs(day.bore - (3.0 + 2 * 0.2)) < 1e-9
