"""Small helpers shared by the report's drawings: number format, escaping, palette.

Every drawing is plain SVG text built in a fixed order, so the same design gives the
same bytes. Drawings are seen from the front: +Y of the design is up on the page, so
y is flipped once, in :func:`pt`.
"""

from __future__ import annotations

from typing import Iterable

import numpy as np

from ..design.names import xml_text

__all__ = ["fmt", "esc", "pt", "path_d", "simplify", "PALETTE", "colour"]

# Our own plain palette: dark ink, muted colours that survive a grey-scale printout.
PALETTE: tuple[str, ...] = (
    "#1f5f8b",
    "#b5562d",
    "#3d7d3a",
    "#7a4f9a",
    "#a0802a",
    "#2f7f7f",
    "#9a3d5f",
    "#5a5a5a",
)


def colour(index: int) -> str:
    """A palette colour for the ``index``-th item (wraps round)."""
    return PALETTE[index % len(PALETTE)]


def fmt(value: float, digits: int = 3) -> str:
    """A short decimal: no trailing zeros, no ``-0``."""
    s = f"{value:.{digits}f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "", "-") else s


def esc(text: str) -> str:
    """Text safe inside SVG or HTML element content and quoted attributes."""
    return xml_text(text)


def pt(x: float, y: float, digits: int = 3) -> str:
    """``"x,y"`` in page units with y flipped (design +Y is up on the page)."""
    return f"{fmt(x, digits)},{fmt(-y, digits)}"


def path_d(loops: Iterable[np.ndarray], digits: int = 3) -> str:
    """An SVG path ``d`` of closed polylines (``(n, 2)`` arrays in mm)."""
    out = []
    for loop in loops:
        pts = " ".join(pt(float(x), float(y), digits) for x, y in loop)
        out.append(f"M{pts}Z")
    return " ".join(out)


def simplify(points: np.ndarray, tol: float) -> np.ndarray:
    """An open polyline with points dropped while it stays within ``tol`` (mm).

    Ramer-Douglas-Peucker; the first and last points are kept. For small drawings
    only: the exact outline is in the part files.
    """
    n = len(points)
    if n <= 2:
        return points.copy()
    keep = np.zeros(n, dtype=bool)
    keep[0] = keep[-1] = True
    stack = [(0, n - 1)]
    while stack:
        i, j = stack.pop()
        if j <= i + 1:
            continue
        a, b = points[i], points[j]
        ab = b - a
        seg = float(np.hypot(*ab))
        rel = points[i + 1 : j] - a
        if seg == 0.0:
            dist = np.hypot(rel[:, 0], rel[:, 1])
        else:
            dist = np.abs(rel[:, 0] * ab[1] - rel[:, 1] * ab[0]) / seg
        k = int(np.argmax(dist))
        if dist[k] > tol:
            m = i + 1 + k
            keep[m] = True
            stack.append((i, m))
            stack.append((m, j))
    return points[keep]
