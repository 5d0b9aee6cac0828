"""One entry point for every kind of part: plan entry in, cadquery solid out."""

from __future__ import annotations

import cadquery as cq

from ..design.model import Design
from ..layout.part_kinds import (
    ArborPart,
    BearingPart,
    CockPart,
    CollarPart,
    CrankPart,
    DialPart,
    HandPart,
    KnobPart,
    Part,
    PillarPart,
    PinPart,
    PlatePart,
    ScrewPart,
    SleevePart,
    WheelPart,
)
from .arbor import make_arbor, make_collar
from .display import make_crank, make_dial, make_hand, make_knob
from .frame import make_bearing, make_cock, make_pillar, make_plate, make_screw
from .pin import make_pin
from .sleeve import make_sleeve
from .wheel import make_wheel

__all__ = ["design_assembly", "design_parts", "make_part", "part_location"]


def make_part(part: Part) -> cq.Shape:
    """The part's solid in its own frame: axis +Z, back face on z = 0, sizes in mm."""
    if isinstance(part, WheelPart):
        return make_wheel(part)
    if isinstance(part, ArborPart):
        return make_arbor(part)
    if isinstance(part, SleevePart):
        return make_sleeve(part)
    if isinstance(part, CollarPart):
        return make_collar(part)
    if isinstance(part, PinPart):
        return make_pin(part)
    if isinstance(part, PlatePart):
        return make_plate(part)
    if isinstance(part, PillarPart):
        return make_pillar(part)
    if isinstance(part, CockPart):
        return make_cock(part)
    if isinstance(part, ScrewPart):
        return make_screw(part)
    if isinstance(part, BearingPart):
        return make_bearing(part)
    if isinstance(part, HandPart):
        return make_hand(part)
    if isinstance(part, DialPart):
        return make_dial(part)
    if isinstance(part, KnobPart):
        return make_knob(part)
    if isinstance(part, CrankPart):
        return make_crank(part)
    raise TypeError(f"cannot build a part of type {type(part).__name__}")


def part_location(part: Part) -> cq.Location:
    """The part's placement (mm, degrees about +Z) as a cadquery Location."""
    pl = part.placement
    return cq.Location(cq.Vector(pl.x, pl.y, pl.z), cq.Vector(0, 0, 1), pl.angle_deg)


def design_parts(design: Design) -> dict[str, tuple[cq.Shape, cq.Location]]:
    """Every part of a loaded design: name -> (solid in its own frame, placement).

    ``least_play`` requests are settled first, as the checks and the build do.
    """
    from ..checks.least_play import settle_play
    from ..parts import plan_parts

    parts = plan_parts(settle_play(design))
    return {p.name: (make_part(p), part_location(p)) for p in parts}


def design_assembly(design: Design) -> cq.Assembly:
    """The whole design as a cadquery Assembly, each part named and placed."""
    assy = cq.Assembly(name=design.name)
    for name, (solid, loc) in design_parts(design).items():
        assy.add(solid, name=name, loc=loc)
    return assy
