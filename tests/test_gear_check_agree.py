"""``wheelgen gear`` and ``wheelgen check`` give one wheel and one pair the same verdicts.

Each case is run twice: through ``wheelgen gear --json`` (the data sheet of the wheel,
with ``--mate`` of the pair) and through ``wheelgen check`` on a train file holding the
same two wheels in mesh. The verdicts (check id and level) on the wheel and on the pair
must be the same. The cases straddle the limits: the tip thickness of 12 teeth at
shift 0.56 is 0.236 mm, under 0.25 module (derived: ISO 21771 tooth thickness on the tip
circle; the case the two commands once judged differently).
"""

from __future__ import annotations

import json

import pytest
from click.testing import CliRunner

from wheelgen.checks import run_checks
from wheelgen.cli import main
from wheelgen.design import loads_design

#: (teeth, shift, mate teeth, mate shift, backlash mm); module 1 mm, 20 degrees.
CASES = [
    (12, 0.56, 40, 0.0, 0.05),  # nearly pointed tips
    (10, 1.0, 40, 0.0, 0.05),  # pointed tips
    (12, 0.0, 40, 0.0, 0.05),  # undercut pinion
    (20, 0.0, 40, 0.0, 0.05),  # nothing to say
    (20, 0.0, 40, 0.0, 0.01),  # backlash under the mill's 0.02 mm
    (20, 0.0, 40, 0.0, 0.02),  # exactly the mill's limit: passes
    (8, 0.0, 9, 0.0, 0.05),  # small pair: undercut, interference, short contact
    (14, 0.5, 30, -0.5, 0.05),  # shifted pair at its working distance
]


def _design(z1: int, x1: float, z2: int, x2: float, backlash: float) -> str:
    return f"""
[design]
title = "agreement"
process = "mill"

[process]
cutter = 0.1

[defaults]
module = 1.0
backlash = {backlash!r}

[drive]
arbor = "a"
period = "1 h"

[[arbor]]
name = "a"
at = [0.0, 0.0]

[[arbor]]
name = "b"

[[wheel]]
name = "wheel"
arbor = "a"
teeth = {z1}
shift = {x1!r}

[[wheel]]
name = "mate"
arbor = "b"
teeth = {z2}
shift = {x2!r}

[[mesh]]
pair = ["wheel", "mate"]
bearing = 0.0
"""


def _verdicts(
    findings: list[dict], subjects: dict[str, str]
) -> set[tuple[str, str, str]]:
    return {
        (subjects[f["subject"]], f["check"], f["level"])
        for f in findings
        if f["subject"] in subjects
    }


@pytest.mark.parametrize(("z1", "x1", "z2", "x2", "backlash"), CASES)
def test_gear_and_check_agree(z1, x1, z2, x2, backlash):
    args = ["gear", "-z", str(z1), "-m", "1", "--shift", repr(x1), "--json"]
    args += ["--backlash", repr(backlash), "--mate", str(z2), "--mate-shift", repr(x2)]
    result = CliRunner().invoke(main, args)
    assert result.exit_code == 0, result.output
    gear = _verdicts(
        json.loads(result.output)["findings"],
        {"wheel": "wheel", "mate": "mate", "mesh": "mesh"},
    )
    design = loads_design(_design(z1, x1, z2, x2, backlash), "agree.toml")
    found = [g.as_dict() for f in run_checks(design) for g in f.every()]
    check = _verdicts(
        found,
        {"wheel wheel": "wheel", "wheel mate": "mate", "mesh wheel-mate": "mesh"},
    )
    assert gear == check


def test_the_case_once_judged_differently_is_a_warning_in_both():
    result = CliRunner().invoke(
        main, ["gear", "-z", "12", "-m", "1", "--shift", "0.56"]
    )
    assert "nearly pointed teeth: tip thickness 0.2358 mm" in result.output
    design = loads_design(_design(12, 0.56, 40, 0.0, 0.0), "agree.toml")
    tips = [f for f in run_checks(design) if f.check == "wheel.pointed_tip"]
    assert [(f.subject, f.level) for f in tips] == [("wheel wheel", "warning")]
    assert "0.2358 mm" in tips[0].message
