"""Where the frame may not go: every moving body's footprint on the plate, by height.

Seen along the axes, each body of the train (:func:`wheelgen.layout.collisions.bodies`)
and each pin's ring (:func:`wheelgen.layout.collisions.pin_sweeps`) takes a *zone*
between two heights:

- a wheel on a fixed axis: the disc of the largest radius of its outline (what it sweeps
  as it turns); an arbor, tube, hub or collar: its own disc;
- a body on a carried axis: the ring its disc sweeps as the carrier turns (radii
  ``R - r`` to ``R + r`` about the carrier's axis, ``R`` the distance between the axes);
- a coupling's pin: its ring about the pin wheel's axis.

Frame parts are tested against zones as discs and *bars* (a segment with a half width:
a cock's arm and foot), and the frame's own parts become zones for those planned after
them. Lengths in mm.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass

import numpy as np

from ..kinematics.rates import axis_root
from ..layout.collisions import bodies, outline_radius, pin_sweeps
from ..layout.placement import tooth_spec
from ..layout.train_layout import Layout

__all__ = [
    "Zone",
    "bar_gap",
    "disc_gap",
    "train_zones",
    "zones_between",
]


@dataclass(frozen=True, slots=True)
class Zone:
    """Something the frame keeps clear of, between heights ``z0`` and ``z1`` (mm).

    A disc or ring about (``x``, ``y``) from radius ``inner`` to ``outer`` (``inner``
    0: a disc); or, when ``to`` is set, a bar from (``x``, ``y``) to ``to`` that is
    ``outer`` wide on each side of that segment. ``member`` is the arbor or sleeve it
    belongs to (a frame part: ``None``); ``label`` names it in messages.
    """

    label: str
    x: float
    y: float
    inner: float
    outer: float
    z0: float
    z1: float
    member: str | None = None
    to: tuple[float, float] | None = None

    @property
    def circles(self) -> list[tuple[float, float, float]]:
        """Circles whose hull holds the zone (x, y, radius; mm)."""
        if self.to is None:
            return [(self.x, self.y, self.outer)]
        return [(self.x, self.y, self.outer), (*self.to, self.outer)]


def _carrier_centre(
    layout: Layout, root: str
) -> tuple[tuple[float, float], float] | None:
    """For a carried axis: the fixed axis it circles and how far from it (mm).

    A carrier that is itself carried adds its own offset (a conservative circle).
    """
    design = layout.design
    pos = layout.placing.positions
    reach, here = 0.0, root
    while (carrier := design.arbor(here).carrier) is not None:
        centre = axis_root(design, design.wheel(carrier).arbor)
        reach += math.dist(pos[here], pos[centre])
        here = centre
    if here == root:
        return None
    return pos[here], reach


def train_zones(layout: Layout) -> list[Zone]:
    """The zone of every body and pin ring of the train (mm)."""
    design = layout.design
    pos = layout.placing.positions
    out: list[Zone] = []
    for b in bodies(layout):
        r = b.radius
        if b.kind == "teeth" and b.wheel is not None:
            try:
                r = max(r, outline_radius(tooth_spec(design.wheel(b.wheel))))
            except (ImportError, ValueError):  # no outline: the tip circle
                pass
        carried = _carrier_centre(layout, b.axis)
        if carried is None:
            x, y = pos[b.axis]
            out.append(Zone(b.label, x, y, 0.0, r, b.z0, b.z1, b.member))
        else:
            (cx, cy), reach = carried
            label = f"path of {b.label} about its carrier"
            out.append(
                Zone(
                    label, cx, cy, max(0.0, reach - r), reach + r, b.z0, b.z1, b.member
                )
            )
    for s in pin_sweeps(layout):
        carried = _carrier_centre(layout, s.axis)
        x, y = pos[s.axis]
        inner, outer = s.inner, s.outer
        if carried is not None:
            (x, y), reach = carried
            inner, outer = max(0.0, reach - s.outer), reach + s.outer
        out.append(
            Zone(f"pin of {s.pinslot}", x, y, inner, outer, s.z0, s.z1, s.member)
        )
    return out


def zones_between(
    zones: Iterable[Zone], z0: float, z1: float, gap: float
) -> list[Zone]:
    """The zones that come within ``gap`` mm of the heights ``z0`` to ``z1``."""
    return [z for z in zones if z.z0 < z1 + gap - 1e-9 and z.z1 > z0 - gap + 1e-9]


def _segment_distance(
    px: np.ndarray, py: np.ndarray, a: tuple[float, float], b: tuple[float, float]
) -> np.ndarray:
    ax, ay = a
    dx, dy = b[0] - ax, b[1] - ay
    length2 = dx * dx + dy * dy
    if length2 < 1e-300:
        return np.asarray(np.hypot(px - ax, py - ay))
    t = np.clip(((px - ax) * dx + (py - ay) * dy) / length2, 0.0, 1.0)
    return np.asarray(np.hypot(px - ax - t * dx, py - ay - t * dy))


def disc_gap(x: np.ndarray, y: np.ndarray, radius: float, zone: Zone) -> np.ndarray:
    """Gap (mm) between discs of ``radius`` at (x, y) and ``zone``; < 0: overlap."""
    x, y = np.asarray(x, dtype=float), np.asarray(y, dtype=float)
    if zone.to is not None:
        return _segment_distance(x, y, (zone.x, zone.y), zone.to) - zone.outer - radius
    d = np.hypot(x - zone.x, y - zone.y)
    outside = d - radius - zone.outer
    if zone.inner <= 0:
        return np.asarray(outside)
    within = zone.inner - (d + radius)  # the disc sits in the ring's hole
    return np.asarray(np.maximum(outside, within))


def bar_gap(
    start: tuple[np.ndarray, np.ndarray],
    end: tuple[np.ndarray, np.ndarray],
    half_width: float,
    zone: Zone,
) -> np.ndarray:
    """Gap (mm) between bars (segments ``start``-``end``, ``half_width`` each side) and
    ``zone``; arrays of segments at once. < 0: overlap."""
    sx, sy = (np.asarray(v, dtype=float) for v in start)
    ex, ey = (np.asarray(v, dtype=float) for v in end)
    if zone.to is not None:
        # bar against bar: sample the zone's segment (it is short) finely
        samples = np.linspace(0.0, 1.0, 41)
        best = np.full(np.broadcast(sx, ex).shape, np.inf)
        for t in samples:
            qx = zone.x + t * (zone.to[0] - zone.x)
            qy = zone.y + t * (zone.to[1] - zone.y)
            best = np.minimum(best, _point_segments(qx, qy, sx, sy, ex, ey))
        return best - half_width - zone.outer
    near = _point_segments(zone.x, zone.y, sx, sy, ex, ey)
    outside = near - half_width - zone.outer
    if zone.inner <= 0:
        return outside
    far = np.maximum(
        np.hypot(sx - zone.x, sy - zone.y), np.hypot(ex - zone.x, ey - zone.y)
    )
    within = zone.inner - (far + half_width)
    return np.asarray(np.maximum(outside, within))


def _point_segments(
    qx: float, qy: float, sx: np.ndarray, sy: np.ndarray, ex: np.ndarray, ey: np.ndarray
) -> np.ndarray:
    dx, dy = ex - sx, ey - sy
    length2 = np.maximum(dx * dx + dy * dy, 1e-300)
    t = np.clip(((qx - sx) * dx + (qy - sy) * dy) / length2, 0.0, 1.0)
    return np.asarray(np.hypot(qx - sx - t * dx, qy - sy - t * dy))
