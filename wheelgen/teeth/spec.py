"""What one wheel's teeth should be: the input of every tooth generator.

Lengths in mm, angles in degrees; the shape coefficients (``addendum``, ``dedendum``,
``root_radius``, ``tip_radius``) are multiples of the module, as in ISO 53.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = ["FORMS", "ToothSpec", "thinning_for"]

#: Tooth forms a spec may name; each has its generator in :mod:`wheelgen.teeth.forms`.
FORMS: tuple[str, ...] = ("involute", "triangular")


@dataclass(frozen=True, slots=True)
class ToothSpec:
    """One wheel's tooth form.

    ``thinning`` is the circumferential tooth thickness (mm) removed at the reference
    circle, usually half the backlash wanted in the mesh. Defaults are the ISO 53
    type A basic rack (20 degrees, addendum 1.0 m, dedendum 1.25 m, fillet 0.38 m).
    """

    teeth: int
    module: float  # mm
    form: str = "involute"  # "involute" | "triangular"
    pressure_angle_deg: float = 20.0
    tooth_angle_deg: float = 60.0  # triangular: included angle of one tooth
    shift: float = 0.0  # profile shift coefficient x
    addendum: float = 1.0  # x module
    dedendum: float = 1.25  # x module
    root_radius: float = 0.38  # x module: rack tip radius (involute) / root rounding
    tip_radius: float = 0.0  # x module: tip rounding (triangular)
    thinning: float = 0.0  # mm: tooth thickness removed at the reference circle
    # teeth per inch when the wheel is cut to a diametral pitch (the module is then
    # 25.4 / it); None for a module wheel. It names the cutter; the shape is the rest.
    diametral_pitch: float | None = None

    def __post_init__(self) -> None:
        if isinstance(self.teeth, bool) or int(self.teeth) != self.teeth:
            raise ValueError(f"'teeth' must be a whole number, got {self.teeth!r}")
        if self.teeth < 3:
            raise ValueError(f"'teeth' must be at least 3, got {self.teeth}")
        if not (math.isfinite(self.module) and self.module > 0):
            raise ValueError(f"'module' must be > 0 mm, got {self.module}")
        if self.form not in FORMS:
            raise ValueError(
                f"'form' must be one of {', '.join(map(repr, FORMS))}, got {self.form!r}"
            )
        if not 5.0 <= self.pressure_angle_deg <= 35.0:
            raise ValueError(
                "'pressure_angle_deg' must be from 5 to 35 degrees, "
                f"got {self.pressure_angle_deg}"
            )
        if not 10.0 <= self.tooth_angle_deg <= 120.0:
            raise ValueError(
                "'tooth_angle_deg' must be from 10 to 120 degrees, "
                f"got {self.tooth_angle_deg}"
            )
        for name in ("shift", "addendum", "dedendum", "root_radius", "tip_radius"):
            if not math.isfinite(getattr(self, name)):
                raise ValueError(f"'{name}' must be a finite number")
        if self.addendum <= 0 or self.dedendum <= 0:
            raise ValueError(
                "'addendum' and 'dedendum' must be > 0 (x module), "
                f"got {self.addendum} and {self.dedendum}"
            )
        if self.root_radius < 0 or self.tip_radius < 0:
            raise ValueError(
                "'root_radius' and 'tip_radius' must be >= 0 (x module), "
                f"got {self.root_radius} and {self.tip_radius}"
            )
        if not (math.isfinite(self.thinning) and self.thinning >= 0):
            raise ValueError(f"'thinning' must be >= 0 mm, got {self.thinning}")
        dp = self.diametral_pitch
        if dp is not None and not (
            math.isfinite(dp) and dp > 0 and math.isclose(self.module * dp, 25.4)
        ):
            raise ValueError(
                f"'diametral_pitch' {dp} does not give module {self.module} mm "
                "(module = 25.4 / diametral pitch)"
            )

    @property
    def reference_diameter(self) -> float:
        """Reference (pitch) diameter m z in mm."""
        return self.module * self.teeth


def thinning_for(backlash: float) -> float:
    """Tooth thickness (mm) taken off one wheel for the ``backlash`` (mm) it asks of its
    meshes: half of it, so that two wheels asking the same mesh with that much play."""
    return backlash / 2.0
