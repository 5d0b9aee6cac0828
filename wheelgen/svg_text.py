"""The text of SVG drawings: numbers, points, paths and escaping, written one way.

Every drawing of wheelgen (1:1 templates, dial faces, tooth outlines, the report's
drawings and the workshop sheets) is plain SVG text built in a fixed order, so the same
design gives the same bytes. The numbers in them are short decimals without trailing
zeros or ``-0``; drawings are seen from the front, so +Y of the design is up on the page
and y is flipped once, in :func:`pt`. Lengths in mm (one SVG user unit is 1 mm on a
1:1 drawing).
"""

from __future__ import annotations

from collections.abc import Iterable

import numpy as np

from .design.names import xml_text

__all__ = ["esc", "fmt", "path_d", "pt"]


def fmt(value: float, digits: int = 3) -> str:
    """A short decimal of at most ``digits`` decimals: no trailing zeros, no ``-0``."""
    s = f"{value:.{digits}f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "", "-") else s


def esc(text: object, quote: bool = True) -> str:
    """Text safe inside SVG or HTML element content (and quoted attributes when
    ``quote``)."""
    return xml_text(text, quote=quote)


def pt(x: float, y: float, digits: int = 3) -> str:
    """``"x,y"`` in page units with y flipped (design +Y is up on the page)."""
    return f"{fmt(x, digits)},{fmt(-y, digits)}"


def path_d(loops: Iterable[np.ndarray], digits: int = 3) -> str:
    """An SVG path ``d`` of closed polylines (``(n, 2)`` arrays in mm), y flipped."""
    out = []
    for loop in loops:
        pts = " ".join(pt(float(x), float(y), digits) for x, y in loop)
        out.append(f"M{pts}Z")
    return " ".join(out)
