"""Metric machine screws that fix pillars and cocks: the sizes a design may name.

Plain numbers from published tables, in mm, for the ISO metric coarse threads from M2 to
M5 (the sizes of model frames):

- pitch ``P``: ISO 261, coarse series;
- clearance hole: ISO 273, medium series (M2 2.4, M2.5 2.9, M3 3.4, M4 4.5, M5 5.5);
- tap drill: ``d - P``, the drill for a coarse thread of about 75 % depth (ISO 2306
  lists these drills; the rule gives the same values for these sizes);
- thread core (minor diameter of the screw): ``d - 1.226869 P``, ISO 724 (``d3``);
- head: ISO 4762 socket head cap screw, head diameter ``dk`` max and height ``k`` max
  (``k = d``);
- lengths: the preferred lengths of ISO 4762 up to 60 mm.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["SCREWS", "SCREW_LENGTHS", "Screw", "screw"]


@dataclass(frozen=True, slots=True)
class Screw:
    """One metric screw size; every length in mm."""

    name: str  # "M3"
    diameter: float
    pitch: float
    clearance_hole: float  # ISO 273 medium
    head_diameter: float  # ISO 4762 dk max
    head_height: float  # ISO 4762 k max

    @property
    def tap_drill(self) -> float:
        """Drill before tapping, mm: ``d - P``."""
        return round(self.diameter - self.pitch, 4)

    @property
    def core(self) -> float:
        """Minor diameter of the screw's thread (ISO 724 ``d3``), mm."""
        return round(self.diameter - 1.226869 * self.pitch, 4)


#: The sizes a design may name in ``[frame] screw``.
SCREWS: dict[str, Screw] = {
    s.name: s
    for s in (
        Screw("M2", 2.0, 0.4, 2.4, 3.8, 2.0),
        Screw("M2.5", 2.5, 0.45, 2.9, 4.5, 2.5),
        Screw("M3", 3.0, 0.5, 3.4, 5.5, 3.0),
        Screw("M4", 4.0, 0.7, 4.5, 7.0, 4.0),
        Screw("M5", 5.0, 0.8, 5.5, 8.5, 5.0),
    )
}

#: Preferred lengths (mm) of ISO 4762 socket head cap screws, up to 60 mm.
SCREW_LENGTHS: tuple[float, ...] = (
    3.0, 4.0, 5.0, 6.0, 8.0, 10.0, 12.0, 16.0, 20.0, 25.0, 30.0, 35.0, 40.0, 45.0,
    50.0, 55.0, 60.0,
)  # fmt: skip


def screw(name: str) -> Screw:
    """The screw called ``name`` ("M3"); ``ValueError`` naming the sizes known."""
    try:
        return SCREWS[name]
    except KeyError:
        raise ValueError(
            f"'screw' must be one of {', '.join(SCREWS)}, got {name!r}"
        ) from None
