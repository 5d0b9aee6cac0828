"""Every mesh at the distance between its arbors' final positions, and the move that fixes it.

Whatever placed the two arbors (an ``at``, a mesh's ``bearing``, a pin-and-slot offset,
a carrier, the axis a tube surrounds), the layout has put them somewhere; the pair
works only if they stand at its working centre distance. A mesh without a bearing that
closes a train is where a small error in a bearing or an ``at`` shows: this module
measures every mesh on the final layout and, when one is off, works out the edit of the
train file that puts it right: the ``at`` or the ``bearing`` that placed the arbor
placed last, moved so that its meshes close. Lengths in mm, angles in degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..design.model import Design, Mesh, Process
from ..design.process_limits import centre_tolerance
from ..findings import Change
from ..kinematics.rates import mesh_frame
from ..teeth.limits import short_of
from .placement import AxisPositions, Link, mesh_centre_distance
from .train_layout import Layout, plan_layout

__all__ = [
    "MeshCentres",
    "Move",
    "centres_fit",
    "mesh_centres",
    "mesh_distances",
    "move_for",
]

Point = tuple[float, float]


@dataclass(frozen=True, slots=True)
class MeshCentres:
    """One mesh on the final layout: its arbors' axes, wanted and measured distance."""

    mesh: Mesh
    arbors: tuple[str, str]
    axes: tuple[str, str]
    wanted: float
    measured: float

    @property
    def error(self) -> float:
        """Measured minus wanted, mm (negative: too close)."""
        return self.measured - self.wanted


@dataclass(frozen=True, slots=True)
class Move:
    """Moving axis ``axis`` to ``to`` (mm) puts every mesh in ``meshes`` right.

    ``change`` is the edit of the train file that does it: the ``at`` of the arbor or
    the ``bearing`` of the mesh or coupling that placed the axis.
    """

    axis: str
    to: Point
    change: Change
    meshes: tuple[MeshCentres, ...]


def centres_fit(error: float, process: Process) -> bool:
    """Is a centre distance ``error`` mm off the working one within the process's
    tolerance (:func:`~wheelgen.design.process_limits.centre_tolerance`)? Exactly the
    tolerance passes."""
    return not short_of(centre_tolerance(process), abs(error))


def mesh_centres(layout: Layout) -> list[MeshCentres]:
    """Every mesh whose two axes are placed and keep one distance (see the module text).

    A mesh whose axes move against each other is left out (``train.mesh_axes``).
    """
    design = layout.design
    pos = layout.placing.positions
    out = []
    for m in design.meshes:
        a, b = (design.wheel(n).arbor for n in m.pair)
        ra, rb = design.axis_root(a), design.axis_root(b)
        if ra not in pos or rb not in pos or not mesh_frame(design, a, b)[0]:
            continue
        try:
            wanted = mesh_centre_distance(design, m)
        except ValueError:  # teeth that cannot be made: the wheel checks say so
            continue
        measured = math.dist(pos[ra], pos[rb])
        out.append(MeshCentres(m, (a, b), (ra, rb), wanted, measured))
    return out


def _circle_meets(c0: Point, r0: float, c1: Point, r1: float) -> list[Point]:
    """Points where two circles meet (mm); none when they do not."""
    d = math.dist(c0, c1)
    if d < 1e-12 or d > r0 + r1 + 1e-9 or d < abs(r0 - r1) - 1e-9:
        return []
    a = (r0 * r0 - r1 * r1 + d * d) / (2 * d)
    h = math.sqrt(max(r0 * r0 - a * a, 0.0))
    ux, uy = (c1[0] - c0[0]) / d, (c1[1] - c0[1]) / d
    mx, my = c0[0] + a * ux, c0[1] + a * uy
    return [(mx - h * uy, my + h * ux), (mx + h * uy, my - h * ux)]


def _solve(
    here: Point, pivot: Point | None, radius: float, needs: list[tuple[Point, float]]
) -> Point | None:
    """A point near ``here`` at distance ``r_i`` from every ``p_i`` in ``needs``.

    With ``pivot`` the point must also stay ``radius`` from it (the axis is placed by
    a bearing there). ``None`` when no such point exists.
    """
    circles: list[tuple[Point, float]] = []
    for c, r in ([(pivot, radius)] if pivot is not None else []) + needs:
        same = [k for k, (c2, _) in enumerate(circles) if math.dist(c, c2) < 1e-9]
        if not same:
            circles.append((c, r))
        elif abs(circles[same[0]][1] - r) > 1e-9 * max(1.0, r):
            return None  # one centre, two distances: no point serves both
    if not circles:
        return None
    if len(circles) == 1:
        (c, r) = circles[0]
        d = math.dist(here, c)
        if d < 1e-12:
            return None
        return (c[0] + r * (here[0] - c[0]) / d, c[1] + r * (here[1] - c[1]) / d)
    options = _circle_meets(circles[0][0], circles[0][1], circles[1][0], circles[1][1])
    good = [
        p
        for p in options
        if all(abs(math.dist(p, c) - r) < 1e-7 * max(1.0, r) for c, r in circles[2:])
    ]
    return min(good, key=lambda p: math.dist(p, here)) if good else None


def _descendants(placing: AxisPositions, axis: str) -> set[str]:
    """Axes placed, directly or not, from ``axis``: they move when it moves."""
    out: set[str] = set()
    for name in placing.order:
        link, sense = placing.placed_by[name]
        parent = link.source if sense > 0 else link.to
        if parent == axis or parent in out:
            out.add(name)
    return out


def _bearing_deg(frm: Point, to: Point) -> float:
    return math.degrees(math.atan2(to[1] - frm[1], to[0] - frm[0]))


def _change_for(layout: Layout, link: Link, sense: int, to: Point) -> Change:
    pos = layout.placing.positions
    if link.kind == "at":
        return Change("arbor", link.item, "at", to)
    if link.kind == "carrier":
        # the carrier stands at angle 0: its frame is the plate's, shifted to its axis
        cx, cy = pos[link.source]
        return Change("arbor", link.item, "at", (to[0] - cx, to[1] - cy))
    other = pos[link.source] if sense > 0 else pos[link.to]
    bearing = _bearing_deg(other, to) if sense > 0 else _bearing_deg(to, other)
    table = "mesh" if link.kind == "mesh" else "pinslot"
    return Change(table, link.item, "bearing", bearing)


def move_for(layout: Layout, off: list[MeshCentres]) -> list[Move]:
    """The moves that put the meshes in ``off`` right, one axis each.

    An axis is moved along what placed it (an ``at`` anywhere, a bearing round its
    pivot), and only for meshes whose other axis does not move with it; the axis that
    serves the most meshes is tried first (then the one placed last), and its meshes
    are solved together, so one move answers for all of them. A mesh that no single
    move can put right is left out.
    """
    placing = layout.placing
    options: dict[str, list[MeshCentres]] = {}
    for mc in off:
        for axis, other in (mc.axes, mc.axes[::-1]):
            if axis in placing.placed_by and other not in _descendants(placing, axis):
                options.setdefault(axis, []).append(mc)
    rank = {axis: i for i, axis in enumerate(placing.order)}
    left = {mc.mesh.index for mc in off}
    every = mesh_centres(layout)
    moves = []
    while left and options:
        axis = max(
            options,
            key=lambda a: (sum(mc.mesh.index in left for mc in options[a]), rank[a]),
        )
        mine = [mc for mc in options.pop(axis) if mc.mesh.index in left]
        if not mine:
            continue
        move = _move(layout, axis, mine, every)
        if move is not None:
            moves.append(move)
            left -= {mc.mesh.index for mc in mine}
    return moves


def _move(
    layout: Layout, axis: str, meshes: list[MeshCentres], every: list[MeshCentres]
) -> Move | None:
    placing = layout.placing
    link, sense = placing.placed_by[axis]
    pos = placing.positions
    carried = _descendants(placing, axis)
    needs = []
    for mc in meshes:
        other = mc.axes[1] if mc.axes[0] == axis else mc.axes[0]
        needs.append((pos[other], mc.wanted))
    # the axis's other meshes must stay as they are, except with the axes placed from
    # it (they move with it) and the one it is placed by (its bearing keeps that one)
    for mc in every:
        if axis not in mc.axes or mc in meshes:
            continue
        other = mc.axes[1] if mc.axes[0] == axis else mc.axes[0]
        if other in carried or other in (link.source, link.to):
            continue
        needs.append((pos[other], mc.measured))
    pivot: Point | None = None
    radius = 0.0
    if link.kind in ("mesh", "pinslot"):
        pivot = pos[link.source] if sense > 0 else pos[link.to]
        radius = link.length
    to = _solve(pos[axis], pivot, radius, needs)
    if to is None:
        return None
    change = _change_for(layout, link, sense, to)
    return Move(axis, to, change, tuple(meshes))


def mesh_distances(design: Design) -> dict[int, float]:
    """Centre distance (mm) of every mesh on the final layout, by mesh ``index``."""
    try:
        layout = plan_layout(design)
    except ValueError:  # a layout that cannot be made: the layout check reports it
        return {}
    return {mc.mesh.index: mc.measured for mc in mesh_centres(layout)}
