"""Mesh data of a pair against textbook worked examples.

Sources (docs/references.md sections 6 and 7):
- KHK_SHIFT: KHK's Gear Technical Reference and Elements of Metric Gear Technology
  (SDP/SI D785), table of a positively shifted spur pair (from memory; every value
  reproduced by the ISO 21771 formulas): m 3, z 12/24, x +0.6/+0.36 -> inv a_w
  0.034316, a_w 26.0886 deg, y 0.8333, a 56.4999, d_a 44.840 / 79.400 with
  h_a1 = (1 + y - x2) m, h_a2 = (1 + y - x1) m
- SCRIBD_CD: "Cent'r Dist'nce of Profile Shifted Gear Calc", a user's spreadsheet,
  scribd.com/doc/210760271: z 22/118, m 8, x 0/0.5 -> inv a_w 0.01750417,
  a_w 21.0617, a 563.8999
- SDP_T109: Elements of Metric Gear Technology, Table 11-1, p. T-109 (transverse values
  of a helical pair): m_t 3.46410, a_t 22.79588, a_wt 23.1126, a 125, d_a
  48.153/213.842, d_b 38.322/191.611 -> e_a 1.2939
- INTERFERENCE: Mechanical Engineering Design (McGraw-Hill), spur-gear chapter,
  "interference": the smallest 20 deg full-depth pinion for a 1:1 pair is 13 teeth
  (from memory)
"""

from __future__ import annotations

import math

import pytest

from wheelgen.teeth import ToothSpec, gear_data, mesh_data, shift_for_centre_distance
from wheelgen.teeth.involute import involute_function
from wheelgen.teeth.mesh_data import (
    contact_ratio,
    shifted_centre_distance,
    working_pressure_angle_deg,
)


def test_shifted_pair_worked_example():
    # KHK_SHIFT
    aw = working_pressure_angle_deg(12, 24, 0.6, 0.36)
    assert involute_function(aw) == pytest.approx(0.034316, abs=5e-7)
    assert aw == pytest.approx(26.0886, abs=5e-5)
    mesh = mesh_data(ToothSpec(12, 3.0, shift=0.6), ToothSpec(24, 3.0, shift=0.36))
    assert mesh.working_pressure_angle_deg == pytest.approx(26.0886, abs=5e-5)
    assert mesh.centre_distance == pytest.approx(56.4999, abs=5e-5)
    assert mesh.centre_distance_factor == pytest.approx(0.8333, abs=5e-5)
    # zero backlash at the shifted centre distance (derived: that is its definition)
    assert mesh.backlash == pytest.approx(0.0, abs=1e-9)


def test_shifted_pair_with_shortened_tips():
    # KHK_SHIFT: tips shortened to (1 + y - x_other) m keep the standard clearance;
    # here the addendum coefficient is set to 1 + y - (x1 + x2) on both wheels
    y = mesh_data(
        ToothSpec(12, 3.0, shift=0.6), ToothSpec(24, 3.0, shift=0.36)
    ).centre_distance_factor
    add = 1 + y - 0.96
    w1 = ToothSpec(12, 3.0, shift=0.6, addendum=add)
    w2 = ToothSpec(24, 3.0, shift=0.36, addendum=add)
    assert gear_data(w1).tip_diameter == pytest.approx(44.840, abs=5e-4)
    assert gear_data(w2).tip_diameter == pytest.approx(79.400, abs=5e-4)
    mesh = mesh_data(w1, w2)
    # derived: e_a = 1.2021 from the contact ratio formula (docs/references.md
    # section 7; no published figure for this pair)
    assert mesh.contact_ratio == pytest.approx(1.2021, abs=5e-5)
    # derived: standard clearance c = 0.25 m restored
    assert mesh.clearance == pytest.approx(0.75, abs=1e-9)


def test_centre_distance_from_shift_and_back():
    # SCRIBD_CD external case
    assert shifted_centre_distance(22, 118, 8.0, 0.0, 0.5) == pytest.approx(
        563.8999, abs=5e-5
    )
    aw = working_pressure_angle_deg(22, 118, 0.0, 0.5)
    assert involute_function(aw) == pytest.approx(0.01750417, abs=5e-9)
    assert aw == pytest.approx(21.0617, abs=5e-5)
    # and the inverse: the shift sum that fits the published distance
    assert shift_for_centre_distance(22, 118, 8.0, 563.8999) == pytest.approx(
        0.5, abs=1e-5
    )
    # KHK_SHIFT the other way round
    assert shift_for_centre_distance(12, 24, 3.0, 56.4999) == pytest.approx(
        0.96, abs=1e-4
    )


def test_mesh_at_a_given_distance_reports_the_shift_that_fits():
    mesh = mesh_data(ToothSpec(22, 8.0), ToothSpec(118, 8.0), centre_distance=563.8999)
    assert mesh.shift_sum_to_fit == pytest.approx(0.5, abs=1e-5)  # SCRIBD_CD
    # unshifted wheels opened to that distance have the backlash that shift would
    # fill: 2 (x1 + x2) m tan a on the reference circle, scaled to the working pitch
    # circle by cos a / cos a_w (derived from s = m (pi/2 + 2 x tan a))
    a, aw = math.radians(20), math.radians(mesh.working_pressure_angle_deg)
    expected = 2 * 0.5 * 8.0 * math.tan(a) * math.cos(a) / math.cos(aw)
    assert mesh.backlash == pytest.approx(expected, abs=1e-4)


def test_contact_ratio_published_example():
    # SDP_T109: rounded published diameters give 1.2938; the table prints 1.2939
    eps = contact_ratio(
        (48.153, 213.842), (38.322, 191.611), 125.0, 23.1126, 3.46410, 22.79588
    )
    assert eps == pytest.approx(1.2939, abs=2e-4)


def test_contact_ratio_standard_pair():
    # derived: contact ratio formula (docs/references.md section 7): 20/40 teeth, m 1,
    # standard distance -> 1.6352
    mesh = mesh_data(ToothSpec(20, 1.0), ToothSpec(40, 1.0))
    assert mesh.contact_ratio == pytest.approx(1.6352, abs=5e-5)
    assert mesh.centre_distance == pytest.approx(30.0)
    assert mesh.working_pressure_angle_deg == pytest.approx(20.0)
    # derived: standard clearance 0.25 m
    assert mesh.clearance == pytest.approx(0.25)


def test_backlash_from_thinning():
    # derived: at the standard distance the circumferential backlash is the sum of
    # the thinnings, along the line of action that times cos a
    mesh = mesh_data(
        ToothSpec(30, 1.0, thinning=0.04), ToothSpec(45, 1.0, thinning=0.04)
    )
    assert mesh.backlash == pytest.approx(0.08, abs=1e-12)
    assert mesh.normal_backlash == pytest.approx(
        0.08 * math.cos(math.radians(20)), abs=1e-12
    )


@pytest.mark.parametrize(("z", "interferes"), [(12, True), (13, False), (20, False)])
def test_interference_point_on_the_line_of_action(z, interferes):
    # INTERFERENCE: a 1:1 pair of 20 deg full-depth wheels needs 13 teeth; with 12 the
    # mating tip reaches past the interference point (the base-circle tangency)
    mesh = mesh_data(ToothSpec(z, 1.0), ToothSpec(z, 1.0))
    assert (mesh.interference_distance1 < 0) is interferes
    if interferes:
        assert mesh.interference1 and mesh.interference2


def test_tip_running_into_an_undercut_fillet_is_interference():
    # derived: a 12-tooth pinion is undercut (its involute starts above the base
    # circle); a large wheel's tip reaching below that start hits the fillet
    mesh = mesh_data(ToothSpec(12, 1.0), ToothSpec(100, 1.0))
    assert mesh.undercut1 and not mesh.undercut2
    assert mesh.interference1 == (
        mesh.active_start1 < gear_data(ToothSpec(12, 1.0)).form_diameter
    )


def test_jammed_pair_is_warned():
    mesh = mesh_data(
        ToothSpec(20, 1.0, shift=0.5), ToothSpec(20, 1.0), centre_distance=20.0
    )
    assert mesh.backlash < 0
    assert any("jam" in w for w in mesh.warnings)


def test_mismatched_pairs_are_refused():
    with pytest.raises(ValueError, match="module"):
        mesh_data(ToothSpec(20, 1.0), ToothSpec(20, 1.5))
    with pytest.raises(ValueError, match="form"):
        mesh_data(ToothSpec(20, 1.0), ToothSpec(20, 1.0, form="triangular"))
    with pytest.raises(ValueError, match="centre_distance"):
        shift_for_centre_distance(20, 20, 1.0, 10.0)


def test_triangular_pair_has_distance_and_clearance():
    w1 = ToothSpec(30, 1.0, form="triangular", root_radius=0.1)
    w2 = ToothSpec(60, 1.0, form="triangular", root_radius=0.1)
    mesh = mesh_data(w1, w2)
    assert mesh.centre_distance == pytest.approx(45.0)  # derived: m (z1 + z2) / 2
    assert mesh.contact_ratio is None
    # derived: the smaller gap between one tip and the other's root, as generated
    g1, g2 = gear_data(w1), gear_data(w2)
    expected = min(
        45.0 - (g1.tip_diameter + g2.root_diameter) / 2,
        45.0 - (g2.tip_diameter + g1.root_diameter) / 2,
    )
    assert mesh.clearance == pytest.approx(expected, abs=1e-12)
    assert 0 < mesh.clearance < 0.25
