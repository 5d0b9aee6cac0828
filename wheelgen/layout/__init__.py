"""Layout: arbor positions, axial stacking, sleeve sizes and the train's parts.

Pure numeric (never the CAD kernel). Lengths in mm, angles in degrees.
"""

from .placement import arbor_positions as arbor_positions
from .train_layout import plan_layout as plan_layout
from .train_parts import train_parts as train_parts

__all__ = [
    "arbor_positions",
    "plan_layout",
    "train_parts",
]
