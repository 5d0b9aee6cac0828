"""The one registry of sheet writers that run inside ``wheelgen build``.

A sheet writer is ``writer(design, parts, findings, staging_dir) -> list[Path]``: it
writes its files (cutting sheet, bill of parts, drilling chart, report...) somewhere
inside ``staging_dir`` and returns their paths; the build hashes them into the
manifest. Writers must not import the CAD kernel. Another layer adds its writer by
extending the tuple here, e.g. ``SHEET_WRITERS = (write_cutting_sheet,)``. A build
forced past error-level findings still calls the writers; they can tell with
``wheelgen.findings.has_errors(findings)`` and should say "unchecked".
"""

from __future__ import annotations

from pathlib import Path
from typing import Callable, Sequence

from ..design.model import Design
from ..findings import Finding
from ..layout.part_kinds import Part
from .staging import UnsafeNameError

__all__ = ["SheetWriter", "SHEET_WRITERS", "write_sheets"]

SheetWriter = Callable[[Design, Sequence[Part], Sequence[Finding], Path], list[Path]]

from ..workshop.assembly import assembly_writer  # noqa: E402
from ..workshop.cutting import cutting_sheet_writer  # noqa: E402  (after the type alias)
from ..workshop.drilling import drilling_sheet_writer  # noqa: E402
from ..workshop.elevation import elevation_writer  # noqa: E402
from ..workshop.parts_bill import parts_sheet_writer  # noqa: E402
from ..workshop.report import report_writer  # noqa: E402
from .beds import print_sheet_writer  # noqa: E402

#: Every sheet writer, run in this order after the part files are in place.
SHEET_WRITERS: tuple[SheetWriter, ...] = (
    cutting_sheet_writer,
    print_sheet_writer,
    parts_sheet_writer,
    drilling_sheet_writer,
    elevation_writer,
    assembly_writer,
    report_writer,
)


def write_sheets(
    design: Design, parts: Sequence[Part], findings: Sequence[Finding], folder: Path
) -> None:
    """Run every sheet writer into ``folder``; each file it returns must be inside.

    Raises
    ------
    UnsafeNameError
        A writer returned a path that is not a file inside ``folder``.
    """
    for writer in SHEET_WRITERS:  # read now: others may extend it
        for written in writer(design, parts, findings, folder):
            resolved = Path(written).resolve()
            if not resolved.is_relative_to(folder.resolve()) or not resolved.is_file():
                raise UnsafeNameError(
                    f"sheet writer {getattr(writer, '__name__', writer)!r} returned"
                    f" {written}, which is not a file inside the output folder"
                )
