"""One part's files: STEP, STL, 3MF, DXF and SVG, each written from one solid,
mesh or flat profile made on first use.

:data:`PART_WRITERS` maps a format to its writer; :func:`build_part_files` writes every
file a part gets (:func:`part_file_names`) under a folder, and keeps the solid as BREP
for the assembly. The CAD kernel is imported only when a solid or mesh is made.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any

from ..design.units import Lengths
from ..layout.part_kinds import (
    BOUGHT_KINDS,
    FLAT_KINDS,
    TURNED_KINDS,
    Part,
    WheelPart,
    is_display,
    is_turned,
)
from .build_options import MESH_ANGLE_DEG, BuildOptions
from .formats import FORMATS, PLANAR_FORMATS
from .staging import inside, safe_name

__all__ = [
    "BREP_FILE",
    "PART_WRITERS",
    "PartWork",
    "build_part_files",
    "part_file_names",
]


def part_file_names(part: Part, formats: Sequence[str]) -> list[tuple[str, str]]:
    """(format, relative path) of every file the part gets.

    Bought parts (screws, bushes, bearings) get none: they are only in the assembly.
    """
    if part.kind in BOUGHT_KINDS:
        return []
    out = []
    for fmt in FORMATS:
        if fmt not in formats:
            continue
        if fmt in PLANAR_FORMATS and part.kind not in FLAT_KINDS | TURNED_KINDS:
            continue
        out.append((fmt, f"{fmt}/{part.name}.{fmt}"))
    return out


class PartWork:
    """One part's solid, mesh and flat profile, each made on first use."""

    def __init__(
        self,
        part: Part,
        tolerance: float,
        dxf_curves: str = "splines",
        units: str = "mm",
    ) -> None:
        self.part = part
        self.tolerance = tolerance
        self.dxf_curves = dxf_curves
        self.units = units
        self._solid: Any = None
        self._mesh: Any = None
        self._profile: Any = None

    @property
    def solid(self) -> Any:
        if self._solid is None:
            from ..solids.part import make_part
            from ..solids.wheel import wheel_from_profile

            # booleans check their own results (solids.wheel.check_solid); a plain
            # prism of a closed profile is not re-checked here (0.3-1 s a wheel):
            # the export tests re-import and validate every kind of part
            if self.part.kind == "wheel":
                self._solid = wheel_from_profile(self.part, self.profile)
            else:
                self._solid = make_part(self.part)
        return self._solid

    @property
    def mesh(self) -> Any:
        if self._mesh is None:
            from .mesh import mesh_shape

            self._mesh = mesh_shape(self.solid, self.tolerance, MESH_ANGLE_DEG)
        return self._mesh

    @property
    def profile(self) -> Any:
        """A wheel's flat profile; a plate's outline as a closed polyline (mm)."""
        if self._profile is None:
            part = self.part
            if part.kind == "plate":
                from ..frame.outline import edges_polyline

                self._profile = edges_polyline(part.outline, 0.005)
                return self._profile
            if is_display(part):
                from ..display.outlines import flat_profile

                self._profile = flat_profile(part)
                return self._profile
            from ..layout.wheel_profile import plate_profile
            from ..teeth.forms import outline_for

            wheel = _wheel(part)
            self._profile = plate_profile(wheel, outline_for(wheel.tooth))
        return self._profile


def _wheel(part: Part) -> WheelPart:
    """The part as the wheel it must be: the only flat kind left once the plates,
    the display's parts and the turned parts are drawn their own ways."""
    if not isinstance(part, WheelPart):
        raise TypeError(f"part {part.name!r}: a {part.kind} has no wheel profile")
    return part


def _write_step(w: PartWork, path: Path) -> None:
    from .step import write_step

    write_step(w.solid, path, w.part.name)


def _write_stl(w: PartWork, path: Path) -> None:
    from .mesh import write_stl

    write_stl(w.mesh, path, w.part.name)


def _write_3mf(w: PartWork, path: Path) -> None:
    from .mesh import write_3mf

    write_3mf(w.mesh, path, w.part.name)


def _face_pins(part: WheelPart) -> list[tuple[float, float, float]]:
    """(x, y, diameter) in mm of a pin standing on the wheel's face, to be marked."""
    pin = part.pin
    if pin is None or pin.hole_only:  # a through hole is drawn as a hole already
        return []
    a = math.radians(pin.angle_deg)
    return [(pin.radius * math.cos(a), pin.radius * math.sin(a), pin.diameter)]


def _lengths(units: str) -> Lengths:
    """The formatter of a build's units (``"mm"`` or ``"in"``)."""
    return Lengths("in" if units == "in" else "mm")


def _write_dxf(w: PartWork, path: Path) -> None:
    part = w.part
    if is_turned(part):
        from ..workshop.turned_drawing import turned_sheet
        from .dxf import write_sheet_dxf

        write_sheet_dxf(turned_sheet(part, _lengths(w.units)), path, w.units)
        return
    if part.kind == "plate":
        from .dxf import write_plate_dxf

        write_plate_dxf(part, path, w.units)
        return
    if is_display(part):
        from .dxf import write_flat_dxf

        engraving = None
        if part.kind == "dial":
            engraving = (part.circles, part.strokes, part.texts)
        write_flat_dxf(w.profile, path, part.name, engraving, w.profile.marks, w.units)
        return
    from .dxf import write_dxf

    wheel = _wheel(part)
    hub = wheel.hub_diameter if wheel.hub_length > 0 else 0.0
    write_dxf(
        w.profile,
        path,
        wheel.name,
        curves=w.dxf_curves,
        tolerance=w.tolerance,
        pins=_face_pins(wheel),
        hub_diameter=hub,
        units=w.units,
    )


def _write_svg(w: PartWork, path: Path) -> None:
    part = w.part
    if is_turned(part):
        from ..workshop.turned_drawing import sheet_svg, turned_sheet

        sheet = turned_sheet(part, _lengths(w.units))
        path.write_text(sheet_svg(sheet), encoding="utf-8", newline="\n")
        return
    if part.kind == "plate":
        from .svg_template import write_plate_svg

        write_plate_svg(part, path, w.profile, units=w.units)
        return
    if is_display(part):
        from .face_svg import write_face_svg

        write_face_svg(part, w.profile, path, units=w.units)
        return
    from .svg_template import write_svg

    wheel = _wheel(part)
    write_svg(
        w.profile,
        path,
        wheel.name,
        wheel.tooth.teeth,
        wheel.tooth.module,
        pins=_face_pins(wheel),
        units=w.units,
        diametral_pitch=wheel.tooth.diametral_pitch,
    )


#: Format -> writer(part work, path). Tests replace an entry to simulate a failure.
PART_WRITERS: dict[str, Callable[[PartWork, Path], None]] = {
    "step": _write_step,
    "stl": _write_stl,
    "3mf": _write_3mf,
    "dxf": _write_dxf,
    "svg": _write_svg,
}
BREP_FILE = "solid.brep"  # kept in the cache entry only, for the assembly


def build_part_files(part: Part, options: BuildOptions, dest: Path) -> list[str]:
    """Write every file of ``part`` under ``dest``; returns their relative paths."""
    safe_name(part.name)
    work = PartWork(
        part, options.mesh_tolerance, options.dxf_curves, options.units or "mm"
    )
    written = []
    for fmt, rel in part_file_names(part, options.formats):
        path = inside(dest, rel)
        path.parent.mkdir(parents=True, exist_ok=True)
        PART_WRITERS[fmt](work, path)
        written.append(rel)
    if "step" in options.formats:
        work.solid.exportBrep(str(dest / BREP_FILE))
    return written
