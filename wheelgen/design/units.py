"""Lengths in millimetres or inches: read exactly, written in the design's units.

Inside wheelgen every length is millimetres. A train file may also write a length as
text with its unit (:func:`parse_length`): ``"3.175 mm"``, ``"0.125 in"``, ``"1/8 in"``,
``"1 3/16 in"``; each is read exactly, as a ``Fraction`` of millimetres, with the inch
of exactly 25.4 mm (the yard of 0.9144 m in force since 1 July 1959; National Bureau
of Standards Circular 572, addendum of January 1960).

Everything a person reads (the workshop sheets, the data sheets, the labels of the
drawings) is written through one :class:`Lengths` formatter for the design's units
(``[design] units``, or ``--units``): millimetres as before, or decimal inches to
0.0001 in, with the fraction beside a size the trade sells by fractions (rod, tube,
sheet). The units change what is written, never a part: the parts of a design are
the same whatever its units.

Only the standard library is used, so every layer may import this module.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from decimal import ROUND_HALF_UP, Decimal
from fractions import Fraction
from typing import Literal

from .periods import PeriodError, parse_number

__all__ = [
    "INCH_PLACES",
    "LENGTH_FORMS",
    "MM",
    "MM_PER_INCH",
    "UNITS",
    "CheckBar",
    "LengthError",
    "Lengths",
    "Units",
    "inch_fraction",
    "lengths_of",
    "parse_length",
]

Units = Literal["mm", "in"]
#: The units a design's sheets and drawings may be written in.
UNITS: tuple[str, ...] = ("mm", "in")
#: Millimetres in one inch, exactly (the inch of 1959; NBS Circular 572, addendum).
MM_PER_INCH = Fraction(127, 5)
#: Decimal places of a length written in inches: 0.0001 in, a "tenth" of the trade.
INCH_PLACES = 4
#: How a length may be written as text, for messages.
LENGTH_FORMS = '"3.175 mm", "0.125 in", "1/8 in", "1 3/16 in"'

# the unit words a length may end with, and their size in mm
_UNIT_MM: dict[str, Fraction] = {
    "mm": Fraction(1),
    "in": MM_PER_INCH,
    "inch": MM_PER_INCH,
    "inches": MM_PER_INCH,
    '"': MM_PER_INCH,
}
# sign, a whole number and a fraction ("1 3/16", "1-3/16"), or any number, then a unit
_LENGTH = re.compile(
    r"""^\s*(?P<sign>[+-]?)\s*
    (?:(?P<whole>\d{1,9})(?:\s+|\s*-\s*)(?P<frac>\d{1,9}\s*/\s*\d{1,9})
      |(?P<number>[0-9.][0-9.eE+/\s-]*?))
    \s*(?P<unit>[a-zA-Z"]+)\s*$""",
    re.VERBOSE,
)
# the finest inch fraction written beside a size, and how near a size must be to it
_FINEST_INCH = 64
_FRACTION_TOL_IN = 1e-6


class LengthError(ValueError):
    """A length written as text that cannot be read; the message says why."""


def parse_length(text: str) -> Fraction:
    """Read a length with its unit, exactly, and return it in millimetres.

    ``"3.175 mm"``, ``"0.125 in"``, ``"1/8 in"``, ``"3/16in"``, ``"1 3/16 in"`` (or
    ``"1-3/16 in"``), ``"-0.5 in"``; units ``mm``, ``in`` (``inch``, ``inches``,
    ``"``). The number is read as :func:`~wheelgen.design.periods.parse_number` reads
    one (decimal, power of ten, fraction; at most 40 characters). Raises
    :class:`LengthError` saying what is wrong.
    """
    if not isinstance(text, str):
        raise LengthError(f"expected a length as text such as {LENGTH_FORMS}")
    m = _LENGTH.match(text)
    if m is None:
        raise LengthError(
            f"{text.strip()!r} is not a number and a unit such as {LENGTH_FORMS}"
        )
    unit = m.group("unit").lower()
    if unit not in _UNIT_MM:
        raise LengthError(f"unknown unit {m.group('unit')!r} (mm or in)")
    try:
        if m.group("whole") is not None:
            value = int(m.group("whole")) + parse_number(m.group("frac"))
        else:
            value = parse_number(m.group("number"))
    except PeriodError as exc:
        raise LengthError(str(exc)) from None
    if m.group("sign") == "-":
        value = -value
    return value * _UNIT_MM[unit]


def inch_fraction(mm: float) -> str | None:
    """The size in inches as the trade writes a fraction: ``"1/8"``, ``"1 3/16"``,
    ``"2"``; ``None`` unless ``mm`` is a whole number of 64ths of an inch."""
    inches = mm / float(MM_PER_INCH)
    if not math.isfinite(inches) or inches <= 0:
        return None
    steps = round(inches * _FINEST_INCH)
    if steps == 0 or abs(inches - steps / _FINEST_INCH) > _FRACTION_TOL_IN:
        return None
    whole, rest = divmod(Fraction(steps, _FINEST_INCH), 1)
    if rest == 0:
        return str(whole)
    part = f"{rest.numerator}/{rest.denominator}"
    return f"{whole} {part}" if whole else part


@dataclass(frozen=True, slots=True)
class CheckBar:
    """A bar printed on a 1:1 drawing to check the printout: its length and the
    spacing of its ticks in mm (drawings are drawn in mm), and its label."""

    length: float
    tick: float
    label: str


_BARS = {
    "mm": CheckBar(50.0, 10.0, "50 mm"),
    # derived: 2 in = 50.8 mm with a tick every 1/4 in (6.35 mm)
    "in": CheckBar(50.8, 6.35, "2 in"),
}


@dataclass(frozen=True, slots=True)
class Lengths:
    """Writes lengths (given in mm) in one unit, the same way on every sheet.

    In millimetres every method writes what the sheets wrote before inches existed;
    in inches a length has :data:`INCH_PLACES` decimals, whatever the places asked
    for millimetres.
    """

    units: Units = "mm"

    def __post_init__(self) -> None:
        if self.units not in UNITS:
            raise ValueError(f"'units' must be 'mm' or 'in', got {self.units!r}")

    @property
    def unit(self) -> str:
        """The unit's symbol: ``"mm"`` or ``"in"``."""
        return self.units

    @property
    def inches(self) -> bool:
        return self.units == "in"

    @property
    def words(self) -> str:
        """The unit in words: ``"millimetres"`` or ``"inches"``."""
        return "inches" if self.inches else "millimetres"

    def value(self, mm: float) -> float:
        """The length in this unit (a float)."""
        return mm / float(MM_PER_INCH) if self.inches else mm

    def num(self, mm: float | None, places: int = 3) -> str:
        """The number alone, fixed decimals: ``places`` in mm, 0.0001 in in inches;
        ``""`` for ``None``."""
        if mm is None:
            return ""
        if self.inches:
            return _fixed(self.value(mm), INCH_PLACES)
        return f"{mm:.{places}f}"

    def short(self, mm: float) -> str:
        """The number as briefly as it is exact enough: ``"3"``, ``"3.175"``
        (``:g`` in mm), ``"0.125"``, ``"0.1181"`` (to 0.0001 in)."""
        if self.inches:
            text = _fixed(self.value(mm), INCH_PLACES).rstrip("0").rstrip(".")
            return "0" if text in ("", "-0") else text
        return f"{mm:g}"

    def text(self, mm: float) -> str:
        """The length with its unit: ``"3 mm"``, ``"0.125 in"``."""
        return f"{self.short(mm)} {self.unit}"

    def fixed(self, mm: float, places: int = 4) -> str:
        """Fixed decimals with the unit: ``"31.7500 mm"``, ``"1.2500 in"``."""
        return f"{self.num(mm, places)} {self.unit}"

    def both(self, mm: float, places: int = 4) -> str:
        """In inches the inch value with the millimetres beside it,
        ``"1.2500 in (31.7500 mm)"``; in millimetres ``"31.7500 mm"``."""
        if self.inches:
            return f"{self.fixed(mm)} ({mm:.{places}f} mm)"
        return self.fixed(mm, places)

    def stock(self, mm: float) -> str:
        """A stock size (rod, tube, sheet, bush) with its unit, and its inch fraction
        where it is one: ``"6.35 mm (1/4 in)"``, ``"0.25 in (1/4)"``, ``"3 mm"``."""
        fraction = inch_fraction(mm)
        if fraction is None:
            return self.text(mm)
        if self.inches:
            return f"{self.text(mm)} ({fraction})"
        return f"{self.text(mm)} ({fraction} in)"

    def trade(self, mm: float) -> str:
        """The number as the trade names a size: in inches its fraction where it is
        one (``"5/32"``), else as :meth:`short` (``"0.094"``, ``"3"``)."""
        fraction = inch_fraction(mm) if self.inches else None
        return fraction if fraction is not None else self.short(mm)

    def col(self, name: str) -> str:
        """A column name with its unit: ``"bore_mm"``, ``"bore_in"``."""
        return f"{name}_{self.unit}"

    def head(self, words: str) -> str:
        """A table heading with its unit: ``"X (mm)"``, ``"X (in)"``."""
        return f"{words} ({self.unit})"

    @property
    def bar(self) -> CheckBar:
        """The check bar of a 1:1 drawing in these units."""
        return _BARS[self.units]


def _fixed(value: float, places: int) -> str:
    """``value`` to ``places`` decimals, halves rounded up as inch tables print them.

    The float is first cut to 10 decimals, so that 0.07075 in (1.79705 mm / 25.4,
    which a float holds as 0.0707499...) is written 0.0708 as the tables have it.
    """
    if not math.isfinite(value):
        return str(value)
    exact = Decimal(repr(round(value, 10)))
    text = f"{exact.quantize(Decimal(1).scaleb(-places), ROUND_HALF_UP):f}"
    # "-0.0000" is no length a person writes
    return text[1:] if text.startswith("-") and float(text) == 0 else text


#: Millimetres, the default of every writer.
MM = Lengths()


def lengths_of(design: object) -> Lengths:
    """The formatter of ``design``'s units (millimetres for anything without any)."""
    return Lengths(getattr(design, "units", "mm"))
