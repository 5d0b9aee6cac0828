"""Advice that works: every numeric "change:" names a key of the format and a value that
clears the finding, and one wrong placement is reported once, as the cause.

Each design below makes one kind of finding with a number in its advice. The test
edits the train file as a user would (tests/_advice.py: the key, on the item, set to
the value), checks again and requires the finding to be gone.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from tests._advice import recheck
from tests._demo import demo_text
from wheelgen.checks import analyse, run_checks
from wheelgen.design import loads_design
from wheelgen.findings import Finding, findings_table

DATA = Path(__file__).parent / "data"


def _text(name: str) -> str:
    return (DATA / name).read_text()


PRINT_WALL = demo_text(
    ('process = "mill"', 'process = "print"'),
    ('cutter = 0.5            # mm: the end mill used for profiles and slots\n'
     'fit = "H7/g6"           # running fit of bores on arbors and tubes',
     "min_wall = 0.2"),
)  # fmt: skip

#: (design text, check id whose advice carries a number)
CASES = [
    ("two_stage.toml", "wheel.undercut"),
    ("checks/print_fine.toml", "mesh.backlash"),
    ("checks/print_fine.toml", "process.face_layers"),
    ("checks/mill_big_cutter.toml", "process.cutter_fit"),
    ("checks/close_axes.toml", "mesh.centre_distance"),
    ("checks/planet_off.toml", "mesh.centre_distance"),
    ("checks/bad_teeth.toml", "wheel.teeth"),
    ("print_wall", "process.min_wall"),
    ("plates_in_cm", "layout.outside_plates"),
    ("one_wheel_out", "layout.outside_plates"),
    ("checks/triangular_tight.toml", "mesh.jam"),
]

_VARIANTS = {
    "print_wall": PRINT_WALL,
    "plates_in_cm": demo_text(("plates = [0.0, 40.0]", "plates = [0.0, 4.0]")),
    "one_wheel_out": demo_text(
        ('name = "moon_disc"\narbor = "moon_dial"\nteeth = 60\nheight = 13.0',
         'name = "moon_disc"\narbor = "moon_dial"\nteeth = 60\nheight = 39.0'),
    ),
}  # fmt: skip


def _source(name: str) -> str:
    return _VARIANTS[name] if name in _VARIANTS else _text(name)


def _flat(found: list[Finding]) -> list[Finding]:
    return [g for f in found for g in f.every()]


@pytest.mark.parametrize(("name", "check"), CASES)
def test_numeric_advice_clears_its_finding(name: str, check: str) -> None:
    text = _source(name)
    found = [f for f in run_checks(loads_design(text, "case.toml")) if f.check == check]
    assert found, f"{name}: no {check}"
    for finding in found:
        assert finding.changes, finding.advice
        _, again = recheck(text, finding, run_checks)
        left = {(f.check, f.subject) for f in again}
        assert (finding.check, finding.subject) not in left, finding.advice


@pytest.mark.parametrize("name", sorted({n for n, _ in CASES}))
def test_every_number_in_advice_is_a_change(name: str) -> None:
    for f in _flat(run_checks(loads_design(_source(name), "case.toml"))):
        if re.search(r"\d", f.advice):
            assert f.changes, f"{f.check}: {f.advice}"
        for c in f.changes:
            assert str(c) in f.advice, (str(c), f.advice)


def test_a_print_wall_under_two_lines_is_an_error():
    result = analyse(loads_design(PRINT_WALL, "print.toml"))
    (wall,) = [f for f in result.findings if f.check == "process.min_wall"]
    assert wall.level == "error"
    # derived: two lines of the default 0.4 mm nozzle
    assert [str(c) for c in wall.changes] == ["min_wall = 0.8 on [process]"]
    # and no tube is made thinner than two lines
    from wheelgen.layout import plan_layout

    sizes = plan_layout(result.design).sizes
    assert sizes and min(s.wall for s in sizes.values()) >= 0.8 - 1e-9


def test_plates_in_the_wrong_unit_are_one_cause():
    found = run_checks(loads_design(_source("plates_in_cm"), "cm.toml"))
    errors = [f for f in found if f.level == "error"]
    assert len(errors) == 1
    (cause,) = errors
    assert cause.subject == "[frame] plates" and len(cause.consequences) >= 13
    text = findings_table(found)
    assert text.splitlines()[-1].startswith("1 error(s)")


def test_summary_counts_causes():
    text = demo_text(("at = [30.8, 0.0]", "at = [31.55, 0.0]"))
    found = run_checks(loads_design(text, "planet.toml"))
    table = findings_table(found)
    assert table.splitlines()[-1].startswith("1 error(s), 0 warning(s), 2 note(s)")
    assert "follow from them" in table.splitlines()[-1]
