"""The animated preview: the layout drawing with every arbor turning at its true rate.

An SVG with SMIL ``animateTransform`` keyframes, so it plays in any browser with no
script and no network. The angles are sampled from
:func:`wheelgen.kinematics.angles.arbor_angles` (exact train, uneven pin-and-slot motion
included) over one loop, and played time-lapsed: ``factor`` real seconds per second of
animation. The loop shows one turn of a *reference* arbor: the slowest arbor with
uneven motion if there is one (so its whole cycle of fast and slow is seen), else the
slowest turning arbor, shortened when the fastest arbor would otherwise spin so often
that it blurs. An arbor with uneven motion also gets a faint pointer that turns
evenly at its mean rate, so the difference shows.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Mapping

import numpy as np

from ..design.model import Design
from ..design.periods import as_float, format_period
from ..kinematics.angles import angle_model, arbor_angles
from ..kinematics.rates import TrainSolution
from ..kinematics.targets import arbor_period
from ._svg import colour, esc, fmt
from .layout_drawing import axis_centres, carried_by, drawing_extent, label_size

__all__ = [
    "PreviewPlan",
    "uneven_arbors",
    "preview_plan",
    "preview_svg",
    "MAX_FAST_TURNS",
]

#: Most turns the fastest arbor makes in one loop: beyond this it only blurs.
MAX_FAST_TURNS = 120
# keyframes per turn of the fastest arbor: 12 (30 degrees apart) keep the straight
# interpolation between keyframes on the circle's real path
_KEYS_PER_FAST_TURN = 12
_MIN_KEYS = 241  # resolves the reference arbor's uneven motion (1.5 degrees of it)
_SECONDS_PER_FAST_TURN = 1.5  # animation seconds for one turn of the fastest arbor
_MIN_LOOP_S, _MAX_LOOP_S = 12.0, 180.0
# a deviation from even motion below this (degrees) is rounding, not a coupling
_UNEVEN_DEG = 1e-6


@dataclass(frozen=True, slots=True)
class PreviewPlan:
    """One loop of the preview.

    ``times_s`` are the sampled moments of the real train (s, from 0 to ``cycle_s``);
    ``duration_s`` is the loop's length on screen; ``factor = cycle_s / duration_s``.
    ``angles_deg`` holds each turning arbor's angle (ccw, cumulative) at ``times_s``.
    """

    reference: str
    cycle_s: float
    duration_s: float
    factor: float
    times_s: np.ndarray
    angles_deg: dict[str, np.ndarray]
    uneven: tuple[str, ...]
    mean_rates_deg_s: dict[str, float]
    shortened: bool


def _turning(design: Design, solution: TrainSolution) -> dict[str, float]:
    """Period in seconds of every arbor that turns (within what a float holds: an
    arbor that turns once in more than 1e308 s stands still in any animation)."""
    out = {}
    for a in design.arbors:
        period = arbor_period(design, solution.rate(a.name))
        if period is not None and math.isfinite(seconds := as_float(period)):
            out[a.name] = seconds
    return out


def uneven_arbors(
    design: Design, solution: TrainSolution, samples: int = 97
) -> tuple[str, ...]:
    """Arbors whose angle strays from even turning (behind a pin-and-slot coupling).

    Each turning arbor's angle is sampled over one of its own turns; even motion is
    the straight line through the two ends, which a periodic unevenness leaves.
    """
    periods = _turning(design, solution)
    # only an arbor behind a coupling can stray; each is sampled on its own, so a
    # train of thousands of arbors costs as much as its couplings' arbors
    model = angle_model(design)
    out = []
    for name in model.uneven():
        if name not in periods:
            continue
        period = periods[name]
        t = np.linspace(0.0, period, samples)
        ang = np.asarray(arbor_angles(design, t, model, [name])[name], dtype=float)
        even = ang[0] + (ang[-1] - ang[0]) * t / period
        if float(np.max(np.abs(ang - even))) > _UNEVEN_DEG:
            out.append(name)
    return tuple(out)


def preview_plan(design: Design, solution: TrainSolution) -> PreviewPlan:
    """Choose the loop: reference arbor, real time shown, speed-up and keyframes."""
    periods = _turning(design, solution)
    if not periods:
        raise ValueError("no arbor turns: there is nothing to animate")
    uneven = uneven_arbors(design, solution)
    pool = uneven or tuple(periods)
    reference = max(pool, key=lambda n: (periods[n], n))
    cycle = periods[reference]
    fastest = min(periods.values())
    shortened = cycle / fastest > MAX_FAST_TURNS
    if shortened:
        cycle = MAX_FAST_TURNS * fastest
    fast_turns = cycle / fastest
    duration = min(max(fast_turns * _SECONDS_PER_FAST_TURN, _MIN_LOOP_S), _MAX_LOOP_S)
    keys = max(_MIN_KEYS, int(math.ceil(fast_turns * _KEYS_PER_FAST_TURN)) + 1)
    times = np.linspace(0.0, cycle, keys)
    angles = arbor_angles(design, times)
    kept = {n: np.asarray(angles[n], dtype=float) for n in periods if n in angles}
    # the mean rate over one whole turn of each uneven arbor (the loop need not be one)
    means = {}
    for n in uneven:
        ends = arbor_angles(design, np.array([0.0, periods[n]]), arbors=[n])[n]
        means[n] = float((ends[1] - ends[0]) / periods[n])
    return PreviewPlan(
        reference=reference,
        cycle_s=cycle,
        duration_s=duration,
        factor=cycle / duration,
        times_s=times,
        angles_deg=kept,
        uneven=tuple(n for n in uneven if n in kept),
        mean_rates_deg_s=means,
        shortened=shortened,
    )


def _rotation(
    values_deg: np.ndarray, cx: float, cy: float, plan: PreviewPlan, key_times: str
) -> str:
    # SVG turns clockwise on the page (y down); our angles are ccw seen from the front
    # a tenth of a degree is far below what the eye follows on a turning pointer
    vals = ";".join(f"{fmt(-v, 1)} {fmt(cx)} {fmt(-cy)}" for v in values_deg)
    return (
        f'<animateTransform attributeName="transform" type="rotate" '
        f'dur="{fmt(plan.duration_s, 2)}s" repeatCount="indefinite" calcMode="linear" '
        f'keyTimes="{key_times}" values="{vals}"/>'
    )


def preview_svg(
    design: Design,
    positions: Mapping[str, tuple[float, float]],
    plan: PreviewPlan,
    rest_deg: Mapping[str, float] | None = None,
) -> str:
    """The animated preview as one ``<svg>`` element (text).

    Every turning arbor has a pointer reaching to 0.9 of its largest pitch circle and
    a mark on each of its wheels, on the middle of one tooth; a carried arbor goes
    round with its carrier; a coupling's pin rides in its slot. The loop starts from
    the rest position of the assembly: each wheel at its angle at rest (``rest_deg``,
    by wheel; by default :func:`wheelgen.layout.phasing.rest_angles`), every carrier
    at 0 and every pin on its coupling's offset line.
    """
    from ..layout.phasing import rest_angles

    rest = rest_angles(design).angles_deg if rest_deg is None else rest_deg
    centres = axis_centres(design, positions)
    ext = drawing_extent(design, centres)
    fs = label_size(ext)
    margin = 3 * fs
    x0, y0, x1, y1 = ext[0] - margin, ext[1] - margin, ext[2] + margin, ext[3] + margin
    kt = np.clip(plan.times_s / plan.cycle_s, 0.0, 1.0)
    kt[0], kt[-1] = 0.0, 1.0
    key_times = ";".join(f"{v:.6f}" for v in kt)
    cols = {a.name: colour(i) for i, a in enumerate(design.arbors)}
    still = {a.name for a in design.arbors} - set(plan.angles_deg)

    def wheel_marks(arbor: str, cx: float, cy: float) -> list[str]:
        items = []
        wheels = design.wheels_on(arbor)
        reach = max((w.pitch_diameter / 2 for w in wheels), default=fs * 2)
        c = cols[arbor]
        for w in wheels:
            r = w.pitch_diameter / 2
            a = math.radians(rest.get(w.name, 0.0))
            ca, sa = math.cos(a), math.sin(a)
            items.append(
                f'<line x1="{fmt(cx + 0.8 * r * ca)}" y1="{fmt(-(cy + 0.8 * r * sa))}" '
                f'x2="{fmt(cx + r * ca)}" y2="{fmt(-(cy + r * sa))}" stroke="{c}" '
                f'stroke-width="{fmt(fs / 5)}"/>'
            )
        for p in design.pinslots:
            b = math.radians(p.bearing_deg)
            if design.wheel(p.pin).arbor == arbor:
                px, py = cx + p.radius * math.cos(b), cy + p.radius * math.sin(b)
                items.append(
                    f'<circle cx="{fmt(px)}" cy="{fmt(-py)}" r="{fmt(p.pin_diameter / 2)}" '
                    f'fill="#9a3d5f"/>'
                )
            if design.wheel(p.slot).arbor == arbor:
                r0 = max(p.radius - p.offset - p.pin_diameter, 0.0)
                r1 = p.radius + p.offset + p.pin_diameter
                items.append(
                    f'<line x1="{fmt(cx + r0 * math.cos(b))}" '
                    f'y1="{fmt(-(cy + r0 * math.sin(b)))}" '
                    f'x2="{fmt(cx + r1 * math.cos(b))}" y2="{fmt(-(cy + r1 * math.sin(b)))}" '
                    f'stroke="#9a3d5f" stroke-opacity="0.45" '
                    f'stroke-width="{fmt(p.pin_diameter * 1.2)}" stroke-linecap="round"/>'
                )
        items.append(
            f'<line x1="{fmt(cx)}" y1="{fmt(-cy)}" x2="{fmt(cx + 0.9 * reach)}" '
            f'y2="{fmt(-cy)}" stroke="{c}" stroke-width="{fmt(fs / 2.5)}" '
            f'stroke-linecap="round"/>'
        )
        return items

    def circles(arbor: str, cx: float, cy: float) -> list[str]:
        dash = ' stroke-dasharray="1.5 1"' if arbor in still else ""
        return [
            f'<circle cx="{fmt(cx)}" cy="{fmt(-cy)}" r="{fmt(w.pitch_diameter / 2)}" '
            f'fill="none" stroke="{cols[arbor]}" stroke-opacity="0.5" '
            f'stroke-width="{fmt(fs / 8)}"{dash}/>'
            for w in design.wheels_on(arbor)
        ]

    def arbor_group(arbor: str, relative_to: str | None) -> list[str]:
        cx, cy = centres[arbor]
        body = wheel_marks(arbor, cx, cy)
        if arbor not in plan.angles_deg:
            return body
        ang = plan.angles_deg[arbor]
        if relative_to is not None:
            ang = ang - plan.angles_deg.get(relative_to, 0.0)
        out = []
        if arbor in plan.uneven:
            full = plan.angles_deg[arbor]
            even = full[0] + plan.mean_rates_deg_s[arbor] * plan.times_s
            if relative_to is not None:
                even = even - plan.angles_deg.get(relative_to, 0.0)
            reach = max(
                (w.pitch_diameter / 2 for w in design.wheels_on(arbor)), default=fs
            )
            out.append(
                f'<g><line x1="{fmt(cx)}" y1="{fmt(-cy)}" x2="{fmt(cx + 0.9 * reach)}" '
                f'y2="{fmt(-cy)}" stroke="{cols[arbor]}" stroke-opacity="0.45" '
                f'stroke-width="{fmt(fs / 2.5)}" stroke-dasharray="{fmt(fs / 2)} '
                f'{fmt(fs / 3)}"/>{_rotation(even, cx, cy, plan, key_times)}</g>'
            )
        out.append(
            "<g>" + "".join(body) + _rotation(ang, cx, cy, plan, key_times) + "</g>"
        )
        return out

    out = [
        f'<svg xmlns="http://www.w3.org/2000/svg" class="drawing preview" '
        f'viewBox="{fmt(x0)} {fmt(-y1)} {fmt(x1 - x0)} {fmt(y1 - y0)}" '
        f'font-family="sans-serif" font-size="{fmt(fs)}">',
        f"<title>Animated preview: 1 s shows {esc(format_period(plan.factor, 4))} "
        "of the train</title>",
        f'<rect x="{fmt(x0)}" y="{fmt(-y1)}" width="{fmt(x1 - x0)}" '
        f'height="{fmt(y1 - y0)}" fill="#fbfaf6"/>',
    ]
    carried = {a.name: carried_by(design, a.name) for a in design.arbors}
    for a in design.arbors:
        if a.name not in centres or carried[a.name] is not None:
            continue
        out.extend(circles(a.name, *centres[a.name]))
    for a in design.arbors:
        if a.name not in centres or carried[a.name] is not None:
            continue
        out.extend(arbor_group(a.name, None))
    for a in design.arbors:
        carrier = carried[a.name]
        if a.name not in centres or carrier is None:
            continue
        cx, cy = centres[carrier]
        ax, ay = centres[a.name]
        inner = circles(a.name, ax, ay) + arbor_group(a.name, carrier)
        inner.append(
            f'<circle cx="{fmt(ax)}" cy="{fmt(-ay)}" r="{fmt(fs / 3)}" fill="#fff" '
            f'stroke="#000" stroke-width="{fmt(fs / 10)}"/>'
        )
        if carrier in plan.angles_deg:
            turn = _rotation(plan.angles_deg[carrier], cx, cy, plan, key_times)
        else:
            turn = ""
        out.append("<g>" + "".join(inner) + turn + "</g>")
    for name, (x, y) in centres.items():
        if carried[name] is not None or design.arbor(name).around is not None:
            continue
        out.append(
            f'<circle cx="{fmt(x)}" cy="{fmt(-y)}" r="{fmt(fs / 3)}" fill="#fff" '
            f'stroke="#000" stroke-width="{fmt(fs / 10)}"/>'
        )
    out.append(
        f'<text x="{fmt(x0 + fs)}" y="{fmt(-y1 + 1.5 * fs)}" fill="#333">'
        f"1 s = {esc(format_period(plan.factor, 4))}; loop = "
        f"{esc(format_period(plan.cycle_s, 5))} of the train</text>"
    )
    out.append("</svg>")
    return "\n".join(out)
