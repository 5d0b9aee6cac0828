"""Coaxial nested sleeves: tube sizes from the innermost shaft outwards (mm).

Each sleeve's bore runs on the outside of the member it surrounds:

- ``mill`` and ``hand``: the ISO 286 fit named in ``[process].fit`` at that nominal
  size (:mod:`wheelgen.layout.fits`). The bore is modelled in the middle of the hole's
  zone (so within its limits), the shaft at its nominal size; the shaft's own limits
  (``shaft_low``, ``shaft_high``) say how to make the member inside.
- ``print``: ``[process].clearance`` is radial, so the bore is the shaft plus twice it.

The wall is at least ``[process]`` ``wall_minimum`` (print: two nozzle widths; mill:
0.3 mm unless set) where it is thinnest: across the flats of a square or hex wheel
seat milled on the tube. Outside diameters are rounded up to :data:`SIZE_STEP`. With a
``[[stock]]`` list, the smallest tube on hand whose bore gives the running fit and
whose wall is thick enough is used, and the layout says which.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..design.model import Design, Process, Stock, Wheel
from ..design.process_limits import wall_minimum
from .fits import fit_limits
from .front import seat_shape

__all__ = [
    "SIZE_STEP",
    "FLAT_DEPTH",
    "Bore",
    "SleeveSize",
    "coaxial_groups",
    "member_outside",
    "running_bore",
    "seat_factor",
    "size_sleeves",
    "stock_fits",
    "wheel_bore",
]

#: A flat seat (for a hand, knob or crank) is filed or printed this share of the
#: diameter deep, a "D" end (common practice, no source).
FLAT_DEPTH = 0.1

#: mm: sleeve outside diameters are rounded up to a multiple of this (bar and tube are
#: sold in 0.1 mm steps; common practice, no source).
SIZE_STEP = 0.1


@dataclass(frozen=True, slots=True)
class Bore:
    """A running bore on a shaft of nominal diameter ``shaft`` (mm).

    ``diameter`` is the modelled bore; ``low`` and ``high`` its limits (mm); ``fit``
    says what sets them (``"H7/g6"`` or ``"print clearance 0.2 mm"``); ``shaft_low``
    and ``shaft_high`` are the limits the shaft is made to (mm).
    """

    shaft: float
    diameter: float
    low: float
    high: float
    fit: str
    zone: str  # the hole's zone ("H7") or "" for a printed bore
    shaft_low: float
    shaft_high: float

    @property
    def clearance(self) -> float:
        """Modelled diametral clearance in mm."""
        return self.diameter - self.shaft


@dataclass(frozen=True, slots=True)
class SleeveSize:
    """One sleeve's tube: inside and outside diameter (mm), its bore, wall and source."""

    name: str
    around: str
    inside: float
    outside: float
    bore: Bore
    wall: float  # thinnest wall in mm (across a seat's flats where there is one)
    wall_minimum: float
    stock: Stock | None = None
    stock_refused: bool = False  # a stock list was given but no tube on it fits


def running_bore(process: Process, shaft: float) -> Bore:
    """The bore (mm) that runs on a shaft of nominal ``shaft`` mm for ``process``."""
    if not (math.isfinite(shaft) and shaft > 0):
        raise ValueError(f"'shaft' must be > 0 mm, got {shaft}")
    if process.kind == "print":
        d = round(shaft + 2.0 * process.clearance, 6)
        fit = f"print clearance {process.clearance:g} mm"
        return Bore(shaft, d, d, d, fit, "", shaft, shaft)
    limits = fit_limits(shaft, process.fit)
    low, high = (round(x, 6) for x in limits.hole_limits)
    s_low, s_high = (round(x, 6) for x in limits.shaft_limits)
    fit = str(limits.fit)
    mid = round((low + high) / 2, 6)
    return Bore(shaft, mid, low, high, fit, str(limits.fit.hole), s_low, s_high)


def seat_factor(shape: str) -> float:
    """Across-flats size of a seat milled on round stock, as a fraction of the outside.

    For a flat seat (one flat, a "D") the figure is twice the flat's distance from the
    axis, so that ``(outside * factor - inside) / 2`` is the wall under the flat.
    """
    if shape == "square":
        return math.cos(math.pi / 4)
    if shape == "hex":
        return math.cos(math.pi / 6)
    if shape == "flat":
        return 1.0 - 2.0 * FLAT_DEPTH
    return 1.0


def _item_seats(design: Design, name: str) -> list[str]:
    """Seat shapes of the hands (and the knob or crank) held on member ``name``."""
    out = [seat_shape(design, name, h) for h in design.readings() if h.arbor == name]
    if name == design.drive.arbor and design.drive_input.kind != "none":
        out.append(seat_shape(design, name))
    return out


def coaxial_groups(design: Design) -> dict[str, list[str]]:
    """Axis root -> its members from the innermost outwards (parents before children)."""
    children: dict[str, list[str]] = {}
    for a in design.arbors:
        if a.around is not None:
            children.setdefault(a.around, []).append(a.name)
    groups: dict[str, list[str]] = {}
    for a in design.arbors:
        if a.around is None:
            order, todo = [], [a.name]
            while todo:
                name = todo.pop(0)
                order.append(name)
                todo.extend(children.get(name, []))
            groups[a.name] = order
    return groups


def _round_up(x: float, step: float) -> float:
    # 1e-9 keeps an exact multiple (3.6 from float noise 3.6000000000000005) unrounded
    return round(math.ceil(x / step - 1e-9) * step, 6)


def stock_fits(process: Process, bore: Bore, s: Stock) -> bool:
    """Does the bore of stock ``s`` give ``bore``'s running fit (tube or bush)?"""
    if process.kind == "print":
        # derived: within half to one and a half times the radial clearance asked for
        c = process.clearance
        return bore.shaft + c <= s.inside <= bore.shaft + 3 * c
    return bore.low - 1e-9 <= s.inside <= bore.high + 1e-9


def size_sleeves(design: Design) -> dict[str, SleeveSize]:
    """Tube sizes of every sleeve, sized from the innermost shaft outwards."""
    proc = design.process
    wall_min = wall_minimum(proc)
    sizes: dict[str, SleeveSize] = {}
    outside: dict[str, float] = {}
    tubes = [s for s in design.stock if s.kind == "tube"]
    for root, members in coaxial_groups(design).items():
        outside[root] = design.arbor(root).diameter
        for name in members[1:]:
            arbor = design.arbor(name)
            assert arbor.around is not None
            bore = running_bore(proc, outside[arbor.around])
            shapes = [w.seat for w in design.wheels_on(name)]
            factor = min(
                (seat_factor(s) for s in shapes + _item_seats(design, name)),
                default=1.0,
            )
            stock: Stock | None = None
            fitting = [
                s
                for s in tubes
                if stock_fits(proc, bore, s)
                and (s.outside * factor - s.inside) / 2 >= wall_min - 1e-9
            ]
            if fitting:
                stock = min(fitting, key=lambda s: (s.outside, s.inside))
                inside, out = stock.inside, stock.outside
            else:
                inside = bore.diameter
                out = _round_up((bore.high + 2 * wall_min) / factor, SIZE_STEP)
            outside[name] = out
            sizes[name] = SleeveSize(
                name,
                arbor.around,
                inside,
                out,
                bore,
                round((out * factor - inside) / 2, 6),
                wall_min,
                stock,
                bool(tubes) and stock is None,
            )
    return sizes


def member_outside(design: Design, sizes: dict[str, SleeveSize], name: str) -> float:
    """Outside diameter (mm) of an arbor or sleeve."""
    return sizes[name].outside if name in sizes else design.arbor(name).diameter


def wheel_bore(design: Design, sizes: dict[str, SleeveSize], wheel: Wheel) -> Bore:
    """The seat hole (mm) of ``wheel``: its own ``bore``, else its seat opened up.

    The seat is the outside of the arbor or sleeve under the wheel; a square or hex
    seat is milled to its flats on either (:func:`seat_factor`), and the hole's size is
    then across its flats. The seat is opened up by the running fit (mill, hand) or the
    print clearance, as the train format says (:func:`running_bore`).
    """
    seat = member_outside(design, sizes, wheel.arbor)
    seat = round(seat * seat_factor(wheel.seat), 6)
    if wheel.bore is not None:
        d = wheel.bore
        return Bore(seat, d, d, d, "as given ('bore')", "", seat, seat)
    return running_bore(design.process, seat)
