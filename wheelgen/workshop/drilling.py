"""Drilling charts of the frame plates: the outline and every hole's X/Y, size and fit.

The datum is the drive arbor's axis; X to the right and Y up, seen from the front (the
back plate is drilled with the same figures from its inner face). Every hole of the
plate is listed (:mod:`wheelgen.frame.holes` and :mod:`wheelgen.frame.plan`): pivots,
held tubes, bushes and bearings, pillar holes and the mounting holes of cocks, each with
its fit and limits, and the tolerance on its position (half the process's centre
tolerance: two holes together then keep a mesh's centre distance). Lengths in mm,
printed to 0.1 micrometre so that distances read from the chart keep the working centre
distances; in a design whose units are inches, to 0.0001 in.

:func:`drilling_csv` and :func:`drilling_svg` return text; :func:`drilling_sheet_writer`
writes ``drilling/<plate>.csv`` and ``drilling/<plate>.svg`` for the build. The SVG is
1:1 (its width, height and viewBox are millimetres) with a check bar (50 mm, or 2 in
in a design in inches); it shows the
outline, every hole with a centre cross and its number, the cocks' feet, the pitch
circles of the wheels on axes fixed in the frame and a line for every mesh between
them, on both plates.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path

from ..design.model import Design
from ..design.units import lengths_of
from ..findings import Finding, has_errors
from ..frame.holes import FrameHole
from ..frame.plan import PLATES, FramePlan, plan_frame
from ..kinematics.rates import axis_root
from ..layout.part_kinds import Part
from ..layout.train_layout import plan_layout
from ._svg import esc
from .csv_text import csv_text

__all__ = [
    "ChartHole",
    "chart_holes",
    "drilling_csv",
    "drilling_sheet_writer",
    "drilling_svg",
]


@dataclass(frozen=True, slots=True)
class ChartHole:
    """One hole of one plate as the chart lists it: x, y from the datum, sizes (mm)."""

    plate: str
    number: int
    member: str  # what sits in it: an arbor or tube, a pillar, a cock
    x: float
    y: float
    nominal: float
    fit: str  # "H7", "print press", "ISO 273 medium"
    low: float
    high: float
    role: str  # pivot, held, bush, bearing, pillar, screw, mounting


def _datum(design: Design) -> tuple[float, float]:
    return plan_layout(design).position(design.drive.arbor) or (0.0, 0.0)


def chart_holes(design: Design, plate: str) -> list[ChartHole]:
    """Holes of ``plate`` ("back" or "front"), numbered from the datum outwards."""
    if plate not in PLATES:
        raise ValueError(f"'plate' must be one of 'back', 'front', got {plate!r}")
    if design.frame is None:
        return []
    from ..display.plan import display_plan

    dx, dy = _datum(design)
    holes: Sequence[FrameHole] = plan_frame(design).plate(plate).holes + tuple(
        h for h in display_plan(design).plate_holes if h.plate == plate
    )
    rows = sorted(
        holes,
        key=lambda h: (round(math.hypot(h.x - dx, h.y - dy), 6), h.what, h.x, h.y),
    )
    return [
        ChartHole(
            plate, i + 1, h.what, round(h.x - dx, 9) + 0.0, round(h.y - dy, 9) + 0.0,
            h.nominal, h.fit, round(h.low, 6), round(h.high, 6), h.role,
        )
        for i, h in enumerate(rows)
    ]  # fmt: skip


def drilling_csv(design: Design, plate: str) -> str:
    """The drilling chart of ``plate`` as CSV text, one hole a row, in the design's
    units (the columns name them)."""
    u = lengths_of(design)
    col = u.col
    tol = plan_frame(design).limits.position_tolerance if design.frame else 0.0
    n = u.num
    return csv_text(
        ["plate", "hole", "member", col("x"), col("y"), col("diameter"), "fit",
         col("low"), col("high"), "role", col("position_tolerance")],
        (
            [h.plate, h.number, h.member, n(h.x, 4), n(h.y, 4), n(h.nominal, 4),
             h.fit, n(h.low, 4), n(h.high, 4), h.role, n(tol, 4)]
            for h in chart_holes(design, plate)
        ),
    )  # fmt: skip


def _mesh_lines(
    design: Design, dx: float, dy: float
) -> tuple[
    list[tuple[float, float, float, str]],
    list[tuple[tuple[float, float], tuple[float, float], str]],
]:
    """Pitch circles and mesh lines of every axis fixed in the frame (datum-relative)."""
    layout = plan_layout(design)
    fixed = {
        root: (p[0] - dx, p[1] - dy)
        for root, p in layout.placing.positions.items()
        if design.arbor(root).carrier is None
    }
    circles = []
    for w in design.wheels:
        root = axis_root(design, w.arbor)
        if root in fixed:
            circles.append((*fixed[root], w.pitch_diameter / 2, w.name))
    lines = []
    for m in design.meshes:
        a, b = (axis_root(design, design.wheel(n).arbor) for n in m.pair)
        if a in fixed and b in fixed:
            lines.append((fixed[a], fixed[b], m.label))
    return circles, lines


def _stadium(
    a: tuple[float, float], b: tuple[float, float], r: float
) -> list[tuple[float, float]]:
    """Points round the bar from ``a`` to ``b`` with round ends of radius ``r`` (mm)."""
    ang = math.atan2(b[1] - a[1], b[0] - a[0])
    pts = []
    for (cx, cy), start in ((b, ang - math.pi / 2), (a, ang + math.pi / 2)):
        for k in range(13):
            t = start + math.pi * k / 12
            pts.append((cx + r * math.cos(t), cy + r * math.sin(t)))
    return pts


_LIST_FONT = 3.0  # mm: hole numbers and the hole list, about 8.5 pt printed 1:1
_LIST_STEP = 4.2  # mm between the lines of the hole list
_CHAR = 0.6  # mean width of a character, of the font size (sans-serif)


def drilling_svg(design: Design, plate: str, unchecked: bool = False) -> str:
    """The drilling chart of ``plate`` as a 1:1 SVG drawing (drawn in mm, labelled in
    the design's units)."""
    u = lengths_of(design)
    plan: FramePlan = plan_frame(design)
    holes = chart_holes(design, plate)
    dx, dy = _datum(design)
    loop = plan.outline_loop(0.02) - (dx, dy)
    circles, lines = _mesh_lines(design, dx, dy)
    xs = [float(loop[:, 0].min()), float(loop[:, 0].max())]
    ys = [float(loop[:, 1].min()), float(loop[:, 1].max())]
    for cx, cy, r, _ in circles:
        xs += [cx - r, cx + r]
        ys += [cy - r, cy + r]
    margin = 10.0
    tol = plan.limits.position_tolerance
    side = "seen from the front" + (" (its inner face)" if plate == "back" else "")
    title = (
        f"{design.title}: {plate} plate, {side}, {u.words if u.inches else 'mm'}, 1:1"
    )
    if unchecked:
        title += " (UNCHECKED: the design has error-level findings)"
    entries = [
        f"{h.number}: {h.member} ({h.role}) \u00d8{u.num(h.nominal)} {h.fit}, "
        f"{u.num(h.x, 4)}, {u.num(h.y, 4)}"
        for h in holes
    ]
    datum = (
        f"datum: axis of arbor {design.drive.arbor}; X right, Y up; every hole's position"
        f" \u00b1{u.num(tol)} {u.unit}, its diameter within the limits on the chart"
    )
    # the hole list goes under the drawing, so that the chart stays as narrow as the
    # plate and reads at a larger scale where it is shown smaller than 1:1
    list_h = _LIST_STEP * (len(holes) + 1) + 4.0
    text_w = max(
        [_CHAR * _LIST_FONT * len(e) for e in entries]
        + [_CHAR * 3.5 * len(title), _CHAR * 2.5 * len(datum), u.bar.length + 70.0]
    )
    x0 = min(xs) - margin
    x1 = max(max(xs) + margin, x0 + text_w + 6.0)
    y1 = max(ys) + margin + 14.0  # the title above
    y_low = min(ys) - margin  # the drawing's lowest point
    y0 = y_low - list_h - 12.0  # the list, then the check bar below
    width, height = x1 - x0, y1 - y0

    def sx(x: float) -> str:
        return f"{x - x0:.4f}"

    def sy(y: float) -> str:
        return f"{y1 - y:.4f}"  # SVG's y runs down; the chart's runs up

    out = [
        '<?xml version="1.0" encoding="UTF-8"?>',
        (
            f'<svg xmlns="http://www.w3.org/2000/svg" width="{width:.4f}mm"'
            f' height="{height:.4f}mm" viewBox="0 0 {width:.4f} {height:.4f}">'
        ),
        f"<title>{esc(title)}</title>",
        f'<text x="2" y="5" font-family="sans-serif" font-size="3.5">{esc(title)}</text>',
        f'<text x="2" y="9" font-family="sans-serif" font-size="2.5">{esc(datum)}</text>',
        (
            f'<path id="{plate}-outline" d="M{" ".join(f"{sx(x)},{sy(y)}" for x, y in loop)}Z"'
            ' fill="none" stroke="#000" stroke-width="0.3"><title>plate outline</title>'
            "</path>"
        ),
        '<g fill="none" stroke="#777" stroke-width="0.15" stroke-dasharray="1.5 0.75">',
    ]
    for cx, cy, r, name in circles:
        out.append(
            f'<circle cx="{sx(cx)}" cy="{sy(cy)}" r="{r:.4f}"><title>pitch circle of'
            f" {esc(name)}</title></circle>"
        )
    out.append("</g>")
    out.append('<g stroke="#36c" stroke-width="0.2">')
    for (ax, ay), (bx, by), label in lines:
        dist = math.hypot(bx - ax, by - ay)
        out.append(
            f'<line x1="{sx(ax)}" y1="{sy(ay)}" x2="{sx(bx)}" y2="{sy(by)}"><title>'
            f"{esc(label)}: {u.fixed(dist)}</title></line>"
        )
    out.append("</g>")
    out.append(
        '<g fill="none" stroke="#7a4f9a" stroke-width="0.15" stroke-dasharray="1 0.5">'
    )
    for c in plan.cocks:
        if c.plate != plate:
            continue
        foot = _stadium(c.along(c.foot_from), c.along(c.length), c.width / 2)
        pts = " ".join(f"{sx(x - dx)},{sy(y - dy)}" for x, y in foot)
        out.append(f'<path d="M{pts}Z"><title>foot of {esc(c.name)}</title></path>')
    out.append("</g>")
    out.append('<g fill="none" stroke="#000" stroke-width="0.2">')
    for h in holes:
        r = h.nominal / 2
        out.append(
            f'<circle cx="{sx(h.x)}" cy="{sy(h.y)}" r="{r:.4f}"><title>hole {h.number}:'
            f" {esc(h.role)} for {esc(h.member)}</title></circle>"
        )
        arm = r + 1.5  # the centre cross reaches past the hole
        out.append(
            f'<line x1="{sx(h.x - arm)}" y1="{sy(h.y)}" x2="{sx(h.x + arm)}" '
            f'y2="{sy(h.y)}"/>'
        )
        out.append(
            f'<line x1="{sx(h.x)}" y1="{sy(h.y - arm)}" x2="{sx(h.x)}" '
            f'y2="{sy(h.y + arm)}"/>'
        )
    out.append("</g>")
    out.append(
        f'<g font-family="sans-serif" font-size="{_LIST_FONT}" font-weight="bold">'
    )
    for h in holes:
        out.append(
            f'<text x="{sx(h.x + h.nominal / 2 + 0.8)}" y="{sy(h.y + h.nominal / 2 + 0.6)}"'
            f">{h.number}</text>"
        )
    out.append("</g>")
    out.append(
        f'<g font-family="sans-serif" font-size="{_LIST_FONT}" id="{plate}-hole-list">'
    )
    list_x, list_y = "5", y1 - y_low + _LIST_STEP + 2.0
    out.append(
        f'<text x="{list_x}" y="{list_y:.4f}" font-weight="bold">hole: holds, diameter'
        f" and fit, X, Y ({u.unit})</text>"
    )
    for k, entry in enumerate(entries, start=1):
        out.append(
            f'<text x="{list_x}" y="{list_y + _LIST_STEP * k:.4f}">{esc(entry)}</text>'
        )
    out.append("</g>")
    bar_x, bar_y, bar = 5.0, height - 8.0, u.bar
    out.append(
        f'<g id="{plate}-check-bar" stroke="#000" stroke-width="0.25" font-family="sans-serif"'
        f' font-size="2.5"><line x1="{bar_x:.4f}" y1="{bar_y:.4f}"'
        f' x2="{bar_x + bar.length:.4f}" y2="{bar_y:.4f}"/>'
    )
    for k in range(round(bar.length / bar.tick) + 1):
        x = bar_x + bar.tick * k
        out.append(
            f'<line x1="{x:.4f}" y1="{bar_y - 2:.4f}" x2="{x:.4f}" y2="{bar_y:.4f}"/>'
        )
    out.append(
        f'<text x="{bar_x + bar.length + 2:.4f}" y="{bar_y:.4f}" stroke="none">'
        f"{bar.label}: print at 100 % and check with a rule</text></g>"
    )
    out.append("</svg>")
    return "\n".join(out) + "\n"


def drilling_sheet_writer(
    design: Design,
    parts: Sequence[Part],
    findings: Sequence[Finding],
    staging_dir: Path,
) -> list[Path]:
    """Write ``drilling/<plate>.csv`` and ``.svg`` for each plate; return their paths."""
    if design.frame is None:
        return []
    unchecked = has_errors(findings)
    folder = Path(staging_dir) / "drilling"
    folder.mkdir(parents=True, exist_ok=True)
    written = []
    for plate in PLATES:
        text = drilling_csv(design, plate)
        if unchecked:
            text = "# UNCHECKED: the design has error-level findings\n" + text
        p = folder / f"{plate}.csv"
        p.write_text(text, encoding="utf-8")
        written.append(p)
        s = folder / f"{plate}.svg"
        s.write_text(drilling_svg(design, plate, unchecked), encoding="utf-8")
        written.append(s)
    return written
