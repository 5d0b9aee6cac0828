"""The train diagram: which arbor drives which, with tooth counts and periods.

Arbors are boxes in columns by their distance (in meshes and couplings) from the
drive; each box gives the arbor's wheels, period and sense from the exact solution.
An arrow from one box to the next is a mesh (labelled ``driver z -> driven z``), a
pin-and-slot coupling (dashed) or a carrier that carries an arbor (dotted). A fixed
arbor sits one column before the arbor it meshes with, as the reaction member. The
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

__all__ = ["TrainLink", "train_links", "train_columns", "train_diagram_svg"]

_FONT = 12.0  # px
_CHAR = 6.6  # px: mean width of one character of the sans-serif font at _FONT
_LINE = 15.0  # px between text lines in a box
_GAP_X = 190.0  # px between columns, room for the arrow labels
_GAP_Y = 26.0


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


def train_diagram_svg(design: Design, solution: TrainSolution) -> str:
    """The diagram as one ``<svg>`` element (text)."""
    cols = train_columns(design)
    boxes = {a.name: _box_lines(design, solution, a.name) for a in design.arbors}
    width = {n: max(len(t) for t in lines) * _CHAR + 16 for n, lines in boxes.items()}
    height = {n: len(lines) * _LINE + 10 for n, lines in boxes.items()}
    ncol = max(cols.values()) + 1
    col_w = [
        max((width[n] for n in cols if cols[n] == c), default=0.0) for c in range(ncol)
    ]
    col_x = [20.0]
    for c in range(1, ncol):
        col_x.append(col_x[-1] + col_w[c - 1] + _GAP_X)
    pos: dict[str, tuple[float, float]] = {}
    col_h = []
    for c in range(ncol):
        y = 20.0
        for a in design.arbors:
            if cols[a.name] == c:
                pos[a.name] = (col_x[c], y)
                y += height[a.name] + _GAP_Y
        col_h.append(y)
    total_w = col_x[-1] + col_w[-1] + 20
    total_h = max(col_h) + 10
    out = [
        f'<svg xmlns="http://www.w3.org/2000/svg" class="drawing train" '
        f'viewBox="0 0 {fmt(total_w)} {fmt(total_h)}" width="{fmt(total_w)}" '
        f'font-family="sans-serif" font-size="{fmt(_FONT)}">',
        "<title>Train diagram</title>",
        '<defs><marker id="wg-train-arrow" viewBox="0 0 10 10" refX="10" refY="5" '
        'markerWidth="7" markerHeight="7" orient="auto-start-reverse">'
        '<path d="M0,0L10,5L0,10z" fill="#333"/></marker></defs>',
    ]
    labels = []
    for link in train_links(design):
        sx, sy = pos[link.source]
        tx, ty = pos[link.target]
        y0 = sy + height[link.source] / 2
        y1 = ty + height[link.target] / 2
        if cols[link.source] < cols[link.target]:
            x0, x1 = sx + width[link.source], tx
        elif cols[link.source] > cols[link.target]:
            x0, x1 = sx, tx + width[link.target]
        else:  # same column: loop out on the right
            x0, x1 = sx + width[link.source], tx + width[link.target]
        bend = max(abs(x1 - x0) / 2, 40.0)
        c0 = x0 + (bend if x1 >= x0 or x0 == x1 else -bend)
        c1 = x1 - (bend if x1 > x0 else -bend)
        if cols[link.source] == cols[link.target]:
            c0, c1 = x0 + 60, x1 + 60
        dash = {
            "mesh": "",
            "pinslot": ' stroke-dasharray="6 4"',
            "carrier": ' stroke-dasharray="2 3"',
        }
        out.append(
            f'<path d="M{fmt(x0)},{fmt(y0)} C{fmt(c0)},{fmt(y0)} {fmt(c1)},{fmt(y1)} '
            f'{fmt(x1)},{fmt(y1)}" fill="none" stroke="#333" stroke-width="1.3"'
            f'{dash[link.kind]} marker-end="url(#wg-train-arrow)"/>'
        )
        # label at the curve's middle (t = 1/2 of the cubic)
        mx = (x0 + 3 * c0 + 3 * c1 + x1) / 8
        my = (y0 + y1) / 2
        labels.append(
            f'<text x="{fmt(mx)}" y="{fmt(my - 4)}" text-anchor="middle" '
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
