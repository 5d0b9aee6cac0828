"""Every mesh is checked at the distance between its arbors' final positions.

The train in tests/data/layout/closing_train.toml goes out from the centre by two meshes
with bearings and comes back to a tube on the centre by a mesh without one. Module 1,
20 + 40 teeth: every working centre distance is m (z1 + z2) / 2 = 30 mm. With the
bearings 0 and 120 degrees the arbors form an equilateral triangle with the centre, so
the closing pair stands exactly 30 mm apart (derived: three sides of 30 mm).
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from tests._advice import apply_to_text, recheck
from wheelgen.checks import run_checks
from wheelgen.design import loads_design
from wheelgen.findings import Finding
from wheelgen.layout import plan_layout
from wheelgen.layout.centres import mesh_centres, move_for

TRAIN = (Path(__file__).parent / "data" / "layout" / "closing_train.toml").read_text()


def _train(bearing: float) -> str:
    assert TRAIN.count("bearing = 120.0") == 1
    return TRAIN.replace("bearing = 120.0", f"bearing = {bearing!r}")


def _closing_gap(bearing_deg: float) -> float:
    # derived: law of cosines in the triangle centre - a - b, sides 30 and 30 with the
    # angle at a of 180 - bearing degrees; the closing pair wants 30 mm
    angle = math.radians(180.0 - bearing_deg)
    return math.sqrt(2 * 30.0**2 - 2 * 30.0**2 * math.cos(angle)) - 30.0


def test_the_exact_train_passes():
    assert run_checks(loads_design(_train(120.0), "train.toml")) == []


@pytest.mark.parametrize("bearing", [121.0, 120.2, 119.8])
def test_a_bearing_off_is_an_error_at_the_closing_mesh(bearing: float) -> None:
    text = _train(bearing)
    found = run_checks(loads_design(text, "train.toml"))
    errors = [f for f in found if f.level == "error"]
    assert len(errors) == 1, [f.check for f in found]
    (cause,) = errors
    assert (cause.check, cause.subject) == ("mesh.centre_distance", "mesh b2-t1")
    # it names both arbors, the wanted and the measured distance
    gap = _closing_gap(bearing)
    assert '"b"' in cause.message and '"out"' in cause.message
    assert "30.0000 mm" in cause.message
    assert f"{30.0 + gap:.4f} mm" in cause.message
    side = "too close" if gap < 0 else "too far apart"
    assert side in cause.message
    # and the change that closes the train: the bearing that placed "b"
    assert [str(c) for c in cause.changes] == ["bearing = 120.0 on the 2nd [[mesh]]"]
    # following it clears the finding (and everything it brought)
    _, again = recheck(text, cause, run_checks)
    assert again == []


def test_one_degree_off_is_the_figure_worked_out_by_hand():
    # derived (see _closing_gap): 2 * 30 * sin(59.5 deg) - 30 = -0.4546 mm
    layout = plan_layout(loads_design(_train(121.0), "train.toml"))
    (closing,) = [mc for mc in mesh_centres(layout) if mc.mesh.index == 3]
    assert closing.error == pytest.approx(_closing_gap(121.0), abs=1e-9)
    assert closing.error == pytest.approx(-0.4546, abs=5e-5)


def test_the_move_keeps_the_pivot_and_closes_the_loop():
    layout = plan_layout(loads_design(_train(121.0), "train.toml"))
    off = [mc for mc in mesh_centres(layout) if abs(mc.error) > 0.02]
    (move,) = move_for(layout, off)
    a = layout.placing.positions["a"]
    assert move.axis == "b"
    assert math.dist(move.to, a) == pytest.approx(30.0, abs=1e-9)
    assert math.dist(move.to, (0.0, 0.0)) == pytest.approx(30.0, abs=1e-9)


def test_an_at_that_closes_a_train_is_moved_along_the_line_of_centres():
    # give b its own 'at' instead of the 2nd mesh's bearing, 0.3 mm too far out
    b = (15.0 * 1.01, 25.98076211353316 * 1.01)
    text = (
        _train(120.0)
        .replace("bearing = 120.0\n", "")
        .replace('name = "b"\n', f'name = "b"\nat = [{b[0]!r}, {b[1]!r}]\n')
    )
    design = loads_design(text, "train.toml")
    causes = [f for f in run_checks(design) if f.check == "mesh.centre_distance"]
    assert len(causes) == 1
    (change,) = causes[0].changes
    assert change.key == "at" and change.name == "b"
    _, again = recheck(text, causes[0], run_checks)
    assert not [f for f in again if f.check == "mesh.centre_distance"]


def test_the_edit_is_made_in_the_file_text():
    text = _train(121.0)
    (cause,) = run_checks(loads_design(text, "train.toml"))
    edited = apply_to_text(text, cause.changes)
    assert loads_design(edited, "edited.toml").meshes[1].bearing_deg == 120.0


def _planet_findings(text: str) -> list[Finding]:
    return run_checks(loads_design(text, "planet.toml"))


def test_a_misplaced_planet_is_one_error_with_its_consequences():
    from tests._demo import DEMO_TEXT

    text = DEMO_TEXT.replace("at = [30.8, 0.0]", "at = [30.05, 0.0]")
    found = _planet_findings(text)
    errors = [f for f in found if f.level != "note"]
    assert len(errors) == 1
    (cause,) = errors
    assert (cause.check, cause.subject) == ("mesh.centre_distance", "arbor planet")
    # both meshes of the planet, each with its arbors and distances, in one message
    assert "mesh planet_pinion-tide_wheel" in cause.message
    assert "mesh sun-planet_wheel" in cause.message
    assert cause.message.count("30.0500 mm apart") == 2
    # derived: the working distance of 13 + 64 (and 11 + 66) teeth at m = 0.8 with
    # shifts +0.4 / -0.4 is m (z1 + z2) / 2 = 30.8 mm
    assert [str(c) for c in cause.changes] == ['at = [30.8, 0.0] on arbor "planet"']
    brought = {(f.check, f.subject) for f in cause.consequences}
    assert ("mesh.jam", "mesh sun-planet_wheel") in brought
    assert ("mesh.jam", "mesh planet_pinion-tide_wheel") in brought
    _, again = recheck(text, cause, run_checks)
    assert [f for f in again if f.level != "note"] == []
