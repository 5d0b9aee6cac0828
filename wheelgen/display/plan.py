"""The display of a design as plain numbers: dials with their rings, hands, knob or crank.

Each axis that carries a hand gets one dial disc, behind its hands; every hand on it
reads a ring of its own: the hand nearest the dial reads the outermost ring. Sizes the
design leaves open are chosen here (the rules and their basis are beside each constant):

- a dial is as large as the largest wheel tip on its axis (at least
  :data:`MIN_DIAL_RADIUS`), but keeps :data:`DIAL_CLEARANCE` from every other dial and
  from the sweep of a knob or crank in front;
- rings nest inwards from the rim, each :func:`ring_width` wide; a hand reaches into
  its ring's marks, its tail is a fifth of its length;
- a dial has a hole for every member that passes it (its own axis's, or the drive's
  under a knob), and stands on three feet placed clear of every hole of the front plate.

Heights come from :mod:`wheelgen.layout.front`, positions from the layout (carriers at
angle 0), rates from the exact kinematics. Lengths in mm, angles in degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache

import numpy as np

from ..design.display_tables import dial_part_name, hand_part_name, input_part_name
from ..design.model import Design, Dial, Hand
from ..design.process_limits import wall_minimum
from ..design.screws import screw
from ..findings import Finding
from ..frame.holes import FrameHole
from ..kinematics.rates import axis_root, solve_rates
from ..kinematics.targets import arbor_period, arbor_sense
from ..layout.front import Level, dial_gap, dial_thickness, nesting_depth
from ..layout.part_kinds import (
    CrankPart,
    DialPart,
    HandPart,
    ItemSeat,
    KnobPart,
    Pose,
)
from ..layout.sleeves import seat_factor
from ..layout.train_layout import Layout, plan_layout
from .graduations import Scale, dial_scale, mark_angle_deg

__all__ = [
    "DIAL_CLEARANCE",
    "DIAL_HOLE_PLAY",
    "MIN_DIAL_RADIUS",
    "KNOB_DIAMETER",
    "CRANK_THROW",
    "CRANK_HANDLE_DIAMETER",
    "FOOT_DIAMETER",
    "FOOT_PIN",
    "RingPlan",
    "HandPlan",
    "DialPlan",
    "InputPlan",
    "DisplayPlan",
    "display_plan",
    "ring_width",
    "seat_clearance",
]

#: mm kept between two dials, and between a dial and a knob's or crank's sweep
#: (common practice, no source).
DIAL_CLEARANCE = 2.0
#: mm: the smallest dial made when the wheels on its axis are smaller still.
MIN_DIAL_RADIUS = 15.0
#: mm, diametral play of a dial's hole round what passes through it: the dial is held
#: by its feet, never by the tubes (common practice, no source).
DIAL_HOLE_PLAY = 0.4
#: mm, a knob's diameter, a crank's throw and its handle's diameter when the design
#: gives none (a grip for thumb and finger; common practice, no source).
KNOB_DIAMETER = 16.0
CRANK_THROW = 25.0
CRANK_HANDLE_DIAMETER = 6.0
#: mm: a dial foot's diameter, and the pin at its end that passes through the front
#: plate (held in a hole of its own size, riveted over or glued behind the plate, so
#: that nothing stands inside the frame; common practice, no source).
FOOT_DIAMETER = 4.0
FOOT_PIN = 2.0
# gap to the next ring inwards, as a share of a ring's width
_RING_GAP = 0.15
# width of a character of the numbers, in text heights (sans-serif digits)
_TEXT_WIDTH = 0.6


@dataclass(frozen=True, slots=True)
class RingPlan:
    """One graduated ring: outer radius and width (mm), zero, sense and scale."""

    arbor: str
    outer: float
    width: float
    text_height: float
    zero_deg: float
    sense: int  # +1: the hand turns counter-clockwise seen from the front
    scale: Scale

    def angle_deg(self, value: Fraction) -> float:
        """Where the mark for ``value`` (in the ring's unit) stands."""
        return mark_angle_deg(value, self.scale.units, self.zero_deg, self.sense)


@dataclass(frozen=True, slots=True)
class HandPlan:
    """A hand, its level and ring, and the arbor's exact rate (turns per drive turn)."""

    part: HandPart
    level: Level
    dial: str  # the dial part it turns over
    ring: RingPlan | None
    rate: Fraction | None


@dataclass(frozen=True, slots=True)
class DialPlan:
    """A dial disc on one axis (``axis``: its innermost member) and its rings.

    ``plate_holes`` are the front plate's holes for its feet's pins.
    """

    part: DialPart
    axis: str
    z0: float
    z1: float
    rings: tuple[RingPlan, ...]
    plate_holes: tuple[FrameHole, ...] = ()


@dataclass(frozen=True, slots=True)
class InputPlan:
    """The knob or crank, its level and the radius it sweeps about the drive's axis."""

    part: KnobPart | CrankPart
    level: Level
    sweep: float


@dataclass(frozen=True, slots=True)
class DisplayPlan:
    """Everything shown, and what could not be made (as findings)."""

    hands: tuple[HandPlan, ...]
    dials: tuple[DialPlan, ...]
    input: InputPlan | None
    problems: tuple[Finding, ...]

    def parts(self) -> tuple[DialPart | HandPart | KnobPart | CrankPart, ...]:
        """The parts to make: dials, then hands, then the knob or crank."""
        out: list[DialPart | HandPart | KnobPart | CrankPart] = [
            d.part for d in self.dials
        ]
        out.extend(h.part for h in self.hands)
        if self.input is not None:
            out.append(self.input.part)
        return tuple(out)

    @property
    def plate_holes(self) -> tuple[FrameHole, ...]:
        """The holes the display needs in the front plate: its dials' foot pins."""
        return tuple(h for d in self.dials for h in d.plate_holes)


def ring_width(radius: float) -> float:
    """Radial width (mm) of a ring of marks and numbers on a dial of ``radius`` mm.

    A fifth of the radius, from 4 to 10 mm: numbers about a third of it high stay
    readable at arm's length (common practice, no source).
    """
    return min(max(0.2 * radius, 4.0), 10.0)


def seat_clearance(design: Design, shape: str) -> float:
    """Play (mm a side) of a hand's, knob's or crank's hole on its seat.

    A friction collet grips: none. Printed: half the process's running clearance.
    Cut: 0.02 mm, and for a square hole enough that its rounded inside corners (the
    cutter's radius rho) clear the member's sharp ones: ``rho (1 - 1/sqrt 2)``
    (derived: the corner of the rounded hole lies that much inside the sharp one's).
    """
    if shape == "collet":
        return 0.0
    proc = design.process
    if proc.kind == "print":
        return proc.clearance / 2
    play = 0.02
    if shape == "square":
        play = max(play, _corner(design) * (1 - 1 / math.sqrt(2)) + 0.01)
    return round(play, 6)


def _corner(design: Design) -> float:
    return design.process.cutter / 2 if design.process.kind == "mill" else 0.0


def _seat_extent(shape: str, across: float, clearance: float) -> float:
    """Largest radius (mm) of a seat hole."""
    if shape == "square":
        return (across / 2 + clearance) * math.sqrt(2)
    return across / 2 + clearance


def _across(layout: Layout, member: str, shape: str) -> float:
    """The member's size at the seat: a square's across flats, else its diameter."""
    outside = layout.outside(member)
    return round(outside * seat_factor("square"), 6) if shape == "square" else outside


def _hub(design: Design, shape: str, across: float, clearance: float) -> float:
    """Hub diameter (mm): the seat hole and a wall of at least 1 mm or two walls."""
    wall = max(1.0, 2 * wall_minimum(design.process))
    return round(2 * (_seat_extent(shape, across, clearance) + wall), 3)


def _tip_radius(design: Design, member: str) -> float:
    from ..layout.collisions import nominal_tip_radius
    from ..layout.placement import tooth_spec

    root = axis_root(design, member)
    radii = [
        nominal_tip_radius(tooth_spec(w))
        for w in design.wheels
        if axis_root(design, w.arbor) == root
    ]
    return max(radii, default=0.0)


@lru_cache(maxsize=16)
def display_plan(design: Design) -> DisplayPlan:
    """The display of ``design`` (cached per design; see the module docstring)."""
    return _Planner(design).plan()


class _Planner:
    def __init__(self, design: Design) -> None:
        self.design = design
        self.layout = plan_layout(design)
        self.problems: list[Finding] = []
        self.rates = solve_rates(design).rates
        stacking = self.layout.stacking
        self.levels = stacking.levels
        self.unreachable = set(stacking.unreachable)

    def plan(self) -> DisplayPlan:
        if self.levels is None or self.levels.front_face is None:
            return DisplayPlan((), (), None, ())
        design = self.design
        hands_by_arbor = {h.arbor: h for h in design.readings()}
        dial_by_arbor = {d.arbor: d for d in design.dials}
        items = [i for i in self.levels.items if i.member not in self.unreachable]
        groups: dict[str, list[Level]] = {}
        for i in items:
            if i.role == "hand":
                groups.setdefault(axis_root(design, i.member), []).append(i)
        inp = self._input(items)
        radii = self._dial_radii(groups, dial_by_arbor, inp)
        hands: list[HandPlan] = []
        dials: list[DialPlan] = []
        for root, group in groups.items():
            pos = self.layout.position(root)
            if pos is None:
                continue
            rings = self._rings(root, group, radii[root], dial_by_arbor)
            name = dial_part_name(root)
            for k, level in enumerate(group):
                ring = rings[k] if k < len(rings) else None
                hands.append(
                    self._hand(level, hands_by_arbor[level.member], ring, pos, name)
                )
            dials.append(self._dial(root, name, pos, radii[root], rings, inp))
        return DisplayPlan(tuple(hands), tuple(dials), inp, tuple(self.problems))

    # -- dials ----------------------------------------------------------------------
    def _dial_radii(
        self,
        groups: dict[str, list[Level]],
        dial_by_arbor: dict[str, Dial],
        inp: InputPlan | None,
    ) -> dict[str, float]:
        """Each dial's radius: the largest ring a design gives, else the default."""
        pos = {r: self.layout.position(r) for r in groups}
        given: dict[str, float] = {}
        cap: dict[str, float] = {}
        for root, group in groups.items():
            radii = [
                dial_by_arbor[i.member].radius
                for i in group
                if i.member in dial_by_arbor
                and dial_by_arbor[i.member].radius is not None
            ]
            if radii:
                given[root] = max(r for r in radii if r is not None)
            cap[root] = max(_tip_radius(self.design, root), MIN_DIAL_RADIUS)
        out = dict(given)
        others: list[tuple[tuple[float, float], float]] = []
        if inp is not None and inp.level.side == "front":
            p = self.layout.position(inp.level.member)
            if p is not None:
                others.append((p, inp.sweep))

        def room(root: str, radius_of: dict[str, float]) -> float:
            p = pos[root]
            assert p is not None
            best = cap[root]
            for other, r in radius_of.items():
                q = pos[other]
                if other != root and q is not None:
                    best = min(best, math.dist(p, q) - r - DIAL_CLEARANCE)
            for q, r in others:
                if math.dist(p, q) > 1e-9:
                    best = min(best, math.dist(p, q) - r - DIAL_CLEARANCE)
            return best

        free = [r for r in groups if r not in given and pos[r] is not None]
        # first each free dial takes half the room to its nearest neighbour, then each
        # grows into what the others leave, in the design's order
        half = {r: cap[r] for r in free}
        for r in free:
            p = pos[r]
            assert p is not None
            for other in groups:
                q = pos[other]
                if other != r and q is not None:
                    share = (math.dist(p, q) - DIAL_CLEARANCE) / 2
                    if other in given:
                        share = math.dist(p, q) - given[other] - DIAL_CLEARANCE
                    half[r] = min(half[r], share)
        out.update(half)
        for r in free:
            out[r] = room(r, out)
        for r in free:
            out[r] = round(max(out[r], 1.0), 3)
        return out

    def _rings(
        self,
        root: str,
        group: list[Level],
        radius: float,
        dial_by_arbor: dict[str, Dial],
    ) -> list[RingPlan]:
        design = self.design
        width = ring_width(radius)
        out: list[RingPlan] = []
        outer = radius
        for level in group:
            dial = dial_by_arbor.get(level.member) or Dial(level.member)
            r_out = dial.radius if dial.radius is not None else outer
            rate = self.rates.get(level.member)
            period = arbor_period(design, rate)
            sense = 1 if arbor_sense(design, rate) == "ccw" else -1
            hole = self.layout.outside(level.member) / 2
            if r_out - width < hole + 2.0:
                self.problems.append(
                    Finding(
                        "error",
                        "display.no_room",
                        f"dial {dial_part_name(root)}",
                        f'the ring for the hand on "{level.member}" would run from'
                        f" {r_out:.1f} to {r_out - width:.1f} mm, into the centre of"
                        f" dial {dial_part_name(root)}",
                        f"{r_out - width:.1f} mm",
                        f">= {hole + 2.0:.1f} mm",
                        "a larger 'radius' on the [[dial]] of the outermost ring, or"
                        " fewer hands on this axis",
                    )
                )
                break
            if period is None and dial.graduations not in ("degrees", "labels"):
                self.problems.append(
                    Finding(
                        "error",
                        "display.still",
                        f"hand {hand_part_name(level.member)}",
                        f'arbor "{level.member}" does not turn, so its hand shows'
                        " nothing and its dial cannot be graduated in time",
                        advice="drive the arbor, or remove its hand",
                    )
                )
                break
            text_h = round(0.32 * width, 3)
            scale = dial_scale(dial.graduations, period, r_out, text_h, dial.labels)
            out.append(
                RingPlan(
                    level.member, r_out, width, text_h, dial.zero_deg, sense, scale
                )
            )
            outer = r_out - width * (1 + _RING_GAP)
        return out

    def _dial(
        self,
        root: str,
        name: str,
        pos: tuple[float, float],
        radius: float,
        rings: list[RingPlan],
        inp: InputPlan | None,
    ) -> DialPlan:
        design = self.design
        assert self.levels is not None and self.levels.front_face is not None
        z0, z1 = self.levels.dials[root]
        spans = self.layout.stacking.spans
        holes: list[tuple[float, float, float]] = []
        for other, members in _groups(design).items():
            passing = [m for m in members if m in spans and spans[m].z1 > z0 + 1e-9]
            q = self.layout.position(other)
            if not passing or q is None:
                continue
            outer = max(passing, key=lambda m: nesting_depth(design, m))
            d = round(self.layout.outside(outer) + DIAL_HOLE_PLAY, 3)
            dx, dy = q[0] - pos[0], q[1] - pos[1]
            if math.hypot(dx, dy) + d / 2 > radius - 1e-9 and other != root:
                if math.hypot(dx, dy) - d / 2 < radius:
                    self.problems.append(
                        Finding(
                            "error",
                            "display.dial_edge",
                            f"dial {name}",
                            f"dial {name} ({radius:.1f} mm) reaches over the edge of"
                            f' arbor "{outer}", which stands through the front plate',
                            advice="a smaller 'radius' for this dial, or move the arbor",
                        )
                    )
                continue
            holes.append((round(dx, 6), round(dy, 6), d))
        holes.sort(key=lambda h: (round(math.hypot(h[0], h[1]), 6), h[0], h[1]))
        gap = dial_gap(design)
        feet = self._feet(pos, radius, holes)
        circles, strokes, texts = _engraving(rings)
        plate_holes = self._foot_holes(name, pos, feet)
        part = DialPart(
            name=name,
            radius=radius,
            thickness=dial_thickness(design),
            foot_length=gap,
            foot_diameter=FOOT_DIAMETER,
            foot_pin=FOOT_PIN,
            pin_length=design.frame.thickness if design.frame is not None else 0.0,
            feet=feet,
            holes=tuple(holes),
            circles=circles,
            strokes=strokes,
            texts=texts,
            placement=Pose(pos[0], pos[1], self.levels.front_face, 0.0),
        )
        return DialPlan(part, root, z0, z1, tuple(rings), plate_holes)

    def _foot_holes(
        self, name: str, pos: tuple[float, float], feet: tuple[tuple[float, float], ...]
    ) -> tuple[FrameHole, ...]:
        """The front plate's hole for each foot's pin: held, of the pin's own size."""
        from ..frame.holes import held_hole

        fit, low, high = held_hole(self.design, FOOT_PIN)
        return tuple(
            FrameHole("front", round(pos[0] + x, 6), round(pos[1] + y, 6), FOOT_PIN,
                      FOOT_PIN, "held", name, fit, low, high)
            for x, y in feet
        )  # fmt: skip

    def _feet(
        self,
        pos: tuple[float, float],
        radius: float,
        holes: list[tuple[float, float, float]],
    ) -> tuple[tuple[float, float], ...]:
        """Three feet near the rim, on the front plate and clear of the frame.

        Each foot's pin passes through the front plate: its hole keeps the frame's
        spacing from every other hole of that plate and from its edge, and the foot
        stays off the heads of the frame's screws on the plate's face.
        """
        from ..frame.limits import min_centre_distance, min_edge_distance
        from ..frame.outline import outline_distance
        from ..frame.plan import plan_frame
        from ..layout.collisions import inside_polygon

        design = self.design
        assert design.frame is not None and self.levels is not None
        frame = plan_frame(design)
        limits = frame.limits
        face = self.levels.front_face
        assert face is not None
        loop = frame.outline_loop()
        avoid: list[tuple[float, float, float]] = []  # (x, y, least centre distance)
        for h in frame.plate("front").holes:
            avoid.append((h.x, h.y, min_centre_distance(FOOT_PIN, h.diameter, limits)))
        for sp in frame.screws:
            if sp.head_up and abs(sp.face - face) < 1e-6:
                r = screw(sp.size).head_diameter / 2
                avoid.append((sp.x, sp.y, r + FOOT_DIAMETER / 2 + limits.clearance))
        for x, y, d in holes:  # what passes through the dial (in its frame)
            avoid.append((pos[0] + x, pos[1] + y, d / 2 + FOOT_DIAMETER / 2 + 1.0))
        edge = min_edge_distance(FOOT_PIN, limits)
        for share in (0.8, 0.7, 0.6, 0.9, 0.5, 0.4):
            rf = min(share * radius, radius - FOOT_DIAMETER)
            best: tuple[float, float] | None = None
            for step in range(120):
                a0 = 90.0 + 3.0 * step
                angles = np.radians(a0 + np.array([0.0, 120.0, 240.0]))
                px = pos[0] + rf * np.cos(angles)
                py = pos[1] + rf * np.sin(angles)
                pts = np.column_stack((px, py))
                if not bool(np.all(inside_polygon(pts, loop))):
                    continue
                slack = float(np.min(outline_distance(pts, loop))) - edge
                for x, y, need in avoid:
                    slack = min(slack, float(np.min(np.hypot(px - x, py - y))) - need)
                if slack >= 0 and (best is None or slack > best[1] + 1e-9):
                    best = (a0, slack)
            if best is not None:
                a0 = best[0]
                return tuple(
                    (round(rf * math.cos(math.radians(a0 + k * 120)), 6),
                     round(rf * math.sin(math.radians(a0 + k * 120)), 6))
                    for k in range(3)
                )  # fmt: skip
        self.problems.append(
            Finding(
                "error",
                "display.no_room",
                f"dial {dial_part_name(axis_root(design, self._axis_of(pos)))}",
                "no place for the dial's three feet on the front plate, clear of its"
                " holes and edge and of the heads of the frame's screws",
                advice="a larger or smaller 'radius' on the [[dial]] of its outermost"
                " ring, or move the pillars ([[pillar]])",
            )
        )
        return ()

    def _axis_of(self, pos: tuple[float, float]) -> str:
        for root, p in self.layout.placing.positions.items():
            if math.dist(p, pos) < 1e-9:
                return root
        return self.design.drive.arbor

    # -- hands ----------------------------------------------------------------------
    def _hand(
        self,
        level: Level,
        hand: Hand,
        ring: RingPlan | None,
        pos: tuple[float, float],
        dial: str,
    ) -> HandPlan:
        design = self.design
        shape: ItemSeat = level.shape  # type: ignore[assignment]  # from seat_shape
        across = _across(self.layout, level.member, shape)
        clearance = seat_clearance(design, shape)
        hub = _hub(design, shape, across, clearance)
        if hand.length is not None:
            length = hand.length
        elif ring is not None:
            length = round(ring.outer - 0.3 * ring.width, 3)
        else:
            length = hub
        nozzle = 2 * design.process.nozzle if design.process.kind == "print" else 0.0
        width = (
            hand.width
            if hand.width is not None
            else max(1.2, 2 * nozzle, 0.07 * length)
        )
        width = round(min(width, hub), 3)
        tip = round(max(0.25 * width, nozzle, 0.3), 3)
        tail = hand.tail if hand.tail is not None else round(0.2 * length, 3)
        angle = 90.0
        if ring is not None:
            units = ring.scale.units
            angle = ring.zero_deg + ring.sense * float(
                360 * Fraction(hand.rest).limit_denominator(10**9) / units
            )
        rate = self.rates.get(level.member)
        part = HandPart(
            name=hand_part_name(level.member),
            arbor=level.member,
            length=length,
            tail=tail,
            width=width,
            tip=min(tip, width),
            hub=hub,
            counterweight=hand.counterweight,
            thickness=level.thickness,
            seat=shape,
            across=across,
            clearance=clearance,
            round_radius=_corner(design),
            # the member's square or flat stands at angle 0 in the assembly
            seat_angle_deg=round((-angle) % (90.0 if shape == "square" else 360.0), 9),
            collet=hub if shape == "collet" else 0.0,
            collet_length=round(level.z1 - level.z0 - level.thickness, 6)
            if shape == "collet"
            else 0.0,
            placement=Pose(pos[0], pos[1], level.z0, round(angle % 360.0, 9)),
        )
        return HandPlan(part, level, dial, ring, rate)

    # -- knob or crank ----------------------------------------------------------------
    def _input(self, items: list[Level]) -> InputPlan | None:
        design = self.design
        level = next((i for i in items if i.role in ("knob", "crank")), None)
        if level is None:
            return None
        pos = self.layout.position(level.member)
        if pos is None:
            return None
        shape: ItemSeat = level.shape  # type: ignore[assignment]  # from seat_shape
        across = _across(self.layout, level.member, shape)
        clearance = seat_clearance(design, shape)
        hub = _hub(design, shape, across, clearance)
        inp = design.drive_input
        name = input_part_name(level.role, level.member)
        if level.role == "knob":
            d = inp.diameter if inp.diameter is not None else KNOB_DIAMETER
            d = max(d, hub)
            part: KnobPart | CrankPart = KnobPart(
                name, level.member, d, level.thickness, shape, across, clearance,
                _corner(design), Pose(pos[0], pos[1], level.z0, 0.0),
            )  # fmt: skip
            return InputPlan(part, level, d / 2)
        handle = inp.diameter if inp.diameter is not None else CRANK_HANDLE_DIAMETER
        throw = inp.throw if inp.throw is not None else CRANK_THROW
        arm = max(handle + 2.0, 0.5 * hub)
        back = level.side == "back"
        z = level.seat[0]  # the arm's back face
        part = CrankPart(
            name, level.member, throw, max(hub, arm), arm, level.thickness, handle,
            level.z1 - level.z0 - level.thickness, back, shape, across, clearance,
            _corner(design), Pose(pos[0], pos[1], z, 0.0),
        )  # fmt: skip
        return InputPlan(part, level, throw + max(handle, arm) / 2)


def _groups(design: Design) -> dict[str, list[str]]:
    from ..layout.sleeves import coaxial_groups

    return coaxial_groups(design)


def _engraving(
    rings: list[RingPlan],
) -> tuple[
    tuple[tuple[float, float], ...],
    tuple[tuple[float, float, float, float], ...],
    tuple[tuple[float, float, float, float, str], ...],
]:
    """Circles, strokes and texts of the rings (mm, degrees), in a fixed order.

    A ring's outer circle bounds its marks; a main mark runs a third of the ring's
    width in, a middle one a quarter, a fine one a sixth; numbers sit upright to the
    reader inside the main marks, notes (phases, months) on an inner row along it.
    """
    circles: list[tuple[float, float]] = []
    strokes: list[tuple[float, float, float, float]] = []
    texts: list[tuple[float, float, float, float, str]] = []
    for ring in rings:
        w = ring.width
        line = round(max(0.15, w / 40), 3)
        circles.append((round(ring.outer, 4), line))
        depth = {0: w / 3, 1: w / 4, 2: w / 6}
        for m in ring.scale.marks:
            a = ring.angle_deg(m.value)
            if m.rank in depth:
                width = line * (2.0 if m.rank == 0 else 1.0)
                strokes.append(
                    (round(a % 360.0, 9), round(ring.outer - depth[m.rank], 4),
                     round(ring.outer, 4), round(width, 3))
                )  # fmt: skip
            rad = math.radians(a)
            th = ring.text_height
            # an upright number's box reaches (W |cos a| + H |sin a|) / 2 towards the
            # centre: it stands just inside the main marks whatever its angle; a word
            # runs along the ring and reaches H / 2
            word = not m.label.replace(".", "").isdigit()
            half = th / 2
            if not word:
                half = (_TEXT_WIDTH * th * len(m.label) * abs(math.cos(rad))
                        + th * abs(math.sin(rad))) / 2  # fmt: skip
            for text, r, size, along in (
                (m.label, ring.outer - w / 3 - 0.3 - half, th, word),
                (m.note, ring.outer - w / 3 - 0.6 - 1.95 * th, 0.7 * th, True),
            ):  # fmt: skip
                if not text:
                    continue
                # numbers stand upright; words run along the ring, their top away from
                # the centre on the upper half and towards it on the lower half
                turn = 0.0
                if along:
                    turn = a - 90.0 + (180.0 if math.sin(rad) < -1e-9 else 0.0)
                texts.append(
                    (round(r * math.cos(rad), 4), round(r * math.sin(rad), 4),
                     round(size, 3), round(turn % 360.0, 6), text)
                )  # fmt: skip
    return tuple(circles), tuple(strokes), tuple(texts)
