"""Dividing-head indexing: crank turns and hole spaces per division, exact fractions.

A worm head turns the work 1/``ratio`` of a turn per crank turn (40:1 is usual).

*Simple indexing*: the index plate is locked; per division the crank turns
``ratio/teeth``: whole turns plus ``holes`` hole spaces on a ``circle``-hole circle.
That works when the denominator of the fractional part divides a circle on the plates.

*Differential indexing* (method and formula: Machinery's Handbook, "Differential
Indexing", from memory): index as if for a near count ``A`` that indexes simply, with
the plate unlocked and geared to the spindle. With ``g`` = plate turns per spindle turn,
signed + when the plate turns the same way as the crank, the crank moves ``ratio/A``
relative to the plate and the plate moves ``g`` times the spindle, so the spindle turns
``(ratio/A) / (ratio - g)`` per division; that is ``1/teeth`` exactly when
``g = (A - teeth) * ratio / A``.

Everything here is exact (``int``, ``Fraction``); nothing imports the CAD kernel.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache
from itertools import permutations
from typing import Any, Iterable, Literal

from ..design.bounds import BOUNDS
from ..design.model import RelativeSense
from ..design.periods import parse_number
from .plates import CHANGE_GEARS, THREE_PLATE

__all__ = [
    "GearTrain",
    "IndexPlan",
    "AngleSetting",
    "Method",
    "PLATE_WORDS",
    "indexing_plan",
    "angle_setting",
    "crank_settings",
    "work_turns_per_division",
]

Method = Literal["simple", "differential", "none"]
#: How the shop says the index plate turns relative to the crank (the relative sense
#: ``"same"`` / ``"opposite"`` of the train model) in differential indexing.
PLATE_WORDS: dict[RelativeSense, str] = {"same": "with", "opposite": "against"}

# Idlers that give each sense on a typical head, from memory (Machinery's Handbook,
# "Differential Indexing"): there the spindle gear meshing straight into the
# plate-shaft gear would turn the plate against the crank, so each idler flips it.
# A simple train needs at least one idler to bridge the centres, hence 2 (not 0) for
# "against"; a compound train's two meshes already flip twice.
_IDLERS: dict[tuple[bool, RelativeSense], int] = {
    (False, "same"): 1,
    (False, "opposite"): 2,
    (True, "same"): 0,
    (True, "opposite"): 1,
}

# (whole turns, (hole spaces, circle) choices) and (drivers, driven) teeth
_Setting = tuple[int, tuple[tuple[int, int], ...]]
_Train = tuple[tuple[int, ...], tuple[int, ...]]

# Range of tooth counts offered when suggesting one extra change gear.
_SUGGEST_TEETH = range(12, 129)


@dataclass(frozen=True, slots=True)
class GearTrain:
    """Change gears from the head spindle to the index-plate drive (differential).

    ``drivers`` and ``driven`` are teeth counts in the order the motion passes:
    ``drivers[0]`` sits on the spindle, ``driven[-1]`` on the shaft that turns the
    index plate (assumed 1:1 to the plate). A compound train has two of each:
    spindle ``drivers[0]`` -> stud ``driven[0]``; stud ``drivers[1]`` -> plate shaft
    ``driven[1]``. ``sense`` is the plate's relative to the crank (``"same"``: the
    plate turns with it); ``idlers`` is the count that gives it on a typical head.
    """

    drivers: tuple[int, ...]
    driven: tuple[int, ...]
    sense: RelativeSense
    idlers: int

    @property
    def plate_words(self) -> str:
        """``"with"`` or ``"against"``: the plate's turn relative to the crank."""
        return PLATE_WORDS[self.sense]

    @property
    def compound(self) -> bool:
        return len(self.drivers) == 2

    @property
    def ratio(self) -> Fraction:
        """Plate turns per spindle turn, + when the plate turns with the crank."""
        value = Fraction(1)
        for teeth in self.drivers:
            value *= teeth
        for teeth in self.driven:
            value /= teeth
        return value if self.sense == "same" else -value

    @property
    def order(self) -> tuple[int, ...]:
        """Teeth in mounting order: spindle, [stud driven, stud driver,] plate shaft."""
        if self.compound:
            return (self.drivers[0], self.driven[0], self.drivers[1], self.driven[1])
        return (self.drivers[0], self.driven[0])


@dataclass(frozen=True, slots=True)
class IndexPlan:
    """How to index ``teeth`` equal divisions on a ``ratio``:1 head.

    ``crank_turns`` is the crank motion per division relative to the index plate, in
    turns: ``turns`` whole turns plus ``holes`` hole spaces on the ``circle``-hole
    circle (``circle`` is None when ``holes`` is 0: whole turns only, any circle).
    ``other_circles`` lists further (holes, circle) choices for the same fraction.
    For ``none``, ``crank_turns`` is ``ratio/teeth``, the motion no circle takes.
    For ``differential`` the crank is set as for ``approx_count`` divisions and
    ``gears`` drive the plate. For ``none``, ``suggestion`` says what plate circle or
    change gear would make it possible and the setting fields are 0 / None;
    ``suggested_circle`` is the smallest circle that would index ``teeth`` simply and
    ``suggested_gear`` one extra change gear that would allow differential indexing
    (None when no gear of 12 to 128 teeth does).
    """

    teeth: int
    ratio: int
    method: Method
    crank_turns: Fraction
    turns: int = 0
    holes: int = 0
    circle: int | None = None
    other_circles: tuple[tuple[int, int], ...] = ()
    approx_count: int | None = None
    gears: GearTrain | None = None
    suggestion: str = ""
    suggested_circle: int | None = None
    suggested_gear: int | None = None

    @property
    def sense(self) -> RelativeSense | None:
        return None if self.gears is None else self.gears.sense

    def as_dict(self) -> dict[str, Any]:
        """Plain JSON-ready mapping (fractions as ``"n/d"`` strings)."""
        gears = self.gears
        return {
            "teeth": self.teeth,
            "ratio": self.ratio,
            "method": self.method,
            "turns": self.turns,
            "holes": self.holes,
            "circle": self.circle,
            "crank_turns": str(self.crank_turns),
            "other_circles": [list(pair) for pair in self.other_circles],
            "approx_count": self.approx_count,
            "gears": None if gears is None else list(gears.order),
            "train": None if gears is None else _train_name(gears),
            "gear_ratio": None if gears is None else str(gears.ratio),
            "sense": None if gears is None else gears.plate_words,
            "idlers": None if gears is None else gears.idlers,
            "suggestion": self.suggestion or None,
            "suggested_circle": self.suggested_circle,
            "suggested_gear": self.suggested_gear,
        }


def _train_name(gears: GearTrain) -> str:
    return "compound" if gears.compound else "simple"


@dataclass(frozen=True, slots=True)
class AngleSetting:
    """Crank setting for turning the work by ``angle_deg`` degrees (plate locked).

    ``found`` is False when no circle of the plates takes the fractional part; then
    ``suggestion`` and ``suggested_circle`` name the smallest circle that would.
    """

    angle_deg: Fraction
    ratio: int
    crank_turns: Fraction
    found: bool
    turns: int = 0
    holes: int = 0
    circle: int | None = None
    other_circles: tuple[tuple[int, int], ...] = ()
    suggestion: str = ""
    suggested_circle: int | None = None


def _whole(value: object, name: str, bound: str) -> int:
    if isinstance(value, bool) or not isinstance(value, int):
        raise ValueError(f"'{name}' must be a whole number, got {value!r}")
    limit = BOUNDS[bound]
    if not limit.holds(value):
        raise ValueError(
            f"'{name}' must be {limit.allowed()}, got {value} ({limit.reason})"
        )
    return value


def _counts(values: object, name: str, each: str, count: str) -> tuple[int, ...]:
    if isinstance(values, (str, bytes)) or not isinstance(values, Iterable):
        raise ValueError(
            f"'{name}' must be a sequence of whole numbers, got {values!r}"
        )
    items = tuple(values)
    limit, most = BOUNDS[each], BOUNDS[count]
    if len(items) > most.high:
        raise ValueError(
            f"'{name}' may hold at most {int(most.high)} entries, got {len(items)} "
            f"({most.reason})"
        )
    for item in items:
        if isinstance(item, bool) or not isinstance(item, int) or not limit.holds(item):
            raise ValueError(
                f"each of '{name}' must be {limit.allowed()}, got {item!r}"
            )
    return items


def crank_settings(
    crank_turns: Fraction, plates: tuple[int, ...]
) -> tuple[int, tuple[tuple[int, int], ...]] | None:
    """Split a crank motion into whole turns and (holes, circle) choices.

    Parameters
    ----------
    crank_turns
        Crank motion in turns (exact, >= 0).
    plates
        Hole circles available.

    Returns
    -------
    (turns, choices) or None
        ``choices`` are (hole spaces, circle) pairs, fewest holes first; empty when the
        motion is whole turns. None when no circle takes the fractional part.
    """
    turns = crank_turns.numerator // crank_turns.denominator
    rest = crank_turns - turns
    if rest == 0:
        return turns, ()
    choices = tuple(
        (rest.numerator * (circle // rest.denominator), circle)
        for circle in sorted(set(plates))
        if circle % rest.denominator == 0
    )
    return (turns, choices) if choices else None


def work_turns_per_division(
    ratio: int, crank_turns: Fraction, gear_ratio: Fraction = Fraction(0)
) -> Fraction:
    """Spindle (work) turns per division, exact.

    ``crank_turns`` is the crank motion relative to the plate; ``gear_ratio`` the
    signed plate turns per spindle turn (0: plate locked). The crank turns
    ``c = ratio * s`` for spindle turns ``s`` and the plate ``g * s``, so
    ``crank_turns = (ratio - g) * s``.
    """
    return crank_turns / (ratio - gear_ratio)


def _divisors(n: int) -> set[int]:
    small = [d for d in range(1, math.isqrt(n) + 1) if n % d == 0]
    return set(small) | {n // d for d in small}


@lru_cache(maxsize=32)
def _indexable(ratio: int, plates: tuple[int, ...]) -> dict[int, _Setting]:
    # Every count A with ratio/A simple on these plates, in increasing order. With
    # g = gcd(A, ratio), the fractional part's denominator q = A / g must divide a
    # circle, so A = q * g with q dividing a circle and g dividing the ratio: only
    # those products are tried (a few hundred), not every count up to ratio * circle.
    ratio_divisors = _divisors(ratio)
    counts = {q * g for c in plates for q in _divisors(c) for g in ratio_divisors}
    found = {}
    for count in sorted(counts):
        if count < 2:
            continue
        setting = crank_settings(Fraction(ratio, count), plates)
        if setting is not None:
            found[count] = setting
    return found


@lru_cache(maxsize=32)
def _trains(gears: tuple[int, ...]) -> dict[Fraction, _Train]:
    # Unsigned ratio -> (drivers, driven), simple trains preferred over compound; among
    # equal ones the smallest total of teeth (compact on the banjo), then lowest counts.
    # Each physical gear once: permutations of positions, so a gear listed twice (24)
    # may appear twice.
    best: dict[Fraction, _Train] = {}
    keys: dict[Fraction, tuple[int, int, tuple[int, ...]]] = {}
    for size in (2, 4):
        for pick in permutations(range(len(gears)), size):
            teeth = tuple(gears[i] for i in pick)
            drivers, driven = teeth[0::2], teeth[1::2]
            value = Fraction(1)
            for t in drivers:
                value *= t
            for t in driven:
                value /= t
            key = (size, sum(teeth), teeth)
            if value not in keys or key < keys[value]:
                keys[value] = key
                best[value] = (drivers, driven)
    return best


def _circle_suggestion(crank_turns: Fraction, plates: tuple[int, ...]) -> int:
    need = (crank_turns - crank_turns.numerator // crank_turns.denominator).denominator
    # The smallest multiple of the needed denominator that is at least as large as the
    # smallest circle the user has (a 3-hole circle is not a plate anyone drills).
    smallest = min(plates)
    return need * max(1, -(-smallest // need))


def _gear_suggestion(
    teeth: int, ratio: int, plates: tuple[int, ...], gears: tuple[int, ...]
) -> tuple[int, str] | None:
    # One extra gear that, with one gear already owned, makes a simple train for a
    # near count A; nearest A first, then the smallest new gear.
    owned = sorted(set(gears))
    best: tuple[int, int, str] | None = None  # (|A - N|, new teeth, text)
    for count, (turns, choices) in _indexable(ratio, plates).items():
        if count == teeth:
            continue
        need = abs(Fraction((count - teeth) * ratio, count))
        for other in owned:
            for new, spindle, shaft in (
                (need * other, None, other),
                (other / need, other, None),
            ):
                if new.denominator != 1 or int(new) not in _SUGGEST_TEETH:
                    continue
                new_teeth = int(new)
                spindle_t = new_teeth if spindle is None else spindle
                shaft_t = new_teeth if shaft is None else shaft
                key = (abs(count - teeth), new_teeth)
                if best is None or key < best[:2]:
                    where = _describe_setting(turns, choices)
                    text = (
                        f"a {new_teeth}-tooth change gear: index as for {count} "
                        f"({where}) with spindle {spindle_t} driving {shaft_t}"
                    )
                    best = (key[0], key[1], text)
    return None if best is None else (best[1], best[2])


def _describe_setting(turns: int, choices: tuple[tuple[int, int], ...]) -> str:
    if not choices:
        return f"{turns} whole turn{'s' if turns != 1 else ''}"
    holes, circle = choices[0]
    return f"{turns} turns + {holes} holes on the {circle} circle"


def indexing_plan(
    teeth: int,
    ratio: int = 40,
    plates: tuple[int, ...] = THREE_PLATE,
    gears: tuple[int, ...] = CHANGE_GEARS,
) -> IndexPlan:
    """Find how to index ``teeth`` equal divisions.

    Simple indexing when the plates allow it; otherwise differential indexing ranked
    by: simple gear train before compound, then nearest approximate count, then
    fewest hole spaces, then fewest idlers. Never raises for a count that cannot be
    indexed: the plan then has method ``"none"`` and a ``suggestion``.

    Parameters
    ----------
    teeth
        Divisions per turn of the work, >= 2.
    ratio
        Worm ratio of the head (crank turns per spindle turn), >= 1.
    plates
        Hole circles available (holes per circle, each >= 2).
    gears
        Change gears owned, one entry per gear (a count listed twice is two gears);
        empty for simple indexing only.

    Returns
    -------
    IndexPlan

    Raises
    ------
    ValueError
        For a bad argument (``teeth`` < 2, an empty plate list, a non-integer count).
    """
    teeth = _whole(teeth, "teeth", "option.index.divisions")
    ratio = _whole(ratio, "ratio", "option.index.ratio")
    plates = tuple(
        sorted(
            set(_counts(plates, "plates", "option.index.holes", "option.index.circles"))
        )
    )
    gears = tuple(
        sorted(_counts(gears, "gears", "option.index.gear_teeth", "option.index.gears"))
    )
    if not plates:
        raise ValueError("'plates' must hold at least one hole circle, got none")

    crank = Fraction(ratio, teeth)
    setting = crank_settings(crank, plates)
    if setting is not None:
        turns, choices = setting
        holes, circle = choices[0] if choices else (0, None)
        return IndexPlan(
            teeth, ratio, "simple", crank, turns, holes, circle, choices[1:]
        )

    trains = _trains(gears) if gears else {}
    best: tuple[tuple[int, ...], IndexPlan] | None = None
    for count, (turns, choices) in _indexable(ratio, plates).items():
        if count == teeth:
            continue
        gear_ratio = Fraction((count - teeth) * ratio, count)
        train = trains.get(abs(gear_ratio))
        if train is None:
            continue
        drivers, driven = train
        sense: RelativeSense = "same" if gear_ratio > 0 else "opposite"
        idlers = _IDLERS[(len(drivers) == 2, sense)]
        holes, circle = choices[0] if choices else (0, None)
        key = (len(drivers), abs(count - teeth), holes, idlers, circle or 0, count)
        if best is not None and key >= best[0]:
            continue
        crank_a = Fraction(ratio, count)
        gear_train = GearTrain(drivers, driven, sense, idlers)
        # Belt and braces: the exact kinematics must give 1/teeth, whatever the search.
        exact = work_turns_per_division(ratio, crank_a, gear_train.ratio)
        if exact != Fraction(1, teeth):
            raise AssertionError(f"differential plan for {teeth} is not exact")
        plan = IndexPlan(
            teeth, ratio, "differential", crank_a, turns, holes, circle,
            choices[1:], count, gear_train,
        )  # fmt: skip
        best = (key, plan)
    if best is not None:
        return best[1]

    circle = _circle_suggestion(crank, plates)
    parts = [f"a {circle}-hole circle would index {teeth} simply"]
    gear = _gear_suggestion(teeth, ratio, plates, gears)
    if gear is not None:
        parts.append(f"or, for differential indexing, {gear[1]}")
    return IndexPlan(
        teeth, ratio, "none", crank,
        suggestion="; ".join(parts),
        suggested_circle=circle,
        suggested_gear=None if gear is None else gear[0],
    )  # fmt: skip


def angle_setting(
    angle_deg: Fraction | int | float | str,
    ratio: int = 40,
    plates: tuple[int, ...] = THREE_PLATE,
) -> AngleSetting:
    """Crank setting for turning the work by an angle (simple, plate locked).

    Parameters
    ----------
    angle_deg
        Angle in degrees, > 0. A float is taken at its shortest decimal form
        (35.5 -> 71/2); a string may be a decimal or a fraction ("100/3").
    ratio
        Worm ratio of the head, >= 1.
    plates
        Hole circles available.

    Returns
    -------
    AngleSetting
        One crank turn is 360/``ratio`` degrees of the work.
    """
    ratio = _whole(ratio, "ratio", "option.index.ratio")
    plates = tuple(
        sorted(
            set(_counts(plates, "plates", "option.index.holes", "option.index.circles"))
        )
    )
    if not plates:
        raise ValueError("'plates' must hold at least one hole circle, got none")
    try:
        # a float at its shortest repr, so 0.1 is 1/10 and not 3602879701896397/2**55
        if isinstance(angle_deg, Fraction):
            angle = angle_deg
        elif isinstance(angle_deg, (int, float)) and not isinstance(angle_deg, bool):
            angle = parse_number(repr(angle_deg))
        else:
            angle = parse_number(str(angle_deg))  # True, None: not numbers
    except ValueError as exc:
        raise ValueError(
            f"'angle_deg' must be a number of degrees, got {angle_deg!r} ({exc})"
        ) from None
    limit = BOUNDS["option.index.angle"]
    if angle <= 0:
        raise ValueError(f"'angle_deg' must be greater than 0, got {angle}")
    if not limit.holds(angle):
        raise ValueError(
            f"'angle_deg' must be {limit.allowed()}, got {angle} ({limit.reason})"
        )
    crank = angle * ratio / 360
    setting = crank_settings(crank, plates)
    if setting is None:
        circle = _circle_suggestion(crank, plates)
        return AngleSetting(
            angle, ratio, crank, False,
            suggestion=f"a {circle}-hole circle would give {angle} degrees",
            suggested_circle=circle,
        )  # fmt: skip
    turns, choices = setting
    holes, circle_found = choices[0] if choices else (0, None)
    return AngleSetting(
        angle, ratio, crank, True, turns, holes, circle_found, choices[1:]
    )
