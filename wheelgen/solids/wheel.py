"""A wheel as one solid: the holed profile extruded once, then hub, cross pin, pin boss.

The toothed outline, seat, windows, slot and pin hole are all wires of a single face,
so the teeth never go through a boolean (one boolean per tooth is slow and bloats
files). Booleans are kept for the few features that are not prisms of the profile: a
hub boss, a cross-pin hole, a pin boss, and a slot that runs into another hole.
"""

from __future__ import annotations

import math
from typing import TypeVar

import cadquery as cq
from OCP.BRepAlgoAPI import BRepAlgoAPI_Cut, BRepAlgoAPI_Fuse
from OCP.BRepCheck import BRepCheck_Analyzer

from ..layout.part_kinds import WheelPart
from ..layout.wheel_profile import (
    Hole,
    PlateProfile,
    cross_pin_diameter,
    plate_profile,
    seat_extent,
)
from ..teeth.outline import WheelOutline
from .profile import (
    CadBuildError,
    chain_wire,
    hole_wire,
    holed_face,
    outline_wire,
    prism,
)

__all__ = ["check_solid", "make_wheel", "wheel_from_profile"]

_S = TypeVar("_S", bound=cq.Shape)


def _outline_for(part: WheelPart) -> WheelOutline:
    from ..teeth.forms import outline_for

    return outline_for(part.tooth)


def _boolean(kind: str, a: cq.Shape, b: cq.Shape, what: str) -> cq.Solid:
    op = (
        BRepAlgoAPI_Fuse(a.wrapped, b.wrapped)
        if kind == "fuse"
        else BRepAlgoAPI_Cut(a.wrapped, b.wrapped)
    )
    if not op.IsDone():
        raise CadBuildError(f"{what}: the kernel could not {kind} it")
    shape = cq.Shape.cast(op.Shape())
    solids = shape.Solids()
    if len(solids) != 1:
        raise CadBuildError(f"{what}: {kind} left {len(solids)} solids, expected 1")
    return check_solid(solids[0], what)


def check_solid(solid: _S, what: str) -> _S:
    """Raise :class:`CadBuildError` unless ``solid`` is one valid solid.

    The full topology and geometry check takes 0.3-1 s for a 127-tooth wheel, so it
    is left to the caller for plain prisms of a closed profile.
    """
    if len(solid.Solids()) != 1:
        raise CadBuildError(
            f"{what}: the kernel made {len(solid.Solids())} solids, expected 1"
        )
    if not BRepCheck_Analyzer(solid.wrapped, False).IsValid():
        raise CadBuildError(f"{what}: the kernel made an invalid solid")
    return solid


def _overlaps(a: Hole, b: Hole) -> bool:
    """Coarse test on polylines: do the two holes' bounding circles meet?"""
    pa, pb = a.polyline(0.05), b.polyline(0.05)
    ca, cb = pa.mean(axis=0), pb.mean(axis=0)
    ra = float(max(math.hypot(*(p - ca)) for p in pa))
    rb = float(max(math.hypot(*(p - cb)) for p in pb))
    return math.hypot(*(ca - cb)) < ra + rb


def wheel_from_profile(part: WheelPart, profile: PlateProfile) -> cq.Solid:
    """The wheel solid from its flat profile; the back face lies on z = 0 (mm)."""
    outer = outline_wire(profile.outline, 0.0, f"{part.name} outline")
    inner = [h for h in profile.holes if h.role != "slot"]
    slots = [h for h in profile.holes if h.role == "slot"]
    cut_later: list[Hole] = []
    for s in slots:
        # a slot running into the seat or a window cannot be a separate inner wire
        if any(_overlaps(s, h) for h in inner):
            cut_later.append(s)
        else:
            inner.append(s)
    wires = [hole_wire(h, 0.0, f"{part.name} {h.role}") for h in inner]
    solid: cq.Solid = prism(holed_face(outer, wires), part.face_width)
    h = part.face_width
    if part.hub_diameter > 0 and part.hub_length > 0:
        hub_outer = cq.Wire.makeCircle(
            part.hub_diameter / 2, cq.Vector(0, 0, h), cq.Vector(0, 0, 1)
        )
        seat = [
            hole_wire(x, h, f"{part.name} seat")
            for x in profile.holes
            if x.role == "bore"
        ]
        hub = prism(holed_face(hub_outer, seat, h), part.hub_length)
        solid = _boolean("fuse", solid, hub, f"{part.name} hub boss")
    for s in cut_later:
        wire = chain_wire(s.segments, -1.0, f"{part.name} slot")
        tool = prism(holed_face(wire, [], -1.0), h + part.hub_length + 2.0)
        solid = _boolean("cut", solid, tool, f"{part.name} slot")
    if part.seat == "pinned" and part.bore > 0:
        d = cross_pin_diameter(part.bore)
        # through the hub when there is one, else through the middle of the face width
        zc = h + part.hub_length / 2 if part.hub_length > 0 else h / 2
        reach = max(part.hub_diameter / 2, seat_extent("round", part.bore)) + 1.0
        if part.hub_length <= 0:
            reach = profile.root_radius + 1.0
        # across the seat, on the direction its flats are turned to (as on the tube)
        t = math.radians(part.seat_angle_deg)
        cos_t, sin_t = math.cos(t), math.sin(t)
        start = cq.Vector(-reach * cos_t, -reach * sin_t, zc)
        tool = cq.Solid.makeCylinder(
            d / 2, 2 * reach, start, cq.Vector(cos_t, sin_t, 0)
        )
        solid = _boolean("cut", solid, tool, f"{part.name} cross-pin hole")
    if part.pin is not None and not part.pin.hole_only:
        a = math.radians(part.pin.angle_deg)
        base = cq.Vector(
            part.pin.radius * math.cos(a), part.pin.radius * math.sin(a), h
        )
        boss = cq.Solid.makeCylinder(part.pin.diameter / 2, part.pin.length, base)
        solid = _boolean("fuse", solid, boss, f"{part.name} pin boss")
    return solid


def make_wheel(part: WheelPart, outline: WheelOutline | None = None) -> cq.Solid:
    """Build one wheel as a cadquery Solid, axis +Z, back face on z = 0.

    Parameters
    ----------
    part : WheelPart
        All sizes in mm (see :mod:`wheelgen.layout.part_kinds`).
    outline : WheelOutline, optional
        The toothed outline; by default generated from ``part.tooth``.
    """
    if part.face_width <= 0:
        raise ValueError(f"'face_width' must be > 0 mm, got {part.face_width}")
    if part.bore < 0:
        raise ValueError(f"'bore' must be >= 0 mm, got {part.bore}")
    profile = plate_profile(
        part, outline if outline is not None else _outline_for(part)
    )
    return wheel_from_profile(part, profile)
