"""The tooth proportions a wheel gets when neither it nor ``[defaults]`` sets them.

Involute teeth take the ISO 53 type A basic rack. Triangular (straight-flanked) teeth
take proportions chosen so that any pair from 10 to 300 teeth runs at its standard
centre distance with the process's smallest backlash to spare; the reasoning and the
measured margins are in docs/format.md ("Triangular teeth that run"). Lengths in mm,
angles in degrees, the shape coefficients in modules.
"""

from __future__ import annotations

import math

from .model import Process
from .process_limits import default_backlash, min_backlash

__all__ = [
    "INVOLUTE_DEFAULTS",
    "TRIANGULAR_ADDENDUM",
    "TRIANGULAR_BACKLASH_FACTOR",
    "TRIANGULAR_DEDENDUM",
    "TRIANGULAR_FLANK_ANGLE_DEG",
    "TRIANGULAR_ROOT_RADIUS",
    "TRIANGULAR_TIP_RADIUS",
    "MIN_TOOTH_ANGLE_DEG",
    "default_tooth_angle_deg",
    "milled_root_radius",
    "tooth_angle_for_flank_deg",
    "tooth_defaults",
]

#: Involute defaults: the ISO 53:1998 type A basic rack (addendum 1.0 m, dedendum
#: 1.25 m, rack tip radius 0.38 m); the backlash follows the process
#: (:func:`.process_limits.default_backlash`).
INVOLUTE_DEFAULTS: dict[str, float] = {
    "tooth_angle_deg": 60.0,  # not used by involute teeth
    "addendum": 1.0,
    "dedendum": 1.25,
    "root_radius": 0.38,
    "tip_radius": 0.0,
}

#: Angle (degrees) between a triangular tooth's flank and the radius where the flank
#: crosses the pitch circle. Two straight-flanked wheels run smoothly only when this
#: angle is the same on both (derived: the flank normals must agree at the pitch
#: point); the default tooth angle keeps it equal on every wheel.
TRIANGULAR_FLANK_ANGLE_DEG = 30.0
#: Height of triangular teeth above the pitch circle, x module. Straight flanks leave
#: the ideal (involute) curve by a distance growing with the square of the height,
#: so short teeth need far less play (measured: docs/format.md).
TRIANGULAR_ADDENDUM = 0.6
#: Depth below the pitch circle, x module: the addendum plus the ISO 53 clearance of
#: 0.25 m; a printed root then stays wider than a nozzle line.
TRIANGULAR_DEDENDUM = 0.85
#: Rounding of the tooth tips, x module: takes off the corners that touch first.
TRIANGULAR_TIP_RADIUS = 0.25
#: Rounding of the root, x module (a milled root takes at least the cutter's radius).
TRIANGULAR_ROOT_RADIUS = 0.1
#: The least running backlash of a pair of default triangular wheels is very nearly
#: ``k m (1/z1 + 1/z2)`` mm (measured over every pair from 10 to 300 teeth, see
#: docs/format.md); this is ``k``, with a little to spare. Each wheel's default
#: backlash is ``2 k m / z`` plus the process's smallest backlash, so that a pair
#: (which takes half of each wheel's backlash) runs with that smallest backlash free.
TRIANGULAR_BACKLASH_FACTOR = 1.5
#: The loader's smallest tooth angle; very small wheels get at least this.
MIN_TOOTH_ANGLE_DEG = 20.0


def tooth_angle_for_flank_deg(teeth: int, flank_angle_deg: float) -> float:
    """Included angle (degrees) of a basic triangular tooth on ``teeth`` teeth whose
    flanks cross the pitch circle at ``flank_angle_deg`` to the radius.

    The basic tooth is half a pitch thick on the pitch circle, so its flank crosses
    it 90/z degrees from the tooth's middle, where the radius has turned 90/z degrees
    from the middle's; leaning in by half the included angle b, the flank meets that
    radius at b/2 + 90/z (derived). Hence b = 2 alpha - 180/z.
    """
    return 2 * flank_angle_deg - 180.0 / teeth


def default_tooth_angle_deg(teeth: int) -> float:
    """Included tooth angle (degrees) of a default triangular tooth on ``teeth`` teeth:
    flanks at ``TRIANGULAR_FLANK_ANGLE_DEG`` to the radius at the pitch circle on every
    wheel, ``60 - 180/z``; never less than ``MIN_TOOTH_ANGLE_DEG``."""
    return max(
        MIN_TOOTH_ANGLE_DEG,
        tooth_angle_for_flank_deg(teeth, TRIANGULAR_FLANK_ANGLE_DEG),
    )


def milled_root_radius(process: Process, module: float) -> float:
    """The smallest root rounding (x module) the process's end mill can leave in a
    triangular tooth space: its own radius, ``cutter / 2``."""
    return process.cutter / 2 / module


def tooth_defaults(
    form: str, teeth: int, module: float, process: Process
) -> dict[str, float]:
    """Default tooth proportions of one wheel, by form, tooth count and process.

    Returns the wheel fields ``tooth_angle_deg``, ``addendum``, ``dedendum``,
    ``root_radius``, ``tip_radius`` (x module) and ``backlash`` (mm).
    """
    if form != "triangular":
        return {**INVOLUTE_DEFAULTS, "backlash": default_backlash(process)}
    root = TRIANGULAR_ROOT_RADIUS
    if process.kind == "mill":
        root = max(root, milled_root_radius(process, module))
    return {
        "tooth_angle_deg": default_tooth_angle_deg(teeth),
        "addendum": TRIANGULAR_ADDENDUM,
        "dedendum": TRIANGULAR_DEDENDUM,
        "root_radius": root,
        "tip_radius": TRIANGULAR_TIP_RADIUS,
        "backlash": _round_up(
            2 * TRIANGULAR_BACKLASH_FACTOR * module / teeth + min_backlash(process)
        ),
    }


def _round_up(value: float) -> float:
    """Up to the next micrometre, so that defaults print as short numbers."""
    return math.ceil(value * 1000 - 1e-9) / 1000
