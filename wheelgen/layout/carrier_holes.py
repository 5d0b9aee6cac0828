"""The holes a carrier wheel needs for the arbors it carries, and whether they fit.

A carried arbor turns in its carrier wheel: the wheel is bored for it with the running
fit (mill, hand) or the print clearance, at the arbor's ``at`` (see
:func:`wheelgen.layout.train_parts.carried_holes`); a spoked wheel is turned so that an arm
carries the first hole. Each hole must keep a wall (``[process] min_wall``) of solid
wheel all round: clear of the seat and any hub boss, below the tooth roots, and clear of
every spoke window, slot, pin hole and other arbor hole. A hole that cannot is a
problem the layout check reports (``layout.carrier_hole``) with its reason; the build
never cuts it. Lengths in mm.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..design.process_limits import wall_minimum
from ..teeth.forms import outline_for
from ..teeth.limits import short_of
from .collisions import signed_distance
from .train_layout import Layout
from .train_parts import carried_holes, wheel_part
from .wheel_profile import plate_profile, seat_extent

__all__ = ["HoleProblem", "carrier_hole_problems"]


@dataclass(frozen=True, slots=True)
class HoleProblem:
    """The hole for ``arbor`` in ``wheel`` has only ``wall`` mm where ``needed`` are."""

    wheel: str
    arbor: str
    reason: str
    wall: float
    needed: float


def _on_arm(spokes: int, first_deg: float, x: float, y: float) -> bool:
    """Does the point lie on the centre line of an arm (the first at ``first_deg``)?"""
    pitch = 360.0 / spokes
    off = math.fmod(math.degrees(math.atan2(y, x)) - first_deg, pitch)
    return min(abs(off), pitch - abs(off)) < 1e-6


def carrier_hole_problems(layout: Layout) -> list[HoleProblem]:
    """Every carried arbor's hole that leaves less than the process's wall round it."""
    design = layout.design
    wall = wall_minimum(design.process)
    out: list[HoleProblem] = []
    for wheel in design.wheels:
        if not design.carried_by(wheel.name):
            continue
        try:
            part = wheel_part(layout, wheel)
            profile = plate_profile(part, outline_for(part.tooth))
        except ValueError:  # teeth or spokes that cannot be made: reported elsewhere
            continue
        names = [name for name, *_ in carried_holes(design, wheel)]
        inner = seat_extent(part.seat, part.bore)
        inner_what = "the seat"
        if (
            part.hub_diameter > 0
            and part.hub_length > 0
            and part.hub_diameter / 2 > inner
        ):
            inner, inner_what = part.hub_diameter / 2, "the hub boss"
        others = [h for h in profile.holes if h.role not in ("bore", "arbor_hole")]
        for k, (name, (x, y, d)) in enumerate(zip(names, part.holes)):
            r, rc = d / 2, math.hypot(x, y)
            checks = [
                (rc - r - inner, f"{inner_what} ({2 * inner:.3f} mm across)"),
                (
                    profile.root_radius - rc - r,
                    f"the tooth roots (root circle {2 * profile.root_radius:.3f} mm)",
                ),
            ]
            on_arm = part.spokes > 0 and _on_arm(
                part.spokes, part.spoke_angle_deg, x, y
            )
            for h in others:
                gap = signed_distance(np.array([x, y]), h.polyline(0.01)) - r
                what = {
                    "window": "a spoke window: "
                    + (
                        "the arm under it is too narrow for it and its walls"
                        if on_arm
                        else "no arm of the spokes carries it"
                    ),
                    "slot": "the coupling's slot",
                    "pin_hole": "the coupling's pin hole",
                }[h.role]
                checks.append((gap, what))
            for j, (x2, y2, d2) in enumerate(part.holes):
                if j != k:
                    gap = math.hypot(x - x2, y - y2) - r - d2 / 2
                    checks.append((gap, f'the hole for arbor "{names[j]}"'))
            gap, what = min(checks)
            if short_of(gap, wall):
                out.append(HoleProblem(wheel.name, name, what, gap, wall))
    return out
