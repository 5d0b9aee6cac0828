"""How a build is made: :class:`BuildOptions` (formats, jobs, cache, tolerance, units).

The options that decide a part's bytes are part of its cache key
(:meth:`BuildOptions.key_options`).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from ..design.bounds import BOUNDS
from ..design.units import UNITS, Units
from .formats import DXF_CURVES, FORMATS, MESH_TOLERANCE

__all__ = ["MESH_ANGLE_DEG", "BuildOptions"]

#: The angular deflection (degrees) of the STL and 3MF meshes, beside the chord
#: tolerance of the options (part of every part's cache key).
MESH_ANGLE_DEG = 30.0


@dataclass(frozen=True, slots=True)
class BuildOptions:
    """How to build: formats, jobs, force past errors, cache, mesh tolerance (mm).

    ``dxf_curves`` says how DXF files draw curves: ``"splines"`` (control and fit
    points) or ``"arcs"`` (lines and arcs only, within ``mesh_tolerance``). ``units``
    is what the sheets, the drawings' labels and the DXF files are written in
    (``"mm"`` or ``"in"``); ``None`` takes the design's (``[design] units``).
    """

    formats: tuple[str, ...] = FORMATS
    jobs: int = 1
    force: bool = False
    use_cache: bool = True
    mesh_tolerance: float = MESH_TOLERANCE
    dxf_curves: str = DXF_CURVES[0]
    units: Units | None = None

    def __post_init__(self) -> None:
        bad = [f for f in self.formats if f not in FORMATS]
        if bad or not self.formats:
            raise ValueError(
                f"'formats' must be some of {', '.join(FORMATS)},"
                f" got {', '.join(bad) or 'none'}"
            )
        for name, value, bound in (
            ("jobs", self.jobs, BOUNDS["option.build.jobs"]),
            ("mesh_tolerance", self.mesh_tolerance, BOUNDS["option.build.tolerance"]),
        ):
            if not bound.holds(value):
                raise ValueError(f"'{name}' must be {bound.allowed()}, got {value!r}")
        if self.dxf_curves not in DXF_CURVES:
            raise ValueError(
                f"'dxf_curves' must be one of {', '.join(DXF_CURVES)},"
                f" got {self.dxf_curves!r}"
            )
        if self.units is not None and self.units not in UNITS:
            raise ValueError(
                f"'units' must be one of {', '.join(UNITS)} or None, got {self.units!r}"
            )

    def key_options(self) -> dict[str, Any]:
        """The options that decide a part's bytes (part of its cache key)."""
        return {
            "formats": sorted(set(self.formats)),
            "mesh_tolerance": self.mesh_tolerance,
            "mesh_angle_deg": MESH_ANGLE_DEG,
            "dxf_curves": self.dxf_curves,
            "units": self.units or "mm",
        }
