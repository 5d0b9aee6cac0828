"""Checks of the display: what cannot be shown, and what would touch in front of the plate.

``display_findings(design)`` gives the findings the engine of
:mod:`wheelgen.checks.engine` adds to every run; its ids start with ``display.``:

- ``display.cannot_reach`` (error): a hand's arbor cannot come out through the front
  plate (a carried arbor circles its carrier; an arbor held by the back plate only), or
  the drive cannot reach the side its knob or crank is on;
- ``display.hidden_hand`` (error): a hand (knob, crank) whose seat lies under another
  tube, or two on one axis of which neither surrounds the other;
- ``display.dial_overlap`` (error): two dials, side by side at one level, overlap;
- ``display.hand_clash`` (error): a hand sweeps over another axis's arbors, knob or
  crank at its own height, or meets a hand of another axis. Two hands are followed
  through their whole joint cycle (their angles from the exact rates and the
  pin-and-slot motion, :mod:`wheelgen.display.motion`); a cycle too long to follow
  counts as a meeting when their sweeps overlap at all;
- ``display.frame_clash`` (error): a dial, hand, knob or crank on a screw head or a
  bush the frame has standing in front of the front plate;
- ``display.thin`` (error): printed, a hand or dial thinner than ``min_layers``
  layers, or a blade narrower than two nozzle lines;
- ``display.no_frame`` (note): hands were asked for but there is no front plate;
- the plan's own findings (``display.no_room``, ``display.still``,
  ``display.dial_edge``).

Lengths in mm, angles in degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..design.model import Design
from ..design.periods import format_period
from ..findings import Change, Finding
from ..kinematics.angles import angle_model
from ..kinematics.rates import axis_root
from ..layout.train_layout import plan_layout
from .motion import hand_angles_deg, joint_cycle_turns
from .plan import DIAL_CLEARANCE, DisplayPlan, HandPlan, display_plan

__all__ = [
    "HAND_CLEARANCE",
    "MAX_CYCLE_SAMPLES",
    "display_findings",
    "hand_min_distance",
]

#: mm two hands, or a hand and another axis's arbor, must keep apart (common practice,
#: no source: hands bend and sit a little out of true).
HAND_CLEARANCE = 0.5
#: Most time steps used to follow two hands through their joint cycle.
MAX_CYCLE_SAMPLES = 1_000_000
# degrees the faster hand turns between two samples of a joint cycle
_STEP_DEG = 0.5


def _mm(x: float) -> str:
    return f"{x:.3f} mm"


def _below(x: float) -> float:
    """``x`` rounded down to 0.1 mm, and a little below it: a length that clears."""
    return math.floor((x - 1e-6) * 10) / 10


def _shorter(hand: HandPlan, room: float) -> Change | None:
    """The hand's ``length`` that keeps its sweep within ``room`` mm, if a length can."""
    p = hand.part
    length = _below(room)
    if length <= max(p.tail, p.hub / 2) or length >= p.length:
        return None
    return Change("hand", p.arbor, "length", length)


def _set(change: Change | None, otherwise: str) -> str:
    return f"set {change}, or {otherwise}" if change is not None else otherwise


@dataclass(frozen=True, slots=True)
class _Sweep:
    """Something in front of the plate turning about an axis: a disc of ``radius``."""

    label: str
    subject: str
    axis: str
    centre: tuple[float, float]
    z0: float
    z1: float
    radius: float
    hand: HandPlan | None = None


def display_findings(design: Design) -> list[Finding]:
    """Every display finding of ``design``."""
    try:
        layout = plan_layout(design)
    except ValueError:
        return []  # the layout check reports why there is no layout
    stacking = layout.stacking
    readings = design.readings()
    if design.frame is None:
        if not readings:
            return []
        return [
            Finding(
                "note",
                "display.no_frame",
                f"design {design.name}",
                "the design has no [frame], so no hands, dials or knob are made: there"
                " is no front plate to bring the readings out through",
                advice="add a [frame] table",
            )
        ]
    out: list[Finding] = []
    out.extend(_unreachable(design, stacking.unreachable, stacking.one_plate))
    for c in stacking.covered:
        out.append(
            Finding(
                "error",
                "display.hidden_hand",
                f"{c.wheel} on {c.member}",
                f'the seat of the {c.wheel} on "{c.member}" lies {_mm(c.overlap)} under'
                f' the tube "{c.tube}" around it',
                _mm(c.overlap),
                "0 mm",
                f'give the {c.wheel} to "{c.tube}" instead, or leave the tube out of'
                " the display",
            )
        )
    levels = stacking.levels
    if levels is not None:
        for a, b in levels.crossed:
            out.append(
                Finding(
                    "error",
                    "display.hidden_hand",
                    f"hand on {b}",
                    f'"{a}" and "{b}" share one axis and both carry a hand (or the'
                    " knob), but neither surrounds the other: one would hide the"
                    " other's seat",
                    advice="keep one of them; on one axis only members that nest"
                    " (each 'around' the next) can show a reading each",
                )
            )
    plan = display_plan(design)
    out.extend(plan.problems)
    out.extend(_thin(design, plan))
    out.extend(_clashes(design, plan))
    out.extend(_frame_clashes(design, plan))
    return out


def _frame_bodies(
    design: Design,
) -> list[tuple[str, float, float, float, float, float]]:
    """What of the frame stands in front of the front plate: (label, x, y, radius, z0,
    z1) of the screw heads on its face and of bushes or bearings standing proud (mm)."""
    from ..design.screws import screw
    from ..frame.plan import plan_frame

    assert design.frame is not None
    frame = plan_frame(design)
    face = design.frame.plates[1] + design.frame.thickness
    out = []
    for sp in frame.screws:
        if sp.head_up and abs(sp.face - face) < 1e-6:
            sc = screw(sp.size)
            out.append(
                (f"the head of screw {sp.name}", sp.x, sp.y, sc.head_diameter / 2,
                 face, face + sc.head_height)
            )  # fmt: skip
    for b in frame.bearings:
        top = b.z0 + (b.stock.width or 0.0)
        if top > face + 1e-9:
            out.append(
                (f"{b.stock.kind} {b.name}", b.x, b.y, b.stock.outside / 2, face, top)
            )
    return out


def _frame_clashes(design: Design, plan: DisplayPlan) -> list[Finding]:
    """``display.frame_clash``: a dial, hand, knob or crank on what the frame has in
    front of the front plate."""
    if design.frame is None or not (plan.dials or plan.hands or plan.input):
        return []
    face = design.frame.plates[1] + design.frame.thickness
    bodies = _frame_bodies(design)
    items: list[tuple[str, str, float, float, float, float, float]] = [
        (f"dial {d.part.name}", d.part.name, d.part.placement.x, d.part.placement.y,
         d.part.radius, d.z0, d.z1)
        for d in plan.dials
    ]  # fmt: skip
    for sweep in _sweeps(design, plan):
        if sweep.hand is not None or sweep.subject.startswith(("knob_", "crank_")):
            items.append(
                (sweep.label, sweep.subject, *sweep.centre, sweep.radius, sweep.z0,
                 sweep.z1)
            )  # fmt: skip
    out = []
    for label, subject, x, y, r, z0, z1 in items:
        for what, bx, by, br, b0, b1 in bodies:
            d = math.hypot(x - bx, y - by)
            if d >= r + br or b1 <= z0 + 1e-9 or b0 >= z1 - 1e-9:
                continue
            change = Change(
                "display", "", "dial_gap", math.ceil((b1 - face + 0.5) * 10) / 10
            )
            out.append(
                Finding(
                    "error",
                    "display.frame_clash",
                    f"{subject} / frame",
                    f"{label} stands from {z0:g} to {z1:g} mm, over {what}, which"
                    f" stands {b1 - face:g} mm proud of the front plate",
                    _mm(b1 - z0),
                    "0 mm",
                    f"set {change}",
                    (change,),
                )
            )
    return out


def _thin(design: Design, plan: DisplayPlan) -> list[Finding]:
    """Printed hands and dials: enough layers, and a blade of two nozzle lines."""
    proc = design.process
    if proc.kind != "print":
        return []
    need = proc.min_layers * proc.layer
    out = []
    own = {h.arbor for h in design.hands if h.thickness is not None}
    for h in plan.hands:
        p = h.part
        if p.thickness < need - 1e-9:
            change = (
                Change("hand", p.arbor, "thickness", need)
                if p.arbor in own
                else Change("display", "", "hand_thickness", need)
            )
            out.append(_thin_layers(p.name, p.thickness, proc, change))
        if p.width < 2 * proc.nozzle - 1e-9:
            change = Change("hand", p.arbor, "width", round(2 * proc.nozzle, 4))
            out.append(
                Finding(
                    "error",
                    "display.thin",
                    p.name,
                    f"the blade of {p.name} is {_mm(p.width)} wide, less than two"
                    " nozzle lines",
                    _mm(p.width),
                    _mm(2 * proc.nozzle),
                    f"set {change}",
                    (change,),
                )
            )
    for d in plan.dials:
        if d.part.thickness < need - 1e-9:
            change = Change("display", "", "dial_thickness", need)
            out.append(_thin_layers(d.part.name, d.part.thickness, proc, change))
    return out


def _thin_layers(name: str, thickness: float, proc: Any, change: Change) -> Finding:
    return Finding(
        "error",
        "display.thin",
        name,
        f"{name} is {_mm(thickness)} thick, {thickness / proc.layer:.1f} layers",
        _mm(thickness),
        f"{proc.min_layers} layers of {proc.layer:g} mm",
        f"set {change}",
        (change,),
    )


def _unreachable(
    design: Design,
    members: tuple[str, ...],
    one_plate: tuple[tuple[str, str, float], ...],
) -> list[Finding]:
    out = []
    partner = {a: (b, d) for a, b, d in one_plate}
    drive = design.drive.arbor
    hands = {h.arbor for h in design.readings()}
    for m in members:
        root = axis_root(design, m)
        arbor = design.arbor(root)
        if arbor.carrier is not None:
            why = (
                f'its axis rides on wheel "{arbor.carrier}" and circles with it, so no'
                " hand on it can stand still in front of the plate"
            )
            advice = (
                "bring the reading out through an arbor or tube on a fixed axis (a"
                " wheel meshing with the carried one), or set [display] readings ="
                ' "none" and list the hands you want'
            )
        elif root in partner:
            other, d = partner[root]
            why = (
                f'its axis is {_mm(d)} from arbor "{other}", so it is held by the other'
                " plate only and cannot pass this one"
            )
            advice = (
                "swap which of the two axes carries the wheels further forward, or"
                " read the value from another arbor"
            )
        else:
            why = "its axis has no place on the plates"
            advice = "place the arbor"
        if m in hands:
            out.append(
                Finding(
                    "error",
                    "display.cannot_reach",
                    f"hand on {m}",
                    f'the hand on "{m}" cannot be brought out through the front'
                    f" plate: {why}",
                    advice=advice,
                )
            )
        if m == drive and design.drive_input.kind != "none":
            out.append(
                Finding(
                    "error",
                    "display.cannot_reach",
                    f"{design.drive_input.kind} on {m}",
                    f'the {design.drive_input.kind} on the drive arbor "{m}" cannot be'
                    f" brought out through the plate: {why}",
                    advice='set [input] side to the other plate, or kind = "none"',
                )
            )
    return out


def _sweeps(design: Design, plan: DisplayPlan) -> list[_Sweep]:
    """Hands, the knob or crank, and the members standing in front of the plate."""
    layout = plan_layout(design)
    levels = layout.stacking.levels
    assert levels is not None and levels.front_face is not None
    face = levels.front_face
    out: list[_Sweep] = []
    for h in plan.hands:
        p = h.part
        reach = max(p.length, p.tail, p.hub / 2)
        out.append(
            _Sweep(
                f"the hand on {p.arbor}", p.name, axis_root(design, p.arbor),
                (p.placement.x, p.placement.y), h.level.z0, h.level.z1, reach, h,
            )
        )  # fmt: skip
    if plan.input is not None and plan.input.level.side == "front":
        q = plan.input.part
        out.append(
            _Sweep(
                f"the {q.kind} on {q.arbor}", q.name, axis_root(design, q.arbor),
                (q.placement.x, q.placement.y), plan.input.level.z0,
                plan.input.level.z1, plan.input.sweep,
            )
        )  # fmt: skip
    for name, span in layout.stacking.spans.items():
        pos = layout.position(name)
        if pos is None or span.z1 <= face + 1e-9:
            continue
        out.append(
            _Sweep(
                f'arbor "{name}"', name, axis_root(design, name), pos, face, span.z1,
                layout.outside(name) / 2,
            )
        )  # fmt: skip
    return out


def _clashes(design: Design, plan: DisplayPlan) -> list[Finding]:
    out: list[Finding] = []
    dials = plan.dials
    for i, one in enumerate(dials):
        for two in dials[i + 1 :]:
            pa, pb = one.part.placement, two.part.placement
            d = math.hypot(pa.x - pb.x, pa.y - pb.y)
            over = one.part.radius + two.part.radius - d
            if over > 1e-9:
                big, small = (
                    (one, two) if one.part.radius >= two.part.radius else (two, one)
                )
                change = None
                radius = _below(d - small.part.radius - DIAL_CLEARANCE)
                if big.rings and radius > 0:
                    change = Change("dial", big.rings[0].arbor, "radius", radius)
                out.append(
                    Finding(
                        "error",
                        "display.dial_overlap",
                        f"dial {one.part.name} / dial {two.part.name}",
                        f"dials {one.part.name} ({one.part.radius:g} mm) and"
                        f" {two.part.name} ({two.part.radius:g} mm) stand {_mm(d)}"
                        f" apart and overlap by {_mm(over)}",
                        _mm(over),
                        "0 mm",
                        _set(change, "smaller 'radius' on their [[dial]] tables"),
                        (change,) if change is not None else (),
                    )
                )
    items = _sweeps(design, plan)
    model = None
    # one finding per hand and other axis: the outermost thing it reaches over
    worst: dict[tuple[str, str], tuple[float, Finding]] = {}
    for i, a in enumerate(items):
        for b in items[i + 1 :]:
            if a.axis == b.axis or (a.hand is None and b.hand is None):
                continue
            z0, z1 = max(a.z0, b.z0), min(a.z1, b.z1)
            if z1 - z0 <= 1e-9:
                continue
            d = math.dist(a.centre, b.centre)
            if a.radius + b.radius + HAND_CLEARANCE <= d:
                continue
            if a.hand is not None and b.hand is not None:
                model = angle_model(design) if model is None else model
                found = _hands_meet(design, plan, a.hand, b.hand, model)
                if found is not None:
                    out.append(found)
                continue
            hand, other = (a, b) if a.hand is not None else (b, a)
            key = (hand.subject, other.axis)
            depth = hand.radius + other.radius + HAND_CLEARANCE - d
            if key in worst and worst[key][0] >= depth:
                continue
            assert hand.hand is not None
            change = _shorter(hand.hand, d - other.radius - HAND_CLEARANCE)
            worst[key] = (
                depth,
                Finding(
                    "error",
                    "display.hand_clash",
                    f"{hand.subject} / {other.subject}",
                    f"{hand.label} reaches {hand.radius:.1f} mm from its axis, over"
                    f" {other.label} {d:.1f} mm away, which stands at its height"
                    f" ({z0:g} to {z1:g} mm)",
                    _mm(depth),
                    "0 mm",
                    _set(change, "move the axes apart"),
                    (change,) if change is not None else (),
                ),
            )
    out.extend(f for _, f in worst.values())
    return out


def hand_min_distance(
    centres: tuple[np.ndarray, np.ndarray],
    angles_deg: tuple[np.ndarray, np.ndarray],
    spans: tuple[tuple[float, float], tuple[float, float]],
) -> np.ndarray:
    """Distance (mm) between two hands' centre lines at each sample.

    Each hand is the segment from ``-tail`` to ``length`` (``spans``) along its
    direction ``angles_deg`` from its axis at ``centres``; the result is the distance
    between the two segments at each sample (derived: the least of the four
    end-to-segment distances, or 0 where they cross).
    """
    ends = []
    for c, a, (back, front) in zip(centres, angles_deg, spans):
        u = np.column_stack((np.cos(np.radians(a)), np.sin(np.radians(a))))
        ends.append((c - back * u, c + front * u))
    (p0, p1), (q0, q1) = ends

    def to_segment(x: np.ndarray, s0: np.ndarray, s1: np.ndarray) -> np.ndarray:
        v = s1 - s0
        t = np.clip(
            np.einsum("ij,ij->i", x - s0, v) / np.einsum("ij,ij->i", v, v), 0, 1
        )
        return np.asarray(np.hypot(*(x - s0 - t[:, None] * v).T), dtype=float)

    def cross(o: np.ndarray, a: np.ndarray, b: np.ndarray) -> np.ndarray:
        return np.asarray(
            (a[:, 0] - o[:, 0]) * (b[:, 1] - o[:, 1])
            - (a[:, 1] - o[:, 1]) * (b[:, 0] - o[:, 0]),
            dtype=float,
        )

    d = np.minimum.reduce(
        [to_segment(p0, q0, q1), to_segment(p1, q0, q1), to_segment(q0, p0, p1),
         to_segment(q1, p0, p1)]
    )  # fmt: skip
    crossing = (np.sign(cross(p0, p1, q0)) != np.sign(cross(p0, p1, q1))) & (
        np.sign(cross(q0, q1, p0)) != np.sign(cross(q0, q1, p1))
    )
    return np.asarray(np.where(crossing, 0.0, d), dtype=float)


def _hands_meet(
    design: Design, plan: DisplayPlan, a: HandPlan, b: HandPlan, model: Any
) -> Finding | None:
    """Follow two hands of different axes through their joint cycle."""
    pa, pb = a.part, b.part
    subject = f"{pa.name} / {pb.name}"
    cycle = joint_cycle_turns(design, (pa.arbor, pb.arbor), model)
    drive_s = float(design.drive.period_s)
    rates = [abs(float(model.rates.get(x.arbor, 0))) for x in (pa, pb)]
    fastest = max(rates)
    if cycle is None or cycle == 0 or fastest == 0:
        samples = 1
        span_s = 0.0
    else:
        span_s = float(cycle) * drive_s
        samples = int(math.ceil(float(cycle) * fastest * 360.0 / _STEP_DEG)) + 1
    # a counterweight wider than the blade counts as the hand's width (conservative)
    width = (max(pa.width, pa.counterweight) + max(pb.width, pb.counterweight)) / 2
    width += HAND_CLEARANCE
    # the longer hand, shortened until the two sweeps keep apart
    reach = {
        h.part.name: max(h.part.length, h.part.tail, h.part.hub / 2) for h in (a, b)
    }
    longer, other = (a, b) if reach[pa.name] >= reach[pb.name] else (b, a)
    apart = math.dist(
        (pa.placement.x, pa.placement.y), (pb.placement.x, pb.placement.y)
    )
    change = _shorter(longer, apart - reach[other.part.name] - HAND_CLEARANCE)
    changes = (change,) if change is not None else ()
    if samples > MAX_CYCLE_SAMPLES:
        return Finding(
            "error",
            "display.hand_clash",
            subject,
            f"the sweeps of {pa.name} and {pb.name} overlap, and their joint cycle"
            f" ({format_period(span_s)}) is too long to follow: they may meet",
            advice=_set(change, "shorter hands, so that their sweeps keep apart"),
            changes=changes,
        )
    t = np.linspace(0.0, span_s, samples)
    angles = hand_angles_deg(design, t, plan, model)
    centres = tuple(
        np.tile([p.placement.x, p.placement.y], (samples, 1)) for p in (pa, pb)
    )
    dist = hand_min_distance(
        (centres[0], centres[1]),
        (angles[pa.name], angles[pb.name]),
        ((pa.tail, pa.length), (pb.tail, pb.length)),
    )
    # between two samples a tip moves at most this far along its circle
    slack = math.radians(_STEP_DEG) * max(pa.length, pa.tail, pb.length, pb.tail)
    worst = int(np.argmin(dist))
    if dist[worst] >= width + (slack if samples > 1 else 0.0):
        return None
    return Finding(
        "error",
        "display.hand_clash",
        subject,
        f"{pa.name} and {pb.name} meet {format_period(float(t[worst]))} after rest"
        f" (their centre lines {_mm(float(dist[worst]))} apart, their widths need"
        f" {_mm(width)}), within their joint cycle of {format_period(span_s)}",
        _mm(float(dist[worst])),
        f">= {_mm(width)}",
        _set(change, "move the axes apart"),
        changes,
    )
