"""Every part to make, as plain numbers: the contract between layout and the CAD layer.

The layout layer fills these from the design; ``wheelgen.solids`` turns each into a solid
and ``wheelgen.export`` writes it. Lengths in mm, angles in degrees. A placement puts the
part's own frame (axis along +Z, back face at z = 0) into the assembly.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal, TypeGuard, Union

from ..teeth.spec import ToothSpec

__all__ = [
    "Pose",
    "SlotCut",
    "PinBoss",
    "WheelPart",
    "TurnedSection",
    "ArborPart",
    "SleevePart",
    "CollarPart",
    "PinPart",
    "FlatEdge",
    "FlatHole",
    "PlatePart",
    "PillarPart",
    "CockPart",
    "ScrewPart",
    "BearingPart",
    "BOUGHT_KINDS",
    "FLAT_KINDS",
    "HandPart",
    "DialPart",
    "KnobPart",
    "CrankPart",
    "Part",
    "SeatShape",
    "DISPLAY_KINDS",
    "TURNED_KINDS",
    "ItemSeat",
    "TurnedPart",
    "DisplayPart",
    "is_turned",
    "is_display",
]

SeatShape = Literal["round", "square", "hex", "pinned", "flat"]
#: How a hand, knob or crank is held on its member (see wheelgen.layout.front).
ItemSeat = Literal["square", "flat", "collet"]


@dataclass(frozen=True, slots=True)
class Pose:
    """Where the part's frame sits in the assembly: origin (mm) and turn about Z (degrees)."""

    x: float = 0.0
    y: float = 0.0
    z: float = 0.0
    angle_deg: float = 0.0


@dataclass(frozen=True, slots=True)
class SlotCut:
    """A radial slot through a wheel: centre line along +X of the wheel's frame.

    ``inner`` and ``outer`` are the radii (mm) of the slot's end centres; ``width`` in mm;
    the ends are semicircles of radius ``width / 2`` (never below the cutter radius).
    """

    inner: float
    outer: float
    width: float
    angle_deg: float = 0.0


@dataclass(frozen=True, slots=True)
class PinBoss:
    """A round pin standing on the wheel's front face at ``radius`` mm along ``angle_deg``."""

    radius: float
    diameter: float
    length: float
    angle_deg: float = 0.0
    hole_only: bool = False  # True: only a hole for a separate pin part


@dataclass(frozen=True, slots=True)
class WheelPart:
    """One wheel, in its own frame: a tooth centred on +X, back face on z = 0.

    ``bore`` is the seat hole's size (diameter, or across flats of a square or hex
    seat), ``bore_fit`` says what sets it; ``seat_angle_deg`` turns a polygon seat and
    the cross-pin hole, ``spoke_angle_deg`` the spokes (an arm on that direction), so
    that in the assembly they meet the tube's flats and the carried arbors. ``holes``
    are extra through holes ``(x, y, diameter)`` (mm): the running bores of the arbors
    this wheel carries. ``placement.angle_deg`` is the wheel's angle at rest.
    """

    name: str
    tooth: ToothSpec
    face_width: float
    bore: float
    seat: SeatShape = "round"
    spokes: int = 0
    rim: float = 0.0
    hub_diameter: float = 0.0
    hub_length: float = 0.0
    round_radius: float = 0.0  # smallest inside corner radius (mill: cutter radius)
    slot: SlotCut | None = None
    pin: PinBoss | None = None
    holes: tuple[
        tuple[float, float, float], ...
    ] = ()  # extra through holes (x, y, diameter)
    placement: Pose = Pose()
    kind: Literal["wheel"] = "wheel"
    bore_fit: str = ""
    seat_angle_deg: float = 0.0
    spoke_angle_deg: float = 0.0


@dataclass(frozen=True, slots=True)
class TurnedSection:
    """One length of an arbor's or tube's outside, in the part's frame (mm).

    ``z0`` to ``z1`` from the part's back end. ``role`` says what the length is for:
    ``"pivot"`` (it runs in a plate, a cock, a bush or bearing, or the wheel that
    carries it), ``"held"`` (fixed in a plate), ``"seat"`` (a wheel is fixed on it),
    ``"item"`` (a hand, knob or crank), ``"under"`` (a tube turns on it),
    ``"shoulder"`` (a stop turned on it), ``"collar"`` (a tube's thrust collar) or
    ``"plain"``; ``what`` names the part it meets. ``diameter`` is the round it is
    turned to; a ``"square"``, ``"hex"`` or ``"flat"`` ``shape`` is milled or filed on
    that round to ``across`` flats. ``zone`` is the ISO 286 zone of a fitted length
    (``""`` when none applies), ``low`` and ``high`` its limits (of ``across`` for a
    polygon).
    """

    z0: float
    z1: float
    diameter: float
    role: str
    what: str = ""
    shape: str = "round"
    across: float = 0.0
    zone: str = ""
    low: float = 0.0
    high: float = 0.0


@dataclass(frozen=True, slots=True)
class ArborPart:
    """A round shaft, ``length`` mm long from z = 0 upward.

    ``seats`` are (z_from, z_to, shape) lengths of it milled square or hex for a wheel,
    drilled for a cross pin, or milled square or filed flat for a hand, knob or crank
    (mm, in the part's frame); ``collars`` (z_from, z_to, diameter) the shoulders
    turned on it. ``sections`` describe every length as made (its role and fit),
    ``stock`` is the bar it is turned from (mm; 0: not worked out); ``notes`` say how
    its wheels and collars are fixed and what sets its end shake.
    """

    name: str
    diameter: float
    length: float
    placement: Pose = Pose()
    seats: tuple[tuple[float, float, SeatShape], ...] = ()
    kind: Literal["arbor"] = "arbor"
    collars: tuple[tuple[float, float, float], ...] = ()
    sections: tuple[TurnedSection, ...] = ()
    stock: float = 0.0
    notes: tuple[str, ...] = ()


@dataclass(frozen=True, slots=True)
class SleevePart:
    """A tube turning on the member inside it; seats are (z_from, z_to, shape) on its
    outside, collars and shoulders (z_from, z_to, diameter) turned on it.

    ``sections`` describe every length of the outside as made; the bore's ISO 286
    limits are ``bore_zone``, ``bore_low`` and ``bore_high`` (mm; no zone when
    printed); ``stock`` is the bar or tube it is turned from (0: not worked out);
    ``notes`` say how its wheels are fixed.
    """

    name: str
    inside: float
    outside: float
    length: float
    seats: tuple[tuple[float, float, SeatShape], ...] = ()
    collars: tuple[tuple[float, float, float], ...] = ()  # (z_from, z_to, diameter)
    placement: Pose = Pose()
    kind: Literal["sleeve"] = "sleeve"
    sections: tuple[TurnedSection, ...] = ()
    bore_zone: str = ""
    bore_low: float = 0.0
    bore_high: float = 0.0
    stock: float = 0.0
    notes: tuple[str, ...] = ()


@dataclass(frozen=True, slots=True)
class CollarPart:
    """A collar: a ring fixed on ``member`` as a stop, ``length`` mm long from z = 0.

    ``inside`` is its modelled bore, with ISO 286 limits ``bore_zone``, ``bore_low``
    and ``bore_high`` (no zone when printed); ``fixing`` says how it is held (mm).
    """

    name: str
    member: str
    inside: float
    outside: float
    length: float
    fixing: str
    placement: Pose = Pose()
    bore_zone: str = ""
    bore_low: float = 0.0
    bore_high: float = 0.0
    kind: Literal["collar"] = "collar"


@dataclass(frozen=True, slots=True)
class PinPart:
    """A separate round pin (for a pin-and-slot coupling), ``length`` mm long."""

    name: str
    diameter: float
    length: float
    placement: Pose = Pose()
    kind: Literal["pin"] = "pin"


@dataclass(frozen=True, slots=True)
class FlatEdge:
    """One piece of a flat part's outline: a ``line`` (2 points) or an ``arc`` (start,
    a point on it, end), in mm in the part's own frame."""

    kind: Literal["line", "arc"]
    points: tuple[tuple[float, float], ...]


@dataclass(frozen=True, slots=True)
class FlatHole:
    """A round hole through a flat part: centre and diameter (mm), what it is for.

    ``role`` groups holes by their use (``"pivot"``, ``"held"``, ``"bush"``,
    ``"bearing"``, ``"pillar"``, ``"screw"``, ``"mounting"``): each group gets its own
    layer in the DXF. ``label`` names what goes through it.
    """

    x: float
    y: float
    diameter: float
    role: str
    label: str


@dataclass(frozen=True, slots=True)
class PlatePart:
    """A frame plate: a closed outline (counter-clockwise) with round holes, ``thickness``
    mm thick from z = 0 up. Its frame is the design's own (x, y as the arbors' ``at``)."""

    name: str
    thickness: float
    outline: tuple[FlatEdge, ...]
    holes: tuple[FlatHole, ...]
    placement: Pose = Pose()
    kind: Literal["plate"] = "plate"


@dataclass(frozen=True, slots=True)
class PillarPart:
    """A pillar between the plates, standing on z = 0 along +Z.

    ``spigot`` > 0: a turned pillar with a spigot of that diameter at each end, passing
    through the plates (``back_spigot`` and ``front_spigot`` mm long); 0: a plain bar.
    ``length`` is the body between the plates' inner faces. Each end may have a blind
    hole (``*_hole`` diameter, ``*_depth`` deep; 0: none) for a screw.
    """

    name: str
    diameter: float
    length: float
    spigot: float = 0.0
    back_spigot: float = 0.0
    front_spigot: float = 0.0
    back_hole: float = 0.0
    back_depth: float = 0.0
    front_hole: float = 0.0
    front_depth: float = 0.0
    placement: Pose = Pose()
    kind: Literal["pillar"] = "pillar"


@dataclass(frozen=True, slots=True)
class CockPart:
    """A cock (bridge) that holds an arbor's second pivot, screwed to a plate.

    In its own frame the pivot is on the origin and the bar runs along +X to ``length``
    (the centre of its far end), ``width`` wide with round ends and ``thickness``
    thick. A foot of the same width stands from ``foot_from`` to ``length`` along the
    bar and ``foot_height`` high, on the plate: below the bar (``hanging`` false, the
    foot's face on z = 0) or above it (``hanging`` true, the bar's face on z = 0).
    ``pivot_hole`` is the hole for the arbor (mm); ``screws`` are the x positions of the
    tapped holes for its screws, ``screw_hole`` across and ``screw_depth`` deep from
    the foot's face (through foot and bar when that is their height).
    """

    name: str
    length: float
    width: float
    thickness: float
    foot_from: float
    foot_height: float
    pivot_hole: float
    screws: tuple[float, ...]
    screw_hole: float
    screw_depth: float
    hanging: bool = False
    placement: Pose = Pose()
    kind: Literal["cock"] = "cock"


@dataclass(frozen=True, slots=True)
class ScrewPart:
    """A bought socket head cap screw, drawn as fitted: its head and the core of its
    thread (so it never seems to overlap the tapped hole it holds in). Head down on
    z = 0 unless ``head_up`` (then the shank stands on z = 0 and the head on top)."""

    name: str
    size: str  # "M3"
    length: float  # under the head
    head_diameter: float
    head_height: float
    core: float
    head_up: bool = False
    placement: Pose = Pose()
    kind: Literal["screw"] = "screw"


@dataclass(frozen=True, slots=True)
class BearingPart:
    """A bought bush or ball bearing from the design's stock list: a ring ``width`` mm
    long from z = 0 up; ``stock_kind`` is ``"bush"`` or ``"bearing"``."""

    name: str
    inside: float
    outside: float
    width: float
    stock_kind: str
    placement: Pose = Pose()
    kind: Literal["bearing"] = "bearing"


@dataclass(frozen=True, slots=True)
class HandPart:
    """A hand: a flat blade along +X of its frame, seated on ``arbor`` (mm).

    The blade runs from the axis to the tip at ``length`` (``width`` wide at the hub,
    ``tip`` wide at the end), a tail of ``tail`` behind the axis, ending in a round
    counterweight ``counterweight`` across (0: none). The hub is ``hub`` across; the
    seat hole fits ``across`` (the square's or flat's size on the member, or its
    diameter for a collet) opened by ``clearance`` a side, turned by ``seat_angle_deg``
    in the hand's frame (so that the hand reads right on a square or flat that stands
    at the member's angle). A collet is a boss ``collet`` across and ``collet_length``
    long on the front face. The placement's angle is the hand's direction at rest.
    """

    name: str
    arbor: str
    length: float
    tail: float
    width: float
    tip: float
    hub: float
    counterweight: float
    thickness: float
    seat: ItemSeat
    across: float
    clearance: float
    round_radius: float = 0.0
    seat_angle_deg: float = 0.0
    collet: float = 0.0
    collet_length: float = 0.0
    placement: Pose = Pose()
    kind: Literal["hand"] = "hand"


@dataclass(frozen=True, slots=True)
class DialPart:
    """A dial disc on feet, with its graduations as engraving (mm, degrees).

    The frame's z = 0 is the face the feet stand on (the front plate's outer face); the
    disc is ``thickness`` thick from ``foot_length`` up. ``holes`` (x, y, diameter) go
    through the disc; ``feet`` (x, y) are round feet ``foot_diameter`` across, each
    ending in a pin ``foot_pin`` across and ``pin_length`` long below z = 0, through the
    plate (riveted or glued behind it). The engraving
    is on the disc's front: ``circles`` (radius, line width), ``strokes`` (angle,
    radius from, radius to, line width) and ``texts`` (x, y, height, turn of the text in
    degrees counter-clockwise, text), each in the dial's frame.
    """

    name: str
    radius: float
    thickness: float
    foot_length: float
    foot_diameter: float
    foot_pin: float
    pin_length: float
    feet: tuple[tuple[float, float], ...]
    holes: tuple[tuple[float, float, float], ...]
    circles: tuple[tuple[float, float], ...] = ()
    strokes: tuple[tuple[float, float, float, float], ...] = ()
    texts: tuple[tuple[float, float, float, float, str], ...] = ()
    placement: Pose = Pose()
    kind: Literal["dial"] = "dial"


@dataclass(frozen=True, slots=True)
class KnobPart:
    """A round knob ``diameter`` across and ``length`` long, seated on the drive (mm)."""

    name: str
    arbor: str
    diameter: float
    length: float
    seat: ItemSeat
    across: float
    clearance: float
    round_radius: float = 0.0
    placement: Pose = Pose()
    kind: Literal["knob"] = "knob"


@dataclass(frozen=True, slots=True)
class CrankPart:
    """A crank: an arm along +X with a handle at ``throw`` mm, seated on the drive.

    The arm is ``thickness`` thick and ``arm`` wide, round at both ends (``hub`` across
    at the axis); the handle, ``handle_diameter`` across and ``handle_length`` long,
    stands on the arm's front face, or on its back face when ``handle_back``.
    """

    name: str
    arbor: str
    throw: float
    hub: float
    arm: float
    thickness: float
    handle_diameter: float
    handle_length: float
    handle_back: bool
    seat: ItemSeat
    across: float
    clearance: float
    round_radius: float = 0.0
    placement: Pose = Pose()
    kind: Literal["crank"] = "crank"


Part = Union[
    WheelPart,
    ArborPart,
    SleevePart,
    CollarPart,
    PinPart,
    PlatePart,
    PillarPart,
    CockPart,
    ScrewPart,
    BearingPart,
    HandPart,
    DialPart,
    KnobPart,
    CrankPart,
]

#: Kinds of part that are bought, not made: no part files, only in the assembly.
BOUGHT_KINDS = frozenset({"screw", "bearing"})
#: Kinds of part that are flat (a profile cut from sheet): DXF and SVG as well.
FLAT_KINDS = frozenset({"wheel", "plate", "hand", "dial", "crank"})
#: Kinds of part turned on a lathe (or printed round): a side view drawn to scale with
#: every diameter and its fit, as SVG and DXF.
TURNED_KINDS = frozenset({"arbor", "sleeve", "collar"})
#: Kinds of part that the display adds (wheelgen.display).
DISPLAY_KINDS = frozenset({"hand", "dial", "knob", "crank"})

#: The part kinds of :data:`TURNED_KINDS`.
TurnedPart = Union[ArborPart, SleevePart, CollarPart]
#: The part kinds of :data:`DISPLAY_KINDS`.
DisplayPart = Union[HandPart, DialPart, KnobPart, CrankPart]


def is_turned(part: Part) -> TypeGuard[TurnedPart]:
    """Is the part of a kind turned on a lathe (:data:`TURNED_KINDS`)?"""
    return part.kind in TURNED_KINDS


def is_display(part: Part) -> TypeGuard[DisplayPart]:
    """Is the part one the display adds (:data:`DISPLAY_KINDS`)?"""
    return part.kind in DISPLAY_KINDS
