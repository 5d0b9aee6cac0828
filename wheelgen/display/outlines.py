"""Flat profiles of the display's parts: hands, dial discs, crank arms and knobs.

Like a wheel's profile (:mod:`wheelgen.layout.wheel_profile`) these are plain numbers:
a closed counter-clockwise chain of exact segments (lines and three-point arcs) and the
holes through it. The solid is the profile extruded; the DXF and the 1:1 SVG draw the
same loops, so they cannot disagree. Lengths in mm, angles in degrees.

A hand is the union of its hub (a circle on the axis), its blade (straight edges from
``width`` at the hub to ``tip`` at the end, closed by an arc), its tail (as wide as the
blade's root) and a round counterweight or a round end. Every piece is symmetric about
the hand's own +X axis, and every vertical line meets each piece in one interval about
that axis, so the outline is found from the pieces' crossing points alone.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Iterator

import numpy as np

from ..layout.part_kinds import CrankPart, DialPart, HandPart, KnobPart
from ..layout.sleeves import FLAT_DEPTH
from ..layout.wheel_profile import Hole, _polygon_hole
from ..teeth.outline import Segment

__all__ = [
    "Loop",
    "FlatProfile",
    "seat_hole",
    "hand_profile",
    "dial_profile",
    "crank_profile",
    "knob_profile",
    "flat_profile",
]


@dataclass(frozen=True, slots=True, eq=False)
class Loop:
    """A closed counter-clockwise chain of segments (mm)."""

    pieces: tuple[Segment, ...]

    def segments(self) -> Iterator[Segment]:
        """The segments in order (the interface the DXF writer reads)."""
        return iter(self.pieces)

    def polyline(self, chord_tol: float) -> np.ndarray:
        """The loop as an ``(n, 2)`` array in mm, first point not repeated."""
        return np.vstack([s.polyline(chord_tol)[:-1] for s in self.pieces])


@dataclass(frozen=True, slots=True, eq=False)
class FlatProfile:
    """An outline and the holes through it; ``marks`` are centres to punch (x, y)."""

    outline: Loop
    holes: tuple[Hole, ...]
    marks: tuple[tuple[float, float], ...] = ()


def _p(x: float, y: float) -> np.ndarray:
    return np.array([x, y], dtype=float)


def _line(a: np.ndarray, b: np.ndarray) -> Segment:
    return Segment("line", np.array([a, b]))


def _arc(a: np.ndarray, m: np.ndarray, b: np.ndarray) -> Segment:
    return Segment("arc", np.array([a, m, b]))


def _arc_about(cx: float, cy: float, r: float, a0: float, a1: float) -> Segment:
    """Counter-clockwise arc about (cx, cy) from angle a0 to a1 (radians, a1 > a0)."""
    am = (a0 + a1) / 2
    pts = [_p(cx + r * math.cos(t), cy + r * math.sin(t)) for t in (a0, am, a1)]
    return _arc(*pts)


def _circle_loop(r: float) -> Loop:
    return Loop(
        (_arc_about(0, 0, r, 0.0, math.pi), _arc_about(0, 0, r, math.pi, 2 * math.pi))
    )


def seat_hole(
    shape: str, across: float, clearance: float, corner: float, angle_deg: float = 0.0
) -> Hole:
    """The hole a hand, knob or crank fits its member with (mm).

    ``square``: a square ``across + 2 clearance`` over flats with corners rounded by
    ``corner`` (the cutter's radius); ``flat``: a round hole with one flat, at
    :data:`~wheelgen.layout.sleeves.FLAT_DEPTH` of the diameter, ``clearance`` off the
    member's; ``collet``: a round hole of the member's diameter (a friction fit).
    ``angle_deg`` turns the square's flats or the flat's normal (from +X).
    """
    if shape == "square":
        hole = _polygon_hole("bore", 4, across + 2 * clearance, corner)
        if angle_deg:
            hole = Hole("bore", tuple(s.rotated(angle_deg) for s in hole.segments))
        return hole
    r = across / 2 + clearance
    if shape == "collet":
        return Hole("bore", circle=(0.0, 0.0, r))
    if shape != "flat":
        raise ValueError(f"'shape' must be 'square', 'flat' or 'collet', got {shape!r}")
    h = across / 2 * (1 - 2 * FLAT_DEPTH) + clearance
    s = math.sqrt(r * r - h * h)
    a = math.atan2(s, h)
    segs = (_arc_about(0, 0, r, a, 2 * math.pi - a), _line(_p(h, -s), _p(h, s)))
    return Hole("bore", tuple(seg.rotated(angle_deg) for seg in segs))


def _seat(part: HandPart | KnobPart | CrankPart, angle_deg: float = 0.0) -> Hole:
    return seat_hole(
        part.seat, part.across, part.clearance, part.round_radius, angle_deg
    )


def hand_profile(part: HandPart) -> FlatProfile:
    """The hand's flat profile along +X: hub, blade, tail and counterweight (mm)."""
    rh = part.hub / 2
    w, t, length = part.width / 2, part.tip / 2, part.length
    if not (0 < w <= rh and 0 < t <= w and length > rh):
        raise ValueError(
            f"{part.name}: the hand needs 0 < tip <= width <= hub < 2 x length,"
            f" got tip {part.tip}, width {part.width}, hub {part.hub}, length {length}"
        )
    k = (t - w) / length  # slope of the blade's upper edge
    # blade edge y = w + k x meets the hub circle x^2 + y^2 = rh^2 at x >= 0
    qa, qb, qc = 1 + k * k, 2 * w * k, w * w - rh * rh
    xb = (-qb + math.sqrt(qb * qb - 4 * qa * qc)) / (2 * qa)
    yb = w + k * xb
    le = length - t  # the tip arc's ends
    ye = w + k * le
    segs: list[Segment] = [
        _arc(_p(le, -ye), _p(length, 0.0), _p(le, ye)),
        _line(_p(le, ye), _p(xb, yb)),
    ]
    ab = math.atan2(yb, xb)
    # the tail ends in a circle: the counterweight, or a round end as wide as the tail
    re = max(part.counterweight / 2, w)
    cx = -part.tail + re
    xt = -math.sqrt(rh * rh - w * w)  # where the tail's edges leave the hub
    xc = cx + math.sqrt(max(re * re - w * w, 0.0))  # where they meet the end circle
    if abs(cx) + re <= rh + 1e-9:  # the end lies within the hub
        segs.append(_arc_about(0, 0, rh, ab, 2 * math.pi - ab))
    elif xc < xt - 1e-6:  # hub, tail edges, end circle
        at = math.atan2(w, xt)
        ae = math.atan2(w, xc - cx)
        segs += [
            _arc_about(0, 0, rh, ab, at),
            _line(_p(xt, w), _p(xc, w)),
            _arc_about(cx, 0, re, ae, 2 * math.pi - ae),
            _line(_p(xc, -w), _p(xt, -w)),
            _arc_about(0, 0, rh, 2 * math.pi - at, 2 * math.pi - ab),
        ]
    else:  # the end circle overlaps the hub: they meet where the two circles cross
        xi = (rh * rh - re * re + cx * cx) / (2 * cx)
        yi = math.sqrt(max(rh * rh - xi * xi, 0.0))
        ah = math.atan2(yi, xi)
        ae = math.atan2(yi, xi - cx)
        segs += [
            _arc_about(0, 0, rh, ab, ah),
            _arc_about(cx, 0, re, ae, 2 * math.pi - ae),
            _arc_about(0, 0, rh, 2 * math.pi - ah, 2 * math.pi - ab),
        ]
    segs.append(_line(_p(xb, -yb), _p(le, -ye)))
    return FlatProfile(Loop(tuple(segs)), (_seat(part, part.seat_angle_deg),))


def dial_profile(part: DialPart) -> FlatProfile:
    """The dial disc: a circle with its holes; the feet's places marked (mm)."""
    holes = tuple(Hole("bore" if i == 0 else "pin_hole", circle=(x, y, d / 2))
                  for i, (x, y, d) in enumerate(part.holes))  # fmt: skip
    return FlatProfile(_circle_loop(part.radius), holes, part.feet)


def crank_profile(part: CrankPart) -> FlatProfile:
    """The crank's arm: a hub on the axis joined to a round end at ``throw`` (mm)."""
    a, rh, x1 = part.arm / 2, part.hub / 2, part.throw
    if not (0 < a <= rh and x1 > rh + a):
        raise ValueError(
            f"{part.name}: the arm needs 0 < arm <= hub and a throw beyond the hub,"
            f" got arm {part.arm}, hub {part.hub}, throw {x1}"
        )
    xh = math.sqrt(rh * rh - a * a)
    ah = math.atan2(a, xh)
    segs = (
        _arc_about(x1, 0, a, -math.pi / 2, math.pi / 2),
        _line(_p(x1, a), _p(xh, a)),
        _arc_about(0, 0, rh, ah, 2 * math.pi - ah),
        _line(_p(xh, -a), _p(x1, -a)),
    )
    return FlatProfile(Loop(segs), (_seat(part),), ((x1, 0.0),))


def knob_profile(part: KnobPart) -> FlatProfile:
    """The knob's section: a circle with the seat hole (mm)."""
    return FlatProfile(_circle_loop(part.diameter / 2), (_seat(part),))


def flat_profile(part: HandPart | DialPart | CrankPart | KnobPart) -> FlatProfile:
    """The profile of any display part."""
    if isinstance(part, HandPart):
        return hand_profile(part)
    if isinstance(part, DialPart):
        return dial_profile(part)
    if isinstance(part, CrankPart):
        return crank_profile(part)
    if isinstance(part, KnobPart):
        return knob_profile(part)
    raise TypeError(f"no flat profile for a part of type {type(part).__name__}")
