"""Continued fractions of exact ratios: terms, convergents, best approximations.

The ratio search uses these to explain a failure: the simplest fraction within the
tolerance, factorised, shows which tooth range or how many stages would reach it.

Background (any number-theory text, e.g. Khinchin, *Continued Fractions*, ch. 1-2):
for ``x = [a0; a1, a2, ...]`` the convergents ``p_n/q_n`` follow
``p_n = a_n p_{n-1} + p_{n-2}`` (same for ``q``), and every best rational
approximation of ``x`` (no fraction with a smaller or equal denominator is closer) is
a convergent or a semiconvergent ``(p_{n-2} + j p_{n-1}) / (q_{n-2} + j q_{n-1})``,
``1 <= j <= a_n``.
"""

from __future__ import annotations

import math
from fractions import Fraction

__all__ = [
    "continued_fraction",
    "convergents",
    "semiconvergents",
    "best_approximation",
    "simplest_between",
    "prime_factors",
]


def continued_fraction(x: Fraction, max_terms: int | None = None) -> list[int]:
    """Terms ``[a0, a1, ...]`` of the (finite) continued fraction of an exact ratio.

    ``x`` must be a positive ``Fraction`` (or int). The last term of a finite
    expansion is kept above 1 (the canonical form), except for ``x = 1``.
    """
    x = Fraction(x)
    if x <= 0:
        raise ValueError(f"'x' must be positive, got {x}")
    if max_terms is not None and max_terms < 1:
        raise ValueError(f"'max_terms' must be at least 1, got {max_terms}")
    terms: list[int] = []
    num, den = x.numerator, x.denominator
    while den and (max_terms is None or len(terms) < max_terms):
        a, rem = divmod(num, den)
        terms.append(a)
        num, den = den, rem
    return terms


def convergents(x: Fraction, max_terms: int | None = None) -> list[Fraction]:
    """Convergents ``p_n/q_n`` of ``x``, in order; the last one is ``x`` itself."""
    out: list[Fraction] = []
    p0, q0, p1, q1 = 0, 1, 1, 0
    for a in continued_fraction(x, max_terms):
        p0, q0, p1, q1 = p1, q1, a * p1 + p0, a * q1 + q0
        out.append(Fraction(p1, q1))
    return out


def semiconvergents(x: Fraction, max_denominator: int) -> list[Fraction]:
    """All convergents and semiconvergents of ``x`` with denominator <= the bound.

    Sorted by denominator. Every best approximation of the first kind is among them;
    not every semiconvergent is one (a semiconvergent with ``j < a_n / 2`` may lose
    to the previous convergent), so callers compare errors.
    """
    if max_denominator < 1:
        raise ValueError(f"'max_denominator' must be at least 1, got {max_denominator}")
    x = Fraction(x)
    out: list[Fraction] = []
    p0, q0, p1, q1 = 0, 1, 1, 0
    for a in continued_fraction(x):
        for j in range(1, a + 1):
            q = q0 + j * q1
            if q > max_denominator:
                return sorted(set(out), key=lambda f: (f.denominator, f))
            if q >= 1:
                out.append(Fraction(p0 + j * p1, q))
        p0, q0, p1, q1 = p1, q1, a * p1 + p0, a * q1 + q0
    return sorted(set(out), key=lambda f: (f.denominator, f))


def best_approximation(x: Fraction, max_denominator: int) -> Fraction:
    """The fraction closest to ``x`` with denominator at most ``max_denominator``.

    Ties go to the smaller denominator. Picked among the semiconvergents, which hold
    every best approximation.
    """
    x = Fraction(x)
    candidates = semiconvergents(x, max_denominator)
    return min(candidates, key=lambda f: (abs(f - x), f.denominator))


def simplest_between(low: Fraction, high: Fraction) -> Fraction:
    """The fraction with the smallest denominator (then numerator) in ``[low, high]``.

    Both bounds are positive and included. Found by walking the continued fractions
    of both ends together (the Stern-Brocot descent).
    """
    low, high = Fraction(low), Fraction(high)
    if low <= 0 or high < low:
        raise ValueError(f"need 0 < low <= high, got low={low}, high={high}")
    floor_low = math.floor(low)
    if floor_low == low:
        return Fraction(floor_low)
    if floor_low + 1 <= high:
        return Fraction(floor_low + 1)
    # both ends share the integer part: recurse on the reciprocals of the fractional
    # parts (order flips under 1/x)
    rest = simplest_between(1 / (high - floor_low), 1 / (low - floor_low))
    return floor_low + 1 / rest


def prime_factors(n: int) -> dict[int, int]:
    """Prime factorisation ``{prime: exponent}`` of a positive integer (trial division).

    Tooth products stay below about 10**12, so trial division up to the square root
    is at most a million steps; ``{}`` for 1.
    """
    if n < 1:
        raise ValueError(f"'n' must be a positive integer, got {n}")
    out: dict[int, int] = {}
    d = 2
    while d * d <= n:
        while n % d == 0:
            out[d] = out.get(d, 0) + 1
            n //= d
        d += 1 if d == 2 else 2
    if n > 1:
        out[n] = out.get(n, 0) + 1
    return out
