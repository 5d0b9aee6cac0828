"""The print sheet of a printed design: ``print.csv`` and the build plates.

A sheet writer (it runs after the part files are in the staging folder and does not
load the CAD kernel): each printed part's STL is read back, turned as
:func:`wheelgen.workshop.print_plan.orientation` says, and its footprint laid out on
the design's build plates (``[process] bed``); each plate is written as one 3MF with
every part where it stands, ``bed/bed-1.3mf``, ``bed/bed-2.3mf``, ... A part larger
than the plate goes on none and the sheet says so; without STL files (a build asked
for other formats only) the sheet gives the orientations alone.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any, Sequence

from ..design.units import lengths_of
from ..workshop.print_plan import (
    PRINT_FILE,
    bed_file,
    print_csv,
    print_layout,
)
from .mesh_files import write_3mf_objects

__all__ = ["print_sheet_writer"]


def print_sheet_writer(
    design: Any, parts: Sequence[Any], findings: Sequence[Any], staging_dir: Path
) -> list[Path]:
    """Sheet writer for ``wheelgen build``: a printed design's sheet and plates."""
    if design.process.kind != "print":
        return []
    staging_dir = Path(staging_dir)
    layout = print_layout(design, parts, staging_dir)
    sheet = staging_dir / PRINT_FILE
    sheet.write_text(print_csv(layout.rows, lengths_of(design)), encoding="utf-8")
    written = [sheet]
    for number, objects in layout.plates:
        path = staging_dir / bed_file(number)
        path.parent.mkdir(exist_ok=True)
        write_3mf_objects(path, f"{design.name} plate {number}", objects)
        written.append(path)
    return written
