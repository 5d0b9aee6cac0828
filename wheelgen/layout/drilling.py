"""Drilling charts of the frame plates: every hole's X/Y from a datum, size and fit.

The datum is the drive arbor's axis; X to the right and Y up, seen from the front (the
back plate is drilled with the same figures from its inner face). A hole holds the
outermost member of an axis that passes through the plate: a turning arbor's pivot is a
running bore (the process's fit), a fixed stud or tube sits in a hole of its own size
(the fit's hole zone, the member held fast). Lengths in mm, printed to 0.1 micrometre so
that distances read from the chart keep the working centre distances.

:func:`drilling_csv` and :func:`drilling_svg` return text; :func:`drilling_sheet_writer`
writes ``drilling/<plate>.csv`` and ``drilling/<plate>.svg`` for the build. The SVG is
1:1 (its width, height and viewBox are millimetres), with the pitch circles of the
wheels on plate-mounted axes and a line for each mesh between them.
"""

from __future__ import annotations

import csv
import io
import math
from collections.abc import Sequence
from dataclasses import dataclass
from html import escape  # light: xml.sax.saxutils pulls in urllib and http
from pathlib import Path
from typing import Any

from ..checks.findings import has_errors
from ..design.model import Design
from ..kinematics.rates import axis_root
from .fits import limit_deviations
from .plan import Layout, plan_layout
from .sleeves import coaxial_groups, running_bore

__all__ = [
    "PlateHole",
    "drilling_csv",
    "drilling_sheet_writer",
    "drilling_svg",
    "plate_holes",
]

PLATES: tuple[str, ...] = ("back", "front")


@dataclass(frozen=True, slots=True)
class PlateHole:
    """One hole in one plate; x, y from the datum and diameters in mm."""

    plate: str
    number: int
    member: str  # the arbor or sleeve that sits in it
    x: float
    y: float
    nominal: float
    fit: str  # "H7" (zone), or "print +0.4" for a printed hole
    low: float
    high: float
    role: str  # "pivot" (turns in it) | "held" (fixed in it)


def _datum(layout: Layout) -> tuple[float, float]:
    return layout.position(layout.design.drive.arbor) or (0.0, 0.0)


def plate_holes(design: Design, plate: str) -> list[PlateHole]:
    """Holes of ``plate`` ("back" or "front"), numbered from the datum outwards."""
    if plate not in PLATES:
        raise ValueError(f"'plate' must be one of 'back', 'front', got {plate!r}")
    layout = plan_layout(design)
    if design.frame is None:
        return []
    spans = layout.stacking.spans
    dx, dy = _datum(layout)
    proc = design.process
    rows = []
    for root, members in coaxial_groups(design).items():
        pos = layout.placing.positions.get(root)
        if pos is None or plate not in spans[root].plates:
            continue
        holder = root
        for m in members[1:]:
            if plate in spans[m].plates:
                holder = m
        d = layout.outside(holder)
        if design.arbor(holder).fixed:
            role = "held"
            if proc.kind == "print":
                fit, low, high = "print press", d, d
            else:
                zone = proc.fit.split("/")[0]
                up, lo = limit_deviations(d, zone)
                fit, low, high = zone, d + lo / 1000, d + up / 1000
        else:
            role = "pivot"
            bore = running_bore(proc, d)
            fit = bore.zone or f"print +{bore.diameter - d:g}"
            low, high = bore.low, bore.high
        rows.append((pos[0] - dx, pos[1] - dy, holder, d, fit, low, high, role))
    rows.sort(key=lambda r: (round(math.hypot(r[0], r[1]), 6), r[2]))
    return [
        PlateHole(plate, i + 1, h, x, y, d, f, round(lo, 6), round(hi, 6), role)
        for i, (x, y, h, d, f, lo, hi, role) in enumerate(rows)
    ]


def drilling_csv(design: Design, plate: str) -> str:
    """The drilling chart of ``plate`` as CSV text, one hole a row (mm)."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(
        ["plate", "hole", "member", "x_mm", "y_mm", "diameter_mm", "fit", "low_mm",
         "high_mm", "role"]
    )  # fmt: skip
    for h in plate_holes(design, plate):
        w.writerow(
            [h.plate, h.number, h.member, f"{h.x:.4f}", f"{h.y:.4f}", f"{h.nominal:.4f}",
             h.fit, f"{h.low:.4f}", f"{h.high:.4f}", h.role]
        )  # fmt: skip
    return buf.getvalue()


def drilling_svg(design: Design, plate: str, unchecked: bool = False) -> str:
    """The drilling chart of ``plate`` as a 1:1 SVG drawing (mm)."""
    layout = plan_layout(design)
    holes = plate_holes(design, plate)
    dx, dy = _datum(layout)
    mounted = {
        root: (p[0] - dx, p[1] - dy)
        for root, p in layout.placing.positions.items()
        if plate in layout.stacking.spans[root].plates
    }
    circles = []
    for w in design.wheels:
        root = axis_root(design, w.arbor)
        if root in mounted:
            circles.append((*mounted[root], w.pitch_diameter / 2, w.name))
    lines = []
    for m in design.meshes:
        a, b = (axis_root(design, design.wheel(n).arbor) for n in m.pair)
        if a in mounted and b in mounted:
            lines.append((mounted[a], mounted[b], m.label))
    xs = [c[0] - c[2] for c in circles] + [c[0] + c[2] for c in circles] + [0.0]
    ys = [c[1] - c[2] for c in circles] + [c[1] + c[2] for c in circles] + [0.0]
    for h in holes:
        xs += [h.x - h.nominal, h.x + h.nominal]
        ys += [h.y - h.nominal, h.y + h.nominal]
    margin = 10.0
    x0, x1 = min(xs) - margin, max(xs) + margin
    y0, y1 = min(ys) - margin, max(ys) + margin + 8.0  # room for the title
    width, height = x1 - x0, y1 - y0

    def sx(x: float) -> str:
        return f"{x - x0:.4f}"

    def sy(y: float) -> str:
        return f"{y1 - y:.4f}"  # SVG's y runs down; the chart's runs up

    title = f"{design.title}: {plate} plate, seen from the front, mm, 1:1"
    if unchecked:
        title += " (UNCHECKED: the design has error-level findings)"
    out = [
        '<?xml version="1.0" encoding="UTF-8"?>',
        (
            f'<svg xmlns="http://www.w3.org/2000/svg" width="{width:.4f}mm"'
            f' height="{height:.4f}mm" viewBox="0 0 {width:.4f} {height:.4f}">'
        ),
        f"<title>{escape(title)}</title>",
        f'<text x="2" y="5" font-family="sans-serif" font-size="3.5">{escape(title)}</text>',
        (
            '<text x="2" y="9" font-family="sans-serif" font-size="2.5">datum: axis of'
            f" arbor {escape(design.drive.arbor)}; X right, Y up</text>"
        ),
        '<g fill="none" stroke="#777" stroke-width="0.15" stroke-dasharray="1.5 0.75">',
    ]
    for cx, cy, r, name in circles:
        out.append(
            f'<circle cx="{sx(cx)}" cy="{sy(cy)}" r="{r:.4f}"><title>pitch circle of'
            f" {escape(name)}</title></circle>"
        )
    out.append("</g>")
    out.append('<g stroke="#36c" stroke-width="0.2">')
    for (ax, ay), (bx, by), label in lines:
        dist = math.hypot(bx - ax, by - ay)
        out.append(
            f'<line x1="{sx(ax)}" y1="{sy(ay)}" x2="{sx(bx)}" y2="{sy(by)}"><title>'
            f"{escape(label)}: {dist:.4f} mm</title></line>"
        )
    out.append("</g>")
    out.append('<g fill="none" stroke="#000" stroke-width="0.2">')
    for h in holes:
        r = h.nominal / 2
        out.append(
            f'<circle cx="{sx(h.x)}" cy="{sy(h.y)}" r="{r:.4f}"><title>hole {h.number}:'
            f" {escape(h.member)}</title></circle>"
        )
        c = r + 1.5
        out.append(
            f'<line x1="{sx(h.x - c)}" y1="{sy(h.y)}" x2="{sx(h.x + c)}" y2="{sy(h.y)}"/>'
        )
        out.append(
            f'<line x1="{sx(h.x)}" y1="{sy(h.y - c)}" x2="{sx(h.x)}" y2="{sy(h.y + c)}"/>'
        )
    out.append("</g>")
    out.append('<g font-family="sans-serif" font-size="2">')
    for h in holes:
        label = (
            f"{h.number}: {h.member} \u00d8{h.nominal:.3f} {h.fit}"
            f" ({h.x:.4f}, {h.y:.4f})"
        )
        out.append(
            f'<text x="{sx(h.x + h.nominal / 2 + 1.5)}" y="{sy(h.y + 1.5)}">{escape(label)}</text>'
        )
    out.append("</g>")
    out.append("</svg>")
    return "\n".join(out) + "\n"


def drilling_sheet_writer(
    design: Design, parts: Sequence[Any], findings: Sequence[Any], staging_dir: Path
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
