"""1:1 SVG templates of flat parts, to print on paper and glue onto sheet stock.

The page is sized in millimetres and one user unit is one millimetre, so a printer set
to "actual size" draws the part full size; the scale bar (50 mm, or 2 in with quarter
inch ticks when the design's units are inches) lets the user check the printout with a
rule before cutting. The labels are written in the design's units. Everything is plain text written in a fixed order
(no kernel, no dates), so the same profile gives the same bytes.
"""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path

import numpy as np

from ..design.units import MM, Lengths
from ..layout.part_kinds import PlatePart
from ..layout.wheel_profile import PlateProfile
from ..svg_text import esc, fmt, path_d

__all__ = ["SCALE_BAR_MM", "write_plate_svg", "write_svg"]

#: Length of the printed scale bar in mm.
SCALE_BAR_MM = 50.0
_MARGIN = 10.0
_MIN_HALF_WIDTH = 60.0  # mm: the labels need about 110 mm of width
_TEXT_BAND = 30.0  # room under the part for the labels and the scale bar (mm)


def _fmt(v: float) -> str:
    """A 1:1 template's number: to 0.1 micrometre."""
    return fmt(v, 4)


def _path_d(loop: np.ndarray) -> str:
    # y is flipped once, as in every drawing: seen from the front, +Y up on paper
    return path_d([loop], 4)


def _esc(text: str) -> str:
    return esc(text, quote=False)


def _pin_marks(
    pins: Sequence[tuple[float, float, float]], lengths: Lengths = MM
) -> list[str]:
    if not pins:
        return []
    out = ['<g id="pins" fill="none" stroke="#000" stroke-width="0.08">']
    for x, y, dia in pins:
        r, c = dia / 2, dia / 2 + 1.0
        out += [
            f'<circle cx="{_fmt(x)}" cy="{_fmt(-y)}" r="{_fmt(r)}" stroke-dasharray="0.5 0.3"/>',
            f'<path d="M{_fmt(x - c)},{_fmt(-y)} H{_fmt(x + c)} M{_fmt(x)},{_fmt(-y - c)} '
            f'V{_fmt(-y + c)}"/>',
            f'<text x="{_fmt(x + c + 0.5)}" y="{_fmt(-y - 0.5)}" stroke="none" fill="#000" '
            f'font-family="sans-serif" font-size="2">pin {_size(dia, lengths)}</text>',
        ]
    out.append("</g>")
    return out


def write_svg(
    profile: PlateProfile,
    path: Path,
    name: str,
    teeth: int,
    module: float,
    chord_tol: float = 0.005,
    pins: Sequence[tuple[float, float, float]] = (),
    units: str = "mm",
    diametral_pitch: float | None = None,
) -> Path:
    """Write a 1:1 template: outline, holes, centre cross, pitch circle, labels, scale.

    ``chord_tol`` (mm) bounds how far the drawn polyline strays from the exact outline.
    ``pins`` are pins standing on the face, ``(x, y, diameter)`` in mm, marked with a
    dashed circle and a cross so their place can be centre-punched from the template.
    ``units`` (``"mm"`` or ``"in"``) is what the labels are written in; the drawing is
    1:1 either way. A wheel cut to a ``diametral_pitch`` is labelled with it.
    """
    lengths = Lengths(units)  # type: ignore[arg-type]  # Lengths checks it
    outer = profile.outline.polyline(chord_tol)
    r_max = float(np.hypot(outer[:, 0], outer[:, 1]).max())
    # wide enough for the label lines even under a small pinion
    half_w = max(r_max + _MARGIN, _MIN_HALF_WIDTH)
    width = 2 * half_w
    top = -(r_max + _MARGIN)
    height = 2 * (r_max + _MARGIN) + _TEXT_BAND
    d = [_path_d(outer)] + [_path_d(h.polyline(chord_tol)) for h in profile.holes]
    cross = min(0.15 * r_max + 2.0, r_max)
    y_text = r_max + _MARGIN + 6.0
    bar_y = y_text + 14.0
    bar_x0 = -lengths.bar.length / 2
    lines = [
        '<?xml version="1.0" encoding="UTF-8"?>',
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{_fmt(width)}mm" '
        f'height="{_fmt(height)}mm" viewBox="{_fmt(-half_w)} {_fmt(top)} {_fmt(width)} '
        f'{_fmt(height)}">',
        f"<title>{_esc(name)}: 1:1 template, {lengths.words}</title>",
        '<g id="outline" fill="none" stroke="#000" stroke-width="0.1" fill-rule="evenodd">',
        f'<path d="{" ".join(d)}"/>',
        "</g>",
        '<g id="centre" stroke="#000" stroke-width="0.1">',
        f'<line x1="{_fmt(-cross)}" y1="0" x2="{_fmt(cross)}" y2="0"/>',
        f'<line x1="0" y1="{_fmt(-cross)}" x2="0" y2="{_fmt(cross)}"/>',
        "</g>",
        f'<circle id="pitch" cx="0" cy="0" r="{_fmt(profile.pitch_radius)}" fill="none" '
        'stroke="#06c" stroke-width="0.08" stroke-dasharray="2 1 0.4 1"/>',
        *_pin_marks(pins, lengths),
        '<g id="labels" font-family="sans-serif" font-size="3.5" fill="#000">',
        f'<text x="{_fmt(-half_w + 5)}" y="{_fmt(y_text)}">{_esc(name)}</text>',
        f'<text x="{_fmt(-half_w + 5)}" y="{_fmt(y_text + 5)}" font-size="3">'
        f"teeth {teeth}, {_pitch(module, diametral_pitch)}, pitch circle dashed "
        f"(d = {_size(2 * profile.pitch_radius, lengths)})</text>",
        "</g>",
        *_scale_bar(bar_x0, bar_y, lengths),
        "</svg>",
        "",
    ]
    Path(path).write_text("\n".join(lines), encoding="utf-8", newline="\n")
    return path


def _size(mm: float, lengths: Lengths) -> str:
    """A size on a template: ``"3.2 mm"`` (to 0.0001 mm), ``"0.126 in"``."""
    return lengths.text(mm) if lengths.inches else f"{_fmt(mm)} mm"


def _sheet(mm: float, lengths: Lengths) -> str:
    """A sheet's thickness: ``"2 mm"``, ``"0.0938 in (3/32)"``."""
    return lengths.stock(mm) if lengths.inches else _size(mm, lengths)


def _pitch(module: float, diametral_pitch: float | None) -> str:
    if diametral_pitch is None:
        return f"module {_fmt(module)} mm"
    return f"{diametral_pitch:g} diametral pitch"


def _scale_bar(x0: float, y: float, lengths: Lengths = MM) -> list[str]:
    """The check bar (50 mm with 10 mm ticks, or 2 in with 1/4 in ticks), its left
    end at (x0, y) (page mm)."""
    bar = lengths.bar
    out = [
        '<g id="scale-bar" stroke="#000" stroke-width="0.2" font-family="sans-serif" '
        'font-size="3">',
        f'<line x1="{_fmt(x0)}" y1="{_fmt(y)}" x2="{_fmt(x0 + bar.length)}" '
        f'y2="{_fmt(y)}"/>',
    ]
    for k in range(round(bar.length / bar.tick) + 1):
        x = x0 + bar.tick * k
        out.append(
            f'<line x1="{_fmt(x)}" y1="{_fmt(y - 2)}" x2="{_fmt(x)}" y2="{_fmt(y)}"/>'
        )
    out += [
        f'<text x="{_fmt(x0)}" y="{_fmt(y + 4)}" stroke="none">0</text>',
        f'<text x="{_fmt(x0 + bar.length)}" y="{_fmt(y + 4)}" stroke="none" '
        f'text-anchor="middle">{bar.label}</text>',
        f'<text x="{_fmt(x0 + bar.length / 2)}" y="{_fmt(y + 8)}" stroke="none" '
        'text-anchor="middle">print at 100 % (actual size) and check this bar with a rule</text>',
        "</g>",
    ]
    return out


def _hole(mm: float, lengths: Lengths) -> str:
    """A hole's size beside it: ``"3.2"`` (mm, as before), ``"0.126 in"``."""
    return lengths.text(mm) if lengths.inches else _fmt(mm)


_ROLE_COLOUR = {"pillar": "#1f5f8b", "screw": "#1f5f8b", "mounting": "#7a4f9a"}


def write_plate_svg(
    part: PlatePart, path: Path, loop: np.ndarray, title: str = "", units: str = "mm"
) -> Path:
    """Write a plate's 1:1 template: outline, every hole with a centre cross and its
    size, and the check bar. ``loop`` is the outline as a closed polyline (mm);
    ``units`` what the sizes are written in."""
    lengths = Lengths(units)  # type: ignore[arg-type]  # Lengths checks it
    x0, y0 = loop.min(axis=0)
    x1, y1 = loop.max(axis=0)
    left, top = float(x0) - _MARGIN, -(float(y1) + _MARGIN)
    width = max(float(x1 - x0) + 2 * _MARGIN, 2 * _MIN_HALF_WIDTH)
    height = float(y1 - y0) + 2 * _MARGIN + _TEXT_BAND + 4.0
    heading = (
        title or f"{part.name}: 1:1 template, {lengths.words}, seen from the front"
    )
    lines = [
        '<?xml version="1.0" encoding="UTF-8"?>',
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{_fmt(width)}mm" '
        f'height="{_fmt(height)}mm" viewBox="{_fmt(left)} {_fmt(top)} {_fmt(width)} '
        f'{_fmt(height)}">',
        f"<title>{_esc(heading)}</title>",
        '<g id="outline" fill="none" stroke="#000" stroke-width="0.15">',
        f'<path d="{_path_d(loop)}"/>',
        "</g>",
        '<g id="holes" fill="none" stroke-width="0.1">',
    ]
    for h in part.holes:
        colour = _ROLE_COLOUR.get(h.role, "#000")
        r, c = h.diameter / 2, h.diameter / 2 + 1.5
        lines += [
            f'<circle cx="{_fmt(h.x)}" cy="{_fmt(-h.y)}" r="{_fmt(r)}" stroke="{colour}">'
            f"<title>{_esc(h.role)} hole for {_esc(h.label)}</title></circle>",
            f'<path d="M{_fmt(h.x - c)},{_fmt(-h.y)} H{_fmt(h.x + c)} '
            f'M{_fmt(h.x)},{_fmt(-h.y - c)} V{_fmt(-h.y + c)}" stroke="#000"/>',
        ]
    lines.append("</g>")
    lines.append('<g id="sizes" font-family="sans-serif" font-size="2" fill="#000">')
    placed: list[tuple[float, float]] = []
    for h in sorted(part.holes, key=lambda h: (-h.y, h.x)):
        tx, ty = h.x + h.diameter / 2 + 1.8, -h.y - 0.8
        # labels of holes close together are stacked downwards, one line each
        while any(abs(ty - py) < 2.4 and abs(tx - px) < 30.0 for px, py in placed):
            ty += 2.4
        placed.append((tx, ty))
        lines.append(
            f'<text x="{_fmt(tx)}" y="{_fmt(ty)}">'
            f"\u00d8{_hole(h.diameter, lengths)} {_esc(h.label)}</text>"
        )
    lines.append("</g>")
    y_text = float(-y0) + _MARGIN + 5.0
    lines += [
        f'<text x="{_fmt(left + 5)}" y="{_fmt(y_text)}" font-family="sans-serif" '
        f'font-size="3.5">{_esc(heading)}</text>',
        f'<text x="{_fmt(left + 5)}" y="{_fmt(y_text + 5)}" font-family="sans-serif" '
        f'font-size="3">{_sheet(part.thickness, lengths)} sheet. Centre-punch each'
        " cross, drill small first, then to size;</text>",
        f'<text x="{_fmt(left + 5)}" y="{_fmt(y_text + 9)}" font-family="sans-serif" '
        'font-size="3">positions and fits: the drilling chart.</text>',
        *_scale_bar(left + 30, y_text + 17.0, lengths),
        "</svg>",
        "",
    ]
    Path(path).write_text("\n".join(lines), encoding="utf-8", newline="\n")
    return path
