"""A wheel's flat profile as plain numbers: the toothed outline and every hole.

This module is pure numeric (numpy only, no CAD kernel): the solid builder extrudes the
profile, and the DXF and SVG writers draw the very same loops, so a sheet template and
the STEP file cannot disagree. Lengths in mm, angles in degrees at the boundary.

Holes are closed chains of :class:`~wheelgen.teeth.outline.Segment` running
counter-clockwise (the solid builder reverses them), or full circles.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

import numpy as np

from ..teeth.outline import Segment, SegmentKind, WheelOutline
from .part_kinds import WheelPart

__all__ = [
    "Hole",
    "HoleRole",
    "PlateProfile",
    "cross_pin_diameter",
    "plate_profile",
    "seat_extent",
    "spoke_sizes",
]

HoleRole = Literal["bore", "window", "slot", "pin_hole", "arbor_hole"]


@dataclass(frozen=True, slots=True, eq=False)
class Hole:
    """One hole through the plate: a full circle or a closed CCW chain of segments."""

    role: HoleRole
    segments: tuple[Segment, ...] = ()
    circle: tuple[float, float, float] | None = None  # (x, y, radius) in mm

    def polyline(self, chord_tol: float) -> np.ndarray:
        """The loop as an ``(n, 2)`` array in mm, first point not repeated."""
        if self.circle is not None:
            x, y, r = self.circle
            step = 2 * math.acos(max(-1.0, 1 - chord_tol / r)) if chord_tol < r else 1.0
            n = max(8, int(math.ceil(2 * math.pi / step)))
            t = np.linspace(0.0, 2 * math.pi, n, endpoint=False)
            return np.column_stack((x + r * np.cos(t), y + r * np.sin(t)))
        return np.vstack([s.polyline(chord_tol)[:-1] for s in self.segments])


@dataclass(frozen=True, slots=True, eq=False)
class PlateProfile:
    """The toothed outline plus holes; ``pitch_radius`` in mm for drawings."""

    outline: WheelOutline
    holes: tuple[Hole, ...]
    pitch_radius: float
    root_radius: float
    tip_radius: float


def _pol(r: float, a_rad: float) -> np.ndarray:
    return np.array([r * math.cos(a_rad), r * math.sin(a_rad)])


def _rot(points: np.ndarray, a_rad: float) -> np.ndarray:
    c, s = math.cos(a_rad), math.sin(a_rad)
    turned: np.ndarray = points @ np.array([[c, -s], [s, c]]).T
    return turned


def _arc_about_origin(r: float, a0: float, a1: float) -> Segment:
    """Arc of radius r about the origin from angle a0 to a1 (radians, either sense)."""
    return Segment("arc", np.array([_pol(r, a0), _pol(r, (a0 + a1) / 2), _pol(r, a1)]))


def _circle_hole(role: HoleRole, x: float, y: float, r: float) -> Hole:
    return Hole(role, circle=(float(x), float(y), float(r)))


def _polygon_hole(
    role: HoleRole, sides: int, across_flats: float, corner: float
) -> Hole:
    """A regular polygon centred on the origin, flats first at +X, corners rounded."""
    apothem = across_flats / 2
    half = math.pi / sides
    corner = min(corner, apothem * 0.9)
    segs: list[Segment] = []
    for k in range(sides):
        a = 2 * half * k + half  # direction of corner k
        if corner <= 0:
            p0 = _pol(apothem / math.cos(half), a - 2 * half)
            p1 = _pol(apothem / math.cos(half), a)
            segs.append(Segment("line", np.array([p0, p1])))
            continue
        # fillet centre on the corner bisector, tangent to both flats
        d = (apothem - corner) / math.cos(half)
        c = _pol(d, a)
        t_in = c + _pol(corner, a - half)  # tangent point on the flat before the corner
        t_out = c + _pol(corner, a + half)
        mid = c + _pol(corner, a)
        prev_c = _pol(d, a - 2 * half)
        prev_out = prev_c + _pol(corner, a - half)
        segs.append(Segment("line", np.array([prev_out, t_in])))
        segs.append(Segment("arc", np.array([t_in, mid, t_out])))
    return Hole(role, tuple(segs))


def seat_extent(seat: str, bore: float) -> float:
    """Largest radius (mm) of the seat hole; ``bore``: diameter or across flats."""
    if seat == "square":
        return bore / 2 / math.cos(math.pi / 4)
    if seat == "hex":
        return bore / 2 / math.cos(math.pi / 6)
    return bore / 2


def cross_pin_diameter(bore: float) -> float:
    """Diameter (mm) of the cross-pin hole of a ``pinned`` seat.

    A third of the bore, at least 0.5 mm, rounded to 0.1 mm (common practice, no source:
    a taper or roll pin of about a third of the shaft leaves two thirds of the shaft).
    """
    return max(0.5, round(bore / 3, 1))


def _seat_hole(part: WheelPart) -> Hole:
    if part.seat in ("square", "hex"):
        sides = 4 if part.seat == "square" else 6
        hole = _polygon_hole("bore", sides, part.bore, part.round_radius)
        if part.seat_angle_deg == 0.0:
            return hole
        return Hole(
            "bore", tuple(sg.rotated(part.seat_angle_deg) for sg in hole.segments)
        )
    return _circle_hole("bore", 0.0, 0.0, part.bore / 2)


def spoke_sizes(part: WheelPart, root_radius: float) -> tuple[float, float, float]:
    """Window inner radius, window outer radius and arm width of a spoked wheel (mm).

    The rim is ``part.rim`` wide below the root circle (2 modules when 0, common
    practice, no source); arms are as wide as the rim, and the windows start one rim
    width outside the hub boss or the seat, whichever is larger.
    """
    rim = part.rim if part.rim > 0 else max(2.0 * part.tooth.module, 1.0)
    r_in = max(part.hub_diameter / 2, seat_extent(part.seat, part.bore)) + rim
    return r_in, root_radius - rim, rim


def _window_side(
    r_in: float, r_out: float, half_arm: float, rho: float
) -> list[np.ndarray]:
    """Points of the window side along an arm lying on +X (window on the +Y side).

    Returns [inner arc end, inner fillet mid, line start, line end, outer fillet mid,
    outer arc start]; with ``rho == 0`` the three points of each fillet coincide.
    """
    if rho <= 0:
        ci = np.array([math.sqrt(r_in**2 - half_arm**2), half_arm])
        co = np.array([math.sqrt(r_out**2 - half_arm**2), half_arm])
        return [ci, ci, ci, co, co, co]
    off = half_arm + rho
    # inner fillet: tangent to the arm side and to the inner circle from outside
    di = r_in + rho
    ci = np.array([math.sqrt(di**2 - off**2), off])
    ti_circle = ci * r_in / di
    ti_line = np.array([ci[0], half_arm])
    mi = ci + rho * _unit((ti_circle - ci) + (ti_line - ci))
    # outer fillet: tangent to the arm side and to the outer circle from inside
    do = r_out - rho
    co = np.array([math.sqrt(do**2 - off**2), off])
    to_circle = co * r_out / do
    to_line = np.array([co[0], half_arm])
    mo = co + rho * _unit((to_circle - co) + (to_line - co))
    return [ti_circle, mi, ti_line, to_line, mo, to_circle]


def _unit(v: np.ndarray) -> np.ndarray:
    return v / float(np.hypot(*v))


def _windows(part: WheelPart, root_radius: float) -> list[Hole]:
    n = part.spokes
    r_in, r_out, arm = spoke_sizes(part, root_radius)
    rho = part.round_radius
    beta = 2 * math.pi / n
    half_arm = arm / 2
    # room check: the window must hold its fillets radially and between the arms
    if r_out - r_in < 2 * rho + 0.2 or r_out <= r_in:
        raise ValueError(
            f"{part.name}: no room for {n} spokes: windows would run from"
            f" r = {r_in:.2f}"
            f" to {r_out:.2f} mm; allowed: at least {2 * rho + 0.2:.2f} mm between them"
        )
    off = half_arm + max(rho, 0.0)
    # the inner corners of one window must not meet across the bisector
    di = r_in + rho
    if di <= off or math.atan2(off, math.sqrt(di**2 - off**2)) >= beta / 2:
        raise ValueError(
            f"{part.name}: {n} arms of {arm:.2f} mm do not leave a window at"
            f" r = {r_in:.2f} mm; allowed: fewer spokes or a smaller hub"
        )
    side = _window_side(r_in, r_out, half_arm, rho)
    # the other side: mirror about the bisector at beta/2 (reverses the sense)
    c, s = math.cos(beta), math.sin(beta)
    mirror = np.array([[c, s], [s, -c]])
    other = [mirror @ p for p in side]
    ti_c, mi, ti_l, to_l, mo, to_c = side
    ui_c, ni, ui_l, uo_l, no, uo_c = other
    segs: list[Segment] = []

    def add(kind: SegmentKind, *pts: np.ndarray) -> None:
        arr = np.array(pts)
        # with no rounding the fillet points coincide: leave the empty piece out
        if float(np.hypot(*(arr[-1] - arr[0]))) > 1e-9:
            segs.append(Segment(kind, arr))

    add("arc", ti_c, mi, ti_l)
    add("line", ti_l, to_l)
    add("arc", to_l, mo, to_c)
    a0 = math.atan2(to_c[1], to_c[0])
    a1 = math.atan2(uo_c[1], uo_c[0])
    segs.append(_arc_about_origin(r_out, a0, a1))
    add("arc", uo_c, no, uo_l)
    add("line", uo_l, ui_l)
    add("arc", ui_l, ni, ui_c)
    b0 = math.atan2(ui_c[1], ui_c[0])
    b1 = math.atan2(ti_c[1], ti_c[0])
    segs.append(_arc_about_origin(r_in, b0, b1))
    holes = []
    for k in range(n):
        ang = math.degrees(k * beta) + part.spoke_angle_deg
        holes.append(Hole("window", tuple(sg.rotated(ang) for sg in segs)))
    return holes


def _stadium(
    role: HoleRole, r0: float, r1: float, width: float, angle_deg: float
) -> Hole:
    """A slot along the ray at ``angle_deg`` from radius r0 to r1 (end centres), CCW."""
    w = width / 2
    p = np.array
    segs = (
        Segment("line", p([[r0, -w], [r1, -w]])),
        Segment("arc", p([[r1, -w], [r1 + w, 0.0], [r1, w]])),
        Segment("line", p([[r1, w], [r0, w]])),
        Segment("arc", p([[r0, w], [r0 - w, 0.0], [r0, -w]])),
    )
    return Hole(role, tuple(s.rotated(angle_deg) for s in segs))


def plate_profile(part: WheelPart, outline: WheelOutline) -> PlateProfile:
    """The wheel's flat profile: toothed outline, seat, windows, slot, pin and arbor holes.

    Parameters
    ----------
    part : WheelPart
        Sizes in mm; ``round_radius`` (mm) rounds the windows and polygon seats.
    outline : WheelOutline
        The toothed outline in mm (from the teeth layer).
    """
    poly = outline.tooth_polyline(0.01)
    radii_now = np.hypot(poly[:, 0], poly[:, 1])
    root = float(outline.radii.get("root", radii_now.min()))
    tip = float(outline.radii.get("tip", radii_now.max()))
    pitch = float(outline.radii.get("pitch", part.tooth.module * part.tooth.teeth / 2))
    holes: list[Hole] = [_seat_hole(part)] if part.bore > 0 else []
    if part.spokes:
        if not 3 <= part.spokes <= 8:
            raise ValueError(f"'spokes' must be 0 or 3..8, got {part.spokes}")
        holes.extend(_windows(part, root))
    if part.slot is not None:
        sl = part.slot
        holes.append(_stadium("slot", sl.inner, sl.outer, sl.width, sl.angle_deg))
    if part.pin is not None and part.pin.hole_only:
        a = math.radians(part.pin.angle_deg)
        holes.append(
            _circle_hole(
                "pin_hole",
                part.pin.radius * math.cos(a),
                part.pin.radius * math.sin(a),
                part.pin.diameter / 2,
            )
        )
    for x, y, d in part.holes:  # the running bores of the arbors this wheel carries
        holes.append(_circle_hole("arbor_hole", x, y, d / 2))
    return PlateProfile(outline, tuple(holes), pitch, root, tip)
