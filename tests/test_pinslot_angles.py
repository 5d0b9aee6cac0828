"""Angles of every arbor over time: exact mean rates plus propagated coupling deviations.

Truth: the maximum deviation asin(e / r) (firgelliauto.com, "Whitworth quick-return
mechanism": alpha = asin(d / r); docs/references.md section 13); everything else derived
from plane geometry, as each test says (positions of pins and axes computed in the
test).
"""

from __future__ import annotations

import math
from fractions import Fraction

import numpy as np
import pytest

from tests._demo import DEMO
from wheelgen.design import load_design, loads_design
from wheelgen.kinematics.angles import (
    angle_model,
    arbor_angles,
    arbor_deviations,
    coupling_deviations,
)
from wheelgen.kinematics.rates import solve_rates

HEAD = """
[design]
title = "test train"
[drive]
arbor = "a"
period = "1 h"
sense = "{sense}"
"""

# a -> (pin) b ~slot~ c -> mesh c2 (20) with d (40)
LINE = (
    HEAD
    + """
[[arbor]]
name = "a"
at = [0.0, 0.0]
[[arbor]]
name = "b"
[[arbor]]
name = "c"
[[arbor]]
name = "d"
[[wheel]]
name = "a1"
arbor = "a"
teeth = 30
[[wheel]]
name = "b1"
arbor = "b"
teeth = 60
[[wheel]]
name = "c1"
arbor = "c"
teeth = 40
height = 5.0
[[wheel]]
name = "c2"
arbor = "c"
teeth = 20
height = 10.0
[[wheel]]
name = "d1"
arbor = "d"
teeth = 40
height = 10.0
[[mesh]]
pair = ["a1", "b1"]
bearing = 0.0
[[mesh]]
pair = ["c2", "d1"]
bearing = 90.0
[[pinslot]]
name = "k"
pin = "{pin}"
slot = "{slot}"
radius = 10.0
offset = 2.0
bearing = 30.0
"""
)


def _line(sense: str = "ccw", pin: str = "b1", slot: str = "c1"):
    return loads_design(LINE.format(sense=sense, pin=pin, slot=slot), "line.toml")


def _times(design, cycles: float, n: int) -> np.ndarray:
    model = angle_model(design)
    cyc = model.cycle_turns("k")
    return np.linspace(0.0, cycles * float(cyc * design.drive.period_s), n)


def test_demo_rates_are_the_kinematics_rates():
    d = load_design(DEMO)
    model = angle_model(d)
    exact = solve_rates(d).rates
    assert model.rates == {k: v for k, v in exact.items() if v is not None}
    assert model.uneven() == ("moon_dial",)


def test_demo_moon_dial_deviation_and_full_cycle():
    d = load_design(DEMO)
    model = angle_model(d)
    cycle_s = float(model.cycle_turns("moon_coupling") * d.drive.period_s)
    t = np.linspace(0.0, cycle_s, 14401)
    ang = arbor_angles(d, t, model)
    dev = ang["moon_dial"] - ang["moon"]
    alpha = math.degrees(math.asin(0.8 / 8.0))  # WHITWORTH: asin(e / r)
    assert dev.max() == pytest.approx(alpha, abs=1e-4)
    assert dev.min() == pytest.approx(-alpha, abs=1e-4)
    # derived: over a whole cycle both wheels turn exactly once, clockwise seen from
    # the front as the drive does (375/11074 turns per drive turn, same sense)
    assert ang["moon"][-1] == pytest.approx(-360.0, abs=1e-9)
    assert ang["moon_dial"][-1] == pytest.approx(-360.0, abs=1e-9)
    assert ang["moon_dial"][0] == 0.0


def test_deviation_propagates_through_a_mesh_with_its_ratio():
    d = _line()
    t = _times(d, 2.0, 4001)
    dev = arbor_deviations(d, t)
    k = coupling_deviations(d, t)["k"]
    # derived: external mesh 20 -> 40 reverses and halves
    assert np.allclose(dev["d"], -0.5 * k, atol=1e-12)
    assert np.allclose(dev["c"], k, atol=1e-12)
    assert not dev["a"].any() and not dev["b"].any()
    assert k.max() == pytest.approx(math.degrees(math.asin(0.2)), abs=1e-4)


def _pin_and_slot_positions(ang, pin_arbor, slot_arbor, r, e, bearing):
    """Independent: pin centre and slot direction from positions in the plane."""
    pin = np.radians(ang[pin_arbor] + bearing)
    px, py = r * np.cos(pin), r * np.sin(pin)
    bx, by = e * math.cos(math.radians(bearing)), e * math.sin(math.radians(bearing))
    towards_pin = np.degrees(np.arctan2(py - by, px - bx))
    slot = ang[slot_arbor] + bearing
    return np.mod(towards_pin - slot + 180.0, 360.0) - 180.0


@pytest.mark.parametrize("sense", ["ccw", "cw"])
def test_slot_points_at_the_pin_fixed_frame(sense):
    # derived: the slot (at the bearing in its wheel at rest) always points at the pin
    d = _line(sense)
    t = _times(d, 1.5, 3001)
    miss = _pin_and_slot_positions(arbor_angles(d, t), "b", "c", 10.0, 2.0, 30.0)
    assert np.abs(miss).max() < 1e-9


def test_slot_side_driven_coupling():
    # the drive reaches the slot wheel first: pin "c1" on c is driven by slot "b1" on b
    d = _line(pin="c1", slot="b1")
    (c,) = angle_model(d).couplings
    assert c.driver == "slot"
    t = _times(d, 1.0, 2001)
    ang = arbor_angles(d, t)
    # the slot on b still points at the pin on c, whose axis is the offset origin
    pin = np.radians(ang["c"] + 30.0)
    px, py = 10.0 * np.cos(pin), 10.0 * np.sin(pin)
    bx, by = 2.0 * math.cos(math.radians(30.0)), 2.0 * math.sin(math.radians(30.0))
    towards = np.degrees(np.arctan2(py - by, px - bx))
    miss = np.mod(towards - (ang["b"] + 30.0) + 180.0, 360.0) - 180.0
    assert np.abs(miss).max() < 1e-9
    # the downstream arbor d follows c through the mesh
    dev = arbor_deviations(d, t)
    assert np.allclose(dev["d"], -0.5 * dev["c"], atol=1e-12)


CARRIED = """
[design]
title = "carried coupling"
[drive]
arbor = "main"
period = "1 d"
[[arbor]]
name = "main"
at = [0.0, 0.0]
[[arbor]]
name = "stud"
around = "main"
fixed = true
[[arbor]]
name = "p"
carrier = "arm"
at = [20.0, 0.0]
[[arbor]]
name = "q"
carrier = "arm"
at = [21.149066664678468, 0.9641814145298089]  # derived: 1.5 mm from p at 40 deg
[[wheel]]
name = "arm"
arbor = "main"
teeth = 60
height = 0.0
[[wheel]]
name = "sun"
arbor = "stud"
teeth = 30
module = 0.5
height = 5.0
[[wheel]]
name = "pw"
arbor = "p"
teeth = 50
module = 0.5
height = 5.0
[[wheel]]
name = "sw"
arbor = "q"
teeth = 40
height = 10.0
[[mesh]]
pair = ["sun", "pw"]
[[pinslot]]
name = "k"
pin = "pw"
slot = "sw"
radius = 8.0
offset = 1.5
bearing = 40.0
"""


def test_carried_axes_follow_the_carrier():
    d = loads_design(CARRIED, "carried.toml")
    model = angle_model(d)
    assert model.rates["p"] == Fraction(8, 5)  # derived: Willis, 1 + 30/50
    assert model.rates["q"] == Fraction(8, 5)
    (c,) = model.couplings
    assert c.frame == "main" and c.rate == Fraction(3, 5)
    cycle = float(model.cycle_turns("k") * d.drive.period_s)
    t = np.linspace(0.0, 2.0 * cycle, 40001)
    ang = arbor_angles(d, t, model)
    # independent: positions in the fixed frame; A rides on the arm at (20, 0)
    arm = np.radians(ang["main"])
    ax_, ay = 20.0 * np.cos(arm), 20.0 * np.sin(arm)
    off = arm + math.radians(40.0)
    bx, by = ax_ + 1.5 * np.cos(off), ay + 1.5 * np.sin(off)
    pin = np.radians(ang["p"] + 40.0)
    px, py = ax_ + 8.0 * np.cos(pin), ay + 8.0 * np.sin(pin)
    towards = np.degrees(np.arctan2(py - by, px - bx))
    miss = np.mod(towards - (ang["q"] + 40.0) + 180.0, 360.0) - 180.0
    assert np.abs(miss).max() < 1e-9
    dev = ang["q"] - ang["p"]
    assert dev.max() == pytest.approx(math.degrees(math.asin(1.5 / 8.0)), abs=1e-4)
    # over one cycle (pin once round relative to the arm) the slot's net rotation
    # equals the pin wheel's exactly
    i = 20000
    assert ang["q"][i] - ang["q"][0] == pytest.approx(
        ang["p"][i] - ang["p"][0], abs=1e-9
    )


def test_carried_fast_point_moves_at_the_carriers_rate():
    d = loads_design(CARRIED, "carried.toml")
    model = angle_model(d)
    cycle = float(model.cycle_turns("k") * d.drive.period_s)
    t = np.linspace(0.0, 3.5 * cycle, 70001)  # fast points at 1, 2, 3 cycles
    ang = arbor_angles(d, t, model)
    speed = np.gradient(ang["q"], t)
    # local maxima of the slot wheel's speed: the fast points, one per cycle
    peaks = [
        i
        for i in range(1, len(t) - 1)
        if speed[i] > speed[i - 1] and speed[i] >= speed[i + 1]
    ]
    assert len(peaks) == 3
    # where the fast point is: the pin's direction in the fixed frame at those times
    where = ang["p"][peaks] + 40.0
    arm = ang["main"][peaks]
    # derived: it lies on the offset line, which turns with the carrier
    assert np.allclose(
        np.mod(where - (arm + 40.0) + 180.0, 360.0) - 180.0, 0.0, atol=0.2
    )
    step = np.diff(where)
    carrier_step = (
        float(model.rates["main"]) * 360.0 * np.diff(t[peaks]) / float(d.drive.period_s)
    )
    assert np.allclose(
        np.mod(step - carrier_step + 180.0, 360.0) - 180.0, 0.0, atol=0.2
    )


def test_bad_offset_raises():
    text = LINE.format(sense="ccw", pin="b1", slot="c1").replace(
        "offset = 2.0", "offset = 10.0"
    )
    with pytest.raises(ValueError, match="'offset' must be smaller"):
        angle_model(loads_design(text, "bad.toml"))
