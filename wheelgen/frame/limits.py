"""The frame's sizes and limits for each process, each with its basis (mm).

Every rule the frame planner and its checks use lives here once:

- **clearance** between a still frame part (pillar, cock, bush) and anything that
  moves (a wheel's swept circle, a carried wheel's path, a pin's ring, an arbor): mill
  1.0 mm, hand and print 1.5 mm, radially and axially (common practice, no source: room
  for a plate that is not quite flat, a wheel that runs a little out of true, and
  printed parts that grow at the first layers). ``[frame] clearance`` sets it.
- **margin** of plate round the wheels' swept circles in the outline that is found
  automatically: 3 mm, print 4 mm (common practice, no source). ``[frame] margin``.
- **material round holes**: a hole's centre lies at least ``1.2 d`` from the plate's
  edge, and two holes' centres at least ``1.1 (d1 + d2)`` apart (``2.2 d`` for equal
  holes). These are the smallest edge distance ``e2 = 1.2 d0`` and spacing
  ``p1 = 2.2 d0`` of EN 1993-1-8:2005, Table 3.3 (holes for fasteners in plates); a
  pivot bears on its hole as a pin does, so the same proportions keep the plate from
  tearing out between holes. Printed plates also keep at least four nozzle widths of
  material between holes and to the edge (two perimeters from each side; common
  practice, no source).
- **hole positions** are held to ``centre_tolerance / 2`` each (``[process]``), so
  that two holes together stay within the centre tolerance of a mesh (derived: the two
  errors add up at worst).
- **pillars**: milled pillars are turned with a spigot at each end (:data:`SPIGOTS`,
  common practice, no source: the spigot leaves a wall of about 1 mm or more round the
  tapped hole, and the screw head covers the spigot's hole); the body is the spigot
  plus 3 mm (a 1.5 mm shoulder for each plate to sit on). Hand-made and printed
  pillars are plain bars with a tapped (hand) or pilot (print) hole at each end; hand
  pillars are as thick as milled ones, printed ones ``3 d + 1`` for screw size ``d``.
  A pillar given thinner keeps at least :data:`SHOULDER_MIN` of shoulder, or
  :data:`WALL_MIN` of wall round its screw holes.
- **screw engagement**: at least ``1.5 d`` of thread in brass or steel, ``2 d`` in a
  printed part (common practice, no source).
- **cocks**: a bar ``2 d`` wide (``d`` the screw size) and at least the plate's
  thickness (print: 3 mm) thick, fixed by two screws ``max(2.2 x clearance hole, head
  + 1 mm)`` apart, so the heads do not touch and the holes keep the spacing above.
  The bridge's pivot stands at least three arbor diameters from the plate's pivot
  (common practice, no source: two bearings closer than that hold an arbor no better
  than one).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..design.model import Design
from ..design.process_limits import centre_tolerance
from ..design.screws import Screw, screw

__all__ = [
    "EDGE_FACTOR",
    "SHOULDER_MIN",
    "SPACING_FACTOR",
    "SPIGOTS",
    "WALL_MIN",
    "FrameLimits",
    "frame_limits",
    "min_centre_distance",
    "spacing_reach",
    "min_edge_distance",
]

#: EN 1993-1-8:2005, Table 3.3: smallest edge distance e2 = 1.2 d0 (centre to edge).
EDGE_FACTOR = 1.2
#: EN 1993-1-8:2005, Table 3.3: smallest spacing p1 = 2.2 d0 (centre to centre),
#: written per hole as 1.1 (d1 + d2) so that unequal holes share it.
SPACING_FACTOR = 1.1
#: Spigot diameter (mm) of a turned pillar for each screw size (common practice, no
#: source; see the module docstring).
SPIGOTS: dict[str, float] = {"M2": 3.5, "M2.5": 4.0, "M3": 5.0, "M4": 6.0, "M5": 8.0}

#: mm, the least shoulder a turned pillar keeps round its spigot for a plate to sit on,
#: and the least wall round a plain pillar's screw holes (common practice, no source).
SHOULDER_MIN = 0.75
WALL_MIN = 1.5

_CLEARANCE = {"mill": 1.0, "hand": 1.5, "print": 1.5}
_MARGIN = {"mill": 3.0, "hand": 3.0, "print": 4.0}
_NOZZLE_LINES = 4  # print: material between holes, in nozzle widths
_ENGAGEMENT = {"mill": 1.5, "hand": 1.5, "print": 2.0}  # x screw diameter
_BEARING_SPACING = 3.0  # x arbor diameter between the two bearings of a bridged arbor


@dataclass(frozen=True, slots=True)
class FrameLimits:
    """The frame's sizes and limits for one design; lengths in mm."""

    process: str
    clearance: float
    margin: float
    min_material: float  # least material between two holes or a hole and the edge
    position_tolerance: float  # +/- on each hole position
    screw: Screw
    pillar_diameter: float
    spigot: float  # 0: a plain pillar (hand, print)
    engagement: float  # least length of thread a screw holds by
    cock_width: float
    cock_thickness: float
    cock_screw_spacing: float
    bearing_spacing_factor: float
    plate_thickness: float

    @property
    def pillar_hole_depth(self) -> float:
        """Depth of the tapped or pilot hole at a pillar's screwed end (mm)."""
        return round(self.engagement + 1.5 * self.screw.diameter, 3)


def min_edge_distance(diameter: float, limits: FrameLimits) -> float:
    """Least distance (mm) from a hole's centre to the plate's edge."""
    return max(EDGE_FACTOR * diameter, diameter / 2 + limits.min_material)


def min_centre_distance(d1: float, d2: float, limits: FrameLimits) -> float:
    """Least distance (mm) between the centres of two holes of ``d1`` and ``d2`` mm."""
    return max(SPACING_FACTOR * (d1 + d2), (d1 + d2) / 2 + limits.min_material)


def spacing_reach(diameter: float, limits: FrameLimits) -> float:
    """A hole's share of :func:`min_centre_distance` (mm): the least distance of two
    holes is never more than the sum of their shares, so holes whose shares do not
    meet need no measuring."""
    return max(SPACING_FACTOR * diameter, diameter / 2 + limits.min_material / 2)


def frame_limits(design: Design) -> FrameLimits:
    """The limits for ``design``'s process, with the ``[frame]`` table's own values."""
    if design.frame is None:
        raise ValueError("the design has no [frame]: it has no plates")
    frame = design.frame
    proc = design.process
    kind = proc.kind
    sc = screw(frame.screw)
    spigot = SPIGOTS[sc.name] if kind == "mill" else 0.0
    if frame.pillar_diameter is not None:
        pillar = frame.pillar_diameter
    elif kind == "print":
        pillar = 3 * sc.diameter + 1.0
    else:
        pillar = SPIGOTS[sc.name] + 3.0
    tol = centre_tolerance(proc)
    material = _NOZZLE_LINES * proc.nozzle if kind == "print" else 0.0
    thickness = max(frame.thickness, 3.0 if kind == "print" else 2.0)
    return FrameLimits(
        process=kind,
        clearance=frame.clearance if frame.clearance is not None else _CLEARANCE[kind],
        margin=frame.margin if frame.margin is not None else _MARGIN[kind],
        min_material=material,
        position_tolerance=round(tol / 2, 6),
        screw=sc,
        pillar_diameter=pillar,
        spigot=spigot,
        engagement=_ENGAGEMENT[kind] * sc.diameter,
        cock_width=2.0 * sc.diameter,
        cock_thickness=thickness,
        cock_screw_spacing=round(
            math.ceil(
                max(2 * SPACING_FACTOR * sc.clearance_hole, sc.head_diameter + 1.0) * 2
            )
            / 2,
            3,
        ),
        bearing_spacing_factor=_BEARING_SPACING,
        plate_thickness=frame.thickness,
    )
