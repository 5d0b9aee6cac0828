"""A 1:1 SVG drawing of a wheel outline with its named circles.

Width, height and viewBox are in millimetres, so the drawing prints at full size.
SVG's y axis points down; we flip y so the drawing looks as the wheel is seen from
the front.
"""

from __future__ import annotations

from ..svg_text import esc, fmt
from .outline import WheelOutline

__all__ = ["CIRCLE_STYLES", "outline_svg"]

#: Stroke colour and dash pattern of each named circle.
CIRCLE_STYLES: dict[str, tuple[str, str]] = {
    "pitch": ("#0050c8", "1.2 0.6 0.2 0.6"),
    "base": ("#008a3a", "0.6 0.6"),
    "tip": ("#7a7a7a", "0.3 0.5"),
    "root": ("#b4002d", "0.3 0.5"),
}


def outline_svg(
    outline: WheelOutline,
    title: str = "",
    chord_tol: float = 0.002,
    margin: float = 3.0,
    line_width: float = 0.05,
    circles: bool = True,
) -> str:
    """SVG text of ``outline`` at 1:1 (all lengths in mm).

    ``chord_tol`` is the largest gap (mm) between the drawn polyline and the outline;
    ``circles`` adds the pitch, base, tip and root circles named in ``outline.radii``.
    """
    if chord_tol <= 0 or margin < 0 or line_width <= 0:
        raise ValueError(
            "'chord_tol' and 'line_width' must be > 0 mm and 'margin' >= 0 mm, got "
            f"{chord_tol}, {line_width}, {margin}"
        )
    pts = outline.polyline(chord_tol)
    extent = max(float(abs(pts).max()), *outline.radii.values()) + margin
    size = 2 * extent

    def num(v: float) -> str:
        return fmt(v, 4)

    path = "M" + " L".join(f"{num(x)} {num(-y)}" for x, y in pts) + " Z"
    lines = [
        '<?xml version="1.0" encoding="UTF-8"?>',
        (
            '<svg xmlns="http://www.w3.org/2000/svg" version="1.1" '
            f'width="{num(size)}mm" height="{num(size)}mm" '
            f'viewBox="{num(-extent)} {num(-extent)} {num(size)} {num(size)}">'
        ),
    ]
    if title:
        lines.append(f"<title>{esc(title)}</title>")
    if circles:
        for name, (colour, dash) in CIRCLE_STYLES.items():
            if name in outline.radii:
                lines.append(
                    f'<circle id="{name}" cx="0" cy="0" r="{num(outline.radii[name])}" '
                    f'fill="none" stroke="{colour}" '
                    f'stroke-width="{num(line_width / 2)}" '
                    f'stroke-dasharray="{dash}"/>'
                )
        arm = min(2.0, 0.1 * extent)
        lines.append(
            f'<path id="centre" d="M{num(-arm)} 0 H{num(arm)} M0 {num(-arm)} '
            f'V{num(arm)}" stroke="#000" stroke-width="{num(line_width / 2)}"/>'
        )
    lines.append(
        f'<path id="outline" d="{path}" fill="none" stroke="#000" '
        f'stroke-width="{num(line_width)}" stroke-linejoin="round"/>'
    )
    lines.append("</svg>")
    return "\n".join(lines) + "\n"
