"""The frame of a design, planned once: outline, plates and their holes, pillars, cocks,
screws and bushes or bearings (mm).

Order of work (each step keeps clear of what the steps before it placed):

1. the zones the moving train takes (:mod:`wheelgen.frame.keepout`);
2. the holes each plate needs for the members that pass through it
   (:mod:`wheelgen.frame.holes`);
3. a cock for every arbor that one plate alone holds (:mod:`wheelgen.frame.cocks`);
4. the pillars, given or placed (:mod:`wheelgen.frame.pillars`);
5. the outline: given, or the rounded hull round every zone grown by the margin, every
   cock, every pillar and every hole with its edge distance
   (:func:`wheelgen.frame.outline.rounded_hull`);
6. the screws that fix pillars and cocks, the lengths chosen from ISO 4762's preferred
   lengths: the shortest that holds by the engagement of
   :class:`~wheelgen.frame.limits.FrameLimits` and stays inside its tapped hole.

Both plates share one outline. What cannot be placed is recorded as a trouble; the
frame checks turn each into a finding.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from ..design.model import Design, Stock
from ..design.screws import SCREW_LENGTHS
from ..layout.part_kinds import FlatEdge
from ..layout.train_layout import Layout, plan_layout
from .cocks import Cock, CockTrouble, arbor_zone, place_cocks
from .holes import FrameHole, held_hole, member_holes, pivot_stock
from .keepout import Zone, train_zones
from .limits import FrameLimits, frame_limits, min_edge_distance
from .outline import (
    Circle,
    edges_polyline,
    polygon_outline,
    rectangle_outline,
    rounded_hull,
)
from .pillars import (
    GROW_STEPS,
    Pillar,
    PillarTrouble,
    choose_pillars,
    given_pillars,
    pillar_candidates,
    pillar_hole,
    pillar_spacing,
    room_report,
)

__all__ = [
    "PLATES",
    "BearingPlace",
    "FramePlan",
    "PlatePlan",
    "ScrewPlace",
    "plan_frame",
]

#: The plates, back to front.
PLATES: tuple[str, ...] = ("back", "front")


@dataclass(frozen=True, slots=True)
class PlatePlan:
    """One plate: its part name, which plate, its lower face's height and its holes."""

    name: str
    side: str  # "back" | "front"
    z0: float
    thickness: float
    holes: tuple[FrameHole, ...]


@dataclass(frozen=True, slots=True)
class ScrewPlace:
    """One screw: size, length under the head (mm), axis, and where its head bears.

    ``face`` is the height of the face the head bears on; the shank runs from it
    towards +Z (``head_up`` false: the head below the face) or towards -Z.
    """

    name: str
    size: str
    length: float
    x: float
    y: float
    face: float
    head_up: bool
    holds: str  # what it fixes: "pillar_1 to the front plate"


@dataclass(frozen=True, slots=True)
class BearingPlace:
    """A bush or bearing from the stock list, seated in a plate or cock (mm)."""

    name: str
    stock: Stock
    member: str  # the arbor that runs in it
    x: float
    y: float
    z0: float
    holds: str  # "moon in the back plate"


@dataclass(frozen=True, slots=True)
class FramePlan:
    """Everything of one design's frame (see the module docstring)."""

    design: Design
    limits: FrameLimits
    outline: tuple[FlatEdge, ...]
    outline_given: bool
    plates: tuple[PlatePlan, ...]
    pillars: tuple[Pillar, ...]
    cocks: tuple[Cock, ...]
    screws: tuple[ScrewPlace, ...]
    bearings: tuple[BearingPlace, ...]
    zones: tuple[Zone, ...]
    pillar_troubles: tuple[PillarTrouble, ...]
    cock_troubles: tuple[CockTrouble, ...]
    missing_stock: tuple[tuple[str, str], ...]  # (arbor, "bush" | "bearing")
    screw_troubles: tuple[tuple[str, float], ...]  # (what, depth of its hole in mm)

    def plate(self, side: str) -> PlatePlan:
        for p in self.plates:
            if p.side == side:
                return p
        raise KeyError(side)

    def outline_loop(self, tol: float = 0.05) -> np.ndarray:
        """The outline as a closed polyline (``(n, 2)``, mm)."""
        return edges_polyline(self.outline, tol)


def _free(name: str, taken: set[str]) -> str:
    """``name``, or ``name_frame``, ``name_frame2``... if the design uses it already."""
    out, k = name, 1
    while out in taken:
        out = f"{name}_frame" if k == 1 else f"{name}_frame{k}"
        k += 1
    taken.add(out)
    return out


def _screw_length(
    limits: FrameLimits, depth: float, blind: bool, plate: bool = True
) -> float | None:
    """Shortest ISO 4762 length (mm) that holds and stays in a hole ``depth`` deep.

    ``plate``: the screw passes the plate before it reaches the hole (else the hole
    starts at the face its head bears on, as in a pillar's spigot).
    """
    t = limits.plate_thickness if plate else 0.0
    top = t + depth - (0.5 if blind else 0.0)
    for length in SCREW_LENGTHS:
        if length >= t + limits.engagement - 1e-9:
            return length if length <= top + 1e-9 else None
    return None


@lru_cache(maxsize=16)
def plan_frame(design: Design) -> FramePlan:
    """The frame of ``design`` (which must have a ``[frame]``); cached per design."""
    if design.frame is None:
        raise ValueError("the design has no [frame]: it has no plates")
    return _plan(plan_layout(design))


def _plan(layout: Layout) -> FramePlan:
    design = layout.design
    frame = design.frame
    assert frame is not None
    limits = frame_limits(design)
    t = frame.thickness
    back, front = frame.plates
    taken = {a.name for a in design.arbors} | {w.name for w in design.wheels}
    taken |= {p.name for p in design.pinslots} | {
        f"{p.name}_pin" for p in design.pinslots
    }
    zones = train_zones(layout)
    holes = {side: member_holes(layout, side) for side in PLATES}
    seats = _seat_zones(layout, holes)
    cocks, cock_troubles = place_cocks(layout, limits, zones + seats, holes)
    cocks = [_renamed(c, _free(c.name, taken)) for c in cocks]
    cock_zones = [z for c in cocks for z in c.zones]
    cock_zones += [
        arbor_zone(layout, c.arbor, *c.arbor_z) for c in cocks if c.arbor_z is not None
    ]
    screw_d = limits.screw.clearance_hole
    for c in cocks:
        for sx, sy in c.screws:
            holes[c.plate].append(
                FrameHole(c.plate, sx, sy, screw_d, screw_d, "mounting", c.name,
                          "ISO 273 medium", screw_d, screw_d)
            )  # fmt: skip
    given_outline: np.ndarray | None = None
    edges: tuple[FlatEdge, ...] | None = None
    if frame.rectangle is not None:
        edges = rectangle_outline(*frame.rectangle, frame.corner)
    elif frame.polygon is not None:
        edges = polygon_outline(frame.polygon, frame.corner)
    if edges is not None:
        given_outline = edges_polyline(edges, 0.05)
    all_zones = zones + seats + cock_zones
    pivots = np.array([(h.x, h.y) for side in PLATES for h in holes[side]]).reshape(
        -1, 2
    )
    pillar_troubles: list[PillarTrouble] = []
    if design.pillars:
        pillars, pillar_troubles = given_pillars(
            design, all_zones, holes["back"] + holes["front"], limits
        )
    else:
        pillars = []
        cands = np.zeros((0, 2))
        for k in [0] if given_outline is not None else range(GROW_STEPS):
            found = choose_pillars(
                cands := pillar_candidates(
                    all_zones,
                    holes["back"] + holes["front"],
                    limits,
                    given_outline,
                    k * limits.pillar_diameter,
                ),
                frame.pillars,
                limits,
                pivots,
            )
            if len(found) > len(pillars):
                pillars = found
            if len(pillars) == frame.pillars:
                break
        if not pillars:
            loop = given_outline if given_outline is not None else _zone_loop(all_zones)
            pillar_troubles.append(
                PillarTrouble(
                    "frame pillars",
                    f"no room for 3 pillars ({limits.pillar_diameter:g} mm across,"
                    f" {limits.clearance:g} mm clear of every wheel, path and part, at"
                    f" least {pillar_spacing(limits):g} mm apart)"
                    " inside the plate outline: "
                    + room_report(all_zones, cands, loop, limits),
                    f"{_spot_count(cands, limits)} place(s)",
                    "3 places",
                    "make the [frame] rectangle or polygon larger, or leave it out (the"
                    " outline then grows round the pillars), or give [[pillar]]"
                    " positions",
                )
            )
        elif len(pillars) < frame.pillars:
            pillar_troubles.append(
                PillarTrouble(
                    "frame pillars",
                    f"only {len(pillars)} of the {frame.pillars} pillars asked for fit"
                    " apart inside the plate outline",
                    f"{len(pillars)} pillars",
                    f"{frame.pillars} pillars",
                    "a larger outline, or fewer pillars ([frame] pillars)",
                    level="warning",
                )
            )
    pillars = [Pillar(_free(p.name, taken), p.x, p.y, p.given) for p in pillars]
    d_pillar = pillar_hole(limits)
    for p in pillars:
        for side in PLATES:
            if limits.spigot > 0:
                fit, low, high = held_hole(design, d_pillar)
                holes[side].append(
                    FrameHole(side, p.x, p.y, d_pillar, d_pillar, "pillar", p.name,
                              fit, low, high)
                )  # fmt: skip
            else:
                holes[side].append(
                    FrameHole(side, p.x, p.y, d_pillar, d_pillar, "screw", p.name,
                              "ISO 273 medium", d_pillar, d_pillar)
                )  # fmt: skip
    if edges is None:
        edges = rounded_hull(_hull_circles(all_zones, pillars, holes, limits))
    screws, bearings, missing, short = _fasteners(
        layout, limits, pillars, cocks, holes, taken
    )
    plates = tuple(
        PlatePlan(
            _free(f"{side}_plate", taken),
            side,
            back - t if side == "back" else front,
            t,
            tuple(holes[side]),
        )
        for side in PLATES
    )
    return FramePlan(
        design=design,
        limits=limits,
        outline=edges,
        outline_given=given_outline is not None,
        plates=plates,
        pillars=tuple(pillars),
        cocks=tuple(cocks),
        screws=tuple(screws),
        bearings=tuple(bearings),
        zones=tuple(zones),
        pillar_troubles=tuple(pillar_troubles),
        cock_troubles=tuple(cock_troubles),
        missing_stock=tuple(missing),
        screw_troubles=tuple(short),
    )


def _seat_zones(layout: Layout, holes: dict[str, list[FrameHole]]) -> list[Zone]:
    """Bushes and bearings that stand proud of a plate's inner face, as zones."""
    design = layout.design
    assert design.frame is not None
    back, front = design.frame.plates
    t = design.frame.thickness
    out = []
    for side in PLATES:
        for h in holes[side]:
            stock = pivot_stock(design, h.what, layout.outside(h.what))
            if (
                h.role not in ("bush", "bearing")
                or stock is None
                or stock.width is None
            ):
                continue
            proud = stock.width - t
            if proud <= 0:
                continue
            z0, z1 = (back, back + proud) if side == "back" else (front - proud, front)
            out.append(
                Zone(
                    f"{stock.kind} of {h.what}",
                    h.x,
                    h.y,
                    0.0,
                    stock.outside / 2,
                    z0,
                    z1,
                )
            )
    return out


def _renamed(c: Cock, name: str) -> Cock:
    if name == c.name:
        return c
    from dataclasses import replace

    return replace(c, name=name, hole=replace(c.hole, plate=name))


def _zone_loop(zones: list[Zone]) -> np.ndarray:
    return edges_polyline(rounded_hull([c for z in zones for c in z.circles]), 0.5)


def _spot_count(cands: np.ndarray, limits: FrameLimits) -> int:
    apart = pillar_spacing(limits)
    spots: list[np.ndarray] = []
    for p in cands:
        if all(float(np.hypot(*(p - q))) >= apart for q in spots):
            spots.append(p)
    return len(spots)


def _hull_circles(
    zones: list[Zone],
    pillars: list[Pillar],
    holes: dict[str, list[FrameHole]],
    limits: FrameLimits,
) -> list[Circle]:
    m = limits.margin
    circles: list[Circle] = [(x, y, r + m) for z in zones for (x, y, r) in z.circles]
    r_pillar = limits.pillar_diameter / 2
    for p in pillars:
        edge = max(r_pillar + m, min_edge_distance(pillar_hole(limits), limits))
        circles.append((p.x, p.y, edge))
    for side in PLATES:
        for h in holes[side]:
            circles.append((h.x, h.y, min_edge_distance(h.diameter, limits)))
    return circles


def _fasteners(
    layout: Layout,
    limits: FrameLimits,
    pillars: list[Pillar],
    cocks: list[Cock],
    holes: dict[str, list[FrameHole]],
    taken: set[str],
) -> tuple[
    list[ScrewPlace], list[BearingPlace], list[tuple[str, str]], list[tuple[str, float]]
]:
    design = layout.design
    assert design.frame is not None
    back, front = design.frame.plates
    t = design.frame.thickness
    size = limits.screw.name
    screws: list[ScrewPlace] = []
    short: list[tuple[str, float]] = []
    depth = limits.pillar_hole_depth
    for p in pillars:
        ends = ("front",) if limits.spigot > 0 else ("back", "front")
        for side in ends:
            length = _screw_length(limits, depth, blind=True, plate=limits.spigot <= 0)
            if length is None:
                short.append((p.name, depth))
                continue
            screws.append(
                ScrewPlace(
                    _free(f"{p.name}_{side}_screw", taken), size, length, p.x, p.y,
                    back - t if side == "back" else front + t, side == "front",
                    f"{p.name} to the {side} plate",
                )
            )  # fmt: skip
    for c in cocks:
        depth_c = _cock_screw_depth(c, limits)
        length = _screw_length(limits, depth_c, blind=depth_c < _cock_height(c) - 1e-9)
        if length is None:
            short.append((c.name, depth_c))
            continue
        for k, (sx, sy) in enumerate(c.screws, start=1):
            screws.append(
                ScrewPlace(
                    _free(f"{c.name}_screw_{k}", taken), size, length, sx, sy,
                    back - t if c.plate == "back" else front + t, c.plate == "front",
                    f"{c.name} to the {c.plate} plate",
                )
            )  # fmt: skip
    bearings: list[BearingPlace] = []
    missing: list[tuple[str, str]] = []
    seats = [(h, side) for side in PLATES for h in holes[side]]
    seats += [(c.hole, c.name) for c in cocks]
    for h, where in seats:
        if h.role not in ("bush", "bearing"):
            continue
        stock = pivot_stock(design, h.what, layout.outside(h.what))
        assert stock is not None and stock.width is not None
        if where == "back":
            z0 = back - t
        elif where == "front":
            z0 = front + t - stock.width
        else:
            cock = next(c for c in cocks if c.name == where)
            mid = (cock.bar_z0 + cock.bar_z1) / 2
            z0 = mid - stock.width / 2
        label = f"{where} plate" if where in PLATES else where
        bearings.append(
            BearingPlace(
                _free(f"{h.what}_{where}_{stock.kind}", taken), stock, h.what, h.x,
                h.y, round(z0, 6), f"{h.what} in the {label}",
            )
        )  # fmt: skip
    for a in design.arbors:
        if a.pivot != "hole" and layout.position(a.name) is not None:
            if pivot_stock(design, a.name, layout.outside(a.name)) is None:
                missing.append((a.name, a.pivot))
    return screws, bearings, missing, short


def _cock_height(c: Cock) -> float:
    return (c.bar_z1 - c.bar_z0) + (c.foot_z1 - c.foot_z0)


def _cock_screw_depth(c: Cock, limits: FrameLimits) -> float:
    """Depth (mm) of a cock's tapped holes: through it, or the pillars' depth if less."""
    return min(_cock_height(c), limits.pillar_hole_depth)
