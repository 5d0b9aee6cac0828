"""1:1 SVG of the display's flat parts: a dial's printed face, hand and crank templates.

One user unit is one millimetre and the page is sized in millimetres, as for the wheel
templates (:mod:`wheelgen.export.svg_template`), with the same check bar (50 mm, or 2 in
when the design's units are inches). A dial's
SVG is its face: the graduations and numbers inside the cutting line, to print at actual
size, cut out and glue onto the disc (or to engrave from). A hand's or crank's SVG is a
template to glue onto sheet and saw round. Plain text in a fixed order: the same part
gives the same bytes.
"""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any

import numpy as np

from ..design.units import Lengths
from ..display.outlines import FlatProfile
from ..layout.part_kinds import DialPart
from .svg_template import _esc, _fmt, _path_d, _scale_bar

__all__ = ["write_face_svg"]

_MARGIN = 8.0
_MIN_HALF_WIDTH = 60.0  # mm: room for the words and the 50 mm bar
_TEXT_BAND = 30.0
_WHAT = {
    "dial": "dial face: print at 100 %, cut along the outer line, glue onto the disc",
    "hand": "hand: glue onto sheet {t} thick and cut round the outline",
    "crank": "crank arm: glue onto sheet {t} thick; the cross marks the handle",
}


def _engraving(part: DialPart) -> list[str]:
    out = ['<g id="graduations" stroke="#000" stroke-linecap="butt" fill="none">']
    for r, w in part.circles:
        out.append(f'<circle cx="0" cy="0" r="{_fmt(r)}" stroke-width="{_fmt(w)}"/>')
    for a, r0, r1, w in part.strokes:
        c, s = math.cos(math.radians(a)), math.sin(math.radians(a))
        out.append(
            f'<line x1="{_fmt(r0 * c)}" y1="{_fmt(-r0 * s)}" x2="{_fmt(r1 * c)}" '
            f'y2="{_fmt(-r1 * s)}" stroke-width="{_fmt(w)}"/>'
        )
    out.append("</g>")
    out.append(
        '<g id="numbers" font-family="sans-serif" fill="#000" text-anchor="middle" '
        'dominant-baseline="central">'
    )
    for x, y, h, turn, text in part.texts:
        # SVG turns clockwise with y down: our counter-clockwise turn is negated
        rot = f' transform="rotate({_fmt(-turn)} {_fmt(x)} {_fmt(-y)})"' if turn else ""
        out.append(
            f'<text x="{_fmt(x)}" y="{_fmt(-y)}" font-size="{_fmt(h)}"{rot}>'
            f"{_esc(text)}</text>"
        )
    out.append("</g>")
    return out


def _marks(points: tuple[tuple[float, float], ...], label: str) -> list[str]:
    if not points:
        return []
    out = [f'<g id="{label}" stroke="#06c" stroke-width="0.1" fill="none">']
    for x, y in points:
        out.append(
            f'<path d="M{_fmt(x - 1.5)},{_fmt(-y)} H{_fmt(x + 1.5)} '
            f'M{_fmt(x)},{_fmt(-y - 1.5)} V{_fmt(-y + 1.5)}"/>'
        )
    out.append("</g>")
    return out


def write_face_svg(
    part: Any,
    profile: FlatProfile,
    path: Path,
    chord_tol: float = 0.005,
    units: str = "mm",
) -> Path:
    """Write the 1:1 SVG of a dial, hand or crank (see the module docstring); its
    words in ``units``."""
    lengths = Lengths(units)  # type: ignore[arg-type]  # Lengths checks it
    outer = profile.outline.polyline(chord_tol)
    xs, ys = outer[:, 0], outer[:, 1]
    x0, x1 = float(xs.min()) - _MARGIN, float(xs.max()) + _MARGIN
    cx = (x0 + x1) / 2
    half = max((x1 - x0) / 2, _MIN_HALF_WIDTH)
    x0, x1 = cx - half, cx + half
    top = -(float(ys.max()) + _MARGIN)
    bottom = -float(ys.min()) + _MARGIN
    height = bottom - top + _TEXT_BAND
    loops = [outer] + [h.polyline(chord_tol) for h in profile.holes]
    d = " ".join(_path_d(loop) for loop in loops)
    cross = min(3.0, float(np.hypot(xs, ys).max()))
    thickness = getattr(part, "thickness", 0.0)
    t = lengths.text(thickness) if lengths.inches else f"{thickness:g} mm"
    what = _WHAT.get(part.kind, part.kind).format(t=t)
    lines = [
        '<?xml version="1.0" encoding="UTF-8"?>',
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{_fmt(x1 - x0)}mm" '
        f'height="{_fmt(height)}mm" viewBox="{_fmt(x0)} {_fmt(top)} {_fmt(x1 - x0)} '
        f'{_fmt(height)}">',
        f"<title>{_esc(part.name)}: 1:1, {lengths.words}</title>",
        '<g id="outline" fill="none" stroke="#000" stroke-width="0.1" fill-rule="evenodd">',
        f'<path d="{d}"/>',
        "</g>",
    ]
    if isinstance(part, DialPart):
        lines += _engraving(part)  # the feet are behind the disc: not on its face
    else:
        lines += _marks(profile.marks, "marks")
    lines += [
        '<g id="centre" stroke="#000" stroke-width="0.08">',
        f'<line x1="{_fmt(-cross)}" y1="0" x2="{_fmt(cross)}" y2="0"/>',
        f'<line x1="0" y1="{_fmt(-cross)}" x2="0" y2="{_fmt(cross)}"/>',
        "</g>",
    ]
    y_text = bottom + 6.0
    lines += [
        '<g id="labels" font-family="sans-serif" font-size="3.5" fill="#000">',
        f'<text x="{_fmt(x0 + 5)}" y="{_fmt(y_text)}">{_esc(part.name)}</text>',
        f'<text x="{_fmt(x0 + 5)}" y="{_fmt(y_text + 5)}" font-size="3">{_esc(what)}</text>',
        "</g>",
        *_scale_bar(cx - lengths.bar.length / 2, y_text + 14.0, lengths),
        "</svg>",
        "",
    ]
    Path(path).write_text("\n".join(lines), encoding="utf-8", newline="\n")
    return path
