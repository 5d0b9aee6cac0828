"""Cutting triangular teeth with a form (fly) cutter, and checking them over pins.

A form cutter for straight-flanked teeth is ground to the **space** between two teeth
of the basic tooth (before any backlash): its included angle is the tooth angle plus
one pitch angle, ``b + 360 / z`` degrees, because the two flanks of a space belong to
neighbouring teeth whose middles are ``360 / z`` apart (derived in
:func:`basic_space_angle_deg`). Fed in to the full depth it cuts the basic tooth; the
backlash thinning comes from feeding it a little further. Fed in ``d`` beyond the full
depth along the space's middle, each cutter flank moves ``d sin(sigma / 2)`` towards
the tooth (``sigma`` the space angle), so a flank at distance ``e`` from the wheel's
centre comes to ``e - d sin(sigma / 2)``; :func:`triangular_cut` solves that for the
thinning asked for, exactly.

The check: a pin laid in a space touches its two straight flanks; the pin that touches
them on the pitch circle gives the size over two pins (or balls, odd counts) from which
the machinist reads how far to feed. Lengths in mm, angles in degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from .spec import ToothSpec
from .triangular import triangular_tooth
from .triangular_data import triangular_data

__all__ = ["TriangularCut", "basic_space_angle_deg", "triangular_cut"]


@dataclass(frozen=True, slots=True)
class TriangularCut:
    """How to cut one triangular wheel with a form cutter (mm, degrees).

    ``space_angle_deg`` is the cutter's included angle (the basic space),
    ``full_depth`` the depth from the blank's rim to the root that cuts the basic
    tooth, ``thinning`` the tooth thinning on the pitch circle (half the backlash),
    ``extra_infeed`` how much further the cutter goes in for it and ``infeed`` the
    whole feed from the rim (``full_depth + extra_infeed``). The cutter's tip is
    ``tip_width`` across its straight flanks, rounded by ``tip_radius`` (the wheel's
    root rounding); its shoulders are rounded by ``shoulder_radius`` (the wheel's tip
    rounding). ``pin_diameter`` touches the flanks on the pitch circle, ``over_pins``
    is the size over two of them (over balls for an odd count) once the wheel is cut to
    ``infeed``.
    """

    teeth: int
    module: float
    space_angle_deg: float
    full_depth: float
    thinning: float
    extra_infeed: float
    infeed: float
    tip_width: float
    tip_radius: float
    shoulder_radius: float
    pin_diameter: float
    over_pins: float


def basic_space_angle_deg(teeth: int, tooth_angle_deg: float) -> float:
    """Included angle (degrees) of the space between two basic triangular teeth.

    A tooth's flanks lean ``b / 2`` from its middle; the next tooth's middle lies
    ``360 / z`` further round, so the two flanks facing each other across the space
    meet at ``b / 2 + 360 / z + b / 2`` (derived): for 60-degree teeth on 56 teeth,
    66.43 degrees.
    """
    return tooth_angle_deg + 360.0 / teeth


def _flank_offset(radius: float, half_tooth_rad: float, half_angle_rad: float) -> float:
    # a straight flank crossing the circle of ``radius`` at half_tooth from the
    # tooth's middle, leaning half_angle towards it, passes r sin(psi + gamma) from the
    # centre (the inverse of triangular_data.half_thickness_rad)
    return radius * math.sin(half_tooth_rad + half_angle_rad)


def triangular_cut(spec: ToothSpec) -> TriangularCut:
    """The form cutter, feed and pin check of the triangular wheel ``spec``."""
    tooth = triangular_tooth(spec)
    basic = triangular_data(replace(spec, thinning=0.0))
    z, m = spec.teeth, spec.module
    r = m * z / 2.0
    gam = math.radians(spec.tooth_angle_deg) / 2.0
    half_space = gam + math.pi / z
    e0 = _flank_offset(r, math.pi / (2 * z), gam)
    e_cut = _flank_offset(r, (math.pi * m / 2 - spec.thinning) / (2 * r), gam)
    extra = (e0 - e_cut) / math.sin(half_space)
    full_depth = basic.cutter_depth
    # the pin that touches both flanks where they cross the pitch circle
    along = math.sqrt(r * r - e_cut * e_cut)
    pin = round(2.0 * (along * math.tan(half_space) - e_cut), 2)
    centre = (e_cut + pin / 2.0) / math.sin(half_space)
    if z % 2:
        centre *= math.cos(math.pi / (2 * z))
    return TriangularCut(
        teeth=z,
        module=m,
        space_angle_deg=basic_space_angle_deg(z, spec.tooth_angle_deg),
        full_depth=full_depth,
        thinning=spec.thinning,
        extra_infeed=extra,
        infeed=full_depth + extra,
        tip_width=basic.cutter_tip_width,
        tip_radius=spec.root_radius * m,
        shoulder_radius=spec.tip_radius * m if tooth.tip_rounded else 0.0,
        pin_diameter=pin,
        over_pins=2 * centre + pin,
    )
