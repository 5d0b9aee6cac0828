"""1:1 SVG templates of flat parts, to print on paper and glue onto sheet stock.

The page is sized in millimetres and one user unit is one millimetre, so a printer set
to "actual size" draws the part full size; the 50 mm scale bar lets the user check the
printout with a rule before cutting. Everything is plain text written in a fixed order
(no kernel, no dates), so the same profile gives the same bytes.
"""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path

import numpy as np

from ..layout.wheel_profile import PlateProfile

__all__ = ["SCALE_BAR_MM", "write_svg"]

#: Length of the printed scale bar in mm.
SCALE_BAR_MM = 50.0
_MARGIN = 10.0
_MIN_HALF_WIDTH = 60.0  # mm: the labels need about 110 mm of width
_TEXT_BAND = 30.0  # room under the part for the labels and the scale bar (mm)


def _fmt(v: float) -> str:
    s = f"{v:.4f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def _path_d(loop: np.ndarray) -> str:
    # y is flipped once here: the drawing is seen from the front, +Y up on paper
    pts = " ".join(f"{_fmt(x)},{_fmt(-y)}" for x, y in loop)
    return f"M{pts}Z"


def _esc(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")


def _pin_marks(pins: Sequence[tuple[float, float, float]]) -> list[str]:
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
            f'font-family="sans-serif" font-size="2">pin {_fmt(dia)} mm</text>',
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
) -> Path:
    """Write a 1:1 template: outline, holes, centre cross, pitch circle, labels, scale.

    ``chord_tol`` (mm) bounds how far the drawn polyline strays from the exact outline.
    ``pins`` are pins standing on the face, ``(x, y, diameter)`` in mm, marked with a
    dashed circle and a cross so their place can be centre-punched from the template.
    """
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
    bar_x0 = -SCALE_BAR_MM / 2
    lines = [
        '<?xml version="1.0" encoding="UTF-8"?>',
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{_fmt(width)}mm" '
        f'height="{_fmt(height)}mm" viewBox="{_fmt(-half_w)} {_fmt(top)} {_fmt(width)} '
        f'{_fmt(height)}">',
        f"<title>{_esc(name)}: 1:1 template, millimetres</title>",
        '<g id="outline" fill="none" stroke="#000" stroke-width="0.1" fill-rule="evenodd">',
        f'<path d="{" ".join(d)}"/>',
        "</g>",
        '<g id="centre" stroke="#000" stroke-width="0.1">',
        f'<line x1="{_fmt(-cross)}" y1="0" x2="{_fmt(cross)}" y2="0"/>',
        f'<line x1="0" y1="{_fmt(-cross)}" x2="0" y2="{_fmt(cross)}"/>',
        "</g>",
        f'<circle id="pitch" cx="0" cy="0" r="{_fmt(profile.pitch_radius)}" fill="none" '
        'stroke="#06c" stroke-width="0.08" stroke-dasharray="2 1 0.4 1"/>',
        *_pin_marks(pins),
        '<g id="labels" font-family="sans-serif" font-size="3.5" fill="#000">',
        f'<text x="{_fmt(-half_w + 5)}" y="{_fmt(y_text)}">{_esc(name)}</text>',
        f'<text x="{_fmt(-half_w + 5)}" y="{_fmt(y_text + 5)}" font-size="3">'
        f"teeth {teeth}, module {_fmt(module)} mm, pitch circle dashed "
        f"(d = {_fmt(2 * profile.pitch_radius)} mm)</text>",
        "</g>",
        '<g id="scale-bar" stroke="#000" stroke-width="0.2" font-family="sans-serif" '
        'font-size="3">',
        f'<line x1="{_fmt(bar_x0)}" y1="{_fmt(bar_y)}" x2="{_fmt(bar_x0 + SCALE_BAR_MM)}" '
        f'y2="{_fmt(bar_y)}"/>',
    ]
    for k in range(int(SCALE_BAR_MM // 10) + 1):
        x = bar_x0 + 10.0 * k
        lines.append(
            f'<line x1="{_fmt(x)}" y1="{_fmt(bar_y - 2)}" x2="{_fmt(x)}" y2="{_fmt(bar_y)}"/>'
        )
    lines += [
        f'<text x="{_fmt(bar_x0)}" y="{_fmt(bar_y + 4)}" stroke="none">0</text>',
        f'<text x="{_fmt(bar_x0 + SCALE_BAR_MM)}" y="{_fmt(bar_y + 4)}" stroke="none" '
        f'text-anchor="middle">{_fmt(SCALE_BAR_MM)} mm</text>',
        f'<text x="{_fmt(bar_x0 + SCALE_BAR_MM / 2)}" y="{_fmt(bar_y + 8)}" stroke="none" '
        'text-anchor="middle">print at 100 % (actual size) and check this bar with a rule</text>',
        "</g>",
        "</svg>",
        "",
    ]
    Path(path).write_text("\n".join(lines), encoding="utf-8", newline="\n")
    return path
