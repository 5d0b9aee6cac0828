"""Checks of pin-and-slot couplings.

Truth: the pin centre's travel r - e .. r + e (derived, law of cosines); the transmission
angle 90 - asin(e / r) (derived; asin(e / r) is the lever's extreme angle of
firgelliauto.com, "Whitworth quick-return mechanism", docs/references.md section 13);
the 30 degree limit is common practice, no source.
"""

from __future__ import annotations

import math

import pytest
from _demo import demo_variant as _variant

from wheelgen.checks.pinslot_checks import (
    pinslot_findings,
    slot_travel_findings,
    wheel_root_radius,
)
from wheelgen.layout.part_kinds import SlotCut


def _ids(findings, level=None):
    return [f.check for f in findings if level is None or f.level == level]


def test_demo_passes():
    d = _variant()
    assert pinslot_findings(d, None) == []


@pytest.mark.parametrize("end", ["inner", "outer"])
def test_slot_0_1_mm_too_short_fails(end):
    d = _variant()
    p = d.pinslots[0]  # r = 8, e = 0.8: the pin centre travels 7.2 .. 8.8 mm
    inner, outer = 8.0 - 0.8, 8.0 + 0.8
    exact = SlotCut(inner=inner, outer=outer, width=1.52)
    assert slot_travel_findings(p, exact) == []
    short = SlotCut(
        inner=inner + (0.1 if end == "inner" else 0.0),
        outer=outer - (0.1 if end == "outer" else 0.0),
        width=1.52,
    )
    found = slot_travel_findings(p, short)
    assert _ids(found, "error") == ["pinslot.travel"]
    assert end in found[0].message
    assert "0.100 mm" in found[0].message


def test_slot_narrower_than_pin_fails():
    d = _variant()
    found = slot_travel_findings(d.pinslots[0], SlotCut(7.0, 9.0, width=1.4))
    assert _ids(found, "error") == ["pinslot.width"]


def test_offset_not_below_radius_is_an_error():
    d = _variant(("offset = 0.8", "offset = 8.0"))
    found = pinslot_findings(d, None)
    assert _ids(found) == ["pinslot.offset"]
    assert found[0].level == "error"


def test_transmission_angle_warning_threshold():
    # asin(0.9) = 64.16 deg -> 25.8 deg < 30: warning; asin(0.8) = 53.13 -> 36.9: none
    warn = _variant(("radius = 8.0\noffset = 0.8", "radius = 10.0\noffset = 9.0"))
    found = [
        f for f in pinslot_findings(warn, None) if f.check == "pinslot.transmission"
    ]
    assert len(found) == 1 and found[0].level == "warning"
    assert (
        found[0].measured
        == f"{90 - math.degrees(math.asin(0.9)):.1f} deg"
        == "25.8 deg"
    )
    ok = _variant(("radius = 8.0\noffset = 0.8", "radius = 10.0\noffset = 8.0"))
    assert "pinslot.transmission" not in _ids(pinslot_findings(ok, None))


def test_slot_into_the_teeth_fails():
    # moon_disc: 60 teeth, m = 0.8 -> root about 23 mm; r + e + margin + w/2 = 22 + 1 + 0.2 + 0.76
    d = _variant(("radius = 8.0\noffset = 0.8", "radius = 22.0\noffset = 1.0"))
    found = pinslot_findings(d, None)
    slot_errors = [
        f for f in found if f.check == "pinslot.slot_fit" and f.level == "error"
    ]
    assert len(slot_errors) == 1 and "teeth" in slot_errors[0].message


def test_slot_into_the_bore_fails():
    # derived, r = 2.0, e = 0.3, bore 2 mm, wall 0.3: slot's inner edge
    # 2.0 - 0.3 - 0.2 - 0.76 = 0.74 mm and pin's inner edge 2.0 - 0.75 = 1.25 mm, both < 1.3
    d = _variant(("radius = 8.0\noffset = 0.8", "radius = 2.0\noffset = 0.3"))
    found = pinslot_findings(d, None)
    assert any(f.check == "pinslot.slot_fit" and "bore" in f.message for f in found)
    assert any(f.check == "pinslot.pin_fit" for f in found)


def test_spoked_slot_wheel_warns():
    d = _variant(
        (
            'form = "triangular"\nface_width = 1.5',
            'form = "triangular"\nface_width = 1.5\nspokes = 4\nrim = 3.0',
        )
    )
    found = pinslot_findings(d, None)
    assert [(f.level, f.check) for f in found] == [("warning", "pinslot.slot_fit")]


def test_wide_cutter_note_and_stacking_error():
    d = _variant(("cutter = 0.5 ", "cutter = 2.0 "))
    notes = [f for f in pinslot_findings(d, None) if f.level == "note"]
    assert _ids(notes) == ["pinslot.width"]
    d = _variant(("teeth = 60\nheight = 13.0", "teeth = 60\nheight = 10.0"))
    assert "pinslot.stacking" in _ids(pinslot_findings(d, None), "error")


def test_root_radius_matches_the_rack_formula():
    # ISO 21771 (from memory): d_f = d - 2 h_f + 2 x m -> moon_wheel 1.0 * (98 / 2 -
    # 1.25 - 0.3)
    d = _variant()
    assert wheel_root_radius(d.wheel("moon_wheel")) == pytest.approx(47.45, abs=1e-9)
