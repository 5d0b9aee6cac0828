"""Axial stacking: each arbor's and sleeve's z-span, wheel seats, collars and pivots (mm).

Heights grow towards the front; a wheel occupies ``height`` to ``height + face_width +
hub_length`` (the hub stands on the front face). The rules:

- A plate-mounted arbor runs through both plates (outer face to outer face), pivoting
  in each. Two plate-mounted axes closer than their radii (the offset axes of a
  pin-and-slot coupling) cannot both do so: the one whose wheels lie further back runs
  from the back plate to its last wheel, the other from its first wheel to the front
  plate, each held by one plate. The two axes of a pin-and-slot coupling are always
  split so, whatever their offset. An arbor whose way to one plate is barred by a
  wheel (or hub) of another axis fixed in the frame, lying across its axis between its
  own wheels and that plate, runs to the other plate only. (The frame then gives each
  such arbor a cock: :mod:`wheelgen.frame.cocks`.)
- A carried arbor spans its wheels and the carrier wheel, in which it turns.
- A sleeve spans its own wheel seats and everything around it: an outer tube rides on
  the inner one, so inner tubes are longer and every seat must lie outside the tubes
  around its member. A seat that an outer tube would cover is a *hidden seat*.
- A sleeve that has another around it carries a collar just behind that tube's back
  end (:data:`COLLAR_LENGTH` long, as wide as that tube), a shoulder for it to run
  against, unless one of its own wheel seats ends there already.
- A fixed sleeve is held by the frame: it runs on through the nearer plate (the other
  one if the nearer would cover a seat), so that plate holds it and the arbor inside
  turns in its bore there.
- A member that carries a hand, a knob or a crank reaches as far in front of the front
  plate (or behind the back plate) as :mod:`wheelgen.layout.front` says, and every
  member inside it at least as far; a tube that so passes through a plate lists it in
  ``plates``. A carried arbor cannot reach out, nor an arbor held by the other plate
  only: such members are listed in ``unreachable`` and keep their length.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..design.model import Design
from ..design.model import Seat as SeatShape
from ..kinematics.rates import axis_root
from .front import DisplayLevels, display_levels
from .placement import nominal_tip_radius, tooth_spec
from .proximity import overlapping_pairs
from .sleeves import SleeveSize, coaxial_groups, member_outside

__all__ = [
    "COLLAR_LENGTH",
    "HiddenSeat",
    "MemberSpan",
    "Seat",
    "Stacking",
    "stack_axes",
    "wheel_extent",
]

#: mm, length of a thrust collar (common practice, no source).
COLLAR_LENGTH = 1.0

_EPS = 1e-9


@dataclass(frozen=True, slots=True)
class Seat:
    """Where one wheel sits on its member: z from and to (mm, absolute), and its shape."""

    wheel: str
    z0: float
    z1: float
    shape: SeatShape


@dataclass(frozen=True, slots=True)
class MemberSpan:
    """One arbor or sleeve along its axis; every z is absolute (mm).

    ``pivots`` are ``(z0, z1, what)``: where it runs or is held ("back plate",
    "front plate", "bore of stud", "wheel hour_wheel"). ``plates`` names the plates it
    passes through ("back", "front").
    """

    name: str
    kind: str  # "arbor" | "carried" | "sleeve"
    z0: float
    z1: float
    seats: tuple[Seat, ...] = ()
    collars: tuple[tuple[float, float, float], ...] = ()  # (z0, z1, diameter)
    pivots: tuple[tuple[float, float, str], ...] = ()
    plates: tuple[str, ...] = ()

    @property
    def length(self) -> float:
        return self.z1 - self.z0


@dataclass(frozen=True, slots=True)
class HiddenSeat:
    """Wheel ``wheel`` on ``member`` would sit under tube ``tube`` for ``overlap`` mm.

    ``for_display``: only because the tube is lengthened through a plate to carry a
    hand, knob or crank (it would be clear otherwise).
    """

    wheel: str
    member: str
    tube: str
    overlap: float
    for_display: bool = False


@dataclass(frozen=True, slots=True)
class Stacking:
    """Spans of every member and what does not fit.

    ``hidden`` are wheel seats under a tube; ``covered`` the seats of hands, knobs and
    cranks under a tube (``HiddenSeat.wheel`` then names the item's role);
    ``unreachable`` the members whose item cannot be brought out (they keep their
    length); ``levels`` the display's axial stack they were lengthened by.
    """

    spans: dict[str, MemberSpan]
    hidden: tuple[HiddenSeat, ...]
    one_plate: tuple[
        tuple[str, str, float], ...
    ]  # (arbor, its close neighbour or the wheel in its way, distance)
    # (arbor, plate it cannot reach, wheel in its way, how far it covers the arbor, mm)
    barred: tuple[tuple[str, str, str, float], ...] = ()
    covered: tuple[HiddenSeat, ...] = ()
    unreachable: tuple[str, ...] = ()
    levels: DisplayLevels | None = None


def wheel_extent(design: Design, name: str) -> tuple[float, float]:
    """Axial extent of a wheel with its hub, in mm."""
    w = design.wheel(name)
    return w.height, w.height + w.face_width + max(w.hub_length, 0.0)


def _seats(design: Design, member: str) -> list[Seat]:
    return [
        Seat(w.name, *wheel_extent(design, w.name), w.seat)
        for w in design.wheels_on(member)
    ]


def _hidden(seats: list[Seat], z0: float, z1: float) -> float:
    return sum(max(0.0, min(s.z1, z1) - max(s.z0, z0)) for s in seats)


def stack_axes(
    design: Design,
    sizes: dict[str, SleeveSize],
    positions: dict[str, tuple[float, float]],
) -> Stacking:
    """Spans, seats, collars and pivots of every member; hidden seats.

    ``sizes`` from :func:`~wheelgen.layout.sleeves.size_sleeves`, ``positions`` of the
    axis roots from :func:`~wheelgen.layout.placement.place_axes` (mm).
    """
    frame = design.frame
    groups = coaxial_groups(design)
    children: dict[str, list[str]] = {}
    for a in design.arbors:
        if a.around is not None:
            children.setdefault(a.around, []).append(a.name)
    seats = {a.name: _seats(design, a.name) for a in design.arbors}
    plate_z: dict[str, tuple[float, float]] = {}
    if frame is not None:
        back, front = frame.plates
        plate_z = {
            "back": (back - frame.thickness, back),
            "front": (front, front + frame.thickness),
        }

    spans: dict[str, MemberSpan] = {}
    reach_front: dict[str, float] = {}
    reach_back: dict[str, float] = {}

    def build(name: str) -> MemberSpan:
        # outer tubes first: a member's span covers every tube around it
        for child in children.get(name, []):
            build(child)
        arbor = design.arbor(name)
        own = seats[name]
        lo = [s.z0 for s in own] + [spans[c].z0 for c in children.get(name, [])]
        hi = [s.z1 for s in own] + [spans[c].z1 for c in children.get(name, [])]
        collars: list[tuple[float, float, float]] = []
        if arbor.around is not None:
            for c in children.get(name, []):
                top = spans[c].z0
                start = top - COLLAR_LENGTH
                ends = [s.z1 for s in own if s.z1 > start - _EPS and s.z0 < top]
                if ends:
                    start = max(ends)
                if top - start > _EPS:
                    collars.append((start, top, member_outside(design, sizes, c)))
                    lo.append(start)
        if name in reach_front:
            hi.append(reach_front[name])
        if name in reach_back:
            lo.append(reach_back[name])
        z0, z1 = (min(lo), max(hi)) if lo else (0.0, 0.0)
        plates: tuple[str, ...] = ()
        pivots: list[tuple[float, float, str]] = []
        if arbor.around is not None and not arbor.fixed and plate_z:
            # a tube lengthened through a plate to carry a hand, knob or crank
            plates = tuple(
                p
                for p, (pz0, pz1) in plate_z.items()
                if z0 < pz1 - _EPS and z1 > pz0 + _EPS
            )
        if arbor.around is not None and arbor.fixed and plate_z:
            inner_seats = [s for m in design.inner_members(name) for s in seats[m]]
            options = []
            for plate, (pz0, pz1) in plate_z.items():
                n0, n1 = min(z0, pz0), max(z1, pz1)
                options.append(
                    (
                        _hidden(inner_seats, n0, n1),
                        min(abs(z0 - pz1), abs(pz0 - z1)),
                        plate,
                        n0,
                        n1,
                    )
                )
            _, _, plate, z0, z1 = min(options)
            plates = (plate,)
            pivots.append((*plate_z[plate], f"{plate} plate"))
        span = MemberSpan(
            name,
            "sleeve"
            if arbor.around is not None
            else ("carried" if arbor.carrier else "arbor"),
            z0,
            z1,
            tuple(sorted(own, key=lambda s: s.z0)),
            tuple(collars),
            tuple(pivots),
            plates,
        )
        spans[name] = span
        return span

    for root in groups:
        build(root)

    # plate-mounted and carried arbors (axis roots)
    one_plate: list[tuple[str, str, float]] = []
    radius = {
        root: max(member_outside(design, sizes, m) for m in members) / 2
        for root, members in groups.items()
    }
    mounted = [r for r in groups if design.arbor(r).carrier is None and r in positions]
    # The two axes of a pin-and-slot coupling are always split, whatever their offset:
    # the pin wheel reaches across the slot wheel's axis (its radius is more than the
    # pin radius, which is more than the offset), so a shaft running plate to plate on
    # either axis would pass through the other wheel.
    coupled = {
        frozenset(
            (
                axis_root(design, design.wheel(p.pin).arbor),
                axis_root(design, design.wheel(p.slot).arbor),
            )
        )
        for p in design.pinslots
    }
    split: dict[str, str] = {}
    index = {name: k for k, name in enumerate(mounted)}
    centre = np.array([positions[a] for a in mounted], dtype=float).reshape(-1, 2)
    reach = np.array([radius[a] for a in mounted], dtype=float)[:, None]
    pairs = set(overlapping_pairs(centre - reach, centre + reach))
    for pair in coupled:
        ends = sorted(index[r] for r in pair if r in index)
        if len(ends) == 2:
            pairs.add((ends[0], ends[1]))
    for i, j in sorted(pairs):
        one, two = mounted[i], mounted[j]
        d = math.dist(positions[one], positions[two])
        if d < radius[one] + radius[two] or frozenset((one, two)) in coupled:
            za = _mean_z(spans[one])
            zb = _mean_z(spans[two])
            lower, upper = (one, two) if za <= zb else (two, one)
            split[lower], split[upper] = "back", "front"
            one_plate.extend([(lower, upper, d), (upper, lower, d)])
    barred: list[tuple[str, str, str, float]] = []
    for root, (plate, wheel, d, depth) in _barred(
        design, spans, positions, mounted, plate_z
    ):
        if root not in split:
            split[root] = "front" if plate == "back" else "back"
            one_plate.append((root, wheel, d))
            barred.append((root, plate, wheel, depth))

    # the display: members with a hand, knob or crank reach out through a plate, where
    # their axis can pass it; then every span is built again with those reaches
    levels = display_levels(design)
    unreachable: list[str] = []
    for item in levels.items:
        root = axis_root(design, item.member)
        can = (
            bool(plate_z)
            and root in positions
            and design.arbor(root).carrier is None
            and split.get(root, item.side) == item.side
        )
        if not can:
            if item.member not in unreachable:
                unreachable.append(item.member)
            continue
        if item.side == "front":
            reach_front[item.member] = max(
                reach_front.get(item.member, item.reach), item.reach
            )
        else:
            reach_back[item.member] = min(
                reach_back.get(item.member, item.reach), item.reach
            )
    inside = {
        (name, c, s.wheel)
        for name, kids in children.items()
        for c in kids
        for s in seats[name]
        if min(s.z1, spans[c].z1) - max(s.z0, spans[c].z0) > _EPS
    }
    if reach_front or reach_back:
        spans.clear()
        for root in groups:
            build(root)
    for root in groups:
        arbor = design.arbor(root)
        s = spans[root]
        z0, z1 = s.z0, s.z1
        pivots = []
        plates: tuple[str, ...] = ()
        if arbor.carrier is not None:
            carrier = design.wheel(arbor.carrier)
            c0, c1 = carrier.height, carrier.height + carrier.face_width
            z0, z1 = min(z0, c0), max(z1, c1)
            pivots.append((c0, c1, f"wheel {carrier.name}"))
        elif plate_z:
            use = (split[root],) if root in split else ("back", "front")
            for plate in use:
                pz0, pz1 = plate_z[plate]
                z0, z1 = min(z0, pz0), max(z1, pz1)
                holder = _holder(design, groups[root], spans, plate, pz0, pz1)
                what = f"{plate} plate" if holder == root else f"bore of {holder}"
                pivots.append((pz0, pz1, what))
            plates = use
        spans[root] = MemberSpan(
            root, s.kind, z0, z1, s.seats, s.collars, tuple(pivots), plates
        )

    hidden: list[HiddenSeat] = []
    covered: list[HiddenSeat] = []
    for name, kids in children.items():
        for c in kids:
            for seat in seats[name]:
                overlap = min(seat.z1, spans[c].z1) - max(seat.z0, spans[c].z0)
                if overlap > _EPS:
                    lengthened = (name, c, seat.wheel) not in inside
                    hidden.append(HiddenSeat(seat.wheel, name, c, overlap, lengthened))
            for item in levels.of(name):
                if name in unreachable:
                    continue
                z0, z1 = item.seat
                overlap = min(z1, spans[c].z1) - max(z0, spans[c].z0)
                if overlap > _EPS:
                    covered.append(HiddenSeat(item.role, name, c, overlap))
    return Stacking(
        spans,
        tuple(hidden),
        tuple(one_plate),
        tuple(barred),
        tuple(covered),
        tuple(unreachable),
        levels,
    )


def _barred(
    design: Design,
    spans: dict[str, MemberSpan],
    positions: dict[str, tuple[float, float]],
    mounted: list[str],
    plate_z: dict[str, tuple[float, float]],
) -> list[tuple[str, tuple[str, str, float, float]]]:
    """Mounted axes that one plate only is barred from: (axis, (that plate, the wheel in
    the way, distance between the axes, how far the wheel covers the arbor; mm)). An
    axis barred from both plates is left out (it runs to both, and the collision check
    reports it)."""
    if not plate_z:
        return []
    on_plates = set(mounted)
    discs = []  # (axis, z0, z1, radius, wheel) of wheels and hubs on fixed axes
    for w in design.wheels:
        root = axis_root(design, w.arbor)
        if root not in on_plates:
            continue
        top = w.height + w.face_width
        discs.append((root, w.height, top, nominal_tip_radius(tooth_spec(w)), w.name))
        if w.hub_diameter > 0 and w.hub_length > 0:
            discs.append((root, top, top + w.hub_length, w.hub_diameter / 2, w.name))
    seated = [a for a in mounted if spans[a].seats]
    # only a disc whose circle reaches the arbor can bar it: found through boxes, not
    # by comparing every arbor with every wheel
    near: dict[int, list[int]] = {}
    if seated and discs:
        centres = np.array(
            [positions[a] for a in seated] + [positions[d[0]] for d in discs], float
        )
        reach = np.array(
            [design.arbor(a).diameter / 2 for a in seated] + [d[3] for d in discs]
        )[:, None]
        count = len(seated)
        for i, j in overlapping_pairs(centres - reach, centres + reach):
            if i < count <= j:
                near.setdefault(i, []).append(j - count)
    out = []
    for k, a in enumerate(seated):
        span = spans[a]
        ways = {
            "back": (plate_z["back"][1], span.z0),
            "front": (span.z1, plate_z["front"][0]),
        }
        ra = design.arbor(a).diameter / 2
        barred: dict[str, tuple[str, float, float]] = {}
        for plate, (lo, hi) in ways.items():
            for b, z0, z1, r, wheel in (discs[n] for n in near.get(k, ())):
                d = math.dist(positions[a], positions[b])
                if b != a and z0 < hi - _EPS and z1 > lo + _EPS and d < r + ra - _EPS:
                    barred.setdefault(plate, (wheel, d, r + ra - d))
        if len(barred) == 1:
            ((plate, (wheel, d, depth)),) = barred.items()
            out.append((a, (plate, wheel, d, depth)))
    return out


def _mean_z(span: MemberSpan) -> float:
    if not span.seats:
        return (span.z0 + span.z1) / 2
    return sum((s.z0 + s.z1) / 2 for s in span.seats) / len(span.seats)


def _holder(
    design: Design,
    members: list[str],
    spans: dict[str, MemberSpan],
    plate: str,
    pz0: float,
    pz1: float,
) -> str:
    """The outermost member of a group that passes through a plate (the root if none)."""
    best = members[0]
    for m in members[1:]:
        if plate in spans[m].plates:
            best = m
    return best
