"""Arbors and tubes as made: pivots, seats, shoulders, collars and end shake (mm).

The layout gives each member (arbor or tube) its span and what sits on it; this module
works out how it is made and held along its axis. For every member:

1. **Lengths by role.** Where the member runs in a plate, a cock, a bush or bearing or
   the wheel that carries it, it is a *pivot*; where a plate holds a fixed tube, it is
   *held*; where a wheel is fixed, a *seat* (milled square or hex, or drilled for a
   cross pin, as the wheel's ``seat`` says); where a hand, knob or crank sits, an
   *item* seat; where a tube turns on it, *under*. Each fitted length is made to the
   process's ISO 286 shaft zone (:mod:`wheelgen.turning.limits`).
2. **A shoulder where wheels seat.** One length between two of its wheels (or between a
   wheel and a tube's collar or back end, or a wheel and a plate) is turned larger, a
   shoulder for each wheel beside it to be pushed against; a wheel behind it goes on
   from the back end, one in front of it from the front end. It is chosen where
   nothing passes over it (no tube, no bearing) and where it keeps
   :data:`~wheelgen.turning.limits.STOP_CLEARANCE` from every body of another axis,
   every frame part and the display; a gap between two wheels is preferred, then a
   gap beside a wheel and a tube, then beside a wheel and a plate. A wheel or a tube
   turning on the member never lies between two turned stops (it could not be put on).
3. **Collars.** Every other wheel is pushed against a neighbour within 0.2 mm, or
   stands flush with the member's end, or gets a collar (a ring fixed on the member)
   beside it, the gap filled when it is short. Then the end shake: an arbor must be
   stopped both ways against its bearings, the gaps at the two stops adding up to
   :func:`~wheelgen.turning.limits.end_shake`. A wheel, shoulder, collar or knob next
   to a bearing's face stops it; an arbor with tubes on it is stopped forward by the
   first tube's back end, and the tubes by their collars, up to the fixed stud or the
   plate that holds the outermost one. Where a stop is missing or too far off, a
   collar is fixed beside the bearing at half the end shake: inside the frame first,
   else outside a plate, lengthening the arbor. A stop that finds no room is left out
   and the member's notes say so.

Wheels and collars are fixed by the process's method (:func:`~wheelgen.turning.limits.
fixing`). The collars become parts of their own (:class:`~wheelgen.layout.part_kinds.
CollarPart`); the shoulders are turned on the member (its ``collars``).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace
from functools import lru_cache
from typing import cast

import numpy as np

from ..design.model import Design
from ..design.process_limits import wall_minimum
from ..design.units import lengths_of
from ..frame.keepout import Zone, disc_gap, train_zones, zones_between
from ..kinematics.rates import axis_root
from ..layout.part_kinds import (
    ArborPart,
    CollarPart,
    CrankPart,
    DialPart,
    HandPart,
    KnobPart,
    Part,
    Pose,
    SeatShape,
    SleevePart,
    TurnedSection,
)
from ..layout.sleeves import running_bore, seat_factor
from ..layout.train_layout import Layout, plan_layout
from .limits import (
    STOP_CLEARANCE,
    collar_length,
    end_shake,
    fixing,
    hole_zone,
    shaft_limits,
    shaft_zone,
    stock_diameter,
    stop_diameter,
)

__all__ = ["Stop", "TurnedMember", "turned_parts", "turned_members"]

_TOL = 1e-6
#: mm: a wheel this close to its neighbour is pushed against it, with no collar.
_TOUCH = 0.2
#: mm: the shortest collar worth making (a thinner gap is left to the neighbour).
_SHORTEST = 0.3


@dataclass(frozen=True, slots=True)
class Stop:
    """What keeps a wheel, or the member itself, in place along the axis.

    ``what`` is a wheel, a shoulder, a collar, a plate or a tube; ``gap`` the axial
    play left there (mm).
    """

    holds: str  # the wheel, or "forward" / "back" for the member itself
    what: str
    gap: float


@dataclass(frozen=True, slots=True)
class TurnedMember:
    """One arbor or tube as made (absolute heights, mm).

    ``sections`` are in the part's own frame, as on the part; ``shoulder`` the
    turned stop ``(z0, z1, diameter)`` or ``None``; ``collars`` the names of its
    collars; ``stops`` what holds each wheel and the member; ``notes`` what a maker
    must know (a stop that found no room, a wheel pushed against another).
    """

    name: str
    z0: float
    length: float
    sections: tuple[TurnedSection, ...]
    shoulder: tuple[float, float, float] | None
    collars: tuple[str, ...]
    stops: tuple[Stop, ...]
    end_shake: float | None
    notes: tuple[str, ...]


@dataclass
class _Span:
    z0: float
    z1: float
    kind: str  # seat, item, pivot, held, under, collar, shoulder, knob
    what: str
    diameter: float = 0.0
    shape: str = "round"
    zone: str = ""


@dataclass
class _Member:
    part: ArborPart | SleevePart
    root: str
    x: float
    y: float
    outside: float
    spans: list[_Span]
    carried: tuple[float, float, float] | None  # carrier centre x, y and radius


def turned_parts(design: Design, parts: Sequence[Part]) -> tuple[Part, ...]:
    """``parts`` with every arbor and tube as made, and their collars added after them.

    ``parts`` is the train and frame of :func:`wheelgen.parts.plan_parts` before this
    step; arbors may be lengthened for a collar outside a plate.
    """
    return _plan(design, tuple(parts))[0]


def turned_members(design: Design, parts: Sequence[Part]) -> dict[str, TurnedMember]:
    """How each arbor and tube of ``parts`` is made (see :func:`turned_parts`)."""
    return _plan(design, tuple(parts))[1]


@lru_cache(maxsize=8)
def _plan(
    design: Design, parts: tuple[Part, ...]
) -> tuple[tuple[Part, ...], dict[str, TurnedMember]]:
    try:
        layout = plan_layout(design)
    except ValueError:  # no layout: the checks say why; the parts stay as they are
        return parts, {}
    zones = _zones(design, layout, parts)
    taken = {p.name for p in parts} | {a.name for a in design.arbors}
    taken |= {w.name for w in design.wheels}
    out: list[Part] = []
    collars: list[Part] = []
    members: dict[str, TurnedMember] = {}
    for part in parts:
        if isinstance(part, (ArborPart, SleevePart)) and part.length > 0:
            m = _member(design, layout, parts, part)
            if m is not None:
                made, rings, info = _make(design, layout, m, zones, taken)
                out.append(made)
                collars.extend(rings)
                members[part.name] = info
                continue
        out.append(part)
    # collars right after the train's members, before the frame and the display
    last = max(
        (i for i, p in enumerate(out) if isinstance(p, (ArborPart, SleevePart))),
        default=len(out) - 1,
    )
    return tuple(out[: last + 1] + collars + out[last + 1 :]), members


def _zones(design: Design, layout: Layout, parts: tuple[Part, ...]) -> list[Zone]:
    """Everything a stop keeps clear of: the train, the frame's parts, the display."""
    zones = list(train_zones(layout))
    if design.frame is not None:
        from ..frame.plan import plan_frame

        plan = plan_frame(design)
        for c in plan.cocks:
            zones.extend(c.zones)
        r = plan.limits.pillar_diameter / 2
        back, front = design.frame.plates
        for p in plan.pillars:
            zones.append(Zone(f"pillar {p.name}", p.x, p.y, 0.0, r, back, front))
    for part in parts:
        pl = part.placement
        if isinstance(part, HandPart):
            r = max(part.length, part.tail, part.hub / 2)
            top = pl.z + part.thickness + part.collet_length
            zones.append(Zone(part.name, pl.x, pl.y, 0.0, r, pl.z, top, part.arbor))
        elif isinstance(part, DialPart):
            disc = pl.z + part.foot_length
            zones.append(
                Zone(part.name, pl.x, pl.y, 0.0, part.radius, disc,
                     disc + part.thickness)
            )  # fmt: skip
            for fx, fy in part.feet:
                zones.append(
                    Zone(f"foot of {part.name}", pl.x + fx, pl.y + fy, 0.0,
                         part.foot_diameter / 2, pl.z, disc)
                )  # fmt: skip
        elif isinstance(part, KnobPart):
            zones.append(
                Zone(part.name, pl.x, pl.y, 0.0, part.diameter / 2, pl.z,
                     pl.z + part.length, part.arbor)
            )  # fmt: skip
        elif isinstance(part, CrankPart):
            r = part.throw + max(part.arm, part.handle_diameter) / 2
            zones.append(
                Zone(part.name, pl.x, pl.y, 0.0, r, pl.z - part.handle_length,
                     pl.z + part.thickness + part.handle_length, part.arbor)
            )  # fmt: skip
    return zones


def _member(
    design: Design,
    layout: Layout,
    parts: tuple[Part, ...],
    part: ArborPart | SleevePart,
) -> _Member | None:
    name = part.name
    span = layout.stacking.spans.get(name)
    pos = layout.position(name)
    if span is None or pos is None:
        return None
    root = axis_root(design, name)
    outside = part.outside if isinstance(part, SleevePart) else part.diameter
    z0 = part.placement.z
    z1 = z0 + part.length
    proc = design.process
    spans: list[_Span] = []
    for s in span.seats:
        spans.append(_Span(s.z0, s.z1, "seat", s.wheel, outside, s.shape))
    for c0, c1, d in span.collars:
        spans.append(_Span(c0, c1, "collar", "", d))
    levels = layout.stacking.levels
    if levels is not None and name not in layout.stacking.unreachable:
        for item in levels.of(name):
            shape = "round" if item.shape == "collet" else item.shape
            what = _item_name(parts, name, item.role)
            kind = "knob" if item.role in ("knob", "crank") else "item"
            spans.append(_Span(item.seat[0], item.seat[1], kind, what, outside, shape))
    for child in design.arbors:
        if child.around == name and child.name in layout.stacking.spans:
            c = layout.stacking.spans[child.name]
            spans.append(_Span(c.z0, c.z1, "under", child.name, outside))
    arbor = design.arbor(name)
    plates = _plate_names(design)
    for p0, p1, what in span.pivots:
        if what.endswith(" plate"):
            side = what.split()[0]
            role = "held" if arbor.fixed else "pivot"
            where = plates.get(side, what)
            if role == "pivot" and arbor.pivot != "hole":
                where = f"{arbor.pivot} in {where}"
            spans.append(
                _Span(p0, p1, role, where, outside, zone=shaft_zone(
                    proc, bearing=role == "pivot" and arbor.pivot == "bearing"))
            )  # fmt: skip
        elif what.startswith("wheel "):
            spans.append(
                _Span(p0, p1, "pivot", what.split()[1], outside, zone=shaft_zone(proc))
            )
    if design.frame is not None and span.kind == "arbor":
        from ..frame.plan import plan_frame

        for cock in plan_frame(design).cocks:
            if cock.arbor == name:
                spans.append(
                    _Span(cock.bar_z0, cock.bar_z1, "pivot", cock.name, outside,
                          zone=shaft_zone(proc))
                )  # fmt: skip
    carried = None
    carrier = design.carrier_arbor(name)
    if carrier is not None:
        cx, cy = layout.position(carrier) or (0.0, 0.0)
        carried = (cx, cy, math.dist((cx, cy), pos))
    spans = [s for s in spans if s.z1 > z0 - _TOL and s.z0 < z1 + _TOL]
    return _Member(part, root, pos[0], pos[1], outside, spans, carried)


def _item_name(parts: tuple[Part, ...], member: str, role: str) -> str:
    for p in parts:
        if isinstance(p, (HandPart, KnobPart, CrankPart)) and p.arbor == member:
            if (role == "hand") == isinstance(p, HandPart):
                return p.name
    return role


def _plate_names(design: Design) -> dict[str, str]:
    if design.frame is None:
        return {}
    from ..frame.plan import plan_frame

    return {p.side: p.name for p in plan_frame(design).plates}


def _clear(
    design: Design,
    m: _Member,
    z0: float,
    z1: float,
    diameter: float,
    zones: list[Zone],
    holders: set[str],
) -> bool:
    """Does a stop ``diameter`` across from ``z0`` to ``z1`` keep clear of the rest?"""
    r = diameter / 2
    for zone in zones_between(zones, z0, z1, STOP_CLEARANCE):
        if zone.member is not None and _same_frame(design, m, zone.member):
            continue
        if zone.label in holders:
            continue  # the bearing it stands against (a carrier wheel, a cock)
        if m.carried is None:
            gap = float(disc_gap(np.array(m.x), np.array(m.y), r, zone))
        else:
            gap = _ring_gap(m.carried, r, zone)
        if gap < STOP_CLEARANCE - 1e-9:
            return False
    return True


def _same_frame(design: Design, m: _Member, member: str) -> bool:
    """Is ``member`` on ``m``'s axis, or carried round with it?"""
    try:
        root = axis_root(design, member)
    except KeyError:  # a display part: its arbor
        return False
    if root == m.root:
        return True
    return m.carried is not None and design.carrier_arbor(root) == design.carrier_arbor(
        m.root
    )


def _ring_gap(carried: tuple[float, float, float], r: float, zone: Zone) -> float:
    """Gap (mm) between the ring a carried stop sweeps and ``zone``; < 0: overlap."""
    cx, cy, reach = carried
    lo, hi = reach - r, reach + r
    if zone.to is not None:
        ts = [i / 20 for i in range(21)]
        ds = [
            math.dist((cx, cy), (zone.x + t * (zone.to[0] - zone.x),
                                 zone.y + t * (zone.to[1] - zone.y)))
            for t in ts
        ]  # fmt: skip
        near, far = min(ds) - zone.outer, max(ds) + zone.outer
        return max(near - hi, lo - far)
    d = math.dist((cx, cy), (zone.x, zone.y))
    if zone.inner > 0 and d < _TOL:
        return max(zone.inner - hi, lo - zone.outer)
    return max(d - zone.outer - hi, lo - (d + zone.outer))


def _free(name: str, taken: set[str]) -> str:
    out, k = name, 1
    while out in taken:
        k += 1
        out = f"{name}_{k}"
    taken.add(out)
    return out


def _make(
    design: Design,
    layout: Layout,
    m: _Member,
    zones: list[Zone],
    taken: set[str],
) -> tuple[ArborPart | SleevePart, list[CollarPart], TurnedMember]:
    proc = design.process
    part = m.part
    z0, z1 = part.placement.z, part.placement.z + part.length
    d = m.outside
    big = stop_diameter(proc, d)
    lc = collar_length(d)
    holders = {
        f"{kind} {s.what.split()[-1]}"
        for s in m.spans
        if s.kind in ("pivot", "held")
        for kind in ("wheel", "hub of wheel", "cock")
    }
    spans = sorted(m.spans, key=lambda s: (s.z0, s.z1))
    notes: list[str] = []
    stops: list[Stop] = []
    seats = [s for s in spans if s.kind == "seat"]
    turned = [s for s in spans if s.kind == "collar"]  # a tube's thrust collars
    unders = [s for s in spans if s.kind == "under"]  # the tubes that turn on it

    def free(a: float, b: float) -> bool:
        if b - a < _TOL:
            return False
        return all(s.z1 <= a + _TOL or s.z0 >= b - _TOL for s in spans)

    def fits(a: float, b: float) -> bool:
        """Room for a stop from ``a`` to ``b`` that the member can still be put in
        with: clear of the rest, and not between two of its bearings unless they are
        the two plates (which go on from either side)."""
        if not _clear(design, m, a, b, big, zones, holders):
            return False
        below = [s for s in spans if s.kind == "pivot" and s.z1 <= a + _TOL]
        above = [s for s in spans if s.kind == "pivot" and s.z0 >= b - _TOL]
        if below and above:
            lo = max(below, key=lambda s: s.z1)
            hi = min(above, key=lambda s: s.z0)
            return lo.what.endswith("back_plate") and hi.what.endswith("front_plate")
        return True

    # 2. the shoulder: one free gap beside a wheel, chosen by what lies on its far side
    shoulder: tuple[float, float, float] | None = None
    best: tuple[int, float, float, float] | None = None
    for g0, g1, below, above in _gaps(spans, z0, z1):
        kinds = {below.kind if below else "", above.kind if above else ""}
        if "seat" not in kinds:
            continue
        a, b = g0, g1
        shake = end_shake(proc) / 2
        if below is not None and below.kind in ("pivot", "held"):
            a = g0 + (0.0 if below.kind == "held" else shake)
        if above is not None and above.kind in ("pivot", "held"):
            b = g1 - (0.0 if above.kind == "held" else shake)
        other = (kinds - {"seat"}) or {"seat"}
        rank = (
            0 if other == {"under"}
            else 1 if other & {"seat", "collar"}
            else 2 if other & {"pivot", "held"}
            else 9
        )  # fmt: skip
        if rank == 9 or b - a < _SHORTEST or not fits(a, b):
            continue
        if _traps(seats + unders, turned, a, b):
            continue
        dia = big
        for t in turned:
            # beside a tube's thrust collar: as wide as the collar, when that leaves
            # the wheel a step of at least the process's thinnest wall
            if abs(t.z0 - b) < _TOL or abs(t.z1 - a) < _TOL:
                if t.diameter >= d + 2 * wall_minimum(proc) - _TOL:
                    dia = t.diameter
        if best is None or (rank, b - a) < (best[0], best[2] - best[1]):
            best = (rank, a, b, dia)
    if best is not None:
        shoulder = (best[1], best[2], best[3])
        spans.append(_Span(best[1], best[2], "shoulder", "", best[3]))
        spans.sort(key=lambda s: (s.z0, s.z1))

    # 3. a stop beside every wheel, then the end shake
    rings: list[tuple[float, float, str]] = []  # (z0, z1, what it stops)

    def add_ring(a: float, b: float, why: str) -> None:
        rings.append((a, b, why))
        spans.append(_Span(a, b, "ring", why, big))
        spans.sort(key=lambda s: (s.z0, s.z1))

    def spans_at(a: float, b: float) -> _Span:
        return next(s for s in spans if s.kind == "ring" and s.z0 == a and s.z1 == b)

    wheel_stops: list[tuple[str, _Span | None, float]] = []
    for w in seats:
        found = _neighbour_stop(w, spans, z0, z1)
        if found is not None:
            wheel_stops.append((w.what, *found))
            if found[0] is not None and found[0].kind == "seat":
                notes.append(f"{w.what} is pushed against wheel {found[0].what}")
            continue
        placed = False
        for side in _sides(w, shoulder):
            ra, rb = _ring_beside(w, side, spans, lc, z0, z1)
            if ra is not None and rb is not None and free(ra, rb) and fits(ra, rb):
                add_ring(ra, rb, w.what)
                wheel_stops.append((w.what, spans_at(ra, rb), 0.0))
                placed = True
                break
        if not placed:
            wheel_stops.append((w.what, None, math.inf))
            notes.append(
                f"{w.what}: no room for a stop beside it; fix it where the drawing"
                " says, measured from the member's back end"
            )

    # a stop just behind each tube's back end, for the tube to run against
    for t in [s for s in spans if s.kind == "under"]:
        if any(
            s.kind in ("seat", "collar", "shoulder", "ring") and abs(s.z1 - t.z0) < _TOL
            for s in spans
        ):
            continue
        prev = max((s.z1 for s in spans if s.z1 <= t.z0 + _TOL and s is not t),
                   default=z0)  # fmt: skip
        a = prev if t.z0 - prev <= 2 * lc else t.z0 - lc
        if t.z0 - a >= _SHORTEST and free(a, t.z0) and fits(a, t.z0):
            add_ring(a, t.z0, f"tube {t.what}")
        else:
            notes.append(f"no room for a stop behind the back end of tube {t.what}")

    shake_total: float | None = None
    if isinstance(part, ArborPart):
        shake_total, z0, z1 = _end_shake(
            design, m, spans, z0, z1, lc, add_ring, free, fits, stops, notes
        )

    collar_parts: list[CollarPart] = []
    ring_bore = running_bore(proc, d)
    names: dict[tuple[float, float], str] = {}
    for a, b, _why in sorted(rings):
        name = _free(f"collar_{part.name}", taken)
        names[(a, b)] = name
        collar_parts.append(
            CollarPart(
                name=name,
                member=part.name,
                inside=ring_bore.diameter,
                outside=big,
                length=round(b - a, 6),
                fixing=fixing(proc),
                placement=Pose(m.x, m.y, round(a, 6), 0.0),
                bore_zone=hole_zone(proc),
                bore_low=ring_bore.low,
                bore_high=ring_bore.high,
            )
        )

    # sections and the made part
    sections = _sections(design, m, spans, z0, z1, names)
    largest = max([d] + [s.diameter for s in spans if s.kind in ("collar", "shoulder")])
    new_collars = tuple(
        (round(s.z0 - z0, 6), round(s.z1 - z0, 6), s.diameter)
        for s in spans
        if s.kind in ("collar", "shoulder")
    )
    placement = replace(part.placement, z=round(z0, 6))
    shift = part.placement.z - z0
    seats_rel: tuple[tuple[float, float, SeatShape], ...] = tuple(
        (round(a + shift, 6), round(b + shift, 6), shape) for a, b, shape in part.seats
    )
    if isinstance(part, ArborPart):
        wheel_seats: tuple[tuple[float, float, SeatShape], ...] = tuple(
            (round(s.z0 - z0, 6), round(s.z1 - z0, 6), cast(SeatShape, s.shape))
            for s in seats
            if s.shape != "round"
        )
        made: ArborPart | SleevePart = replace(
            part,
            length=round(z1 - z0, 6),
            placement=placement,
            seats=tuple(sorted(seats_rel + wheel_seats)),
            collars=new_collars,
            sections=sections,
            stock=0.0
            if proc.kind == "print"
            else stock_diameter(largest, design.units),
        )
    else:
        size = layout.sizes.get(part.name)
        bore = size.bore if size is not None else running_bore(proc, part.inside)
        tube = size is not None and size.stock is not None and largest <= d + _TOL
        made = replace(
            part,
            length=round(z1 - z0, 6),
            placement=placement,
            seats=seats_rel,
            collars=new_collars,
            sections=sections,
            bore_zone=bore.zone,
            bore_low=bore.low,
            bore_high=bore.high,
            stock=0.0
            if proc.kind == "print" or tube
            else stock_diameter(largest, design.units),
        )

    def named(s: _Span | None) -> str:
        if s is None:
            return "nothing"
        if s.kind == "ring":
            return names[(s.z0, s.z1)]
        if s.kind == "seat":
            return f"wheel {s.what}"
        if s.kind == "collar":
            return "thrust collar"
        return s.kind

    for wheel, span, gap in wheel_stops:
        if span is None and gap == 0.0:
            what = "flush with the end"
        elif span is None:
            what = "its place on the drawing"
            notes.append(
                f"{wheel}: no room for a stop beside it; fix it where the drawing"
                " says, measured from the back end"
            )
        else:
            what = named(span)
        stops.insert(0, Stop(wheel, what, round(gap, 6)))
    stops = [
        replace(s, gap=round(s.gap, 6)) if math.isfinite(s.gap) else s for s in stops
    ]
    stops = [_rename(s, names) for s in stops]
    made = replace(made, notes=_part_notes(design, seats, stops, shake_total, notes))
    info = TurnedMember(
        part.name,
        round(z0, 6),
        round(z1 - z0, 6),
        sections,
        shoulder,
        tuple(c.name for c in collar_parts),
        tuple(stops),
        shake_total,
        tuple(notes),
    )
    return made, collar_parts, info


def _part_notes(
    design: Design,
    seats: list[_Span],
    stops: list[Stop],
    shake: float | None,
    notes: list[str],
) -> tuple[str, ...]:
    """What the maker must know, in words: each wheel's fixing and stop, the end shake."""
    out = []
    u = lengths_of(design)
    shapes = {w.what: w.shape for w in seats}
    by = {s.holds: s for s in stops}
    for wheel, shape in shapes.items():
        stop = by.get(wheel)
        where = ""
        if stop is not None and math.isfinite(stop.gap):
            where = (
                ", flush with the end"
                if stop.what == "flush with the end"
                else f", pushed against {stop.what}"
            )
        out.append(f"{wheel}: fixed with {fixing(design.process, shape)}{where}")
    if shake is not None:
        fwd, back = by.get("forward"), by.get("back")
        parts = [
            f"{s.what} ({u.fixed(s.gap, 2)})" for s in (fwd, back) if s is not None
        ]
        out.append(f"end shake {u.fixed(shake, 2)}: " + "; ".join(parts))
    return tuple(out + notes)


def _rename(stop: Stop, names: dict[tuple[float, float], str]) -> Stop:
    """A stop that names a collar by its place, ``collar@z0:z1``, gets the collar's
    name."""
    if not stop.what.startswith("collar@"):
        return stop
    place, _, rest = stop.what[len("collar@") :].partition(" ")
    a, b = (float(v) for v in place.split(":"))
    return replace(stop, what=f"{names[(a, b)]} {rest}".strip())


def _gaps(
    spans: list[_Span], z0: float, z1: float
) -> list[tuple[float, float, _Span | None, _Span | None]]:
    """The free gaps along the member: (from, to, what lies below, what lies above)."""
    out: list[tuple[float, float, _Span | None, _Span | None]] = []
    cursor: float = z0
    below: _Span | None = None
    for s in sorted(spans, key=lambda s: (s.z0, s.z1)):
        if s.z0 > cursor + _TOL:
            out.append((cursor, s.z0, below, s))
        if s.z1 >= cursor - _TOL:
            cursor, below = max(cursor, s.z1), s
    if z1 > cursor + _TOL:
        out.append((cursor, z1, below, None))
    return out


def _traps(seats: list[_Span], turned: list[_Span], a: float, b: float) -> bool:
    """Would a shoulder from ``a`` to ``b`` leave a wheel (or a tube turning on the
    member) between two turned stops, where it could not be put on?"""
    fixed = [(s.z0, s.z1) for s in turned] + [(a, b)]
    for w in seats:
        below = any(f1 <= w.z0 + _TOL for _, f1 in fixed)
        above = any(f0 >= w.z1 - _TOL for f0, _ in fixed)
        if below and above:
            return True
    return False


def _neighbour_stop(
    w: _Span, spans: list[_Span], z0: float, z1: float
) -> tuple[_Span | None, float] | None:
    """A stop already beside wheel seat ``w``: (the span, gap), ``(None, 0)`` when the
    wheel stands flush with the member's end, or ``None``."""
    found: list[tuple[int, float, _Span]] = []
    order = {"shoulder": 0, "collar": 1, "ring": 2, "seat": 3}
    for s in spans:
        if s is w or s.kind not in order:
            continue
        if s.z1 > w.z0 + _TOL and s.z0 < w.z1 - _TOL:
            continue
        gap = w.z0 - s.z1 if s.z1 <= w.z0 + _TOL else s.z0 - w.z1
        if gap <= _TOUCH + _TOL:
            found.append((order[s.kind], max(gap, 0.0), s))
    if found:
        _, gap, s = min(found, key=lambda f: (f[0], f[1]))
        return s, gap
    if abs(w.z0 - z0) < _TOL or abs(w.z1 - z1) < _TOL:
        return None, 0.0
    return None


def _sides(w: _Span, shoulder: tuple[float, float, float] | None) -> list[str]:
    """Sides of wheel ``w`` to try a collar on: towards the shoulder first."""
    if shoulder is not None and shoulder[0] >= w.z1 - _TOL:
        return ["above", "below"]
    return ["below", "above"]


def _ring_beside(
    w: _Span, side: str, spans: list[_Span], lc: float, z0: float, z1: float
) -> tuple[float | None, float | None]:
    """A collar beside wheel ``w`` on ``side``: filling a short gap, else ``lc`` long."""
    if side == "above":
        nxt = min(
            (s.z0 for s in spans if s.z0 >= w.z1 - _TOL and s is not w), default=z1
        )
        gap = nxt - w.z1
        if gap < _SHORTEST:
            return None, None
        return w.z1, (nxt if gap <= 2 * lc else w.z1 + lc)
    prev = max((s.z1 for s in spans if s.z1 <= w.z0 + _TOL and s is not w), default=z0)
    gap = w.z0 - prev
    if gap < _SHORTEST:
        return None, None
    return (prev if gap <= 2 * lc else w.z0 - lc), w.z0


def _end_shake(
    design: Design,
    m: _Member,
    spans: list[_Span],
    z0: float,
    z1: float,
    lc: float,
    add_ring: Callable[[float, float, str], None],
    free: Callable[[float, float], bool],
    fits: Callable[[float, float], bool],
    stops: list[Stop],
    notes: list[str],
) -> tuple[float | None, float, float]:
    """Stop the arbor both ways against its bearings; returns (end shake, z0, z1)."""
    bearings = [s for s in spans if s.kind == "pivot"]
    if not bearings:
        return None, z0, z1
    half = end_shake(design.process) / 2
    stoppers = ("seat", "collar", "shoulder", "ring", "knob")

    def forward() -> tuple[float, str]:
        # the nearest stop behind a bearing's back face, or a tube's back end
        best = (math.inf, "")
        for b in bearings:
            below = [s for s in spans if s.kind in stoppers and s.z1 <= b.z0 + _TOL]
            if below:
                s = max(below, key=lambda s: s.z1)
                if not any(t.z0 >= s.z1 - _TOL and t.z1 <= b.z0 + _TOL and t.kind in
                           ("pivot",) for t in spans if t is not b):  # fmt: skip
                    best = min(best, (b.z0 - s.z1, f"{_label(s)} against {b.what}"))
        for t in spans:
            if t.kind == "under":
                below = [s for s in spans if s.kind in stoppers and s.z1 <= t.z0 + _TOL]
                if below:
                    s = max(below, key=lambda s: s.z1)
                    if t.z0 - s.z1 <= half + _TOL:
                        best = min(
                            best, (t.z0 - s.z1, f"{_label(s)} against tube {t.what}")
                        )
        return best

    def backward() -> tuple[float, str]:
        best = (math.inf, "")
        for b in bearings:
            above = [s for s in spans if s.kind in stoppers and s.z0 >= b.z1 - _TOL]
            if above:
                s = min(above, key=lambda s: s.z0)
                best = min(best, (s.z0 - b.z1, f"{_label(s)} against {b.what}"))
        return best

    for direction in ("forward", "back"):
        near: float
        gap, _ = forward() if direction == "forward" else backward()
        if gap <= half + 0.05:
            continue
        placed = False
        order = sorted(bearings, key=lambda b: b.z0, reverse=direction == "back")
        options: list[tuple[float, float, bool]] = []  # (a, b, outside)
        for bearing in order:
            if direction == "forward":
                near = max(
                    (
                        s.z1
                        for s in spans
                        if s.z1 <= bearing.z0 + _TOL and s is not bearing
                    ),
                    default=-math.inf,
                )
                top = bearing.z0 - half
                if near > -math.inf and top - near <= 2 * lc:
                    options.append((near, top, False))
                else:
                    options.append((top - lc, top, near == -math.inf))
            else:
                near = min(
                    (
                        s.z0
                        for s in spans
                        if s.z0 >= bearing.z1 - _TOL and s is not bearing
                    ),
                    default=math.inf,
                )
                bottom = bearing.z1 + half
                if near < math.inf and near - bottom <= 2 * lc:
                    options.append((bottom, near, False))
                else:
                    options.append((bottom, bottom + lc, near == math.inf))
        # inside the member's span first, then beyond a plate (the arbor lengthened)
        for a, b, _beyond in sorted(options, key=lambda o: o[2]):
            if b - a < _SHORTEST:
                continue
            inside = a >= z0 - _TOL and b <= z1 + _TOL
            if inside and not free(a, b):
                continue
            if not inside and any(t.z1 > a + _TOL and t.z0 < b - _TOL for t in spans):
                continue
            if not fits(a, b):
                continue
            add_ring(a, b, direction)
            z0, z1 = min(z0, a), max(z1, b)
            placed = True
            break
        if not placed:
            notes.append(
                f"no room for a collar to stop {m.part.name} going {direction}:"
                f" its end shake that way is {lengths_of(design).fixed(gap, 2)}"
                if gap < math.inf
                else f"nothing stops {m.part.name} going {direction} along its axis"
            )
    fg, fwhat = forward()
    bg, bwhat = backward()
    stops.append(Stop("forward", fwhat or "nothing", fg))
    stops.append(Stop("back", bwhat or "nothing", bg))
    total = round(fg + bg, 6) if math.isfinite(fg + bg) else None
    return total, z0, z1


def _label(s: _Span) -> str:
    if s.kind == "seat":
        return f"wheel {s.what}"
    if s.kind == "knob":
        return s.what
    if s.kind == "ring":
        return f"collar@{s.z0!r}:{s.z1!r}"
    if s.kind == "collar":
        return "thrust collar"
    return s.kind


_ROLE = {"knob": "item", "ring": "collar seat"}


def _sections(
    design: Design,
    m: _Member,
    spans: list[_Span],
    z0: float,
    z1: float,
    names: dict[tuple[float, float], str],
) -> tuple[TurnedSection, ...]:
    """The member's outside, length by length, in its own frame (from ``z0``)."""
    proc = design.process
    cuts = {z0, z1}
    for t in spans:
        cuts.update((min(max(t.z0, z0), z1), min(max(t.z1, z0), z1)))
    levels = sorted(cuts)
    rank = {"item": 0, "knob": 0, "seat": 1, "held": 2, "pivot": 2, "under": 3,
            "ring": 3, "collar": 4, "shoulder": 4}  # fmt: skip
    out: list[TurnedSection] = []
    d = m.outside
    for a, b in zip(levels, levels[1:]):
        if b - a < 1e-6:
            continue
        mid = (a + b) / 2
        here = [t for t in spans if t.kind in rank and t.z0 <= mid <= t.z1]
        s: _Span | None = min(here, key=lambda t: rank[t.kind]) if here else None
        role = "plain" if s is None else _ROLE.get(s.kind, s.kind)
        dia = s.diameter if s is not None and s.kind in ("collar", "shoulder") else d
        shape = s.shape if s is not None else "round"
        across = 0.0
        zone = ""
        fitted = ("pivot", "held", "seat", "under", "item", "collar seat")
        if role in fitted and proc.kind != "print":
            zone = s.zone if s is not None and s.zone else shaft_zone(proc)
        size = dia
        if shape in ("square", "hex", "flat"):
            across = round(d * seat_factor(shape), 6)
            size = across
        low = high = round(size, 6)
        if zone:
            low, high = shaft_limits(size, zone)
        what = s.what if s is not None else ""
        if role == "collar seat":
            what = names.get((s.z0, s.z1), "") if s is not None else ""
        if role == "shoulder":
            what = "stop for the wheels beside it"
        elif role == "collar":
            what = "thrust collar for the tube in front"
        out.append(
            TurnedSection(
                round(a - z0, 6), round(b - z0, 6), round(dia, 6), role, what,
                shape, across, zone, low, high,
            )
        )  # fmt: skip
    return _merged(out)


def _merged(sections: list[TurnedSection]) -> tuple[TurnedSection, ...]:
    out: list[TurnedSection] = []
    for s in sections:
        if out and replace(out[-1], z0=0.0, z1=0.0) == replace(s, z0=0.0, z1=0.0):
            out[-1] = replace(out[-1], z1=s.z1)
        else:
            out.append(s)
    return tuple(out)
