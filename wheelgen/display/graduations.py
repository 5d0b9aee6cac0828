"""Dial graduations at exact angles, from the exact period of the arbor that reads them.

A ring's scale runs in its own unit (hours, days, degrees, or the number of a label)
with ``units`` of them in one turn of the hand. A mark for the value ``v`` stands at

    angle = zero + sense * 360 * v / units        (degrees, counter-clockwise from +x),

``sense`` +1 when the hand turns counter-clockwise seen from the front and -1 when it
turns clockwise, so that the numbers always grow the way the hand goes. ``v / units`` is
worked out with fractions (the period is an exact ``Fraction`` of seconds), so a month of
29.530589 days puts its day 15 at exactly 15 / 29.530589 of a turn; only the final angle
is a float.

Kinds (``graduations`` of a ``[[dial]]``):

- ``hours``: a mark and a number for every whole hour, finer marks between;
- ``days``: a mark for every day, numbers every 1, 2, 5, 10... days as room allows;
- ``month``: days of a lunar month (numbers every 5 days) and the four mean phases (new,
  first quarter, full, last quarter at 0, 1/4, 1/2, 3/4 of the period);
- ``year``: a mark at the start of every month of a common year and for every fifth day,
  the month's name in the middle of it;
- ``degrees``: 0 to 360, a mark every 5 degrees, a number every 30;
- ``labels``: the design's texts, equally spaced, the first at the zero;
- ``auto``: ``hours`` below two days, ``month`` for 29 to 30 days, ``year`` for 360 to
  370 days, ``days`` otherwise.

Angles are degrees, radii and sizes millimetres.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

from ..design.periods import UNIT_SECONDS

__all__ = [
    "MONTHS",
    "MONTH_DAYS",
    "PHASES",
    "MIN_MARK_SPACING",
    "Mark",
    "Scale",
    "resolve_kind",
    "scale_units",
    "dial_scale",
    "mark_angle_deg",
]

#: Month names and lengths of a common year (days), January first.
MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct",
          "Nov", "Dec")  # fmt: skip
MONTH_DAYS = (31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31)
#: The moon's four mean phases, at these fractions of the synodic month.
PHASES = (
    (Fraction(0), "new"),
    (Fraction(1, 4), "first quarter"),
    (Fraction(1, 2), "full"),
    (Fraction(3, 4), "last quarter"),
)
#: mm: marks closer than this along the ring are not engraved (they would run together
#: on a cut or printed face; common practice, no source).
MIN_MARK_SPACING = 1.0
# characters of a number's width, in units of the text height (sans-serif digits)
_CHAR_WIDTH = 0.6


@dataclass(frozen=True, slots=True)
class Mark:
    """One graduation: its value in the ring's unit, rank and texts.

    ``rank`` 0 is a main (numbered) mark, 1 a middle one, 2 a fine one, 3 no stroke at
    all (a name between two marks); ``label`` is printed on the ring's number row,
    ``note`` on its inner row (the moon's phases, the months' names).
    """

    value: Fraction
    rank: int
    label: str = ""
    note: str = ""


@dataclass(frozen=True, slots=True)
class Scale:
    """A ring's scale: ``units`` of ``unit`` per turn and its marks in value order."""

    kind: str
    unit: str  # "h", "d", "deg", "label"
    units: Fraction
    marks: tuple[Mark, ...]


def resolve_kind(kind: str, period_s: Fraction | None) -> str:
    """The graduation kind a ring gets: ``kind``, or for ``auto`` one from the period."""
    if kind != "auto":
        return kind
    if period_s is None:
        return "degrees"
    days = period_s / UNIT_SECONDS["d"]
    if days < 2:
        return "hours"
    if 29 <= days <= 30:
        return "month"
    if 360 <= days <= 370:
        return "year"
    return "days"


def scale_units(
    kind: str, period_s: Fraction | None, labels: tuple[str, ...]
) -> tuple[str, Fraction]:
    """The unit and the number of units in one turn of the hand, exactly."""
    if kind == "degrees":
        return "deg", Fraction(360)
    if kind == "labels":
        return "label", Fraction(len(labels))
    if period_s is None or period_s <= 0:
        raise ValueError(f"a dial in {kind} needs an arbor that turns")
    if kind == "hours":
        return "h", period_s / UNIT_SECONDS["h"]
    return "d", period_s / UNIT_SECONDS["d"]


def mark_angle_deg(
    value: Fraction, units: Fraction, zero_deg: float, sense: int
) -> float:
    """Angle (degrees, counter-clockwise from +x) of the mark for ``value``."""
    turn = Fraction(value) / units  # exact share of a turn
    return zero_deg + sense * float(360 * turn)


def _step(
    units: Fraction, radius: float, spacing: float, steps: tuple[Fraction, ...]
) -> Fraction | None:
    """The smallest step (in units) whose marks are at least ``spacing`` mm apart."""
    per_unit = 2 * math.pi * radius / float(units)  # mm along the ring per unit
    for s in steps:
        if float(s) * per_unit >= spacing - 1e-12:
            return s
    return None


def _values(units: Fraction, step: Fraction) -> list[Fraction]:
    """0, step, 2 step, ... below ``units`` (the value ``units`` is the zero again)."""
    out, v = [], Fraction(0)
    while v < units:
        out.append(v)
        v += step
    return out


_NICE = tuple(Fraction(m) * Fraction(10) ** e for e in range(-1, 7) for m in (1, 2, 5))


def _label_step(units: Fraction, radius: float, text_h: float, widest: int) -> Fraction:
    """A whole step (1, 2, 5, 10, ...) at which numbers ``widest`` characters wide fit."""
    room = text_h * (_CHAR_WIDTH * widest + 0.8)
    whole = tuple(s for s in _NICE if s >= 1)
    return _step(units, radius, room, whole) or whole[-1]


def _number(v: Fraction) -> str:
    return str(v.numerator) if v.denominator == 1 else f"{float(v):g}"


def dial_scale(
    kind: str,
    period_s: Fraction | None,
    radius: float,
    text_height: float,
    labels: tuple[str, ...] = (),
) -> Scale:
    """The marks of a ring of outer ``radius`` mm, with numbers ``text_height`` mm high.

    ``kind`` as in the module docstring (``auto`` resolved first); ``period_s`` is the
    exact period of the hand that reads the ring (seconds); fine marks closer than
    :data:`MIN_MARK_SPACING` mm are left out.
    """
    kind = resolve_kind(kind, period_s)
    unit, units = scale_units(kind, period_s, labels)
    marks: dict[Fraction, Mark] = {}

    def put(v: Fraction, rank: int, label: str = "", note: str = "") -> None:
        old = marks.get(v, Mark(v, rank))
        marks[v] = Mark(v, min(rank, old.rank), old.label or label, old.note or note)

    if kind == "labels":
        for k, text in enumerate(labels):
            put(Fraction(k), 0, text)
    elif kind == "degrees":
        for v in _values(units, Fraction(5)):
            put(v, 2)
        for v in _values(units, Fraction(10)):
            put(v, 1)
        for v in _values(units, Fraction(30)):
            put(v, 0, _number(v))
    elif kind == "hours":
        fine = _step(units, radius, MIN_MARK_SPACING, (Fraction(1, 12), Fraction(1, 6),
                     Fraction(1, 4), Fraction(1, 2), Fraction(1)))  # fmt: skip
        if fine is not None:
            for v in _values(units, fine):
                put(v, 2)
        if fine is not None and fine < 1:
            for v in _values(units, Fraction(1, 2) if fine <= Fraction(1, 2) else fine):
                put(v, 1)
        whole = units.denominator == 1
        step = _label_step(units, radius, text_height, len(str(math.floor(units))))
        for v in _values(units, Fraction(1)):
            if v % step == 0:
                text = _number(units) if v == 0 and whole else _number(v)
                put(v, 0, text)
            else:
                put(v, 1)
    elif kind == "year":
        start = Fraction(0)
        for name, days in zip(MONTHS, MONTH_DAYS):
            if start >= units:
                break
            put(start, 0)
            put(start + Fraction(days, 2), 3, note=name)
            start += days
        fine = _step(units, radius, MIN_MARK_SPACING, (Fraction(1), Fraction(5)))
        if fine is not None:
            for v in _values(units, fine):
                put(v, 2)
    else:  # days, month
        fine = _step(units, radius, MIN_MARK_SPACING, (Fraction(1, 4), Fraction(1, 2),
                     Fraction(1), Fraction(5), Fraction(10)))  # fmt: skip
        if fine is not None:
            for v in _values(units, fine):
                put(v, 2)
        step = _label_step(units, radius, text_height, len(str(math.floor(units))))
        if kind == "month":
            step = max(step, Fraction(5))
        for v in _values(units, step):
            put(v, 0, _number(v))
        if kind == "month":
            for share, name in PHASES:
                put(units * share, 0 if share == 0 else 1, note=name)
    return Scale(kind, unit, units, tuple(marks[v] for v in sorted(marks)))
