"""The train's parts, as plain numbers (:mod:`wheelgen.layout.part_kinds`).

Every wheel sits at its axis with its back face at its height, turned to its angle at
rest (:mod:`wheelgen.layout.phasing`), so that every pair interleaves; what must meet
other parts is cut where the rest position needs it in the wheel's own frame: a pin or
a slot on its coupling's offset line, a polygon seat and its cross pin on the tube's
flats (angle 0), and a running bore for each arbor the wheel carries, at the arbor's
``at`` (the carrier's frame stands at angle 0 at rest), with the spokes turned so that
an arm carries it. Arbors and sleeves stand at their axis from the bottom of their
span. Lengths in mm, angles in degrees.
"""

from __future__ import annotations

import math
from dataclasses import replace

from ..design.model import Design, Wheel
from ..design.units import MM, Lengths, lengths_of
from .part_kinds import (
    ArborPart,
    Part,
    PinBoss,
    Pose,
    SeatShape,
    SleevePart,
    SlotCut,
    WheelPart,
)
from .phasing import rest_angles
from .placement import tooth_spec
from .sleeves import Bore, running_bore, wheel_bore
from .train_layout import Layout, plan_layout

__all__ = ["carried_holes", "train_parts", "wheel_part"]

try:  # the pin-and-slot sizes live with the coupling (issue 6)
    from . import pinslot_geometry as _pinslot
except ImportError:  # pragma: no cover - only while that module is missing
    _pinslot = None  # type: ignore[assignment]  # slot and pin are then left out


def _round_radius(design: Design) -> float:
    # an end mill cannot leave an inside corner tighter than its own radius
    return design.process.cutter / 2 if design.process.kind == "mill" else 0.0


def _turned(x: float, y: float, angle_deg: float) -> tuple[float, float]:
    a = math.radians(angle_deg)
    c, s = math.cos(a), math.sin(a)
    return (round(c * x - s * y, 9) + 0.0, round(s * x + c * y, 9) + 0.0)


def carried_holes(
    design: Design, wheel: Wheel, angle_deg: float = 0.0
) -> tuple[tuple[str, float, float, float], ...]:
    """``(arbor, x, y, diameter)`` of each arbor ``wheel`` carries, in the wheel's own
    frame when it stands at ``angle_deg`` (mm): the arbor's running bore at its ``at``."""
    return tuple(
        (a.name, *_turned(a.at[0], a.at[1], -angle_deg),
         round(running_bore(design.process, a.diameter).diameter, 6))
        for a in design.carried_by(wheel.name)
        if a.at is not None
    )  # fmt: skip


def wheel_part(layout: Layout, wheel: Wheel) -> WheelPart:
    """One wheel's part: teeth, bore on its seat, spokes, slot or pin, extra holes."""
    design = layout.design
    pos = layout.position(wheel.arbor) or (0.0, 0.0)
    phi = rest_angles(design).angles_deg.get(wheel.name, 0.0)
    slot: SlotCut | None = None
    pin: PinBoss | None = None
    if _pinslot is not None:
        for p in design.pinslots:
            # on the offset line at rest: at the bearing in the plate's frame
            if p.slot == wheel.name:
                cut = _pinslot.slot_cut(design, p)
                slot = replace(cut, angle_deg=cut.angle_deg - phi)
            if p.pin == wheel.name:
                boss = _pinslot.pin_boss(design, p)
                pin = replace(boss, angle_deg=boss.angle_deg - phi)
    holes = carried_holes(design, wheel, phi)
    spoke_angle = 0.0
    if holes and wheel.spokes:
        spoke_angle = math.degrees(math.atan2(holes[0][2], holes[0][1]))
    bore = wheel_bore(design, layout.sizes, wheel)
    return WheelPart(
        name=wheel.name,
        tooth=tooth_spec(wheel),
        face_width=wheel.face_width,
        bore=bore.diameter,
        seat=wheel.seat,
        spokes=wheel.spokes,
        rim=wheel.rim if wheel.rim is not None else 0.0,
        hub_diameter=wheel.hub_diameter,
        hub_length=wheel.hub_length,
        round_radius=_round_radius(design),
        slot=slot,
        pin=pin,
        holes=tuple((x, y, d) for _, x, y, d in holes),
        placement=Pose(pos[0], pos[1], wheel.height, phi),
        bore_fit=_fit_text(bore, lengths_of(design)),
        seat_angle_deg=-phi if wheel.seat != "round" else 0.0,
        spoke_angle_deg=spoke_angle,
    )


def _fit_text(bore: Bore, u: Lengths = MM) -> str:
    """What sets a bore, in the design's units: ``"H7/g6 on 3 mm: 3.000 to 3.010 mm"``."""
    if bore.zone:
        return (
            f"{bore.fit} on {u.trade(bore.shaft)} {u.unit}: {u.num(bore.low)} to "
            f"{u.num(bore.high)} {u.unit}"
        )
    fit = bore.fit
    if u.inches and not bore.zone and fit.startswith("print clearance"):
        fit = f"print clearance {u.text(bore.clearance / 2)}"
    return f"{fit} on {u.trade(bore.shaft)} {u.unit}"


def train_parts(design: Design) -> tuple[Part, ...]:
    """The train's parts: wheels, arbors and sleeves, then separate pins.

    Every part the build makes (with the display's and the frame's) is
    :func:`wheelgen.parts.plan_parts`.
    """
    layout = plan_layout(design)
    parts: list[Part] = []
    placements: dict[str, Pose] = {}
    for w in design.wheels:
        part = wheel_part(layout, w)
        placements[w.name] = part.placement
        parts.append(part)
    for a in design.arbors:
        span = layout.stacking.spans.get(a.name)
        pos = layout.position(a.name)
        if span is None or pos is None or span.length <= 0:
            continue
        where = Pose(pos[0], pos[1], span.z0, 0.0)
        items = _item_seats(layout, a.name, span.z0)
        if a.name in layout.sizes:
            size = layout.sizes[a.name]
            parts.append(
                SleevePart(
                    name=a.name,
                    inside=round(size.inside, 6),
                    outside=size.outside,
                    length=span.length,
                    seats=tuple(
                        (s.z0 - span.z0, s.z1 - span.z0, s.shape) for s in span.seats
                    )
                    + items,
                    collars=tuple(
                        (z0 - span.z0, z1 - span.z0, d) for z0, z1, d in span.collars
                    ),
                    placement=where,
                )
            )
        else:
            parts.append(ArborPart(a.name, a.diameter, span.length, where, items))
    if _pinslot is not None:
        for p in design.pinslots:
            if p.pin_part == "separate":
                parts.append(_pinslot.pin_part(design, p, placements[p.pin]))
    return tuple(parts)


def _item_seats(
    layout: Layout, member: str, z0: float
) -> tuple[tuple[float, float, SeatShape], ...]:
    """Seats of the hands, knob or crank on ``member``, relative to ``z0`` (mm).

    A square or flat is milled or filed on the member's end; a collet grips the round.
    """
    stacking = layout.stacking
    if stacking.levels is None or member in stacking.unreachable:
        return ()
    out: list[tuple[float, float, SeatShape]] = []
    for item in stacking.levels.of(member):
        shape: SeatShape = "round" if item.shape == "collet" else item.shape  # type: ignore[assignment]  # square or flat
        a, b = item.seat
        out.append((round(a - z0, 6), round(b - z0, 6), shape))
    return tuple(out)
