"""The frame's parts as plain numbers.

:func:`frame_parts` turns the frame plan (:func:`wheelgen.frame.plan.plan_frame`) into
part-plan entries (:mod:`wheelgen.layout.part_kinds`): the two plates, the pillars, the
cocks, and the bought screws and bushes or bearings, each placed where it goes.
:func:`to_cocks` lengthens the train's arbors that reach out to a cock. Every part of
a design is :func:`wheelgen.parts.plan_parts`. Lengths in mm.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import replace

from ..design.model import Design
from ..design.screws import screw
from ..layout.part_kinds import (
    ArborPart,
    BearingPart,
    CockPart,
    FlatHole,
    Part,
    PillarPart,
    PlatePart,
    Pose,
    ScrewPart,
)
from .holes import FrameHole
from .plan import FramePlan, plan_frame

__all__ = ["frame_parts", "to_cocks"]


def _plates(plan: FramePlan, extra: tuple[FrameHole, ...]) -> list[Part]:
    out: list[Part] = []
    for p in plan.plates:
        holes = tuple(
            FlatHole(round(h.x, 6), round(h.y, 6), round(h.diameter, 6), h.role, h.what)
            for h in p.holes + tuple(h for h in extra if h.plate == p.side)
        )
        out.append(
            PlatePart(p.name, p.thickness, plan.outline, holes, Pose(0.0, 0.0, p.z0))
        )
    return out


def _pillars(plan: FramePlan) -> list[Part]:
    design = plan.design
    assert design.frame is not None
    back, front = design.frame.plates
    t = design.frame.thickness
    lim = plan.limits
    tap = lim.screw.tap_drill
    depth = lim.pillar_hole_depth
    out: list[Part] = []
    for p in plan.pillars:
        if lim.spigot > 0:
            part = PillarPart(
                p.name, lim.pillar_diameter, front - back, lim.spigot, t, t,
                front_hole=tap, front_depth=depth,
                placement=Pose(p.x, p.y, back - t),
            )  # fmt: skip
        else:
            part = PillarPart(
                p.name, lim.pillar_diameter, front - back,
                back_hole=tap, back_depth=depth, front_hole=tap, front_depth=depth,
                placement=Pose(p.x, p.y, back),
            )  # fmt: skip
        out.append(part)
    return out


def _cocks(plan: FramePlan) -> list[Part]:
    lim = plan.limits
    out: list[Part] = []
    for c in plan.cocks:
        hanging = c.plate == "front"
        height = (c.bar_z1 - c.bar_z0) + (c.foot_z1 - c.foot_z0)
        out.append(
            CockPart(
                name=c.name,
                length=c.length,
                width=c.width,
                thickness=round(c.bar_z1 - c.bar_z0, 6),
                foot_from=c.foot_from,
                foot_height=round(c.foot_z1 - c.foot_z0, 6),
                pivot_hole=c.hole.diameter,
                screws=(c.foot_from, c.length),
                screw_hole=lim.screw.tap_drill,
                screw_depth=round(min(height, lim.pillar_hole_depth), 6),
                hanging=hanging,
                placement=Pose(
                    c.x, c.y, c.bar_z0 if hanging else c.foot_z0, c.angle_deg
                ),
            )
        )
    return out


def _bought(plan: FramePlan) -> list[Part]:
    out: list[Part] = []
    for s in plan.screws:
        size = screw(s.size)
        z = s.face - s.length if s.head_up else s.face - size.head_height
        out.append(
            ScrewPart(
                s.name, s.size, s.length, size.head_diameter, size.head_height,
                size.core, s.head_up, Pose(s.x, s.y, round(z, 6)),
            )
        )  # fmt: skip
    for b in plan.bearings:
        st = b.stock
        assert st.width is not None
        out.append(
            BearingPart(
                b.name, st.inside, st.outside, st.width, st.kind,
                Pose(b.x, b.y, b.z0),
            )
        )  # fmt: skip
    return out


def frame_parts(
    design: Design, plate_holes: Iterable[FrameHole] = ()
) -> tuple[Part, ...]:
    """The frame's parts: plates, pillars, cocks, then screws and bushes or bearings.

    ``plate_holes`` are further holes of the plates (the dials' foot pins, from
    :attr:`wheelgen.display.plan.DisplayPlan.plate_holes`), each on its ``plate``.
    A design without ``[frame]`` has none.
    """
    if design.frame is None:
        return ()
    plan = plan_frame(design)
    extra = tuple(plate_holes)
    return tuple(_plates(plan, extra) + _pillars(plan) + _cocks(plan) + _bought(plan))


def to_cocks(design: Design, parts: Iterable[Part]) -> tuple[Part, ...]:
    """``parts`` with every arbor that reaches out to its cock lengthened to it.

    Its seats (for a hand, knob or crank) stay where they are.
    """
    if design.frame is None:
        return tuple(parts)
    plan = plan_frame(design)
    reach = {c.arbor: c.arbor_z for c in plan.cocks if c.arbor_z is not None}
    out: list[Part] = []
    for p in parts:
        if isinstance(p, ArborPart) and p.name in reach:
            z0, z1 = reach[p.name]
            pl = p.placement
            seats = tuple(
                (round(a + pl.z - z0, 6), round(b + pl.z - z0, 6), shape)
                for a, b, shape in p.seats
            )
            p = replace(
                p, length=round(z1 - z0, 6), placement=replace(pl, z=z0), seats=seats
            )
        out.append(p)
    return tuple(out)
