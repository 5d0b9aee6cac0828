"""Measurements taken on a generated outline, as a gauge would take them on the wheel.

These read the outline's own points (its exact spline points, through the polyline at
a fine chord tolerance), not the formulas, so they check the geometry itself.
Lengths in mm.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .outline import WheelOutline

__all__ = ["SpanMeasurement", "measure_span"]


@dataclass(frozen=True, slots=True)
class SpanMeasurement:
    """Span (base tangent length) over ``k`` teeth measured on an outline.

    ``width`` is the distance (mm) between two parallel anvils touching the outer
    flanks of ``k`` consecutive teeth; ``contact`` the two touching points (mm, in the
    frame where the k teeth straddle +X); ``on_flank`` says both anvils touch the
    inside of a flank segment ('spline' or 'line'), not a corner or the tip.
    """

    k: int
    width: float
    contact: tuple[tuple[float, float], tuple[float, float]]
    on_flank: bool


def measure_span(
    outline: WheelOutline, k: int, chord_tol: float = 1e-7
) -> SpanMeasurement:
    """Measure the span over ``k`` teeth on ``outline`` (chord tolerance in mm).

    The k teeth are turned so they straddle the +X axis and each anvil is a line
    parallel to X. A real anvil is a small disc that reaches into the spaces but not
    through the wheel, so it rests on the first high point met going from the tip of
    the outer tooth down its outer flank; the span is the distance between the two
    anvils. For a symmetric involute tooth this is the textbook W_k when the anvils
    touch the involute; ``on_flank`` tells whether they do.
    """
    z = outline.teeth
    if not 1 <= k < z:
        raise ValueError(f"'k' must be from 1 to {z - 1}, got {k}")
    parts = [seg.polyline(chord_tol)[:-1] for seg in outline.tooth]
    pts = np.vstack(parts)
    kinds = np.concatenate(
        [
            np.full(len(p), seg.kind in ("spline", "line"))
            for p, seg in zip(parts, outline.tooth)
        ]
    )
    first = np.concatenate(
        [np.arange(len(p)) == 0 for p in parts]
    )  # segment starts are corners, not flank interiors
    tip = int(np.argmax(pts[:, 0]))
    half = (k - 1) * math.pi / z
    top = _first_peak(pts, kinds, first, tip, half, +1)
    bottom = _first_peak(pts, kinds, first, tip, -half, -1)
    return SpanMeasurement(
        k=k,
        width=top[0][1] - bottom[0][1],
        contact=(top[0], bottom[0]),
        on_flank=top[1] and bottom[1],
    )


def _first_peak(
    pts: np.ndarray,
    kinds: np.ndarray,
    first: np.ndarray,
    tip: int,
    turn: float,
    sense: int,
) -> tuple[tuple[float, float], bool]:
    # walk from the tip down the upper (sense +1, increasing index) or lower flank
    c, s = math.cos(turn), math.sin(turn)
    order = np.arange(tip, len(pts)) if sense > 0 else np.arange(tip, -1, -1)
    y = sense * (s * pts[order, 0] + c * pts[order, 1])
    drop = np.nonzero(np.diff(y) < 0)[0]
    j = int(drop[0]) if len(drop) else len(y) - 1
    i = int(order[j])
    x_rot = c * pts[i, 0] - s * pts[i, 1]
    on_flank = bool(kinds[i]) and not bool(first[i]) and 0 < j < len(y) - 1
    return (float(x_rot), float(sense * y[j])), on_flank
