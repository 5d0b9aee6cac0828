"""The file formats of a build: one home for their names (no CAD kernel, no writer).

The build (:mod:`wheelgen.export.build`), the DXF writer and the command line all read
these, so a format is named once.
"""

from __future__ import annotations

__all__ = ["DXF_CURVES", "FORMATS", "PLANAR_FORMATS"]

#: Every export format, in the order files are written.
FORMATS: tuple[str, ...] = ("step", "stl", "3mf", "dxf", "svg")
#: Formats that only flat parts (wheels, plates, hands, dials, crank arms) get.
PLANAR_FORMATS = frozenset({"dxf", "svg"})
#: How DXF files may draw curves: B-splines (control and fit points), or lines and
#: arcs only (see :mod:`wheelgen.export.dxf`).
DXF_CURVES: tuple[str, ...] = ("splines", "arcs")
