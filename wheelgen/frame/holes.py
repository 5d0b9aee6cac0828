"""The holes of the frame's plates and cocks: which member runs or is held in each, and
its size and fit (mm).

The holes follow from the layout: a plate has a hole for every axis whose span passes
through it (:attr:`wheelgen.layout.stacking.MemberSpan.plates`), sized for the outermost
member of that axis that passes. Then:

- a member that turns there pivots in a running bore: the process's fit
  (:func:`wheelgen.layout.sleeves.running_bore`; the hole is modelled in the middle of
  its zone);
- a member held still there (a fixed stud or tube) sits in a hole of its own size: the
  hole zone of the process's fit (``H7`` of ``H7/g6``), the member made to a press fit
  or fixed with retaining compound; printed, the hole is the member's size;
- an arbor whose ``pivot`` is ``"bush"`` or ``"bearing"`` runs in the smallest bush or
  ball bearing of the design's ``[[stock]]`` list that fits it (a bush's bore gives the
  running fit, a bearing's bore is the arbor's diameter), and the plate's hole holds
  that part's outside as a held member's hole does.

A plate-like part added later (a dial) gets its holes the same way from the members that
pass through it. Pillar and screw holes are added by the frame plan.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..design.model import Design, Stock
from ..layout.fits import limit_deviations
from ..layout.sleeves import coaxial_groups, running_bore, stock_fits
from ..layout.train_layout import Layout

__all__ = ["FrameHole", "held_hole", "member_holes", "pivot_stock"]


@dataclass(frozen=True, slots=True)
class FrameHole:
    """One round hole of a plate or cock, in the design's frame (mm).

    ``diameter`` is the size modelled in the solid, ``nominal`` the size named on the
    chart, ``low`` to ``high`` its limits and ``fit`` what sets them. ``role``: pivot,
    held, bush, bearing, pillar, screw (a pillar's screw) or mounting (a cock's screw).
    ``what`` names the member, pillar or cock it serves.
    """

    plate: str
    x: float
    y: float
    diameter: float
    nominal: float
    role: str
    what: str
    fit: str
    low: float
    high: float


def held_hole(design: Design, diameter: float) -> tuple[str, float, float]:
    """Fit, smallest and largest size (mm) of a hole that holds a part still."""
    proc = design.process
    if proc.kind == "print":
        return "print press", diameter, diameter
    zone = proc.fit.split("/")[0]
    up, lo = limit_deviations(diameter, zone)
    return zone, round(diameter + lo / 1000, 6), round(diameter + up / 1000, 6)


def pivot_stock(design: Design, arbor: str, shaft: float) -> Stock | None:
    """The bush or bearing from ``[[stock]]`` that ``arbor`` runs in, if it asks for one.

    ``None`` when the arbor runs in a plain hole, or when nothing on the list fits it
    (the frame checks say so).
    """
    kind = design.arbor(arbor).pivot
    if kind == "hole":
        return None
    bore = running_bore(design.process, shaft)
    fitting = [
        s
        for s in design.stock
        if s.kind == kind
        and (
            stock_fits(design.process, bore, s)
            if kind == "bush"
            else abs(s.inside - shaft) <= 1e-6
        )
    ]
    if not fitting:
        return None
    return min(fitting, key=lambda s: (s.outside, s.width or 0.0, s.inside))


def seat_hole(
    design: Design,
    member: str,
    shaft: float,
    fixed: bool,
    where: str,
    x: float,
    y: float,
) -> FrameHole:
    """The hole for ``member`` (``shaft`` mm across) at (x, y) in ``where``."""
    stock = None if fixed else pivot_stock(design, member, shaft)
    if fixed or stock is not None:
        size = shaft if stock is None else stock.outside
        fit, low, high = held_hole(design, size)
        role = "held" if stock is None else stock.kind
        return FrameHole(where, x, y, size, size, role, member, fit, low, high)
    bore = running_bore(design.process, shaft)
    fit = bore.zone or f"print +{bore.diameter - shaft:g}"
    return FrameHole(
        where, x, y, bore.diameter, shaft, "pivot", member, fit, bore.low, bore.high
    )


def member_holes(layout: Layout, plate: str) -> list[FrameHole]:
    """The holes of ``plate`` ("back" or "front") for the members passing through it."""
    design = layout.design
    spans = layout.stacking.spans
    out = []
    for root, members in coaxial_groups(design).items():
        pos = layout.placing.positions.get(root)
        if pos is None or plate not in spans[root].plates:
            continue
        holder = root
        for m in members[1:]:
            if plate in spans[m].plates:
                holder = m
        out.append(
            seat_hole(
                design,
                holder,
                layout.outside(holder),
                design.arbor(holder).fixed,
                plate,
                *pos,
            )
        )
    return out
