"""Plain arbors and separate pins: round bars standing on z = 0 along +Z (mm)."""

from __future__ import annotations

import cadquery as cq

from ..layout.part_kinds import ArborPart, CollarPart, PinPart

__all__ = ["make_arbor", "make_collar", "make_pin", "round_bar"]


def round_bar(name: str, diameter: float, length: float) -> cq.Solid:
    """A cylinder ``diameter`` mm across and ``length`` mm long, from z = 0 upward."""
    if diameter <= 0 or length <= 0:
        raise ValueError(
            f"{name}: 'diameter' and 'length' must be > 0 mm,"
            f" got {diameter} and {length}"
        )
    return cq.Solid.makeCylinder(
        diameter / 2, length, cq.Vector(0, 0, 0), cq.Vector(0, 0, 1)
    )


def make_arbor(part: ArborPart) -> cq.Shape:
    """An arbor: a round shaft of the length the layout gives, its seats milled and its
    shoulders turned."""
    if not part.seats and not part.collars:
        return round_bar(part.name, part.diameter, part.length)
    from .sleeve import turned_member

    return turned_member(
        part.name, 0.0, part.diameter, part.length, part.seats, part.collars
    )


def make_collar(part: CollarPart) -> cq.Shape:
    """A collar: a ring from z = 0 to its length, bored for its member."""
    if not 0 < part.inside < part.outside:
        raise ValueError(
            f"{part.name}: 'inside' must be > 0 and below 'outside'"
            f" ({part.outside} mm), got {part.inside}"
        )
    from .sleeve import turned_member

    return turned_member(part.name, part.inside, part.outside, part.length, ())


def make_pin(part: PinPart) -> cq.Solid:
    """A separate round pin (pin-and-slot coupling)."""
    return round_bar(part.name, part.diameter, part.length)
