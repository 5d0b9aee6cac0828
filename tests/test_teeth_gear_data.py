"""One wheel's data sheet against handbook tables, and measured on the outline.

Sources (docs/references.md sections 4, 5, 6 and 11):
- TANDWIEL: tandwiel.info, "Measurement over multiple teeth" (the ISO 21771 W_k formula)
- WK_TABLE: m = 1, 20 deg, x = 0: derived with that formula; the rows match the
  handbook span tables as remembered (from memory), e.g. z = 12 -> 4.5963,
  z = 20 -> 7.6604
- SDP_SPAN: Elements of Metric Gear Technology (SDP/SI D785) section 10.2 and KHK's
  Gear Technical Reference, span example m 3, z 24, x +0.4 -> k 4, W 32.8266 (from
  memory; the formula gives the same)
- PINS: Machinery's Handbook, "Checking Gear Size by Measurement over Wires or Pins",
  as reproduced at ashokagears.net/gear-size.html: 32 T, 1 DP, 20 deg, pin 1.728 ->
  34.4130 (m = 1 mm reads the same)
- ROSE: Modern Machine Shop Practice (1887), table of involute form cutters
- SDP_T36: Elements of Metric Gear Technology, section 4.3, p. T-36: z_c 32 at 14.5 deg,
  18 at 20 deg
- OKDOR: okdor.com/prevent-gear-undercut-in-design: 12 teeth at 25 deg
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from wheelgen.teeth import ToothSpec, gear_data, measure_span, outline_for
from wheelgen.teeth.gear_data import (
    cutter_number,
    over_pins,
    span_teeth,
    span_width,
    undercut_limit_teeth,
)

# (z, k, W_k) for m = 1, 20 deg, x = 0 -- WK_TABLE
WK_TABLE = [
    (10, 2, 4.5683), (11, 2, 4.5823), (12, 2, 4.5963), (13, 2, 4.6103),
    (14, 2, 4.6243), (15, 2, 4.6383), (16, 2, 4.6523), (17, 2, 4.6663),
    (18, 2, 4.6803), (19, 3, 7.6464), (20, 3, 7.6604), (21, 3, 7.6744),
    (22, 3, 7.6885), (23, 3, 7.7025), (24, 3, 7.7165), (25, 3, 7.7305),
    (26, 3, 7.7445), (27, 3, 7.7585), (28, 4, 10.7246), (29, 4, 10.7386),
    (30, 4, 10.7526), (31, 4, 10.7666),
]  # fmt: skip


@pytest.mark.parametrize(("z", "k", "w"), WK_TABLE)
def test_span_formula_and_k_match_the_table(z, k, w):
    # WK_TABLE prints 4 decimals; k rounds half down at z = 18, 27 as the tables do
    assert span_teeth(z) == k
    assert span_width(z, 1.0, k) == pytest.approx(w, abs=5e-5)


@pytest.mark.parametrize(("z", "k", "w"), WK_TABLE[::3] + [(20, 3, 7.6604)])
def test_span_measured_on_the_generated_outline(z, k, w):
    # WK_TABLE, measured between two parallel anvils on the outline's points
    measured = measure_span(outline_for(ToothSpec(z, 1.0)), k)
    assert measured.on_flank
    assert measured.width == pytest.approx(w, abs=5e-5)


@pytest.mark.parametrize("z", [3, 5, 7, 9, 101, 150, 233, 300])
@pytest.mark.parametrize(("x", "m"), [(0.0, 1.0), (0.5, 2.0), (-0.3, 0.5)])
def test_span_measured_agrees_with_iso_formula_small_and_large_counts(z, x, m):
    # TANDWIEL / ISO 21771 formula (derived for these counts), measured on the outline
    spec = ToothSpec(z, m, shift=x)
    try:
        outline = outline_for(spec)
    except ValueError:
        pytest.skip("no usable tooth")
    data = gear_data(spec)
    measured = measure_span(outline, data.span_teeth)
    if measured.on_flank:
        assert measured.width == pytest.approx(data.span_width, abs=1e-6 * m)
    else:
        # the anvils would touch a corner: the sheet must say so
        assert any("span over" in w for w in data.warnings)


def test_span_published_shifted_example():
    # SDP_SPAN: m 3, z 24, x +0.4 -> k = 4, W = 32.8266
    spec = ToothSpec(24, 3.0, shift=0.4)
    data = gear_data(spec)
    assert data.span_teeth == 4
    assert data.span_width == pytest.approx(32.8266, abs=5e-5)
    assert measure_span(outline_for(spec), 4).width == pytest.approx(32.8266, abs=5e-5)


def test_span_invariants():
    # derived from the W_k formula (docs/references.md section 4): W(k+1) - W(k) =
    # pi m cos a = 2.9521 (m = 1); W(z+1) - W(z) at the same k = m cos a inv a = 0.01401
    assert span_width(40, 1.0, 5) - span_width(40, 1.0, 4) == pytest.approx(
        2.9521, abs=5e-5
    )
    assert span_width(41, 1.0, 5) - span_width(40, 1.0, 5) == pytest.approx(
        0.01401, abs=5e-6
    )


def test_thinning_shortens_the_span_by_its_base_tangent_share():
    # derived: a thinner tooth by t on the reference arc is thinner by t cos a along
    # the base tangent; measured on the outline as well
    thin = ToothSpec(30, 1.0, thinning=0.1)
    data = gear_data(thin)
    assert data.span_width == pytest.approx(
        10.7526 - 0.1 * math.cos(math.radians(20)), abs=5e-5
    )
    assert measure_span(outline_for(thin), 4).width == pytest.approx(
        data.span_width, abs=1e-6
    )


def test_over_pins_published_example():
    # PINS: 32 teeth, pin 1.728 -> 34.4130
    m_over, contact = over_pins(32, 1.0, 1.728)
    assert m_over == pytest.approx(34.4130, abs=5e-5)
    # derived: a 1.728 m pin is the size meant to touch near the pitch circle
    assert contact == pytest.approx(32.0, abs=0.1)
    data = gear_data(ToothSpec(32, 1.0))
    assert data.pin_diameter == pytest.approx(1.728)
    assert data.over_pins == pytest.approx(34.4130, abs=5e-5)


@pytest.mark.parametrize(
    ("z", "x"), [(32, 0.0), (20, 0.0), (24, 0.4), (12, 0.6), (60, -0.3)]
)
def test_pin_rests_on_both_flanks_of_the_outline(z, x):
    # derived check of the over-pins dimension on the geometry: a pin of the stated
    # size, centred on the space axis at (M - d_p) / 2, touches the outline
    # (closest outline point = pin radius) and does not cut into it
    spec = ToothSpec(z, 1.0, shift=x)
    data = gear_data(spec)
    dp = data.pin_diameter
    centre_r = (data.over_pins - dp) / 2  # z even here
    assert z % 2 == 0
    outline = outline_for(spec)
    pts = outline.tooth_polyline(1e-7)
    a = math.pi / z  # a space middle
    centre = centre_r * np.array([math.cos(a), math.sin(a)])
    gap = np.hypot(*(pts - centre).T).min() - dp / 2
    assert abs(gap) < 1e-6
    assert data.pin_contact_diameter / 2 >= data.form_diameter / 2 - 1e-9


def test_odd_count_uses_balls_across_the_widest_chord():
    # derived: for odd z the two spaces are not opposite; M = 2 R_M cos(90/z) + d_p
    m_odd, _ = over_pins(33, 1.0, 1.728)
    m_even, _ = over_pins(32, 1.0, 1.728)
    assert m_even < m_odd < m_even + 1.0


CUTTERS = [
    (12, 8), (13, 8), (14, 7), (16, 7), (17, 6), (20, 6), (21, 5), (25, 5),
    (26, 4), (34, 4), (35, 3), (54, 3), (55, 2), (134, 2), (135, 1), (400, 1),
]  # fmt: skip


@pytest.mark.parametrize(("z", "number"), CUTTERS)
def test_form_cutter_numbers(z, number):
    # ROSE: No. 1 135-rack ... No. 8 12-13
    assert cutter_number(z) == number
    assert gear_data(ToothSpec(z, 1.0)).cutter_number == number


def test_no_form_cutter_below_twelve_teeth():
    # ROSE: the set ends at 12 teeth
    assert cutter_number(11) is None


@pytest.mark.parametrize(
    ("alpha", "limit", "whole", "source"),
    [(20.0, 17.097, 18, "SDP_T36 (17 is widely quoted: 17.10 rounded)"),
     (14.5, 31.90, 32, "SDP_T36"),
     (25.0, 11.20, 12, "OKDOR")],
)  # fmt: skip
def test_minimum_teeth_free_of_undercut(alpha, limit, whole, source):
    # 17 vs 18 at 20 deg: the limit is 17.10 teeth, so 17 teeth are (just) undercut;
    # the sheet gives the first whole number free of it and the limit itself
    assert undercut_limit_teeth(alpha) == pytest.approx(limit, abs=5e-3), source
    data = gear_data(ToothSpec(40, 1.0, pressure_angle_deg=alpha, root_radius=0.25))
    assert data.min_teeth_no_undercut == whole, source


def test_sizes_of_a_standard_and_a_shifted_wheel():
    # derived (ISO 21771 / ISO 53): d = m z, d_b = d cos a, d_a = d + 2 m (1 + x),
    # d_f = d - 2 m (1.25 - x), full depth 2.25 m, p = pi m, p_b = p cos a,
    # s = m (pi/2 + 2 x tan a)
    for x in (0.0, 0.4):
        data = gear_data(ToothSpec(30, 2.0, shift=x))
        assert data.pitch_diameter == pytest.approx(60.0)
        assert data.base_diameter == pytest.approx(60.0 * math.cos(math.radians(20)))
        assert data.tip_diameter == pytest.approx(60.0 + 4.0 * (1 + x))
        assert data.root_diameter == pytest.approx(60.0 - 4.0 * (1.25 - x))
        assert data.depth_of_cut == pytest.approx(4.5)
        assert data.blank_diameter == pytest.approx(data.tip_diameter)
        assert data.circular_pitch == pytest.approx(2 * math.pi)
        assert data.base_pitch == pytest.approx(
            2 * math.pi * math.cos(math.radians(20))
        )
        assert data.pitch_thickness == pytest.approx(
            2.0 * (math.pi / 2 + 2 * x * math.tan(math.radians(20)))
        )


def test_tip_thickness_is_measured_on_the_outline():
    # derived: the tip arc of the outline spans the tip thickness
    spec = ToothSpec(20, 1.0)
    outline = outline_for(spec)
    tip = [s for s in outline.tooth if s.kind == "arc"][1]
    a0 = math.atan2(tip.start[1], tip.start[0])
    a1 = math.atan2(tip.end[1], tip.end[0])
    assert gear_data(spec).tip_thickness == pytest.approx(11.0 * (a1 - a0), abs=1e-12)


def test_pointed_teeth_are_warned():
    data = gear_data(ToothSpec(8, 1.0, shift=1.0))
    assert data.pointed and data.tip_thickness == 0.0
    assert any("pointed" in w for w in data.warnings)
    assert data.tip_diameter < data.blank_diameter
    near = gear_data(ToothSpec(12, 1.0, shift=0.6))
    assert not near.pointed
    assert any("nearly pointed" in w for w in near.warnings)


def test_undercut_wheel_is_reported():
    data = gear_data(ToothSpec(10, 1.0))
    assert data.undercut and data.form_diameter > data.base_diameter
    assert any("undercut" in w for w in data.warnings)
    assert not gear_data(ToothSpec(10, 1.0, shift=0.5)).undercut


def test_triangular_sheet_has_no_involute_items():
    data = gear_data(ToothSpec(40, 1.0, form="triangular", root_radius=0.1))
    assert data.base_diameter is None and data.span_width is None
    assert data.cutter_number is None and data.over_pins is None
    assert data.pitch_diameter == pytest.approx(40.0)
    assert data.tip_diameter == pytest.approx(42.0)


def test_bad_pin_is_refused():
    with pytest.raises(ValueError, match="pin_diameter"):
        gear_data(ToothSpec(20, 1.0), pin_diameter=-1.0)
