"""Lengths with units: read exactly, written in millimetres or inches.

The inch is exactly 25.4 mm: "1 yard = 0.914 4 meter exactly ... From this definition
it follows that 1 inch equals 25.4 millimeters" (National Bureau of Standards Circular
572, addendum of January 1960, on the definition in force from 1 July 1959). Every
other value here is derived from it beside the test.
"""

from __future__ import annotations

from fractions import Fraction

import pytest

from wheelgen.design.units import (
    MM,
    MM_PER_INCH,
    LengthError,
    Lengths,
    inch_fraction,
    lengths_of,
    parse_length,
)

INCH = Lengths("in")


def test_the_inch_is_25_4_mm_exactly():
    assert MM_PER_INCH == Fraction(254, 10)  # NBS Circular 572, addendum (1960)


@pytest.mark.parametrize(
    ("text", "mm"),
    [
        ("3.175 mm", Fraction(127, 40)),
        ("0.125 in", Fraction(127, 40)),  # derived: 25.4 / 8
        ("1/8 in", Fraction(127, 40)),
        ("1/8in", Fraction(127, 40)),
        ('1/8"', Fraction(127, 40)),
        ("3/16in", Fraction(381, 80)),  # derived: 3 x 25.4 / 16 = 4.7625
        ("1 3/16 in", Fraction(2413, 80)),  # derived: 19 x 25.4 / 16 = 30.1625
        ("1-3/16 in", Fraction(2413, 80)),
        ("-0.5 in", Fraction(-127, 10)),
        ("- 1/8 in", Fraction(-127, 40)),
        ("1.2e3 mm", Fraction(1200)),
        ("2 inches", Fraction(254, 5)),
        ("  .5IN ", Fraction(127, 10)),
        ("0 in", Fraction(0)),
    ],
)
def test_lengths_are_read_exactly(text, mm):
    assert parse_length(text) == mm


def test_a_length_in_inches_is_the_same_float_as_its_millimetres():
    # derived: both are the nearest float to 127/40; the parts of a design written in
    # inches are then the very same as those written in millimetres
    assert float(parse_length("1/8 in")) == 3.175
    assert float(parse_length("3/32 in")) == 2.38125
    assert float(parse_length("0.0940 in")) == float("2.3876")


@pytest.mark.parametrize(
    ("text", "words"),
    [
        ("3.175", "not a number and a unit"),
        ("in", "not a number and a unit"),
        ("1/8 ft", "unknown unit 'ft'"),
        ("1/0 in", "divides by zero"),
        ("1e99 in", "power of ten"),
        ("abc mm", "not a number and a unit"),
        ("1" * 50 + " mm", "more than 40 characters"),
        ("1/8 in in", "not a number and a unit"),
    ],
)
def test_lengths_that_cannot_be_read_say_why(text, words):
    with pytest.raises(LengthError, match=words):
        parse_length(text)


def test_not_text_is_refused():
    with pytest.raises(LengthError):
        parse_length(3.175)  # type: ignore[arg-type]


@pytest.mark.parametrize(
    ("mm", "fraction"),
    [
        (3.175, "1/8"),
        (6.35, "1/4"),
        (4.7625, "3/16"),
        (0.396875, "1/64"),  # derived: 25.4 / 64
        (30.1625, "1 3/16"),
        (25.4, "1"),
        (50.8, "2"),
        (3.0, None),
        (3.18008, None),  # 0.1252 in: no 64th
        (0.0, None),
        (-3.175, None),
    ],
)
def test_inch_fractions_of_the_trade(mm, fraction):
    assert inch_fraction(mm) == fraction


def test_millimetres_are_written_as_the_sheets_always_wrote_them():
    assert MM.num(31.75, 4) == "31.7500"
    assert MM.num(2.0) == "2.000"
    assert MM.num(None) == ""
    assert MM.text(3.0) == "3 mm"
    assert MM.text(3.175) == "3.175 mm"
    assert MM.col("bore") == "bore_mm"
    assert MM.head("X") == "X (mm)"
    assert MM.both(31.75) == "31.7500 mm"
    assert MM.stock(3.0) == "3 mm"
    assert MM.stock(6.35) == "6.35 mm (1/4 in)"
    assert MM.bar.length == 50.0 and MM.bar.label == "50 mm"


def test_inches_are_written_to_a_ten_thousandth():
    assert INCH.num(31.75) == "1.2500"  # derived: 31.75 / 25.4
    assert INCH.num(31.75, 1) == "1.2500"  # whatever places mm would have
    assert INCH.num(33.3375) == "1.3125"
    # 2.2/32 + 0.002 in = 0.07075 in: halves are rounded up as the tables print it
    assert INCH.num(0.07075 * 25.4) == "0.0708"
    assert INCH.num(-0.0001) == "0.0000"
    assert INCH.text(3.175) == "0.125 in"
    assert INCH.text(3.0) == "0.1181 in"
    assert INCH.both(31.75) == "1.2500 in (31.7500 mm)"
    assert INCH.stock(3.175) == "0.125 in (1/8)"
    assert INCH.trade(3.96875) == "5/32"
    assert INCH.trade(2.3876) == "0.094"
    assert INCH.col("x") == "x_in"
    assert INCH.words == "inches" and MM.words == "millimetres"


def test_the_inch_check_bar_is_two_inches_in_quarters():
    bar = INCH.bar
    assert bar.length == pytest.approx(2 * 25.4)  # derived
    assert bar.tick == pytest.approx(25.4 / 4)
    assert bar.label == "2 in"


def test_the_units_of_a_design():
    class Thing:
        units = "in"

    assert lengths_of(Thing()) == INCH
    assert lengths_of(object()) == MM
    with pytest.raises(ValueError, match="'units'"):
        Lengths("cm")  # type: ignore[arg-type]
