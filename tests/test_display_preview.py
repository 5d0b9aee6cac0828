"""The report's dial preview: read each hand's keyframes back and compare with the train.

The expected angles are worked out here from the demo's tooth counts and the
pin-and-slot triangle, not taken from the code under test.
"""

from __future__ import annotations

import math
import xml.etree.ElementTree as ET

import pytest

from tests._demo import DEMO
from wheelgen.design import load_design
from wheelgen.display.plan import display_plan
from wheelgen.kinematics.rates import solve_rates
from wheelgen.workshop.dial_preview import dials_svg
from wheelgen.workshop.preview import preview_plan
from wheelgen.workshop.report import report_html

NS = "{http://www.w3.org/2000/svg}"
DAY = 86400.0

# Turns per day of each reading arbor, counter-clockwise positive. The drive turns
# clockwise once a day, seen from the front (-1); derived: hours = 96/48 * 72/72 = 2
# drive turns; tide (Willis, carrier = hours, fixed sun) = 2 * (1 - (11/66) * (13/64))
# = 371/192; moon = 25/113 * 15/98 = 375/11074; all the same way as the drive.
DRIVE = -1.0
RATES = {
    "hours": DRIVE * 2.0,
    "tide": DRIVE * 371 / 192,
    "moon_dial": DRIVE * 375 / 11074,
}
PIN_RADIUS, PIN_OFFSET = 8.0, 0.8  # the demo's moon coupling, bearing 0


def _expected_turn_deg(arbor: str, t: float) -> float:
    if arbor != "moon_dial":
        return 360.0 * RATES[arbor] * t / DAY
    # the moon arbor turns evenly; the slot wheel leads it by the triangle's angle
    # delta = atan2(e sin u, r - e cos u), u the pin's angle from the offset line
    u = math.radians(360.0 * RATES["moon_dial"] * t / DAY)
    delta = math.atan2(PIN_OFFSET * math.sin(u), PIN_RADIUS - PIN_OFFSET * math.cos(u))
    return math.degrees(u + delta)


def _keyframes(svg: str, hand: str) -> tuple[list[float], list[float], float]:
    root = ET.fromstring(svg)
    group = next(g for g in root.iter(f"{NS}g") if g.get("id") == f"hand-{hand}")
    anim = group.find(f"{NS}animateTransform")
    times = [float(v) for v in anim.get("keyTimes").split(";")]
    # SVG turns clockwise on the page: the keyframes hold minus our angle
    angles = [-float(v.split()[0]) for v in anim.get("values").split(";")]
    static = -float(group.get("transform").split("(")[1].split()[0])
    return times, angles, static


def _diff(a: float, b: float) -> float:
    return abs((a - b + 180.0) % 360.0 - 180.0)


@pytest.fixture(scope="module")
def demo():
    design = load_design(DEMO)
    plan = preview_plan(design, solve_rates(design))
    display = display_plan(design)
    return design, plan, display, dials_svg(design, display, plan)


def test_every_target_has_a_hand_on_a_dial(demo) -> None:
    design, _, display, svg = demo
    assert {h.part.arbor for h in display.hands} == {t.arbor for t in design.targets}
    root = ET.fromstring(svg)
    ids = {g.get("id") for g in root.iter(f"{NS}g")}
    assert {f"hand-hand_{a}" for a in RATES} <= ids
    assert {"dial-dial_main", "dial-dial_moon_dial"} <= ids


@pytest.mark.parametrize("arbor", sorted(RATES))
def test_preview_hands_turn_at_the_exact_rates(demo, arbor: str) -> None:
    design, plan, display, svg = demo
    hand = next(h for h in display.hands if h.part.arbor == arbor)
    times, angles, static = _keyframes(svg, hand.part.name)
    rest = hand.part.placement.angle_deg
    assert rest == pytest.approx(90.0)  # reading 0 at rest: the dial's top
    assert _diff(static, rest) < 1e-3  # shown at rest when not playing
    n = len(times)
    for k in (0, n // 7, n // 3, n // 2, 2 * n // 3, n - 1):
        t = times[k] * plan.cycle_s
        want = rest + _expected_turn_deg(arbor, t)
        # the keyframes are written to 0.1 degree
        assert _diff(angles[k], want) <= 0.05 + 1e-9, (arbor, k, t)


def test_the_moon_hand_runs_unevenly(demo) -> None:
    _, plan, display, svg = demo
    hand = next(h for h in display.hands if h.part.arbor == "moon_dial")
    times, angles, _ = _keyframes(svg, hand.part.name)
    lead = [
        (a - 90.0) - 360.0 * RATES["moon_dial"] * tk * plan.cycle_s / DAY
        for tk, a in zip(times, angles)
    ]
    # derived: the largest lead and lag are asin(e / r) = 5.74 degrees
    alpha = math.degrees(math.asin(PIN_OFFSET / PIN_RADIUS))
    assert max(lead) == pytest.approx(alpha, abs=0.1)
    assert min(lead) == pytest.approx(-alpha, abs=0.1)


def test_report_carries_the_dial_preview(demo) -> None:
    from wheelgen.checks import run_checks
    from wheelgen.parts import plan_parts

    design = demo[0]
    page = report_html(design, plan_parts(design), run_checks(design))
    assert 'class="drawing dials"' in page
    assert 'id="hand-hand_moon_dial"' in page
