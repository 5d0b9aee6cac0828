"""Each wheel's angle at rest: every pair interleaves on its line of centres.

The check is independent of the phasing rule: each wheel's generated outline is put
where the parts put it (position and ``Pose.angle_deg``) and the two polygons of
every meshing pair are tested for overlap with matplotlib's point-in-polygon test. The
same test at angle 0 finds overlaps, so it can fail.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest
from click.testing import CliRunner
from matplotlib.path import Path as PolyPath

from tests._demo import DEMO_TEXT
from wheelgen.checks import run_checks
from wheelgen.cli import main
from wheelgen.design import load_design, loads_design
from wheelgen.design.model import Design
from wheelgen.layout import plan_layout
from wheelgen.layout.part_kinds import WheelPart
from wheelgen.layout.phasing import rest_angles
from wheelgen.layout.placement import arbor_positions
from wheelgen.parts import plan_parts
from wheelgen.teeth.forms import outline_for

DATA = Path(__file__).parent / "data" / "layout"
EPICYCLIC = DATA / "epicyclic_nested.toml"

LOOP = (DATA / "loop_misfit.toml").read_text()


def _polygon(part: WheelPart, turn_deg: float = 0.0) -> np.ndarray:
    poly = outline_for(part.tooth).polyline(0.002)
    a = math.radians(part.placement.angle_deg + turn_deg)
    c, s = math.cos(a), math.sin(a)
    turned = poly @ np.array([[c, s], [-s, c]])
    return turned + np.array([part.placement.x, part.placement.y])


def _overlap(p: np.ndarray, q: np.ndarray) -> bool:
    return bool(
        PolyPath(q).contains_points(p).any() or PolyPath(p).contains_points(q).any()
    )


def _wheels(design: Design) -> dict[str, WheelPart]:
    return {p.name: p for p in plan_parts(design) if isinstance(p, WheelPart)}


@pytest.mark.parametrize(
    "design",
    [loads_design(DEMO_TEXT, "demo.toml"), load_design(EPICYCLIC)],
    ids=["demo", "epicyclic"],
)
def test_every_pair_interleaves_where_the_parts_stand(design: Design) -> None:
    wheels = _wheels(design)
    for m in design.meshes:
        a, b = (wheels[n] for n in m.pair)
        assert not _overlap(_polygon(a), _polygon(b)), m.label
    assert rest_angles(design).misfits == ()


def test_at_angle_zero_the_demo_pairs_overlap():
    # what the parts were before they were phased: the test above can fail
    design = loads_design(DEMO_TEXT, "demo.toml")
    wheels = _wheels(design)
    overlapping = []
    for m in design.meshes:
        a, b = (wheels[n] for n in m.pair)
        pa = _polygon(a, -a.placement.angle_deg)
        pb = _polygon(b, -b.placement.angle_deg)
        if _overlap(pa, pb):
            overlapping.append(m.label)
    assert overlapping


def test_a_loop_that_cannot_interleave_is_reported_with_its_misfit():
    design = loads_design(LOOP, "loop.toml")
    (misfit,) = rest_angles(design).misfits
    assert misfit.mesh.pair == ("wc", "wd")
    found = [f for f in run_checks(design) if f.check == "layout.phasing"]
    assert len(found) == 1 and f"{misfit.misfit_deg:+.4f} deg" in found[0].message
    # independent: at rest the closing pair overlaps; turned by the misfit it
    # interleaves, and then the pair that placed it overlaps instead
    wheels = _wheels(design)
    wb, wc, wd = wheels["wb"], wheels["wc"], wheels["wd"]
    assert _overlap(_polygon(wc), _polygon(wd))
    assert not _overlap(_polygon(wc), _polygon(wd, misfit.misfit_deg))
    assert _overlap(_polygon(wb), _polygon(wd, misfit.misfit_deg))


def test_the_pin_stands_on_the_offset_line_at_rest():
    design = loads_design(DEMO_TEXT, "demo.toml")
    wheels = _wheels(design)
    (link,) = design.pinslots
    pin, slot = wheels[link.pin], wheels[link.slot]
    assert pin.pin is not None and slot.slot is not None
    turn = pin.placement.angle_deg + pin.pin.angle_deg
    assert math.isclose(turn, link.bearing_deg, abs_tol=1e-9)
    assert math.isclose(
        slot.placement.angle_deg + slot.slot.angle_deg, link.bearing_deg, abs_tol=1e-9
    )


def test_a_carried_arbor_stands_in_its_hole_at_rest():
    design = loads_design(DEMO_TEXT, "demo.toml")
    hour = _wheels(design)["hour_wheel"]
    ((x, y, d),) = hour.holes
    a = math.radians(hour.placement.angle_deg)
    at = (
        hour.placement.x + x * math.cos(a) - y * math.sin(a),
        hour.placement.y + x * math.sin(a) + y * math.cos(a),
    )
    planet = plan_layout(design).position("planet")
    assert planet is not None
    assert math.dist(at, planet) < 1e-9
    # the running bore of a 2 mm arbor: H7 over 1 up to 3 mm, 0 to +10 um (ISO
    # 286-1:2010, Table 1, IT7 = 10 um), modelled in the middle of its zone
    assert d == pytest.approx(2.005)


def test_preview_and_motion_use_the_same_rest_angles():
    from wheelgen.kinematics import solve_rates
    from wheelgen.workshop.preview import preview_plan, preview_svg

    design = loads_design(DEMO_TEXT, "demo.toml")
    angles = {p.name: p.placement.angle_deg for p in _wheels(design).values()}
    assert angles == rest_angles(design).angles_deg
    assert any(a != 0.0 for a in angles.values())
    plan = preview_plan(design, solve_rates(design))
    positions = arbor_positions(design)
    shown = preview_svg(design, positions, plan)
    assert shown == preview_svg(design, positions, plan, angles)
    assert shown != preview_svg(design, positions, plan, {})
    demo = (
        Path(__file__).parents[1] / "wheelgen" / "designs" / "harbour_tide_clock.toml"
    )
    result = CliRunner().invoke(main, ["motion", str(demo), "--json"])
    assert result.exit_code == 0, result.output
    assert json.loads(result.output)["rest_angles_deg"] == angles
