"""Arbors and tubes through the front: telescoping order, reach, and what cannot be shown."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from tests._demo import DEMO, DEMO_TEXT
from wheelgen.checks import run_checks
from wheelgen.design import load_design, loads_design
from wheelgen.display.checks import hand_min_distance
from wheelgen.display.plan import display_plan
from wheelgen.layout import plan_layout
from wheelgen.layout.front import SEAT_PROUD
from wheelgen.parts import plan_parts
from wheelgen.workshop.drilling import chart_holes

ROOT = Path(__file__).resolve().parents[1]
WEEK = ROOT / "tests" / "data" / "display" / "week_and_month.toml"


def _ids(findings, level: str = "error") -> list[str]:
    return sorted(f.check for f in findings if f.level == level)


def test_demo_tubes_telescope_through_the_front():
    design = load_design(DEMO)
    layout = plan_layout(design)
    spans = layout.stacking.spans
    levels = layout.stacking.levels
    face = 42.0  # derived: front plate's inner face 40 + thickness 2
    assert levels.front_face == face
    # derived: the dial 3.5 mm in front of the face (clear of the 3 mm heads of the
    # frame's M3 screws, ISO 4762 k max, by 0.5 mm), 1 mm thick; first hand 1 mm further
    assert levels.dials["main"] == (45.5, 46.5)
    tide, hours = (
        next(i for i in levels.items if i.member == m) for m in ("tide", "hours")
    )
    assert tide.z0 == pytest.approx(47.5)
    # derived: the tide hand 0.8 mm, its collet 1.5 mm, the tube 0.5 mm proud of it,
    # then the next hand 1 mm in front of the tube's end
    assert tide.reach == pytest.approx(47.5 + 0.8 + 1.5 + SEAT_PROUD)
    assert hours.z0 == pytest.approx(tide.reach + 1.0)
    # each inner member stands proud of the one around it
    assert spans["stud"].z1 == pytest.approx(face)
    assert spans["tide"].z1 == pytest.approx(tide.reach)
    assert spans["hours"].z1 == pytest.approx(hours.reach)
    assert spans["main"].z1 >= spans["hours"].z1
    assert spans["stud"].z1 < spans["tide"].z1 < spans["hours"].z1
    # the knob is behind the back plate (the drive's axis carries hands)
    knob = next(i for i in levels.items if i.role == "knob")
    assert knob.side == "back" and spans["main"].z0 == pytest.approx(knob.reach)
    # what passes the front plate is listed, and the plate's hole holds the stud
    assert {"tide", "hours", "stud", "main"} <= {
        n for n, s in spans.items() if "front" in s.plates
    }
    centre = next(h for h in chart_holes(design, "front") if h.x == 0 and h.y == 0)
    assert centre.member == "stud" and centre.role == "held"


def test_demo_has_a_hand_and_dial_for_every_target_and_a_knob():
    design = load_design(DEMO)
    parts = {p.name: p for p in plan_parts(design)}
    face = plan_layout(design).stacking.levels.front_face
    for t in design.targets:
        hand = parts[f"hand_{t.arbor}"]
        assert hand.placement.z > face
    assert {"dial_main", "dial_moon_dial", "knob_main"} <= set(parts)
    # every dial lies behind its hands
    plan = display_plan(design)
    for h in plan.hands:
        dial = next(d for d in plan.dials if d.part.name == h.dial)
        assert dial.z1 < h.level.z0
    assert not [f for f in run_checks(design) if f.check.startswith("display")]


def test_seats_follow_the_process():
    # mill: a square on the solid moon_dial arbor, friction collets on the tubes
    demo = {h.part.arbor: h.part for h in display_plan(load_design(DEMO)).hands}
    assert demo["moon_dial"].seat == "square"
    assert demo["hours"].seat == demo["tide"].seat == "collet"
    week = {h.part.arbor: h.part for h in display_plan(load_design(WEEK)).hands}
    assert week["week"].seat == "flat"  # printed
    parts = {p.name: p for p in plan_parts(load_design(WEEK))}
    assert parts["week"].seats[-1][2] == "flat"


def test_a_carried_or_one_plate_arbor_cannot_reach_the_front():
    for arbor, why in (
        ("planet", "rides on wheel"),
        ("moon", "held by the other plate"),
    ):
        design = loads_design(DEMO_TEXT + f'\n[[hand]]\narbor = "{arbor}"\n', "d.toml")
        found = [f for f in run_checks(design) if f.check == "display.cannot_reach"]
        assert found and found[0].level == "error", arbor
        assert f'"{arbor}"' in found[0].message and why in found[0].message


def test_the_old_centre_order_hides_the_hour_wheel():
    # the tide tube around the hour tube, its wheel behind the hour wheel: bringing the
    # tide hand out covers the hour wheel's seat
    text = DEMO_TEXT.replace(
        "teeth = 64\nheight = 23.0", "teeth = 64\nheight = 10.0"
    ).replace("teeth = 13\nheight = 23.0", "teeth = 13\nheight = 10.0")
    findings = run_checks(loads_design(text, "d.toml"))
    hidden = [f for f in findings if f.check == "layout.hidden_seat"]
    assert any('"hour_wheel"' in f.message and '"tide"' in f.message for f in hidden)


SIBLINGS = """
[design]
title = "two tubes side by side on one arbor"

[frame]
plates = [0.0, 30.0]

[drive]
arbor = "main"
period = "1 h"

[[arbor]]
name = "main"
at = [0.0, 0.0]

[[arbor]]
name = "a"
around = "main"

[[arbor]]
name = "b"
around = "main"

[[arbor]]
name = "lay"

[[wheel]]
name = "m1"
arbor = "main"
teeth = 30
height = 2.0

[[wheel]]
name = "l1"
arbor = "lay"
teeth = 30
height = 2.0

[[wheel]]
name = "l2"
arbor = "lay"
teeth = 20
height = 10.0

[[wheel]]
name = "wa"
arbor = "a"
teeth = 40
height = 10.0

[[wheel]]
name = "l3"
arbor = "lay"
teeth = 30
height = 18.0

[[wheel]]
name = "wb"
arbor = "b"
teeth = 30
height = 18.0

[[mesh]]
pair = ["m1", "l1"]
bearing = 0.0

[[mesh]]
pair = ["l2", "wa"]

[[mesh]]
pair = ["l3", "wb"]

[[hand]]
arbor = "a"

[[hand]]
arbor = "b"
"""


def test_two_tubes_side_by_side_cannot_both_show_a_hand():
    findings = run_checks(loads_design(SIBLINGS, "s.toml"))
    hidden = [f for f in findings if f.check == "display.hidden_hand"]
    assert hidden and hidden[0].level == "error"
    assert '"a"' in hidden[0].message and '"b"' in hidden[0].message


def test_a_wheel_beyond_the_plate_covers_the_hand_inside_it():
    # wheel "wb" on tube "b" stands in front of the front plate; "main" inside it
    # carries a hand whose seat then lies under that tube
    text = (
        SIBLINGS.replace('[[hand]]\narbor = "a"\n', "")
        .replace('[[hand]]\narbor = "b"\n', '[[hand]]\narbor = "main"\n')
        .replace("teeth = 30\nheight = 18.0", "teeth = 30\nheight = 35.0")
    )
    findings = run_checks(loads_design(text, "s.toml"))
    assert "layout.outside_plates" in _ids(findings)
    # moving the wheel back between the plates clears it: it comes under that cause
    covered = [
        g for f in findings for g in f.every() if g.check == "display.hidden_hand"
    ]
    assert covered and '"b"' in covered[0].message


def test_hand_distance_of_crossed_and_parallel_segments():
    # derived by hand: two hands on axes 40 mm apart along x
    centres = (np.array([[0.0, 0.0]] * 3), np.array([[40.0, 0.0]] * 3))
    a = np.array([0.0, 90.0, 0.0])  # along +x, up, along +x
    b = np.array([180.0, 90.0, 0.0])  # along -x, up (parallel), along +x
    spans = ((5.0, 30.0), (5.0, 30.0))
    d = hand_min_distance(centres, (a, b), spans)
    # facing: the tips at x = 30 and x = 10 overlap: 0; parallel and upright: 40;
    # both along +x: the first tip (30) and the second's tail (35) 5 apart
    assert d == pytest.approx([0.0, 40.0, 5.0])


def test_the_reading_at_rest_turns_the_hand_and_its_seat():
    text = DEMO_TEXT + '\n[[hand]]\narbor = "moon_dial"\nrest = 7.5\n'
    hand = next(
        h.part
        for h in display_plan(loads_design(text, "d.toml")).hands
        if h.part.arbor == "moon_dial"
    )
    # derived: the moon hand turns clockwise, as the drive does; day 7.5 of a month of
    # 29.5306667 days (the train's period: 11074/375 d) stands that share of a turn
    # on from the top, clockwise (angles counter-clockwise from +x, in [0, 360))
    want = (90.0 - 360.0 * 7.5 / (11074 / 375)) % 360.0
    assert hand.placement.angle_deg == pytest.approx(want, abs=1e-9)
    # the square hole is turned back by as much, so the hand reads 7.5 on a square
    # milled at the arbor's angle 0
    assert hand.seat == "square"
    turn = (hand.seat_angle_deg + want) % 90.0
    assert min(turn, 90.0 - turn) == pytest.approx(0.0, abs=1e-6)


def test_a_seat_hidden_only_by_the_display_says_so_and_how_to_turn_it_off():
    from tests._advice import recheck

    # the stud inside the hour tube again (as in a clock whose readings stay inside):
    # bringing the hour and tide hands out covers the sun's seat on the stud
    text = _without_dials(
        DEMO_TEXT.replace(
            'name = "hours"          # tube on the main arbor: the hour hand, and the'
            ' planet\'s carrier\naround = "main"',
            'name = "hours"\naround = "stud"',
        ).replace(
            'holds the sun still\naround = "tide"',
            'holds the sun still\naround = "main"',
        )
    )
    hidden = [
        g
        for f in run_checks(loads_design(text, "d.toml"))
        for g in f.every()
        if g.check == "layout.hidden_seat"
    ]
    assert hidden and all("lengthened through the plate" in f.message for f in hidden)
    _, again = recheck(text, hidden[0], run_checks)  # readings = "none"
    assert "layout.hidden_seat" not in {f.check for f in again}


def _without_dials(text: str) -> str:
    """The demo's text without its [[dial]] tables (each needs its hand)."""
    head, _, _ = text.partition("# --- what the front shows")
    return head


def test_dial_feet_are_pinned_through_the_front_plate_clear_of_its_holes():
    from wheelgen.frame import plan_frame
    from wheelgen.frame.limits import min_centre_distance

    design = load_design(DEMO)
    plan = display_plan(design)
    chart = chart_holes(design, "front")
    frame = plan_frame(design)
    for dial in plan.dials:
        part = dial.part
        mine = [h for h in chart if h.member == part.name]
        assert len(mine) == len(part.feet) == 3
        # derived: the chart counts from the drive's axis, at the centre here
        feet = {(round(part.placement.x + x, 4), round(part.placement.y + y, 4))
                for x, y in part.feet}  # fmt: skip
        assert {(round(h.x, 4), round(h.y, 4)) for h in mine} == feet
        # each foot's 2 mm pin is held in an H7 hole of its own size: 2.000 to 2.010
        # (ISO 286-1:2010, Table 1, IT7 up to 3 mm = 10 um; EI = 0 for H)
        assert all(h.nominal == 2.0 and h.role == "held" for h in mine)
        assert all((h.low, h.high) == (2.0, 2.01) for h in mine)
        for x, y in feet:
            for h in frame.plate("front").holes:
                need = min_centre_distance(2.0, h.diameter, frame.limits)
                assert np.hypot(x - h.x, y - h.y) >= need - 1e-9


def test_an_arbor_lengthened_to_its_cock_keeps_its_hand_seat():
    design = load_design(ROOT / "tests" / "data" / "two_stage.toml")
    output = next(p for p in plan_parts(design) if p.name == "output")
    hand = next(p for p in plan_parts(design) if p.name == "hand_output")
    z0, z1, shape = output.seats[-1]
    # the square runs from the hand's back face to the arbor's end
    assert output.placement.z + z0 == pytest.approx(hand.placement.z)
    assert z1 == pytest.approx(output.length) and shape == "square"
