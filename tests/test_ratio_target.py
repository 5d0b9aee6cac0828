"""Reading ratio targets and the drift of period targets."""

from __future__ import annotations

from fractions import Fraction

import pytest

from wheelgen.kinematics.ratio_target import parse_target


def test_fraction_is_exact():
    t = parse_target("254/19")
    assert t.value == Fraction(254, 19) and t.exact and not t.is_period
    assert parse_target(" 12 ").value == 12


def test_decimal_is_read_exactly_but_measured():
    t = parse_target("13.36842")
    assert t.value == Fraction(1336842, 100000) and not t.exact


def test_periods_give_output_turns_per_input_turn():
    t = parse_target("27.321661 d per 365.2422 d")
    # derived: 365.2422 / 27.321661, read exactly
    assert t.value == Fraction("365.2422") / Fraction("27.321661")
    assert t.is_period and not t.exact
    assert parse_target("1 h PER 1 d").value == 24  # derived: 24 h in a day


def test_drift_in_degrees_per_year():
    t = parse_target("12 h per 1 d")  # wanted: 2 turns per day
    assert t.drift_deg_per_yr(Fraction(2)) == 0
    # derived: ratio 2.001 turns a day -> 0.001 turn/d too many -> 0.36 deg/d,
    # times 365.25 d = 131.49 deg per year, fast (positive)
    assert t.drift_deg_per_yr(Fraction(2001, 1000)) == pytest.approx(131.49)
    assert parse_target("3/2").drift_deg_per_yr(Fraction(3, 2)) is None


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("", "empty"),
        ("0/5", "positive"),
        ("abc", "not a target"),
        ("1 d per 2 d per 3 d", "once"),
        ("1 week per 1 d", "unit"),
        ("-3", "not a target"),
        ("inf", "not a target"),
        ("nan", "not a target"),
        # Fraction("1e999999") would build a million-digit integer first
        ("1e999999", "power of ten"),
        ("1e308", "power of ten"),
        ("9" * 50 + "/7", "characters"),
        # the train format's bounds on a target's turns: 1e-12 to 1e12
        ("1e13", "allowed: from 1e-12"),
        ("1/2000000000000", "allowed: from 1e-12"),
        ("1e-6 s per 1e6 yr", "allowed: from 1e-12"),
    ],
)
def test_bad_targets(text, message):
    with pytest.raises(ValueError, match=message):
        parse_target(text)
