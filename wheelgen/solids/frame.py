"""Solids of the frame: plates, pillars, cocks, and the bought screws and bearings (mm).

A plate is its outline and holes extruded once (the fast profile route of
:mod:`wheelgen.solids.profile`), so the solid, the DXF and the SVG are drawn from the
same numbers. Pillars, screws and bearings are solids of revolution made of stacked
cylinders; a cock is its bar and foot, two prisms with their holes, fused.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import cadquery as cq

from ..layout.part_kinds import (
    BearingPart,
    CockPart,
    FlatEdge,
    PillarPart,
    PlatePart,
    ScrewPart,
)
from ..teeth.outline import Segment
from .profile import CadBuildError, chain_wire, holed_face, prism
from .wheel import check_solid

__all__ = [
    "flat_segments",
    "make_bearing",
    "make_cock",
    "make_pillar",
    "make_plate",
    "make_screw",
]

_Z = cq.Vector(0, 0, 1)


def flat_segments(edges: tuple[FlatEdge, ...]) -> list[Segment]:
    """A flat outline's edges as the exact segments the profile builder takes."""
    import numpy as np

    return [Segment(e.kind, np.array(e.points, dtype=float)) for e in edges]


def _circle(x: float, y: float, d: float, z: float, inner: bool) -> cq.Wire:
    # an inner wire runs clockwise seen from +Z: a circle with normal -Z does
    return cq.Wire.makeCircle(
        d / 2, cq.Vector(x, y, z), cq.Vector(0, 0, -1 if inner else 1)
    )


def make_plate(part: PlatePart) -> cq.Solid:
    """The plate: its outline with every hole, ``thickness`` mm from z = 0 up."""
    if part.thickness <= 0:
        raise ValueError(
            f"{part.name}: 'thickness' must be > 0 mm, got {part.thickness}"
        )
    outer = chain_wire(flat_segments(part.outline), 0.0, f"{part.name} outline")
    holes = [_circle(h.x, h.y, h.diameter, 0.0, True) for h in part.holes]
    return prism(holed_face(outer, holes), part.thickness)


def _cylinder(d: float, z0: float, length: float) -> cq.Solid:
    return cq.Solid.makeCylinder(d / 2, length, cq.Vector(0, 0, z0), _Z)


def _fused(name: str, pieces: Sequence[cq.Shape]) -> cq.Shape:
    shape = pieces[0]
    if len(pieces) > 1:
        shape = shape.fuse(*pieces[1:]).clean()
    solids = shape.Solids()
    if len(solids) != 1:
        raise CadBuildError(f"{name}: the kernel made {len(solids)} solids, expected 1")
    return solids[0]


def make_pillar(part: PillarPart) -> cq.Shape:
    """A pillar: spigot, body, spigot (or a plain bar), with its end holes."""
    if part.diameter <= 0 or part.length <= 0:
        raise ValueError(f"{part.name}: 'diameter' and 'length' must be > 0 mm")
    z = 0.0
    pieces: list[cq.Shape] = []
    if part.spigot > 0 and part.back_spigot > 0:
        pieces.append(_cylinder(part.spigot, 0.0, part.back_spigot))
        z = part.back_spigot
    pieces.append(_cylinder(part.diameter, z, part.length))
    top = z + part.length
    if part.spigot > 0 and part.front_spigot > 0:
        pieces.append(_cylinder(part.spigot, top, part.front_spigot))
        top += part.front_spigot
    shape = _fused(part.name, pieces)
    if part.back_hole > 0 and part.back_depth > 0:
        shape = shape.cut(_cylinder(part.back_hole, -1.0, part.back_depth + 1.0))
    if part.front_hole > 0 and part.front_depth > 0:
        shape = shape.cut(
            _cylinder(part.front_hole, top - part.front_depth, part.front_depth + 1.0)
        )
    return check_solid(_fused(part.name, [shape]), part.name)


def _stadium(length: float, width: float, start: float, z: float) -> cq.Wire:
    """Closed wire of a bar from x = start to x = length (end centres), round ends."""
    w = width / 2
    import numpy as np

    p = np.array
    segs = [
        Segment("line", p([[start, -w], [length, -w]])),
        Segment("arc", p([[length, -w], [length + w, 0.0], [length, w]])),
        Segment("line", p([[length, w], [start, w]])),
        Segment("arc", p([[start, w], [start - w, 0.0], [start, -w]])),
    ]
    return chain_wire(segs, z, "cock outline")


def make_cock(part: CockPart) -> cq.Shape:
    """A cock: its bar with the pivot hole and its foot, fused, tapped holes cut."""
    if part.length <= part.foot_from or part.width <= 0 or part.thickness <= 0:
        raise ValueError(f"{part.name}: the bar must run past its foot and have a size")
    t, h = part.thickness, part.foot_height
    bar_z = h if not part.hanging else 0.0
    foot_z = 0.0 if not part.hanging else t
    bar = prism(
        holed_face(
            _stadium(part.length, part.width, 0.0, bar_z),
            [_circle(0.0, 0.0, part.pivot_hole, bar_z, True)],
            bar_z,
        ),
        t,
    )
    pieces: list[cq.Shape] = [bar]
    if h > 0:
        foot = prism(
            holed_face(
                _stadium(part.length, part.width, part.foot_from, foot_z), [], foot_z
            ),
            h,
        )
        pieces.append(foot)
    shape = _fused(part.name, pieces)
    total = t + h
    for x in part.screws:
        depth = min(part.screw_depth, total)
        z0 = -1.0 if not part.hanging else total - depth
        length = depth + 1.0
        tool = cq.Solid.makeCylinder(
            part.screw_hole / 2, length, cq.Vector(x, 0, z0), _Z
        )
        shape = shape.cut(tool)
    return check_solid(_fused(part.name, [shape]), part.name)


def make_screw(part: ScrewPart) -> cq.Shape:
    """A socket head cap screw as fitted: the head and the core of its thread."""
    k, length = part.head_height, part.length
    if part.head_up:
        pieces = [
            _cylinder(part.core, 0.0, length),
            _cylinder(part.head_diameter, length, k),
        ]
    else:
        pieces = [
            _cylinder(part.head_diameter, 0.0, k),
            _cylinder(part.core, k, length),
        ]
    shape = _fused(part.name, pieces)
    # the hexagon socket, 0.6 k deep (ISO 4762: s = 2.5 mm at M3; here about 0.45 dk)
    s = 0.45 * part.head_diameter
    depth = 0.6 * k
    z = length + k - depth if part.head_up else -1e-3
    hexagon = cq.Wire.makePolygon(
        [
            cq.Vector(s / math.sqrt(3) * math.cos(a), s / math.sqrt(3) * math.sin(a), z)
            for a in (math.radians(60 * i) for i in range(7))
        ]
    )
    tool = cq.Solid.extrudeLinear(
        cq.Face.makeFromWires(hexagon), cq.Vector(0, 0, depth + 1e-3)
    )
    return check_solid(_fused(part.name, [shape.cut(tool)]), part.name)


def make_bearing(part: BearingPart) -> cq.Shape:
    """A bush or ball bearing as a plain ring (bought; drawn for the assembly)."""
    if not 0 < part.inside < part.outside or part.width <= 0:
        raise ValueError(f"{part.name}: a ring needs 0 < inside < outside and a width")
    outer = _circle(0.0, 0.0, part.outside, 0.0, False)
    return prism(
        holed_face(outer, [_circle(0.0, 0.0, part.inside, 0.0, True)]), part.width
    )
