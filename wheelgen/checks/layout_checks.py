"""Layout checks for the shared findings list of ``wheelgen check`` and the build.

``layout_findings(design, analysis)`` is a design check in the sense of
:mod:`wheelgen.checks.engine`: it judges the numbers of :mod:`wheelgen.layout` where
the layout puts every part. Check ids start with ``layout.``. Lengths in mm.
"""

from __future__ import annotations

import math
from dataclasses import replace
from fractions import Fraction

from ..design.model import Design
from ..design.process_limits import centre_tolerance
from ..design.units import lengths_of
from ..findings import Change, Finding, Level
from ..layout.carrier_holes import carrier_hole_problems
from ..layout.centres import MeshCentres, Move, centres_fit, mesh_centres, move_for
from ..layout.collisions import Clash, PinClash, find_clashes, find_pin_clashes
from ..layout.phasing import rest_angles
from ..layout.placement import LOOP_TOLERANCE, LoopMismatch
from ..layout.stacking import HiddenSeat, wheel_extent
from ..layout.train_layout import Layout, plan_layout
from ..teeth.limits import short_of
from ..teeth.mesh_data import shift_for_centre_distance
from .analysis import Analysis

__all__ = ["FACE_OVERLAP_MIN", "findings_for_layout", "layout_findings"]

#: Meshing faces must overlap axially by at least this share of the narrower face
#: (common practice, no source).
FACE_OVERLAP_MIN = 0.8


def _mm(x: float) -> str:
    return f"{x:.3f} mm"


def _in_inches(design: Design, *sizes: float) -> str:
    """``"3/16 x 0.1252 in; "`` to put beside stock sizes in mm when the design's
    units are inches (the findings are in mm); ``""`` otherwise."""
    u = lengths_of(design)
    if not u.inches:
        return ""
    return f"{' x '.join(u.trade(v) for v in sizes)} in; "


def layout_findings(design: Design, analysis: Analysis | None) -> list[Finding]:
    """Every layout finding of ``design``; ``analysis`` gives the exact rates.

    Only ``analysis.solution.rates`` is read; ``None`` treats every arbor as turning.
    """
    try:
        layout = plan_layout(design)
    except ValueError as exc:
        return [
            Finding(
                "error", "layout.failed", f"design {design.name}", f"no layout: {exc}"
            )
        ]
    rates = dict(analysis.solution.rates) if analysis is not None else {}
    return findings_for_layout(layout, rates)


def findings_for_layout(
    layout: Layout, rates: dict[str, Fraction | None]
) -> list[Finding]:
    """The findings of an already computed layout (see :func:`layout_findings`)."""
    design = layout.design
    out: list[Finding] = _centre_findings(layout)
    for mm in layout.placing.mismatches:
        loop = _loop_finding(layout, mm)
        if loop is not None:
            out.append(loop)
    for h in layout.stacking.hidden:
        out.append(_hidden_finding(layout, h))
    for s in layout.sizes.values():
        if s.wall < s.wall_minimum - 1e-9:
            out.append(
                Finding(
                    "error",
                    "layout.sleeve_wall",
                    f"sleeve {s.name}",
                    f'the wall of sleeve "{s.name}" ({s.outside:g} x {s.inside:.3f} mm) is'
                    f" {_mm(s.wall)} at its thinnest",
                    _mm(s.wall),
                    _mm(s.wall_minimum),
                    "a tube with a thicker wall, or a round seat instead of a square or hex",
                )
            )
        if s.stock is not None:
            out.append(
                Finding(
                    "note",
                    "layout.stock",
                    f"sleeve {s.name}",
                    f'sleeve "{s.name}" is cut from stock tube {s.stock.outside:g} x'
                    f" {s.stock.inside:g} mm"
                    f" ({_in_inches(design, s.stock.outside, s.stock.inside)}bore on"
                    f" {s.bore.shaft:g} mm, {s.bore.fit})",
                )
            )
        elif s.stock_refused:
            out.append(
                Finding(
                    "note",
                    "layout.stock",
                    f"sleeve {s.name}",
                    f'no stock tube fits sleeve "{s.name}": it is made {s.outside:g} x'
                    f" {s.inside:.3f} mm",
                    limit=f"bore {s.bore.low:.3f} to {s.bore.high:.3f} mm",
                    advice="add a [[stock]] tube of that size, or make the tube",
                )
            )
    out.extend(_clash_findings(find_clashes(layout, rates)))
    out.extend(_pin_findings(find_pin_clashes(layout, rates)))
    out.extend(_face_findings(design))
    out.extend(_plate_findings(design))
    out.extend(_bore_findings(layout))
    out.extend(_carrier_hole_findings(layout))
    out.extend(_phasing_findings(layout))
    return out


def _carrier_hole_findings(layout: Layout) -> list[Finding]:
    """``layout.carrier_hole``: a carried arbor's hole without a wall of wheel round it."""
    out = []
    for p in carrier_hole_problems(layout):
        cut = "runs into" if p.wall < 0 else "comes within " + _mm(p.wall) + " of"
        out.append(
            Finding(
                "error",
                "layout.carrier_hole",
                f"wheel {p.wheel} / arbor {p.arbor}",
                f'wheel "{p.wheel}" carries arbor "{p.arbor}" in a bore of its own, but '
                f"that bore {cut} {p.reason}; the wheel cannot be made so",
                _mm(p.wall),
                f"{_mm(p.needed)} (min_wall)",
                f"move arbor \"{p.arbor}\" (its 'at') onto solid wheel, or change the "
                f'spokes, hub or bore of "{p.wheel}"',
            )
        )
    return out


def _phasing_findings(layout: Layout) -> list[Finding]:
    """``layout.phasing``: a loop of meshes whose teeth cannot all interleave."""
    design = layout.design
    out = []
    for mf in rest_angles(design).misfits:
        w1, w2 = (design.wheel(n) for n in mf.mesh.pair)
        play = min(w1.backlash, w2.backlash) / 2
        if not short_of(play, mf.arc):
            continue  # the teeth still go in, inside the play of the mesh
        out.append(
            Finding(
                "error",
                "layout.phasing",
                mf.mesh.label,
                f"{mf.mesh.label} closes a loop of wheels whose teeth cannot all "
                f'interleave: set to mesh with the rest, "{w2.name}" would have to turn '
                f"{mf.misfit_deg:+.4f} deg ({mf.arc:.4f} mm on its pitch circle)",
                f"{mf.misfit_deg:+.4f} deg",
                f"{_mm(play)} on the pitch circle (half the backlash)",
                "change a tooth count or an arbor's place in the loop so that the teeth "
                "meet whole pitches round it",
            )
        )
    return out


def _mesh_words(mc: MeshCentres) -> str:
    a, b = mc.arbors
    err = mc.error
    side = (
        "too close: the teeth bind"
        if err < 0
        else "too far apart: the teeth lose depth and contact"
    )
    return (
        f'{mc.mesh.label}: arbors "{a}" and "{b}" stand {mc.measured:.4f} mm apart, '
        f"the teeth need {mc.wanted:.4f} mm; {abs(err):.4f} mm {side}"
    )


def _move_words(layout: Layout, move: Move) -> str:
    x, y = layout.placing.positions[move.axis]
    d = math.dist((x, y), move.to)
    return (
        f'set {move.change} (it moves arbor "{move.axis}" {d:.4f} mm, to '
        f"({move.to[0]:.4f}, {move.to[1]:.4f}))"
    )


def _centre_findings(layout: Layout) -> list[Finding]:
    """``mesh.centre_distance``: every mesh at its arbors' final distance.

    One finding per arbor to move: a mesh that one move puts right is reported with
    that move; several meshes that one arbor's move puts right are one finding about
    that arbor.
    """
    design = layout.design
    proc = design.process
    tol = centre_tolerance(proc)
    off = [mc for mc in mesh_centres(layout) if not centres_fit(mc.error, proc)]
    if not off:
        return []
    limit = f"working centre distance +- {tol:g} mm ({proc.kind} placing)"
    out = []
    moved: set[int] = set()
    for move in move_for(layout, off):
        moved.update(mc.mesh.index for mc in move.meshes)
        worst = max(move.meshes, key=lambda mc: abs(mc.error))
        if len(move.meshes) == 1:
            mc = move.meshes[0]
            subject, message = mc.mesh.label, _mesh_words(mc)
        else:
            subject = f"arbor {move.axis}"
            message = (
                f'arbor "{move.axis}" stands where none of its meshes can work: '
                + "; ".join(_mesh_words(mc) for mc in move.meshes)
            )
        out.append(
            Finding(
                "error",
                "mesh.centre_distance",
                subject,
                message,
                f"{worst.measured:.4f} mm ({worst.error:+.4f} mm)",
                limit,
                _move_words(layout, move),
                changes=(move.change,),
            )
        )
    for mc in off:
        if mc.mesh.index in moved:
            continue
        changes = _shift_to_fit(design, mc)
        fix = (
            f"set {changes[0]}: the pair then works where the arbors stand"
            if changes
            else "change the shifts or the tooth counts so that the pair works where "
            "the arbors stand"
        )
        out.append(
            Finding(
                "error",
                "mesh.centre_distance",
                mc.mesh.label,
                _mesh_words(mc),
                f"{mc.measured:.4f} mm ({mc.error:+.4f} mm)",
                limit,
                f"no single bearing or 'at' closes this train; {fix}",
                changes=changes,
            )
        )
    return out


def _shift_to_fit(design: Design, mc: MeshCentres) -> tuple[Change, ...]:
    """The shift of the mesh's second wheel that makes it work at the measured distance
    (involute teeth; ISO 21771 shift sum for a centre distance), if the format allows it."""
    w1, w2 = (design.wheel(n) for n in mc.mesh.pair)
    if w1.form != "involute" or w2.form != "involute":
        return ()
    try:
        total = shift_for_centre_distance(
            w1.teeth, w2.teeth, w1.module, mc.measured, w1.pressure_angle_deg
        )
    except ValueError:
        return ()
    shift = round(total - w1.shift, 4)
    if not -1.0 <= shift <= 2.0:
        return ()
    return (Change("wheel", w2.name, "shift", shift),)


def _loop_finding(layout: Layout, mm: LoopMismatch) -> Finding | None:
    """``layout.loop``: two routes to one axis that disagree.

    A mesh that closes the loop at the wrong distance is the centre-distance check's
    (one finding, with its fix); at the right distance in the wrong direction only its
    bearing disagrees, and the bearing the arbors really have is offered.
    """
    link = mm.closing
    changes: tuple[Change, ...] = ()
    pos = layout.placing.positions
    if link is not None and link.kind in ("mesh", "pinslot"):
        a, b = pos[link.source], pos[link.to]
        if abs(math.dist(a, b) - link.length) > LOOP_TOLERANCE:
            if link.kind == "mesh":
                return None  # reported as mesh.centre_distance, with its fix
        else:
            bearing = math.degrees(math.atan2(b[1] - a[1], b[0] - a[0]))
            changes = (Change(link.kind, link.item, "bearing", bearing),)
    elif link is not None and link.kind == "at":
        changes = (Change("arbor", link.item, "at", mm.first),)
    elif link is not None and link.kind == "carrier":
        cx, cy = pos[link.source]
        changes = (
            Change("arbor", link.item, "at", (mm.first[0] - cx, mm.first[1] - cy)),
        )
    advice = (
        f"set {changes[0]}, where the other route puts it"
        if changes
        else "leave the 'bearing' out of one mesh in the loop (its distance is then"
        " checked), or change 'at', a bearing or the tooth counts so the loop closes"
    )
    return Finding(
        "error",
        "layout.loop",
        f"arbor {mm.axis}",
        f'two routes place arbor "{mm.axis}" {_mm(mm.distance)} apart: at '
        f"({mm.first[0]:.3f}, {mm.first[1]:.3f}) through {' > '.join(mm.first_route)}"
        f", and at ({mm.second[0]:.3f}, {mm.second[1]:.3f}) through "
        f"{' > '.join(mm.second_route)}",
        _mm(mm.distance),
        _mm(LOOP_TOLERANCE),
        advice,
        changes=changes,
    )


def _hidden_finding(layout: Layout, h: HiddenSeat) -> Finding:
    """``layout.hidden_seat``; when only the display's lengthening hides the seat, the
    message says so, and a design whose hands are all its targets' may turn them off."""
    design = layout.design
    where = f'the tube "{h.tube}" around it'
    advice = (
        f'move wheel "{h.wheel}" (height) clear of the wheels on "{h.tube}" and the'
        " tubes around it"
    )
    changes: tuple[Change, ...] = ()
    if h.for_display:
        where += ", which is lengthened through the plate to carry a hand (or the knob)"
        advice = (
            f'move wheel "{h.wheel}" behind the wheel of "{h.tube}" (on an axis whose'
            " tubes all show a reading, the innermost member's wheel lies furthest back)"
        )
        if not design.hands:  # every hand is a target's: one key turns them off
            change = Change("display", "", "readings", "none")
            changes = (change,)
            advice = f"set {change} (no hands by default), or " + advice
    return Finding(
        "error",
        "layout.hidden_seat",
        f"wheel {h.wheel}",
        f'the seat of wheel "{h.wheel}" on "{h.member}" lies {_mm(h.overlap)} under'
        f" {where}",
        _mm(h.overlap),
        "0 mm",
        advice,
        changes,
    )


def _clash_findings(clashes: list[Clash]) -> list[Finding]:
    worst: dict[tuple[str, str], Clash] = {}
    for c in clashes:
        a, b = c.first, c.second
        key_a = f"wheel {a.wheel}" if a.wheel else a.label
        key_b = f"wheel {b.wheel}" if b.wheel else b.label
        key = (key_a, key_b) if key_a <= key_b else (key_b, key_a)
        if key not in worst or c.depth > worst[key].depth:
            worst[key] = c
    out = []
    for (ka, kb), c in worst.items():
        a, b = c.first, c.second
        both_wheels = a.wheel is not None and b.wheel is not None
        check = "layout.wheel_collision" if both_wheels else "layout.cuts_arbor"
        if a.wheel is None and b.wheel is None:
            check = "layout.arbor_collision"
        out.append(
            Finding(
                "error",
                check,
                f"{ka} / {kb}",
                f"{a.label} and {b.label} overlap by {_mm(c.depth)} between heights"
                f" {c.z0:g} and {c.z1:g} mm",
                _mm(c.depth),
                "0 mm",
                "move one of them axially (height) or move the axes apart",
            )
        )
    return out


def _pin_findings(clashes: list[PinClash]) -> list[Finding]:
    """``layout.pin_collision``: a body in the ring a coupling's pin sweeps."""
    worst: dict[tuple[str, str], PinClash] = {}
    for c in clashes:
        b = c.body
        key = (c.sweep.pinslot, f"wheel {b.wheel}" if b.kind == "teeth" else b.label)
        if key not in worst or c.depth > worst[key].depth:
            worst[key] = c
    out = []
    for (pin, other), c in worst.items():
        s = c.sweep
        out.append(
            Finding(
                "error",
                "layout.pin_collision",
                f"pin of {pin} / {other}",
                f'the pin of "{pin}" on wheel "{s.pin_wheel}" sweeps radii'
                f" {s.inner:g} to {s.outer:g} mm about its axis; {c.body.label} reaches"
                f" {_mm(c.depth)} into that ring between heights {c.z0:g} and"
                f" {c.z1:g} mm",
                _mm(c.depth),
                "0 mm",
                _pin_advice(c, other),
            )
        )
    return out


def _pin_advice(c: PinClash, other: str) -> str:
    s, b = c.sweep, c.body
    if b.kind == "teeth":
        return (
            f"move {other} (height) out of heights {s.z0:g} to {s.z1:g} mm, or its"
            " axis away from the pin's path"
        )
    if b.wheel is not None:
        return f"a smaller or shorter hub on wheel {b.wheel}, or move the pin (radius)"
    return (
        f"move the axis of {other} away from the pin's path, make it thinner, or move"
        " the pin (radius)"
    )


def _face_findings(design: Design) -> list[Finding]:
    out = []
    for m in design.meshes:
        a, b = (design.wheel(n) for n in m.pair)
        overlap = min(a.height + a.face_width, b.height + b.face_width) - max(
            a.height, b.height
        )
        narrow = min(a.face_width, b.face_width)
        share = max(overlap, 0.0) / narrow
        if share >= FACE_OVERLAP_MIN - 1e-9:
            continue
        level: Level = "error" if overlap <= 0 else "warning"
        out.append(
            Finding(
                level,
                "layout.face_overlap",
                f"mesh {a.name}-{b.name}",
                f'the faces of "{a.name}" (height {a.height:g}) and "{b.name}" (height'
                f" {b.height:g}) overlap by {_mm(max(overlap, 0.0))}, {share:.0%} of the"
                f" narrower face",
                f"{share:.0%}",
                f"{FACE_OVERLAP_MIN:.0%}",
                "give both wheels the same height",
            )
        )
    return out


def _plate_findings(design: Design) -> list[Finding]:
    """``layout.outside_plates``: wheels beyond the plates' inner faces.

    When several wheels are out, the plates are the cause (given in the wrong unit,
    say): one finding about ``[frame] plates`` with the wheels under it.
    """
    if design.frame is None:
        return []
    back, front = design.frame.plates
    out = []
    lows, highs = [], []
    for w in design.wheels:
        z0, z1 = wheel_extent(design, w.name)
        lows.append(z0)
        highs.append(z1)
        if z0 < back - 1e-9 or z1 > front + 1e-9:
            height = back if z0 < back - 1e-9 else front - (z1 - z0)
            change = Change("wheel", w.name, "height", height)
            out.append(
                Finding(
                    "error",
                    "layout.outside_plates",
                    f"wheel {w.name}",
                    f'wheel "{w.name}" spans heights {z0:g} to {z1:g} mm, outside the'
                    f" plates' inner faces at {back:g} and {front:g} mm",
                    f"{z0:g} to {z1:g} mm",
                    f"{back:g} to {front:g} mm",
                    f"set {change} (or move the frame's plates)",
                    changes=(change,),
                )
            )
    if len(out) < 2:
        return out
    # room for every wheel, the back plate where it was if it can stay, and a whole
    # millimetre to spare in front (common practice, no source)
    new = (min(back, min(lows)), float(math.ceil(max(highs)) + 1))
    change = Change("frame", "", "plates", new)
    cause = Finding(
        "error",
        "layout.outside_plates",
        "[frame] plates",
        f"{len(out)} of {len(design.wheels)} wheels lie outside the plates, whose "
        f"inner faces are at {back:g} and {front:g} mm (heights are in mm); the "
        f"wheels span {min(lows):g} to {max(highs):g} mm",
        f"{back:g} to {front:g} mm",
        f"{min(lows):g} to {max(highs):g} mm",
        f"set {change}",
        changes=(change,),
        consequences=tuple(replace(f, changes=(), advice="") for f in out),
    )
    return [cause]


def _bore_findings(layout: Layout) -> list[Finding]:
    design = layout.design
    out = []
    for w in design.wheels:
        seat = layout.outside(w.arbor)
        if w.bore is not None and w.bore < seat - 1e-9:
            out.append(
                Finding(
                    "error",
                    "layout.bore",
                    f"wheel {w.name}",
                    f'wheel "{w.name}" asks for a {w.bore:g} mm bore but "{w.arbor}" is'
                    f" {seat:g} mm across where it sits",
                    _mm(w.bore),
                    f">= {_mm(seat)}",
                    "leave 'bore' out (the seat's size is then used)",
                )
            )
    return out
