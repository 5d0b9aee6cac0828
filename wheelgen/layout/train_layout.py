"""One layout of a design: axis positions, sleeve sizes and axial stacking, computed once.

Every other layout module (collisions, drilling chart, parts) reads from this.
Lengths in mm.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

from ..design.model import Design
from ..kinematics.rates import axis_root
from .placement import LOOP_TOLERANCE, AxisPositions, place_axes
from .sleeves import SleeveSize, member_outside, size_sleeves
from .stacking import Stacking, stack_axes

__all__ = ["Layout", "plan_layout"]


@dataclass(frozen=True, slots=True)
class Layout:
    """Positions of axis roots (mm, carriers at 0), sleeve sizes and the stacking."""

    design: Design
    placing: AxisPositions
    sizes: dict[str, SleeveSize]
    stacking: Stacking

    def position(self, arbor: str) -> tuple[float, float] | None:
        """Axis position (mm) of any arbor or sleeve, or ``None`` if it is not placed."""
        return self.placing.positions.get(axis_root(self.design, arbor))

    def outside(self, arbor: str) -> float:
        """Outside diameter (mm) of an arbor or sleeve."""
        return member_outside(self.design, self.sizes, arbor)


@lru_cache(maxsize=16)
def _plan(design: Design, tolerance: float) -> Layout:
    placing = place_axes(design, tolerance)
    sizes = size_sleeves(design)
    stacking = stack_axes(design, sizes, placing.positions)
    return Layout(design, placing, sizes, stacking)


def plan_layout(design: Design, tolerance: float = LOOP_TOLERANCE) -> Layout:
    """The layout of ``design``; loops must close within ``tolerance`` mm.

    Cached per design (designs are frozen), so the checks, the parts and the drilling
    chart share one computation.
    """
    return _plan(design, float(tolerance))
