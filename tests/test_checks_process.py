"""Process checks: printing, milling and hand-filing limits, passing and failing."""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from wheelgen.checks.process_checks import (
    check_cutter_fits,
    check_process,
    cutter_depth_lost,
    design_process_checks,
    space_width_at,
    tooth_width_at,
)
from wheelgen.design.loader import load_design
from wheelgen.design.model import Process
from wheelgen.findings import Finding
from wheelgen.teeth.forms import outline_for
from wheelgen.teeth.outline import Segment, WheelOutline
from wheelgen.teeth.spec import ToothSpec

DATA = Path(__file__).parent / "data" / "checks"


def _by_check(findings: list[Finding]) -> dict[str, list[Finding]]:
    out: dict[str, list[Finding]] = {}
    for f in findings:
        assert f.subject in f.message  # every message names its subject
        out.setdefault(f.check, []).append(f)
    return out


def v_wheel(z: int, r_tip: float, r_root: float) -> WheelOutline:
    """Sharp triangular teeth meeting in a sharp V at the root."""
    p = 2 * math.pi / z
    pts = np.array(
        [
            [r_root * math.cos(-p / 2), r_root * math.sin(-p / 2)],
            [r_tip, 0.0],
            [r_root * math.cos(p / 2), r_root * math.sin(p / 2)],
        ]
    )
    segs = (Segment("line", pts[:2]), Segment("line", pts[1:]))
    return WheelOutline(z, segs, {"tip": r_tip, "root": r_root})


# --- measuring the outline


def test_tooth_and_space_width_on_the_reference_circle():
    # ISO 21771 / SDP D785: on the reference circle an unshifted tooth is p/2 = pi m / 2
    # thick (an arc), and the space is the rest of the pitch
    shape = outline_for(ToothSpec(20, 1.0))
    assert tooth_width_at(shape, 10.0) == pytest.approx(math.pi / 2, abs=5e-4)
    assert space_width_at(shape, 10.0) == pytest.approx(math.pi / 2, abs=5e-4)
    # derived: thinning comes off the tooth and goes to the space
    thin = outline_for(ToothSpec(20, 1.0, thinning=0.1))
    assert tooth_width_at(thin, 10.0) == pytest.approx(math.pi / 2 - 0.1, abs=5e-4)


def test_cutter_in_a_v_shaped_space():
    # derived: a circle of radius rho in a V of half-angle phi touches both flanks with
    # its centre rho / sin(phi) from the apex, so its lowest point stays
    # rho (1 / sin(phi) - 1) above the apex
    z, r_tip, r_root = 12, 7.0, 5.0
    shape = v_wheel(z, r_tip, r_root)
    p = 2 * math.pi / z
    apex = np.array([r_root * math.cos(p / 2), r_root * math.sin(p / 2)])
    to_tip = np.array([r_tip, 0.0]) - apex
    u = apex / np.linalg.norm(apex)
    phi = math.acos(float(to_tip @ u) / float(np.linalg.norm(to_tip)))
    for cutter in (0.2, 0.5, 1.0, 4.0):
        expected = cutter / 2 * (1 / math.sin(phi) - 1)
        assert cutter_depth_lost(shape, cutter) == pytest.approx(expected, abs=1e-4)


def test_cutter_too_wide_for_the_flanks_rests_on_the_tips():
    # derived: for a 6 mm mill the flank tangent point rho / tan(phi) lies beyond the
    # flank's end, so the mill rests on the two tip corners: its centre is 3 mm from the
    # tip (7, 0) on the 15 deg bisector, rc^2 - 14 cos(15) rc + 49 - 9 = 0
    b = 14.0 * math.cos(math.radians(15.0))
    rc = (b + math.sqrt(b * b - 4 * 40.0)) / 2
    assert cutter_depth_lost(v_wheel(12, 7.0, 5.0), 6.0) == pytest.approx(
        rc - 3.0 - 5.0, abs=1e-6
    )


def test_small_cutter_reaches_the_root_of_involute_teeth():
    # derived: the ISO 53 A root fillet is 0.38 m, so a mill of 0.5 m diameter and less
    # reaches the root circle; a mill of 1.5 m cannot
    shape = outline_for(ToothSpec(20, 1.0))
    assert cutter_depth_lost(shape, 0.5) < 0.01
    assert cutter_depth_lost(shape, 1.5) > 0.25


# --- one wheel


def test_print_limits_pass_for_a_coarse_wheel():
    printed = Process(kind="print", nozzle=0.4, layer=0.2)
    assert (
        check_process(
            ToothSpec(20, 1.0, thinning=0.1),
            printed,
            "wheel w1",
            face_width=3.0,
            web=3.0,
        )
        == []
    )


def test_print_limits_fail_for_a_fine_wheel():
    # derived: m = 0.25, tip 1 m above the reference circle: half a nozzle (0.2 mm)
    # below the tip the tooth is 0.3 mm wide; the space 0.2 mm above the root about
    # 0.2 mm
    printed = Process(kind="print", nozzle=0.4, layer=0.2)
    found = _by_check(
        check_process(ToothSpec(20, 0.25), printed, "wheel w1", face_width=0.6, web=0.5)
    )
    assert set(found) == {
        "process.tip_width",
        "process.root_gap",
        "process.face_layers",
        "process.wall",
    }
    assert found["process.tip_width"][0].level == "error"
    # 0.5 mm is less than two 0.4 mm lines side by side: a printer cannot make it
    assert found["process.wall"][0].level == "error"
    # the nozzle sets the limit: a 0.15 mm nozzle prints the same teeth
    fine = Process(kind="print", nozzle=0.15, layer=0.1)
    found = _by_check(
        check_process(ToothSpec(20, 0.25), fine, "wheel w1", face_width=0.6)
    )
    assert "process.tip_width" not in found and "process.root_gap" not in found


def test_face_layers_is_settable():
    printed = Process(kind="print", layer=0.2, min_layers=3)
    found = check_process(ToothSpec(20, 1.0), printed, "wheel w1", face_width=0.6)
    assert "process.face_layers" not in _by_check(found)


def test_mill_cutter_root():
    spec = ToothSpec(20, 1.0)
    assert check_process(spec, Process(kind="mill", cutter=0.5), "wheel w1") == []
    found = _by_check(check_process(spec, Process(kind="mill", cutter=1.5), "wheel w1"))
    assert [f.level for f in found["process.cutter_root"]] == ["error"]


def test_hand_module_limit_is_settable():
    spec = ToothSpec(30, 0.4)
    found = _by_check(check_process(spec, Process(kind="hand"), "wheel w1"))
    assert [f.level for f in found["process.hand_module"]] == ["error"]
    assert (
        check_process(spec, Process(kind="hand", min_module_hand=0.3), "wheel w1") == []
    )


def test_cutter_fits():
    assert check_cutter_fits(1.0, 1.5, "coupling c1", "pin slot") == []
    found = check_cutter_fits(2.0, 1.5, "coupling c1", "pin slot")
    assert [f.check for f in found] == ["process.cutter_fit"]
    assert "coupling c1" in found[0].message


# --- whole designs


@pytest.mark.parametrize("name", ["print_ok", "mill_ok", "hand_ok", "good_pair"])
def test_designs_that_pass(name):
    assert design_process_checks(load_design(DATA / f"{name}.toml")) == []


def test_printed_design_too_fine():
    found = _by_check(design_process_checks(load_design(DATA / "print_fine.toml")))
    for check in ("process.tip_width", "process.root_gap", "process.face_layers"):
        assert {f.subject for f in found[check]} == {"wheel w1", "wheel w2"}
    assert "wheel w2" in {f.subject for f in found["process.wall"]}


def test_milled_design_with_a_big_cutter():
    found = _by_check(design_process_checks(load_design(DATA / "mill_big_cutter.toml")))
    assert {f.subject for f in found["process.cutter_root"]} == {
        "wheel w1",
        "wheel w2",
        "wheel w3",
    }
    fits = {
        (f.subject, f.message.split("wider than the ")[1])
        for f in found["process.cutter_fit"]
    }
    assert fits == {
        ("coupling c1", "pin slot"),
        ("wheel w2", "spoke windows (radial room)"),
    }


def test_hand_design_too_fine():
    found = _by_check(design_process_checks(load_design(DATA / "hand_fine.toml")))
    assert {f.subject for f in found["process.hand_module"]} == {"wheel w1", "wheel w2"}


def test_bores_from_the_layout_override():
    design = load_design(DATA / "print_ok.toml")
    # derived: w1 root circle 8.75 mm radius; a 17 mm bore leaves a 0.25 mm web
    found = _by_check(design_process_checks(design, bores={"w1": 17.0}))
    assert [f.subject for f in found["process.wall"]] == ["wheel w1"]


def test_design_with_teeth_that_cannot_be_made_is_left_to_the_wheel_checks():
    assert design_process_checks(load_design(DATA / "bad_teeth.toml")) == []
