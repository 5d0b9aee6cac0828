"""Export: part files (STEP, STL, 3MF, DXF, 1:1 SVG), manifest, cache and the build.

Modules are imported on use: ``build`` (the pipeline behind ``wheelgen build``),
``step`` (deterministic STEP), ``mesh`` (STL, 3MF), ``dxf``, ``svg_template``,
``manifest``, ``cache``, ``staging`` and ``sheets`` (the registry of sheet writers).
Only ``step`` and ``mesh`` import the CAD kernel; the rest runs without it.
"""

__all__: list[str] = []
