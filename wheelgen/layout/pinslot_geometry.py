"""Sizes of a pin-and-slot coupling's parts: the slot cut, the pin boss or separate pin.

Rest position: the pin and the slot lie on the offset line, at ``bearing_deg`` in the
wheels' own frames (see :mod:`wheelgen.kinematics.angles`); a wheel placed at angle 0
then shows the coupling at rest.

Slot width (the choice, per process):

- ``print``: pin diameter plus twice ``[process].clearance``. That key is a *radial*
  running clearance (train format), and a pin between two slot walls needs it on each
  side, so the slot is wider by the diametral clearance ``2 * clearance``.
- ``mill``: pin diameter plus :data:`MILL_SLOT_PLAY`, and never narrower than the end
  mill (``[process].cutter``): a milled slot cannot be narrower than its cutter, and a
  wider cutter only adds play (the checks report it). The ISO 286 fit of bores is the
  arbors' concern and is not applied to the slot.
- ``hand``: pin diameter plus :data:`HAND_SLOT_PLAY` (a filed slot).

Slot length: from the slot wheel's axis the pin centre travels between ``r - e`` and
``r + e`` (law of cosines, :func:`wheelgen.kinematics.pinslot_motion.pin_distance`); the
slot's end centres lie :data:`SLOT_MARGIN` beyond that, and its ends are semicircles of
radius ``width / 2`` (at least the cutter radius when milling), which hold the pin.
Lengths in mm, angles in degrees.
"""

from __future__ import annotations

import math

from ..design.model import Design, PinSlot
from ..kinematics.pinslot_motion import check_offset
from .part_kinds import PinBoss, PinPart, Pose, SlotCut

__all__ = [
    "SLOT_MARGIN",
    "MILL_SLOT_PLAY",
    "HAND_SLOT_PLAY",
    "slot_width",
    "slot_cut",
    "pin_length",
    "pin_boss",
    "pin_part",
]

#: mm beyond the pin centre's travel at each end of the slot (common practice, no source).
SLOT_MARGIN = 0.2
#: mm, diametral play of a milled slot on its pin: a close running fit (common practice,
#: no source; about the largest clearance of H7/g6 at 1-3 mm, 18 um, ISO 286-2).
MILL_SLOT_PLAY = 0.02
#: mm, diametral play of a slot filed by hand (common practice, no source).
HAND_SLOT_PLAY = 0.05


def slot_width(design: Design, pinslot: PinSlot) -> float:
    """Width of the slot in mm for the design's process (see the module docstring)."""
    proc = design.process
    d = pinslot.pin_diameter
    if proc.kind == "print":
        return d + 2.0 * proc.clearance
    if proc.kind == "mill":
        return max(d + MILL_SLOT_PLAY, proc.cutter)
    return d + HAND_SLOT_PLAY


def slot_cut(design: Design, pinslot: PinSlot, margin: float = SLOT_MARGIN) -> SlotCut:
    """The slot to cut in the slot wheel, in that wheel's own frame.

    ``inner``/``outer`` are the radii (mm) of the end centres, ``r - e - margin`` and
    ``r + e + margin``; ``margin`` in mm. Raises ``ValueError`` when the offset is not
    below the radius or the slot would reach the wheel's axis.
    """
    check_offset(pinslot.radius, pinslot.offset)
    if not (math.isfinite(margin) and margin >= 0):
        raise ValueError(f"'margin' must be >= 0 mm, got {margin}")
    width = slot_width(design, pinslot)
    inner = pinslot.radius - pinslot.offset - margin
    outer = pinslot.radius + pinslot.offset + margin
    if inner - width / 2 <= 0:
        raise ValueError(
            f'pin-and-slot "{pinslot.name}": the slot would reach the wheel\'s axis '
            f"(inner end at {inner - width / 2:.3f} mm); make 'radius' larger or "
            "'offset' smaller"
        )
    return SlotCut(inner=inner, outer=outer, width=width, angle_deg=pinslot.bearing_deg)


def _axial_gap(design: Design, pinslot: PinSlot) -> float:
    pin_w, slot_w = design.wheel(pinslot.pin), design.wheel(pinslot.slot)
    gap = slot_w.height - (pin_w.height + pin_w.face_width)
    if gap < 0:
        raise ValueError(
            f'pin-and-slot "{pinslot.name}": the slot wheel "{slot_w.name}" (back face at '
            f'{slot_w.height} mm) must sit in front of the pin wheel "{pin_w.name}" '
            f"(front face at {pin_w.height + pin_w.face_width} mm)"
        )
    return gap


def pin_length(design: Design, pinslot: PinSlot) -> float:
    """Length (mm) of the pin above the pin wheel's front face.

    It bridges the axial gap between the wheels and passes through the slot wheel to its
    front face: ``gap + slot wheel face width``.
    """
    return _axial_gap(design, pinslot) + design.wheel(pinslot.slot).face_width


def pin_boss(design: Design, pinslot: PinSlot) -> PinBoss:
    """The pin on the pin wheel (``pin_part = "boss"``), or its hole (``"separate"``).

    In the pin wheel's own frame; ``diameter`` is the pin's, also for the hole (a press
    fit: the CAD layer sizes the hole for its process).
    """
    check_offset(pinslot.radius, pinslot.offset)
    return PinBoss(
        radius=pinslot.radius,
        diameter=pinslot.pin_diameter,
        length=pin_length(design, pinslot),
        angle_deg=pinslot.bearing_deg,
        hole_only=pinslot.pin_part == "separate",
    )


def pin_part(
    design: Design, pinslot: PinSlot, wheel_placement: Pose | None = None
) -> PinPart:
    """The separate pin (``pin_part = "separate"``), through the pin wheel and the slot.

    Length = pin wheel face width + :func:`pin_length`. ``wheel_placement`` is the pin
    wheel's placement in the assembly; the pin's placement follows from it (its back end
    flush with the pin wheel's back face). Named ``<coupling>_pin``.
    """
    if pinslot.pin_part != "separate":
        raise ValueError(
            f'pin-and-slot "{pinslot.name}" has pin_part "{pinslot.pin_part}", '
            "not 'separate': the pin is a boss on its wheel"
        )
    boss = pin_boss(design, pinslot)
    face = design.wheel(pinslot.pin).face_width
    if wheel_placement is None:
        wheel_placement = Pose()
    turn = math.radians(wheel_placement.angle_deg + boss.angle_deg)
    where = Pose(
        x=wheel_placement.x + boss.radius * math.cos(turn),
        y=wheel_placement.y + boss.radius * math.sin(turn),
        z=wheel_placement.z,
        angle_deg=0.0,
    )
    return PinPart(
        name=f"{pinslot.name}_pin",
        diameter=pinslot.pin_diameter,
        length=face + boss.length,
        placement=where,
    )
