"""Sleeves: tubes turning on the member inside them, with seats and collars (mm).

A seat is a length of the outside milled to the wheel's seat shape: a square or hex
seat is the largest square or hexagon that fits in the round stock (flats at
``outside * cos(45 deg)`` or ``outside * cos(30 deg)`` across), a ``flat`` seat (for a
hand, knob or crank) one flat filed on the round, a ``pinned`` seat keeps the round
and gets a cross-pin hole. Plain arbors with a seat at their end are built the same way
(:func:`turned_member` with no bore). The tube is built as stacked prisms, one per
length of constant section, fused once.
"""

from __future__ import annotations

from collections.abc import Sequence

import cadquery as cq

from ..layout.part_kinds import SleevePart
from ..layout.sleeves import seat_factor
from ..layout.wheel_profile import Hole, _polygon_hole, cross_pin_diameter
from .profile import CadBuildError, chain_wire, hole_wire, holed_face, prism

__all__ = ["make_sleeve", "seat_across_flats", "turned_member"]


def seat_across_flats(shape: str, outside: float) -> float:
    """Across-flats size (mm) of a square, hex or flat seat milled on round ``outside``.

    For a flat seat it is twice the flat's distance from the axis.
    """
    return outside * seat_factor(shape)


def _outer_wire(shape: str, outside: float, z: float, name: str) -> cq.Wire:
    if shape in ("square", "hex"):
        sides = 4 if shape == "square" else 6
        hole: Hole = _polygon_hole(
            "bore", sides, seat_across_flats(shape, outside), 0.0
        )
        return chain_wire(hole.segments, z, f"{name} seat")
    if shape == "flat":
        from ..display.outlines import seat_hole

        return chain_wire(
            seat_hole("flat", outside, 0.0, 0.0).segments, z, f"{name} seat"
        )
    return cq.Wire.makeCircle(outside / 2, cq.Vector(0, 0, z), cq.Vector(0, 0, 1))


def make_sleeve(part: SleevePart) -> cq.Shape:
    """The sleeve as one solid, axis +Z, from z = 0 to ``part.length``."""
    if not 0 < part.inside < part.outside:
        raise ValueError(
            f"{part.name}: 'inside' must be > 0 and below 'outside'"
            f" ({part.outside} mm),"
            f" got {part.inside}"
        )
    return turned_member(
        part.name, part.inside, part.outside, part.length, part.seats, part.collars
    )


def turned_member(
    name: str,
    inside: float,
    outside: float,
    length: float,
    seats: Sequence[tuple[float, float, str]],
    collars: Sequence[tuple[float, float, float]] = (),
) -> cq.Shape:
    """A shaft (``inside`` 0) or a tube with its seats and collars, as one solid (mm)."""
    if length <= 0:
        raise ValueError(f"{name}: 'length' must be > 0 mm, got {length}")
    cuts = {0.0, float(length)}
    for z0, z1, _ in seats:
        cuts.update((min(max(z0, 0.0), length), min(max(z1, 0.0), length)))
    for z0, z1, _ in collars:
        cuts.update((min(max(z0, 0.0), length), min(max(z1, 0.0), length)))
    levels = sorted(cuts)
    pieces: list[cq.Solid] = []
    for za, zb in zip(levels, levels[1:]):
        if zb - za < 1e-6:
            continue
        zm = (za + zb) / 2
        collar = max((d for z0, z1, d in collars if z0 <= zm <= z1), default=0.0)
        seat = next((s for z0, z1, s in seats if z0 <= zm <= z1), "round")
        if collar > outside:
            outer = _outer_wire("round", collar, za, name)
        else:
            outer = _outer_wire(seat, outside, za, name)
        bores = []
        if inside > 0:
            bores.append(hole_wire(Hole("bore", circle=(0.0, 0.0, inside / 2)), za))
        pieces.append(prism(holed_face(outer, bores, za), zb - za))
    if not pieces:
        raise CadBuildError(f"{name}: the member has no length")
    shape: cq.Shape = pieces[0]
    if len(pieces) > 1:
        shape = pieces[0].fuse(*pieces[1:]).clean()
    for z0, z1, s in seats:
        if s != "pinned":
            continue
        d = cross_pin_diameter(outside)
        reach = outside
        tool = cq.Solid.makeCylinder(
            d / 2, 2 * reach, cq.Vector(-reach, 0, (z0 + z1) / 2), cq.Vector(1, 0, 0)
        )
        shape = shape.cut(tool)
    solids = shape.Solids()
    if len(solids) != 1:
        raise CadBuildError(f"{name}: the member came out as {len(solids)} solids")
    return solids[0]
