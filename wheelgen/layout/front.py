"""The display's axial stack: dials, hands, knob or crank, and how far each arbor reaches.

Everything shown stands in front of the front plate (a knob or crank may stand behind the
back plate instead). Heights, in mm, from the front plate's outer face ``F``:

- every dial's back lies :func:`dial_gap` in front of ``F``, on feet; all dials share
  that level, so a hand or knob of one axis clears the dial of another, and a knob or
  crank stands no nearer the plate than the dials (clear of the screw heads on it);
- on each axis the hands follow in telescoping order: the hand on the outermost tube
  first, ``hand_gap`` in front of the dial, then the next member inside it, each
  ``hand_gap`` in front of the end of the member around it. A member ends
  :data:`SEAT_PROUD` in front of its hand (or its hand's collet), so each inner member
  stands proud of the one around it;
- a knob or crank at the front is one more item of the drive's axis in the same order;
  at the back it stands ``hand_gap`` behind the back plate's outer face.

Members that carry no item are not lengthened here: the stacking makes every member
reach at least as far as the tubes around it. This module says how far each member with
an item must reach; :mod:`wheelgen.layout.stacking` decides whether it can (a carried
arbor cannot, nor an arbor held by the other plate only).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from ..design.model import Design, Hand
from ..design.screws import screw
from ..kinematics.rates import axis_root

__all__ = [
    "SEAT_PROUD",
    "COLLET_LENGTH",
    "KNOB_LENGTH",
    "CRANK_ARM_THICKNESS",
    "CRANK_HANDLE_LENGTH",
    "Level",
    "DisplayLevels",
    "DIAL_GAP_MIN",
    "dial_gap",
    "dial_thickness",
    "hand_thickness",
    "input_side",
    "nesting_depth",
    "seat_shape",
    "display_levels",
]

#: mm a member stands in front of the hand it carries, so the hand sits fully on its
#: seat (common practice, no source).
SEAT_PROUD = 0.5
#: mm, length of a hand's friction collet, a boss on its front face (common practice,
#: no source).
COLLET_LENGTH = 1.5
#: mm, length of a knob along its axis (common practice, no source).
KNOB_LENGTH = 8.0
#: mm, thickness of a crank's arm; its handle stands this long on the arm's outer face
#: (common practice, no source).
CRANK_ARM_THICKNESS = 2.5
CRANK_HANDLE_LENGTH = 12.0

#: mm, the least gap between the front plate and the dials (room for the feet and a
#: finger; common practice, no source).
DIAL_GAP_MIN = 2.0
#: mm a dial keeps above the heads of the frame's screws on the front plate.
_HEAD_CLEARANCE = 0.5

Role = Literal["hand", "knob", "crank"]


@dataclass(frozen=True, slots=True)
class Level:
    """One item on a member's end: where it stands and how far the member reaches (mm).

    ``z0``..``z1`` is the item (a hand with its collet, a knob, a crank arm with its
    handle); ``seat`` the part of the member it is held on; ``reach`` the member's end
    (in front for ``side == "front"``, behind the back plate for ``"back"``).
    """

    member: str
    role: Role
    side: Literal["front", "back"]
    z0: float
    z1: float
    seat: tuple[float, float]
    reach: float
    shape: str  # "square", "flat" or "collet"
    thickness: float  # of the flat part (a hand's or crank arm's plate), mm


@dataclass(frozen=True, slots=True)
class DisplayLevels:
    """Every item's level, each dial's level by axis, and items that hide each other.

    ``dials`` maps an axis (its innermost member) to the dial's ``(z0, z1)``;
    ``crossed`` lists pairs of members on one axis that both carry an item although
    neither surrounds the other, so one item would be hidden behind the other's tube.
    """

    items: tuple[Level, ...]
    dials: dict[str, tuple[float, float]]
    crossed: tuple[tuple[str, str], ...]
    front_face: float | None
    back_face: float | None

    def of(self, member: str) -> tuple[Level, ...]:
        """The items on ``member``."""
        return tuple(i for i in self.items if i.member == member)


def dial_gap(design: Design) -> float:
    """From the front plate's outer face to the dials' back (mm): the design's, else
    :data:`DIAL_GAP_MIN`, or more to clear the heads of the frame's screws (ISO 4762
    head height of ``[frame] screw``) by 0.5 mm."""
    if design.display.dial_gap is not None:
        return design.display.dial_gap
    head = screw(design.frame.screw).head_height if design.frame is not None else 0.0
    return max(DIAL_GAP_MIN, head + _HEAD_CLEARANCE)


def dial_thickness(design: Design) -> float:
    """Thickness (mm) of the dial discs: the design's, else 1.6 printed, 1.0 otherwise.

    A printed disc of 8 layers of 0.2 mm stays flat; 1 mm sheet for a cut dial (common
    practice, no source).
    """
    if design.display.dial_thickness is not None:
        return design.display.dial_thickness
    return 1.6 if design.process.kind == "print" else 1.0


def hand_thickness(design: Design, hand: Hand | None = None) -> float:
    """Thickness (mm) of a hand: its own, the design's, else by process.

    Printed: at least 1.2 mm and ``min_layers`` layers; cut from sheet: 0.8 mm
    (common practice, no source).
    """
    if hand is not None and hand.thickness is not None:
        return hand.thickness
    if design.display.hand_thickness is not None:
        return design.display.hand_thickness
    p = design.process
    return max(1.2, p.min_layers * p.layer) if p.kind == "print" else 0.8


def seat_shape(design: Design, member: str, hand: Hand | None = None) -> str:
    """How a hand (or, with ``hand=None``, the knob or crank) is held on ``member``.

    The hand's own ``seat``; else a friction collet on a tube (a square or a flat would
    thin its wall), and the process's seat on a solid arbor (square milled, flat
    printed, collet made by hand).
    """
    if hand is not None and hand.seat is not None:
        return hand.seat
    if design.arbor(member).around is not None:
        return "collet"
    return design.process.hand_seat


def nesting_depth(design: Design, member: str) -> int:
    """How many tubes deep ``member`` lies: 0 for an axis's innermost member."""
    depth, a = 0, design.arbor(member)
    while a.around is not None:
        depth += 1
        a = design.arbor(a.around)
    return depth


def input_side(design: Design) -> Literal["front", "back"] | None:
    """Where the knob or crank goes, or ``None`` when the design has none.

    The design's ``side``; else the back when a hand stands on the drive's axis (the knob
    would cover the dial), else the front.
    """
    inp = design.drive_input
    if inp.kind == "none":
        return None
    if inp.side is not None:
        return inp.side
    root = axis_root(design, design.drive.arbor)
    hands = {axis_root(design, h.arbor) for h in design.readings()}
    return "back" if root in hands else "front"


def _inside(design: Design, inner: str, outer: str) -> bool:
    """Does ``outer`` surround ``inner`` (directly or through other tubes)?"""
    a = design.arbor(outer)
    while a.around is not None:
        if a.around == inner:
            return True
        a = design.arbor(a.around)
    return False


def display_levels(design: Design) -> DisplayLevels:
    """The axial level of every dial, hand, knob and crank (see the module docstring).

    Without a ``[frame]`` there is no front plate to stand in front of: no levels.
    """
    frame = design.frame
    if frame is None:
        return DisplayLevels((), {}, (), None, None)
    front_face = frame.plates[1] + frame.thickness
    back_face = frame.plates[0] - frame.thickness
    gap = design.display.hand_gap
    side = input_side(design)
    wanted: dict[str, list[tuple[str, Role, Hand | None]]] = {}
    names = {a.name for a in design.arbors}
    for h in design.readings():
        if h.arbor in names:
            wanted.setdefault(axis_root(design, h.arbor), []).append(
                (h.arbor, "hand", h)
            )
    drive = design.drive.arbor
    kind = design.drive_input.kind
    role: Role = "crank" if kind == "crank" else "knob"
    if side == "front":
        wanted.setdefault(axis_root(design, drive), []).append((drive, role, None))
    # a knob or crank alone stands at the dials' level: clear of the screw heads
    base = front_face + dial_gap(design)
    if any(r == "hand" for g in wanted.values() for _, r, _ in g):
        base += dial_thickness(design)
    items: list[Level] = []
    dials: dict[str, tuple[float, float]] = {}
    crossed: list[tuple[str, str]] = []
    for root in sorted(wanted, key=lambda r: [a.name for a in design.arbors].index(r)):
        group = sorted(wanted[root], key=lambda m: -nesting_depth(design, m[0]))
        if any(r == "hand" for _, r, _ in group):
            dials[root] = (round(base - dial_thickness(design), 6), round(base, 6))
        for (m, _, _), (n, _, _) in zip(group, group[1:]):
            if not _inside(design, n, m):
                crossed.append((m, n))
        cur = base
        for member, what, hand in group:
            shape = seat_shape(design, member, hand)
            if what == "hand":
                t = hand_thickness(design, hand)
                z0 = cur + gap
                z1 = z0 + t + (COLLET_LENGTH if shape == "collet" else 0.0)
                reach = z1 + SEAT_PROUD
            elif what == "knob":
                t = KNOB_LENGTH
                z0 = cur + gap
                z1 = reach = z0 + t
            else:
                t = CRANK_ARM_THICKNESS
                z0 = cur + gap
                z1 = z0 + t + CRANK_HANDLE_LENGTH
                reach = z0 + t
            z0, z1, reach = round(z0, 6), round(z1, 6), round(reach, 6)
            items.append(
                Level(member, what, "front", z0, z1, (z0, reach), reach, shape, t)
            )
            cur = reach
    if side == "back":
        shape = seat_shape(design, drive)
        if role == "knob":
            z1 = back_face - gap
            z0 = reach = z1 - KNOB_LENGTH
            t = KNOB_LENGTH
        else:
            t = CRANK_ARM_THICKNESS
            z1 = back_face - gap
            reach = z1 - t
            z0 = reach - CRANK_HANDLE_LENGTH
        z0, z1, reach = round(z0, 6), round(z1, 6), round(reach, 6)
        items.append(Level(drive, role, "back", z0, z1, (reach, z1), reach, shape, t))
    return DisplayLevels(tuple(items), dials, tuple(crossed), front_face, back_face)
