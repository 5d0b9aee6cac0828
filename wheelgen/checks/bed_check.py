"""``process.bed``: a printed part too large for the printer's build plate.

The flat parts are the large ones: a wheel is as wide as its tip circle, a plate as
its outline, a dial as its disc, a hand or crank arm as its profile. A part that fits
neither way round on ``[process] bed`` (less the print sheet's spacing at each edge)
cannot be printed whole; the print sheet then puts it on no plate. Lengths in mm.
"""

from __future__ import annotations

from typing import Any

from ..design.model import Design
from ..findings import Finding
from ..layout.part_kinds import Part

__all__ = ["EDGE_SPACING", "bed_findings", "flat_footprint"]

#: Room kept between a part and the plate's edge, mm (the print sheet's spacing;
#: common practice, no source: room for a brim and for the scraper).
EDGE_SPACING = 5.0


def flat_footprint(part: Part) -> tuple[float, float] | None:
    """Width and depth (mm) of a flat part lying on the plate; None for other kinds."""
    import numpy as np

    if part.kind == "wheel":
        from ..teeth.forms import outline_for

        d = 2 * float(outline_for(part.tooth).radii["tip"])
        return d, d
    if part.kind == "dial":
        return 2 * part.radius, 2 * part.radius
    if part.kind == "plate":
        from ..frame.outline import edges_polyline

        loop = edges_polyline(part.outline, 0.05)
    elif part.kind in ("hand", "crank"):
        from ..display.outlines import flat_profile

        loop = flat_profile(part).outline.polyline(0.05)
    else:
        return None
    size = np.ptp(loop, axis=0)
    return float(size[0]), float(size[1])


def bed_findings(design: Design, analysis: Any = None) -> list[Finding]:
    """A warning for each printed flat part that fits the bed neither way round."""
    if design.process.kind != "print":
        return []
    from ..parts import plan_parts

    try:
        parts = plan_parts(design)
    except ValueError:  # no layout: the layout checks say why
        return []
    bx, by = design.process.bed
    room = (bx - 2 * EDGE_SPACING, by - 2 * EDGE_SPACING)
    out = []
    for part in parts:
        size = flat_footprint(part)
        if size is None:
            continue
        w, d = size
        if (w <= room[0] and d <= room[1]) or (d <= room[0] and w <= room[1]):
            continue
        out.append(
            Finding(
                "warning",
                "process.bed",
                f"{part.kind} {part.name}",
                f"{part.kind} {part.name} is {w:.1f} x {d:.1f} mm: it fits on the "
                f"{bx:g} x {by:g} mm build plate neither way round (with "
                f"{EDGE_SPACING:g} mm at each edge), so the print sheet puts it on none",
                measured=f"{w:.1f} x {d:.1f} mm",
                limit=f"{room[0]:g} x {room[1]:g} mm",
                advice="set [process] bed to your printer's plate if it is larger; "
                "else make the part smaller or print it in pieces",
            )
        )
    return out
