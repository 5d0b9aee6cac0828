"""Layout drawing, train diagram, animated preview, motion plot and part drawings.

Truth used here:
- the pin-and-slot triangle (rule of sines): the slot wheel strays from the pin wheel by
  at most arcsin(e / r) (derived; the same law as the slotted-lever quick return);
- the preview must play the kinematics' own angles (derived: arbor_angles sampled at
  the keyframe times), and a pin must stay on its slot's centre line at every frame.
"""

from __future__ import annotations

import math
import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pytest

from tests._demo import DEMO
from wheelgen.design import load_design
from wheelgen.kinematics import solve_rates
from wheelgen.kinematics.angles import arbor_angles
from wheelgen.layout import arbor_positions
from wheelgen.layout.part_kinds import BOUGHT_KINDS
from wheelgen.parts import plan_parts
from wheelgen.workshop.layout_drawing import axis_centres, layout_svg
from wheelgen.workshop.motion_plot import deviation_curve, motion_plot_svg
from wheelgen.workshop.part_drawing import part_svg
from wheelgen.workshop.preview import preview_plan, preview_svg, uneven_arbors
from wheelgen.workshop.train_diagram import (
    train_columns,
    train_diagram_svg,
    train_links,
)

ROOT = Path(__file__).resolve().parent.parent
TWO_STAGE = ROOT / "tests" / "data" / "two_stage.toml"
SVG = "{http://www.w3.org/2000/svg}"


@pytest.fixture(scope="module")
def demo():
    design = load_design(DEMO)
    return design, solve_rates(design), arbor_positions(design)


def _texts(svg: str) -> str:
    root = ET.fromstring(svg)
    return " ".join("".join(t.itertext()) for t in root.iter(f"{SVG}text"))


def test_layout_drawing_names_everything(demo) -> None:
    design, _, positions = demo
    svg = layout_svg(design, positions)
    text = _texts(svg)  # also proves the SVG is well-formed XML
    for a in design.arbors:
        assert a.name in text
    for w in design.wheels:
        assert f"{w.name} {w.teeth}" in text
    for p in design.pinslots:
        assert p.name in text
    root = ET.fromstring(svg)
    radii = {float(c.get("r")) for c in root.iter(f"{SVG}circle")}
    for w in design.wheels:  # every pitch circle m z / 2 is drawn
        assert any(math.isclose(r, w.pitch_diameter / 2, abs_tol=1e-3) for r in radii)


def test_carried_arbor_goes_round_with_its_carrier(demo) -> None:
    design, _, positions = demo
    home = axis_centres(design, positions)
    turned = axis_centres(design, positions, {"hours": 90.0})
    x, y = home["planet"]
    # derived: a quarter turn ccw about the hours axis at the origin maps (x, y) to (-y, x)
    assert turned["planet"] == pytest.approx((-y, x), abs=1e-9)
    assert turned["main"] == home["main"]


def test_train_diagram_directions(demo) -> None:
    design, solution, _ = demo
    cols = train_columns(design)
    assert cols["main"] == 0 and cols["lay"] == 1 and cols["hours"] == 2
    links = {(k.source, k.target, k.kind) for k in train_links(design)}
    assert ("main", "lay", "mesh") in links
    assert ("hours", "planet", "carrier") in links
    assert ("stud", "planet", "mesh") in links  # the fixed sun is the reaction member
    assert ("moon", "moon_dial", "pinslot") in links
    text = _texts(train_diagram_svg(design, solution))
    assert "day_wheel 96 \u2192 lay_pinion 48" in text
    assert "1 turn in 12 h" in text


def test_uneven_arbors_found_only_behind_a_coupling(demo) -> None:
    design, solution, _ = demo
    assert uneven_arbors(design, solution) == ("moon_dial",)
    plain = load_design(TWO_STAGE)
    assert uneven_arbors(plain, solve_rates(plain)) == ()


def test_preview_plays_the_true_angles(demo) -> None:
    design, solution, positions = demo
    plan = preview_plan(design, solution)
    assert plan.reference == "moon_dial" and not plan.shortened
    assert plan.factor == pytest.approx(plan.cycle_s / plan.duration_s)
    # the fastest arbor moves less than 45 degrees between keyframes
    steps = [np.abs(np.diff(a)).max() for a in plan.angles_deg.values()]
    assert max(steps) < 45.0
    svg = preview_svg(design, positions, plan)
    root = ET.fromstring(svg)
    expected = arbor_angles(design, plan.times_s)
    found = set()
    for g in root.iter(f"{SVG}g"):
        anim = g.find(f"{SVG}animateTransform")
        if anim is None:
            continue
        first = anim.get("values").split(";")
        cx, cy = (float(v) for v in first[0].split()[1:])
        vals = np.array([-float(v.split()[0]) for v in first])
        assert len(vals) == len(plan.times_s)
        for name, angles in expected.items():
            x, y = axis_centres(design, positions)[name]
            if name != "planet" and math.isclose(x, cx) and math.isclose(-y, cy):
                if np.allclose(vals, angles, atol=0.051):  # printed to 0.1 degree
                    found.add(name)
    assert {"main", "hours", "tide", "lay", "moon_lay", "moon", "moon_dial"} <= found
    assert "1 s = " in _texts(svg)


def test_pin_stays_in_its_slot(demo) -> None:
    design, _, positions = demo
    (p,) = design.pinslots
    a_pin, a_slot = design.wheel(p.pin).arbor, design.wheel(p.slot).arbor
    t = np.linspace(0.0, 40 * 86400.0, 401)
    ang = arbor_angles(design, t)
    ax, ay = positions[a_pin]
    bx, by = positions[a_slot]
    u = np.radians(ang[a_pin] + p.bearing_deg)
    s = np.radians(ang[a_slot] + p.bearing_deg)
    px, py = ax + p.radius * np.cos(u) - bx, ay + p.radius * np.sin(u) - by
    # the pin lies on the slot's centre line: cross product of slot direction and pin
    assert np.abs(np.cos(s) * py - np.sin(s) * px).max() < 1e-9


def test_motion_plot_deviation_is_the_coupling_law(demo) -> None:
    design, solution, _ = demo
    (p,) = design.pinslots
    period = float(design.drive.period_s / abs(solution.rate("moon_dial")))
    _, dev, speed = deviation_curve(design, "moon_dial", period)
    # derived, rule of sines: at most arcsin(e / r) = arcsin(0.1) = 5.7392 degrees
    limit = math.degrees(math.asin(p.offset / p.radius))
    assert np.abs(dev).max() == pytest.approx(limit, abs=2e-3)
    # "ahead" is in the arbor's own sense: the demo's moon hand turns clockwise and is
    # furthest ahead after (90 - alpha) / 360 of its turn (see test_cli_motion)
    k = round((90.0 - limit) / 360.0 * (len(dev) - 1))
    assert dev[k] == pytest.approx(limit, abs=0.05)
    assert speed.min() < 1.0 < speed.max()
    svg = motion_plot_svg(design, "moon_dial", period)
    assert svg == motion_plot_svg(design, "moon_dial", period)  # same bytes each time
    ET.fromstring(svg)


def test_part_drawings_are_svg(demo) -> None:
    design = demo[0]
    kinds = set()
    for part in plan_parts(design):
        if part.kind in BOUGHT_KINDS:
            continue  # bought parts get no drawing
        svg = part_svg(part)
        root = ET.fromstring(svg)
        assert root.find(f"{SVG}title").text == part.name
        kinds.add(part.kind)
    assert kinds == {
        "wheel", "arbor", "sleeve", "collar", "dial", "hand", "knob", "plate",
        "pillar", "cock",
    }  # fmt: skip
