"""The parts the build makes, as plain numbers (:mod:`wheelgen.layout.part_plan`).

Wheels sit at their axis with their back face at their height, angle 0; arbors and
sleeves stand at their axis from the bottom of their span. A carried arbor is placed
with its carrier at angle 0, and its carrier wheel gets a running bore for it at the
arbor's ``at``. Lengths in mm, angles in degrees.
"""

from __future__ import annotations

from ..design.model import Design, Wheel
from .part_plan import (
    ArborPart,
    Part,
    PinBoss,
    Placement,
    SleevePart,
    SlotCut,
    WheelPart,
)
from .placement import tooth_spec
from .plan import Layout, plan_layout
from .sleeves import running_bore

__all__ = ["plan_parts", "wheel_part"]

try:  # the pin-and-slot sizes live with the coupling (issue 6)
    from . import pinslot_geometry as _pinslot
except ImportError:  # pragma: no cover - only while that module is missing
    _pinslot = None  # type: ignore[assignment]  # slot and pin are then left out


def _round_radius(design: Design) -> float:
    # an end mill cannot leave an inside corner tighter than its own radius
    return design.process.cutter / 2 if design.process.kind == "mill" else 0.0


def wheel_part(layout: Layout, wheel: Wheel) -> WheelPart:
    """One wheel's part: teeth, bore on its seat, spokes, slot or pin, extra holes."""
    design = layout.design
    pos = layout.position(wheel.arbor) or (0.0, 0.0)
    slot: SlotCut | None = None
    pin: PinBoss | None = None
    if _pinslot is not None:
        for p in design.pinslots:
            if p.slot == wheel.name:
                slot = _pinslot.slot_cut(design, p)
            if p.pin == wheel.name:
                pin = _pinslot.pin_boss(design, p)
    holes = tuple(
        (a.at[0], a.at[1], round(running_bore(design.process, a.diameter).diameter, 6))
        for a in design.arbors
        if a.carrier == wheel.name and a.at is not None
    )
    return WheelPart(
        name=wheel.name,
        tooth=tooth_spec(wheel),
        face_width=wheel.face_width,
        bore=wheel.bore if wheel.bore is not None else layout.outside(wheel.arbor),
        seat=wheel.seat,
        spokes=wheel.spokes,
        rim=wheel.rim if wheel.rim is not None else 0.0,
        hub_diameter=wheel.hub_diameter,
        hub_length=wheel.hub_length,
        round_radius=_round_radius(design),
        slot=slot,
        pin=pin,
        holes=holes,
        placement=Placement(pos[0], pos[1], wheel.height, 0.0),
    )


def plan_parts(design: Design) -> tuple[Part, ...]:
    """Every part to make: wheels, then arbors and sleeves, then separate pins."""
    layout = plan_layout(design)
    parts: list[Part] = []
    placements: dict[str, Placement] = {}
    for w in design.wheels:
        part = wheel_part(layout, w)
        placements[w.name] = part.placement
        parts.append(part)
    for a in design.arbors:
        span = layout.stacking.spans.get(a.name)
        pos = layout.position(a.name)
        if span is None or pos is None or span.length <= 0:
            continue
        where = Placement(pos[0], pos[1], span.z0, 0.0)
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
                    ),
                    collars=tuple(
                        (z0 - span.z0, z1 - span.z0, d) for z0, z1, d in span.collars
                    ),
                    placement=where,
                )
            )
        else:
            parts.append(ArborPart(a.name, a.diameter, span.length, where))
    if _pinslot is not None:
        for p in design.pinslots:
            if p.pin_part == "separate":
                parts.append(_pinslot.pin_part(design, p, placements[p.pin]))
    return tuple(parts)
