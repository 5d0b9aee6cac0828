"""Every part to make, as plain numbers: the contract between layout and the CAD layer.

The layout layer fills these from the design; ``wheelgen.solids`` turns each into a solid
and ``wheelgen.export`` writes it. Lengths in mm, angles in degrees. A placement puts the
part's own frame (axis along +Z, back face at z = 0) into the assembly.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal, Union

from ..teeth.spec import ToothSpec

__all__ = [
    "Placement",
    "SlotCut",
    "PinBoss",
    "WheelPart",
    "ArborPart",
    "SleevePart",
    "PinPart",
    "Part",
    "SeatShape",
]

SeatShape = Literal["round", "square", "hex", "pinned"]


@dataclass(frozen=True, slots=True)
class Placement:
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
    placement: Placement = Placement()
    kind: Literal["wheel"] = "wheel"
    bore_fit: str = ""
    seat_angle_deg: float = 0.0
    spoke_angle_deg: float = 0.0


@dataclass(frozen=True, slots=True)
class ArborPart:
    """A plain round shaft, ``length`` mm long from z = 0 upward."""

    name: str
    diameter: float
    length: float
    placement: Placement = Placement()
    kind: Literal["arbor"] = "arbor"


@dataclass(frozen=True, slots=True)
class SleevePart:
    """A tube turning on the member inside it; seats are (z_from, z_to, shape) on its outside."""

    name: str
    inside: float
    outside: float
    length: float
    seats: tuple[tuple[float, float, SeatShape], ...] = ()
    collars: tuple[tuple[float, float, float], ...] = ()  # (z_from, z_to, diameter)
    placement: Placement = Placement()
    kind: Literal["sleeve"] = "sleeve"


@dataclass(frozen=True, slots=True)
class PinPart:
    """A separate round pin (for a pin-and-slot coupling), ``length`` mm long."""

    name: str
    diameter: float
    length: float
    placement: Placement = Placement()
    kind: Literal["pin"] = "pin"


Part = Union[WheelPart, ArborPart, SleevePart, PinPart]
