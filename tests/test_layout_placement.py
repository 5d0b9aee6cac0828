"""Arbor placement: working centre distance, loops of meshes, carried arbors."""

import math
from pathlib import Path

import pytest

from tests._demo import DEMO
from wheelgen.checks.engine import analyse
from wheelgen.checks.layout_checks import layout_findings
from wheelgen.design.loader import load_design, loads_design
from wheelgen.layout import arbor_positions
from wheelgen.layout.placement import place_axes, working_centre_distance
from wheelgen.teeth.spec import ToothSpec

DATA = Path(__file__).parent / "data" / "layout"

# Triangle a-b-c with sides 25, 35, 30 mm (m = 1: 20+30, 30+40, 20+40 teeth).
# Derived: law of cosines, cos(angle at a) = (25^2 + 30^2 - 35^2) / (2 25 30) = 0.2.
PHI = math.degrees(math.acos(0.2))
C = (30 * math.cos(math.radians(PHI)), 30 * math.sin(math.radians(PHI)))
THETA = math.degrees(math.atan2(C[1], C[0] - 25.0))


def loop_design(bearing_bc: float, bearing_ac: float = PHI):
    text = (DATA / "loop.toml").read_text()
    text = text.replace("BEARING_BC", repr(bearing_bc)).replace(
        "BEARING_AC", repr(bearing_ac)
    )
    return loads_design(text, "loop.toml")


def test_shifted_pair_centre_distance_matches_published_example():
    # KHK Gear Technical Reference / SDP/SI D785 positive-shift table (from memory):
    # m 3, 20 deg, z 12/24, x +0.6/+0.36 -> a = 56.4999 mm (docs/references.md
    # section 7; the ISO 21771 formulas reproduce it)
    a = working_centre_distance(
        ToothSpec(12, 3.0, shift=0.6), ToothSpec(24, 3.0, shift=0.36)
    )
    assert a == pytest.approx(56.4999, abs=5e-5)


def test_external_pair_with_one_shift_matches_published_example():
    # "Cent'r Dist'nce of Profile Shifted Gear Calc", scribd.com/doc/210760271:
    # z 22/118, m 8, x 0/0.5 -> a = 563.8999 mm (docs/references.md section 7)
    a = working_centre_distance(ToothSpec(22, 8.0), ToothSpec(118, 8.0, shift=0.5))
    assert a == pytest.approx(563.8999, abs=5e-5)


def test_closed_loop_passes():
    design = loop_design(THETA)
    placing = place_axes(design)
    assert placing.mismatches == ()
    assert placing.positions["c"] == pytest.approx(C, abs=1e-8)
    assert not [
        f for f in layout_findings(design, analyse(design)) if f.check == "layout.loop"
    ]


def test_loop_perturbed_by_50_micrometres_fails_with_that_distance():
    # turning the b->c bearing by delta moves c along a chord of the 35 mm circle:
    # derived: chord = 2 * 35 * sin(delta / 2) = 0.05 mm
    delta = math.degrees(2 * math.asin(0.05 / 70))
    design = loop_design(THETA + delta)
    (mm,) = place_axes(design).mismatches
    assert mm.axis == "c"
    assert mm.distance == pytest.approx(0.05, abs=1e-9)
    (f,) = [
        f for f in layout_findings(design, analyse(design)) if f.check == "layout.loop"
    ]
    assert f.level == "error"
    assert f.measured == "0.050 mm"
    assert "mesh a2-c2" in f.message and "mesh b2-c1" in f.message


def test_loop_tolerance_is_settable():
    delta = math.degrees(2 * math.asin(0.05 / 70))
    design = loop_design(THETA + delta)
    assert place_axes(design, tolerance=0.06).mismatches == ()


def test_at_and_bearing_disagreeing_is_a_loop_mismatch():
    text = (DATA / "loop.toml").read_text()
    text = text.replace('name = "b"\n', 'name = "b"\nat = [25.03, 0.0]\n', 1)
    design = loads_design(
        text.replace("BEARING_BC", repr(THETA)).replace("BEARING_AC", repr(PHI)),
        "x.toml",
    )
    mismatches = place_axes(design).mismatches
    assert any(
        m.axis in ("a", "b") and m.distance == pytest.approx(0.03) for m in mismatches
    )


def test_demo_positions_follow_meshes_and_pinslot():
    design = load_design(DEMO)
    pos = arbor_positions(design)
    # derived: a = m (z1 + z2) / 2 for unshifted (or equal and opposite shifted) pairs
    assert pos["lay"] == pytest.approx((1.0 * (96 + 48) / 2, 0.0))
    assert pos["moon_lay"] == pytest.approx((-0.9 * (25 + 113) / 2, 0.0))
    assert pos["moon"] == pytest.approx((-62.1, 1.0 * (15 + 98) / 2))
    assert pos["moon_dial"] == pytest.approx((-62.1 + 0.8, 56.5))
    # sleeves stand on their axis; a carried arbor at its carrier's axis + at (angle 0)
    assert pos["tide"] == pos["hours"] == pos["main"] == (0.0, 0.0)
    assert pos["planet"] == pytest.approx((30.8, 0.0))
