"""Wheels cut to a diametral pitch: module, inch proportions and the workshop sizes.

Sources, each named again beside its values:

- [Mott] R. L. Mott, *Machine Elements in Mechanical Design*, 4th ed., Table 8-4,
  "Formulas for gear-tooth features for 20 deg pressure angle, full-depth involute
  system" (p. 314): coarse pitch (P < 20) addendum 1/P, dedendum 1.25/P, clearance
  0.25/P; fine pitch (P >= 20) addendum 1/P, dedendum 1.200/P + 0.002, clearance
  0.200/P + 0.002 (inches).
- [PIC] PIC Design, "Gear Pitch Equivalents", Table 7.2 "Spur Gear Data" (addendum,
  dedendum and whole depth of the standard stock pitches, inches, 4 decimals; its
  rows from 24 DP agree with [Mott]'s fine-pitch formulas to the last digit).
- [MH] *Machinery's Handbook*, "Checking Gear Size by Measurement over Wires or Pins",
  as reproduced by ashokagears.net/gear-size.html: wire 1.728/P for external spur
  gears; 32 teeth, 4 DP, 20 deg: 34.4130 at 1 DP, so 34.4130 / 4 = 8.6032 in.
- [MC] machinecalcs.com, "Span Measurement Over Teeth Calculator", worked example: 20
  teeth, module 2 mm, 20 deg: W = 15.321 mm over 3 teeth, 21.225 mm over 4.
- [TW] tandwiel.info, "Pitch - metric module - diametral pitch - circular pitch - tooth
  thickness - tooth depth - base pitch", table: base pitch at 20 deg of 64, 72 and 80
  DP: 1.1716, 1.0414 and 0.9373 mm.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from click.testing import CliRunner

from wheelgen.cli import main
from wheelgen.design import loads_design
from wheelgen.design.bounds import BOUNDS
from wheelgen.design.diametral_pitch import (
    FINE_PITCH_FROM,
    inch_rack,
    largest_rack_tip_radius,
    module_of_dp,
)
from wheelgen.teeth import ToothSpec, gear_data, measure_span, outline_for

INCH = 25.4


def dp_spec(teeth: int, dp: float, **kw: float) -> ToothSpec:
    """A DP wheel's tooth spec as the loader makes it (module and inch rack)."""
    rack = inch_rack(dp)
    return ToothSpec(
        teeth=teeth,
        module=module_of_dp(dp),
        dedendum=rack.dedendum,
        root_radius=rack.root_radius,
        diametral_pitch=dp,
        **kw,
    )


def test_the_module_of_a_diametral_pitch_is_25_4_over_it():
    # derived: 25.4 / 32 = 0.79375 exactly, a float holds it to the last bit
    assert module_of_dp(32) == 0.79375
    assert module_of_dp(20) == 1.27
    assert module_of_dp(12.7) == 2.0
    with pytest.raises(ValueError, match="diametral_pitch"):
        module_of_dp(0)


def test_the_diametral_pitch_bound_is_the_module_bound():
    # derived: P = 25.4 / m, so the ends swap
    dp, m = BOUNDS["diametral_pitch"], BOUNDS["module"]
    assert float(dp.low) == pytest.approx(INCH / m.high)
    assert float(dp.high) == pytest.approx(INCH / m.low)


@pytest.mark.parametrize("dp", [4, 10, 16, 19.5])
def test_coarse_pitch_proportions(dp):
    rack = inch_rack(dp)
    assert rack.addendum == 1.0  # [Mott] 1/P
    assert rack.dedendum == 1.25  # [Mott] 1.25/P
    assert rack.root_radius == 0.3  # ANSI/AGMA 201.02 rack tip radius, from memory
    assert "201.02" in rack.standard


@pytest.mark.parametrize("dp", [20, 32, 48, 120])
def test_fine_pitch_proportions(dp):
    rack = inch_rack(dp)
    assert dp >= FINE_PITCH_FROM  # [Mott] fine pitch is P >= 20
    assert rack.addendum == 1.0  # [Mott] 1/P
    # [Mott] 1.200/P + 0.002 in, in units of 1/P: 1.2 + 0.002 P
    assert rack.dedendum == pytest.approx(1.2 + 0.002 * dp, abs=1e-12)
    assert rack.root_radius == 0.3  # as for coarse pitch, from memory
    assert "207.06" in rack.standard


def test_the_rack_tip_radius_is_kept_to_what_fits():
    # derived (see largest_rack_tip_radius): 0.25 / (1 - sin 20 deg) = 0.37995, ISO 53
    # type A's 0.38 for its dedendum of 1.25 at 20 deg, to 3 decimals
    assert largest_rack_tip_radius(1.25, 20.0) == pytest.approx(0.37995, abs=1e-5)
    # at 200 DP the dedendum is 1.6/P: 0.3/P no longer fits the rack's tip
    assert inch_rack(200).root_radius == pytest.approx(0.29, abs=1e-3)
    assert inch_rack(200).root_radius <= largest_rack_tip_radius(1.6, 20.0)
    outline_for(dp_spec(40, 200))  # the generator accepts it
    # a steeper pressure angle leaves less room: at 200 DP and 25 deg, derived
    # (pi/4 - 1.6 tan 25) cos 25 / (1 - sin 25) = 0.0617
    assert inch_rack(200, 25.0).root_radius == pytest.approx(0.0617, abs=1e-4)
    assert inch_rack(32, 25.0).root_radius == 0.3


# [PIC] Table 7.2: pitch, addendum, dedendum, whole depth (inches, 4 decimals). Its 20
# DP row (0.0579, 0.1079) follows the older 1.157/P dedendum; [Mott] counts 20 DP as a
# fine pitch, as AGMA 207.06 does since its range was extended down to 20 DP.
PIC_TABLE = [
    (24, 0.0417, 0.0520, 0.0937),
    (32, 0.0313, 0.0395, 0.0708),
    (48, 0.0208, 0.0270, 0.0478),
    (64, 0.0156, 0.0208, 0.0364),
    (72, 0.0139, 0.0187, 0.0326),
    (80, 0.0125, 0.0170, 0.0295),
    (96, 0.0104, 0.0145, 0.0249),
    (120, 0.0083, 0.0120, 0.0203),
    (200, 0.0050, 0.0080, 0.0130),
]


@pytest.mark.parametrize(("dp", "addendum", "dedendum", "whole"), PIC_TABLE)
def test_tooth_depths_match_the_fine_pitch_table(dp, addendum, dedendum, whole):
    data = gear_data(dp_spec(40, dp))
    # the table prints 4 decimals, halves rounded up: half a unit in the last place
    half = 5e-5 + 1e-12
    tip, root, ref = data.tip_diameter, data.root_diameter, data.pitch_diameter
    assert (tip - ref) / 2 / INCH == pytest.approx(addendum, abs=half)
    assert (ref - root) / 2 / INCH == pytest.approx(dedendum, abs=half)
    assert data.depth_of_cut / INCH == pytest.approx(whole, abs=half)


def test_tooth_depths_on_the_generated_outline():
    # the outline itself reaches the tip and root circles of [PIC]'s 32 DP row
    outline = outline_for(dp_spec(40, 32))
    pts = outline.polyline(1e-4)
    r = np.hypot(pts[:, 0], pts[:, 1])
    assert 2 * r.max() / INCH == pytest.approx(1.3125, abs=1e-6)  # (40 + 2) / 32
    assert (r.max() - r.min()) / INCH == pytest.approx(0.0708, abs=5e-5 + 1e-9)  # [PIC]


@pytest.mark.parametrize("dp", [4, 10, 16])
def test_coarse_whole_depth(dp):
    # [Mott]: whole depth 1/P + 1.25/P = 2.25/P
    assert gear_data(dp_spec(40, dp)).depth_of_cut / INCH == pytest.approx(
        2.25 / dp, abs=1e-9
    )


def test_forty_teeth_at_32_dp():
    data = gear_data(dp_spec(40, 32))
    # derived: D = N / P = 1.25 in, outside (N + 2) / P = 1.3125 in
    assert data.pitch_diameter == pytest.approx(31.75, abs=1e-9)
    assert data.tip_diameter == pytest.approx(33.3375, abs=1e-9)
    assert data.diametral_pitch == 32


def test_over_pins_published_inch_example():
    # [MH]: 32 teeth, 4 DP, 20 deg, wires 1.728/P = 0.432 in: 8.6032 in
    data = gear_data(dp_spec(32, 4))
    assert data.pin_diameter == pytest.approx(0.432 * INCH, abs=1e-9)
    assert data.over_pins / INCH == pytest.approx(8.6032, abs=5e-5)


def test_span_of_the_published_example_cut_to_its_diametral_pitch():
    # [MC]: 20 teeth at module 2 mm; 12.7 DP is module 2 (derived: 25.4 / 12.7)
    data = gear_data(dp_spec(20, 12.7))
    assert data.span_teeth == 3
    assert data.span_width == pytest.approx(15.321, abs=5e-4)
    # measured on the generated outline, not only the formula
    measured = measure_span(outline_for(dp_spec(20, 12.7)), 4)
    assert measured.on_flank
    assert measured.width == pytest.approx(21.225, abs=5e-4)  # [MC] over 4 teeth


def test_span_of_an_inch_wheel_in_inches():
    # derived (ISO 21771 span formula, in inches): W = cos a [pi (k - 0.5) + z inv a] / P;
    # 20 teeth, 32 DP, k = 3: 0.93969 x (7.85398 + 20 x 0.014904) / 32 = 0.23939 in.
    # The span of module 1 over 3 of 20 teeth, 7.6604 mm (from memory, the usual span
    # tables for module 1), divided by 32 gives the same.
    a = math.radians(20.0)
    inv = math.tan(a) - a
    expected = math.cos(a) * (math.pi * 2.5 + 20 * inv) / 32
    assert expected == pytest.approx(7.6604 / 32, abs=1e-5)
    spec = dp_spec(20, 32)
    data = gear_data(spec)
    assert data.span_teeth == 3
    assert data.span_width / INCH == pytest.approx(expected, abs=1e-9)
    # measured on the generated outline, and as the data sheet prints it
    assert measure_span(outline_for(spec), 3).width / INCH == pytest.approx(
        expected, abs=1e-6
    )
    assert "span over 3 teeth     0.2394 in" in _gear("-z", "20", "--dp", "32").output


@pytest.mark.parametrize(
    ("dp", "base_pitch"), [(64, 1.1716), (72, 1.0414), (80, 0.9373)]
)
def test_one_more_tooth_in_the_span_adds_a_base_pitch(dp, base_pitch):
    outline = outline_for(dp_spec(48, dp))
    spans = [measure_span(outline, k).width for k in (4, 5, 6)]
    # [TW] prints the base pitch to 0.0001 mm
    assert spans[1] - spans[0] == pytest.approx(base_pitch, abs=1e-4)
    assert spans[2] - spans[1] == pytest.approx(base_pitch, abs=1e-4)


def _gear(*args: str):
    return CliRunner().invoke(main, ["gear", *args])


def test_gear_data_sheet_at_a_diametral_pitch():
    result = _gear("-z", "40", "--dp", "32")
    assert result.exit_code == 0, result.output
    text = result.output
    assert "32 diametral pitch (module 0.79375 mm)" in text
    assert "pitch diameter        1.2500 in (31.7500 mm)" in text  # derived: 40 / 32
    assert "tip diameter          1.3125 in (33.3375 mm)" in text  # derived: 42 / 32
    assert "full depth of cut     0.0708 in (1.7970 mm)" in text  # [PIC] 32 DP
    assert "No. 3 of a 32 DP set (35 to 54 teeth" in text


def test_gear_over_pins_at_four_diametral_pitch():
    result = _gear("-z", "32", "--dp", "4")
    assert "over two pins         8.6032 in" in result.output  # [MH]
    assert "with 0.432 in pins" in result.output  # [MH] 1.728 / 4
    data = json.loads(_gear("-z", "32", "--dp", "4", "--json").output)
    assert data["diametral_pitch"] == 4
    assert data["over_pins"] / INCH == pytest.approx(8.6032, abs=5e-5)  # mm in JSON


def test_gear_units_and_lengths_with_units():
    mm = _gear("-z", "40", "--dp", "32", "--units", "mm").output
    assert "pitch diameter        31.7500 mm" in mm
    inch = _gear("-z", "40", "-m", "1", "--units", "in").output
    assert "pitch diameter        1.5748 in (40.0000 mm)" in inch  # derived: 40 / 25.4
    pin = json.loads(
        _gear("-z", "32", "--dp", "4", "--pin", "0.432in", "--json").output
    )
    assert pin["pin_diameter"] == pytest.approx(10.9728, abs=1e-12)  # 0.432 x 25.4
    half = json.loads(
        _gear("-z", "30", "--dp", "32", "--mate", "45", "--backlash", "0.004 in",
              "--json").output
    )  # fmt: skip
    assert half["backlash"] == pytest.approx(0.1016, abs=1e-9)  # derived: 0.004 x 25.4


def test_gear_dp_mate_uses_the_same_proportions():
    data = json.loads(_gear("-z", "40", "--dp", "32", "--mate", "20", "--json").output)
    # derived: the standard distance (40 + 20) / (2 x 32) = 0.9375 in; the clearance
    # [Mott] 0.200/P + 0.002 in
    assert data["centre_distance"] == pytest.approx(0.9375 * INCH, abs=1e-9)
    assert data["clearance"] / INCH == pytest.approx(0.2 / 32 + 0.002, abs=1e-9)


@pytest.mark.parametrize(
    ("args", "words"),
    [
        (["-z", "40"], "'--module' (mm) or as '--dp'"),
        (["-z", "40", "-m", "1", "--dp", "32"], "'--module' (mm) or as '--dp'"),
        (["-z", "40", "--dp", "0"], "'--dp'"),
        (["-z", "40", "--dp", "nan"], "'--dp'"),
        (["-z", "40", "--dp", "32", "--pin", "1/8 ft"], "unknown unit 'ft'"),
        (["-z", "40", "--dp", "32", "--pin", "100 in"], "2540 mm"),
        (["-z", "40", "--dp", "32", "--units", "cm"], "'--units'"),
    ],
)
def test_gear_refuses_what_it_cannot_use(args, words):
    result = _gear(*args)
    assert result.exit_code == 2
    assert words in result.output
    assert "Traceback" not in result.output


def test_a_dp_spec_must_agree_with_its_module():
    with pytest.raises(ValueError, match="diametral_pitch"):
        ToothSpec(teeth=20, module=1.0, diametral_pitch=32)
    assert math.isclose(dp_spec(20, 48).module * 48, INCH)


def _ratio(*args: str):
    return CliRunner().invoke(main, ["ratio", *args])


def test_ratio_sizes_at_a_diametral_pitch(tmp_path):
    out = tmp_path / "train.toml"
    result = _ratio(
        "12", "--teeth", "12-80", "--stages", "2", "--dp", "32",
        "--max-diameter", "2.2in", "--top", "3", "--write", str(out),
    )  # fmt: skip
    assert result.exit_code == 0, result.output
    # derived: a tip of 2.2 in at 32 DP is (z + 2) / 32 <= 2.2, so z <= 68
    assert "teeth 12-68 (from --max-diameter)" in result.output
    assert "32 DP" in result.output and "tip in" in result.output
    # derived: the largest wheel of each train is 48 teeth, (48 + 2) / 32 = 1.5625 in
    assert "1.5625" in result.output
    design = loads_design(out.read_text(encoding="utf-8"), str(out))
    assert design.units == "in"
    assert {w.diametral_pitch for w in design.wheels} == {32}
    assert {w.module for w in design.wheels} == {0.79375}  # derived: 25.4 / 32


def test_ratio_needs_one_tooth_size():
    result = _ratio("12", "--dp", "32", "--module", "1")
    assert result.exit_code == 2
    assert "--module (and --stage-module) or as --dp" in result.output


def test_ratio_advice_at_a_diametral_pitch():
    # derived: 254/19 needs a 127-tooth wheel: (127 + 2) / 32 = 4.03125 in
    result = _ratio("254/19", "--dp", "32", "--max-diameter", "2in", "--stages", "2")
    assert result.exit_code == 1
    assert "at 32 DP that needs --max-diameter 4.0313in" in result.stderr
