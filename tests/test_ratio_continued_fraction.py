"""Continued fractions against published tables (sources beside each value)."""

from __future__ import annotations

from fractions import Fraction

import pytest

from wheelgen.kinematics.continued_fraction import (
    best_approximation,
    continued_fraction,
    convergents,
    prime_factors,
    semiconvergents,
    simplest_between,
)

# pi to 50 decimals: OEIS A000796 (decimal expansion of Pi)
PI = Fraction("3.14159265358979323846264338327950288419716939937510")

# OEIS A002485 (numerators) / A002486 (denominators), "Convergents to Pi",
# terms from n = 2 on (n = 0, 1 are the formal 0/1 and 1/0)
PI_CONVERGENTS = [
    (3, 1),
    (22, 7),
    (333, 106),
    (355, 113),
    (103993, 33102),
    (104348, 33215),
    (208341, 66317),
    (312689, 99532),
    (833719, 265381),
    (1146408, 364913),
    (4272943, 1360120),
    (5419351, 1725033),
]


def test_pi_convergents_match_oeis_a002485_a002486():
    got = convergents(PI, max_terms=len(PI_CONVERGENTS))
    assert got == [Fraction(p, q) for p, q in PI_CONVERGENTS], "OEIS A002485/A002486"


def test_pi_partial_quotients_match_oeis_a001203():
    # OEIS A001203, continued fraction for Pi: 3, 7, 15, 1, 292, 1, 1, 1, 2, 1, 3
    assert continued_fraction(PI, 11) == [3, 7, 15, 1, 292, 1, 1, 1, 2, 1, 3]


def test_year_per_synodic_month_convergents():
    # Tropical year 365.24219 d and synodic month 29.530588861 d, and the expansion
    # 365.24219 / 29.530588861 = [12; 2, 1, 2, 1, 1, 17, 3, 196, ...] with the
    # convergent [12; 2, 1, 2, 1, 1] = 235/19: math Q&A "Finding Integer
    # Approximations", https://imathworks.com/math/finding-integer-approximations
    # (the convergents 37/3, 99/8, 136/11 are also listed in the blog post
    # "Calendars and continued fractions", 30 May 2018, with slightly different data)
    ratio = Fraction("365.24219") / Fraction("29.530588861")
    assert continued_fraction(ratio, 9) == [12, 2, 1, 2, 1, 1, 17, 3, 196]
    got = convergents(ratio, 6)
    assert got[2:] == [
        Fraction(37, 3),
        Fraction(99, 8),
        Fraction(136, 11),
        Fraction(235, 19),
    ]


def _brute_best(x: Fraction, max_den: int) -> Fraction:
    # derived: try every denominator, the nearest numerator for each
    best = None
    for q in range(1, max_den + 1):
        for p in (
            x.numerator * q // x.denominator,
            x.numerator * q // x.denominator + 1,
        ):
            f = Fraction(p, q)
            if best is None or (abs(f - x), f.denominator) < (
                abs(best - x),
                best.denominator,
            ):
                best = f
    assert best is not None
    return best


@pytest.mark.parametrize("max_den", [1, 7, 50, 100, 113, 1000, 5000])
def test_best_approximation_of_pi_equals_brute_force(max_den):
    # derived: brute force over every denominator (note: with q <= 100 it is the
    # semiconvergent 311/99, closer than the convergent 22/7)
    assert best_approximation(PI, max_den) == _brute_best(PI, max_den)


def test_semiconvergents_hold_311_99():
    # derived: (3 + 14 * 22) / (1 + 14 * 7), a semiconvergent of pi between 22/7
    # and 333/106
    assert Fraction(311, 99) in semiconvergents(PI, 200)


@pytest.mark.parametrize(
    ("low", "high", "simplest"),
    [
        (Fraction(3), Fraction(7, 2), Fraction(3)),  # derived: an integer in range
        (Fraction(31, 10), Fraction(315, 100), Fraction(22, 7)),  # derived: brute force
        (Fraction(1, 3), Fraction(1, 3), Fraction(1, 3)),
        (
            Fraction(13367, 1000),
            Fraction(13369, 1000),
            Fraction(254, 19),
        ),  # derived: brute force
    ],
)
def test_simplest_between(low, high, simplest):
    assert simplest_between(low, high) == simplest
    # derived: no fraction with a smaller denominator lies in the interval
    for q in range(1, simplest.denominator):
        p = -(-low.numerator * q // low.denominator)  # ceil(low * q)
        assert Fraction(p, q) > high


@pytest.mark.parametrize(
    ("n", "factors"),
    [
        (1, {}),
        (254, {2: 1, 127: 1}),  # derived: 254 = 2 * 127
        (235, {5: 1, 47: 1}),  # derived: 235 = 5 * 47
        (2**10 * 3**4, {2: 10, 3: 4}),
        (1_000_003, {1_000_003: 1}),  # from memory: 1000003 is prime (checked below)
    ],
)
def test_prime_factors(n, factors):
    got = prime_factors(n)
    assert got == factors
    product = 1
    for p, e in got.items():
        assert all(p % d for d in range(2, int(p**0.5) + 1))  # each factor is prime
        product *= p**e
    assert product == n


def test_bad_arguments():
    with pytest.raises(ValueError, match="positive"):
        continued_fraction(Fraction(-1, 2))
    with pytest.raises(ValueError, match="max_denominator"):
        semiconvergents(PI, 0)
    with pytest.raises(ValueError, match="low"):
        simplest_between(Fraction(2), Fraction(1))
