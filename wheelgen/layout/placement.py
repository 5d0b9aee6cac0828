"""Where every arbor axis stands on the plates: from ``at``, mesh bearings and pin offsets.

Positions are in mm, in the fixed frame seen from the front, with every carrier at
angle 0 (a carried arbor's ``at`` is then simply added to its carrier's axis). A sleeve
stands on the axis of the member it surrounds, so only axis roots are placed.

Every placing rule is an edge ``pos[to] = pos[from] + vector``: an ``at`` ties an axis to
the origin, a mesh with a ``bearing`` ties the second wheel's axis to the first's at the
working centre distance (profile shift included), a pin-and-slot ties the slot axis to
the pin axis at the offset, and a carried arbor ties to its carrier's axis. The edges
are walked breadth first from the origin; an edge that meets an axis already placed
closes a loop, and the two routes must agree within a tolerance.
"""

from __future__ import annotations

import math
from collections import deque
from dataclasses import dataclass, field
from typing import Literal

from ..design.model import Design, Mesh, Wheel
from ..kinematics.rates import axis_root
from ..teeth.mesh_data import mesh_data
from ..teeth.spec import ToothSpec, thinning_for

__all__ = [
    "LOOP_TOLERANCE",
    "Link",
    "LinkKind",
    "LoopMismatch",
    "AxisPositions",
    "arbor_positions",
    "mesh_centre_distance",
    "nominal_tip_radius",
    "place_axes",
    "tooth_spec",
    "working_centre_distance",
]

#: mm: two routes to one axis that differ by more than this are reported.
LOOP_TOLERANCE = 0.01

_ORIGIN = "@origin"


def tooth_spec(wheel: Wheel) -> ToothSpec:
    """The tooth generator's input for ``wheel``; thinning is half the backlash (mm)."""
    return ToothSpec(
        teeth=wheel.teeth,
        module=wheel.module,
        form=wheel.form,
        pressure_angle_deg=wheel.pressure_angle_deg,
        tooth_angle_deg=wheel.tooth_angle_deg,
        shift=wheel.shift,
        addendum=wheel.addendum,
        dedendum=wheel.dedendum,
        root_radius=wheel.root_radius,
        tip_radius=wheel.tip_radius,
        thinning=thinning_for(wheel.backlash),
        diametral_pitch=wheel.diametral_pitch,
    )


def nominal_tip_radius(spec: ToothSpec) -> float:
    """Tip radius (mm) before any tip shortening: ``m (z/2 + h_a + x)``.

    ISO 21771:2007, tip diameter ``d_a = d + 2 m (h_aP* + x)`` with no tip shortening;
    triangular teeth have no profile shift.
    """
    shift = spec.shift if spec.form == "involute" else 0.0
    return spec.module * (spec.teeth / 2.0 + spec.addendum + shift)


def working_centre_distance(spec1: ToothSpec, spec2: ToothSpec) -> float:
    """Working centre distance (mm) of two wheels in external mesh.

    The teeth layer's figure (:func:`wheelgen.teeth.mesh_data.mesh_data`): for involute
    teeth with profile shift, ISO 21771:2007 ``inv a_w = inv a + 2 tan a (x1 + x2) /
    (z1 + z2)``, ``a = m (z1 + z2) / 2 * cos a / cos a_w``; the backlash comes from
    thinning the teeth, not from the distance. Triangular teeth mesh at ``m (z1 + z2) / 2``.
    """
    return float(mesh_data(spec1, spec2).centre_distance)


def mesh_centre_distance(design: Design, mesh: Mesh) -> float:
    """Working centre distance (mm) of one ``[[mesh]]``."""
    a, b = (design.wheel(n) for n in mesh.pair)
    return working_centre_distance(tooth_spec(a), tooth_spec(b))


LinkKind = Literal["at", "carrier", "mesh", "pinslot"]


@dataclass(frozen=True, slots=True)
class Link:
    """One placing rule: ``pos[to] = pos[source] + (dx, dy)``; ``label`` says which.

    ``kind`` and ``item`` say what in the file sets it: an arbor's ``at`` (item: the
    arbor; ``carrier`` when measured on a carrier wheel), a mesh's ``bearing`` (item:
    the mesh's 1-based index as text) or a coupling's ``bearing`` (item: its name).
    """

    source: str
    to: str
    dx: float
    dy: float
    label: str
    kind: LinkKind = "at"
    item: str = ""

    @property
    def length(self) -> float:
        return math.hypot(self.dx, self.dy)


@dataclass(frozen=True, slots=True)
class LoopMismatch:
    """Two routes place axis ``axis`` at different points (mm)."""

    axis: str
    first: tuple[float, float]
    first_route: tuple[str, ...]
    second: tuple[float, float]
    second_route: tuple[str, ...]
    closing: Link | None = None  # the rule that did not fit

    @property
    def distance(self) -> float:
        return math.hypot(
            self.first[0] - self.second[0], self.first[1] - self.second[1]
        )


@dataclass(frozen=True, slots=True)
class AxisPositions:
    """Placed axis roots (mm, carriers at angle 0), the route to each, and loop misfits.

    ``placed_by[axis]`` is the rule that placed the axis and the way it was used
    (``+1``: from ``source`` to ``to``, ``-1``: backwards); ``order`` lists the axes in
    the order they were placed (an axis never depends on one placed after it).
    """

    positions: dict[str, tuple[float, float]]
    routes: dict[str, tuple[str, ...]]
    mismatches: tuple[LoopMismatch, ...]
    placed_by: dict[str, tuple[Link, int]] = field(default_factory=dict)
    order: tuple[str, ...] = ()


def _links(design: Design) -> list[Link]:
    links: list[Link] = []
    for a in design.arbors:
        if a.around is None and a.at is not None:
            if a.carrier is None:
                links.append(
                    Link(
                        _ORIGIN, a.name, a.at[0], a.at[1], f'"at" of arbor {a.name}',
                        "at", a.name,
                    )
                )  # fmt: skip
            else:
                carrier_axis = axis_root(design, design.wheel(a.carrier).arbor)
                links.append(
                    Link(
                        carrier_axis, a.name, a.at[0], a.at[1], f"carrier {a.carrier}",
                        "carrier", a.name,
                    )
                )  # fmt: skip
    for m in design.meshes:
        if m.bearing_deg is None:
            continue
        wa, wb = (design.wheel(n) for n in m.pair)
        dist = mesh_centre_distance(design, m)
        t = math.radians(m.bearing_deg)
        links.append(
            Link(
                axis_root(design, wa.arbor),
                axis_root(design, wb.arbor),
                dist * math.cos(t),
                dist * math.sin(t),
                m.label,
                "mesh",
                str(m.index),
            )
        )
    for p in design.pinslots:
        t = math.radians(p.bearing_deg)
        links.append(
            Link(
                axis_root(design, design.wheel(p.pin).arbor),
                axis_root(design, design.wheel(p.slot).arbor),
                p.offset * math.cos(t),
                p.offset * math.sin(t),
                f"pin-and-slot {p.name}",
                "pinslot",
                p.name,
            )
        )
    return links


def place_axes(design: Design, tolerance: float = LOOP_TOLERANCE) -> AxisPositions:
    """Place every axis root; report each loop that fails to close within ``tolerance`` mm.

    Axes that nothing places are left out (the loader refuses such designs).
    """
    if not (math.isfinite(tolerance) and tolerance >= 0):
        raise ValueError(f"'tolerance' must be >= 0 mm, got {tolerance}")
    links = _links(design)
    adjacent: dict[str, list[tuple[Link, int]]] = {}
    for link in links:
        adjacent.setdefault(link.source, []).append((link, +1))
        adjacent.setdefault(link.to, []).append((link, -1))
    pos: dict[str, tuple[float, float]] = {_ORIGIN: (0.0, 0.0)}
    route: dict[str, tuple[str, ...]] = {_ORIGIN: ()}
    used: set[int] = set()
    mismatches: list[LoopMismatch] = []
    placed_by: dict[str, tuple[Link, int]] = {}
    order: list[str] = []
    queue = deque([_ORIGIN])
    while queue:
        here = queue.popleft()
        for link, sense in adjacent.get(here, []):
            if id(link) in used:
                continue
            used.add(id(link))
            there = link.to if sense > 0 else link.source
            x = pos[here][0] + sense * link.dx
            y = pos[here][1] + sense * link.dy
            if there not in pos:
                pos[there] = (x, y)
                route[there] = route[here] + (link.label,)
                placed_by[there] = (link, sense)
                order.append(there)
                queue.append(there)
                continue
            if math.hypot(x - pos[there][0], y - pos[there][1]) > tolerance:
                mismatches.append(
                    LoopMismatch(
                        there,
                        pos[there],
                        route[there],
                        (x, y),
                        route[here] + (link.label,),
                        link,
                    )
                )
    del pos[_ORIGIN], route[_ORIGIN]
    # sub-nanometre float noise (6.8e-15 from cos 180 deg) would print as "-0.0000"
    clean = {k: (round(x, 9) + 0.0, round(y, 9) + 0.0) for k, (x, y) in pos.items()}
    return AxisPositions(clean, route, tuple(mismatches), placed_by, tuple(order))


def arbor_positions(design: Design) -> dict[str, tuple[float, float]]:
    """Every arbor's axis position (mm) in the fixed frame with carriers at angle 0.

    Sleeves get the position of the axis they surround. Arbors that cannot be placed
    are left out.
    """
    axes = place_axes(design).positions
    out: dict[str, tuple[float, float]] = {}
    for a in design.arbors:
        root = axis_root(design, a.name)
        if root in axes:
            out[a.name] = axes[root]
    return out
