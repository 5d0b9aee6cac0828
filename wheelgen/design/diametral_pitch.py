"""Wheels cut to a diametral pitch: their module and their inch tooth proportions.

A diametral pitch P is the number of teeth per inch of pitch diameter, so the module
is exactly ``m = 25.4 / P`` mm and a length of ``k / P`` inches is ``k`` modules. The
inch standards give the 20-degree full-depth involute tooth in two ranges, and where
they differ from the metric basic rack (ISO 53 type A: addendum 1, dedendum 1.25,
rack tip radius 0.38 modules) a diametral-pitch wheel takes the inch values:

- *coarse pitch*, P under 20 (ANSI/AGMA 201.02): addendum 1.000/P, dedendum
  1.250/P (R. L. Mott, *Machine Elements in Mechanical Design*, 4th ed., Table 8-4);
  basic rack tip (root fillet) radius 0.300/P (ANSI/AGMA 201.02, from memory);
- *fine pitch*, P of 20 and finer (AGMA 207.06, now ANSI/AGMA 1003): addendum
  1.000/P, dedendum 1.200/P + 0.002 in, so whole depth 2.200/P + 0.002 in (Mott,
  Table 8-4; the whole depths of PIC Design's "Spur Gear Data" table 7.2 follow it,
  for example 0.0708 in at 32 DP); rack tip radius 0.300/P as for coarse pitch
  (from memory), or, at the finest pitches where the deeper dedendum narrows the
  rack's tooth so that 0.300/P no longer fits its tip, the largest that does
  (derived below; 0.29/P at 200 DP).

The 0.002 in of the fine pitches is a length, not a multiple of the module: in
modules it is ``0.002 P``. Only the standard library is used.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

from .units import MM_PER_INCH

__all__ = [
    "FINE_PITCH_FROM",
    "InchRack",
    "inch_rack",
    "largest_rack_tip_radius",
    "module_of_dp",
    "pitch_words",
]

#: Diametral pitches from this one up are fine pitch (Mott, Table 8-4: "P >= 20").
FINE_PITCH_FROM = 20
# the fine-pitch clearance added to 0.200/P, in inches (Mott, Table 8-4)
_FINE_EXTRA_IN = Fraction(2, 1000)


@dataclass(frozen=True, slots=True)
class InchRack:
    """The inch basic rack at one diametral pitch, in modules (multiples of 1/P)."""

    addendum: float
    dedendum: float
    root_radius: float
    standard: str


def _exact(dp: float | Fraction) -> Fraction:
    # a float from a file or a command line is read as the decimal it was written as
    return dp if isinstance(dp, Fraction) else Fraction(repr(float(dp)))


def module_of_dp(dp: float | Fraction) -> float:
    """The module in mm of diametral pitch ``dp``: 25.4 / dp, computed exactly and
    rounded once (32 DP is 0.79375 mm)."""
    p = _exact(dp)
    if p <= 0:
        raise ValueError(f"'diametral_pitch' must be > 0 teeth per inch, got {dp}")
    return float(MM_PER_INCH / p)


def pitch_words(
    module: float, diametral_pitch: float | None, with_module: bool = False
) -> str:
    """The size of a wheel's teeth in words: ``"module 1 mm"``, ``"32 diametral
    pitch"``, or with ``with_module`` ``"32 diametral pitch (module 0.79375 mm)"``."""
    if diametral_pitch is None:
        return f"module {module:g} mm"
    words = f"{diametral_pitch:g} diametral pitch"
    return f"{words} (module {module:g} mm)" if with_module else words


def largest_rack_tip_radius(dedendum: float, pressure_angle_deg: float) -> float:
    """The largest tip radius (modules) of a basic rack whose tooth reaches
    ``dedendum`` modules below the pitch line, for an unshifted tooth of half a pitch
    meshing a mate of addendum 1.

    Derived: a tip circle tangent to the tip line and to the flank leaves the flank
    ``r (1 - sin a)`` above the tip. (1) The flank must stay straight over the mate's
    addendum, so ``r <= (dedendum - 1) / (1 - sin a)``: the clearance over
    ``1 - sin a`` (0.25 / (1 - sin 20 deg) = 0.380, ISO 53 type A's 0.38). (2) The
    tip is ``pi/4 - dedendum tan a`` modules wide on each side of its middle and the
    circle's centre lies ``r (1 - sin a) / cos a`` in from its corner, so
    ``r <= (pi/4 - dedendum tan a) cos a / (1 - sin a)``. The smaller of the two.
    """
    a = math.radians(pressure_angle_deg)
    sag = 1 - math.sin(a)
    over_flank = (dedendum - 1) / sag
    half = math.pi / 4 - dedendum * math.tan(a)
    return max(0.0, min(over_flank, half * math.cos(a) / sag))


def inch_rack(dp: float | Fraction, pressure_angle_deg: float = 20.0) -> InchRack:
    """The full-depth inch tooth at diametral pitch ``dp`` (see the module docstring
    for the standards and values); the rack tip radius is kept to what fits at
    ``pressure_angle_deg``."""
    p = _exact(dp)
    if p <= 0:
        raise ValueError(f"'diametral_pitch' must be > 0 teeth per inch, got {dp}")
    if p < FINE_PITCH_FROM:
        dedendum, standard = Fraction(5, 4), "ANSI/AGMA 201.02 coarse pitch"
    else:
        # 1.200/P + 0.002 in, in units of 1/P
        dedendum = Fraction(6, 5) + _FINE_EXTRA_IN * p
        standard = "AGMA 207.06 fine pitch"
    fits = largest_rack_tip_radius(float(dedendum), pressure_angle_deg)
    # 4 decimals, rounded down: a radius that fits, written as a person would
    radius = min(0.3, math.floor(fits * 10**4) / 10**4)
    return InchRack(1.0, float(dedendum), radius, standard)
