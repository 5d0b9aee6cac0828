"""Periods with units, kept exact: ``"27.321661 d"`` -> ``Fraction`` of seconds."""

from __future__ import annotations

import math
import re
from fractions import Fraction

__all__ = [
    "UNIT_SECONDS",
    "as_float",
    "scientific",
    "parse_number",
    "parse_period",
    "format_period",
    "PeriodError",
]

#: Seconds in one of each unit. ``yr`` is the Julian year of 365.25 days, as the
#: train format says (derived: 365.25 * 86400).
UNIT_SECONDS: dict[str, Fraction] = {
    "s": Fraction(1),
    "min": Fraction(60),
    "h": Fraction(3600),
    "d": Fraction(86400),
    "yr": Fraction(36525 * 864),
}

_MAX_EXPONENT = 30
_MAX_DIGITS = 40
_NUMBER = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_PERIOD = re.compile(rf"^\s*({_NUMBER}(?:\s*/\s*\d+)?)\s*([a-z]+)\s*$")


class PeriodError(ValueError):
    """A period string that cannot be read; the message says what is allowed."""


def parse_number(text: str) -> Fraction:
    """Read a number written as people write it, exactly: ``"29.5"``, ``"1.2e3"``,
    ``"254/19"``, ``"6939.602/19"``.

    At most 40 characters and powers of ten from -30 to 30: ``Fraction("1e999999")``
    would first build an integer of a million digits. Raises :class:`PeriodError` (a
    ``ValueError``) saying what is wrong.
    """
    if not isinstance(text, str):
        raise PeriodError(f"expected a number as text, got {text!r}")
    number = text.strip()
    if len(number) > _MAX_DIGITS:
        raise PeriodError(
            f"{number[:20]!r}... has more than {_MAX_DIGITS} characters in its number"
        )
    if re.fullmatch(rf"{_NUMBER}(?:\s*/\s*\d+)?", number) is None:
        raise PeriodError(f"{number!r} is not a number such as 29.5, 1.2e3 or 254/19")
    exponent = re.search(r"[eE]([+-]?\d+)", number)
    if exponent is not None and abs(int(exponent.group(1))) > _MAX_EXPONENT:
        raise PeriodError(f"{number!r} has a power of ten beyond {_MAX_EXPONENT}")
    # Fraction() itself reads "254/19" but not "6939.602/19": divide the parts here.
    top, _, bottom = number.replace(" ", "").partition("/")
    if bottom and int(bottom) == 0:
        raise PeriodError(f"{number!r} divides by zero")
    return Fraction(top) / (Fraction(bottom) if bottom else 1)


def parse_period(text: str) -> Fraction:
    """Read ``"<number> <unit>"`` exactly and return the period in seconds.

    The number may be a decimal (read exactly, ``"27.321661"`` is
    ``27321661/1000000``) or a fraction (``"254/19"``). Units: s, min, h, d, yr.
    The period must be positive.
    """
    if not isinstance(text, str):
        raise PeriodError(f'expected a string such as "27.3 d", got {text!r}')
    match = _PERIOD.match(text)
    if match is None:
        raise PeriodError(
            f'{text!r} is not \'<number> <unit>\' (for example "1 d" or "27.321661 d")'
        )
    number, unit = match.groups()
    if len(number) > _MAX_DIGITS:
        # int() refuses more than 4300 digits with a plain ValueError; no period needs 40
        raise PeriodError(
            f"{text[:20]!r}... has more than {_MAX_DIGITS} characters in its number"
        )
    exponent = re.search(r"[eE]([+-]?\d+)", number)
    # Fraction("1e999999999") would build a huge integer first: refuse silly exponents.
    if exponent is not None and abs(int(exponent.group(1))) > _MAX_EXPONENT:
        raise PeriodError(
            f"{text!r} has a power of ten beyond {_MAX_EXPONENT} (write it in another unit)"
        )
    if unit not in UNIT_SECONDS:
        units = ", ".join(UNIT_SECONDS)
        raise PeriodError(f"unknown unit {unit!r} in {text!r}; units are {units}")
    try:
        value = parse_number(number)
    except PeriodError as exc:
        raise PeriodError(f"{exc} in {text!r}") from None
    if value <= 0:
        raise PeriodError(f"{text!r} is not a positive period")
    return value * UNIT_SECONDS[unit]


def as_float(value: Fraction | float) -> float:
    """``value`` as a float; ``inf`` (with its sign) where no float is that large.

    A long train can turn an arbor 3^-2000 times per drive turn: its period is exact,
    but ``float()`` of it raises OverflowError.
    """
    try:
        return float(value)
    except OverflowError:
        return math.inf if value > 0 else -math.inf


def scientific(value: Fraction, digits: int = 4) -> str:
    """An exact number of any size as ``"1.235e+330"``, worked out on the integers."""
    if value == 0:
        return "0"
    sign = "-" if value < 0 else ""
    num, den = abs(value.numerator), value.denominator
    # 10^e <= num/den < 10^(e+1)
    e = len(str(num)) - len(str(den))
    if num * 10 ** max(0, -e) < den * 10 ** max(0, e):
        e -= 1
    shift = digits - 1 - e
    scaled = (num * 10 ** max(0, shift)) // (den * 10 ** max(0, -shift))
    text = str(scaled)
    mantissa = text[0] + ("." + text[1:digits] if digits > 1 else "")
    return f"{sign}{mantissa}e{e:+d}"


def format_period(seconds: Fraction | float, digits: int = 6) -> str:
    """A period in the largest unit that keeps the number at least 1, e.g. ``"27.3217 d"``."""
    value = as_float(seconds)
    if value == float("inf"):
        if isinstance(seconds, Fraction) and seconds != math.inf:
            return f"{scientific(seconds / UNIT_SECONDS['yr'], digits)} yr"
        return "never"
    for unit in ("yr", "d", "h", "min"):
        size = float(UNIT_SECONDS[unit])
        if abs(value) >= size:
            return f"{value / size:.{digits}g} {unit}"
    return f"{value:.{digits}g} s"
