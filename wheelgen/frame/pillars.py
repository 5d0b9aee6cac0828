"""Pillars: where the posts that hold the plates apart stand (mm, degrees).

A design may give its pillars (``[[pillar]]`` tables, at least three); otherwise
``[frame] pillars`` of them (four unless set) are placed here. How:

1. **Where a pillar may stand.** Its body must keep the frame's clearance from every
   zone between the plates (every wheel's swept circle, every carried wheel's path,
   every pin's ring, every arbor, tube and cock), and its holes in the plates the
   spacing of :func:`~wheelgen.frame.limits.min_centre_distance` from the other holes.
   With the outline found automatically, the candidates are the points of the line
   that runs round all of those zones at exactly that clearance (the hull of the zones,
   grown by the pillar's radius and the clearance): as close to the train as a pillar
   can stand, so the plates stay small. With a given rectangle or polygon, they are the
   points of a 1 mm grid inside it that keep the pillar's hole the edge distance of
   :func:`~wheelgen.frame.limits.min_edge_distance` from the edge, and are clear.
2. **Which of them.** The set of pillars whose polygon holds every pivot of the plates
   and, among those (or among all, when none holds them all), encloses the largest
   area. The loads of the train come into the plates at the pivots; a plate held at
   points spread widely round them bends least between its supports, stays parallel
   and square to the arbors, and the frame resists twisting best (the pillars'
   resistance to a twist of one plate against the other grows with the square of their
   distance from its middle). The best polygon is found exactly among up to 40
   candidates spread evenly along the outside of the candidate set (every vertex of a
   largest polygon lies on that outside), then each pillar is moved along it, within
   one such step, to a better candidate until none improves.

When fewer than three places are far enough apart (:func:`pillar_spacing`): with the
outline found automatically, the line is moved out one pillar diameter at a time (a
small train gets a larger plate); with a given outline the design is refused, and
:func:`room_report` says in which directions from the middle of the plate the wheels
leave no room and which of them fill it.
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from ..design.model import Design
from ..layout.collisions import convex_hull_order, inside_polygon
from .holes import FrameHole
from .keepout import Zone, disc_gap
from .limits import FrameLimits, min_centre_distance, min_edge_distance
from .outline import edges_polyline, outline_distance, rounded_hull

__all__ = [
    "GROW_STEPS",
    "Pillar",
    "PillarTrouble",
    "choose_pillars",
    "given_pillars",
    "pillar_candidates",
    "pillar_hole",
    "pillar_spacing",
    "room_report",
]

_COARSE = 40  # candidates searched exhaustively for the largest polygon
#: With the outline found automatically, a train too small to keep the pillars apart
#: on the line round it gets them on lines further out, one pillar diameter at a time.
GROW_STEPS = 6
_DIRECTIONS = (
    "to the right", "to the upper right", "above", "to the upper left",
    "to the left", "to the lower left", "below", "to the lower right",
)  # fmt: skip


@dataclass(frozen=True, slots=True)
class Pillar:
    """A pillar's axis at (``x``, ``y``) (mm); ``given`` by the design or placed."""

    name: str
    x: float
    y: float
    given: bool = False


@dataclass(frozen=True, slots=True)
class PillarTrouble:
    """A pillar that cannot stand, or pillars that cannot be placed: the message."""

    subject: str
    message: str
    measured: str = ""
    limit: str = ""
    advice: str = ""
    level: str = "error"


def pillar_hole(limits: FrameLimits) -> float:
    """Diameter (mm) of a pillar's hole in a plate: the spigot's, else the screw's."""
    return limits.spigot if limits.spigot > 0 else limits.screw.clearance_hole


def pillar_spacing(limits: FrameLimits) -> float:
    """Least distance (mm) between two pillars' axes: their bodies keep the clearance
    and their holes the spacing of :func:`~wheelgen.frame.limits.min_centre_distance`."""
    d = pillar_hole(limits)
    return max(
        limits.pillar_diameter + limits.clearance, min_centre_distance(d, d, limits)
    )


def _near(
    x: np.ndarray, y: np.ndarray, box: tuple[float, float, float, float]
) -> np.ndarray:
    """Indices of the points (x, y) inside ``box`` (x0, y0, x1, y1); ``x`` sorted."""
    lo, hi = np.searchsorted(x, box[0], "left"), np.searchsorted(x, box[2], "right")
    k = np.arange(lo, hi)
    return k[(y[k] >= box[1]) & (y[k] <= box[3])]


def _clear(
    x: np.ndarray, y: np.ndarray, zones: Sequence[Zone], radius: float, gap: float
) -> np.ndarray:
    # Only the points within reach of a zone's box can come too near it: each zone is
    # tested against those alone (sorted by x), so the cost follows the points near
    # each zone rather than all points times all zones.
    order = np.argsort(x, kind="stable")
    sx, sy = x[order], y[order]
    ok = np.ones(x.shape, dtype=bool)
    for z in zones:
        reach = z.outer + radius + gap + 1e-6
        xs = (z.x, z.to[0]) if z.to is not None else (z.x,)
        ys = (z.y, z.to[1]) if z.to is not None else (z.y,)
        k = _near(
            sx, sy, (min(xs) - reach, min(ys) - reach, max(xs) + reach, max(ys) + reach)
        )
        if len(k):
            idx = order[k]
            ok[idx] &= disc_gap(x[idx], y[idx], radius, z) >= gap - 1e-9
    return ok


def _holes_clear(
    x: np.ndarray,
    y: np.ndarray,
    holes: Sequence[FrameHole],
    d: float,
    limits: FrameLimits,
) -> np.ndarray:
    order = np.argsort(x, kind="stable")
    sx, sy = x[order], y[order]
    ok = np.ones(x.shape, dtype=bool)
    for h in holes:
        need = min_centre_distance(d, h.diameter, limits)
        reach = need + 1e-6
        k = _near(sx, sy, (h.x - reach, h.y - reach, h.x + reach, h.y + reach))
        if len(k):
            idx = order[k]
            ok[idx] &= np.hypot(x[idx] - h.x, y[idx] - h.y) >= need - 1e-9
    return ok


def pillar_candidates(
    zones: Sequence[Zone],
    holes: Sequence[FrameHole],
    limits: FrameLimits,
    outline: np.ndarray | None,
    grow: float = 0.0,
) -> np.ndarray:
    """Places (``(n, 2)``, mm) where a pillar may stand, in order round the train.

    ``outline`` is the given outline as a closed polyline, or ``None`` when the outline
    is found round the train (then the candidates run round it at the clearance, plus
    ``grow`` mm).
    """
    r = limits.pillar_diameter / 2
    reach = r + limits.clearance + grow
    d = pillar_hole(limits)
    if outline is None:
        circles = [(x, y, rad + reach) for z in zones for (x, y, rad) in z.circles]
        if not circles:
            return np.zeros((0, 2))
        loop = edges_polyline(rounded_hull(circles), 0.05)
        pts = _resample(loop, 1.0)
    else:
        lo, hi = outline.min(axis=0), outline.max(axis=0)
        gx, gy = np.meshgrid(
            np.arange(math.floor(lo[0]), math.ceil(hi[0]) + 1.0, 1.0),
            np.arange(math.floor(lo[1]), math.ceil(hi[1]) + 1.0, 1.0),
        )
        pts = np.column_stack((gx.ravel(), gy.ravel()))
        pts = pts[inside_polygon(pts, outline)]
        if len(pts):
            edge = max(min_edge_distance(d, limits), r)
            pts = pts[outline_distance(pts, outline) >= edge - 1e-9]
    if len(pts) == 0:
        return pts.reshape(0, 2)
    ok = _clear(pts[:, 0], pts[:, 1], zones, r, limits.clearance)
    ok &= _holes_clear(pts[:, 0], pts[:, 1], holes, d, limits)
    return np.asarray(pts[ok])


def _resample(loop: np.ndarray, step: float) -> np.ndarray:
    closed = np.vstack((loop, loop[:1]))
    seg = np.hypot(*np.diff(closed, axis=0).T)
    s = np.concatenate(([0.0], np.cumsum(seg)))
    total = float(s[-1])
    at = np.arange(0.0, total, step)
    return np.column_stack(
        (np.interp(at, s, closed[:, 0]), np.interp(at, s, closed[:, 1]))
    )


def _outer_pivots(pivots: np.ndarray) -> np.ndarray:
    """The corners of the pivots' convex hull: a convex polygon holds every pivot when
    it holds these, so only they need testing."""
    if len(pivots) <= 3:
        return pivots
    unique = np.unique(pivots, axis=0)
    if len(unique) <= 3:
        return unique
    corners: np.ndarray = unique[convex_hull_order(unique, collinear=False)]
    return corners


def _area(pts: np.ndarray, idx: Sequence[int]) -> float:
    p = pts[list(idx)]
    x, y = p[:, 0], p[:, 1]
    return 0.5 * abs(float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1))))


def _encloses(polys: np.ndarray, pivots: np.ndarray) -> np.ndarray:
    """For convex CCW polygons ``(m, k, 2)``: does each hold every pivot ``(p, 2)``?"""
    if len(pivots) == 0:
        return np.ones(len(polys), dtype=bool)
    a = polys
    b = np.roll(polys, -1, axis=1)
    ex, ey = (b - a)[..., 0][..., None], (b - a)[..., 1][..., None]
    dx = pivots[:, 0][None, None, :] - a[..., 0][..., None]
    dy = pivots[:, 1][None, None, :] - a[..., 1][..., None]
    return np.asarray(np.all(ex * dy - ey * dx >= -1e-9, axis=(1, 2)))


def _score(
    pts: np.ndarray, idx: Sequence[int], pivots: np.ndarray
) -> tuple[bool, float]:
    poly = pts[sorted(idx)][None, ...]
    return bool(_encloses(poly, pivots)[0]), round(_area(pts, sorted(idx)), 9)


def _largest(pts: np.ndarray, count: int, pivots: np.ndarray) -> list[int]:
    """Indices (in order along ``pts``, a convex CCW chain) of the ``count``-gon that
    encloses every pivot if any does, and the largest area among those."""
    n = len(pts)
    if n <= count:
        return list(range(n))
    pivots = _outer_pivots(pivots)
    coarse = np.unique(np.linspace(0, n, min(n, _COARSE), endpoint=False).astype(int))
    k0 = min(count, 4, len(coarse))
    count_all = math.comb(len(coarse), k0)
    combos = np.fromiter(
        itertools.chain.from_iterable(itertools.combinations(range(len(coarse)), k0)),
        dtype=np.int64,
        count=count_all * k0,
    ).reshape(count_all, k0)
    p = pts[coarse][combos]  # (m, k0, 2)
    x, y = p[..., 0], p[..., 1]
    areas = 0.5 * np.abs(
        np.sum(x * np.roll(y, -1, axis=1) - y * np.roll(x, -1, axis=1), axis=1)
    )
    if count <= 4 and len(pivots):
        # every pivot left of the edge from candidate a to candidate b
        q = pts[coarse]
        ex = q[None, :, 0] - q[:, None, 0]
        ey = q[None, :, 1] - q[:, None, 1]
        dx = pivots[None, None, :, 0] - q[:, None, None, 0]
        dy = pivots[None, None, :, 1] - q[:, None, None, 1]
        left = np.all(ex[..., None] * dy - ey[..., None] * dx >= -1e-9, axis=2)
        holds = np.ones(len(combos), dtype=bool)
        for e in range(k0):
            holds &= left[combos[:, e], combos[:, (e + 1) % k0]]
        areas = np.where(holds, areas + 1e12, areas)
    j = int(np.argmax(areas))
    chosen = sorted(int(coarse[c]) for c in combos[j])
    while len(chosen) < count:  # more than four: add the corner that gains the most
        c = max(
            (c for c in range(n) if c not in chosen),
            key=lambda c: (_score(pts, chosen + [c], pivots), -c),
        )
        chosen = sorted(chosen + [c])
    for _ in range(50):  # move each pillar to a better neighbour while one exists
        moved = False
        for k in range(len(chosen)):
            lo = chosen[k - 1] if k > 0 else chosen[-1] - n
            hi = chosen[k + 1] if k + 1 < len(chosen) else chosen[0] + n
            step = n // _COARSE + 1  # look one coarse step either way
            near = range(max(lo + 1, chosen[k] - step), min(hi, chosen[k] + step + 1))
            best = max(
                (sorted(chosen[:k] + [c % n] + chosen[k + 1 :]) for c in near),
                key=lambda trial: _score(pts, trial, pivots),
            )
            if _score(pts, best, pivots) > _score(pts, chosen, pivots):
                chosen, moved = best, True
        if not moved:
            break
    return chosen


def choose_pillars(
    candidates: np.ndarray, count: int, limits: FrameLimits, pivots: np.ndarray
) -> list[Pillar]:
    """The ``count`` (or, when fewer fit apart, at least three) pillars round the
    ``pivots`` (``(p, 2)``, mm) enclosing the largest area; an empty list when three do
    not fit."""
    if len(candidates) < 3:
        return []
    hull = candidates[convex_hull_order(candidates)]
    apart = pillar_spacing(limits)
    for k in range(count, 2, -1):
        idx = _largest(hull, k, pivots)
        if len(idx) < k:
            continue
        p = hull[idx]
        dist = np.hypot(*(p[:, None, :] - p[None, :, :]).transpose(2, 0, 1))
        np.fill_diagonal(dist, np.inf)
        if float(dist.min()) >= apart - 1e-9:
            # number the pillars from the one lowest left, counter-clockwise
            start = int(np.lexsort((p[:, 0], p[:, 1]))[0])
            p = np.roll(p, -start, axis=0)
            return [
                Pillar(
                    f"pillar_{i + 1}",
                    round(float(x), 6) + 0.0,
                    round(float(y), 6) + 0.0,
                )
                for i, (x, y) in enumerate(p)
            ]
    return []


def given_pillars(
    design: Design,
    zones: Sequence[Zone],
    holes: Sequence[FrameHole],
    limits: FrameLimits,
) -> tuple[list[Pillar], list[PillarTrouble]]:
    """The design's own pillars, and a trouble for each that meets a moving part."""
    r = limits.pillar_diameter / 2
    out, troubles = [], []
    for spec in design.pillars:
        name = f"pillar_{spec.index}"
        x, y = spec.at
        out.append(Pillar(name, x, y, True))
        for z in zones:
            gap = float(disc_gap(np.array(x), np.array(y), r, z))
            if gap < limits.clearance - 1e-9:
                troubles.append(
                    PillarTrouble(
                        f"{name} / {z.label}",
                        f"{name} at ({x:g}, {y:g}) ({limits.pillar_diameter:g} mm across)"
                        f" comes within {max(gap, 0.0):.3f} mm of {z.label} (heights"
                        f" {z.z0:g} to {z.z1:g} mm)"
                        + (" and overlaps it" if gap < 0 else ""),
                        f"{gap:.3f} mm",
                        f">= {limits.clearance:g} mm",
                        "move the [[pillar]] 'at', or leave all [[pillar]] tables out to"
                        " have the pillars placed clear of the train",
                    )
                )
    return out, troubles


def room_report(
    zones: Sequence[Zone],
    candidates: np.ndarray,
    outline: np.ndarray,
    limits: FrameLimits,
) -> str:
    """Where the plate has room for a pillar and where it lacks it, in words."""
    centre = outline.mean(axis=0)
    text = []
    if len(candidates):
        spots = _spots(candidates, pillar_spacing(limits))
        places = ", ".join(f"({x:.1f}, {y:.1f})" for x, y in spots[:6])
        text.append(f"room for a pillar only near {places}")
    else:
        text.append("no room for a single pillar")
    lacking = []
    ang_c = (
        np.degrees(np.arctan2(*(candidates - centre).T[::-1]))
        if len(candidates)
        else np.array([])
    )
    for k, words in enumerate(_DIRECTIONS):
        mid = 45.0 * k
        if len(ang_c) and np.any(np.abs((ang_c - mid + 180.0) % 360.0 - 180.0) <= 22.5):
            continue
        who = _fillers(zones, outline, centre, mid)
        lacking.append(f"{words} ({', '.join(who) if who else 'the plate edge'})")
    if lacking:
        text.append("lacking " + "; ".join(lacking))
    return "; ".join(text)


def _spots(candidates: np.ndarray, apart: float) -> list[tuple[float, float]]:
    spots: list[tuple[float, float]] = []
    for x, y in candidates:
        if all(math.hypot(x - sx, y - sy) >= apart for sx, sy in spots):
            spots.append((float(x), float(y)))
    return spots


def _fillers(
    zones: Sequence[Zone], outline: np.ndarray, centre: np.ndarray, mid_deg: float
) -> list[str]:
    """The zones that cover the plate in the wedge of +-22.5 degrees about ``mid_deg``."""
    reach = float(np.max(np.hypot(*(outline - centre).T)))
    t = np.radians(np.linspace(mid_deg - 22.5, mid_deg + 22.5, 10))
    r = np.linspace(0.0, reach, 40)
    px = centre[0] + np.outer(r, np.cos(t)).ravel()
    py = centre[1] + np.outer(r, np.sin(t)).ravel()
    keep = inside_polygon(np.column_stack((px, py)), outline)
    px, py = px[keep], py[keep]
    names = []
    for z in zones:
        if np.any(disc_gap(px, py, 0.0, z) < 0) and z.label not in names:
            names.append(z.label)
    big = [n for n in names if n.startswith(("wheel", "path", "pin", "cock"))]
    return (big or names)[:4]
