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
    "CHAR_WIDTH",
    "LabelPlacer",
    "boxes_meet",
    "text_box",
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


#: Width of one character as a fraction of the font size: a mean over the letters,
#: digits and underscores of names in a sans-serif face, a little generous so that an
#: estimated box holds the drawn text (bold adds a twentieth).
CHAR_WIDTH = 0.62
_ASCENT, _DESCENT = 0.8, 0.25  # of the font size, above and below the baseline

Box = tuple[float, float, float, float]


def text_box(
    x: float, y: float, text: str, size: float, anchor: str, bold: bool = False
) -> Box:
    """The box ``(x0, y0, x1, y1)`` (mm, y up) a line of ``text`` takes, drawn at
    ``x``, ``y`` (its baseline) in ``size`` with ``anchor`` start, middle or end."""
    w = len(text) * size * (CHAR_WIDTH * (1.05 if bold else 1.0))
    x0 = {"start": x, "middle": x - w / 2, "end": x - w}[anchor]
    return (x0, y - _DESCENT * size, x0 + w, y + _ASCENT * size)


def boxes_meet(a: Box, b: Box) -> bool:
    """Do two boxes overlap (touching edges do not count)?"""
    return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]


Spot = tuple[float, float, str]  # baseline x, y (mm, y up) and text-anchor


class LabelPlacer:
    """Places labels one by one at the first of their candidate spots where the text
    meets no label placed before (else where it meets the fewest)."""

    def __init__(self) -> None:
        self.taken: list[Box] = []

    def place(
        self, text: str, size: float, spots: list[Spot], bold: bool = False
    ) -> Spot:
        best, best_hits = spots[0], None
        for spot in spots:
            box = text_box(spot[0], spot[1], text, size, spot[2], bold)
            hits = sum(boxes_meet(box, t) for t in self.taken)
            if hits == 0:
                best, best_hits = spot, 0
                break
            if best_hits is None or hits < best_hits:
                best, best_hits = spot, hits
        self.taken.append(text_box(best[0], best[1], text, size, best[2], bold))
        return best


def _around_point(x: float, y: float, fs: float) -> list[Spot]:
    """Spots for a name beside a point: below right first, then stepping away."""
    spots: list[Spot] = []
    for k in range(8):
        spots += [
            (x + fs / 2, y - (1.3 + k) * fs, "start"),
            (x + fs / 2, y + (0.6 + k) * fs, "start"),
            (x - fs / 2, y - (1.3 + k) * fs, "end"),
            (x - fs / 2, y + (0.6 + k) * fs, "end"),
        ]
    return spots


def _round_circle(
    x: float, y: float, r: float, start_deg: float, fs: float
) -> list[Spot]:
    """Spots for a wheel's name on its pitch circle, from ``start_deg`` round both
    ways in 10-degree steps, then on circles a line and more further out (a small
    wheel in a crowded middle); the text runs outward from the circle."""
    spots: list[Spot] = []
    for ring in range(5):
        rr = r + 1.2 * fs * ring
        for k in range(37):
            for sign in (1, -1) if k else (1,):
                a = math.radians(start_deg + sign * 10.0 * k)
                px, py = x + rr * math.cos(a), y + rr * math.sin(a)
                anchor = "start" if math.cos(a) >= -0.2 else "end"
                spots.append((px, py - (0.8 * fs if math.sin(a) < 0 else 0.0), anchor))
    return spots


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
    plate_note = ""
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
        plate_note = (
            f"plates: inner faces at {plates} {u.unit}, "
            f"{u.text(design.frame.thickness)} thick;"
            f" {len(frame.pillars)} pillars"
            + (f", {len(frame.cocks)} cock(s)" if frame.cocks else "")
        )
        out.append(
            f'<text x="{fmt(ext[0])}" y="{fmt(-ext[3] - fs)}" fill="#6b6354">'
            f"{esc(plate_note)}</text>"
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
    wheel_labels: list[tuple[float, float, float, float, str, str]] = []
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
        # labels of wheels on one axis start fanned out; the placer moves on round
        # the circle from there until the label meets no other
        key = f"{fmt(x)},{fmt(y)}"
        k = label_turn.get(key, 0)
        label_turn[key] = k + 1
        wheel_labels.append((x, y, r, 62.0 + 31.0 * k, f"{w.name} {w.teeth}", ink))
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
    coupling_labels: list[tuple[float, float, str]] = []
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
        coupling_labels.append((px, py, f"{p.name} (offset {u.text(p.offset)})"))
    # arbor centres and names on top
    arbor_labels: list[tuple[float, float, list[str]]] = []
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
        arbor_labels.append((x, y, names))
    # names last, on top, placed so that no two meet: the arbors' names first (stacked
    # for a coaxial set), then the couplings', then the wheels' round their circles
    placer = LabelPlacer()
    if frame is not None and design.frame is not None:
        placer.taken.append(text_box(ext[0], ext[3] + fs, plate_note, fs, "start"))
    for x, y, names in arbor_labels:
        for name in names:
            tx, ty, anchor = placer.place(name, fs, _around_point(x, y, fs), bold=True)
            out.append(
                f'<text x="{fmt(tx)}" y="{fmt(-ty)}" text-anchor="{anchor}" '
                f'font-weight="bold" stroke="#fff" stroke-width="{fmt(fs / 5)}" '
                f'paint-order="stroke">{esc(name)}</text>'
            )
    small = 0.85 * fs
    for px, py, text in coupling_labels:
        tx, ty, anchor = placer.place(text, small, _around_point(px, py, small))
        out.append(
            f'<text x="{fmt(tx)}" y="{fmt(-ty)}" text-anchor="{anchor}" '
            f'fill="#9a3d5f" stroke="#fff" stroke-width="{fmt(fs / 6)}" '
            f'paint-order="stroke" font-size="{fmt(small)}">{esc(text)}</text>'
        )
    for x, y, r, start, text, c in wheel_labels:
        tx, ty, anchor = placer.place(text, small, _round_circle(x, y, r, start, small))
        out.append(
            f'<text x="{fmt(tx)}" y="{fmt(-ty)}" text-anchor="{anchor}" fill="{c}" '
            f'stroke="#fff" stroke-width="{fmt(fs / 6)}" paint-order="stroke" '
            f'font-size="{fmt(small)}">{esc(text)}</text>'
        )
    out.append("</svg>")
    return "\n".join(out)
