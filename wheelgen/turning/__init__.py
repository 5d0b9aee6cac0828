"""Arbors and tubes as made: pivots, seats, shoulders, collars and their fits (numeric).

Plain numbers only (no CAD kernel). :func:`turned_parts` finishes the part plan of
:func:`wheelgen.parts.plan_parts`; :mod:`wheelgen.turning.limits` holds the numbers
every turned member is made to. Lengths in mm.
"""

from .plan import TurnedMember as TurnedMember
from .plan import turned_members as turned_members
from .plan import turned_parts as turned_parts

__all__ = ["TurnedMember", "turned_members", "turned_parts"]
