"""A small drawing of one part for the report: a wheel, plate, hand, dial or crank
face-on, a shaft, tube or pillar side-on, a cock from above.

The wheel is its flat profile (toothed outline and every hole, the very loops the
solid is extruded from) with the pitch circle dashed; a plate its outline and holes; an
arbor, sleeve, pin or pillar is a side view with its seats, collars and spigots; a cock
its bar with the foot dashed. Sizes in mm; the SVG scales to the page, and the caption
gives the real size.
"""

from __future__ import annotations

import numpy as np

from ..display.outlines import flat_profile
from ..frame.outline import edges_polyline
from ..layout.part_kinds import (
    ArborPart,
    CockPart,
    CollarPart,
    CrankPart,
    DialPart,
    HandPart,
    KnobPart,
    Part,
    PillarPart,
    PinPart,
    PlatePart,
    SleevePart,
    WheelPart,
)
from ..layout.wheel_profile import plate_profile
from ..teeth.forms import outline_for
from ..teeth.outline import WheelOutline
from ._svg import esc, fmt, path_d, simplify

__all__ = ["part_svg"]

# the report shows a part about 150 px wide: a chord error of 1/500 of its radius is
# under a tenth of a pixel there, and keeps the page small
_CHORD_PER_RADIUS = 1 / 500


def _outline_loop(outline: WheelOutline, tol: float) -> np.ndarray:
    # one tooth thinned out, then repeated: the exact spline points are far denser
    # than a small drawing needs
    one = outline.tooth_polyline(tol)
    one = simplify(np.vstack((one, one[:1])), tol)[:-1]
    a = np.radians(np.arange(outline.teeth) * outline.pitch_angle_deg)
    c, s = np.cos(a)[:, None], np.sin(a)[:, None]
    x = c * one[:, 0] - s * one[:, 1]
    y = s * one[:, 0] + c * one[:, 1]
    return np.column_stack((x.ravel(), y.ravel()))


def _wheel_svg(part: WheelPart) -> str:
    outline = outline_for(part.tooth)
    profile = plate_profile(part, outline)
    tol = max(profile.tip_radius * _CHORD_PER_RADIUS, 0.002)
    loops = [_outline_loop(outline, tol)] + [h.polyline(tol) for h in profile.holes]
    r = profile.tip_radius * 1.06
    sw = r / 150
    return (
        f'<svg xmlns="http://www.w3.org/2000/svg" class="part" '
        f'viewBox="{fmt(-r)} {fmt(-r)} {fmt(2 * r)} {fmt(2 * r)}">'
        f"<title>{esc(part.name)}</title>"
        f'<path d="{path_d(loops, 2)}" fill="#d9cfa8" fill-rule="evenodd" stroke="#333" '
        f'stroke-width="{fmt(sw, 4)}"/>'
        f'<circle cx="0" cy="0" r="{fmt(profile.pitch_radius)}" fill="none" '
        f'stroke="#1f5f8b" stroke-width="{fmt(sw, 4)}" '
        f'stroke-dasharray="{fmt(6 * sw, 4)} {fmt(3 * sw, 4)}"/>'
        "</svg>"
    )


def _side_svg(part: ArborPart | SleevePart | PinPart | CollarPart) -> str:
    length = part.length
    collars: tuple[tuple[float, float, float], ...] = ()
    seats: tuple[tuple[float, float, str], ...] = ()
    if isinstance(part, SleevePart):
        d_out, d_in = part.outside, part.inside
        collars, seats = part.collars, part.seats
    elif isinstance(part, CollarPart):
        d_out, d_in = part.outside, part.inside
    elif isinstance(part, ArborPart):
        d_out, d_in = part.diameter, 0.0
        collars, seats = part.collars, part.seats
    else:
        d_out, d_in = part.diameter, 0.0
    big = max([d_out] + [d for _, _, d in collars])
    # at least 1:6 high so that a long thin shaft still shows its diameter
    h = max(big * 1.4, length / 6)
    pad = max(length, h) * 0.04
    sw = max(length, h) / 300
    out = [
        f'<svg xmlns="http://www.w3.org/2000/svg" class="part side" '
        f'viewBox="{fmt(-pad)} {fmt(-h / 2)} {fmt(length + 2 * pad)} {fmt(h)}">'
        f"<title>{esc(part.name)}</title>"
    ]
    for z0, z1, d in collars:
        out.append(
            f'<rect x="{fmt(z0)}" y="{fmt(-d / 2)}" width="{fmt(z1 - z0)}" '
            f'height="{fmt(d)}" fill="#c9b98a" stroke="#333" stroke-width="{fmt(sw, 4)}"/>'
        )
    out.append(
        f'<rect x="0" y="{fmt(-d_out / 2)}" width="{fmt(length)}" height="{fmt(d_out)}" '
        f'fill="#d9cfa8" stroke="#333" stroke-width="{fmt(sw, 4)}"/>'
    )
    if d_in > 0:
        out.append(
            f'<rect x="0" y="{fmt(-d_in / 2)}" width="{fmt(length)}" height="{fmt(d_in)}" '
            f'fill="#fff" stroke="#333" stroke-width="{fmt(sw, 4)}" '
            f'stroke-dasharray="{fmt(4 * sw, 4)} {fmt(2 * sw, 4)}"/>'
        )
    for z0, z1, _shape in seats:
        out.append(
            f'<rect x="{fmt(z0)}" y="{fmt(-d_out / 2)}" width="{fmt(z1 - z0)}" '
            f'height="{fmt(d_out)}" fill="#1f5f8b" fill-opacity="0.35" stroke="none"/>'
        )
    out.append(
        f'<line x1="{fmt(-pad / 2)}" y1="0" x2="{fmt(length + pad / 2)}" y2="0" '
        f'stroke="#b5562d" stroke-width="{fmt(sw, 4)}" '
        f'stroke-dasharray="{fmt(8 * sw, 4)} {fmt(3 * sw, 4)}"/>'
    )
    out.append("</svg>")
    return "".join(out)


def _plate_svg(part: PlatePart) -> str:
    loop = edges_polyline(part.outline, 0.2)
    (x0, y0), (x1, y1) = loop.min(axis=0), loop.max(axis=0)
    pad = 0.04 * max(x1 - x0, y1 - y0)
    sw = max(x1 - x0, y1 - y0) / 300
    holes = [
        f'<circle cx="{fmt(h.x)}" cy="{fmt(-h.y)}" r="{fmt(h.diameter / 2)}" '
        f'fill="#fff" stroke="#333" stroke-width="{fmt(sw, 4)}"/>'
        for h in part.holes
    ]
    return (
        f'<svg xmlns="http://www.w3.org/2000/svg" class="part" '
        f'viewBox="{fmt(x0 - pad)} {fmt(-y1 - pad)} {fmt(x1 - x0 + 2 * pad)} '
        f'{fmt(y1 - y0 + 2 * pad)}"><title>{esc(part.name)}</title>'
        f'<path d="{path_d([loop], 2)}" fill="#e6dcb8" stroke="#333" '
        f'stroke-width="{fmt(sw, 4)}"/>' + "".join(holes) + "</svg>"
    )


def _pillar_svg(part: PillarPart) -> str:
    spigots = (part.back_spigot + part.front_spigot) if part.spigot > 0 else 0.0
    length = part.length + spigots
    h = max(part.diameter * 1.4, length / 6)
    pad = max(length, h) * 0.04
    sw = max(length, h) / 300
    x = part.back_spigot if part.spigot > 0 else 0.0
    out = [
        f'<svg xmlns="http://www.w3.org/2000/svg" class="part side" '
        f'viewBox="{fmt(-pad)} {fmt(-h / 2)} {fmt(length + 2 * pad)} {fmt(h)}">'
        f"<title>{esc(part.name)}</title>",
        f'<rect x="{fmt(x)}" y="{fmt(-part.diameter / 2)}" width="{fmt(part.length)}" '
        f'height="{fmt(part.diameter)}" fill="#d0d2d6" stroke="#333" '
        f'stroke-width="{fmt(sw, 4)}"/>',
    ]
    if part.spigot > 0:
        for x0, w in ((0.0, part.back_spigot), (x + part.length, part.front_spigot)):
            out.append(
                f'<rect x="{fmt(x0)}" y="{fmt(-part.spigot / 2)}" width="{fmt(w)}" '
                f'height="{fmt(part.spigot)}" fill="#d0d2d6" stroke="#333" '
                f'stroke-width="{fmt(sw, 4)}"/>'
            )
    for x0, d, depth in (
        (0.0, part.back_hole, part.back_depth),
        (length - part.front_depth, part.front_hole, part.front_depth),
    ):
        if d > 0 and depth > 0:
            out.append(
                f'<rect x="{fmt(x0)}" y="{fmt(-d / 2)}" width="{fmt(depth)}" '
                f'height="{fmt(d)}" fill="#fff" stroke="#333" stroke-width="{fmt(sw, 4)}" '
                f'stroke-dasharray="{fmt(4 * sw, 4)} {fmt(2 * sw, 4)}"/>'
            )  # fmt: skip
    out.append("</svg>")
    return "".join(out)


def _cock_svg(part: CockPart) -> str:
    w, r = part.width, part.width / 2
    pad = 0.1 * (part.length + w)
    sw = (part.length + w) / 200

    def stadium(start: float, dash: str) -> str:
        return (
            f'<path d="M{fmt(start)},{fmt(-r)} L{fmt(part.length)},{fmt(-r)} '
            f"A{fmt(r)},{fmt(r)} 0 0 1 {fmt(part.length)},{fmt(r)} L{fmt(start)},{fmt(r)} "
            f'A{fmt(r)},{fmt(r)} 0 0 1 {fmt(start)},{fmt(-r)}Z" fill="none" stroke="#333" '
            f'stroke-width="{fmt(sw, 4)}"{dash}/>'
        )

    holes = [(0.0, part.pivot_hole)] + [(x, part.screw_hole) for x in part.screws]
    return (
        f'<svg xmlns="http://www.w3.org/2000/svg" class="part" '
        f'viewBox="{fmt(-r - pad)} {fmt(-r - pad)} {fmt(part.length + w + 2 * pad)} '
        f'{fmt(w + 2 * pad)}"><title>{esc(part.name)}</title>'
        + stadium(0.0, "").replace('fill="none"', 'fill="#e6dcb8"')
        + stadium(
            part.foot_from, f' stroke-dasharray="{fmt(3 * sw, 4)} {fmt(2 * sw, 4)}"'
        )
        + "".join(
            f'<circle cx="{fmt(x)}" cy="0" r="{fmt(d / 2)}" fill="#fff" stroke="#333" '
            f'stroke-width="{fmt(sw, 4)}"/>'
            for x, d in holes
        )
        + "</svg>"
    )


def _flat_svg(part: HandPart | DialPart | CrankPart | KnobPart) -> str:
    profile = flat_profile(part)
    outer = profile.outline.polyline(0.05)
    r = float(np.hypot(outer[:, 0], outer[:, 1]).max()) * 1.06
    tol = max(r * _CHORD_PER_RADIUS, 0.002)
    loops = [profile.outline.polyline(tol)] + [h.polyline(tol) for h in profile.holes]
    sw = r / 150
    ticks = ""
    if isinstance(part, DialPart):
        ticks = "".join(
            f'<line x1="{fmt(r0 * np.cos(np.radians(a)))}" '
            f'y1="{fmt(-r0 * np.sin(np.radians(a)))}" '
            f'x2="{fmt(r1 * np.cos(np.radians(a)))}" '
            f'y2="{fmt(-r1 * np.sin(np.radians(a)))}" stroke="#333" '
            f'stroke-width="{fmt(max(w, sw), 4)}"/>'
            for a, r0, r1, w in part.strokes
        )
    return (
        f'<svg xmlns="http://www.w3.org/2000/svg" class="part" '
        f'viewBox="{fmt(-r)} {fmt(-r)} {fmt(2 * r)} {fmt(2 * r)}">'
        f"<title>{esc(part.name)}</title>"
        f'<path d="{path_d(loops, 2)}" fill="#d9cfa8" fill-rule="evenodd" stroke="#333" '
        f'stroke-width="{fmt(sw, 4)}"/>{ticks}'
        "</svg>"
    )


def part_svg(part: Part) -> str:
    """One part as an ``<svg>`` element (text); wheels, plates and the display's flat
    parts face-on, shafts, tubes and pillars side-on, cocks from above."""
    if isinstance(part, WheelPart):
        return _wheel_svg(part)
    if isinstance(part, (HandPart, DialPart, CrankPart, KnobPart)):
        return _flat_svg(part)
    if isinstance(part, (ArborPart, SleevePart, PinPart, CollarPart)):
        return _side_svg(part)
    if isinstance(part, PlatePart):
        return _plate_svg(part)
    if isinstance(part, PillarPart):
        return _pillar_svg(part)
    if isinstance(part, CockPart):
        return _cock_svg(part)
    raise ValueError(f"unknown part kind {type(part).__name__!r}")
