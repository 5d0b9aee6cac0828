"""The data sheet of a wheel with triangular (straight-flanked) teeth.

Only what belongs to straight flanks: tooth and space angles, the flank's angle at the
pitch circle, widths at the pitch, tip and root circles, and the cutter that makes one
space. Lengths in mm, angles in degrees; widths are chords (what calipers measure)
unless they say arc.

Every width follows from one fact: a straight flank passes at a fixed distance ``e``
from the wheel's centre (``TriangularTooth.flank_offset``), so at radius ``R`` it stands
at the polar angle ``asin(e / R) - gamma`` from the tooth's middle, ``gamma`` being half
the tooth angle (derived in :func:`half_thickness_rad`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields

from .limits import tip_thickness, tooth_verdicts
from .spec import ToothSpec
from .triangular import triangular_tooth

__all__ = ["TriangularData", "half_thickness_rad", "triangular_data"]


@dataclass(frozen=True, slots=True)
class TriangularData:
    """One triangular wheel's data sheet (mm, degrees).

    ``tooth_angle_deg`` is the included angle of a tooth as cut, ``basic_angle_deg``
    the one asked for (before the backlash turned the flanks in),
    ``space_angle_deg`` the included angle between the two flanks that bound a space
    (that of a cutter which cuts one space), ``flank_angle_deg`` the angle between a
    flank and the radius where it crosses the pitch circle (equal on two wheels that
    run smoothly together).
    ``tip_width`` is the tooth's chord where its straight flanks reach the tip circle,
    ``tip_land`` what is left of it between the tip roundings; ``root_width`` the
    space's chord where the flanks reach the root circle (0: they meet above it in a
    V), ``root_land`` what is left between the root roundings. A cutter ground to
    the space as cut is ``cutter_angle_deg`` included, ``cutter_depth`` deep from
    the blank's rim, ``cutter_tip_width`` across its flat and rounded by
    ``cutter_tip_radius``; the usual cutter, ground to the basic space and fed a
    little further for the backlash, is :func:`wheelgen.teeth.triangular_cut`'s.
    """

    teeth: int
    module: float
    tooth_angle_deg: float
    basic_angle_deg: float
    space_angle_deg: float
    flank_angle_deg: float
    pitch_diameter: float
    tip_diameter: float
    root_diameter: float
    circular_pitch: float
    thinning: float
    pitch_thickness_arc: float
    pitch_thickness_chord: float
    tip_width: float
    tip_land: float
    tip_rounding: float
    root_width: float
    root_land: float
    root_rounding: float
    pointed: bool
    v_root: bool
    blank_diameter: float
    cutter_angle_deg: float
    cutter_depth: float
    cutter_tip_width: float
    cutter_tip_radius: float
    warnings: tuple[str, ...]

    def as_dict(self) -> dict[str, object]:
        """Plain dict (for JSON)."""
        return {f.name: getattr(self, f.name) for f in fields(self)}


def half_thickness_rad(
    flank_offset: float, half_angle_rad: float, radius: float
) -> float:
    """Half the angular thickness (radians) of a straight-flanked tooth at ``radius`` mm.

    The flank line is ``flank_offset`` mm from the centre; the foot of the
    perpendicular lies at polar angle ``gamma - 90 deg`` (lower flank, ``gamma`` half the
    tooth angle), and the point at radius R lies ``acos(e / R)`` further round, so the
    flank's polar angle is ``asin(e / R) - gamma`` below the tooth's middle (derived).
    """
    return math.asin(min(1.0, flank_offset / radius)) - half_angle_rad


def triangular_data(spec: ToothSpec) -> TriangularData:
    """The data sheet of the triangular wheel ``spec``."""
    tooth = triangular_tooth(spec)
    z, m = spec.teeth, spec.module
    r = tooth.ref_radius
    e, gam = tooth.flank_offset, tooth.half_angle_rad
    r_tip = r + spec.addendum * m  # the tip circle before the flanks may meet below it
    r_root = r - spec.dedendum * m
    half_space = math.pi / z
    psi = half_thickness_rad(e, gam, r)
    tip_half = 0.0 if tooth.pointed else half_thickness_rad(e, gam, r_tip)
    root_half = max(0.0, half_space - half_thickness_rad(e, gam, r_root))
    if tooth.v_radius >= r_root:
        root_half = 0.0  # the flanks of neighbouring teeth meet above the root circle
    warnings = [v.message for v in tooth_verdicts(spec)]
    tooth_angle = math.degrees(2 * gam)
    space_angle = tooth_angle + 360.0 / z
    root_width = 2 * r_root * math.sin(root_half)
    return TriangularData(
        teeth=z,
        module=m,
        tooth_angle_deg=tooth_angle,
        basic_angle_deg=spec.tooth_angle_deg,
        space_angle_deg=space_angle,
        flank_angle_deg=tooth.pitch_flank_angle_deg,
        pitch_diameter=2 * r,
        tip_diameter=2 * tooth.tip_radius,
        root_diameter=2 * tooth.root_radius,
        circular_pitch=math.pi * m,
        thinning=spec.thinning,
        pitch_thickness_arc=2 * r * psi,
        pitch_thickness_chord=2 * r * math.sin(psi),
        tip_width=2 * r_tip * math.sin(tip_half),
        tip_land=tip_thickness(spec),
        tip_rounding=spec.tip_radius * m,
        root_width=root_width,
        root_land=2 * r_root * math.sin(tooth.root_flat_half_rad),
        root_rounding=spec.root_radius * m,
        pointed=tooth.pointed,
        v_root=tooth.v_radius >= r_root,
        blank_diameter=2 * tooth.tip_radius,
        cutter_angle_deg=space_angle,
        cutter_depth=tooth.tip_radius - tooth.root_radius,
        cutter_tip_width=root_width,
        cutter_tip_radius=spec.root_radius * m,
        warnings=tuple(warnings),
    )
