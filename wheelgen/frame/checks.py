"""Frame checks for the shared findings list of ``wheelgen check`` and the build.

``frame_findings(design)`` gives the findings the engine of
:mod:`wheelgen.checks.engine` adds to every run; its ids start with ``frame.``:

- ``frame.none``: the design has no ``[frame]``, so no plates (a note);
- ``frame.pillar_room``: fewer than three pillars fit (an error that says where room is
  lacking), or fewer than asked for (a warning);
- ``frame.pillar_clearance``: a pillar the design places meets a moving part;
- ``frame.cock``: an arbor that one plate holds and no cock fits;
- ``frame.held``: an arbor that turns and is held at one end only (an error), or held
  by a plate and a cock (a note saying which);
- ``frame.clearance``: a pillar, cock or bush comes closer to a wheel, a carried path,
  a pin's ring or an arbor than the frame's clearance (measured on the plan, whatever
  placed it);
- ``frame.material``: too little material between two holes of a plate or cock, or
  between a hole and the edge (limits of :mod:`wheelgen.frame.limits`);
- ``frame.stock``: an arbor asks for a bush or bearing that the ``[[stock]]`` list
  does not have;
- ``frame.screw``: no ISO 4762 screw length both holds and fits a hole;
- ``frame.pillar_size``: a ``pillar_diameter`` too small for the spigots' shoulders or
  the wall round the screw holes.

Lengths in mm.
"""

from __future__ import annotations

import numpy as np

from ..design.model import Design
from ..findings import Finding, Level
from ..layout.collisions import inside_polygon
from ..layout.proximity import overlapping_pairs
from ..layout.sleeves import coaxial_groups
from .keepout import Zone, bar_gap, disc_gap, zones_between
from .limits import (
    EDGE_FACTOR,
    SHOULDER_MIN,
    SPACING_FACTOR,
    WALL_MIN,
    min_centre_distance,
    min_edge_distance,
    spacing_reach,
)
from .outline import edges_polyline, outline_distance
from .plan import FramePlan, plan_frame

__all__ = ["frame_bodies", "frame_findings", "findings_for_frame"]


def _mm(x: float) -> str:
    return f"{x:.3f} mm"


def frame_findings(design: Design) -> list[Finding]:
    """Every frame finding of ``design``."""
    if design.frame is None:
        return [
            Finding(
                "note",
                "frame.none",
                f"design {design.name}",
                "the design has no [frame] table: no plates, pillars or drilling"
                " chart are made",
                advice="add a [frame] table (plates = [back, front] heights, mm)",
            )
        ]
    try:
        plan = plan_frame(design)
    except ValueError:  # a layout that cannot be made: the layout check reports it
        return []
    return findings_for_frame(plan)


def findings_for_frame(plan: FramePlan) -> list[Finding]:
    """The findings of an already planned frame (see :func:`frame_findings`)."""
    out: list[Finding] = []
    for t in plan.pillar_troubles:
        check = (
            "frame.pillar_room"
            if t.subject == "frame pillars"
            else "frame.pillar_clearance"
        )
        level: Level = "warning" if t.level == "warning" else "error"
        out.append(
            Finding(level, check, t.subject, t.message, t.measured, t.limit, t.advice)
        )
    for c in plan.cock_troubles:
        blocked = f"; in the way: {', '.join(c.blockers)}" if c.blockers else ""
        out.append(
            Finding(
                "error",
                "frame.cock",
                f"arbor {c.arbor}",
                f'arbor "{c.arbor}" is held by the {c.plate} plate only, and {c.reason}'
                f"{blocked}",
                advice=f"move its wheels further from the {c.plate} plate (height), or"
                " move the parts in the way",
            )
        )
    out.extend(_held(plan))
    out.extend(_clearance(plan))
    out.extend(_frame_overlaps(plan))
    out.extend(_material(plan))
    for arbor, kind in plan.missing_stock:
        have = [
            f"{s.outside:g} x {s.inside:g} x {s.width:g}"
            for s in plan.design.stock
            if s.kind == kind
        ]
        out.append(
            Finding(
                "error",
                "frame.stock",
                f"arbor {arbor}",
                f'arbor "{arbor}" asks for a {kind} (pivot = "{kind}") and no {kind} on'
                " the [[stock]] list fits it"
                + (f" (the list has {', '.join(have)} mm)" if have else ""),
                advice=f'add a [[stock]] kind = "{kind}" whose bore'
                + (
                    " gives the running fit"
                    if kind == "bush"
                    else " is the arbor's diameter"
                )
                + ', or set pivot = "hole"',
            )
        )
    out.extend(_pillar_size(plan))
    for what, depth in plan.screw_troubles:
        lim = plan.limits
        out.append(
            Finding(
                "error",
                "frame.screw",
                what,
                f"no {lim.screw.name} screw of a preferred length holds {what}: its hole"
                f" is {_mm(depth)} deep and the screw needs {_mm(lim.engagement)} of"
                f" thread beyond the {lim.plate_thickness:g} mm plate",
                _mm(depth),
                f">= {_mm(lim.engagement)}",
                "a smaller screw ([frame] screw) or a thicker part",
            )
        )
    return out


def _pillar_size(plan: FramePlan) -> list[Finding]:
    lim = plan.limits
    if not plan.pillars:
        return []
    if lim.spigot > 0:
        need = lim.spigot + 2 * SHOULDER_MIN
        what = f"its {lim.spigot:g} mm spigots and a {SHOULDER_MIN:g} mm shoulder for each plate"
    else:
        need = lim.screw.tap_drill + 2 * WALL_MIN
        what = (
            f"a {WALL_MIN:g} mm wall round its {lim.screw.tap_drill:g} mm screw holes"
        )
    if lim.pillar_diameter >= need - 1e-9:
        return []
    return [
        Finding(
            "error",
            "frame.pillar_size",
            "frame pillars",
            f"pillars {lim.pillar_diameter:g} mm across are too thin for {what}",
            _mm(lim.pillar_diameter),
            f">= {_mm(need)}",
            "leave [frame] pillar_diameter out, or make it larger (or use a smaller"
            " screw)",
        )
    ]


def _held(plan: FramePlan) -> list[Finding]:
    design = plan.design
    layout_spans = _spans(design)
    cocks = {c.arbor: c for c in plan.cocks}
    troubled = {c.arbor for c in plan.cock_troubles}
    out = []
    for name, plates in layout_spans.items():
        arbor = design.arbor(name)
        if arbor.fixed or arbor.carrier is not None or arbor.around is not None:
            continue
        holders = list(plates) + ([cocks[name].name] if name in cocks else [])
        if name in cocks:
            c = cocks[name]
            assert design.frame is not None
            t = design.frame.thickness
            back, front = design.frame.plates
            held_mid = back - t / 2 if c.held_by == "back" else front + t / 2
            spacing = abs((c.bar_z0 + c.bar_z1) / 2 - held_mid)
            where = "beyond its wheels" if c.plate != c.held_by else "beside its wheels"
            out.append(
                Finding(
                    "note",
                    "frame.held",
                    f"arbor {name}",
                    f'arbor "{name}" runs in the {c.held_by} plate and in {c.name}, a'
                    f" cock {where} screwed to the {c.plate} plate ({spacing:.1f} mm"
                    " between the two bearings): it cannot run from plate to plate",
                )
            )
        elif len(holders) < 2 and name not in troubled and plates:
            out.append(
                Finding(
                    "error",
                    "frame.held",
                    f"arbor {name}",
                    f'arbor "{name}" turns and is held at one end only (by the'
                    f" {plates[0]} plate)",
                    f"{len(holders)} bearing",
                    "2 bearings",
                    "let it run from plate to plate, or give it room for a cock",
                )
            )
    return out


def _spans(design: Design) -> dict[str, tuple[str, ...]]:
    from ..layout.train_layout import plan_layout

    layout = plan_layout(design)
    return {
        name: span.plates
        for name, span in layout.stacking.spans.items()
        if span.kind == "arbor" and layout.position(name) is not None
    }


def frame_bodies(plan: FramePlan) -> list[tuple[Zone, frozenset[str]]]:
    """Every still part of the frame as a zone, with the members it may touch (its own
    arbor's group, for a cock or a bush)."""
    design = plan.design
    assert design.frame is not None
    back, front = design.frame.plates
    groups = coaxial_groups(design)
    group_of = {m: frozenset(ms) for ms in groups.values() for m in ms}
    out: list[tuple[Zone, frozenset[str]]] = []
    r = plan.limits.pillar_diameter / 2
    for p in plan.pillars:
        out.append((Zone(p.name, p.x, p.y, 0.0, r, back, front), frozenset()))
    for c in plan.cocks:
        for z in c.zones:
            out.append((z, group_of.get(c.arbor, frozenset({c.arbor}))))
    for b in plan.bearings:
        member = b.member
        z = Zone(
            b.name,
            b.x,
            b.y,
            0.0,
            b.stock.outside / 2,
            b.z0,
            b.z0 + (b.stock.width or 0.0),
        )
        out.append((z, group_of.get(member, frozenset({member}))))
    return out


def _gap(body: Zone, zone: Zone) -> float:
    if body.to is None:
        return float(disc_gap(np.array(body.x), np.array(body.y), body.outer, zone))
    return float(
        bar_gap(
            (np.array(body.x), np.array(body.y)),
            (np.array(body.to[0]), np.array(body.to[1])),
            body.outer,
            zone,
        )
    )


def _clearance(plan: FramePlan) -> list[Finding]:
    clr = plan.limits.clearance
    out = []
    bodies = frame_bodies(plan)
    for body, own in bodies:
        for zone in zones_between(plan.zones, body.z0, body.z1, clr):
            if zone.member in own and (body.to is not None or body.label != zone.label):
                # a cock's bar and a bush are pierced by their own arbor on purpose
                if zone.label.startswith(("arbor ", "sleeve ")):
                    continue
            gap = _gap(body, zone)
            if gap < clr - 1e-6:
                out.append(
                    Finding(
                        "error",
                        "frame.clearance",
                        f"{body.label} / {zone.label}",
                        f"{body.label} comes within {_mm(max(gap, 0.0))} of {zone.label}"
                        f" between heights {max(body.z0, zone.z0):g} and"
                        f" {min(body.z1, zone.z1):g} mm"
                        + (f", overlapping it by {_mm(-gap)}" if gap < 0 else ""),
                        _mm(gap),
                        f">= {_mm(clr)}",
                        "move the part (a [[pillar]] 'at'), or the wheel (height or"
                        " position)",
                    )
                )
    return out


def _frame_overlaps(plan: FramePlan) -> list[Finding]:
    """Two still parts of the frame that overlap (a cock on a pillar, a bush in a
    cock's foot); a cock and the bush seated in it are one."""
    bodies = [z for z, _ in frame_bodies(plan)]
    out = []
    for i, a in enumerate(bodies):
        for b in bodies[i + 1 :]:
            if min(a.z1, b.z1) - max(a.z0, b.z0) <= 1e-6:
                continue
            if _same_seat(plan, a, b):
                continue
            gap = _gap(a, b) if b.to is None else _gap(b, a)
            if gap < -1e-6:
                out.append(
                    Finding(
                        "error",
                        "frame.clearance",
                        f"{a.label} / {b.label}",
                        f"{a.label} and {b.label} overlap by {_mm(-gap)}",
                        _mm(gap),
                        ">= 0 mm",
                        "move one of them",
                    )
                )
    return out


def _same_seat(plan: FramePlan, a: Zone, b: Zone) -> bool:
    for c in plan.cocks:
        cock = {f"cock {c.name}", f"foot of cock {c.name}"}
        if {a.label, b.label} == cock:
            return True
        seat = {x.name for x in plan.bearings if x.holds.endswith(f"the {c.name}")}
        if (a.label in cock and b.label in seat) or (
            b.label in cock and a.label in seat
        ):
            return True
    return False


def _material(plan: FramePlan) -> list[Finding]:
    lim = plan.limits
    basis = (
        f"centres {EDGE_FACTOR:g} d from the edge and {2 * SPACING_FACTOR:g} d apart"
        " (EN 1993-1-8:2005, Table 3.3)"
        + (
            f", at least {lim.min_material:g} mm of material (four nozzle widths)"
            if lim.min_material
            else ""
        )
    )
    loop = edges_polyline(plan.outline, 0.01)
    out = []
    for plate in plan.plates:
        holes = plate.holes
        centres = np.array([(h.x, h.y) for h in holes]).reshape(-1, 2)
        inside = inside_polygon(centres, loop) if len(holes) else np.array([], bool)
        dist = outline_distance(centres, loop) if len(holes) else np.array([])
        for k, h in enumerate(holes):
            need = min_edge_distance(h.diameter, lim)
            got = float(dist[k]) if inside[k] else -float(dist[k])
            if got < need - 1e-6:
                where = "outside the plate" if got < 0 else "too near the plate's edge"
                out.append(
                    Finding(
                        "error",
                        "frame.material",
                        f"{plate.name}: hole for {h.what}",
                        f"the {h.role} hole for {h.what} ({h.diameter:g} mm) in the"
                        f" {plate.side} plate is {where}: its centre is"
                        f" {_mm(max(got, 0.0))} from the edge",
                        _mm(got),
                        f">= {_mm(need)} ({basis})",
                        "move the hole's part inward, or enlarge the outline ([frame]"
                        " rectangle or polygon, or margin)",
                    )
                )
        # two holes too close have overlapping boxes of their own reach (the least
        # centre distance is at most the sum of the two reaches), so only those pairs
        # are measured
        reach = np.array([spacing_reach(h.diameter, lim) for h in holes]).reshape(-1, 1)
        near = overlapping_pairs(centres - reach, centres + reach, margin=-1e-6)
        for i, j in near:
            a, b = holes[i], holes[j]
            need = min_centre_distance(a.diameter, b.diameter, lim)
            got = float(np.hypot(a.x - b.x, a.y - b.y))
            if got < need - 1e-6:
                out.append(
                    Finding(
                        "error",
                        "frame.material",
                        f"{plate.name}: holes for {a.what} and {b.what}",
                        f"the holes for {a.what} ({a.diameter:g} mm) and {b.what}"
                        f" ({b.diameter:g} mm) in the {plate.side} plate are"
                        f" {_mm(got)} apart (centres), leaving"
                        f" {_mm(got - (a.diameter + b.diameter) / 2)} between them",
                        _mm(got),
                        f">= {_mm(need)} ({basis})",
                        "move one of the parts away from the other",
                    )
                )
    for c in plan.cocks:
        need = min_edge_distance(c.hole.diameter, lim)
        if c.width / 2 < need - 1e-6:
            out.append(
                Finding(
                    "error",
                    "frame.material",
                    f"{c.name}: pivot hole",
                    f"the pivot hole of {c.name} ({c.hole.diameter:g} mm) is"
                    f" {_mm(c.width / 2)} from the cock's edge",
                    _mm(c.width / 2),
                    f">= {_mm(need)} ({basis})",
                    "a larger screw size ([frame] screw) makes the cock wider",
                )
            )
    return out
