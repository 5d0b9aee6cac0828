"""Hands that meet through their cycle, dials that overlap, sweeps over other axes."""

from __future__ import annotations

import pytest

from tests._demo import DEMO_TEXT
from wheelgen.checks import run_checks
from wheelgen.design import loads_design
from wheelgen.display.motion import hand_angles_deg, joint_cycle_turns
from wheelgen.display.plan import display_plan

# Three 20-tooth wheels in a row, 20 mm apart: "a" drives "c" through the idler "b", so
# "a" and "c" turn the same way at the same rate and their hands stay parallel.
ROW = """
[design]
title = "two hands kept parallel by an idler"

[frame]
plates = [0.0, 20.0]

[drive]
arbor = "a"
period = "1 h"

[[arbor]]
name = "a"
at = [0.0, 0.0]

[[arbor]]
name = "b"

[[arbor]]
name = "c"

[[wheel]]
name = "wa"
arbor = "a"
teeth = 20
height = 5.0

[[wheel]]
name = "wb"
arbor = "b"
teeth = 20
height = 5.0

[[wheel]]
name = "wc"
arbor = "c"
teeth = 20
height = 5.0

[[mesh]]
pair = ["wa", "wb"]
bearing = 0.0

[[mesh]]
pair = ["wb", "wc"]
bearing = 0.0

[[hand]]
arbor = "a"
length = 30.0
tail = TAIL

[[hand]]
arbor = "c"
length = 30.0
tail = TAIL
"""


def _clashes(tail: float, extra: str = "") -> list:
    design = loads_design(ROW.replace("TAIL", repr(tail)) + extra, "row.toml")
    return [f for f in run_checks(design) if f.check == "display.hand_clash"]


def test_parallel_hands_pass_clear_with_short_tails():
    # derived: pointing along the row, the first hand's tip (x = 30) and the second's
    # tail end (x = 40 - 6 = 34) stay 4 mm apart; 2.1 mm widths and 0.5 mm need 2.6
    assert _clashes(6.0) == []


def test_parallel_hands_meet_with_long_tails():
    # derived: with 12 mm tails the second's tail reaches back to x = 28, past the
    # first's tip at 30, each time the hands point along the row
    (found,) = _clashes(12.0)
    assert found.level == "error" and "hand_a" in found.subject
    assert "joint cycle of 1 h" in found.message


def test_the_joint_cycle_is_exact():
    design = loads_design(ROW.replace("TAIL", "6.0"), "row.toml")
    assert joint_cycle_turns(design, ("a", "c")) == 1
    # derived: the idler turns the other way at the same rate; "c" follows "a"
    angles = hand_angles_deg(design, [0.0, 900.0])  # a quarter of an hour
    assert angles["hand_a"] == pytest.approx([90.0, 180.0])
    assert angles["hand_c"] == pytest.approx([90.0, 180.0])


def test_overlapping_dials_are_an_error():
    extra = '\n[[dial]]\narbor = "a"\nradius = 25.0\n\n[[dial]]\narbor = "c"\nradius = 25.0\n'
    design = loads_design(ROW.replace("TAIL", "6.0") + extra, "row.toml")
    found = [f for f in run_checks(design) if f.check == "display.dial_overlap"]
    assert found and "10.000 mm" in found[0].message  # derived: 25 + 25 - 40


def test_default_dials_keep_apart():
    design = loads_design(ROW.replace("TAIL", "6.0"), "row.toml")
    a, c = display_plan(design).dials
    gap = 40.0 - a.part.radius - c.part.radius
    assert gap >= 2.0 - 1e-9  # DIAL_CLEARANCE


def test_printed_hands_need_their_layers_and_lines():
    text = ROW.replace("TAIL", "6.0").replace(
        'title = "two', 'process = "print"\ntitle = "two'
    )
    extra = "\n[display]\nhand_thickness = 0.4\n"
    found = [
        g
        for f in run_checks(loads_design(text + extra, "row.toml"))
        for g in f.every()
        if g.check == "display.thin"
    ]
    # derived: 4 layers of 0.2 mm (the print defaults) need 0.8 mm; 0.4 mm is 2 layers
    assert found and all("2.0 layers" in f.message for f in found)
    assert {f.subject for f in found} == {"hand_a", "hand_c"}
    # one change puts both right, so the second comes under the first
    assert str(found[0].changes[0]) == "hand_thickness = 0.8 on [display]"


ADVICE_CASES = [
    # dials let down to 2 mm from the plate sit on the heads of the moon cock's screws
    (DEMO_TEXT + "\n[display]\ndial_gap = 2.0\n", "display.frame_clash"),
    # a hand on the layshaft long enough to reach over the centre arbor's tubes
    (DEMO_TEXT + '\n[[hand]]\narbor = "lay"\nlength = 80.0\n', "display.hand_clash"),
    (
        ROW.replace("TAIL", "6.0")
        + '\n[[dial]]\narbor = "a"\nradius = 25.0\n\n[[dial]]\narbor = "c"\nradius = 25.0\n',
        "display.dial_overlap",
    ),
    (
        ROW.replace("TAIL", "6.0").replace(
            'title = "two', 'process = "print"\ntitle = "two'
        )
        + "\n[display]\nhand_thickness = 0.4\n",
        "display.thin",
    ),
]


@pytest.mark.parametrize(("text", "check"), ADVICE_CASES)
def test_display_advice_is_a_change_that_clears_it(text: str, check: str) -> None:
    from tests._advice import recheck

    found = [
        g
        for f in run_checks(loads_design(text, "case.toml"))
        for g in f.every()
        if g.check == check
    ]
    assert found
    for finding in found:
        assert finding.changes, finding.advice
        _, again = recheck(text, finding, run_checks)
        assert (finding.check, finding.subject) not in {
            (f.check, f.subject) for f in again
        }, finding.advice
