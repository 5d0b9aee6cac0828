"""The motion law of a pin-and-slot coupling between two offset axes.

A pin at radius ``r`` on the pin wheel (axis A) drives a radial slot in the slot wheel
(axis B); B lies at distance ``e`` (the offset) from A in the direction of the offset
line. In the triangle A, B, pin the angle at the pin is the slot wheel's deviation
``delta`` from the pin wheel, and the rule of sines gives

    sin(delta) = (e / r) * sin(psi),     tan(delta) = e sin(u) / (r - e cos(u)),

with ``u`` the pin's angle and ``psi = u + delta`` the slot's angle, both measured from
the offset line (A towards B), counter-clockwise. The largest deviation is therefore
``arcsin(e / r)``, reached when the slot stands at right angles to the offset line
(``psi = +-90 deg``), i.e. at ``u = +-(90 deg - arcsin(e / r))``. This is the triangle of
the slotted-lever quick-return linkage and of the eccentric in planetary theory (see
docs/references.md, section 13, for published relatives).

Because ``e < r`` keeps ``r - e cos(u)`` positive, ``delta`` is a smooth, odd, periodic
function of ``u``: over a whole turn of the pin the slot turns exactly once too.

When both axes ride on a carrier (or, generally, stand still in a turning frame F),
the same law holds for angles relative to F: the offset line turns with the carrier.
The functions below take the frame's angle as ``frame_angle_deg``.

Angles are degrees at this boundary (counter-clockwise seen from the front, cumulative,
not wrapped); lengths in mm.
"""

from __future__ import annotations

from typing import cast

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = [
    "check_offset",
    "deviation_from_pin_deg",
    "deviation_from_slot_deg",
    "slot_angle_deg",
    "pin_angle_deg",
    "max_deviation_deg",
    "max_deviation_pin_angles_deg",
    "speed_ratio",
    "transmission_angle_deg",
    "pin_distance",
]

FloatArray = NDArray[np.float64]
# numpy's stubs type ufunc results as Any: cast(FloatArray, ...) below only tells mypy.


def check_offset(radius: float, offset: float) -> None:
    """Raise ``ValueError`` unless ``0 <= offset < radius`` (mm)."""
    if not (np.isfinite(radius) and radius > 0):
        raise ValueError(f"'radius' must be > 0 mm, got {radius}")
    if not (np.isfinite(offset) and offset >= 0):
        raise ValueError(f"'offset' must be >= 0 mm, got {offset}")
    if offset >= radius:
        raise ValueError(
            f"'offset' must be smaller than 'radius' ({radius} mm), got {offset} mm: "
            "the pin would pass through the slot wheel's axis"
        )


def deviation_from_pin_deg(
    u_deg: ArrayLike, radius: float, offset: float
) -> FloatArray:
    """Slot wheel's lead over the pin wheel (degrees) for pin angles ``u_deg``.

    ``u_deg`` is the pin's angle from the offset line in degrees (relative to the frame
    in which both axes stand still). Returns ``delta = psi - u`` in degrees, positive
    when the slot wheel is ahead counter-clockwise.
    """
    check_offset(radius, offset)
    u = np.radians(np.asarray(u_deg, dtype=float))
    # atan2 of the cross and dot product of the two radii (A->pin, B->pin): smooth, and
    # the denominator r - e cos u stays positive for e < r, so no branch jumps.
    return cast(
        FloatArray,
        np.degrees(np.arctan2(offset * np.sin(u), radius - offset * np.cos(u))),
    )


def deviation_from_slot_deg(
    psi_deg: ArrayLike, radius: float, offset: float
) -> FloatArray:
    """The same deviation ``delta`` (degrees), given the slot's angle ``psi_deg``.

    Rule of sines in the triangle A, B, pin: ``sin(delta) = (e / r) sin(psi)``. Used when
    the slot wheel drives the pin wheel.
    """
    check_offset(radius, offset)
    psi = np.radians(np.asarray(psi_deg, dtype=float))
    return cast(FloatArray, np.degrees(np.arcsin((offset / radius) * np.sin(psi))))


def slot_angle_deg(
    pin_deg: ArrayLike,
    radius: float,
    offset: float,
    frame_angle_deg: ArrayLike = 0.0,
) -> FloatArray:
    """Slot wheel's angle (degrees) for pin wheel angles ``pin_deg`` (degrees).

    Both wheel angles are cumulative, counter-clockwise, in the fixed frame, and zero
    where pin and slot lie on the offset line (the rest position). ``frame_angle_deg`` is
    the angle of the frame that carries both axes (0 for axes in the plates): the offset
    line turns with it. The law is ``slot = F + g(pin - F)``, ``g(u) = u + delta(u)``.
    """
    pin = np.asarray(pin_deg, dtype=float)
    frame = np.asarray(frame_angle_deg, dtype=float)
    return pin + deviation_from_pin_deg(pin - frame, radius, offset)


def pin_angle_deg(
    slot_deg: ArrayLike,
    radius: float,
    offset: float,
    frame_angle_deg: ArrayLike = 0.0,
) -> FloatArray:
    """Inverse of :func:`slot_angle_deg`: the pin wheel's angle (degrees) for slot angles."""
    slot = np.asarray(slot_deg, dtype=float)
    frame = np.asarray(frame_angle_deg, dtype=float)
    return slot - deviation_from_slot_deg(slot - frame, radius, offset)


def max_deviation_deg(radius: float, offset: float) -> float:
    """Largest deviation ``arcsin(e / r)`` in degrees (both the lead and the lag)."""
    check_offset(radius, offset)
    return float(np.degrees(np.arcsin(offset / radius)))


def max_deviation_pin_angles_deg(radius: float, offset: float) -> tuple[float, float]:
    """Pin angles from the offset line (degrees) of the largest lead and the largest lag.

    The slot then stands at right angles to the offset line: ``u = +-(90 - arcsin(e/r))``.
    """
    u = 90.0 - max_deviation_deg(radius, offset)
    return u, -u


def speed_ratio(u_deg: ArrayLike, radius: float, offset: float) -> FloatArray:
    """Slot wheel's angular speed over the pin wheel's (relative to the frame), at ``u_deg``.

    ``d psi / d u = r (r - e cos u) / (r^2 + e^2 - 2 r e cos u)``: largest, ``r / (r - e)``,
    with the pin on the near side of the offset line (``u = 0``, the fast point), smallest,
    ``r / (r + e)``, on the far side.
    """
    check_offset(radius, offset)
    u = np.radians(np.asarray(u_deg, dtype=float))
    r, e = radius, offset
    return cast(
        FloatArray,
        r * (r - e * np.cos(u)) / (r * r + e * e - 2.0 * r * e * np.cos(u)),
    )


def transmission_angle_deg(
    u_deg: ArrayLike, radius: float, offset: float
) -> FloatArray:
    """Angle (degrees) between the slot's line and the pin's path, at pin angles ``u_deg``.

    The contact force acts at right angles to the slot, the pin moves at right angles to
    its radius; the two radii meet at the pin at ``delta``, so the transmission angle is
    ``90 - |delta|`` (90 degrees is ideal). Smallest: ``90 - arcsin(e / r)``.
    """
    return 90.0 - np.abs(deviation_from_pin_deg(u_deg, radius, offset))


def pin_distance(u_deg: ArrayLike, radius: float, offset: float) -> FloatArray:
    """Distance (mm) from the slot wheel's axis to the pin centre, at pin angles ``u_deg``.

    Law of cosines: ``sqrt(r^2 + e^2 - 2 r e cos u)``, from ``r - e`` (``u = 0``) to
    ``r + e`` (``u = 180``): the pin's travel along the slot.
    """
    check_offset(radius, offset)
    u = np.radians(np.asarray(u_deg, dtype=float))
    x = radius * np.cos(u) - offset
    y = radius * np.sin(u)
    return cast(FloatArray, np.hypot(x, y))
