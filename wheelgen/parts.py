"""Every part the build makes, as plain numbers: the train's, the display's, the frame's.

The train is laid out first (:func:`wheelgen.layout.train_parts`), the frame is planned
round it (:mod:`wheelgen.frame`), and the display is planned last, in front of the
front plate (:func:`wheelgen.display.display_plan`): its dials' feet keep clear of the
frame's holes and screw heads and add their pins' holes to the front plate. Last, every
arbor and tube is finished as made on that frame, with its collars
(:func:`wheelgen.turning.turned_parts`). This module puts them together, so that no
layer has to call one planned after it. Part kinds are in
:mod:`wheelgen.layout.part_kinds`; lengths in mm, angles in degrees.
"""

from __future__ import annotations

from .design.model import Design
from .display.plan import display_plan
from .frame.parts import frame_parts, to_cocks
from .layout.part_kinds import Part
from .layout.train_parts import train_parts
from .turning import turned_parts

__all__ = ["plan_parts"]


def plan_parts(design: Design) -> tuple[Part, ...]:
    """Every part to make, in this order: the train's (wheels, arbors and sleeves,
    separate pins), the display's (dials, hands, knob or crank), then the frame's
    (plates, pillars, cocks, bought screws and bearings).

    An arbor that reaches out to its cock is lengthened to it; the front plate carries
    the holes of the dials' foot pins; then every arbor and tube is finished as made
    (pivots, seats, shoulders, fits) and its collars are added after the train's parts.
    """
    display = display_plan(design)
    train = to_cocks(design, train_parts(design) + display.parts())
    return turned_parts(design, train + frame_parts(design, display.plate_holes))
