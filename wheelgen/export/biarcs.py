"""Lines and arcs within a tolerance of a smooth curve: a chain of biarcs.

Many laser and router CAM programs read only lines and arcs from a DXF. A biarc is
two circular arcs that meet with a common tangent and match the curve's end points
and end tangents; a curve split into enough pieces is followed within any tolerance
by a chain of them, tangent-continuous throughout (no facets for the cutter to feel).
Biarcs as in K. M. Bolton, "Biarc curves", Computer-Aided Design 7 (1975); of the
one-parameter family between two tangent ends we take the one whose two tangent legs
are equally long (derived: with v the chord and t0, t1 the unit end tangents, the
legs d meet when |v - d (t0 + t1)| = 2 d, a quadratic in d). A piece whose
deviation, measured at 32 points of the curve, is above the tolerance is halved in
parameter, until every piece holds.

Plain numbers only (no CAD kernel). Lengths in mm.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import NDArray
from scipy.interpolate import BSpline

from ..solids.spline_fit import SplineFit
from ..teeth.outline import Segment, circle_through

__all__ = ["arc_deviation", "biarc_segments"]

FloatArray = NDArray[np.float64]
_SAMPLES = 32  # curve points checked per piece
_MAX_DEPTH = 24  # halvings of one piece: 2**-24 of the curve's parameter at most


def _arc_from(p: FloatArray, tangent: FloatArray, q: FloatArray) -> Segment:
    """The arc leaving ``p`` along ``tangent`` and ending at ``q`` (a line if straight)."""
    normal = np.array([-tangent[1], tangent[0]])
    chord = q - p
    across = float(normal @ chord)
    length2 = float(chord @ chord)
    if abs(across) <= 1e-12 * max(1.0, math.sqrt(length2)):
        return Segment("line", np.array([p, q]))
    centre = p + normal * (length2 / (2.0 * across))
    r = math.hypot(*(p - centre))
    a0 = math.atan2(p[1] - centre[1], p[0] - centre[0])
    a1 = math.atan2(q[1] - centre[1], q[0] - centre[0])
    if across > 0:  # centre on the left: counter-clockwise
        sweep = (a1 - a0) % (2 * math.pi)
    else:
        sweep = -((a0 - a1) % (2 * math.pi))
    mid = centre + r * np.array([math.cos(a0 + sweep / 2), math.sin(a0 + sweep / 2)])
    return Segment("arc", np.array([p, mid, q]))


def _biarc(
    p0: FloatArray, t0: FloatArray, p1: FloatArray, t1: FloatArray
) -> list[Segment] | None:
    """Two arcs from ``p0`` (tangent ``t0``) to ``p1`` (tangent ``t1``), or None."""
    v = p1 - p0
    t = t0 + t1
    vt = float(v @ t)
    vv = float(v @ v)
    a = 2.0 * (1.0 - float(t0 @ t1))
    if a > 1e-12:
        d = (-vt + math.sqrt(vt * vt + a * vv)) / a
    elif vt > 1e-12:
        d = vv / (2.0 * vt)  # parallel end tangents: the limit of the root above
    else:
        return None
    if not d > 0:
        return None
    joint = 0.5 * (p0 + d * t0 + p1 - d * t1)
    first = _arc_from(p0, t0, joint)
    # the second arc, run backwards from p1 along -t1, then turned round
    back = _arc_from(p1, -t1, joint)
    second = Segment(back.kind, back.points[::-1])
    return [first, second]


def arc_deviation(seg: Segment, points: FloatArray) -> FloatArray:
    """Distance (mm) of each point from a ``line`` or ``arc`` segment (its ends included)."""
    pts = seg.points
    if seg.kind == "line":
        a, b = pts
        ab = b - a
        length2 = float(ab @ ab)
        s = np.clip(((points - a) @ ab) / length2 if length2 > 0 else 0.0, 0.0, 1.0)
        return np.asarray(np.hypot(*(a + np.outer(s, ab) - points).T))
    start, mid, end = pts
    centre, r = circle_through(start, mid, end)
    assert r is not None
    ang = np.arctan2(points[:, 1] - centre[1], points[:, 0] - centre[0])
    a0 = math.atan2(start[1] - centre[1], start[0] - centre[0])
    am = math.atan2(mid[1] - centre[1], mid[0] - centre[0])
    a1 = math.atan2(end[1] - centre[1], end[0] - centre[0])
    sweep = (a1 - a0) % (2 * math.pi)
    ccw = (am - a0) % (2 * math.pi) <= sweep
    rel = (ang - a0) % (2 * math.pi) if ccw else (a0 - ang) % (2 * math.pi)
    span = sweep if ccw else (2 * math.pi - sweep)
    on_arc = np.abs(np.hypot(*(points - centre).T) - r)
    to_ends = np.minimum(np.hypot(*(points - start).T), np.hypot(*(points - end).T))
    return np.asarray(np.where(rel <= span, on_arc, to_ends))


def biarc_segments(fit: SplineFit, tolerance: float) -> list[Segment]:
    """Arcs (and lines where straight) within ``tolerance`` mm of the fitted curve.

    The chain starts at the curve's first pole and ends at its last, exactly, and
    each piece meets the next at a point of the curve with the curve's tangent.
    """
    if tolerance <= 0:
        raise ValueError(f"'tolerance' must be > 0 mm, got {tolerance}")
    spline = BSpline(fit.full_knots(), fit.poles, fit.degree)
    deriv = spline.derivative()

    def at(u: float) -> tuple[FloatArray, FloatArray]:
        p = np.asarray(spline(u), dtype=float)
        d = np.asarray(deriv(u), dtype=float)
        return p, d / math.hypot(*d)

    first, last = fit.poles[0], fit.poles[-1]
    out: list[Segment] = []
    # work list of parameter pieces, first piece first
    todo: list[tuple[float, float, int]] = [(0.0, 1.0, 0)]
    while todo:
        ua, ub, depth = todo.pop()
        pa, ta = at(ua)
        pb, tb = at(ub)
        if ua == 0.0:
            pa = first
        if ub == 1.0:
            pb = last
        pieces = _biarc(pa, ta, pb, tb)
        worst = float("inf")
        if pieces is not None:
            samples = np.asarray(spline(np.linspace(ua, ub, _SAMPLES + 2)[1:-1]))
            worst = float(
                np.minimum(*(arc_deviation(s, samples) for s in pieces)).max()
            )
        if depth < _MAX_DEPTH and (pieces is None or worst > tolerance):
            um = 0.5 * (ua + ub)
            todo.append((um, ub, depth + 1))
            todo.append((ua, um, depth + 1))
            continue
        # pieces meet exactly: both ends of a cut are the curve at the same parameter
        out.extend(pieces or [Segment("line", np.array([pa, pb]))])
    return out
