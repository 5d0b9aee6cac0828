"""ISO 286 limits and fits for running bores: limit deviations from the standard's tables.

Only what a running fit of a bore on a shaft needs is tabulated: the standard tolerance
grades IT5 to IT11 and the fundamental deviations of the clearance positions d, e, f,
g, h (shafts) and D, E, F, G, H (holes), for nominal sizes up to 500 mm. Deviations are
whole micrometres, as the standard prints them; sizes and clearances are in mm.

Sources: ISO 286-1:2010, Table 1 (standard tolerance grades) and Table 2 (fundamental
deviations of shafts a to h); for holes A to H the rule EI = -es of the same letter
(ISO 286-1:2010, 4.3.2.4, "general rule"). Spot values are checked in
tests/test_layout_fits.py against ISO 286-2 tables printed by tool makers (see
docs/references.md, section 9).
"""

from __future__ import annotations

import bisect
import re
from dataclasses import dataclass

__all__ = [
    "MAX_SIZE",
    "Fit",
    "FitLimits",
    "ToleranceZone",
    "fit_limits",
    "limit_deviations",
    "parse_fit",
    "parse_zone",
]

#: Upper ends (mm, "up to and including") of the ISO 286 nominal size ranges used here.
_RANGE_TOP: tuple[float, ...] = (
    3, 6, 10, 18, 30, 50, 80, 120, 180, 250, 315, 400, 500,
)  # fmt: skip
MAX_SIZE = 500.0

# ISO 286-1:2010 Table 1, standard tolerance grades (micrometres), one column per range.
_IT: dict[int, tuple[int, ...]] = {
    5: (4, 5, 6, 8, 9, 11, 13, 15, 18, 20, 23, 25, 27),
    6: (6, 8, 9, 11, 13, 16, 19, 22, 25, 29, 32, 36, 40),
    7: (10, 12, 15, 18, 21, 25, 30, 35, 40, 46, 52, 57, 63),
    8: (14, 18, 22, 27, 33, 39, 46, 54, 63, 72, 81, 89, 97),
    9: (25, 30, 36, 43, 52, 62, 74, 87, 100, 115, 130, 140, 155),
    10: (40, 48, 58, 70, 84, 100, 120, 140, 160, 185, 210, 230, 250),
    11: (60, 75, 90, 110, 130, 160, 190, 220, 250, 290, 320, 360, 400),
}

# ISO 286-1:2010 Table 2, upper deviation es of shafts (micrometres), clearance letters.
_SHAFT_ES: dict[str, tuple[int, ...]] = {
    "d": (-20, -30, -40, -50, -65, -80, -100, -120, -145, -170, -190, -210, -230),
    "e": (-14, -20, -25, -32, -40, -50, -60, -72, -85, -100, -110, -125, -135),
    "f": (-6, -10, -13, -16, -20, -25, -30, -36, -43, -50, -56, -62, -68),
    "g": (-2, -4, -5, -6, -7, -9, -10, -12, -14, -15, -17, -18, -20),
    "h": (0,) * 13,
}

_ZONE = re.compile(r"^([A-Za-z])(\d{1,2})$")


@dataclass(frozen=True, slots=True)
class ToleranceZone:
    """A tolerance position and grade, e.g. ``H7`` (hole) or ``g6`` (shaft)."""

    letter: str
    grade: int

    @property
    def is_hole(self) -> bool:
        return self.letter.isupper()

    def __str__(self) -> str:
        return f"{self.letter}{self.grade}"


@dataclass(frozen=True, slots=True)
class Fit:
    """A hole zone on a shaft zone, written ``"H7/g6"``."""

    hole: ToleranceZone
    shaft: ToleranceZone

    def __str__(self) -> str:
        return f"{self.hole}/{self.shaft}"


@dataclass(frozen=True, slots=True)
class FitLimits:
    """Limit deviations (micrometres) of hole and shaft at one nominal size (mm)."""

    size: float
    fit: Fit
    hole_upper: int
    hole_lower: int
    shaft_upper: int
    shaft_lower: int

    @property
    def min_clearance(self) -> float:
        """Smallest diametral clearance in mm (largest shaft in smallest hole)."""
        return (self.hole_lower - self.shaft_upper) / 1000.0

    @property
    def max_clearance(self) -> float:
        """Largest diametral clearance in mm."""
        return (self.hole_upper - self.shaft_lower) / 1000.0

    @property
    def mean_clearance(self) -> float:
        """Diametral clearance in mm between the middles of the two zones."""
        return (self.min_clearance + self.max_clearance) / 2

    @property
    def hole_limits(self) -> tuple[float, float]:
        """Smallest and largest hole diameter in mm."""
        return (
            self.size + self.hole_lower / 1000.0,
            self.size + self.hole_upper / 1000.0,
        )

    @property
    def shaft_limits(self) -> tuple[float, float]:
        """Smallest and largest shaft diameter in mm."""
        return (
            self.size + self.shaft_lower / 1000.0,
            self.size + self.shaft_upper / 1000.0,
        )


def _allowed() -> str:
    letters = (
        ", ".join(sorted(_SHAFT_ES))
        + " (shafts) or "
        + ", ".join(s.upper() for s in sorted(_SHAFT_ES))
    )
    return f"a letter {letters} (holes) and a grade {min(_IT)} to {max(_IT)}"


def parse_zone(text: str) -> ToleranceZone:
    """``"H7"`` -> ``ToleranceZone("H", 7)``; only the running-fit letters are known."""
    m = _ZONE.match(text.strip())
    if not m or m.group(1).lower() not in _SHAFT_ES or int(m.group(2)) not in _IT:
        raise ValueError(f"'zone' must be {_allowed()}, got {text!r}")
    return ToleranceZone(m.group(1), int(m.group(2)))


def parse_fit(text: str) -> Fit:
    """``"H7/g6"`` -> a :class:`Fit`: a hole zone (capital) over a shaft zone (small)."""
    parts = text.split("/")
    if len(parts) != 2:
        raise ValueError(
            f"'fit' must be written hole/shaft such as 'H7/g6', got {text!r}"
        )
    hole, shaft = parse_zone(parts[0]), parse_zone(parts[1])
    if not hole.is_hole or shaft.is_hole:
        raise ValueError(
            f"'fit' must be a hole zone (capital letter) over a shaft zone (small letter),"
            f" got {text!r}"
        )
    return Fit(hole, shaft)


def _column(size: float) -> int:
    if not 0 < size <= MAX_SIZE:
        raise ValueError(f"'size' must be > 0 and <= {MAX_SIZE:g} mm, got {size}")
    # "over a up to and including b": a size equal to a range's top belongs to it
    return bisect.bisect_left(_RANGE_TOP, size)


def limit_deviations(size: float, zone: ToleranceZone | str) -> tuple[int, int]:
    """Upper and lower limit deviation (micrometres) of ``zone`` at ``size`` mm."""
    z = parse_zone(zone) if isinstance(zone, str) else zone
    col = _column(size)
    it = _IT[z.grade][col]
    es = _SHAFT_ES[z.letter.lower()][col]
    if z.is_hole:
        lower = -es  # EI = -es for A to H (ISO 286-1, general rule)
        return lower + it, lower
    return es, es - it


def fit_limits(size: float, fit: Fit | str) -> FitLimits:
    """Limit deviations of both members of ``fit`` at nominal ``size`` mm."""
    f = parse_fit(fit) if isinstance(fit, str) else fit
    hu, hl = limit_deviations(size, f.hole)
    su, sl = limit_deviations(size, f.shaft)
    return FitLimits(size, f, hu, hl, su, sl)
