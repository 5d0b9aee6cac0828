"""DXF of a flat part for cutting: outline, bore, other holes and centre mark on layers.

:func:`write_dxf` draws a wheel's profile; :func:`write_plate_dxf` a frame plate (its
outline and round holes, grouped on layers by what they hold).

Written from the same exact profile as the solid (no kernel needed): lines as LINE,
arcs as ARC, each flank as one SPLINE through the generator's exact points, circles
as CIRCLE. Drawing units are millimetres ($INSUNITS = 4).

ezdxf normally stamps dates and GUIDs; its fixed-metadata switch makes them constant.
The CLASSES section came out in hash-seed order (ezdxf collects entity types in a
set); we sort it before saving, so no interpreter setting (PYTHONHASHSEED) is needed
(both in :func:`_drawing`, which every writer here uses).
"""

from __future__ import annotations

import math
from collections import OrderedDict
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path
from typing import Any

import ezdxf
import numpy as np

from ..layout.part_plan import PlatePart
from ..layout.wheel_profile import Hole, PlateProfile
from ..teeth.outline import Segment, circle_through

__all__ = ["LAYERS", "PLATE_LAYERS", "write_dxf", "write_plate_dxf"]

#: Layer names and ACI colours: toothed outline, seat bore, other holes, centre mark.
LAYERS: dict[str, int] = {"OUTLINE": 7, "BORE": 1, "HOLES": 5, "CENTRE": 3}
#: A plate's layers and ACI colours: outline, pivot holes (and held tubes, bushes and
#: bearings), pillar holes, mounting holes (cock screws), centre marks.
PLATE_LAYERS: dict[str, int] = {
    "OUTLINE": 7,
    "PIVOTS": 1,
    "PILLARS": 5,
    "MOUNTING": 6,
    "CENTRES": 3,
}
_PLATE_LAYER_OF_ROLE = {
    "pivot": "PIVOTS",
    "held": "PIVOTS",
    "bush": "PIVOTS",
    "bearing": "PIVOTS",
    "pillar": "PILLARS",
    "screw": "PILLARS",
    "mounting": "MOUNTING",
}


def _arc_params(p: np.ndarray) -> tuple[tuple[float, float], float, float, float]:
    """Centre, radius and CCW start/end angles (degrees) of the arc through 3 points."""
    a, b, c = p
    centre, radius = circle_through(a, b, c)
    if radius is None:
        raise ValueError("an arc's three points lie on one line")
    ux, uy, r = float(centre[0]), float(centre[1]), radius
    # the sign of the triangle's area: start, mid, end turn left
    d = (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])
    ang = [math.degrees(math.atan2(q[1] - uy, q[0] - ux)) for q in (a, b, c)]
    ccw = d > 0  # the sign of the triangle's area: start, mid, end turn left
    start, end = (ang[0], ang[2]) if ccw else (ang[2], ang[0])
    return (float(ux), float(uy)), float(r), start % 360.0, end % 360.0


def _add_segment(msp, seg: Segment, layer: str) -> None:  # type: ignore[no-untyped-def]
    attrs = {"layer": layer}
    pts = seg.points
    if seg.kind == "line" or (seg.kind == "spline" and len(pts) == 2):
        msp.add_line(tuple(pts[0]), tuple(pts[-1]), dxfattribs=attrs)
    elif seg.kind == "arc":
        centre, r, a0, a1 = _arc_params(pts)
        msp.add_arc(centre, r, a0, a1, dxfattribs=attrs)
    else:
        msp.add_spline(
            fit_points=[(float(x), float(y), 0.0) for x, y in pts], dxfattribs=attrs
        )


def _add_hole(msp, hole: Hole) -> None:  # type: ignore[no-untyped-def]  # ezdxf layout
    layer = "BORE" if hole.role == "bore" else "HOLES"
    if hole.circle is not None:
        x, y, r = hole.circle
        msp.add_circle((x, y), r, dxfattribs={"layer": layer})
        return
    for seg in hole.segments:
        _add_segment(msp, seg, layer)


@contextmanager
def _drawing(path: Path, name: str, layers: dict[str, int]) -> Iterator[Any]:
    """A new DXF (R2010, mm) with ``layers``; yields its modelspace, saves on leaving.

    ezdxf normally stamps dates and GUIDs: its fixed-metadata switch makes them
    constant. It also adds a CLASS per entity type in use while saving, iterating a
    set, so their order followed PYTHONHASHSEED: they are added here, sorted, and
    saving adds none.
    """
    previous = ezdxf.options.write_fixed_meta_data_for_testing
    ezdxf.options.write_fixed_meta_data_for_testing = True  # no dates, fixed GUIDs
    try:
        doc = ezdxf.new("R2010", setup=False)
        doc.units = 4  # millimetres
        doc.header["$MEASUREMENT"] = 1
        for layer, colour in layers.items():
            doc.layers.add(layer, color=colour)
        yield doc.modelspace()
        doc.header["$PROJECTNAME"] = name
        doc.classes.add_required_classes(doc.dxfversion)
        doc.classes.classes = OrderedDict(sorted(doc.classes.classes.items()))
        doc.saveas(path)
    finally:
        ezdxf.options.write_fixed_meta_data_for_testing = previous


def write_dxf(profile: PlateProfile, path: Path, name: str) -> Path:
    """Write the profile as a DXF (R2010, mm); the same profile gives the same bytes."""
    with _drawing(path, name, LAYERS) as msp:
        for seg in profile.outline.segments():
            _add_segment(msp, seg, "OUTLINE")
        for hole in profile.holes:
            _add_hole(msp, hole)
        bore = next((h for h in profile.holes if h.role == "bore"), None)
        size = max(2.0, 0.6 * (2 * bore.circle[2] if bore and bore.circle else 2.0))
        msp.add_line((-size, 0.0), (size, 0.0), dxfattribs={"layer": "CENTRE"})
        msp.add_line((0.0, -size), (0.0, size), dxfattribs={"layer": "CENTRE"})
    return path


def write_plate_dxf(part: PlatePart, path: Path) -> Path:
    """Write a plate as a DXF (R2010, mm): outline, holes by layer, centre marks.

    The drawing is in the design's frame (the arbors' ``at``), seen from the front.
    """
    with _drawing(path, part.name, PLATE_LAYERS) as msp:
        for e in part.outline:
            points = np.array(e.points, dtype=float)
            _add_segment(msp, Segment(e.kind, points), "OUTLINE")
        for h in part.holes:
            layer = _PLATE_LAYER_OF_ROLE.get(h.role, "PIVOTS")
            msp.add_circle((h.x, h.y), h.diameter / 2, dxfattribs={"layer": layer})
            c = h.diameter / 2 + 1.0
            attrs = {"layer": "CENTRES"}
            msp.add_line((h.x - c, h.y), (h.x + c, h.y), dxfattribs=attrs)
            msp.add_line((h.x, h.y - c), (h.x, h.y + c), dxfattribs=attrs)
    return path
