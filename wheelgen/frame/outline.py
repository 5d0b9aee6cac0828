"""Outlines of flat frame parts as exact lines and arcs, and measures on them (mm).

A plate's outline is either found round what it must carry, as the rounded hull of a set
of circles (:func:`rounded_hull`: the convex hull of the circles, every corner an arc of
one of them and every side a line tangent to two), or given as a rectangle or a polygon
whose corners are rounded (:func:`rectangle_outline`, :func:`polygon_outline`). Every
outline is a closed chain of :class:`~wheelgen.layout.part_kinds.FlatEdge` running
counter-clockwise, the form a solid, a DXF and an SVG are drawn from alike.

Which circles bound the hull, in order, is found from the support function on 4096
directions (in each direction the circle reaching farthest); the hull is then made
exact: each side is the outer common tangent of its two circles, in closed form. An arc
that spans less than one direction step (0.09 degrees) can be missed by the sampling,
and a side between two far-apart circles can then cut through a small circle between
them by far more than that step suggests (0.024 mm seen for circles 120 mm apart), so
every side is tested against every circle in closed form and a circle that reaches past
it is put into the hull between the side's two circles, until none does.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from ..layout.part_kinds import FlatEdge
from ..layout.proximity import overlapping_pairs

__all__ = [
    "Circle",
    "edges_polyline",
    "outline_distance",
    "polygon_outline",
    "rectangle_outline",
    "rounded_hull",
]

Circle = tuple[float, float, float]  # x, y, radius (mm)
Point = tuple[float, float]

_SAMPLES = 4096  # directions in which the hull's farthest circle is found
_BLOCK = 1024  # circles whose reach is worked out at once


def _pt(p: np.ndarray | Sequence[float]) -> Point:
    return (round(float(p[0]), 9) + 0.0, round(float(p[1]), 9) + 0.0)


def _arc(c: Circle, a0: float, a1: float) -> FlatEdge:
    """Arc of circle ``c`` counter-clockwise from angle a0 to a1 (radians, a1 > a0)."""
    x, y, r = c
    am = (a0 + a1) / 2
    return FlatEdge(
        "arc",
        (
            _pt((x + r * math.cos(a0), y + r * math.sin(a0))),
            _pt((x + r * math.cos(am), y + r * math.sin(am))),
            _pt((x + r * math.cos(a1), y + r * math.sin(a1))),
        ),
    )


def _tangent(c1: Circle, c2: Circle) -> tuple[np.ndarray, np.ndarray]:
    """Points where the outer tangent leaves ``c1`` and meets ``c2``, with both circles
    on its left (the side of a counter-clockwise hull's inside)."""
    p1, p2 = np.array(c1[:2]), np.array(c2[:2])
    d = p2 - p1
    length = float(np.hypot(*d))
    u = d / length
    right = np.array([u[1], -u[0]])
    k = (c1[2] - c2[2]) / length
    n = k * u + math.sqrt(max(0.0, 1.0 - k * k)) * right
    return p1 + c1[2] * n, p2 + c2[2] * n


def rounded_hull(circles: Sequence[Circle]) -> tuple[FlatEdge, ...]:
    """The convex hull of ``circles`` (x, y, radius in mm) as lines and arcs, CCW."""
    unique = sorted({(float(x), float(y), float(r)) for x, y, r in circles})
    if not unique or any(not r > 0 for _, _, r in unique):
        raise ValueError("'circles' must hold at least one circle of radius > 0 mm")
    unique = _outermost(unique)
    # the support function: in each direction u the hull's farthest point belongs to
    # the circle with the largest c.u + r; turning u counter-clockwise walks the hull
    owner = _support_owners(np.array(unique))
    seq: list[int] = []
    for i in owner:
        if not seq or seq[-1] != int(i):
            seq.append(int(i))
    while len(seq) > 1 and seq[0] == seq[-1]:
        seq.pop()
    if len(seq) == 1:
        only = unique[seq[0]]
        return (_arc(only, 0.0, math.pi), _arc(only, math.pi, 2 * math.pi))
    seq = _complete(unique, seq)
    n = len(seq)
    tangents = [_tangent(unique[seq[i]], unique[seq[(i + 1) % n]]) for i in range(n)]
    edges: list[FlatEdge] = []
    for i in range(n):
        circle = unique[seq[i]]
        cx, cy, radius = circle
        arrive = tangents[i - 1][1]  # where the side before meets this circle
        leave = tangents[i][0]
        a0 = math.atan2(arrive[1] - cy, arrive[0] - cx)
        a1 = math.atan2(leave[1] - cy, leave[0] - cx)
        sweep = (a1 - a0) % (2 * math.pi)
        if sweep * radius > 1e-6 and sweep < 2 * math.pi - 1e-9:
            edges.append(_arc(circle, a0, a0 + sweep))
        start, end = _pt(leave), _pt(tangents[i][1])
        if math.dist(start, end) > 1e-6:
            edges.append(FlatEdge("line", (start, end)))
    return _closed(edges)


def _outermost(unique: list[Circle]) -> list[Circle]:
    """``unique`` (sorted, distinct) without the circles that lie inside another.

    A circle inside another (touching it from inside included) adds nothing, and where
    it touches, the two tie in the support function and leave no side. Of two circles
    inside each other (equal but for float noise) the larger is kept, or the later in
    sorted order. Only circles whose boxes overlap can hold one another, so only those
    pairs are measured.
    """
    cs = np.array(unique)
    low, high = cs[:, :2] - cs[:, 2:], cs[:, :2] + cs[:, 2:]
    held = np.zeros(len(unique), dtype=bool)
    for i, j in overlapping_pairs(low, high, margin=-1e-6):
        gap = math.hypot(cs[i, 0] - cs[j, 0], cs[i, 1] - cs[j, 1])
        ri, rj = cs[i, 2], cs[j, 2]
        # i inside j, and j ranks higher (larger, or equal and later)
        if gap + ri <= rj + 1e-9 and (rj > ri or (rj == ri and j > i)):
            held[i] = True
        if gap + rj <= ri + 1e-9 and ri > rj:
            held[j] = True
    return [c for c, h in zip(unique, held) if not h]


def _support_owners(cs: np.ndarray) -> np.ndarray:
    """For each of the sampled directions, the index of the circle ``cs`` (x, y, r rows)
    reaching farthest (the first of equals); worked out a block of circles at a time so
    memory stays small for thousands of circles."""
    t = np.linspace(0.0, 2 * math.pi, _SAMPLES, endpoint=False)
    cos, sin = np.cos(t), np.sin(t)
    best = np.full(_SAMPLES, -np.inf)
    owner = np.zeros(_SAMPLES, dtype=int)
    for start in range(0, len(cs), _BLOCK):
        block = cs[start : start + _BLOCK]
        reach = np.outer(cos, block[:, 0]) + np.outer(sin, block[:, 1]) + block[:, 2]
        k = np.argmax(reach, axis=1)
        value = reach[np.arange(_SAMPLES), k]
        better = value > best  # strictly: an earlier circle keeps a tie
        best = np.where(better, value, best)
        owner = np.where(better, k + start, owner)
    return owner


def _outward(c1: Circle, c2: Circle) -> np.ndarray:
    """Unit normal of the outer tangent from ``c1`` to ``c2``, pointing out of the hull."""
    p1, p2 = _tangent(c1, c2)
    normal: np.ndarray = (p1 - np.array(c1[:2])) / c1[2]
    return normal


def _complete(unique: Sequence[Circle], seq: list[int]) -> list[int]:
    """``seq`` with every circle the sampling missed put in where it reaches out.

    A side from circle a to circle b lies on the line ``u . p = u . c_a + r_a`` with
    outward normal ``u``; a circle c with ``u . c_c + r_c`` beyond it pokes out and
    belongs to the hull between a and b (it holds the support in direction ``u``).
    Each pass puts in the farthest such circle of one side; the hull has at most
    ``2 n`` arcs for ``n`` circles, so the passes are bounded.
    """
    cs = np.asarray(unique, dtype=float)
    for _ in range(2 * len(unique) + 2):
        n = len(seq)
        for i in range(n):
            a, b = seq[i], seq[(i + 1) % n]
            if a == b:
                continue
            u = _outward(unique[a], unique[b])
            beyond = cs[:, :2] @ u + cs[:, 2] - (cs[a, :2] @ u + cs[a, 2])
            j = int(np.argmax(beyond))
            if beyond[j] > 1e-9 and j not in (a, b):
                seq = seq[: i + 1] + [j] + seq[i + 1 :]
                break
        else:
            return seq
    return seq


def _closed(edges: list[FlatEdge]) -> tuple[FlatEdge, ...]:
    """Snap each edge's start onto the previous edge's end (float noise only)."""
    out = []
    for i, e in enumerate(edges):
        prev_end = edges[i - 1].points[-1]
        if math.dist(prev_end, e.points[0]) > 1e-4:
            raise ValueError("the outline does not close")
        out.append(FlatEdge(e.kind, (prev_end,) + e.points[1:]))
    return tuple(out)


def _signed_area(pts: Sequence[Point]) -> float:
    a = np.asarray(pts, dtype=float)
    x, y = a[:, 0], a[:, 1]
    return 0.5 * float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))


def polygon_outline(points: Sequence[Point], corner: float) -> tuple[FlatEdge, ...]:
    """A polygon's outline, counter-clockwise, each corner rounded to ``corner`` mm.

    A corner whose sides are too short for the rounding gets the largest that fits
    (half the shorter side's length). A reflex corner is rounded the other way.
    """
    pts = [(float(x), float(y)) for x, y in points]
    if len(pts) < 3:
        raise ValueError("a polygon needs at least 3 corners")
    if _signed_area(pts) < 0:
        pts.reverse()
    n = len(pts)
    if corner <= 0:
        return _closed(
            [FlatEdge("line", (_pt(pts[i]), _pt(pts[(i + 1) % n]))) for i in range(n)]
        )
    fillets: list[tuple[Point, Point, Point] | None] = []
    for i in range(n):
        p = np.array(pts[i])
        a, b = np.array(pts[i - 1]), np.array(pts[(i + 1) % n])
        ua, ub = (a - p) / np.hypot(*(a - p)), (b - p) / np.hypot(*(b - p))
        turn = float(np.clip(np.dot(ua, ub), -1.0, 1.0))
        half = math.acos(turn) / 2  # half the inside angle
        if half > math.pi / 2 - 1e-9:
            fillets.append(None)  # a straight corner: nothing to round
            continue
        room = min(np.hypot(*(a - p)), np.hypot(*(b - p))) / 2
        r = min(corner, room * math.tan(half))
        back = r / math.tan(half)
        t1, t2 = p + back * ua, p + back * ub
        bis = (ua + ub) / np.hypot(*(ua + ub))
        centre = p + bis * r / math.sin(half)
        mid = centre - bis * r
        fillets.append((_pt(t1), _pt(mid), _pt(t2)))
    edges: list[FlatEdge] = []
    for i in range(n):
        f = fillets[i]
        start = f[2] if f else _pt(pts[i])
        nxt = fillets[(i + 1) % n]
        end = nxt[0] if nxt else _pt(pts[(i + 1) % n])
        if math.dist(start, end) > 1e-6:
            edges.append(FlatEdge("line", (start, end)))
        if nxt:
            edges.append(FlatEdge("arc", nxt))
    return _closed(edges)


def rectangle_outline(
    x0: float, y0: float, x1: float, y1: float, corner: float
) -> tuple[FlatEdge, ...]:
    """The rectangle x0..x1, y0..y1 (mm), corners rounded to ``corner`` mm."""
    return polygon_outline([(x0, y0), (x1, y0), (x1, y1), (x0, y1)], corner)


def _arc_points(p: Sequence[Point], tol: float) -> np.ndarray:
    a, b, c = (np.array(q, dtype=float) for q in p)
    d = 2 * (a[0] * (b[1] - c[1]) + b[0] * (c[1] - a[1]) + c[0] * (a[1] - b[1]))
    if abs(d) < 1e-15:
        return np.array([a, c])
    ux = (a @ a * (b[1] - c[1]) + b @ b * (c[1] - a[1]) + c @ c * (a[1] - b[1])) / d
    uy = (a @ a * (c[0] - b[0]) + b @ b * (a[0] - c[0]) + c @ c * (b[0] - a[0])) / d
    r = float(np.hypot(a[0] - ux, a[1] - uy))
    a0, a1, a2 = (math.atan2(q[1] - uy, q[0] - ux) for q in (a, b, c))
    sweep = (a2 - a0) % (2 * math.pi)
    if (a1 - a0) % (2 * math.pi) > sweep:
        sweep -= 2 * math.pi
    step = 2 * math.acos(max(-1.0, 1 - tol / r)) if tol < r else math.pi / 2
    count = max(2, int(math.ceil(abs(sweep) / step)) + 1)
    t = a0 + np.linspace(0.0, sweep, count)
    out = np.column_stack((ux + r * np.cos(t), uy + r * np.sin(t)))
    out[0], out[-1] = a, c
    return out


def edges_polyline(edges: Sequence[FlatEdge], tol: float = 0.01) -> np.ndarray:
    """The closed outline as an ``(n, 2)`` array (mm), chord error <= ``tol`` mm,
    first point not repeated."""
    if tol <= 0:
        raise ValueError(f"'tol' must be > 0 mm, got {tol}")
    parts = []
    for e in edges:
        if e.kind == "line":
            parts.append(np.array(e.points[:1], dtype=float))
        else:
            parts.append(_arc_points(e.points, tol)[:-1])
    return np.vstack(parts)


def outline_distance(points: np.ndarray, loop: np.ndarray) -> np.ndarray:
    """Distance (mm) from each of ``points`` to the closed polyline ``loop``."""
    a = loop
    ab = np.roll(loop, -1, axis=0) - a
    lengths = np.maximum(np.einsum("ij,ij->i", ab, ab), 1e-300)
    out = np.empty(len(points))
    for k, p in enumerate(np.asarray(points, dtype=float)):
        ap = p - a
        t = np.clip(np.einsum("ij,ij->i", ap, ab) / lengths, 0.0, 1.0)
        out[k] = float(np.min(np.hypot(*(ap - t[:, None] * ab).T)))
    return out
