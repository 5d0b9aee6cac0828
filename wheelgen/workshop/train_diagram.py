"""The train diagram: which arbor drives which, with tooth counts and periods.

Arbors are boxes in rows down the page by their distance (in meshes and couplings)
from the drive; each box gives the arbor's wheels, period and sense from the exact solution.
An arrow from one box to the next is a mesh (labelled ``driver z -> driven z``), a
pin-and-slot coupling (dashed) or a carrier that carries an arbor (dotted). A fixed
arbor sits one row before the arbor it meshes with, as the reaction member. The
drawing is in page pixels, not millimetres.
"""

from __future__ import annotations

from collections import deque
from dataclasses import dataclass

from ..design.model import Design
from ..design.periods import format_period
from ..kinematics.rates import TrainSolution
from ..kinematics.targets import arbor_period, arbor_sense
from ._svg import esc, fmt

__all__ = [
    "PAGE_WIDTH",
    "TrainLink",
    "label_width",
    "train_links",
    "train_columns",
    "train_diagram_svg",
]

_FONT = 12.0  # px
_CHAR = 6.6  # px: mean width of one character of the sans-serif font at _FONT
_LINE = 15.0  # px between text lines in a box
_GAP_X = 40.0  # px between two boxes side by side
_GAP_Y = 26.0  # px between the lines of a wrapped row
_ROW_GAP = 90.0  # px between two rows, room for the arrows and their labels
#: Where along an arrow its label may stand, tried in this order.
_LABEL_AT = (0.5, 0.35, 0.65, 0.22, 0.78, 0.12, 0.88)
Point = tuple[float, float]
Box = tuple[float, float, float, float]
#: Widest the diagram is drawn, px: the report's text column (62 em at 16 px, less its
#: padding), so that it prints and reads at its own size.
PAGE_WIDTH = 960.0
_DASH = {
    "mesh": "",
    "pinslot": ' stroke-dasharray="6 4"',
    "carrier": ' stroke-dasharray="2 3"',
}


def label_width(text: str) -> float:
    """Width (px) of an arrow's label: its characters at the label's font."""
    return len(text) * _CHAR * (_FONT - 1) / _FONT


@dataclass(frozen=True, slots=True)
class TrainLink:
    """One arrow: ``source`` arbor drives ``target`` arbor through ``kind``."""

    source: str
    target: str
    kind: str  # "mesh" | "pinslot" | "carrier"
    label: str


def _raw_links(design: Design) -> list[tuple[str, str, str, str, str]]:
    """(arbor a, arbor b, kind, label a->b, label b->a)."""
    out: list[tuple[str, str, str, str, str]] = []
    for m in design.meshes:
        a, b = design.wheel(m.pair[0]), design.wheel(m.pair[1])
        out.append(
            (
                a.arbor,
                b.arbor,
                "mesh",
                f"{a.name} {a.teeth} \u2192 {b.name} {b.teeth}",
                f"{b.name} {b.teeth} \u2192 {a.name} {a.teeth}",
            )
        )
    for p in design.pinslots:
        pin, slot = design.wheel(p.pin).arbor, design.wheel(p.slot).arbor
        text = f"pin-and-slot {p.name}"
        out.append((pin, slot, "pinslot", text, text))
    for arb in design.arbors:
        if arb.carrier is not None:
            c = design.wheel(arb.carrier)
            text = f"carried on {c.name}"
            out.append((c.arbor, arb.name, "carrier", text, text))
    return out


def train_columns(design: Design) -> dict[str, int]:
    """Column of every arbor: its distance from the drive (fixed arbors see above)."""
    raw = _raw_links(design)
    nbrs: dict[str, list[str]] = {a.name: [] for a in design.arbors}
    for a, b, *_ in raw:
        nbrs[a].append(b)
        nbrs[b].append(a)
    fixed = {a.name for a in design.arbors if a.fixed}
    depth = {design.drive.arbor: 0}
    todo = deque([design.drive.arbor])
    while todo:
        cur = todo.popleft()
        for n in nbrs[cur]:
            if n not in depth and n not in fixed:
                depth[n] = depth[cur] + 1
                todo.append(n)
    for f in sorted(fixed):
        near = [depth[n] for n in nbrs[f] if n in depth]
        depth[f] = max(min(near) - 1, 0) if near else 0
    last = max(depth.values(), default=0) + 1
    for arbor in design.arbors:
        depth.setdefault(arbor.name, last)  # not connected to the drive
    return depth


def train_links(design: Design) -> tuple[TrainLink, ...]:
    """Every arrow of the diagram, pointing away from the drive."""
    cols = train_columns(design)
    fixed = {a.name for a in design.arbors if a.fixed}
    out = []
    for a, b, kind, ab, ba in _raw_links(design):
        forward = cols[a] <= cols[b]
        if a in fixed:
            forward = True
        elif b in fixed:
            forward = False
        out.append(TrainLink(a, b, kind, ab) if forward else TrainLink(b, a, kind, ba))
    return tuple(out)


def _box_lines(design: Design, solution: TrainSolution, arbor: str) -> list[str]:
    a = design.arbor(arbor)
    rate = solution.rate(arbor)
    lines = [arbor]
    wheels = ", ".join(f"{w.name} {w.teeth}" for w in design.wheels_on(arbor))
    if wheels:
        lines.append(wheels)
    if a.fixed:
        lines.append("fixed")
    elif rate is None:
        lines.append("undriven")
    else:
        period = arbor_period(design, rate)
        per = "still" if period is None else f"1 turn in {format_period(period)}"
        lines.append(f"{per}, {arbor_sense(design, rate)}")
        lines.append(f"{rate} turn{'' if abs(rate) == 1 else 's'} per drive turn")
    return lines


def _cubic(p0: Point, c0: Point, c1: Point, p1: Point, t: float) -> Point:
    u = 1 - t
    return (
        u**3 * p0[0] + 3 * u * u * t * c0[0] + 3 * u * t * t * c1[0] + t**3 * p1[0],
        u**3 * p0[1] + 3 * u * u * t * c0[1] + 3 * u * t * t * c1[1] + t**3 * p1[1],
    )


def _meets(a: Box, b: Box) -> bool:
    return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]


def train_diagram_svg(design: Design, solution: TrainSolution) -> str:
    """The diagram as one ``<svg>`` element (text), at most :data:`PAGE_WIDTH` wide.

    The train runs down the page: a row for each step from the drive, its arbors side
    by side (a row wider than the page wraps onto a second line, as text does). An
    arrow runs from one box's edge to the next's, its label placed along it where it
    meets no box and no other label.
    """
    cols = train_columns(design)
    links = train_links(design)
    boxes = {a.name: _box_lines(design, solution, a.name) for a in design.arbors}
    width = {n: max(len(t) for t in lines) * _CHAR + 16 for n, lines in boxes.items()}
    height = {n: len(lines) * _LINE + 10 for n, lines in boxes.items()}
    nrow = max(cols.values()) + 1
    pos: dict[str, Point] = {}
    y = 20.0
    for r in range(nrow):
        x, line_h = 20.0, 0.0
        for a in design.arbors:
            if cols[a.name] != r:
                continue
            if x > 20.0 and x + width[a.name] + 20 > PAGE_WIDTH:
                x, y = 20.0, y + line_h + _GAP_Y  # wrap the row
                line_h = 0.0
            pos[a.name] = (x, y)
            x += width[a.name] + _GAP_X
            line_h = max(line_h, height[a.name])
        y += line_h + _ROW_GAP
    total_w = max(pos[n][0] + width[n] for n in pos) + 20
    total_h = y - _ROW_GAP + 20
    out = [
        f'<svg xmlns="http://www.w3.org/2000/svg" class="drawing train" '
        f'viewBox="0 0 {fmt(total_w)} {fmt(total_h)}" width="{fmt(total_w)}" '
        f'font-family="sans-serif" font-size="{fmt(_FONT)}">',
        "<title>Train diagram</title>",
        '<defs><marker id="wg-train-arrow" viewBox="0 0 10 10" refX="10" refY="5" '
        'markerWidth="7" markerHeight="7" orient="auto-start-reverse">'
        '<path d="M0,0L10,5L0,10z" fill="#333"/></marker></defs>',
    ]
    taken: list[Box] = [
        (x, y, x + width[n], y + height[n]) for n, (x, y) in pos.items()
    ]
    labels = []
    for link in links:
        sx, sy = pos[link.source]
        tx, ty = pos[link.target]
        if abs(sy - ty) < 1e-9:  # side by side: from one side to the other
            left = sx < tx
            p0 = (sx + width[link.source] if left else sx, sy + height[link.source] / 2)
            p1 = (tx if left else tx + width[link.target], ty + height[link.target] / 2)
            c0, c1 = p0, p1
        else:  # down (or up) the page: from one box's bottom to the other's top
            down = sy < ty
            p0 = (
                sx + width[link.source] / 2,
                sy + (height[link.source] if down else 0.0),
            )
            p1 = (
                tx + width[link.target] / 2,
                ty + (0.0 if down else height[link.target]),
            )
            step = (p1[1] - p0[1]) / 2
            c0, c1 = (p0[0], p0[1] + step), (p1[0], p1[1] - step)
        out.append(
            f'<path d="M{fmt(p0[0])},{fmt(p0[1])} C{fmt(c0[0])},{fmt(c0[1])} '
            f'{fmt(c1[0])},{fmt(c1[1])} {fmt(p1[0])},{fmt(p1[1])}" fill="none" '
            f'stroke="#333" stroke-width="1.3"{_DASH[link.kind]} '
            'marker-end="url(#wg-train-arrow)"/>'
        )
        w = label_width(link.label)
        best: tuple[int, Point] | None = None
        for t in _LABEL_AT:
            mx, my = _cubic(p0, c0, c1, p1, t)
            box = (mx - w / 2, my - _FONT, mx + w / 2, my + 3)
            hits = sum(_meets(box, b) for b in taken)
            if best is None or hits < best[0]:
                best = (hits, (mx, my))
            if hits == 0:
                break
        assert best is not None
        mx, my = best[1]
        taken.append((mx - w / 2, my - _FONT, mx + w / 2, my + 3))
        labels.append(
            f'<text x="{fmt(mx)}" y="{fmt(my)}" text-anchor="middle" '
            f'font-size="{fmt(_FONT - 1)}" stroke="#fff" stroke-width="3" '
            f'paint-order="stroke" fill="#222">{esc(link.label)}</text>'
        )
    for a in design.arbors:
        x, y = pos[a.name]
        lines = boxes[a.name]
        drive = a.name == design.drive.arbor
        fill = "#e8eef5" if drive else ("#eeeeee" if a.fixed else "#ffffff")
        out.append(
            f'<rect x="{fmt(x)}" y="{fmt(y)}" width="{fmt(width[a.name])}" '
            f'height="{fmt(height[a.name])}" rx="5" fill="{fill}" stroke="#333" '
            f'stroke-width="{2 if drive else 1}"/>'
        )
        for i, text in enumerate(lines):
            weight = ' font-weight="bold"' if i == 0 else ""
            out.append(
                f'<text x="{fmt(x + 8)}" y="{fmt(y + 5 + _LINE * (i + 0.8))}"'
                f"{weight}>{esc(text)}</text>"
            )
    out.extend(labels)
    out.append("</svg>")
    return "\n".join(out)
