"""The workshop drawing of an arbor, tube or collar: a side view at 1:1, dimensioned.

The part lies along the page, its back end (the datum) on the left. Every change of
diameter is dimensioned from that end (ordinate figures below the part, jogged apart
where they would touch); every length carries a numbered balloon above the part, and a
table under it gives for each number the length's place, its diameter (and the flats
of a square, hex or flat seat), its ISO 286 zone and limits and what it is for. The
bore of a tube or collar is drawn hidden (dashed) with its own limits; a cross-pin
hole as a circle. A title block names the stock, the datum, the general tolerance of
unfitted sizes, the fixings and the end shake, and a 50 mm bar checks the print.

The drawing is plain geometry (:class:`Sheet`, millimetres, y up): the SVG is written
here (:func:`sheet_svg`, 1 user unit = 1 mm, the page sized in mm), the DXF by
:func:`wheelgen.export.dxf.write_sheet_dxf` from the same lines and texts.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..design.units import MM, Lengths
from ..layout.part_kinds import ArborPart, CollarPart, SleevePart, TurnedSection
from ..layout.wheel_profile import cross_pin_diameter
from ._svg import esc, fmt

__all__ = [
    "SCALE_BAR_MM",
    "SHEET_LAYERS",
    "Sheet",
    "SheetText",
    "sheet_svg",
    "turned_sheet",
]

#: Length (mm) of the check bar under every 1:1 drawing.
SCALE_BAR_MM = 50.0
#: Layers of a drawing sheet and their DXF colour numbers.
SHEET_LAYERS = {
    "OUTLINE": 7,
    "HIDDEN": 8,
    "CENTRE": 1,
    "DIMENSION": 3,
    "TEXT": 7,
}
_TEXT = 2.5  # mm: the height of the drawing's figures (readable at 1:1)
_SMALL = 2.0
_ROW = 3.6  # mm between table rows
_PAD = 8.0


@dataclass(frozen=True, slots=True)
class SheetText:
    """A line of text at (x, y) mm, ``height`` mm, ``anchor`` start/middle/end,
    turned ``rotation_deg`` counter-clockwise."""

    x: float
    y: float
    height: float
    text: str
    anchor: str = "start"
    rotation_deg: float = 0.0
    layer: str = "TEXT"


@dataclass(frozen=True, slots=True)
class Sheet:
    """A drawing as plain geometry in mm (y up): ``lines`` (x0, y0, x1, y1, layer),
    ``circles`` (x, y, r, layer), ``texts``, and the page ``(x0, y0, x1, y1)``."""

    name: str
    title: str
    page: tuple[float, float, float, float]
    lines: tuple[tuple[float, float, float, float, str], ...]
    circles: tuple[tuple[float, float, float, str], ...]
    texts: tuple[SheetText, ...]


def _limits(s: TurnedSection, u: Lengths = MM) -> str:
    if not s.zone:
        return "as printed" if s.role not in ("plain", "shoulder", "collar") else ""
    return f"{s.zone}  {u.num(s.low)} / {u.num(s.high)}"


def _collar_sections(part: CollarPart) -> tuple[TurnedSection, ...]:
    return (
        TurnedSection(0.0, part.length, part.outside, "collar", f"on {part.member}"),
    )


def _role_words(s: TurnedSection) -> str:
    words = {
        "pivot": "runs in",
        "held": "held in",
        "seat": "seat of",
        "item": "seat of",
        "under": "turns in",
        "collar seat": "collar",
        "shoulder": "",
        "collar": "",
        "plain": "",
    }
    lead = words.get(s.role, s.role)
    if s.role == "under":
        return f"tube {s.what} turns on it"
    if s.role in ("shoulder", "collar"):
        return s.what
    if s.role == "collar seat":
        return f"{s.what} fixed here"
    return f"{lead} {s.what}".strip()


def turned_sheet(part: ArborPart | SleevePart | CollarPart, u: Lengths = MM) -> Sheet:
    """The 1:1 drawing of a turned part (see the module docstring). Its figures are in
    ``u``'s unit; the drawing itself is laid out in millimetres whatever the unit, so
    a design in inches gets the same lines at the same places."""

    def num(x: float, places: int = 2) -> str:
        return u.short(x) if u.inches else fmt(x, places)

    if isinstance(part, CollarPart):
        sections = _collar_sections(part)
        inside, bore = part.inside, (part.bore_zone, part.bore_low, part.bore_high)
        stock = f"rod or tube at least {u.text(part.outside)}"
        notes: tuple[str, ...] = (f"fixed on {part.member} with {part.fixing}",)
        kind = "collar"
    elif isinstance(part, SleevePart):
        sections = part.sections or (
            TurnedSection(0.0, part.length, part.outside, "plain"),
        )
        inside, bore = part.inside, (part.bore_zone, part.bore_low, part.bore_high)
        stock = (
            f"turn from {u.stock(part.stock)} bar, bore to size"
            if part.stock > 0
            else f"tube {u.short(part.outside)} x {u.text(part.inside)}"
        )
        notes = part.notes
        kind = "tube"
    else:
        sections = part.sections or (
            TurnedSection(0.0, part.length, part.diameter, "plain"),
        )
        inside, bore = 0.0, ("", 0.0, 0.0)
        stock = (
            f"turn from {u.stock(part.stock)} bar"
            if part.stock > 0
            else f"rod {u.stock(part.diameter)}"
        )
        notes = part.notes
        kind = "arbor"
    if (
        not isinstance(part, CollarPart)
        and part.stock == 0.0
        and not any(s.zone for s in sections)
    ):
        stock = "printed (or cut from rod of the listed diameter)"
    length = part.length
    r_max = max(s.diameter for s in sections) / 2
    lines: list[tuple[float, float, float, float, str]] = []
    circles: list[tuple[float, float, float, str]] = []
    texts: list[SheetText] = []

    # the outline: each length at its radius, a step at each change of diameter
    prev_r = 0.0
    for s in sections:
        r = s.diameter / 2
        lines.append((s.z0, r, s.z1, r, "OUTLINE"))
        lines.append((s.z0, -r, s.z1, -r, "OUTLINE"))
        lines.append((s.z0, -max(r, prev_r), s.z0, max(r, prev_r), "OUTLINE"))
        if s.across:
            # the flats: their edge seen from the side
            a = s.across / 2
            lines.append((s.z0, a, s.z1, a, "OUTLINE"))
            lines.append((s.z0, -a, s.z1, -a, "OUTLINE"))
        if s.shape == "pinned":
            circles.append(
                ((s.z0 + s.z1) / 2, 0.0, cross_pin_diameter(s.diameter) / 2, "OUTLINE")
            )
        prev_r = r
    lines.append((length, -prev_r, length, prev_r, "OUTLINE"))
    if inside > 0:
        lines.append((0.0, inside / 2, length, inside / 2, "HIDDEN"))
        lines.append((0.0, -inside / 2, length, -inside / 2, "HIDDEN"))
    lines.append((-3.0, 0.0, length + 3.0, 0.0, "CENTRE"))

    # ordinate figures from the back end, jogged apart where they would touch
    marks = sorted({0.0, length} | {s.z0 for s in sections} | {s.z1 for s in sections})
    y_tick = -r_max - 1.0
    y_text = y_tick - 5.0
    placed = -math.inf
    for x in marks:
        tx = max(x, placed + _TEXT * 1.4)
        placed = tx
        lines.append((x, y_tick, x, y_tick - 2.0, "DIMENSION"))
        lines.append((x, y_tick - 2.0, tx, y_tick - 4.0, "DIMENSION"))
        texts.append(
            SheetText(tx + _TEXT * 0.35, y_tick - 4.5, _TEXT, num(x), "end", 90.0,
                      "DIMENSION")
        )  # fmt: skip
    lowest = y_tick - 4.5 - max(len(fmt(x, 2)) for x in marks) * _TEXT * 0.6
    # the overall length
    y_len = lowest - 3.0
    label = f"{num(length)} overall"
    # a short part: the arrows point in from outside, the figure stands beside them
    short = length < 0.6 * _TEXT * len(label) + 4.0
    inward = -1.0 if short else 1.0
    lines.append((0.0, y_len, length, y_len, "DIMENSION"))
    if short:
        lines.append((-4.0, y_len, length + 4.0, y_len, "DIMENSION"))
    for x, sgn in ((0.0, inward), (length, -inward)):
        lines.append((x, y_len, x + sgn * 1.5, y_len + 0.6, "DIMENSION"))
        lines.append((x, y_len, x + sgn * 1.5, y_len - 0.6, "DIMENSION"))
        lines.append((x, y_tick, x, y_len - 1.0, "DIMENSION"))
    if short:
        texts.append(
            SheetText(length + 5.0, y_len - _TEXT / 2, _TEXT, label, "start", 0.0,
                      "DIMENSION")
        )  # fmt: skip
    else:
        texts.append(
            SheetText(length / 2, y_len - 3.2, _TEXT, label, "middle", 0.0,
                      "DIMENSION")
        )  # fmt: skip
    y_text = y_len - 6.0

    # a balloon for each length, jogged apart above the part
    y_b = r_max + 6.0
    placed = -math.inf
    for i, s in enumerate(sections, start=1):
        mid = (s.z0 + s.z1) / 2
        bx = max(mid, placed + 5.2)
        placed = bx
        lines.append((mid, s.diameter / 2, bx, y_b - 2.0, "DIMENSION"))
        circles.append((bx, y_b, 2.0, "DIMENSION"))
        texts.append(
            SheetText(bx, y_b - 0.8, _SMALL, str(i), "middle", 0.0, "DIMENSION")
        )
    right = max(length, placed + 3.0)

    # the table of lengths
    head = ("no.", "from - to", "dia.", "form", "ISO 286 zone, limits", "for")
    cols = (0.0, 9.0, 34.0, 47.0, 76.0, 120.0)
    y = y_text - 4.0
    for c, h in zip(cols, head):
        texts.append(SheetText(c, y, _SMALL, h))
    lines.append((0.0, y - 1.2, 190.0, y - 1.2, "TEXT"))
    for i, s in enumerate(sections, start=1):
        y -= _ROW
        form = s.shape
        if s.across:
            form = f"{s.shape} {num(s.across, 3)} AF"
        elif s.shape == "pinned":
            form = f"cross hole {num(cross_pin_diameter(s.diameter))}"
        row = (
            str(i),
            f"{num(s.z0)} - {num(s.z1)}",
            num(s.diameter, 3),
            form,
            _limits(s, u),
            _role_words(s),
        )
        for c, cell in zip(cols, row):
            texts.append(SheetText(c, y, _SMALL, cell))
    if inside > 0:
        y -= _ROW
        zone, low, high = bore
        limits = f"{zone}  {u.num(low)} / {u.num(high)}" if zone else "as printed"
        for c, cell in zip(cols, ("bore", f"0 - {num(length)}", num(inside, 3),
                                   "round", limits, "through")):  # fmt: skip
            texts.append(SheetText(c, y, _SMALL, cell))

    # title block and notes
    title = f"{part.name} ({kind}): 1:1, {u.words}"
    y_top = y_b + 6.0
    info = [
        f"stock: {stock}",
        "datum: the back end (left); figures below are distances from it",
        "unfitted sizes: ISO 2768-m; break sharp edges",
        *notes,
    ]
    y_notes = y_top + (len(info) + 1) * (_SMALL + 1.5)
    texts.append(SheetText(0.0, y_notes + 1.5, 3.5, title))
    for k, line in enumerate(info):
        texts.append(SheetText(0.0, y_notes - 3.0 - k * (_SMALL + 1.5), _SMALL, line))

    # the check bar
    y_bar = y - 9.0
    lines.append((0.0, y_bar, SCALE_BAR_MM, y_bar, "DIMENSION"))
    for k in range(int(SCALE_BAR_MM // 10) + 1):
        lines.append((10.0 * k, y_bar, 10.0 * k, y_bar + 2.0, "DIMENSION"))
    texts.append(
        SheetText(SCALE_BAR_MM + 2.0, y_bar, _SMALL,
                  f"{fmt(SCALE_BAR_MM)} mm: print at 100 % and check with a rule")
    )  # fmt: skip
    width = max(right, 190.0, max(_text_right(t) for t in texts))
    page = (-_PAD, y_bar - _PAD, width + _PAD, y_notes + 6.0 + _PAD)
    return Sheet(part.name, title, page, tuple(lines), tuple(circles), tuple(texts))


def _text_right(t: SheetText) -> float:
    """Right end (mm) of a text, for the page's width (0.6 of its height per letter)."""
    if t.rotation_deg:
        return t.x + t.height
    width = 0.6 * t.height * len(t.text)
    return t.x + (width if t.anchor == "start" else width / 2)


_STYLE = {
    "OUTLINE": 'stroke="#000" stroke-width="0.3"',
    "HIDDEN": 'stroke="#000" stroke-width="0.18" stroke-dasharray="1.2 0.8"',
    "CENTRE": 'stroke="#b5562d" stroke-width="0.15" stroke-dasharray="4 1 0.6 1"',
    "DIMENSION": 'stroke="#1f5f8b" stroke-width="0.15"',
    "TEXT": 'stroke="#555" stroke-width="0.1"',
}


def sheet_svg(sheet: Sheet) -> str:
    """The drawing as a complete SVG document at 1:1 (page size in mm)."""
    x0, y0, x1, y1 = sheet.page
    w, h = x1 - x0, y1 - y0
    out = [
        '<?xml version="1.0" encoding="UTF-8"?>',
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{fmt(w)}mm" '
        f'height="{fmt(h)}mm" viewBox="{fmt(x0)} {fmt(-y1)} {fmt(w)} {fmt(h)}">',
        f"<title>{esc(sheet.title)}</title>",
        f'<rect x="{fmt(x0)}" y="{fmt(-y1)}" width="{fmt(w)}" height="{fmt(h)}" '
        'fill="#fff"/>',
    ]
    for layer, style in _STYLE.items():
        group = [
            f'<line x1="{fmt(a)}" y1="{fmt(-b)}" x2="{fmt(c)}" y2="{fmt(-d)}"/>'
            for a, b, c, d, lay in sheet.lines
            if lay == layer
        ]
        group += [
            f'<circle cx="{fmt(x)}" cy="{fmt(-y)}" r="{fmt(r)}" fill="none"/>'
            for x, y, r, lay in sheet.circles
            if lay == layer
        ]
        if group:
            out.append(f'<g id="{layer.lower()}" {style}>')
            out.extend(group)
            out.append("</g>")
    out.append('<g id="text" font-family="sans-serif" fill="#000">')
    for t in sheet.texts:
        colour = ' fill="#1f5f8b"' if t.layer == "DIMENSION" else ""
        turn = (
            f' transform="rotate({fmt(-t.rotation_deg)} {fmt(t.x)} {fmt(-t.y)})"'
            if t.rotation_deg
            else ""
        )
        out.append(
            f'<text x="{fmt(t.x)}" y="{fmt(-t.y)}" font-size="{fmt(t.height)}" '
            f'text-anchor="{t.anchor}"{colour}{turn}>{esc(t.text)}</text>'
        )
    out.append("</g>")
    out.append("</svg>")
    return "\n".join(out) + "\n"
