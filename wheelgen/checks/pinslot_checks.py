"""Checks of pin-and-slot couplings: offset, stacking, fit in the wheels, travel, angle.

Check ids (``pinslot.*``):

- ``offset``: the offset must be smaller than the pin radius (else the pin crosses the
  slot wheel's axis and the law has no smooth solution): error.
- ``stacking``: the slot wheel must sit in front of the pin wheel, not overlapping: error.
- ``width``: the slot must be at least as wide as the pin: error; milling with a cutter
  wider than pin plus play leaves lost motion: note.
- ``travel``: over a full turn the pin centre must stay between the slot's end centres,
  followed through the motion law (not the sizing formula): error.
- ``slot_fit``: the slot must lie in the slot wheel's body, clear of the bore or hub and
  below the root circle, with the process's minimum wall each side: error; a spoked slot
  wheel: warning (the slot must run along a spoke).
- ``pin_fit``: the pin must stand on the pin wheel's body in the same way: error.
- ``transmission``: smallest angle between the slot and the pin's path over a turn;
  below :data:`MIN_TRANSMISSION_DEG`: warning.
"""

from __future__ import annotations

import numpy as np

from ..design.model import Design, PinSlot, Wheel
from ..design.process_limits import wall_minimum
from ..findings import Finding
from ..kinematics.pinslot_motion import (
    max_deviation_pin_angles_deg,
    pin_distance,
    transmission_angle_deg,
)
from ..layout.part_kinds import SlotCut
from ..layout.pinslot_geometry import MILL_SLOT_PLAY, pin_boss, slot_cut
from ..layout.placement import tooth_spec
from ..layout.sleeves import size_sleeves, wheel_bore
from ..layout.wheel_profile import seat_extent
from ..teeth.forms import outline_for
from .analysis import Analysis

__all__ = [
    "MIN_TRANSMISSION_DEG",
    "pinslot_findings",
    "slot_travel_findings",
    "wheel_root_radius",
]

#: Smallest transmission angle without a warning (common practice, no source: the
#: usual lower limit for linkages).
MIN_TRANSMISSION_DEG = 30.0
# Pin angles sampled over one turn (every 0.25 degree) besides the exact extremes.
_SAMPLES = 1441
_TOL = 1e-9  # mm: rounding allowance when comparing radii


def wheel_root_radius(wheel: Wheel) -> float:
    """Root circle radius of ``wheel`` in mm, from the tooth generator."""
    spec = tooth_spec(wheel)
    try:
        return float(outline_for(spec).radii["root"])
    except ValueError:
        # Teeth the generator cannot make (the mesh checks report those): the
        # rack-generated root circle, m (z/2 - h_f + x).
        return wheel.module * (wheel.teeth / 2 - wheel.dedendum + wheel.shift)


def _inner_limit(design: Design, wheel: Wheel) -> tuple[float, str]:
    """Radius (mm) the cut must stay outside of: the bore, or the hub boss if larger."""
    bore = wheel_bore(design, size_sleeves(design), wheel).diameter
    extent = seat_extent(wheel.seat, bore)
    if wheel.hub_diameter / 2 > extent:
        return wheel.hub_diameter / 2, "hub"
    return extent, "bore"


def _mm(x: float) -> str:
    return f"{x:.3f} mm"


def slot_travel_findings(pinslot: PinSlot, cut: SlotCut) -> list[Finding]:
    """Does the pin stay in ``cut`` over a full turn, and does it fit its width?

    The pin centre's distance from the slot wheel's axis is followed through the motion
    law over a turn (sampled, plus the exact nearest and farthest points) and must stay
    between the slot's end centres; the slot must be at least as wide as the pin.
    """
    subject = f"pin-and-slot {pinslot.name}"
    out: list[Finding] = []
    if cut.width < pinslot.pin_diameter - _TOL:
        out.append(
            Finding(
                "error",
                "pinslot.width",
                subject,
                "the slot is narrower than the pin",
                measured=_mm(cut.width),
                limit=f">= {_mm(pinslot.pin_diameter)}",
                advice="widen the slot or use a thinner pin",
            )
        )
    u = np.concatenate((np.linspace(0.0, 360.0, _SAMPLES), [0.0, 180.0]))
    dist = pin_distance(u, pinslot.radius, pinslot.offset)
    near, far = float(dist.min()), float(dist.max())
    if near < cut.inner - _TOL:
        out.append(
            Finding(
                "error",
                "pinslot.travel",
                subject,
                f"the pin leaves the slot at its inner end over a turn, by "
                f"{_mm(cut.inner - near)}",
                measured=f"pin centre comes to {_mm(near)} from the axis",
                limit=f"inner end centre at {_mm(cut.inner)}",
                advice="the slot must reach the pin's whole travel: its ends follow "
                "'radius' and 'offset'",
            )
        )
    if far > cut.outer + _TOL:
        out.append(
            Finding(
                "error",
                "pinslot.travel",
                subject,
                f"the pin leaves the slot at its outer end over a turn, by "
                f"{_mm(far - cut.outer)}",
                measured=f"pin centre reaches {_mm(far)} from the axis",
                limit=f"outer end centre at {_mm(cut.outer)}",
                advice="the slot must reach the pin's whole travel: its ends follow "
                "'radius' and 'offset'",
            )
        )
    return out


def _body_findings(
    design: Design,
    wheel: Wheel,
    low: float,
    high: float,
    check: str,
    subject: str,
    what: str,
) -> list[Finding]:
    wall = wall_minimum(design.process)
    inside, which = _inner_limit(design, wheel)
    root = wheel_root_radius(wheel)
    out: list[Finding] = []
    if low < inside + wall - _TOL:
        out.append(
            Finding(
                "error",
                check,
                subject,
                f"{what} comes too close to the {which} of wheel {wheel.name}",
                measured=f"inner edge at {_mm(low)}",
                limit=f">= {_mm(inside + wall)} ({which} {_mm(inside)} + wall {_mm(wall)})",
                advice="make 'radius' larger or 'offset' smaller, or use a smaller hub",
            )
        )
    if high > root - wall + _TOL:
        out.append(
            Finding(
                "error",
                check,
                subject,
                f"{what} runs into the teeth of wheel {wheel.name}",
                measured=f"outer edge at {_mm(high)}",
                limit=f"<= {_mm(root - wall)} (root {_mm(root)} - wall {_mm(wall)})",
                advice="make 'radius' or 'offset' smaller, or the wheel larger",
            )
        )
    return out


def _one(design: Design, p: PinSlot) -> list[Finding]:
    subject = f"pin-and-slot {p.name}"
    if p.offset >= p.radius:
        return [
            Finding(
                "error",
                "pinslot.offset",
                subject,
                "the offset between the axes is not smaller than the pin radius: the "
                "pin would pass through the slot wheel's axis",
                measured=_mm(p.offset),
                limit=f"< radius {_mm(p.radius)}",
                advice="make 'offset' smaller or 'radius' larger",
            )
        ]
    out: list[Finding] = []
    pin_w, slot_w = design.wheel(p.pin), design.wheel(p.slot)
    try:
        boss = pin_boss(design, p)
    except ValueError as exc:
        boss = None
        out.append(
            Finding(
                "error",
                "pinslot.stacking",
                subject,
                str(exc),
                advice="raise the slot wheel's 'height' above the pin wheel's front face",
            )
        )
    try:
        cut = slot_cut(design, p)
    except ValueError as exc:
        out.append(Finding("error", "pinslot.slot_fit", subject, str(exc)))
        cut = None
    if cut is not None:
        out.extend(slot_travel_findings(p, cut))
        out.extend(
            _body_findings(
                design,
                slot_w,
                cut.inner - cut.width / 2,
                cut.outer + cut.width / 2,
                "pinslot.slot_fit",
                subject,
                "the slot",
            )
        )
        if slot_w.spokes:
            out.append(
                Finding(
                    "warning",
                    "pinslot.slot_fit",
                    subject,
                    f"wheel {slot_w.name} has {slot_w.spokes} spokes: the slot must run "
                    "along a spoke wide enough to keep a wall each side",
                    advice="give the slot wheel a solid web (spokes = 0)",
                )
            )
        play = cut.width - p.pin_diameter
        if design.process.kind == "mill" and play > MILL_SLOT_PLAY + _TOL:
            lost = np.degrees(play / (p.radius - p.offset))
            out.append(
                Finding(
                    "note",
                    "pinslot.width",
                    subject,
                    f"the cutter ({_mm(design.process.cutter)}) makes the slot "
                    f"{_mm(play)} wider than the pin: up to {lost:.2f} degrees of lost "
                    "motion in the coupling",
                    measured=_mm(cut.width),
                    limit=f"pin + {_mm(MILL_SLOT_PLAY)}",
                    advice="cut the slot with a cutter no wider than the pin",
                )
            )
    if boss is not None:
        out.extend(
            _body_findings(
                design,
                pin_w,
                p.radius - p.pin_diameter / 2,
                p.radius + p.pin_diameter / 2,
                "pinslot.pin_fit",
                subject,
                "the pin",
            )
        )
    u_lead, u_lag = max_deviation_pin_angles_deg(p.radius, p.offset)
    u = np.concatenate((np.linspace(0.0, 360.0, _SAMPLES), [u_lead, u_lag]))
    smallest = float(transmission_angle_deg(u, p.radius, p.offset).min())
    if smallest < MIN_TRANSMISSION_DEG:
        out.append(
            Finding(
                "warning",
                "pinslot.transmission",
                subject,
                "the slot meets the pin's path at a shallow angle: the coupling will "
                "bind or wear",
                measured=f"{smallest:.1f} deg",
                limit=f">= {MIN_TRANSMISSION_DEG:.0f} deg",
                advice="make 'offset' smaller relative to 'radius'",
            )
        )
    return out


def pinslot_findings(design: Design, analysis: Analysis) -> list[Finding]:
    """Findings for every pin-and-slot coupling of ``design`` (see the module docstring)."""
    out: list[Finding] = []
    for p in design.pinslots:
        out.extend(_one(design, p))
    return out
