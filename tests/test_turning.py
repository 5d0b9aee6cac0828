"""Arbors and tubes as made: fits, stops beside every wheel, end shake, seat forms.

Truth, outside the code under test:

- ISO 286 limits of the zones the demo uses, from tables of ISO 286-2 as printed by
  tool makers (each row names its source);
- stops and end shake measured on the planned parts themselves (plate faces, the
  placements and lengths of collars, shoulders and wheels), against the rules written
  beside each test (derived);
- the section of a hexagonal seat: the area of a regular hexagon of across-flats ``s``
  is (sqrt(3) / 2) s^2 (derived: six triangles of base s / sqrt(3), height s / 2).
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from tests._demo import DEMO_TEXT
from wheelgen.design import load_design, loads_design
from wheelgen.layout.part_kinds import ArborPart, CollarPart, SleevePart, WheelPart
from wheelgen.parts import plan_parts
from wheelgen.turning import turned_members
from wheelgen.turning.limits import END_SHAKE

DATA = Path(__file__).parent / "data"

# Shaft g6 and hole H7, limit deviations in micrometres (upper, lower).
SHAFTS = (
    "Sumitomo Electric Hardmetal, technical information p. 28, 'Dimensional"
    " Tolerances for Regularly Used Fits (taken from JIS B 0401:1999, = ISO 286-2)'"
)
HOLES = "MIKI PULLEY, 'List of Fit Tolerances (Excerpt from JIS B 0401 = ISO 286-2)'"
G6 = {3.0: (-2, -8, SHAFTS), 6.0: (-4, -12, SHAFTS)}  # ranges up to 3, over 3 to 6
H7 = {3.0: (10, 0, HOLES), 6.0: (12, 0, HOLES)}


def _published(table: dict[float, tuple[int, int, str]], size: float) -> tuple:
    top = min(t for t in table if size <= t + 1e-9)
    return table[top]


@pytest.fixture(scope="module")
def demo():
    design = loads_design(DEMO_TEXT, "demo.toml")
    parts = plan_parts(design)
    return design, parts, {p.name: p for p in parts}


def test_every_fitted_length_has_its_published_limits(demo) -> None:
    _, parts, _ = demo
    checked = 0
    for p in parts:
        if not isinstance(p, (ArborPart, SleevePart)):
            continue
        for s in p.sections:
            if not s.zone:
                continue
            assert s.zone == "g6", (p.name, s)
            size = s.across or s.diameter
            upper, lower, source = _published(G6, size)
            assert s.low == pytest.approx(size + lower / 1000, abs=1e-9), source
            assert s.high == pytest.approx(size + upper / 1000, abs=1e-9), source
            checked += 1
        if isinstance(p, SleevePart):
            upper, lower, source = _published(H7, p.bore_low)
            nominal = p.bore_low  # an H zone starts at the nominal size
            assert p.bore_zone == "H7"
            assert p.bore_high == pytest.approx(nominal + upper / 1000, abs=1e-9), (
                source
            )
    assert checked > 20


def test_fitted_lengths_name_what_they_meet(demo) -> None:
    _, _, by_name = demo
    roles = {(s.role, s.what) for s in by_name["lay"].sections}
    assert {("pivot", "back_plate"), ("pivot", "front_plate")} <= roles
    assert {("seat", "lay_pinion"), ("seat", "lay_wheel")} <= roles
    # the centre arbor runs in the hour tube, the planet in the wheel that carries it
    assert ("under", "hours") in {(s.role, s.what) for s in by_name["main"].sections}
    assert ("pivot", "hour_wheel") in {
        (s.role, s.what) for s in by_name["planet"].sections
    }
    # the fixed stud is held by the front plate
    assert ("held", "front_plate") in {
        (s.role, s.what) for s in by_name["stud"].sections
    }


def _member_features(parts, member: str) -> list[tuple[float, float, str]]:
    """(z0, z1, what) of everything larger than the member on its axis: its wheels, its
    turned shoulders and collars, its separate collars (absolute heights, mm)."""
    by_name = {p.name: p for p in parts}
    m = by_name[member]
    z = m.placement.z
    out = [(z + a, z + b, "shoulder") for a, b, _ in m.collars]
    for p in parts:
        if isinstance(p, CollarPart) and p.member == member:
            out.append((p.placement.z, p.placement.z + p.length, p.name))
    return out


def test_every_wheel_sits_against_a_stop(demo) -> None:
    # derived: a wheel is put on its member from one end and pushed against a
    # shoulder, a collar or a wheel already there (within 0.2 mm), or it stands flush
    # with the member's end
    design, parts, by_name = demo
    for w in design.wheels:
        member = by_name[w.arbor]
        z0, z1 = w.height, w.height + w.face_width + w.hub_length
        faces = [(a, b) for a, b, _ in _member_features(parts, w.arbor)]
        faces += [
            (o.height, o.height + o.face_width)
            for o in design.wheels
            if o.arbor == w.arbor and o.name != w.name
        ]
        touching = any(abs(b - z0) <= 0.2 + 1e-9 or abs(a - z1) <= 0.2 + 1e-9
                       for a, b in faces)  # fmt: skip
        ends = (member.placement.z, member.placement.z + member.length)
        flush = any(abs(e - z0) < 1e-9 or abs(e - z1) < 1e-9 for e in ends)
        assert touching or flush, w.name


@pytest.mark.parametrize("arbor", ["lay", "moon_lay", "moon", "moon_dial", "planet"])
def test_end_shake_is_the_process_s_between_the_bearings(demo, arbor: str) -> None:
    # derived: the arbor can move forward until a stop behind a bearing meets that
    # bearing's back face, and back until a stop in front of a bearing meets its front
    # face; the two gaps, measured on the parts, add up to the end shake of a milled
    # arbor
    design, parts, by_name = demo
    info = turned_members(design, parts[: len(parts)])
    assert info[arbor].end_shake == pytest.approx(END_SHAKE["mill"], abs=1e-9)
    bearings = [
        (s.z0 + by_name[arbor].placement.z, s.z1 + by_name[arbor].placement.z)
        for s in by_name[arbor].sections
        if s.role == "pivot"
    ]
    features = _member_features(parts, arbor) + [
        (w.height, w.height + w.face_width + w.hub_length, w.name)
        for w in design.wheels
        if w.arbor == arbor
    ]
    forward = min(
        b0 - f1 for b0, _ in bearings for _, f1, _ in features if f1 <= b0 + 1e-9
    )
    back = min(
        f0 - b1 for _, b1 in bearings for f0, _, _ in features if f0 >= b1 - 1e-9
    )
    assert forward + back == pytest.approx(END_SHAKE["mill"], abs=1e-9)


def test_collars_keep_their_member_s_bore_and_fixing(demo) -> None:
    _, parts, by_name = demo
    collars = [p for p in parts if isinstance(p, CollarPart)]
    assert collars
    for c in collars:
        member = by_name[c.member]
        assert (c.placement.x, c.placement.y) == (
            member.placement.x,
            member.placement.y,
        )
        d = member.diameter if isinstance(member, ArborPart) else member.outside
        upper, lower, source = _published(H7, d)
        assert (c.bore_low, c.bore_high) == pytest.approx(
            (d + lower / 1000, d + upper / 1000), abs=1e-9
        ), source
        assert c.bore_low <= c.inside <= c.bore_high
        assert c.fixing == "retaining compound"
        # it lies on the member, between its ends
        z0, z1 = member.placement.z, member.placement.z + member.length
        assert z0 - 1e-9 <= c.placement.z and c.placement.z + c.length <= z1 + 1e-9


def test_no_stop_between_a_cock_and_the_plate_that_holds_its_arbor(demo) -> None:
    # derived: the arbor goes through the plate and the cock; a collar or shoulder
    # between the two could pass through neither
    _, parts, by_name = demo
    moon = by_name["moon"]
    z = moon.placement.z
    bearings = sorted((s.z0 + z, s.z1 + z) for s in moon.sections if s.role == "pivot")
    assert len(bearings) == 2
    (_, gap0), (gap1, _) = bearings
    for a, b, what in _member_features(parts, "moon"):
        assert b <= gap0 + 1e-9 or a >= gap1 - 1e-9, what


def test_a_hex_seat_on_a_plain_arbor_is_milled_hexagonal() -> None:
    text = (DATA / "two_stage.toml").read_text()
    text = text.replace(
        'name = "wheel_a"\narbor = "lay"\nteeth = 48\nheight = 2.0\n',
        'name = "wheel_a"\narbor = "lay"\nteeth = 48\nheight = 2.0\nseat = "hex"\n',
    )
    design = loads_design(text, "hex.toml")
    by_name = {p.name: p for p in plan_parts(design)}
    lay, wheel = by_name["lay"], by_name["wheel_a"]
    assert isinstance(lay, ArborPart) and isinstance(wheel, WheelPart)
    z = lay.placement.z
    ((a, b, shape),) = [s for s in lay.seats if s[2] == "hex"]
    assert (a + z, b + z) == pytest.approx((2.0, 5.0)) and shape == "hex"
    # derived: the largest hexagon in the 3 mm round is 3 cos 30 across flats; the
    # wheel's hole is that across flats opened by the H7 hole zone (modelled mid-zone)
    flats = 3.0 * math.cos(math.radians(30.0))
    (section,) = [s for s in lay.sections if s.role == "seat" and s.what == "wheel_a"]
    assert section.shape == "hex" and section.across == pytest.approx(flats, abs=1e-6)
    upper, lower, _ = _published(H7, flats)
    assert wheel.seat == "hex"
    assert wheel.bore == pytest.approx(flats + (upper + lower) / 2000, abs=1e-6)


@pytest.mark.cad
def test_the_hex_seat_is_hexagonal_in_the_solid() -> None:
    pytest.importorskip("cadquery")
    from wheelgen.solids.part import make_part

    text = (
        (DATA / "two_stage.toml")
        .read_text()
        .replace(
            "teeth = 48\nheight = 2.0\n", 'teeth = 48\nheight = 2.0\nseat = "hex"\n'
        )
    )
    design = loads_design(text, "hex.toml")
    (lay,) = [p for p in plan_parts(design) if p.name == "lay"]
    solid = make_part(lay)
    ((a, b, _),) = [s for s in lay.seats if s[2] == "hex"]
    import cadquery as cq

    cut = solid.intersect(
        cq.Solid.makeBox(20, 20, 0.01, cq.Vector(-10, -10, (a + b) / 2))
    )
    flats = 3.0 * math.cos(math.radians(30.0))
    # derived: regular hexagon of across-flats s has area (sqrt 3 / 2) s^2
    assert cut.Volume() / 0.01 == pytest.approx(math.sqrt(3) / 2 * flats**2, rel=1e-4)


def test_a_printed_member_has_no_iso_zone() -> None:
    design = loads_design((DATA / "frame" / "print_week.toml").read_text(), "w.toml")
    for p in plan_parts(design):
        if isinstance(p, (ArborPart, SleevePart)):
            assert all(s.zone == "" for s in p.sections), p.name
            assert p.stock == 0.0
        if isinstance(p, CollarPart):
            assert p.fixing == "glue" and p.bore_zone == ""


def test_an_arbor_with_a_tube_gets_a_thrust_face_behind_the_tube(demo) -> None:
    # derived: the hour tube runs on the centre arbor; something on the arbor must
    # meet the tube's back end, or the tube would slide back to the wheels
    _, parts, by_name = demo
    hours = by_name["hours"]
    faces = [b for _, b, _ in _member_features(parts, "main")]
    assert any(abs(f - hours.placement.z) < 1e-9 for f in faces)


def test_moving_a_wheel_moves_the_shoulder() -> None:
    # the worked example's layshaft: wheel_a at 2 to 5 mm, pinion_b at 10 mm; the
    # shoulder fills the gap between them, wherever the second stage stands
    for height in (10.0, 11.0):
        text = (
            (DATA / "two_stage.toml")
            .read_text()
            .replace("height = 10.0", f"height = {height}")
        )
        design = loads_design(text, "two_stage.toml")
        lay = next(p for p in plan_parts(design) if p.name == "lay")
        ((a, b, _),) = lay.collars
        z = lay.placement.z
        assert (a + z, b + z) == pytest.approx((5.0, height))


def test_no_tube_lies_between_two_turned_stops() -> None:
    """A tube slides onto its member from one end: a stop turned on the member at
    both ends of it would keep it off (derived). Tubes nested three deep on a stud."""
    design = load_design(DATA / "layout" / "epicyclic_nested.toml")
    for part in plan_parts(design):
        if not isinstance(part, (ArborPart, SleevePart)):
            continue
        turned = [s for s in part.sections if s.role in ("shoulder", "collar")]
        for s in part.sections:
            if s.role != "under":
                continue
            below = any(t.z1 <= s.z0 + 1e-6 for t in turned)
            above = any(t.z0 >= s.z1 - 1e-6 for t in turned)
            assert not (below and above), (part.name, s.what)
