"""What an arbor or tube is made to, by process: end shake, stops, fits and fixings (mm).

One home for the numbers of turned members:

- **end shake**: how far an arbor may move along its axis between its two bearings,
  the sum of the gaps at its two stops (common practice, no source: a clock arbor is
  given a few hundredths to a tenth or two of a millimetre so that it turns freely
  whatever the plates' flatness; printed parts need more, about a layer and a half);
- **stops**: a shoulder turned on the member, or a collar fixed to it, is
  :func:`stop_diameter` across (the member plus a wall of a quarter of its diameter
  and at least the process's thinnest wall on each side) and :func:`collar_length`
  long (half the diameter, at least 1 mm); a stop keeps :data:`STOP_CLEARANCE` from
  everything on other axes (common practice, no source);
- **fits**: every length that runs in or on something, or holds something, is made to
  the shaft zone of the process's ISO 286 fit (``g6`` of ``H7/g6``; :func:`shaft_zone`)
  and a bore to its hole zone; a ball bearing's bore takes the ``h`` zone of the same
  grade (a sliding fit, fixed with retaining compound). Printed parts have no ISO zone:
  their holes are opened by the print clearance;
- **fixing** a wheel or collar to its member: :func:`fixing` names the method.
"""

from __future__ import annotations

import math

from ..design.model import Process
from ..design.process_limits import wall_minimum
from ..layout.fits import limit_deviations, parse_fit

__all__ = [
    "END_SHAKE",
    "STOP_CLEARANCE",
    "STOCK_STEP",
    "STOCK_STEP_INCH",
    "collar_length",
    "end_shake",
    "fixing",
    "hole_zone",
    "round_up",
    "shaft_limits",
    "shaft_zone",
    "stock_diameter",
    "stop_diameter",
]

#: mm of axial play of an arbor between its bearings (see the module text).
END_SHAKE = {"mill": 0.1, "hand": 0.15, "print": 0.3}
#: mm a shoulder or collar keeps from every body on another axis.
STOP_CLEARANCE = 0.5
#: mm: bar and tube for turning are bought in these steps of diameter (common
#: practice, no source).
STOCK_STEP = 0.5
#: mm: in an inch workshop bar comes in 32nds of an inch (common practice, no source).
STOCK_STEP_INCH = 25.4 / 32
# mm of material a turner takes off the bar's skin (common practice, no source)
_TURNING_ALLOWANCE = 0.5


def round_up(x: float, step: float) -> float:
    """``x`` rounded up to a multiple of ``step`` (an exact multiple stays)."""
    return round(math.ceil(x / step - 1e-9) * step, 6)


def end_shake(process: Process) -> float:
    """Total axial play (mm) of an arbor between its two stops."""
    return END_SHAKE[process.kind]


def stop_diameter(process: Process, diameter: float) -> float:
    """Across a shoulder or collar (mm) on a member ``diameter`` mm across."""
    wall = max(0.25 * diameter, wall_minimum(process))
    return round_up(diameter + 2 * wall, 0.1)


def collar_length(diameter: float) -> float:
    """Length (mm) of a collar on a member ``diameter`` mm across."""
    return max(1.0, round_up(0.5 * diameter, 0.5))


def shaft_zone(process: Process, bearing: bool = False) -> str:
    """The ISO 286 zone a running or fitted length is made to; ``""`` when printed.

    ``bearing``: the seat of a ball bearing's bore (``h`` of the fit's grade).
    """
    if process.kind == "print":
        return ""
    zone = parse_fit(process.fit).shaft
    return f"h{zone.grade}" if bearing else str(zone)


def hole_zone(process: Process) -> str:
    """The ISO 286 zone of a bore that runs on, or is fixed to, a shaft."""
    if process.kind == "print":
        return ""
    return str(parse_fit(process.fit).hole)


def shaft_limits(size: float, zone: str) -> tuple[float, float]:
    """Smallest and largest size (mm) of a shaft of nominal ``size`` in ``zone``."""
    upper, lower = limit_deviations(size, zone)
    return round(size + lower / 1000, 6), round(size + upper / 1000, 6)


def stock_diameter(largest: float, units: str = "mm") -> float:
    """Bar (mm) to turn a member whose largest diameter is ``largest`` from: the next
    size up in the workshop's steps (32nds of an inch in a design in inches)."""
    step = STOCK_STEP_INCH if units == "in" else STOCK_STEP
    return round_up(largest + _TURNING_ALLOWANCE, step)


def fixing(process: Process, shape: str = "round") -> str:
    """How a wheel or collar is fixed on its member, in a few words."""
    if shape == "pinned":
        return "a cross pin through hub and member"
    how = {
        "mill": "retaining compound",
        "hand": "soft solder or retaining compound",
        "print": "glue",
    }[process.kind]
    if shape in ("square", "hex"):
        return f"driven by the flats, kept in place with {how}"
    return how
