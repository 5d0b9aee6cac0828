"""The form cutter of triangular teeth and the feed that reaches the listed sizes.

Derivations used below (on paper, written out beside each check):

- Space angle: a basic triangular tooth of included angle b leans each flank b/2
  towards its middle; the next tooth's middle lies 360/z further round, so the two
  flanks that bound one space meet at b/2 + 360/z + b/2 = b + 360/z. For 60-degree
  teeth on 56 teeth: 60 + 6.428571 = 66.428571 degrees (the figure the cutter must be
  ground to).
- Feed for the thinning, involute: ISO 21771:2007 gives the tooth thickness on the
  reference circle as s = m (pi/2 + 2 x tan a); a cutter fed in by d = -x m takes
  2 d tan a off it, so a thinning t needs d = t / (2 tan a). At 20 degrees and
  t = 0.025 mm (the demo's 0.05 mm backlash, half on each wheel): 0.0343 mm.
- Feed for the thinning, triangular: checked by construction, not by formula: the
  basic tooth's flank lines (taken from the outline the part files are made from)
  are moved along the space's middle by the feed, and the tooth between two moved
  spaces is measured on the pitch circle; the pins are circles tangent to the moved
  flanks.
"""

from __future__ import annotations

import csv
import io
import math
import re
import xml.etree.ElementTree as ET
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from tests._demo import DEMO
from wheelgen.design import load_design
from wheelgen.layout.part_kinds import WheelPart
from wheelgen.parts import plan_parts
from wheelgen.teeth import gear_data
from wheelgen.teeth.forms import outline_for
from wheelgen.teeth.spec import ToothSpec
from wheelgen.teeth.triangular_cut import basic_space_angle_deg, triangular_cut
from wheelgen.workshop.cutter_drawing import cutter_profile
from wheelgen.workshop.cutting import (
    CUTTING_COLUMNS,
    cutting_rows,
    cutting_sheet_writer,
    extra_infeed,
)

DATA = Path(__file__).resolve().parent / "data"


def _tri(z: int, m: float = 1.0, angle: float = 60.0, **kw: float) -> ToothSpec:
    base = dict(addendum=0.6, dedendum=0.85, tip_radius=0.25, root_radius=0.1)
    base.update(kw)
    return ToothSpec(z, m, form="triangular", tooth_angle_deg=angle, **base)


def test_space_angle_for_60_degree_teeth_on_56() -> None:
    # derived: b + 360 / z = 60 + 360 / 56 = 66.428571 degrees
    assert basic_space_angle_deg(56, 60.0) == pytest.approx(66.428571, abs=1e-6)
    cut = triangular_cut(_tri(56, thinning=0.025))
    assert cut.space_angle_deg == pytest.approx(66.428571, abs=1e-6)


@pytest.mark.parametrize(("z", "angle"), [(56, 60.0), (12, 45.0), (120, 58.5)])
def test_cutter_profile_flanks_meet_at_the_space_angle(z: int, angle: float) -> None:
    # measured: the straight flanks of the drawn profile, fitted as lines
    spec = _tri(z, angle=angle)
    prof = cutter_profile(spec)
    cut = triangular_cut(spec)
    depth = cut.full_depth
    chain = prof[:-2]  # without the body's two corners
    steps = np.hypot(*np.diff(chain, axis=0).T)
    sides = []
    for sign in (-1, 1):  # the longest straight step on each side is the flank
        mid = (chain[:-1, 0] + chain[1:, 0]) * sign > 0
        k = int(np.argmax(np.where(mid, steps, 0.0)))
        sides.append(chain[k + 1] - chain[k])
    dl, dr = sides
    between = math.degrees(math.acos(abs(dl @ dr) / (np.hypot(*dl) * np.hypot(*dr))))
    assert between == pytest.approx(basic_space_angle_deg(z, angle), abs=1e-6)
    # tip to rim is the full depth (the rim is y = 0)
    assert -prof[:, 1].min() == pytest.approx(depth, abs=2e-3)


def _flank_lines(spec: ToothSpec) -> tuple[np.ndarray, np.ndarray]:
    """Point and unit direction of the lower straight flank of the tooth on +x."""
    lines = [s for s in outline_for(spec).tooth if s.kind == "line"]
    lower = min(lines, key=lambda s: float(s.points[:, 1].mean()))
    p, q = lower.points
    d = (q - p) / np.hypot(*(q - p))
    return p, d


def _cross_circle(p: np.ndarray, d: np.ndarray, radius: float) -> np.ndarray:
    b, c = 2 * p @ d, p @ p - radius * radius
    t = (-b + math.sqrt(b * b - 4 * c)) / 2
    return p + t * d


@pytest.mark.parametrize(
    ("z", "m", "angle", "thinning"),
    [(56, 1.0, 60.0, 0.025), (60, 0.8, 57.0, 0.04), (15, 2.0, 48.0, 0.1)],
)
def test_triangular_feed_reaches_the_thinning_and_the_pins(
    z: int, m: float, angle: float, thinning: float
) -> None:
    spec = _tri(z, m, angle, thinning=thinning)
    cut = triangular_cut(spec)
    assert cut.infeed == pytest.approx(cut.full_depth + cut.extra_infeed)
    p, d = _flank_lines(replace(spec, thinning=0.0))
    # the space below the tooth on +x has its middle at -180/z degrees: the feed moves
    # the cutter (and its flank) along that middle towards the centre
    a = -math.pi / z
    axis = np.array([math.cos(a), math.sin(a)])
    moved = p - cut.extra_infeed * axis
    r = m * z / 2
    q = _cross_circle(moved, d, r)
    half = -math.atan2(q[1], q[0])  # the tooth is symmetric about +x
    assert 2 * r * half == pytest.approx(math.pi * m / 2 - thinning, abs=1e-9)
    # the pin: a circle of the listed diameter touching both moved flanks of that
    # space, its centre on the space's middle (the other flank is the mirror image
    # about that middle)
    normal = np.array([-d[1], d[0]])  # d runs outward: this points into the tooth
    rho = cut.pin_diameter / 2
    # centre c * axis, rho from the moved line on the space's side:
    # normal . (c axis - moved) = -rho
    c = (normal @ moved - rho) / (normal @ axis)
    over = 2 * c + cut.pin_diameter
    if z % 2:
        over = 2 * c * math.cos(math.pi / (2 * z)) + cut.pin_diameter
    assert cut.over_pins == pytest.approx(over, abs=1e-9)
    # it touches near the pitch circle and stands proud of the tips
    touch = c * axis + rho * normal
    assert float(np.hypot(*touch)) == pytest.approx(r, abs=0.01)
    assert c + rho > r + spec.addendum * m


def test_involute_feed_equals_a_negative_shift() -> None:
    # derived (module docstring): at 20 degrees, t = 0.025 mm: 0.025 / (2 tan 20)
    assert extra_infeed(0.025, 20.0) == pytest.approx(0.034343, abs=1e-6)
    thinned = ToothSpec(40, 1.0, thinning=0.025)
    d = extra_infeed(0.025, 20.0)
    shifted = ToothSpec(40, 1.0, shift=-d / 1.0)
    # ISO 21771 span and thickness of a wheel cut d deeper without thinning
    assert gear_data(thinned).span_width == pytest.approx(
        gear_data(shifted).span_width, abs=1e-12
    )
    (row,) = cutting_rows([WheelPart("w", thinned, 3.0, 3.0)])
    assert row.infeed == pytest.approx(row.full_depth + d, abs=1e-12)
    assert row.thinning == 0.025


def test_demo_sheet_states_the_feed_and_draws_the_cutter(tmp_path: Path) -> None:
    design = load_design(DEMO)
    parts = plan_parts(design)
    paths = cutting_sheet_writer(design, parts, [], tmp_path)
    names = sorted(str(p.relative_to(tmp_path)) for p in paths)
    assert names == ["cutters/moon_disc.svg", "cutting.csv"]
    table = list(csv.DictReader(io.StringIO((tmp_path / "cutting.csv").read_text())))
    assert tuple(table[0]) == CUTTING_COLUMNS
    for row in table:
        thinning = float(row["thinning_mm"])
        assert float(row["infeed_mm"]) > float(row["full_depth_mm"])
        assert f"thinning of {thinning:.4f} mm" in row["notes"]
        assert row["over_pins_mm"] != ""
    (disc,) = [r for r in table if r["form"] == "triangular"]
    spec = next(p.tooth for p in parts if p.name == "moon_disc")
    cut = triangular_cut(spec)
    assert float(disc["space_angle_deg"]) == pytest.approx(
        spec.tooth_angle_deg + 6.0, abs=1e-4
    )  # derived: 360 / 60 teeth
    assert disc["cutter_drawing"] == "cutters/moon_disc.svg"
    # the drawing: its page in mm, the 1:1 profile as deep and wide as the cutter
    root = ET.parse(tmp_path / "cutters" / "moon_disc.svg").getroot()
    assert root.get("width", "").endswith("mm")
    view = [float(v) for v in root.get("viewBox", "").split()]
    assert float(root.get("width", "0mm")[:-2]) == pytest.approx(view[2])
    ns = {"s": "http://www.w3.org/2000/svg"}
    poly = root.find(".//s:polygon[@id='moon_disc-profile-1to1']", ns)
    assert poly is not None
    pts = np.array(
        [[float(v) for v in xy.split(",")] for xy in poly.get("points", "").split()]
    )
    assert pts[:, 1].max() - pts[:, 1].min() == pytest.approx(
        cut.full_depth + float(cutter_profile(spec)[:, 1].max()), abs=1e-3
    )
    bar = root.find(".//s:g[@id='moon_disc-check-bar']/s:line", ns)
    assert bar is not None
    assert float(bar.get("x2", "0")) - float(bar.get("x1", "0")) == pytest.approx(10.0)
    text = " ".join(t.text or "" for t in root.iter("{http://www.w3.org/2000/svg}text"))
    assert re.search(rf"{cut.space_angle_deg:.4f}", text)


def test_printed_design_gets_no_cutting_sheet(tmp_path: Path) -> None:
    design = load_design(DATA / "frame" / "print_week.toml")
    assert cutting_sheet_writer(design, plan_parts(design), [], tmp_path) == []
    assert not (tmp_path / "cutting.csv").exists()


def test_gear_command_gives_the_same_cutter() -> None:
    import json

    from click.testing import CliRunner

    from wheelgen.cli import main

    args = ["gear", "--form", "triangular", "-z", "56", "-m", "1", "--tooth-angle",
            "60", "--process", "mill"]  # fmt: skip
    text = CliRunner().invoke(main, args).output
    data = json.loads(CliRunner().invoke(main, [*args, "--json"]).output)
    cutter = data["form_cutter"]
    assert cutter["space_angle_deg"] == pytest.approx(66.428571, abs=1e-6)  # derived
    assert "66.4286 deg included (the basic space)" in text
    assert f"{cutter['over_pins']:.4f} mm across two pins" in text
    assert cutter["infeed"] == pytest.approx(
        cutter["full_depth"] + cutter["extra_infeed"]
    )
