"""The frame: plates, pillars, cocks, their holes and fixings (pure numeric).

Everything here is plain numbers (numpy), never the CAD kernel; the parts it plans are
built by :mod:`wheelgen.solids`. Lengths in mm, angles in degrees.
"""

from .checks import frame_findings as frame_findings
from .parts import frame_parts as frame_parts
from .parts import to_cocks as to_cocks
from .plan import plan_frame as plan_frame

__all__ = ["frame_findings", "frame_parts", "plan_frame", "to_cocks"]
