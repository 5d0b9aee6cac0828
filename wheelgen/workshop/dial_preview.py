"""The animated front view: every dial with its graduations and its hands turning.

It shares the loop of :mod:`wheelgen.workshop.preview` (the same sampled moments and
time-lapse), so both pictures run in step. Each hand is its real outline
(:func:`wheelgen.display.outlines.hand_profile`) turned by SMIL ``animateTransform``
keyframes: its direction at rest plus its arbor's angle from
:func:`wheelgen.kinematics.angles.arbor_angles` (exact rates, and the pin-and-slot
coupling's uneven motion where there is one). A knob or crank in front is drawn too.
Each hand's group has the id ``hand-<part name>`` so that its keyframes can be read back.
"""

from __future__ import annotations

import math

import numpy as np

from ..design.model import Design
from ..design.periods import format_period
from ..display.outlines import hand_profile
from ..display.plan import DisplayPlan
from ._svg import esc, fmt, path_d, simplify
from .preview import PreviewPlan, _rotation

__all__ = ["dials_svg"]

_HAND_COLOUR = "#1d2233"


def _extent(display: DisplayPlan) -> tuple[float, float, float, float]:
    xs, ys = [], []
    for d in display.dials:
        p, r = d.part.placement, d.part.radius
        xs += [p.x - r, p.x + r]
        ys += [p.y - r, p.y + r]
    for h in display.hands:
        p, r = h.part.placement, max(h.part.length, h.part.tail)
        xs += [p.x - r, p.x + r]
        ys += [p.y - r, p.y + r]
    return min(xs), min(ys), max(xs), max(ys)


def _dial(display: DisplayPlan, index: int) -> list[str]:
    part = display.dials[index].part
    cx, cy = part.placement.x, part.placement.y
    out = [
        f'<g class="dial" id="dial-{esc(part.name)}" '
        f'transform="translate({fmt(cx)} {fmt(-cy)})">',
        f'<circle cx="0" cy="0" r="{fmt(part.radius)}" fill="#f4f1e6" stroke="#555" '
        f'stroke-width="{fmt(part.radius / 120)}"/>',
    ]
    for x, y, d in part.holes:
        out.append(
            f'<circle cx="{fmt(x)}" cy="{fmt(-y)}" r="{fmt(d / 2)}" fill="#fff" '
            'stroke="#555" stroke-width="0.1"/>'
        )
    for r, w in part.circles:
        out.append(
            f'<circle cx="0" cy="0" r="{fmt(r)}" fill="none" stroke="#222" '
            f'stroke-width="{fmt(w)}"/>'
        )
    for a, r0, r1, w in part.strokes:
        c, s = math.cos(math.radians(a)), math.sin(math.radians(a))
        out.append(
            f'<line x1="{fmt(r0 * c)}" y1="{fmt(-r0 * s)}" x2="{fmt(r1 * c)}" '
            f'y2="{fmt(-r1 * s)}" stroke="#222" stroke-width="{fmt(w)}"/>'
        )
    for x, y, h, turn, text in part.texts:
        rot = f' transform="rotate({fmt(-turn)} {fmt(x)} {fmt(-y)})"' if turn else ""
        out.append(
            f'<text x="{fmt(x)}" y="{fmt(-y)}" font-size="{fmt(h)}" '
            f'text-anchor="middle" dominant-baseline="central" fill="#222"{rot}>'
            f"{esc(text)}</text>"
        )
    out.append("</g>")
    return out


def dials_svg(design: Design, display: DisplayPlan, plan: PreviewPlan) -> str:
    """The dials seen from the front, hands turning, as one ``<svg>`` element (text)."""
    x0, y0, x1, y1 = _extent(display)
    size = max(x1 - x0, y1 - y0)
    fs = size / 40
    margin = 2.5 * fs
    x0, y0, x1, y1 = x0 - margin, y0 - margin, x1 + margin, y1 + margin
    kt = np.clip(plan.times_s / plan.cycle_s, 0.0, 1.0)
    kt[0], kt[-1] = 0.0, 1.0
    key_times = ";".join(f"{v:.6f}" for v in kt)
    out = [
        f'<svg xmlns="http://www.w3.org/2000/svg" class="drawing dials" '
        f'viewBox="{fmt(x0)} {fmt(-y1)} {fmt(x1 - x0)} {fmt(y1 - y0)}" '
        f'font-family="sans-serif" font-size="{fmt(fs)}">',
        f"<title>The dials, seen from the front: 1 s shows "
        f"{esc(format_period(plan.factor, 4))} of the train</title>",
        f'<rect x="{fmt(x0)}" y="{fmt(-y1)}" width="{fmt(x1 - x0)}" '
        f'height="{fmt(y1 - y0)}" fill="#fbfaf6"/>',
    ]
    for i in range(len(display.dials)):
        out.extend(_dial(display, i))
    for h in sorted(display.hands, key=lambda h: h.level.z0):
        part = h.part
        cx, cy = part.placement.x, part.placement.y
        profile = hand_profile(part)
        tol = max(part.length / 600, 0.005)
        loop = profile.outline.polyline(tol)
        loop = simplify(np.vstack((loop, loop[:1])), tol)[:-1]
        moved = loop + np.array([cx, cy])
        hub = f'<circle cx="{fmt(cx)}" cy="{fmt(-cy)}" r="{fmt(part.hub / 4)}" fill="#c9b98a"/>'
        body = (
            f'<path d="{path_d([moved], 3)}" fill="{_HAND_COLOUR}" '
            f'fill-opacity="0.92" stroke="none"/>{hub}'
        )
        rest = part.placement.angle_deg
        angles = plan.angles_deg.get(part.arbor)
        # the static transform shows the rest reading (in print, or with no
        # animation); the keyframes, absolute angles, replace it while playing
        turn = ""
        if angles is not None:
            turn = _rotation(rest + angles, cx, cy, plan, key_times)
        out.append(
            f'<g class="hand" id="hand-{esc(part.name)}" '
            f'transform="rotate({fmt(-rest, 3)} {fmt(cx)} {fmt(-cy)})">{body}{turn}</g>'
        )
    if display.input is not None and display.input.level.side == "front":
        q = display.input.part
        out.append(
            f'<circle cx="{fmt(q.placement.x)}" cy="{fmt(-q.placement.y)}" '
            f'r="{fmt(display.input.sweep)}" fill="none" stroke="#6b4a2b" '
            f'stroke-dasharray="{fmt(fs / 2)} {fmt(fs / 3)}" stroke-width="{fmt(fs / 8)}"/>'
        )
    out.append(
        f'<text x="{fmt(x0 + fs)}" y="{fmt(-y1 + 1.5 * fs)}" fill="#333">'
        f"1 s = {esc(format_period(plan.factor, 4))}</text>"
    )
    out.append("</svg>")
    return "\n".join(out)
