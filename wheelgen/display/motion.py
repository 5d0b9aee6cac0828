"""Where every hand points over time, and how long until two hands repeat their dance.

A hand turns with its arbor: its direction at time ``t`` is its direction at rest plus
the arbor's angle from :func:`wheelgen.kinematics.angles.arbor_angles` (the exact mean
rate and, behind a pin-and-slot coupling, the coupling's uneven motion). The reading is
that direction measured from the ring's zero, the way the hand turns, in the ring's
units.

Angles are degrees counter-clockwise from +x seen from the front (cumulative, not
wrapped); times are seconds from rest.
"""

from __future__ import annotations

import math
from fractions import Fraction
from typing import Iterable

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..design.model import Design
from ..kinematics.angles import AngleModel, angle_model, arbor_angles
from .plan import DisplayPlan, HandPlan, display_plan

__all__ = ["hand_angles_deg", "hand_reading", "joint_cycle_turns"]

FloatArray = NDArray[np.float64]


def hand_angles_deg(
    design: Design,
    times_s: ArrayLike,
    plan: DisplayPlan | None = None,
    model: AngleModel | None = None,
) -> dict[str, FloatArray]:
    """Each hand's direction (degrees, ccw from +x) at ``times_s``, by part name.

    A hand on an arbor that nothing drives keeps its rest direction.
    """
    plan = display_plan(design) if plan is None else plan
    t = np.asarray(times_s, dtype=float)
    arbors = arbor_angles(design, t, model) if plan.hands else {}
    out = {}
    for h in plan.hands:
        turn = arbors.get(h.part.arbor)
        rest = h.part.placement.angle_deg
        out[h.part.name] = rest + (turn if turn is not None else np.zeros_like(t))
    return out


def hand_reading(hand: HandPlan, angle_deg: ArrayLike) -> FloatArray:
    """What the hand reads on its ring at direction ``angle_deg``, in the ring's units.

    From the ring's zero the way the hand turns, wrapped to ``[0, units)``.
    """
    if hand.ring is None:
        raise ValueError(f"{hand.part.name} has no ring to read")
    ring = hand.ring
    a = np.asarray(angle_deg, dtype=float)
    turns = np.mod(ring.sense * (a - ring.zero_deg) / 360.0, 1.0)
    return np.asarray(turns * float(ring.scale.units), dtype=float)


def _lcm(a: Fraction, b: Fraction) -> Fraction:
    """Least common multiple of two positive fractions."""
    num = a.numerator * b.numerator // math.gcd(a.numerator, b.numerator)
    return Fraction(num, math.gcd(a.denominator, b.denominator))


def joint_cycle_turns(
    design: Design, arbors: Iterable[str], model: AngleModel | None = None
) -> Fraction | None:
    """Drive turns after which these arbors all stand as they started, exactly.

    The least common multiple of their turns and of the cycles of the couplings whose
    unevenness they carry; ``None`` when one of them is not driven. An arbor that stands
    still adds nothing.
    """
    model = angle_model(design) if model is None else model
    cycle = Fraction(0)
    for a in arbors:
        rate = model.rates.get(a)
        if rate is None:
            return None
        periods = [] if rate == 0 else [1 / abs(rate)]
        for c, coeff in model.terms.get(a, {}).items():
            if coeff != 0:
                turns = model.cycle_turns(c)
                if turns is not None:
                    periods.append(turns)
        for p in periods:
            cycle = p if cycle == 0 else _lcm(cycle, p)
    return cycle
