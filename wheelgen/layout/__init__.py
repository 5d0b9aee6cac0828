"""Layout: arbor positions, axial stacking, sleeve sizes and the train's parts.

Pure numeric (never the CAD kernel). Lengths in mm, angles in degrees.
"""

from .checks import layout_findings as layout_findings
from .parts import plan_parts as plan_parts
from .placement import arbor_positions as arbor_positions
from .plan import plan_layout as plan_layout

__all__ = [
    "arbor_positions",
    "layout_findings",
    "plan_layout",
    "plan_parts",
]
