"""The pin-and-slot motion law against plane geometry and published relatives.

Sources (docs/references.md section 13):
- WHITWORTH: firgelliauto.com, "Whitworth quick-return mechanism": for a crank of
  radius r and a pivot offset d, the lever's extreme angle is alpha = asin(d / r); it is
  the same triangle as the coupling (pin = crank pin, slot = slotted lever).
- POT: a potentiometer maker's technical definitions, section 6 "Linearity errors
  resulting from mechanical coupling" (europages.co.uk, cpid-5458727): maximum
  relative error F_max = E / (pi r_k); for E = 0.1, r_k = 5 it prints 0.00637.
- ECCENTRIC: "Epicyclic theory of ancient Indians", Brahmasphutasiddhanta vol. 1 p. 193
  (sa.wikisource.org): tan E = p sin(theta) / (a - p cos(theta)), largest E = asin(p/a).
Everything else is derived from plane geometry, as each test says.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from wheelgen.kinematics.pinslot_motion import (
    deviation_from_pin_deg,
    deviation_from_slot_deg,
    max_deviation_deg,
    max_deviation_pin_angles_deg,
    pin_angle_deg,
    pin_distance,
    slot_angle_deg,
    speed_ratio,
    transmission_angle_deg,
)

CASES = [(8.0, 0.8), (5.0, 0.1), (10.0, 3.0), (4.0, 3.5), (1.0, 0.5)]
U = np.linspace(-720.0, 720.0, 28801)  # every 0.05 degree over four turns


@pytest.mark.parametrize(("r", "e"), CASES)
def test_largest_deviation_is_arcsin_e_over_r(r, e):
    # WHITWORTH / ECCENTRIC: the largest angle is asin(e / r)
    published = math.degrees(math.asin(e / r))
    assert max_deviation_deg(r, e) == pytest.approx(published, rel=1e-12)
    dev = deviation_from_pin_deg(U, r, e)
    # sampled every 0.05 deg: a smooth maximum is met to well below 1e-4 deg
    assert dev.max() == pytest.approx(published, abs=1e-4)
    assert -dev.min() == pytest.approx(published, abs=1e-4)
    assert dev.max() <= published + 1e-12


@pytest.mark.parametrize(("r", "e"), CASES)
def test_largest_deviation_where_the_slot_is_square_to_the_offset(r, e):
    # WHITWORTH: the extreme comes with the lever at right angles to the line of centres
    u_lead, u_lag = max_deviation_pin_angles_deg(r, e)
    alpha = math.degrees(math.asin(e / r))
    assert u_lead == pytest.approx(90.0 - alpha)
    assert u_lag == pytest.approx(-(90.0 - alpha))
    assert deviation_from_pin_deg(u_lead, r, e) == pytest.approx(alpha, abs=1e-9)
    assert deviation_from_pin_deg(u_lag, r, e) == pytest.approx(-alpha, abs=1e-9)
    # the slot then points at +-90 degrees from the offset line
    assert slot_angle_deg(u_lead, r, e) == pytest.approx(90.0, abs=1e-9)
    assert slot_angle_deg(u_lag, r, e) == pytest.approx(-90.0, abs=1e-9)
    # and the sampled extreme sits there (to the sampling step, 0.05 deg)
    dev = deviation_from_pin_deg(U[(U >= 0) & (U < 360)], r, e)
    u_at = U[(U >= 0) & (U < 360)][int(np.argmax(dev))]
    assert u_at == pytest.approx(u_lead, abs=0.05)


def test_potentiometer_linearity_error():
    # POT: F_max = E / (pi r_k) = 0.00637 for E = 0.1, r_k = 5 (3 significant digits);
    # it is the peak-to-peak error over a full turn, 2 asin(E / r) / 360 deg.
    dev = deviation_from_pin_deg(U, 5.0, 0.1)
    assert (dev.max() - dev.min()) / 360.0 == pytest.approx(0.00637, abs=5e-6)


@pytest.mark.parametrize(("r", "e"), CASES)
def test_deviation_is_odd_about_the_offset_line(r, e):
    # derived: mirroring the figure in the offset line mirrors the pin and the slot
    assert np.allclose(
        deviation_from_pin_deg(-U, r, e), -deviation_from_pin_deg(U, r, e), atol=1e-12
    )
    assert deviation_from_pin_deg(0.0, r, e) == pytest.approx(0.0, abs=1e-12)
    assert deviation_from_pin_deg(180.0, r, e) == pytest.approx(0.0, abs=1e-12)


def _pin_from_slot_by_intersection(psi_deg: float, r: float, e: float) -> float:
    """Independent: intersect the slot's ray from B = (e, 0) with the circle |P| = r."""
    c, s = math.cos(math.radians(psi_deg)), math.sin(math.radians(psi_deg))
    # |B + t (c, s)|^2 = r^2  ->  t^2 + 2 e c t + e^2 - r^2 = 0, the root with t > 0
    t = -e * c + math.sqrt((e * c) ** 2 - (e * e - r * r))
    x, y = e + t * c, t * s
    return math.degrees(math.atan2(y, x))


@settings(max_examples=200, deadline=None)
@given(
    psi=st.floats(-179.9, 179.9),
    r=st.floats(0.5, 50.0),
    ratio=st.floats(0.0, 0.95),
)
def test_law_matches_line_circle_intersection(psi, r, ratio):
    e = ratio * r
    u = _pin_from_slot_by_intersection(psi, r, e)
    assert float(slot_angle_deg(u, r, e)) == pytest.approx(psi, abs=1e-8)
    assert float(pin_angle_deg(psi, r, e)) == pytest.approx(u, abs=1e-8)


@pytest.mark.parametrize(("r", "e"), CASES)
def test_full_turn_nets_exactly_one_turn(r, e):
    # derived: the deviation is periodic, so a whole turn in gives a whole turn out
    for k in (1, 3, -2):
        out = slot_angle_deg(U + 360.0 * k, r, e) - slot_angle_deg(U, r, e)
        assert np.allclose(out, 360.0 * k, atol=1e-9)
    # and the motion is continuous (no jumps of the branch), monotonic for e < r
    assert np.all(np.diff(slot_angle_deg(U, r, e)) > 0)


@pytest.mark.parametrize(("r", "e"), CASES)
def test_inverse_and_slot_side_deviation(r, e):
    psi = slot_angle_deg(U, r, e)
    assert np.allclose(pin_angle_deg(psi, r, e), U, atol=1e-9)
    # rule of sines in triangle A, B, pin: sin(delta) = (e / r) sin(psi)
    assert np.allclose(deviation_from_slot_deg(psi, r, e), psi - U, atol=1e-9)


def test_carried_frame_turns_the_offset_line():
    # derived: turning the whole figure (carrier, pin, slot) by c turns the slot by c
    r, e = 8.0, 0.8
    for c in (0.0, 37.0, -200.0, 1000.0):
        assert np.allclose(
            slot_angle_deg(U + c, r, e, c), slot_angle_deg(U, r, e) + c, atol=1e-9
        )


@pytest.mark.parametrize(("r", "e"), CASES)
def test_pin_travel_between_r_minus_e_and_r_plus_e(r, e):
    # derived (law of cosines): |B - P| = sqrt(r^2 + e^2 - 2 r e cos u)
    d = pin_distance(U, r, e)
    assert d.min() == pytest.approx(r - e, abs=1e-12)
    assert d.max() == pytest.approx(r + e, abs=1e-12)
    assert np.all(d >= r - e - 1e-12) and np.all(d <= r + e + 1e-12)


@pytest.mark.parametrize(("r", "e"), CASES)
def test_speed_ratio_is_the_derivative(r, e):
    # derived: central difference of the law against the closed form
    h = 1e-4
    u = np.linspace(-180, 180, 721)
    num = (slot_angle_deg(u + h, r, e) - slot_angle_deg(u - h, r, e)) / (2 * h)
    assert np.allclose(speed_ratio(u, r, e), num, rtol=1e-6)
    assert float(speed_ratio(0.0, r, e)) == pytest.approx(r / (r - e))
    assert float(speed_ratio(180.0, r, e)) == pytest.approx(r / (r + e))


def test_transmission_angle_smallest_is_complement():
    # derived: 90 deg - asin(e / r); e / r = 0.9 gives 25.84 deg
    assert transmission_angle_deg(U, 10.0, 9.0).min() == pytest.approx(
        90.0 - math.degrees(math.asin(0.9)), abs=1e-4
    )


def test_zero_offset_has_no_deviation():
    # derived: coaxial wheels turn together
    assert np.all(deviation_from_pin_deg(U, 8.0, 0.0) == 0.0)


@pytest.mark.parametrize(("r", "e"), [(8.0, 8.0), (8.0, 9.0), (0.0, 0.1), (5.0, -0.1)])
def test_bad_offsets_raise(r, e):
    with pytest.raises(ValueError, match="'(offset|radius)' must"):
        deviation_from_pin_deg(0.0, r, e)
