"""The order of assembly, worked out from the stacking.

Every part is seen along its axis as a few rings (a length of it at one height, from
its bore to its outside; a plate is a sheet with holes). A part or a group of parts is
fitted by sliding it along its axis from the back or from the front; that is possible
when on the way it never meets a part already in place: on the same axis, rings must
not overlap across (a wheel's bore passes over an arbor's pivots, but not over a
collar); on another axis, their circles must not overlap (two wheels in mesh, or a
pin and its slot, slide into each other and are let pass); a sheet lets a ring through
only where it has a hole at least as large.

The plan follows the stacking, as a clockmaker assembles a movement with the back
plate lying on the bench:

1. the back plate, its bushes or bearings, the pillars and the cocks screwed to it;
2. every arbor as a unit, made up off the movement (its wheels and collars fixed on it
   in an order that never passes a part over a larger one, the arbors that its wheels
   carry put through them), then put in; a part that would stop it going in (a collar
   behind the plate it runs in) is fitted once it is in place; tubes slide onto the
   member inside them;
3. the front plate, made up with whatever it alone holds (a cock hanging from it and
   the arbor running in that cock), lowered over the pivots onto the pillars, and
   screwed down;
4. the dials, then the hands from the back one forward, and the knob or crank.

:func:`assembly_steps` gives the steps, :func:`assembly_csv` the file
``assembly.csv`` (columns ``step,part,action,onto,note``) and :func:`assembly_writer`
writes it in a build. Where no clear way is found the step says so in its note. A
wheel or collar fixed on its member says how far its back face stands from the
member's back end, and a member put in its end shake, in the design's units.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path
from typing import Sequence

from ..design.model import Design
from ..design.units import lengths_of
from ..findings import Finding
from ..layout.part_kinds import (
    ArborPart,
    BearingPart,
    CockPart,
    CollarPart,
    CrankPart,
    DialPart,
    HandPart,
    KnobPart,
    Part,
    PillarPart,
    PinPart,
    PlatePart,
    ScrewPart,
    SleevePart,
    WheelPart,
)
from ..layout.placement import nominal_tip_radius
from .csv_text import csv_text

__all__ = [
    "ASSEMBLY_FILE",
    "ASSEMBLY_COLUMNS",
    "BACK",
    "FRONT",
    "Ring",
    "Step",
    "assembly_csv",
    "assembly_steps",
    "assembly_writer",
    "rings",
]

#: The assembly order's file inside the build output.
ASSEMBLY_FILE = "assembly.csv"
#: Its columns.
ASSEMBLY_COLUMNS = ("step", "part", "action", "onto", "note")
#: Sides a part comes from: moving up the axis (from the back) or down it.
BACK, FRONT = "back", "front"

_TOL = 1e-3  # mm: touching is not overlapping
_SAME = 1e-2  # mm: two axes this close are one
_POLYGONS = frozenset({"square", "hex", "flat"})


@dataclass(frozen=True, slots=True)
class Ring:
    """One length of a part about an axis ``at`` (mm): from ``z0`` to ``z1`` in height,
    from ``r_in`` to ``r_out`` across (``math.inf``: a plate). ``bore_shape`` is the
    shape of its bore (a square bore passes over a square seat), ``shape`` and
    ``across`` those of its outside; ``holes`` (x, y, r) are where other axes pass
    through it; ``sheet`` marks a plate, which covers every other axis."""

    part: str
    at: tuple[float, float]
    z0: float
    z1: float
    r_in: float
    r_out: float
    bore_shape: str = "round"
    shape: str = "round"
    across: float = 0.0
    holes: tuple[tuple[float, float, float], ...] = ()
    sheet: bool = False


@dataclass(frozen=True, slots=True)
class Step:
    """One step of the assembly: ``part`` is fitted (``action``, naming the side it
    comes from) onto ``onto``; ``note`` says what else to know. ``group`` names every
    part that moves with it (a made-up arbor), ``movement`` whether it is fitted in
    the movement (or off it, on the unit being made up), ``shown`` every part of
    what it is fitted into, itself included, once it is done (for a figure)."""

    number: int
    part: str
    action: str
    onto: str
    note: str
    group: tuple[str, ...]
    movement: bool
    shown: tuple[str, ...] = ()  # the parts together once this step is done


def _turn(
    x: float, y: float, part: Part
) -> tuple[float, float]:  # a point of the part's frame in the assembly
    a = math.radians(part.placement.angle_deg)
    c, s = math.cos(a), math.sin(a)
    return (part.placement.x + c * x - s * y, part.placement.y + s * x + c * y)


def rings(part: Part) -> tuple[Ring, ...]:
    """The part as rings about its axes, in the assembly (see the module docstring)."""
    at = (part.placement.x, part.placement.y)
    z = part.placement.z
    n = part.name
    if isinstance(part, WheelPart):
        holes = tuple((*_turn(hx, hy, part), d / 2) for hx, hy, d in part.holes)
        out = [
            Ring(n, at, z, z + part.face_width, part.bore / 2,
                 nominal_tip_radius(part.tooth), part.seat, holes=holes)
        ]  # fmt: skip
        if part.hub_diameter > 0 and part.hub_length > 0:
            top = z + part.face_width
            out.append(
                Ring(n, at, top, top + part.hub_length, part.bore / 2,
                     part.hub_diameter / 2, part.seat)
            )  # fmt: skip
        return tuple(out)
    if isinstance(part, (ArborPart, SleevePart)):
        inside = part.inside / 2 if isinstance(part, SleevePart) else 0.0
        if part.sections:
            return tuple(
                Ring(n, at, z + s.z0, z + s.z1, inside, s.diameter / 2,
                     shape=s.shape, across=s.across)
                for s in part.sections
            )  # fmt: skip
        d = part.diameter if isinstance(part, ArborPart) else part.outside
        return (Ring(n, at, z, z + part.length, inside, d / 2),)
    if isinstance(part, CollarPart):
        return (Ring(n, at, z, z + part.length, part.inside / 2, part.outside / 2),)
    if isinstance(part, PlatePart):
        holes = tuple((h.x + at[0], h.y + at[1], h.diameter / 2) for h in part.holes)
        return (
            Ring(n, at, z, z + part.thickness, 0.0, math.inf, holes=holes, sheet=True),
        )
    if isinstance(part, PillarPart):
        return _pillar(part)
    if isinstance(part, CockPart):
        return _cock(part)
    if isinstance(part, ScrewPart):
        k, length = part.head_height, part.length
        head, core = part.head_diameter / 2, part.core / 2
        if part.head_up:
            return (
                Ring(n, at, z, z + length, 0.0, core),
                Ring(n, at, z + length, z + length + k, 0.0, head),
            )
        return (
            Ring(n, at, z, z + k, 0.0, head),
            Ring(n, at, z + k, z + k + length, 0.0, core),
        )
    if isinstance(part, BearingPart):
        return (Ring(n, at, z, z + part.width, part.inside / 2, part.outside / 2),)
    if isinstance(part, PinPart):
        return (Ring(n, at, z, z + part.length, 0.0, part.diameter / 2),)
    if isinstance(part, DialPart):
        return _dial(part)
    if isinstance(part, HandPart):
        bore = part.across / 2 + part.clearance
        shape = part.seat if part.seat != "collet" else "round"
        out = [
            Ring(n, at, z, z + part.thickness, bore, max(part.length, part.tail), shape)
        ]
        if part.collet > 0 and part.collet_length > 0:
            top = z + part.thickness
            out.append(
                Ring(n, at, top, top + part.collet_length, bore, part.collet / 2)
            )
        return tuple(out)
    if isinstance(part, KnobPart):
        bore = part.across / 2 + part.clearance
        shape = part.seat if part.seat != "collet" else "round"
        return (Ring(n, at, z, z + part.length, bore, part.diameter / 2, shape),)
    # the last kind of part: a crank, its arm swept round as a disc
    bore = part.across / 2 + part.clearance
    shape = part.seat if part.seat != "collet" else "round"
    reach = part.throw + part.arm / 2
    return (Ring(n, at, z, z + part.thickness, bore, reach, shape),)


def _pillar(part: PillarPart) -> tuple[Ring, ...]:
    at, z, n = (part.placement.x, part.placement.y), part.placement.z, part.name
    spans: list[tuple[float, float, float]] = []
    top = z
    if part.spigot > 0 and part.back_spigot > 0:
        spans.append((z, z + part.back_spigot, part.spigot / 2))
        top = z + part.back_spigot
    spans.append((top, top + part.length, part.diameter / 2))
    top += part.length
    if part.spigot > 0 and part.front_spigot > 0:
        spans.append((top, top + part.front_spigot, part.spigot / 2))
        top += part.front_spigot
    out = []
    back_end = z + (part.back_depth if part.back_hole > 0 else 0.0)
    front_end = top - (part.front_depth if part.front_hole > 0 else 0.0)
    if back_end > z:  # the tapped hole at the back end
        out.append(Ring(n, at, z, back_end, part.back_hole / 2, spans[0][2]))
    if front_end < top:
        out.append(Ring(n, at, front_end, top, part.front_hole / 2, spans[-1][2]))
    for z0, z1, r in spans:
        z0, z1 = max(z0, back_end), min(z1, front_end)
        if z1 > z0:
            out.append(Ring(n, at, z0, z1, 0.0, r))
    return tuple(out)


def _cock(part: CockPart) -> tuple[Ring, ...]:
    """The bar as a row of discs from the pivot to its far end, the foot likewise; the
    pivot hole on the first, the screw holes where they fall."""
    n, z = part.name, part.placement.z
    t, h, w = part.thickness, part.foot_height, part.width / 2
    bar_z = z + (h if not part.hanging else 0.0)
    foot_z = z + (0.0 if not part.hanging else t)
    holes = tuple((*_turn(x, 0.0, part), part.screw_hole / 2) for x in part.screws)
    holes += ((*_turn(0.0, 0.0, part), part.pivot_hole / 2),)
    out = []
    steps = max(1, math.ceil(part.length / w))
    for k in range(steps + 1):
        x = part.length * k / steps
        at = _turn(x, 0.0, part)
        out.append(Ring(n, at, bar_z, bar_z + t, 0.0, w, holes=holes))
        if h > 0 and x >= part.foot_from - _TOL:
            out.append(Ring(n, at, foot_z, foot_z + h, 0.0, w, holes=holes))
    return tuple(out)


def _dial(part: DialPart) -> tuple[Ring, ...]:
    n, z = part.name, part.placement.z
    at = (part.placement.x, part.placement.y)
    own = [d / 2 for x, y, d in part.holes if math.hypot(x, y) < _SAME]
    holes = tuple(
        (*_turn(x, y, part), d / 2)
        for x, y, d in part.holes
        if math.hypot(x, y) >= _SAME
    )
    disc = z + part.foot_length
    out = [
        Ring(n, at, disc, disc + part.thickness, own[0] if own else 0.0, part.radius,
             holes=holes)
    ]  # fmt: skip
    for fx, fy in part.feet:
        foot = _turn(fx, fy, part)
        out.append(Ring(n, foot, z, disc, 0.0, part.foot_diameter / 2))
        out.append(Ring(n, foot, z - part.pin_length, z, 0.0, part.foot_pin / 2))
    return tuple(out)


def _hole_at(ring: Ring, at: tuple[float, float]) -> float | None:
    for x, y, r in ring.holes:
        if math.hypot(x - at[0], y - at[1]) < _SAME:
            return r
    return None


def _outside(ring: Ring, against: Ring) -> float:
    """``ring``'s outside as met by ``against``'s bore: a polygon passes through a
    bore of its own shape at its size across flats."""
    if ring.shape in _POLYGONS and ring.shape == against.bore_shape and ring.across:
        return ring.across / 2
    return ring.r_out


def _clash(a: Ring, b: Ring) -> bool:
    """Whether two rings at one height would overlap (see the module docstring)."""
    hole = _hole_at(b, a.at)
    if hole is not None:
        return a.r_out > hole + _TOL
    hole = _hole_at(a, b.at)
    if hole is not None:
        return b.r_out > hole + _TOL
    if a.sheet or b.sheet:
        return True
    d = math.hypot(a.at[0] - b.at[0], a.at[1] - b.at[1])
    if d < _SAME:
        return a.r_in < _outside(b, a) - _TOL and b.r_in < _outside(a, b) - _TOL
    return d < a.r_out + b.r_out - _TOL


def _met(a: Ring, b: Ring, side: str) -> bool:
    """Whether ``a``, coming from ``side`` to its place, passes the height of ``b``."""
    if side == FRONT:
        return b.z1 > a.z0 + _TOL
    return b.z0 < a.z1 - _TOL


class _Shop:
    """The parts, their rings, and which pairs may slide into each other."""

    def __init__(self, design: Design, parts: Sequence[Part]) -> None:
        self.design = design
        self.parts = {p.name: p for p in parts}
        self.order = [p.name for p in parts]
        self.rings = {p.name: rings(p) for p in parts}
        free: set[frozenset[str]] = set()
        for m in design.meshes:
            free.add(frozenset(m.pair))
        for c in design.pinslots:
            free.add(frozenset((c.pin, c.slot)))
        wheels = [p.name for p in parts if isinstance(p, WheelPart)]
        for p in parts:
            if isinstance(p, PinPart):
                free.update(frozenset((p.name, w)) for w in wheels)
        self.free = free

    def blocking(
        self, moving: Sequence[str], fixed: Sequence[str], side: str
    ) -> list[tuple[str, str]]:
        """Pairs (moving part, fixed part) that would meet on the way from ``side``."""
        out = []
        for m in moving:
            for f in fixed:
                if frozenset((m, f)) in self.free:
                    continue
                if any(
                    _met(a, b, side) and _clash(a, b)
                    for a in self.rings[m]
                    for b in self.rings[f]
                ):
                    out.append((m, f))
        return out

    def low(self, name: str) -> float:
        return min((r.z0 for r in self.rings[name]), default=0.0)


@dataclass
class _Unit:
    """A member made up with what it carries (``kids``: names of single parts and of
    carried members), and what was left to fit once it is in place."""

    member: str
    kids: list[str]


class _Planner:
    def __init__(self, design: Design, parts: Sequence[Part]) -> None:
        self.shop = _Shop(design, parts)
        self.design = design
        self.lengths = lengths_of(design)
        self.parts = list(parts)
        self.steps: list[Step] = []
        self.placed: dict[str, str] = {}  # part -> the unit it is in ("" movement)
        self.members = {p.name for p in parts if isinstance(p, (ArborPart, SleevePart))}
        self.kids = self._kids()
        self._nest_tubes()
        #: parts left off until the members named are in
        self.waiting: dict[str, set[str]] = {}

    # -- what goes on what --------------------------------------------------------
    def _kids(self) -> dict[str, list[str]]:
        """For each member: the wheels and collars fixed on it, separate pins on its
        wheels, and the members its wheels carry."""
        out: dict[str, list[str]] = {m: [] for m in self.members}
        wheel_of: dict[str, str] = {}
        for p in self.parts:
            if isinstance(p, WheelPart):
                try:
                    member = self.design.wheel(p.name).arbor
                except KeyError:
                    continue
                if member in out:
                    out[member].append(p.name)
                    wheel_of[p.name] = member
            elif isinstance(p, CollarPart) and p.member in out:
                out[p.member].append(p.name)
        for p in self.parts:
            if isinstance(p, PinPart):
                wheel = self._pin_wheel(p)
                if wheel is not None:
                    out[wheel_of[wheel]].append(p.name)
        for a in self.design.arbors:
            if a.carrier is not None and a.name in out and a.carrier in wheel_of:
                out[wheel_of[a.carrier]].append(a.name)
        return out

    def _nest_tubes(self) -> None:
        """A tube that cannot slide on from the front over what its member carries (a
        shoulder or wheel at the member's front end) but can from the back is made up
        onto its member off the movement, before the member goes in."""
        arbors = {a.name: a for a in self.design.arbors}
        tubes = [
            a.name
            for a in self.design.arbors
            if a.around is not None and a.name in self.members and a.around in self.kids
        ]
        # inner tubes first, so that an outer one meets its member as made up
        tubes.sort(key=lambda t: len(self.design.inner_members(t)))
        for t in tubes:
            member = arbors[t].around
            assert member is not None
            if any(t in ks for ks in self.kids.values()):
                continue  # carried
            mine = self._group(t, set())
            theirs = [g for g in self._group(member, set()) if g not in mine]
            if self.shop.blocking(mine, theirs, FRONT) and not self.shop.blocking(
                mine, theirs, BACK
            ):
                self.kids[member].append(t)

    def _pin_wheel(self, pin: PinPart) -> str | None:
        for p in self.parts:
            if not isinstance(p, WheelPart):
                continue
            top = p.placement.z + p.face_width
            d = math.hypot(
                pin.placement.x - p.placement.x, pin.placement.y - p.placement.y
            )
            if abs(pin.placement.z - top) < _SAME and d < nominal_tip_radius(p.tooth):
                return p.name
        return None

    def _supports(self, member: str) -> list[str]:
        """What a member runs in or is held in (plates, cocks, bearings), back first."""
        part = self.shop.parts[member]
        names = [
            s.what
            for s in getattr(part, "sections", ())
            if s.role in ("pivot", "held") and s.what in self.shop.parts
        ]
        return sorted(set(names), key=lambda n: (self.shop.low(n), n))

    # -- steps ---------------------------------------------------------------------
    def _add(
        self, part: str, action: str, onto: str, note: str, group: Sequence[str],
        unit: str,
    ) -> None:  # fmt: skip
        if unit:
            where = (
                f"on {unit} lying inner face up, off the movement"
                if isinstance(self.shop.parts.get(unit), PlatePart)
                else f"making up {unit}, off the movement"
            )
            note = f"{note}; {where}" if note else where
        for g in group:
            self.placed[g] = unit
        self.steps.append(
            Step(len(self.steps) + 1, part, action, onto, note, tuple(group),
                 unit == "", tuple(self._in(unit)))
        )  # fmt: skip

    def _in(self, unit: str) -> list[str]:
        return [p for p, u in self.placed.items() if u == unit]

    def _side(
        self, moving: Sequence[str], unit: str
    ) -> tuple[str | None, list[tuple[str, str]]]:
        """The side from which ``moving`` goes clear into ``unit``; else the pairs
        that meet from the better side."""
        fixed = self._in(unit)
        best: list[tuple[str, str]] | None = None
        for side in self._sides(moving, unit):
            hit = self.shop.blocking(moving, fixed, side)
            if not hit:
                return side, []
            if best is None or len(hit) < len(best):
                best = hit
        return None, best or []

    def _sides(self, moving: Sequence[str], unit: str) -> tuple[str, str]:
        """The nearer end first: a part low on its member comes from the back."""
        fixed = self._in(unit)
        if not fixed:
            return FRONT, BACK
        lo = min(self.shop.low(f) for f in fixed)
        hi = max(max(r.z1 for r in self.shop.rings[f]) for f in fixed)
        z = min(self.shop.low(m) for m in moving)
        return (BACK, FRONT) if z - lo < hi - z else (FRONT, BACK)

    # -- made-up members -----------------------------------------------------------
    def _group(self, member: str, skip: set[str]) -> list[str]:
        out = [member]
        for k in self.kids[member]:
            if k in skip or k in self.placed:
                continue
            out.extend(self._group(k, skip) if k in self.members else [k])
        return out

    def _make_up(self, member: str, skip: set[str]) -> list[str]:
        """Make ``member`` up off the movement with its kids (but ``skip``); return
        the kids that could not be fitted."""
        self.placed[member] = member  # its own step comes when it goes in
        left: list[str] = []
        singles = [
            k for k in self.kids[member] if k not in skip and k not in self.members
        ]
        carried = [k for k in self.kids[member] if k not in skip and k in self.members]
        # parts from the back nearest the stop first (highest), from the front lowest
        order = []
        for k in singles:
            side, _ = self._side([k], member)
            order.append((side or FRONT, k))
        order.sort(
            key=lambda sk: (sk[0] != BACK, -self.shop.low(sk[1]) if sk[0] == BACK
                            else self.shop.low(sk[1]), sk[1])
        )  # fmt: skip
        for _, k in order:
            if not self._fit_single(k, member, member):
                left.append(k)
        for c in carried:
            left.extend(self._put_in(c, member, skip0=frozenset(skip)))
        return left

    def _fit_single(self, part: str, onto: str, unit: str) -> bool:
        side, hit = self._side([part], unit)
        if side is None:
            return False
        p = self.shop.parts[part]
        how = "fix"
        note = ""
        if isinstance(p, CollarPart):
            note = f"fixed with {p.fixing}" + self._height(part, onto)
        elif isinstance(p, WheelPart):
            note = self._wheel_note(part, onto) + self._height(part, onto)
        elif isinstance(p, (HandPart, KnobPart, CrankPart)):
            how = "push"
            note = f"on its {p.seat} seat"
        elif isinstance(p, PinPart):
            how = "press"
        self._add(part, f"{how} on from the {side}", onto, note, [part], unit)
        return True

    def _height(self, part: str, member: str) -> str:
        """Where ``part`` goes on ``member``: its back face from the member's back
        end (``""`` when ``member`` is no arbor or tube)."""
        if member not in self.members:
            return ""
        gap = self.shop.low(part) - self.shop.low(member)
        if abs(gap) < _TOL:
            return f", at the back end of {member}"
        return f", back face {self.lengths.fixed(gap, 2)} from the back end of {member}"

    def _shake(self, member: str) -> str:
        """The member's end shake as its turning notes give it, or ``""``."""
        for n in getattr(self.shop.parts[member], "notes", ()):
            if n.startswith("end shake "):
                return str(n).split(":", 1)[0]
        return ""

    def _wheel_note(self, wheel: str, member: str) -> str:
        part = self.shop.parts[member]
        for n in getattr(part, "notes", ()):
            if n.startswith(f"{wheel}: "):
                return str(n).removeprefix(f"{wheel}: ")
        return ""

    def _put_in(
        self,
        member: str,
        unit: str,
        later: Sequence[str] = (),
        skip0: frozenset[str] = frozenset(),
    ) -> list[str]:
        """Make up ``member`` and put it into ``unit`` onto its host; return what is
        left to fit (into ``unit``, once it is in place). A part that would stop one
        of the members to come ``later`` is left off until that one is in
        (:attr:`waiting`); ``skip0`` are parts left off by the caller."""
        skip: set[str] = set(skip0) & set(self._group(member, set()))
        host = self._host(member)
        while True:
            group = self._group(member, skip)
            side, hit = self._side(group, unit)
            if side is not None:
                break
            drop = {m for m, _ in hit if m != member and m in self.kids[member]}
            # a part of a carried member that stops it: left to its own unit
            if not drop:
                drop = {m for m, _ in hit if m != member}
            if not drop:
                break
            skip |= drop
        # look ahead: a part of this unit in the way of a member still to come
        fixed = self._in(unit)
        for u in later:
            if u in self.placed or u == member:
                continue
            gu = self._unit(u)
            for way in (FRONT, BACK):
                if self.shop.blocking(gu, fixed, way):
                    continue
                mine = self._group(member, set())  # all it carries, left off or not
                stop = {f for _, f in self.shop.blocking(gu, mine, way)}
                if stop and not stop & self.members:
                    skip |= stop
                    for f in stop:
                        self.waiting.setdefault(f, set()).add(u)
                break
        left = self._make_up(member, skip)
        group = [p for p, u in self.placed.items() if u == member]
        if side is None:
            side = FRONT
            note = "no clear way found: " + ", ".join(
                f"{a} meets {b}" for a, b in hit[:3]
            )
        else:
            note = self._runs_note(member)
            shake = self._shake(member)
            if shake:
                note = f"{note}; {shake}" if note else shake
        for g in group:
            self.placed[g] = unit
        with_ = [g for g in group if g != member]
        if with_:
            note = f"with {', '.join(with_)} on it; " + note
        self._add(member, f"put in from the {side}", host, note.rstrip("; "),
                  group, unit)  # fmt: skip
        # what was skipped is fitted now, into the unit it went into
        rest = []
        for k in sorted(skip | set(left), key=lambda k: (self.shop.low(k), k)):
            if k in self.placed:
                continue
            if k in self.waiting:
                rest.append(k)
                continue
            if k in self.members:
                rest.extend(self._put_in(k, unit))
            elif not self._fit_single(k, self._owner(k), unit):
                rest.append(k)
        return rest

    def _owner(self, part: str) -> str:
        for m, ks in self.kids.items():
            if part in ks:
                return m
        p = self.shop.parts[part]
        return getattr(p, "member", "") or getattr(p, "arbor", "")

    def _host(self, member: str) -> str:
        a = {x.name: x for x in self.design.arbors}.get(member)
        if a is not None and a.around is not None:
            return a.around
        if a is not None and a.carrier is not None:
            return a.carrier
        sup = self._supports(member)
        return sup[0] if sup else ""

    def _runs_note(self, member: str) -> str:
        sup = self._supports(member)
        a = {x.name: x for x in self.design.arbors}.get(member)
        if a is not None and a.around is not None:
            return f"slides over {a.around}"
        if a is not None and a.carrier is not None:
            return f"runs in {a.carrier}"
        return f"runs in {', '.join(sup)}" if sup else ""

    # -- the movement ----------------------------------------------------------------
    def plan(self) -> list[Step]:
        by_kind: dict[str, list[Part]] = {}
        for p in self.parts:
            by_kind.setdefault(p.kind, []).append(p)
        plates = sorted(
            (p for p in self.parts if isinstance(p, PlatePart)),
            key=lambda p: p.placement.z,
        )
        pillars = [p.name for p in by_kind.get("pillar", [])]
        back = plates[0].name if plates else ""
        front = plates[-1].name if len(plates) > 1 else ""
        cock_plate = {
            c.name: self._plate_of(c, plates)
            for c in self.parts
            if isinstance(c, CockPart)
        }
        screws = {
            s.name: self._screwed(s) for s in self.parts if isinstance(s, ScrewPart)
        }
        front_side = {front} if front else set()
        front_side |= {c for c, pl in cock_plate.items() if pl == front and front}
        members = sorted(
            (m for m in self.members if not self._carried(m)),
            key=lambda m: (self.shop.low(m), m),
        )
        on_front = [
            m for m in members
            if self._supports(m) and set(self._supports(m)) <= front_side
            and self._host(m) not in self.members
        ]  # fmt: skip
        if back:
            self._add(back, "lay on the bench, inner face up", "",
                      "the back of the movement down", [back], "")  # fmt: skip
        self._frame(by_kind, back, pillars, screws)
        # the arbors in the movement, the cocks they run in, then the tubes over them
        cocks = [c for c, pl in cock_plate.items() if pl == back and back]
        pending = [m for m in members if m not in on_front] + cocks
        later = pending + ([front] if front else [])
        frame = set(self._in(""))
        left: list[str] = []
        while pending:
            ready = [m for m in pending if self._ready(m)] or pending[:1]
            m = self._choose(ready, pending, frame)
            pending.remove(m)
            later.remove(m)
            if m in cocks:
                self._cock(m, back, screws, "")
                frame |= {m} | {s for s, holds in screws.items() if holds == m}
            else:
                left.extend(self._put_in(m, "", later=later))
            for k in sorted(left, key=lambda k: (self.shop.low(k), k)):
                if k in self.waiting and not self.waiting[k] & set(later):
                    del self.waiting[k]
                    if self._fit_single(k, self._owner(k), ""):
                        left.remove(k)
        if front:
            self._front_plate(front, on_front, by_kind, cock_plate, screws, pillars)
        # what could not go in with its member, now from its free side
        for k in sorted(set(left), key=lambda k: (self.shop.low(k), k)):
            if k not in self.placed:
                self._fit_single(k, self._owner(k), "")
        for s in sorted(screws, key=lambda s: (self.shop.low(s), s)):
            if s not in self.placed:
                self._screw(s, screws[s], "")
        self._display(by_kind)
        for name in self.shop.order:  # anything not reached: said plainly
            if name not in self.placed:
                self._add(name, "fit", self._owner(name), "no clear way found",
                          [name], "")  # fmt: skip
        return self.steps

    def _unit(self, name: str) -> list[str]:
        """What moves when ``name`` goes in: a made-up member, or a single part."""
        if name in self.members:
            return [g for g in self._group(name, set()) if g not in self.placed]
        return [name]

    def _frame_only(self, name: str, frame: set[str]) -> bool:
        """Whether ``name`` goes in stopped by nothing but the frame (a collar behind
        a plate: fitted once the rest is in)."""
        fixed = self._in("")
        return any(
            self._free(name, self.shop.blocking(self._unit(name), fixed, side), frame)
            for side in (FRONT, BACK)
        )

    @staticmethod
    def _free(name: str, hit: list[tuple[str, str]], frame: set[str]) -> bool:
        """Whether a way is open to ``name``: only the frame stops it, and only parts
        that can be fitted after (not the member or part itself)."""
        return {f for _, f in hit} <= frame and name not in {a for a, _ in hit}

    def _choose(self, ready: list[str], pending: list[str], frame: set[str]) -> str:
        """The next unit into the movement: the first (lowest) that goes in and stops
        none of the others that could still go in; else the first that goes in."""
        fixed = self._in("")
        goes = [m for m in ready if self._frame_only(m, frame)]
        for m in goes:
            mine = self._unit(m)
            harmless = True
            for u in pending:
                if u == m:
                    continue
                theirs = self._unit(u)
                harm = []
                for w in (FRONT, BACK):
                    now = self.shop.blocking(theirs, fixed, w)
                    if not self._free(u, now, frame):
                        continue  # not this way anyway
                    stopped = {a for a, _ in self.shop.blocking(theirs, mine, w)}
                    # parts the frame stops already are fitted later in any case
                    harm.append(bool(stopped - {a for a, _ in now}))
                if harm and all(harm):
                    harmless = False
                    break
            if harmless:
                return m
        return goes[0] if goes else ready[0]

    def _cock(self, cock: str, plate: str, screws: dict[str, str], unit: str) -> None:
        side, hit = self._side([cock], unit)
        note = "its pivot hole over the arbor's hole"
        if side is None:
            note += "; no clear way found: " + ", ".join(f"{b}" for _, b in hit[:3])
        self._add(cock, f"set on from the {side or FRONT}", plate, note, [cock], unit)
        for s, holds in screws.items():
            if holds == cock:
                self._screw(s, cock, unit)

    def _carried(self, member: str) -> bool:
        return any(member in ks for ks in self.kids.values())

    def _ready(self, member: str) -> bool:
        host = self._host(member)
        return not host or host in self.placed

    def _plate_of(self, cock: CockPart, plates: Sequence[PlatePart]) -> str:
        """The plate a cock's foot stands on."""
        z = cock.placement.z
        if cock.hanging:
            z += cock.thickness + cock.foot_height
        for p in plates:
            if (
                abs(p.placement.z - z) < _SAME
                or abs(p.placement.z + p.thickness - z) < _SAME
            ):
                return p.name
        return plates[0].name if plates else ""

    def _screwed(self, screw: ScrewPart) -> str:
        """The pillar or cock a screw holds."""
        at = (screw.placement.x, screw.placement.y)
        for p in self.parts:
            if (
                isinstance(p, PillarPart)
                and math.hypot(p.placement.x - at[0], p.placement.y - at[1]) < _SAME
            ):
                return p.name
        for p in self.parts:
            if isinstance(p, CockPart) and any(
                _hole_at(r, at) is not None for r in self.shop.rings[p.name]
            ):
                return p.name
        return ""

    def _screw(self, screw: str, holds: str, unit: str) -> None:
        part = self.shop.parts[screw]
        side = BACK if not getattr(part, "head_up", False) else FRONT
        size = getattr(part, "size", "")
        self._add(screw, f"screw in from the {side}", holds,
                  f"{size} x {getattr(part, 'length', 0):g}".strip(), [screw], unit)  # fmt: skip

    def _frame(
        self,
        by_kind: dict[str, list[Part]],
        base: str,
        pillars: list[str],
        screws: dict[str, str],
    ) -> None:
        """The back plate's bushes or bearings, the pillars and their back screws."""
        if not base:
            return
        for b in by_kind.get("bearing", []):
            if self._in_plate(b, base):
                side, _ = self._side([b.name], "")
                self._add(b.name, f"press in from the {side or FRONT}", base,
                          "flush with the plate's face", [b.name], "")  # fmt: skip
        for name in pillars:
            self._add(name, "stand on from the front", base, "", [name], "")
        for s, holds in screws.items():
            if holds in pillars and self.shop.low(s) < self.shop.low(base) + _SAME:
                self._screw(s, holds, "")

    def _in_plate(self, bearing: Part, plate: str) -> bool:
        (pr,) = self.shop.rings[plate]
        (br,) = self.shop.rings[bearing.name]
        return pr.z0 - _TOL <= br.z0 and br.z1 <= pr.z1 + _TOL

    def _front_plate(
        self,
        front: str,
        on_front: list[str],
        by_kind: dict[str, list[Part]],
        cock_plate: dict[str, str],
        screws: dict[str, str],
        pillars: list[str],
    ) -> None:
        """Make the front plate up with what it alone holds, then lower it on."""
        unit = front
        self.placed[front] = unit  # made up lying inner face up; its step: lowered on
        for b in by_kind.get("bearing", []):
            if self._in_plate(b, front):
                self._add(b.name, "press in", front, "flush with the plate's face",
                          [b.name], unit)  # fmt: skip
        for c, plate in cock_plate.items():
            if plate == front:
                self._cock(c, front, screws, unit)
        left: list[str] = []
        for m in on_front:
            left.extend(self._put_in(m, unit))
        for k in left:
            if k not in self.placed:
                self._fit_single(k, self._owner(k), unit)
        group = self._in(unit)
        side_hit = self.shop.blocking(group, self._in(""), FRONT)
        note = (
            "onto the pillars"
            + (f" ({', '.join(pillars)})" if pillars else "")
            + ", over every front pivot"
        )
        if side_hit:
            note += "; no clear way found: " + ", ".join(
                f"{a} meets {b}" for a, b in side_hit[:3]
            )
        with_ = [g for g in group if g != front]
        if with_:
            note = f"with {', '.join(with_)}; " + note
        # the plate is already listed: this step moves the made-up plate in
        for g in group:
            self.placed[g] = ""
        self.steps.append(
            Step(len(self.steps) + 1, front, "lower on from the front",
                 pillars[0] if pillars else "", note, tuple(group), True,
                 tuple(self._in("")))
        )  # fmt: skip
        for s, holds in screws.items():
            if holds in pillars and s not in self.placed:
                self._screw(s, holds, "")

    def _display(self, by_kind: dict[str, list[Part]]) -> None:
        plates = sorted(by_kind.get("plate", []), key=lambda p: p.placement.z)
        for d in sorted(by_kind.get("dial", []), key=lambda p: (p.placement.z, p.name)):
            onto = plates[-1].name if plates else ""
            side, hit = self._side([d.name], "")
            note = "its feet through the plate, riveted or glued behind it"
            if side is None:
                note += "; no clear way found"
            self._add(d.name, f"set on from the {side or FRONT}", onto, note,
                      [d.name], "")  # fmt: skip
        items = [
            p for p in self.parts if isinstance(p, (HandPart, KnobPart, CrankPart))
        ]
        # hands from the back one forward; a knob or crank behind comes from the back
        for p in sorted(items, key=lambda p: (p.placement.z, p.name)):
            if not self._fit_single(p.name, p.arbor, ""):
                self._add(p.name, "fit", p.arbor, "no clear way found", [p.name], "")


def assembly_steps(design: Design, parts: Sequence[Part]) -> tuple[Step, ...]:
    """The numbered steps that put ``parts`` together (see the module docstring)."""
    return tuple(_Planner(design, parts).plan())


def assembly_csv(design: Design, parts: Sequence[Part]) -> str:
    """``assembly.csv`` as text: a header, then one row per step."""
    return csv_text(
        ASSEMBLY_COLUMNS,
        (
            [s.number, s.part, s.action, s.onto, s.note]
            for s in assembly_steps(design, parts)
        ),
    )


def assembly_writer(
    design: Design,
    parts: Sequence[Part],
    findings: Sequence[Finding],
    staging_dir: Path,
) -> list[Path]:
    """Sheet writer for ``wheelgen build``: writes ``assembly.csv``."""
    path = Path(staging_dir) / ASSEMBLY_FILE
    path.write_text(assembly_csv(design, parts), encoding="utf-8", newline="\n")
    return [path]
