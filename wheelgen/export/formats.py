"""The file formats of a build: one home for their names (no CAD kernel, no writer).

The build (:mod:`wheelgen.export.build`), the DXF writer and the command line all read
these, so a format (and the default tolerance) is written once.
"""

from __future__ import annotations

__all__ = ["DXF_CURVES", "FORMATS", "MESH_TOLERANCE", "PLANAR_FORMATS"]

#: Every export format, in the order files are written.
FORMATS: tuple[str, ...] = ("step", "stl", "3mf", "dxf", "svg")
#: Formats that only flat parts (wheels, plates, hands, dials, crank arms) get as their
#: profile, and turned parts (arbors, tubes, collars) as their dimensioned 1:1 drawing.
PLANAR_FORMATS = frozenset({"dxf", "svg"})
#: How DXF files may draw curves: B-splines (control and fit points), or lines and
#: arcs only (see :mod:`wheelgen.export.dxf`).
DXF_CURVES: tuple[str, ...] = ("splines", "arcs")
#: The default largest chord deviation (mm) of STL/3MF meshes and of DXF arcs; its
#: bounds are ``option.build.tolerance`` in :mod:`wheelgen.design.bounds`.
MESH_TOLERANCE = 0.01
