"""The display: dials, hands, the knob or crank, their motion and their checks.

Pure numeric (numpy and fractions, never the CAD kernel). Heights in front of the front
plate come from :mod:`wheelgen.layout.front`; this package sizes and places the parts
(:mod:`.plan`), draws their flat profiles (:mod:`.outlines`), graduates the dials
(:mod:`.graduations`), turns the hands with the train (:mod:`.motion`) and checks that
they clear each other and the frame (:mod:`.checks`). Lengths in mm, angles in degrees.
"""

from .graduations import dial_scale as dial_scale
from .plan import display_plan as display_plan

__all__ = ["dial_scale", "display_plan"]
