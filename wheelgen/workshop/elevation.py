"""The sectional elevation: every arbor, tube, wheel, collar, plate, dial and hand seen
from the side, cut through the axes, at their true heights.

The arbors do not stand in one plane, so the section is developed: the axes are taken
in order across the plates (by x, then y) and each stands at its true distance from
the one before it, so two axes next to each other in that order show their true
centre distance (a mesh between them its true overlap of tips). Heights are the
assembly's z (mm), up the page: the back of the movement at the bottom, the hands at
the top; the labels and the height scale are in the design's units (the drawing
stays 1:1 in mm). Wheels are drawn to their tip diameter with their hub, arbors and tubes
with every turned length at its diameter, plates across the whole section, a dial
across its diameter, a hand from its tail to its tip. Pillars and screws stand off
the section and are left out.

:func:`elevation_blocks` gives the rectangles (also used by the assembly figures),
:func:`elevation_svg` the drawing (one SVG user unit is one mm), and
:func:`elevation_writer` writes ``drawings/elevation.svg`` in a build.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path
from typing import Collection, Sequence

from ..design.model import Design
from ..design.units import MM, Lengths, lengths_of
from ..findings import Finding
from ..layout.part_kinds import (
    ArborPart,
    CockPart,
    CollarPart,
    CrankPart,
    DialPart,
    HandPart,
    KnobPart,
    Part,
    PlatePart,
    SleevePart,
    WheelPart,
)
from ..layout.placement import nominal_tip_radius
from ._svg import esc, fmt

__all__ = [
    "ELEVATION_FILE",
    "ELEVATION_KINDS",
    "Block",
    "Column",
    "elevation_blocks",
    "elevation_svg",
    "elevation_writer",
]

#: The elevation's file inside the build output.
ELEVATION_FILE = "drawings/elevation.svg"
#: Kinds of part the elevation draws (pillars, screws and bearings stand off it).
ELEVATION_KINDS = frozenset(
    {"arbor", "sleeve", "wheel", "collar", "plate", "dial", "hand", "cock", "knob",
     "crank"}
)  # fmt: skip

_SAME_AXIS = 1e-6  # mm: two placements this close stand on one axis
_PLATE_OVERHANG = 4.0  # mm past the outermost part
_TEXT = 2.5  # mm: label height
_GAP = 3.2  # mm between label lines

# Fill and edge of each kind: muted, readable in grey.
_STYLE = {
    "plate": ("#e6dfcf", "#8a7a5a"),
    "cock": ("#d8c3a5", "#8a7a5a"),
    "dial": ("#f4f1e8", "#8a7a5a"),
    "wheel": ("#cfdce8", "#1f5f8b"),
    "hand": ("#333333", "#111111"),
    "knob": ("#e0b9a4", "#b5562d"),
    "crank": ("#e0b9a4", "#b5562d"),
    "sleeve": ("#d4c09a", "#7a5f2a"),
    "arbor": ("#a9a9a9", "#333333"),
    "collar": ("#707070", "#222222"),
}
# Painting order: a member over the wheels it passes through, a collar over its member.
_ORDER = ("plate", "dial", "cock", "wheel", "hand", "knob", "crank", "sleeve",
          "arbor", "collar")  # fmt: skip


@dataclass(frozen=True, slots=True)
class Column:
    """One axis of the section: its place ``at`` on the plates (mm), its developed
    position ``x`` (mm from the first axis) and the members on it."""

    x: float
    at: tuple[float, float]
    members: tuple[str, ...]


@dataclass(frozen=True, slots=True)
class Block:
    """One rectangle of the section: ``part`` of ``kind`` from ``x0`` to ``x1`` across
    (developed, mm) and from ``z0`` to ``z1`` in height (mm)."""

    part: str
    kind: str
    x0: float
    x1: float
    z0: float
    z1: float


def _columns(parts: Sequence[Part]) -> list[Column]:
    axes: dict[tuple[float, float], list[str]] = {}
    for p in parts:
        if isinstance(p, (ArborPart, SleevePart)):
            key = (round(p.placement.x, 6), round(p.placement.y, 6))
            axes.setdefault(key, []).append(p.name)
    out: list[Column] = []
    for at in sorted(axes):
        x = 0.0
        if out:
            px, py = out[-1].at
            x = out[-1].x + math.hypot(at[0] - px, at[1] - py)
        out.append(Column(x, at, tuple(axes[at])))
    return out


def _column_of(columns: Sequence[Column], part: Part) -> Column:
    """The axis a part stands on (the nearest, for a dial off every axis)."""
    px, py = part.placement.x, part.placement.y
    return min(columns, key=lambda c: (math.hypot(c.at[0] - px, c.at[1] - py), c.x))


def _shape(part: Part) -> list[tuple[float, float, float, float]]:
    """The part's rectangles (x0, x1 across its axis; z0, z1 from its back face)."""
    if isinstance(part, WheelPart):
        r = nominal_tip_radius(part.tooth)
        out = [(-r, r, 0.0, part.face_width)]
        if part.hub_diameter > 0 and part.hub_length > 0:
            h = part.hub_diameter / 2
            out.append((-h, h, part.face_width, part.face_width + part.hub_length))
        return out
    if isinstance(part, (ArborPart, SleevePart)):
        if part.sections:
            return [
                (-s.diameter / 2, s.diameter / 2, s.z0, s.z1) for s in part.sections
            ]
        d = part.diameter if isinstance(part, ArborPart) else part.outside
        return [(-d / 2, d / 2, 0.0, part.length)]
    if isinstance(part, CollarPart):
        return [(-part.outside / 2, part.outside / 2, 0.0, part.length)]
    if isinstance(part, DialPart):
        z = part.foot_length
        return [(-part.radius, part.radius, z, z + part.thickness)]
    if isinstance(part, HandPart):
        out = [(-part.tail, part.length, 0.0, part.thickness)]
        if part.collet > 0 and part.collet_length > 0:
            c = part.collet / 2
            out.append((-c, c, part.thickness, part.thickness + part.collet_length))
        return out
    if isinstance(part, KnobPart):
        return [(-part.diameter / 2, part.diameter / 2, 0.0, part.length)]
    if isinstance(part, CrankPart):
        return [(-part.hub / 2, part.throw + part.arm / 2, 0.0, part.thickness)]
    if isinstance(part, CockPart):
        # the bar round the pivot, cut across; its foot stands off the section
        z0 = 0.0 if part.hanging else part.foot_height
        return [(-part.width / 2, part.width / 2, z0, z0 + part.thickness)]
    return []


def elevation_blocks(
    parts: Sequence[Part], only: Collection[str] | None = None
) -> tuple[list[Column], list[Block]]:
    """The developed section's axes and rectangles, in painting order (see the module
    docstring); plates span every other block and a little more. ``only``: draw just
    these parts, where they stand among all of ``parts``."""
    columns = _columns(parts)
    if not columns:
        return [], []
    blocks: list[Block] = []
    for p in parts:
        if p.kind not in ELEVATION_KINDS or isinstance(p, PlatePart):
            continue
        c = _column_of(columns, p)
        z = p.placement.z
        for x0, x1, z0, z1 in _shape(p):
            blocks.append(
                Block(p.name, p.kind, round(c.x + x0, 6), round(c.x + x1, 6),
                      round(z + z0, 6), round(z + z1, 6))
            )  # fmt: skip
    lo = min([b.x0 for b in blocks] + [columns[0].x]) - _PLATE_OVERHANG
    hi = max([b.x1 for b in blocks] + [columns[-1].x]) + _PLATE_OVERHANG
    for p in parts:
        if isinstance(p, PlatePart):
            z = p.placement.z
            blocks.append(Block(p.name, p.kind, lo, hi, z, round(z + p.thickness, 6)))
    rank = {k: i for i, k in enumerate(_ORDER)}
    # tubes outside in: the outer one first, so the one inside is painted over it
    wide = {b.part: -(b.x1 - b.x0) for b in blocks if b.kind in ("sleeve", "arbor")}
    blocks.sort(key=lambda b: (rank[b.kind], wide.get(b.part, 0.0)))
    if only is not None:
        keep = set(only)
        blocks = [b for b in blocks if b.part in keep]
    return columns, blocks


def _labels(
    blocks: Sequence[Block], mid: float, lengths: Lengths = MM
) -> list[tuple[str, float, float, bool]]:
    """One label per part: (text, anchor x, anchor z, on the left)."""
    seen: dict[str, list[Block]] = {}
    for b in blocks:
        seen.setdefault(b.part, []).append(b)
    plates = sorted(b.z0 for b in blocks if b.kind == "plate")
    out = []
    for name, bs in seen.items():
        z0, z1 = min(b.z0 for b in bs), max(b.z1 for b in bs)
        x0, x1 = min(b.x0 for b in bs), max(b.x1 for b in bs)
        left = (x0 + x1) / 2 < mid
        if bs[0].kind == "plate":  # the plates span everything: back left, front right
            left = z0 == plates[0]
        main = bs[0]
        zc = (main.z0 + main.z1) / 2
        text = f"{name}  {_height(z0, lengths)} \u2013 {_height(z1, lengths)}"
        out.append((text, x0 if left else x1, zc, left))
    return out


def _height(z: float, lengths: Lengths) -> str:
    """A height as the labels write it: to 0.01 mm, or to 0.0001 in."""
    return lengths.short(z) if lengths.inches else fmt(z, 2)


#: The height scale's ticks (mm apart) and every how many ticks one is numbered: 5 mm
#: numbered every 10 mm; 0.1 in numbered every 0.5 in.
_SCALE = {"mm": (5.0, 2), "in": (2.54, 5)}


def _spread(wanted: list[float]) -> list[float]:
    """Label heights in order, at least one line apart, as near the wanted ones."""
    placed: list[float] = []
    for z in wanted:
        placed.append(z if not placed else max(z, placed[-1] + _GAP))
    # centre the run on what was wanted, never closer than a line
    shift = (sum(wanted) - sum(placed)) / len(placed) if placed else 0.0
    return [z + shift for z in placed]


def elevation_svg(
    parts: Sequence[Part],
    *,
    only: Collection[str] | None = None,
    highlight: Collection[str] | None = None,
    labels: bool = True,
    title: str = "",
    lengths: Lengths = MM,
) -> str:
    """The sectional elevation as an SVG document (1 user unit = 1 mm, page in mm).

    Every drawn part is a group ``<g data-part=name data-kind=kind>`` of rectangles;
    ``only`` draws just those parts in their places, ``highlight`` draws those in a
    strong colour and the rest in grey (the assembly figures); ``labels`` adds a name
    and height range beside each part and a height scale, in ``lengths``' units.
    """
    columns, everything = elevation_blocks(parts)
    _, blocks = elevation_blocks(parts, only)
    if highlight is not None:  # what is being fitted on top, so it shows whole
        lit = set(highlight)
        blocks = [b for b in blocks if b.part not in lit] + [
            b for b in blocks if b.part in lit
        ]
    if not everything:
        return (
            '<svg xmlns="http://www.w3.org/2000/svg" width="10mm" height="10mm" '
            'viewBox="0 0 10 10"/>\n'
        )
    # the page is the whole movement's, whatever is drawn on it
    x_lo = min(b.x0 for b in everything)
    x_hi = max(b.x1 for b in everything)
    z_lo = min(b.z0 for b in everything)
    z_hi = max(b.z1 for b in everything)
    body: list[str] = []
    # the axes
    for c in columns:
        body.append(
            f'<line x1="{fmt(c.x)}" y1="{fmt(-(z_hi + 3))}" x2="{fmt(c.x)}" '
            f'y2="{fmt(-(z_lo - 3))}" stroke="#b5562d" stroke-width="0.15" '
            'stroke-dasharray="4 1 0.6 1"/>'
        )
    current = ""
    for b in blocks:
        if b.part != current:
            if current:
                body.append("</g>")
            fill, edge = _STYLE[b.kind]
            if highlight is not None:
                fill, edge = ("#d9452b", "#7a1d0f") if b.part in highlight else (
                    "#e4e4e4", "#9a9a9a")  # fmt: skip
            body.append(
                f'<g data-part="{esc(b.part)}" data-kind="{b.kind}" fill="{fill}" '
                f'stroke="{edge}" stroke-width="0.2">'
            )
            current = b.part
        body.append(
            f'<rect x="{fmt(b.x0)}" y="{fmt(-b.z1)}" width="{fmt(b.x1 - b.x0)}" '
            f'height="{fmt(b.z1 - b.z0)}"/>'
        )
    if blocks:
        body.append("</g>")
    left_w = right_w = 2.0
    if labels:
        mid = (x_lo + x_hi) / 2
        found = _labels(blocks, mid, lengths)
        for side in (True, False):
            mine = sorted((a for a in found if a[3] == side), key=lambda a: a[2])
            width = max((0.6 * _TEXT * len(t) for t, *_ in mine), default=0.0) + 8.0
            rim = x_lo - width if side else x_hi + width
            ys = _spread([a[2] for a in mine])
            for (text, ax, az, _), ly in zip(mine, ys):
                tx = x_lo - 6.0 if side else x_hi + 6.0
                body.append(
                    f'<polyline points="{fmt(ax)},{fmt(-az)} {fmt(tx)},{fmt(-ly)}" '
                    'fill="none" stroke="#555" stroke-width="0.12"/>'
                    f'<circle cx="{fmt(ax)}" cy="{fmt(-az)}" r="0.35" fill="#555"/>'
                )
                anchor = "end" if side else "start"
                nudge = -0.8 if side else 0.8
                body.append(
                    f'<text x="{fmt(tx + nudge)}" y="{fmt(-ly + _TEXT * 0.35)}" '
                    f'font-size="{fmt(_TEXT)}" text-anchor="{anchor}">{esc(text)}</text>'
                )
            if side:
                left_w = x_lo - rim
            else:
                right_w = rim - x_hi
            if mine:
                z_lo = min(z_lo, ys[0] - _TEXT)
                z_hi = max(z_hi, ys[-1] + _TEXT)
        # the height scale, left of the labels
        sx = x_lo - left_w - 4.0
        tick, every = _SCALE[lengths.unit]
        i0, i1 = math.floor(z_lo / tick), math.ceil(z_hi / tick)
        first, last = i0 * tick, i1 * tick
        body.append(
            f'<line x1="{fmt(sx)}" y1="{fmt(-first)}" x2="{fmt(sx)}" y2="{fmt(-last)}" '
            'stroke="#1f5f8b" stroke-width="0.15"/>'
        )
        for i in range(i0, i1 + 1):
            k = i * tick
            long = i % every == 0
            body.append(
                f'<line x1="{fmt(sx)}" y1="{fmt(-k)}" x2="{fmt(sx + (2.0 if long else 1.0))}" '
                f'y2="{fmt(-k)}" stroke="#1f5f8b" stroke-width="0.15"/>'
            )
            if long:
                body.append(
                    f'<text x="{fmt(sx - 1.0)}" y="{fmt(-k + 0.7)}" font-size="2" '
                    f'text-anchor="end" fill="#1f5f8b">{lengths.short(k)}</text>'
                )
        body.append(
            f'<text x="{fmt(sx)}" y="{fmt(-last - 2.5)}" font-size="2" '
            f'text-anchor="middle" fill="#1f5f8b">z ({lengths.unit})</text>'
        )
        left_w += 12.0
        z_lo, z_hi = min(z_lo, first), max(z_hi, last + 4.0)
    x0 = x_lo - left_w - 2.0
    x1 = x_hi + right_w + 2.0
    y0 = -(z_hi + 4.0)
    y1 = -(z_lo - 4.0)
    w, h = x1 - x0, y1 - y0
    head = [
        '<svg xmlns="http://www.w3.org/2000/svg" '
        f'width="{fmt(w)}mm" height="{fmt(h)}mm" '
        f'viewBox="{fmt(x0)} {fmt(y0)} {fmt(w)} {fmt(h)}" '
        'font-family="sans-serif">',
    ]
    if title:
        head.append(f"<title>{esc(title)}</title>")
    head.append(
        f'<rect x="{fmt(x0)}" y="{fmt(y0)}" width="{fmt(w)}" height="{fmt(h)}" '
        'fill="#fff"/>'
    )
    return "\n".join(head + body + ["</svg>"]) + "\n"


def elevation_writer(
    design: Design,
    parts: Sequence[Part],
    findings: Sequence[Finding],
    staging_dir: Path,
) -> list[Path]:
    """Sheet writer for ``wheelgen build``: ``drawings/elevation.svg``, labelled in
    the design's units."""
    u = lengths_of(design)
    svg = elevation_svg(
        parts,
        title=f"{design.title}: sectional elevation, developed, 1:1, "
        + ("labelled in inches" if u.inches else "mm"),
        lengths=u,
    )
    path = Path(staging_dir) / ELEVATION_FILE
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(svg, encoding="utf-8", newline="\n")
    return [path]
