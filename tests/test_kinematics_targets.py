"""Targets: wanted and obtained period, error in ppm, drift a year, sense, verdict."""

from __future__ import annotations

from fractions import Fraction

import pytest

from wheelgen.design import loads_design
from wheelgen.design.periods import format_period, parse_period
from wheelgen.kinematics import evaluate_targets, solve_rates

# One turn per synodic month in, through an idler, 242 T -> 223 T out: the output turns
# 242/223 times a month. en.m.wikiversity.org, "Astronomy college course/Saros cycle"
# (docs/references.md section 14): synodic month 29.530589 d, draconic month 27.212221
# d, 223 synodic ~ 242 draconic months.
ECLIPSE = """\
[design]
title = "eclipse cycle"

[drive]
arbor = "a"
period = "29.530589 d"

[[arbor]]
name = "a"
at = [0.0, 0.0]

[[arbor]]
name = "i"
at = [150.0, 0.0]

[[arbor]]
name = "b"
at = [300.0, 0.0]

[[wheel]]
name = "w1"
arbor = "a"
teeth = 242

[[wheel]]
name = "wi"
arbor = "i"
teeth = 40

[[wheel]]
name = "w2"
arbor = "b"
teeth = 223

[[mesh]]
pair = ["w1", "wi"]

[[mesh]]
pair = ["wi", "w2"]
"""

MONTH_S = Fraction("29.530589") * 86400  # Saros page, as above
DRACONIC_S = Fraction("27.212221") * 86400  # Saros page, as above
YEAR_S = Fraction("365.25") * 86400  # the format's 'yr'


def result(target: str):
    d = loads_design(ECLIPSE + "\n[[target]]\n" + target, "eclipse.toml")
    (r,) = evaluate_targets(d, solve_rates(d))
    return r


def test_wanted_and_obtained_period_error_and_drift():
    r = result('arbor = "b"\nperiod = "27.212221 d"\ntolerance = "10 ppm"\n')
    got = MONTH_S * 223 / 242  # derived: drive period / (242/223)
    assert r.wanted_s == DRACONIC_S
    assert r.got_s == got
    assert r.got_turns == Fraction(242, 223)
    # derived from the two published periods: (got - wanted) / wanted, about -5.5 ppm
    expected_ppm = float((got - DRACONIC_S) / DRACONIC_S) * 1e6
    assert r.error_ppm == pytest.approx(expected_ppm, rel=1e-12)
    assert -6 < r.error_ppm < -5
    # derived: drift = (1/got - 1/wanted) turns a second * seconds a year * 360 degrees
    drift = float((1 / got - 1 / DRACONIC_S) * YEAR_S * 360)
    assert r.drift_deg_per_year == pytest.approx(drift, rel=1e-12)
    assert r.drift_deg_per_year > 0  # the train's period is short: it runs ahead
    assert r.sense_ok and r.met


def test_default_tolerance_is_one_ppm():
    r = result('arbor = "b"\nperiod = "27.212221 d"\n')
    assert r.target.tolerance_ppm == 1.0
    assert not r.met  # -5.5 ppm is outside 1 ppm


@pytest.mark.parametrize(
    ("tolerance", "met"),
    [
        ('"6 ppm"', True),
        ('"5 ppm"', False),
        # derived: |got - wanted| = 27.212221 d * 5.5e-6 ~ 12.9 s
        ('"13 s"', True),
        ('"12 s"', False),
    ],
)
def test_tolerance_forms_decide_the_verdict(tolerance, met):
    r = result(f'arbor = "b"\nperiod = "27.212221 d"\ntolerance = {tolerance}\n')
    assert r.met is met


def test_exact_turns_target_with_zero_tolerance():
    r = result('arbor = "b"\nturns = "242/223"\ntolerance = "0 ppm"\n')
    assert r.error_ppm == 0 and r.met
    r = result('arbor = "b"\nturns = "243/223"\ntolerance = "0 s"\n')
    assert not r.met


def test_tolerance_boundary_is_exact():
    # an error of exactly 0.1 ppm must pass a "0.1 ppm" tolerance: no float rounding
    wanted = Fraction(242, 223) * (1 + Fraction(1, 10**7))
    r = result(f'arbor = "b"\nturns = "{wanted}"\ntolerance = "0.1 ppm"\n')
    assert r.met


@pytest.mark.parametrize(
    ("sense", "ok"), [("either", True), ("ccw", True), ("cw", False)]
)
def test_sense_check(sense, ok):
    # two external meshes: the output turns with the drive, counter-clockwise
    r = result(f'arbor = "b"\nturns = "242/223"\nsense = "{sense}"\n')
    assert r.sense_ok is ok
    assert r.met is ok


def test_still_arbor_cannot_meet_a_period():
    text = ECLIPSE + '\n[[arbor]]\nname = "s"\nat = [0.0, 90.0]\nfixed = true\n'
    text += '\n[[target]]\narbor = "s"\nperiod = "1 d"\n'
    d = loads_design(text, "x.toml")
    (r,) = evaluate_targets(d, solve_rates(d))
    assert r.got_s is None and r.error_ppm is None and not r.met


@pytest.mark.parametrize(
    ("text", "seconds"),
    [
        ("1 s", 1),
        ("2 min", 120),
        ("12 h", 43200),
        ("1 d", 86400),
        ("1 yr", 31557600),  # derived: 365.25 * 86400 (Julian year)
        ("254/19 d", Fraction(254 * 86400, 19)),
        ("6939.602/19 d", Fraction("6939.602") * 86400 / 19),
        (".5 h", 1800),
    ],
)
def test_parse_period(text, seconds):
    assert parse_period(text) == seconds


@pytest.mark.parametrize(
    "text",
    [
        "1 fortnight",
        "-1 d",
        "0 s",
        "1/0 s",
        "d",
        "1e40 s",
        "",
        "1/" + "7" * 5000 + " s",
    ],
)
def test_parse_period_refuses(text):
    with pytest.raises(ValueError):
        parse_period(text)


def test_format_period_picks_a_readable_unit():
    assert format_period(43200) == "12 h"
    assert format_period(Fraction("29.530589") * 86400, 9) == "29.530589 d"
    assert format_period(90) == "1.5 min"
