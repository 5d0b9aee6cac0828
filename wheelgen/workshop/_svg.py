"""Small helpers shared by the report's drawings: the palette and polyline thinning.

Numbers, points, paths and escaping come from :mod:`wheelgen.svg_text` (re-exported
here), the one way every drawing of the project writes them.

Every drawing is plain SVG text built in a fixed order, so the same design gives the
same bytes. Drawings are seen from the front: +Y of the design is up on the page, so
y is flipped once, in :func:`pt`.
"""

from __future__ import annotations

import numpy as np

from ..svg_text import esc as esc
from ..svg_text import fmt as fmt
from ..svg_text import path_d as path_d
from ..svg_text import pt as pt

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
