"""Cocks: a second bearing for an arbor that only one plate can hold (mm, degrees).

Two axes closer than their radii, the two axes of a pin-and-slot coupling, and an arbor
whose way to one plate is barred by another axis's wheel cannot run from plate to
plate (:mod:`wheelgen.layout.stacking`): each is held by one plate. Such an arbor gets
a *cock*: a bar with a pivot hole on the arbor's axis, carried by a foot that stands on
the inner face of a plate and is fixed to it by two screws from the outside. Two places
are tried, in this order:

1. **at the free end**: beyond the arbor's wheels, on the side of the plate that cannot
   hold it, the foot standing on that plate. The arbor is lengthened to the cock (its
   way there must be clear), and its wheels then run between two bearings, as between
   two plates;
2. **beside the held end**: between the plate that holds it and its nearest wheel, the
   foot standing on that plate. The wheels then overhang the cock, close to it.

In each place the bar is put as close to the wheels as the frame's clearance allows,
then moved away in 0.5 mm steps while the two bearings stay
:attr:`~wheelgen.frame.limits.FrameLimits.bearing_spacing_factor` arbor diameters
apart; every 5 degrees of direction and every 0.5 mm of reach (up to 80 mm) is tried.
The bar must clear every zone at its heights (the arbor it holds excepted), the foot
every zone from the plate to the bar, each by the frame's clearance, and its two screw
holes must keep the spacing of :func:`~wheelgen.frame.limits.min_centre_distance` from
the plate's other holes. The shortest bar wins (the stiffest), then the one with the
most room round it, then the smallest angle.

When nothing fits, the arbor stays held at one end and the frame checks report what is
in the way.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from ..design.model import Design
from ..layout.sleeves import coaxial_groups
from ..layout.train_layout import Layout
from .holes import FrameHole, pivot_stock, seat_hole
from .keepout import Zone, bar_gap, disc_gap, zones_between
from .limits import FrameLimits, min_centre_distance

__all__ = ["Cock", "CockTrouble", "arbor_zone", "one_plate_arbors", "place_cocks"]

_ANGLES_DEG = np.arange(0.0, 360.0, 5.0)
_REACH = np.arange(1.0, 80.0 + 1e-9, 0.5)  # mm from the pivot to the foot's near end
_Z_STEP = 0.5


@dataclass(frozen=True, slots=True)
class Cock:
    """A cock (bridge) holding ``arbor``'s second pivot, screwed to ``plate`` (mm).

    ``held_by`` is the plate that holds the arbor's other pivot. ``arbor_z`` is the
    arbor's new span when it is lengthened to reach the cock, else ``None``.
    """

    name: str
    arbor: str
    plate: str
    held_by: str
    x: float
    y: float
    angle_deg: float
    length: float  # pivot to the centre of the bar's far end
    foot_from: float  # where the foot starts along the bar
    width: float
    bar_z0: float
    bar_z1: float
    foot_z0: float
    foot_z1: float
    hole: FrameHole
    screws: tuple[tuple[float, float], ...]
    arbor_z: tuple[float, float] | None = None

    def along(self, distance: float) -> tuple[float, float]:
        """The point ``distance`` mm along the bar from the pivot."""
        a = math.radians(self.angle_deg)
        return (self.x + distance * math.cos(a), self.y + distance * math.sin(a))

    @property
    def zones(self) -> list[Zone]:
        """The cock's bar and foot, as zones the rest of the frame keeps clear of."""
        end = self.along(self.length)
        start = self.along(self.foot_from)
        half = self.width / 2
        return [
            Zone(f"cock {self.name}", self.x, self.y, 0.0, half,
                 self.bar_z0, self.bar_z1, None, end),
            Zone(f"foot of cock {self.name}", *start, 0.0, half,
                 self.foot_z0, self.foot_z1, None, end),
        ]  # fmt: skip


@dataclass(frozen=True, slots=True)
class CockTrouble:
    """No cock fits ``arbor``: ``reason`` says why, ``blockers`` what is in the way."""

    arbor: str
    plate: str
    reason: str
    blockers: tuple[str, ...] = ()


@dataclass(frozen=True, slots=True)
class _Place:
    """Where a cock may go: its foot's plate, the heights the bar may take, and the
    heights the arbor must be lengthened over to reach it."""

    foot_plate: str
    lo: float  # the bar lies between lo and hi
    hi: float
    grows: str  # "up": the arbor runs up to the bar's top; "down"; "": no change


def one_plate_arbors(layout: Layout) -> list[tuple[str, str]]:
    """(arbor, plate) of every turning plate-mounted arbor held by one plate only."""
    design = layout.design
    out = []
    for name, span in layout.stacking.spans.items():
        arbor = design.arbor(name)
        if (
            span.kind == "arbor"
            and len(span.plates) == 1
            and not arbor.fixed
            and layout.position(name) is not None
        ):
            out.append((name, span.plates[0]))
    return out


def _places(
    design: Design, zones: Sequence[Zone], root: str, held: str
) -> list[_Place]:
    """The free end first, then beside the held end."""
    assert design.frame is not None
    group = set(coaxial_groups(design)[root])
    own = [z for z in zones if z.member in group and z.label != f"arbor {root}"]
    if not own:
        return []
    back, front = design.frame.plates
    low, high = min(z.z0 for z in own), max(z.z1 for z in own)
    if held == "back":
        return [_Place("front", high, front, "up"), _Place("back", back, low, "")]
    return [_Place("back", back, low, "down"), _Place("front", high, front, "")]


def place_cocks(
    layout: Layout,
    limits: FrameLimits,
    zones: Sequence[Zone],
    plate_holes: dict[str, list[FrameHole]],
) -> tuple[list[Cock], list[CockTrouble]]:
    """A cock for every arbor held by one plate; or why none fits."""
    design = layout.design
    cocks: list[Cock] = []
    troubles: list[CockTrouble] = []
    placed: list[Zone] = []
    screw_holes: dict[str, list[tuple[float, float]]] = {"back": [], "front": []}
    for root, held in one_plate_arbors(layout):
        places = _places(design, zones, root, held)
        if not places:
            continue
        found: Cock | None = None
        reasons: list[str] = []
        blockers: dict[str, float] = {}
        for place in places:
            result = _place_one(
                layout, limits, list(zones) + placed, plate_holes, screw_holes,
                root, held, place, blockers,
            )  # fmt: skip
            if isinstance(result, Cock):
                found = result
                break
            reasons.append(result)
        if found is None:
            worst = sorted(blockers, key=lambda k: blockers[k])[:4]
            troubles.append(CockTrouble(root, held, "; ".join(reasons), tuple(worst)))
            continue
        cocks.append(found)
        placed.extend(found.zones)
        if found.arbor_z is not None:
            placed.append(arbor_zone(layout, root, *found.arbor_z))
        screw_holes[found.plate].extend(found.screws)
    return cocks, troubles


def arbor_zone(layout: Layout, root: str, z0: float, z1: float) -> Zone:
    """The zone of arbor ``root`` between heights ``z0`` and ``z1`` (mm)."""
    x, y = layout.position(root) or (0.0, 0.0)
    r = layout.outside(root) / 2
    return Zone(f"arbor {root}", x, y, 0.0, r, z0, z1, root)


def _place_one(
    layout: Layout,
    limits: FrameLimits,
    zones: list[Zone],
    plate_holes: dict[str, list[FrameHole]],
    screw_holes: dict[str, list[tuple[float, float]]],
    root: str,
    held: str,
    place: _Place,
    blockers: dict[str, float],
) -> Cock | str:
    design = layout.design
    assert design.frame is not None
    pos = layout.position(root)
    assert pos is not None
    span = layout.stacking.spans[root]
    clr = limits.clearance
    t_plate = design.frame.thickness
    back, front = design.frame.plates
    hole = seat_hole(design, root, layout.outside(root), False, f"cock of {root}", *pos)
    width = max(limits.cock_width, 2 * 1.2 * hole.diameter)
    thick = limits.cock_thickness
    seat = pivot_stock(design, root, layout.outside(root))
    if seat is not None and seat.width is not None:
        thick = max(thick, seat.width)  # the bush or bearing sits wholly in the bar
    spacing = limits.cock_screw_spacing
    need = limits.bearing_spacing_factor * design.arbor(root).diameter
    held_mid = back - t_plate / 2 if held == "back" else front + t_plate / 2
    side = "at its free end" if place.grows else f"beside the {held} plate"
    heights = []
    if place.foot_plate == "back":  # the bar above its foot, as high as it may be
        zb = place.hi - clr - thick
        while zb >= place.lo + (clr if place.grows else 0.0) - 1e-9:
            if abs((zb + thick / 2) - held_mid) >= need - 1e-9:
                heights.append(zb)
            zb -= _Z_STEP
    else:  # the bar below its foot, as low as it may be
        zb = place.lo + clr
        while zb + thick <= place.hi - (clr if place.grows else 0.0) + 1e-9:
            if abs(held_mid - (zb + thick / 2)) >= need - 1e-9:
                heights.append(zb)
            zb += _Z_STEP
    if not heights:
        return (
            f"{side} there is no room between heights {place.lo:g} and {place.hi:g} mm"
            f" for a cock {thick:g} mm thick, {clr:g} mm clear of the wheels and"
            f" {need:g} mm (three arbor diameters) from the plate's pivot"
        )
    angles = np.radians(_ANGLES_DEG)
    ux, uy = np.cos(angles)[:, None], np.sin(angles)[:, None]
    near = (_REACH + width / 2)[None, :]  # where the foot starts
    far = near + spacing  # the bar's far end (and the foot's)
    px, py = pos
    bar_end = (px + far * ux, py + far * uy)
    foot_start = (px + near * ux, py + near * uy)
    pivot = (np.full_like(far, px), np.full_like(far, py))
    group = set(coaxial_groups(design)[root])
    for zb in heights:
        bar_z = (zb, zb + thick)
        if place.foot_plate == "back":
            foot_z = (back, zb)
        else:
            foot_z = (zb + thick, front)
        arbor_z = None
        way = (0.0, 0.0)
        if place.grows == "up":
            arbor_z = (span.z0, zb + thick)
            way = (span.z1, zb + thick)
        elif place.grows == "down":
            arbor_z = (zb, span.z1)
            way = (zb, span.z0)
        if arbor_z is not None:
            # the lengthened arbor must pass clear of everything but its own group
            r = layout.outside(root) / 2
            barred = False
            for z in zones_between(zones, *way, 0.0):
                if z.member in group:
                    continue
                step = float(disc_gap(np.array(px), np.array(py), r, z))
                if step < clr - 1e-9:
                    blockers[z.label] = min(blockers.get(z.label, math.inf), step)
                    barred = True
            if barred:
                continue
        ok = np.ones(bar_end[0].shape, dtype=bool)
        room = np.full(bar_end[0].shape, np.inf)
        for z in zones_between(zones, *bar_z, clr):
            if z.label == f"arbor {root}":
                continue
            gap = bar_gap(pivot, bar_end, width / 2, z)
            _note(blockers, z.label, gap, clr)
            ok &= gap >= clr - 1e-9
            room = np.minimum(room, gap)
        for z in zones_between(zones, *foot_z, clr):
            gap = bar_gap(foot_start, bar_end, width / 2, z)
            _note(blockers, z.label, gap, clr)
            ok &= gap >= clr - 1e-9
            room = np.minimum(room, gap)
        d_screw = limits.screw.clearance_hole
        for sx, sy in (foot_start, bar_end):
            for h in plate_holes[place.foot_plate]:
                need_d = min_centre_distance(d_screw, h.diameter, limits)
                ok &= np.hypot(sx - h.x, sy - h.y) >= need_d - 1e-9
            for qx, qy in screw_holes[place.foot_plate]:
                need_d = min_centre_distance(d_screw, d_screw, limits)
                ok &= np.hypot(sx - qx, sy - qy) >= need_d - 1e-9
        if not ok.any():
            continue
        # shortest reach first, then the most room, then the smallest angle
        cols = np.nonzero(ok.any(axis=0))[0]
        j = int(cols[0])
        rows = np.nonzero(ok[:, j])[0]
        i = int(rows[np.argmax(room[rows, j])])
        s1 = (float(foot_start[0][i, j]), float(foot_start[1][i, j]))
        s2 = (float(bar_end[0][i, j]), float(bar_end[1][i, j]))
        name = f"cock_{root}"
        return Cock(
            name=name,
            arbor=root,
            plate=place.foot_plate,
            held_by=held,
            x=px,
            y=py,
            angle_deg=float(_ANGLES_DEG[i]),
            length=round(float(far[0, j]), 6),
            foot_from=round(float(near[0, j]), 6),
            width=width,
            bar_z0=round(bar_z[0], 6),
            bar_z1=round(bar_z[1], 6),
            foot_z0=round(foot_z[0], 6),
            foot_z1=round(foot_z[1], 6),
            hole=FrameHole(
                name,
                px,
                py,
                hole.diameter,
                hole.nominal,
                hole.role,
                root,
                hole.fit,
                hole.low,
                hole.high,
            ),  # fmt: skip
            screws=(_round(s1), _round(s2)),
            arbor_z=None
            if arbor_z is None
            else (round(arbor_z[0], 6), round(arbor_z[1], 6)),
        )
    return (
        f"{side} no cock {width:g} mm wide fits: in every direction its bar or foot"
        f" comes within {clr:g} mm of a moving part"
        + (", or the lengthened arbor's way is barred" if place.grows else "")
    )


def _note(blockers: dict[str, float], label: str, gap: np.ndarray, clr: float) -> None:
    worst = float(np.min(gap))
    if worst < clr:
        blockers[label] = min(blockers.get(label, math.inf), worst)


def _round(p: tuple[float, float]) -> tuple[float, float]:
    return (round(p[0], 6) + 0.0, round(p[1], 6) + 0.0)
