"""Slot and pin sizes of a pin-and-slot coupling.

Values derived from the demo file and the sizing rules of wheelgen/layout/pinslot_geometry.py
(documented there; the 0.2 mm margin and the slot play are common practice, no source).
"""

from __future__ import annotations

import pytest
from _demo import demo_variant as _variant

from wheelgen.layout.part_kinds import Pose
from wheelgen.layout.pinslot_geometry import (
    MILL_SLOT_PLAY,
    SLOT_MARGIN,
    pin_boss,
    pin_part,
    slot_cut,
    slot_width,
)


def test_demo_slot_cut():
    d = _variant()
    p = d.pinslots[0]
    cut = slot_cut(d, p)
    # derived: r - e - margin and r + e + margin with r = 8, e = 0.8, margin = 0.2
    assert cut.inner == pytest.approx(8.0 - 0.8 - SLOT_MARGIN)
    assert cut.outer == pytest.approx(8.0 + 0.8 + SLOT_MARGIN)
    # mill, cutter 0.5 < pin 1.5: pin + play
    assert cut.width == pytest.approx(1.5 + MILL_SLOT_PLAY)
    assert cut.angle_deg == 0.0


def test_slot_width_per_process():
    # print: radial clearance 0.2 on each side -> 1.5 + 0.4
    d = _variant(
        ('process = "mill"', 'process = "print"'), ("cutter = 0.5 ", "clearance = 0.2 ")
    )
    assert slot_width(d, d.pinslots[0]) == pytest.approx(1.9)
    # mill with a cutter wider than the pin: never narrower than the cutter
    d = _variant(("cutter = 0.5 ", "cutter = 2.0 "))
    assert slot_width(d, d.pinslots[0]) == pytest.approx(2.0)
    d = _variant(
        ('process = "mill"', 'process = "hand"'), ("cutter = 0.5 ", "nozzle = 0.4 ")
    )
    assert slot_width(d, d.pinslots[0]) == pytest.approx(1.55)


def test_slot_follows_the_bearing():
    d = _variant(("bearing = 0.0\npin_diameter", "bearing = 135.0\npin_diameter"))
    p = d.pinslots[0]
    assert slot_cut(d, p).angle_deg == 135.0
    assert pin_boss(d, p).angle_deg == 135.0


def test_demo_pin_boss():
    d = _variant()
    boss = pin_boss(d, d.pinslots[0])
    # derived: moon_wheel front face at 9 + 2 = 11, moon_disc from 13 to 14.5
    assert boss.length == pytest.approx(2.0 + 1.5)
    assert boss.radius == 8.0 and boss.diameter == 1.5
    assert not boss.hole_only
    with pytest.raises(ValueError, match="not 'separate'"):
        pin_part(d, d.pinslots[0])


def test_separate_pin_part():
    d = _variant(("pin_diameter = 1.5", 'pin_diameter = 1.5\npin_part = "separate"'))
    p = d.pinslots[0]
    assert pin_boss(d, p).hole_only
    part = pin_part(d, p, Pose(x=10.0, y=-5.0, z=9.0, angle_deg=90.0))
    assert part.name == "moon_coupling_pin"
    # derived: through the pin wheel (2) + gap (2) + slot wheel (1.5)
    assert part.length == pytest.approx(5.5)
    # the pin at radius 8 along +X of the wheel, turned 90 degrees with it
    assert (part.placement.x, part.placement.y, part.placement.z) == pytest.approx(
        (10.0, 3.0, 9.0)
    )


def test_slot_wheel_behind_pin_wheel_raises():
    d = _variant(("teeth = 60\nheight = 13.0", "teeth = 60\nheight = 10.0"))
    with pytest.raises(ValueError, match="must sit in front"):
        pin_boss(d, d.pinslots[0])


def test_offset_not_below_radius_raises():
    d = _variant(("offset = 0.8", "offset = 8.0"))
    with pytest.raises(ValueError, match="'offset' must be smaller"):
        slot_cut(d, d.pinslots[0])
