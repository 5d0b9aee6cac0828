"""DXF of a flat part for cutting: outline, holes and marks, each on a named layer.

:func:`write_dxf` draws a wheel's profile; :func:`write_plate_dxf` a frame plate (its
outline and round holes, grouped on layers by what they hold); :func:`write_flat_dxf`
a hand, dial or crank arm, a dial with its graduations and numbers on a layer of their
own (``ENGRAVE``), to engrave or to leave out when only cutting.

Written from the same exact profile as the solid (no kernel needed), in one of two
flavours (:data:`wheelgen.export.formats.DXF_CURVES`, the build option):

- ``"splines"`` (the default): lines as LINE, arcs as ARC, circles as CIRCLE, and each
  flank as one SPLINE carrying both its control points (the same cubic B-spline the
  STEP file holds, within 0.05 um of the exact curve) and its fit points (the exact
  points of the tooth generator), for readers that take either;
- ``"arcs"``: no splines at all; each flank becomes a tangent-continuous chain of
  arcs (biarcs, :mod:`wheelgen.export.biarcs`) within the given tolerance, for CAM
  programs that read only lines, arcs and circles.

Cut lines and marks lie on separate layers (:data:`LAYERS`), so a CAM program can
cut the outline, the bore, windows, slots and pin holes in their own passes and
leave the marks (a pin standing on the face, a hub boss) as scribe or drill lines.
Drawing units are millimetres ($INSUNITS = 4), or inches ($INSUNITS = 1, every
coordinate in inches) for a design whose units are inches: the part is drawn in mm and
scaled by 1/25.4 as a whole when it is saved, so both are the same true size.

ezdxf normally stamps dates and GUIDs; its fixed-metadata switch, on from creating
the document to saving it, makes them constant. The CLASSES section came out in hash-seed order (ezdxf collects entity types in a
set); we sort it before saving, so no interpreter setting (PYTHONHASHSEED) is needed.
"""

from __future__ import annotations

import math
from collections import OrderedDict
from collections.abc import Iterable, Iterator, Sequence
from contextlib import contextmanager
from pathlib import Path
from typing import Any

import ezdxf
import numpy as np
from ezdxf.enums import TextEntityAlignment
from ezdxf.math import Matrix44

from ..design.units import MM_PER_INCH, UNITS
from ..layout.part_kinds import PlatePart
from ..layout.wheel_profile import Hole, PlateProfile
from ..solids.spline_fit import SplineFit, fit_segments
from ..teeth.outline import Segment, WheelOutline, circle_through
from ..workshop.turned_drawing import SHEET_LAYERS, Sheet
from .biarcs import biarc_segments
from .formats import DXF_CURVES, MESH_TOLERANCE

__all__ = [
    "write_sheet_dxf",
    "Engraving",
    "FLAT_LAYERS",
    "HOLE_LAYERS",
    "LAYERS",
    "PLATE_LAYERS",
    "add_chain",
    "add_outline",
    "dxf_document",
    "save_dxf",
    "write_dxf",
    "write_flat_dxf",
    "write_plate_dxf",
]

#: Layer names and ACI colours. Cut lines: the toothed outline, the seat bore,
#: spoke windows, slots, pin holes, holes for the arbors a wheel carries (and any
#: other hole). Marks, not to be cut: a pin standing on the face, a hub boss on the
#: face, the centre cross.
LAYERS: dict[str, int] = {
    "OUTLINE": 7,
    "BORE": 1,
    "WINDOWS": 5,
    "SLOTS": 6,
    "PIN_HOLES": 4,
    "ARBOR_HOLES": 140,
    "HOLES": 5,
    "PIN_MARK": 2,
    "HUB_MARK": 30,
    "CENTRE": 3,
}

#: A hand's, dial's or crank arm's layers: the outline, its seat (or centre hole), other
#: holes, marks to punch (the feet of a dial, a crank's handle, the centre) and a dial's
#: graduations and numbers.
FLAT_LAYERS: dict[str, int] = {
    "OUTLINE": 7,
    "BORE": 1,
    "HOLES": 5,
    "CENTRE": 3,
    "ENGRAVE": 6,
}
#: A dial's engraving (see :class:`wheelgen.layout.part_kinds.DialPart`): circles
#: (radius, width), strokes (angle, radius from, radius to, width) and texts (x, y,
#: height, turn in degrees, text); mm and degrees.
Engraving = tuple[
    Sequence[tuple[float, float]],
    Sequence[tuple[float, float, float, float]],
    Sequence[tuple[float, float, float, float, str]],
]

#: The layer of each hole role of a wheel profile; any other role goes on HOLES.
HOLE_LAYERS: dict[str, str] = {
    "bore": "BORE",
    "window": "WINDOWS",
    "slot": "SLOTS",
    "pin_hole": "PIN_HOLES",
    "arbor_hole": "ARBOR_HOLES",
}

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
    start, end = (ang[0], ang[2]) if d > 0 else (ang[2], ang[0])
    return (float(ux), float(uy)), float(r), start % 360.0, end % 360.0


def _check_curves(curves: str) -> None:
    if curves not in DXF_CURVES:
        raise ValueError(
            f"'curves' must be one of {', '.join(map(repr, DXF_CURVES))}, got {curves!r}"
        )


def _xyz(points: Iterable[Any]) -> list[tuple[float, float, float]]:
    return [(float(x), float(y), 0.0) for x, y in points]


def _add_spline(msp: Any, seg: Segment, fit: SplineFit, attrs: dict[str, Any]) -> None:
    spline = msp.add_spline(dxfattribs={**attrs, "degree": fit.degree})
    spline.control_points = _xyz(fit.poles)
    spline.knots = fit.full_knots().tolist()
    spline.fit_points = _xyz(seg.points)
    # end tangents, for readers that rebuild the curve from the fit points: a clamped
    # B-spline leaves its first pole towards the second and ends from the last but one
    for key, (a, b) in (
        ("start_tangent", fit.poles[:2]),
        ("end_tangent", fit.poles[-2:]),
    ):
        d = b - a
        spline.dxf.set(key, (*(d / math.hypot(*d)), 0.0))


def _add_simple(msp: Any, seg: Segment, attrs: dict[str, Any]) -> None:
    pts = seg.points
    if seg.kind == "arc" and circle_through(pts[0], pts[1], pts[2])[1] is not None:
        centre, r, a0, a1 = _arc_params(pts)
        msp.add_arc(centre, r, a0, a1, dxfattribs=attrs)
    else:
        msp.add_line(tuple(pts[0]), tuple(pts[-1]), dxfattribs=attrs)


def add_chain(
    msp: Any,
    segments: Sequence[Segment],
    layer: str,
    curves: str = "splines",
    tolerance: float = MESH_TOLERANCE,
    fits: Sequence[SplineFit | None] | None = None,
) -> None:
    """Draw a chain of exact segments on ``layer`` of an ezdxf layout.

    ``curves`` is ``"splines"`` or ``"arcs"``; with ``"arcs"`` every spline becomes
    arcs within ``tolerance`` mm of the exact curve. ``fits`` are the segments' spline
    fits when already made (see :func:`wheelgen.solids.spline_fit.fit_segments`).
    """
    _check_curves(curves)
    attrs = {"layer": layer}
    if fits is None:
        fits = fit_segments(segments)
    for seg, fit in zip(segments, fits):
        if fit is None or len(seg.points) == 2:
            _add_simple(msp, seg, attrs)
        elif curves == "splines":
            _add_spline(msp, seg, fit, attrs)
        else:
            # the arcs' budget is what the fit has left of the tolerance
            for piece in biarc_segments(fit, tolerance - fit.deviation):
                _add_simple(msp, piece, attrs)


def add_outline(
    msp: Any,
    outline: WheelOutline,
    layer: str = "OUTLINE",
    curves: str = "splines",
    tolerance: float = MESH_TOLERANCE,
) -> None:
    """Draw a wheel's toothed outline; tooth 0's curves are made once and turned."""
    fits = fit_segments(outline.tooth)
    tooth: list[Segment] = []
    if curves == "arcs":
        # turn tooth 0's arcs rather than fitting arcs to every tooth
        for seg, fit in zip(outline.tooth, fits):
            if fit is None or len(seg.points) == 2:
                tooth.append(seg)
            else:
                tooth.extend(biarc_segments(fit, tolerance - fit.deviation))
        fits = tuple(None for _ in tooth)
    else:
        tooth = list(outline.tooth)
    for k in range(outline.teeth):
        angle = k * outline.pitch_angle_deg
        turned = [s if k == 0 else s.rotated(angle) for s in tooth]
        turned_fits = [f if f is None or k == 0 else f.rotated(angle) for f in fits]
        add_chain(msp, turned, layer, curves, tolerance, turned_fits)


def _add_hole(msp: Any, hole: Hole, curves: str, tolerance: float) -> None:
    layer = HOLE_LAYERS.get(hole.role, "HOLES")
    if hole.circle is not None:
        x, y, r = hole.circle
        msp.add_circle((x, y), r, dxfattribs={"layer": layer})
        return
    add_chain(msp, hole.segments, layer, curves, tolerance)


@contextmanager
def _fixed_metadata() -> Iterator[None]:
    # ezdxf stamps the creation and the saving with dates and GUIDs; its switch for
    # tests makes them constant. It is global: set it only while we need it.
    previous = ezdxf.options.write_fixed_meta_data_for_testing
    ezdxf.options.write_fixed_meta_data_for_testing = True
    try:
        yield
    finally:
        ezdxf.options.write_fixed_meta_data_for_testing = previous


def dxf_document(name: str, layers: dict[str, int] = LAYERS) -> Any:
    """A new DXF document (R2010, mm) with every layer of ``layers`` (a wheel's)."""
    with _fixed_metadata():
        doc = ezdxf.new("R2010", setup=False)
    doc.units = 4  # millimetres
    doc.header["$MEASUREMENT"] = 1
    doc.header["$PROJECTNAME"] = name
    for layer, colour in layers.items():
        doc.layers.add(layer, color=colour)
    return doc


#: $INSUNITS of each unit a drawing may be saved in (the DXF reference's codes).
_INSUNITS = {"mm": 4, "in": 1}


def save_dxf(doc: Any, path: Path, units: str = "mm") -> Path:
    """Save ``doc`` to ``path`` with fixed dates and GUIDs: the same bytes each run.

    ``doc`` is drawn in mm; with ``units = "in"`` every entity is scaled by 1/25.4 and
    the drawing's units set to inches first, so it keeps its true size.
    """
    if units not in UNITS:
        raise ValueError(f"'units' must be 'mm' or 'in', got {units!r}")
    if units == "in":
        scale = Matrix44.scale(1 / float(MM_PER_INCH))
        for entity in doc.modelspace():
            entity.transform(scale)
        doc.units = _INSUNITS["in"]
        doc.header["$MEASUREMENT"] = 0  # imperial
    with _fixed_metadata():
        # ezdxf adds a CLASS per entity type in use while saving, iterating a set:
        # the order followed PYTHONHASHSEED. Add them now, sorted; saving adds none.
        doc.classes.add_required_classes(doc.dxfversion)
        doc.classes.classes = OrderedDict(sorted(doc.classes.classes.items()))
        doc.saveas(path)
    return path


def write_dxf(
    profile: PlateProfile,
    path: Path,
    name: str,
    curves: str = "splines",
    tolerance: float = MESH_TOLERANCE,
    pins: Sequence[tuple[float, float, float]] = (),
    hub_diameter: float = 0.0,
    units: str = "mm",
) -> Path:
    """Write the profile as a DXF (R2010, mm or in); the same input gives the same bytes.

    Parameters
    ----------
    profile : PlateProfile
        The wheel's outline and holes, in mm.
    curves : str
        ``"splines"`` or ``"arcs"`` (lines and arcs only).
    tolerance : float
        Largest distance (mm) of the arcs from the exact flanks with ``"arcs"``.
    pins : sequence of (x, y, diameter)
        Pins standing on the face (mm), drawn on PIN_MARK as a circle and a cross.
    hub_diameter : float
        A hub boss on the face (mm, 0 for none), drawn on HUB_MARK as a circle.
    units : str
        ``"mm"``, or ``"in"`` for a drawing in inches (see :func:`save_dxf`).
    """
    _check_curves(curves)
    if tolerance <= 0:
        raise ValueError(f"'tolerance' must be > 0 mm, got {tolerance}")
    doc = dxf_document(name)
    msp = doc.modelspace()
    add_outline(msp, profile.outline, "OUTLINE", curves, tolerance)
    for hole in profile.holes:
        _add_hole(msp, hole, curves, tolerance)
    for x, y, dia in pins:
        c = dia / 2 + 1.0  # the cross reaches 1 mm past the pin, as on the SVG template
        msp.add_circle((x, y), dia / 2, dxfattribs={"layer": "PIN_MARK"})
        msp.add_line((x - c, y), (x + c, y), dxfattribs={"layer": "PIN_MARK"})
        msp.add_line((x, y - c), (x, y + c), dxfattribs={"layer": "PIN_MARK"})
    if hub_diameter > 0:
        msp.add_circle((0.0, 0.0), hub_diameter / 2, dxfattribs={"layer": "HUB_MARK"})
    bore = next((h for h in profile.holes if h.role == "bore"), None)
    size = max(2.0, 0.6 * (2 * bore.circle[2] if bore and bore.circle else 2.0))
    msp.add_line((-size, 0.0), (size, 0.0), dxfattribs={"layer": "CENTRE"})
    msp.add_line((0.0, -size), (0.0, size), dxfattribs={"layer": "CENTRE"})
    return save_dxf(doc, path, units)


def write_flat_dxf(
    profile: Any,
    path: Path,
    name: str,
    engraving: Engraving | None = None,
    marks: Sequence[tuple[float, float]] = (),
    units: str = "mm",
) -> Path:
    """Write a hand's, dial's or crank arm's flat profile as a DXF (R2010, mm or in).

    ``profile`` has an ``outline`` of lines and arcs and ``holes``
    (:class:`wheelgen.display.outlines.FlatProfile`); ``engraving`` goes on ENGRAVE,
    ``marks`` (x, y) are crosses on CENTRE. The same input gives the same bytes.
    """
    doc = dxf_document(name, FLAT_LAYERS)
    msp = doc.modelspace()
    add_chain(msp, list(profile.outline.segments()), "OUTLINE")
    for hole in profile.holes:
        layer = "BORE" if hole.role == "bore" else "HOLES"
        if hole.circle is not None:
            x, y, r = hole.circle
            msp.add_circle((x, y), r, dxfattribs={"layer": layer})
        else:
            add_chain(msp, hole.segments, layer)
    for x, y in [(0.0, 0.0), *marks]:
        attrs = {"layer": "CENTRE"}
        msp.add_line((x - 1.5, y), (x + 1.5, y), dxfattribs=attrs)
        msp.add_line((x, y - 1.5), (x, y + 1.5), dxfattribs=attrs)
    if engraving is not None:
        circles, strokes, texts = engraving
        attrs = {"layer": "ENGRAVE"}
        for r, _ in circles:
            msp.add_circle((0.0, 0.0), r, dxfattribs=attrs)
        for a, r0, r1, _ in strokes:
            c, s = math.cos(math.radians(a)), math.sin(math.radians(a))
            msp.add_line((r0 * c, r0 * s), (r1 * c, r1 * s), dxfattribs=attrs)
        for x, y, h, turn, text in texts:
            entity = msp.add_text(text, height=h, rotation=turn, dxfattribs=attrs)
            entity.set_placement((x, y), align=TextEntityAlignment.MIDDLE_CENTER)
    return save_dxf(doc, path, units)


def write_plate_dxf(part: PlatePart, path: Path, units: str = "mm") -> Path:
    """Write a plate as a DXF (R2010, mm or in): outline, holes by layer, centre marks.

    The drawing is in the design's frame (the arbors' ``at``), seen from the front.
    """
    doc = dxf_document(part.name, PLATE_LAYERS)
    msp = doc.modelspace()
    outline = [Segment(e.kind, np.array(e.points, dtype=float)) for e in part.outline]
    add_chain(msp, outline, "OUTLINE")
    for h in part.holes:
        layer = _PLATE_LAYER_OF_ROLE.get(h.role, "PIVOTS")
        msp.add_circle((h.x, h.y), h.diameter / 2, dxfattribs={"layer": layer})
        c = h.diameter / 2 + 1.0
        attrs = {"layer": "CENTRES"}
        msp.add_line((h.x - c, h.y), (h.x + c, h.y), dxfattribs=attrs)
        msp.add_line((h.x, h.y - c), (h.x, h.y + c), dxfattribs=attrs)
    return save_dxf(doc, path, units)


_ALIGN = {
    "start": TextEntityAlignment.LEFT,
    "middle": TextEntityAlignment.CENTER,
    "end": TextEntityAlignment.RIGHT,
}


def write_sheet_dxf(sheet: Sheet, path: Path, units: str = "mm") -> Path:
    """Write a workshop drawing (an arbor's, a tube's or a collar's) as a DXF (R2010,
    mm, 1:1): its lines, circles and texts on the layers of
    :data:`wheelgen.workshop.turned_drawing.SHEET_LAYERS`. The same sheet gives the same
    bytes. Drawn in inches when ``units`` is ``"in"`` (the figures are the sheet's:
    :func:`~wheelgen.workshop.turned_drawing.turned_sheet` writes them in inches)."""
    doc = dxf_document(sheet.name, SHEET_LAYERS)
    doc.linetypes.add("DASHED", pattern=[2.0, 1.2, -0.8])
    doc.linetypes.add("CENTER", pattern=[6.6, 4.0, -1.0, 0.6, -1.0])
    doc.layers.get("HIDDEN").dxf.linetype = "DASHED"
    doc.layers.get("CENTRE").dxf.linetype = "CENTER"
    msp = doc.modelspace()
    for x0, y0, x1, y1, layer in sheet.lines:
        msp.add_line((x0, y0), (x1, y1), dxfattribs={"layer": layer})
    for x, y, r, layer in sheet.circles:
        msp.add_circle((x, y), r, dxfattribs={"layer": layer})
    for t in sheet.texts:
        entity = msp.add_text(
            t.text,
            height=t.height,
            rotation=t.rotation_deg,
            dxfattribs={"layer": t.layer},
        )
        entity.set_placement((t.x, t.y), align=_ALIGN[t.anchor])
    return save_dxf(doc, path, units)
