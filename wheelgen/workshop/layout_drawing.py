"""The layout drawing: plate outline, pillars, cocks, arbors, pitch circles, meshes and
couplings, with names.

Seen from the front, in millimetres (one SVG user unit is one mm; the page scales it).
Arbor positions come from :func:`wheelgen.layout.arbor_positions`; a carried arbor is
drawn where it stands when its carrier is at angle 0. The helpers
:func:`axis_centres` and :func:`carried_by` are shared with the animated preview.
"""

from __future__ import annotations

import math
from typing import Mapping

import numpy as np

from ..design.model import Design
from ..design.units import lengths_of
from ..frame.plan import FramePlan, plan_frame
from ._svg import colour, esc, fmt, path_d

__all__ = [
    "layout_svg",
    "axis_centres",
    "carried_by",
    "drawing_extent",
    "label_size",
]

Point = tuple[float, float]


def carried_by(design: Design, arbor: str) -> str | None:
    """The arbor whose wheel carries ``arbor``'s axis (through any coaxial nesting)."""
    return design.carrier_arbor(arbor)


def axis_centres(
    design: Design,
    positions: Mapping[str, Point],
    carrier_angles_deg: Mapping[str, float] | None = None,
) -> dict[str, Point]:
    """Centre (mm) of every arbor on the plate, carried arbors placed by their carrier.

    ``positions`` is what :func:`wheelgen.layout.placement.arbor_positions` returns:
    the fixed frame, every carrier at angle 0. ``carrier_angles_deg`` turns each
    carrier arbor (ccw, degrees) and carries its arbors round; missing ones stay at 0.
    """
    angles = carrier_angles_deg or {}
    out: dict[str, Point] = {}

    def place(name: str) -> Point:
        if name in out:
            return out[name]
        carrier = carried_by(design, name)
        x, y = positions[name]
        if carrier is not None:
            cx, cy = place(carrier)
            hx, hy = positions[design.axis_root(carrier)]
            # the stored point is already on the plate at carrier angle 0
            dx, dy = x - hx, y - hy
            a = math.radians(angles.get(carrier, 0.0))
            x = cx + dx * math.cos(a) - dy * math.sin(a)
            y = cy + dx * math.sin(a) + dy * math.cos(a)
        out[name] = (x, y)
        return out[name]

    for a in design.arbors:
        if a.name in positions:
            place(a.name)
    return out


def drawing_extent(design: Design, centres: Mapping[str, Point]) -> tuple[float, ...]:
    """``(xmin, ymin, xmax, ymax)`` in mm of every tip circle (module above pitch)."""
    xs0, ys0, xs1, ys1 = [], [], [], []
    for w in design.wheels:
        if w.arbor not in centres:
            continue
        x, y = centres[w.arbor]
        r = w.pitch_diameter / 2 + w.module * (1 + max(w.shift, 0.0))
        xs0.append(x - r)
        ys0.append(y - r)
        xs1.append(x + r)
        ys1.append(y + r)
    for x, y in centres.values():
        xs0.append(x)
        ys0.append(y)
        xs1.append(x)
        ys1.append(y)
    return (min(xs0), min(ys0), max(xs1), max(ys1))


def label_size(extent: tuple[float, ...]) -> float:
    """Font size in mm that reads well at the drawing's printed size."""
    span = max(extent[2] - extent[0], extent[3] - extent[1], 10.0)
    return span / 45.0


def _arbor_colours(design: Design) -> dict[str, str]:
    return {a.name: colour(i) for i, a in enumerate(design.arbors)}


def layout_svg(design: Design, positions: Mapping[str, Point]) -> str:
    """The layout drawing as one ``<svg>`` element (text), seen from the front.

    The plates are drawn with their real outline, the pillars and the cocks' bars
    (:func:`wheelgen.frame.plan.plan_frame`); pitch circles in their arbor's colour; a
    mesh as a line between centres labelled with both tooth counts; a pin-and-slot
    coupling as the pin circle and the offset between the two axes.
    """
    u = lengths_of(design)
    centres = axis_centres(design, positions)
    ext = drawing_extent(design, centres)
    frame: FramePlan | None = None
    loop: np.ndarray | None = None
    if design.frame is not None:
        try:
            frame = plan_frame(design)
        except ValueError:  # no layout: the findings say why
            frame = None
    if frame is not None:
        loop = frame.outline_loop(0.1)
        ext = (
            min(ext[0], float(loop[:, 0].min())),
            min(ext[1], float(loop[:, 1].min())),
            max(ext[2], float(loop[:, 0].max())),
            max(ext[3], float(loop[:, 1].max())),
        )
    fs = label_size(ext)
    margin = 4 * fs
    x0, y0, x1, y1 = ext[0] - margin, ext[1] - margin, ext[2] + margin, ext[3] + margin
    y1 += 2 * fs  # room for the plate note above the plates
    cols = _arbor_colours(design)
    out = [
        f'<svg xmlns="http://www.w3.org/2000/svg" class="drawing layout" '
        f'viewBox="{fmt(x0)} {fmt(-y1)} {fmt(x1 - x0)} {fmt(y1 - y0)}" '
        f'font-family="sans-serif" font-size="{fmt(fs)}">',
        f"<title>Layout seen from the front ({u.unit})</title>",
    ]
    if frame is not None and loop is not None and design.frame is not None:
        out.append(
            f'<path d="{path_d([loop], 2)}" fill="#f4f1ea" stroke="#8a8170" '
            f'stroke-width="{fmt(fs / 8)}"><title>plate outline</title></path>'
        )
        plates = ", ".join(u.short(h) for h in design.frame.plates)
        out.append(
            f'<text x="{fmt(ext[0])}" y="{fmt(-ext[3] - fs)}" fill="#6b6354">'
            f"plates: inner faces at {plates} {u.unit}, "
            f"{u.text(design.frame.thickness)} thick;"
            f" {len(frame.pillars)} pillars"
            + (f", {len(frame.cocks)} cock(s)" if frame.cocks else "")
            + "</text>"
        )
        for cock in frame.cocks:
            (ax, ay), (bx, by) = (cock.x, cock.y), cock.along(cock.length)
            out.append(
                f'<line x1="{fmt(ax)}" y1="{fmt(-ay)}" x2="{fmt(bx)}" y2="{fmt(-by)}" '
                f'stroke="#b8a36a" stroke-width="{fmt(cock.width)}" '
                f'stroke-linecap="round" stroke-opacity="0.8">'
                f"<title>{esc(cock.name)}</title></line>"
            )
        r_p = frame.limits.pillar_diameter / 2
        for pillar in frame.pillars:
            out.append(
                f'<circle cx="{fmt(pillar.x)}" cy="{fmt(-pillar.y)}" r="{fmt(r_p)}" '
                f'fill="#8d9096" stroke="#333" stroke-width="{fmt(fs / 10)}">'
                f"<title>{esc(pillar.name)}</title></circle>"
            )
    # pitch circles, biggest first so small ones stay visible on top
    wheels = sorted(
        (w for w in design.wheels if w.arbor in centres),
        key=lambda w: -w.pitch_diameter,
    )
    label_turn: dict[str, int] = {}
    for w in wheels:
        x, y = centres[w.arbor]
        r = w.pitch_diameter / 2
        ink = cols[w.arbor]
        dash = ' stroke-dasharray="1.5 1"' if design.arbor(w.arbor).fixed else ""
        out.append(
            f'<circle cx="{fmt(x)}" cy="{fmt(-y)}" r="{fmt(r)}" fill="none" '
            f'stroke="{ink}" stroke-width="{fmt(fs / 7)}"{dash}>'
            f"<title>{esc(w.name)}: {w.teeth} teeth, module {w.module:g}</title></circle>"
        )
        # labels of wheels on one axis fan out so they do not sit on each other
        key = f"{fmt(x)},{fmt(y)}"
        k = label_turn.get(key, 0)
        label_turn[key] = k + 1
        label_rad = math.radians(62.0 + 31.0 * k)
        lx, ly = x + r * math.cos(label_rad), y + r * math.sin(label_rad)
        out.append(
            f'<text x="{fmt(lx)}" y="{fmt(-ly)}" fill="{ink}" stroke="#fff" '
            f'stroke-width="{fmt(fs / 6)}" paint-order="stroke" '
            f'font-size="{fmt(0.85 * fs)}">{esc(w.name)} {w.teeth}</text>'
        )
    for m in design.meshes:
        wa, wb = design.wheel(m.pair[0]), design.wheel(m.pair[1])
        if wa.arbor not in centres or wb.arbor not in centres:
            continue
        (ax, ay), (bx, by) = centres[wa.arbor], centres[wb.arbor]
        out.append(
            f'<line x1="{fmt(ax)}" y1="{fmt(-ay)}" x2="{fmt(bx)}" y2="{fmt(-by)}" '
            f'stroke="#333" stroke-width="{fmt(fs / 10)}" stroke-dasharray="{fmt(fs / 2)} '
            f'{fmt(fs / 3)}"/>'
        )
        # the pitch point: where the two pitch circles touch on the line of centres
        d = math.hypot(bx - ax, by - ay) or 1.0
        ra = wa.pitch_diameter / 2
        px, py = ax + (bx - ax) * ra / d, ay + (by - ay) * ra / d
        out.append(
            f'<circle cx="{fmt(px)}" cy="{fmt(-py)}" r="{fmt(fs / 4)}" fill="#333">'
            f"<title>{esc(m.label)}</title></circle>"
        )
    for p in design.pinslots:
        pw, sw = design.wheel(p.pin), design.wheel(p.slot)
        if pw.arbor not in centres or sw.arbor not in centres:
            continue
        (ax, ay), (bx, by) = centres[pw.arbor], centres[sw.arbor]
        out.append(
            f'<circle cx="{fmt(ax)}" cy="{fmt(-ay)}" r="{fmt(p.radius)}" fill="none" '
            f'stroke="#9a3d5f" stroke-width="{fmt(fs / 10)}" stroke-dasharray="'
            f'{fmt(fs / 5)} {fmt(fs / 5)}"><title>{esc(p.name)}: pin circle</title>'
            "</circle>"
        )
        bearing = math.radians(p.bearing_deg)
        px, py = ax + p.radius * math.cos(bearing), ay + p.radius * math.sin(bearing)
        out.append(
            f'<circle cx="{fmt(px)}" cy="{fmt(-py)}" r="{fmt(p.pin_diameter / 2)}" '
            f'fill="#9a3d5f"/>'
        )
        out.append(
            f'<line x1="{fmt(ax)}" y1="{fmt(-ay)}" x2="{fmt(bx)}" y2="{fmt(-by)}" '
            f'stroke="#9a3d5f" stroke-width="{fmt(fs / 6)}"/>'
        )
        out.append(
            f'<text x="{fmt(px + fs / 2)}" y="{fmt(-py - fs / 2)}" fill="#9a3d5f" '
            f'font-size="{fmt(0.85 * fs)}">{esc(p.name)} (offset {u.text(p.offset)})'
            "</text>"
        )
    # arbor centres and names on top
    named: dict[str, list[str]] = {}
    for name, (x, y) in centres.items():
        named.setdefault(f"{fmt(x)},{fmt(y)}", []).append(name)
    for names in named.values():
        x, y = centres[names[0]]
        arbor = design.arbor(names[0])
        out.append(
            f'<circle cx="{fmt(x)}" cy="{fmt(-y)}" '
            f'r="{fmt(max(arbor.diameter / 2, fs / 3))}" '
            f'fill="#fff" stroke="#000" stroke-width="{fmt(fs / 8)}"/>'
        )
        # coaxial names stacked; a carried axis labelled above, clear of its carrier's
        up = carried_by(design, names[0]) is not None
        for i, name in enumerate(names):
            ty = y + (1.2 + i) * fs if up else y - (1.3 + i) * fs
            if up:
                ty = y + (1.0 + len(names) - 1 - i) * fs
            out.append(
                f'<text x="{fmt(x + fs / 2)}" y="{fmt(-ty)}" '
                f'font-weight="bold" stroke="#fff" stroke-width="{fmt(fs / 5)}" '
                f'paint-order="stroke">{esc(name)}</text>'
            )
    out.append("</svg>")
    return "\n".join(out)
