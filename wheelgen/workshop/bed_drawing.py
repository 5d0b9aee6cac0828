"""A plan of one build plate for the report: the plate and each part's outline on it.

Each part is drawn as the outline of its mesh seen from above (the convex hull of its
vertices, as it stands on the plate), named inside its own outline: the outlines keep
the print sheet's spacing, so the names never meet. Sizes in mm; y up on the page.
"""

from __future__ import annotations

import numpy as np

from ..layout.collisions import convex_hull_order
from ._svg import colour, esc, fmt

__all__ = ["bed_svg", "label_font"]

_CHAR_WIDTH = 0.6  # of the font size: the advance of an average sans-serif letter
_MAX_FONT = 6.0
_MIN_FONT = 1.5


def label_font(text: str, width: float, height: float) -> tuple[float, bool]:
    """Font size (mm) that fits ``text`` inside a ``width`` x ``height`` box, and
    whether it runs upwards (turned a quarter turn) to fit a tall, narrow box."""
    along, across = (height, width) if height > 1.5 * width else (width, height)
    size = min(_MAX_FONT, 0.9 * along / (_CHAR_WIDTH * max(1, len(text))), 0.8 * across)
    return max(_MIN_FONT, size), height > 1.5 * width


def bed_svg(
    number: int,
    bed: tuple[float, float],
    objects: list[tuple[str, np.ndarray, np.ndarray]],
) -> str:
    """The plan of build plate ``number`` (``bed`` x, y in mm) with ``objects``."""
    bx, by = bed
    out = [
        f'<svg xmlns="http://www.w3.org/2000/svg" class="drawing bed" '
        f'viewBox="-2 -{fmt(by + 2)} {fmt(bx + 4)} {fmt(by + 4)}" '
        f'font-family="sans-serif"><title>build plate {number}</title>',
        f'<rect x="0" y="{fmt(-by)}" width="{fmt(bx)}" height="{fmt(by)}" '
        'fill="#f4f4f0" stroke="#444" stroke-width="0.6"/>',
    ]
    for k, (name, v, _) in enumerate(objects):
        xy = v[:, :2]
        hull = xy[convex_hull_order(xy, collinear=False)]
        pts = " ".join(f"{fmt(x, 2)},{fmt(-y, 2)}" for x, y in hull)
        out.append(
            f'<polygon points="{pts}" fill="{colour(k)}" fill-opacity="0.25" '
            f'stroke="{colour(k)}" stroke-width="0.4"><title>{esc(name)}</title>'
            "</polygon>"
        )
        lo, hi = xy.min(axis=0), xy.max(axis=0)
        cx, cy = (lo + hi) / 2
        size, upright = label_font(name, *(hi - lo))
        turn = f' transform="rotate(-90 {fmt(cx)} {fmt(-cy)})"' if upright else ""
        out.append(
            f'<text x="{fmt(cx)}" y="{fmt(-cy + size * 0.35)}" font-size="{fmt(size, 2)}" '
            f'text-anchor="middle"{turn}>{esc(name)}</text>'
        )
    out.append("</svg>")
    return "".join(out)
