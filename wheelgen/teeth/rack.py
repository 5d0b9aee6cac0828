"""The basic rack (ISO 53) that generates involute teeth, and its cutter tooth.

Coefficients are multiples of the module; the cutter is the basic rack's counterpart,
so its tooth reaches ``dedendum`` below the datum line and ends in a fillet of radius
``root_radius`` that cuts the wheel's root.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = ["ISO_53_A", "BasicRack", "CutterTip", "cutter_tip"]


@dataclass(frozen=True, slots=True)
class BasicRack:
    """Basic rack profile; defaults are ISO 53:1998 type A.

    ``addendum``, ``dedendum`` and ``root_radius`` are multiples of the module;
    ``pressure_angle_deg`` is the flank angle in degrees.
    """

    pressure_angle_deg: float = 20.0
    addendum: float = 1.0
    dedendum: float = 1.25
    root_radius: float = 0.38

    def __post_init__(self) -> None:
        if not 5.0 <= self.pressure_angle_deg <= 35.0:
            raise ValueError(
                "'pressure_angle_deg' must be from 5 to 35 degrees, "
                f"got {self.pressure_angle_deg}"
            )
        if self.addendum <= 0 or self.dedendum <= 0 or self.root_radius < 0:
            raise ValueError(
                "rack 'addendum' and 'dedendum' must be > 0 and 'root_radius' >= 0, "
                f"got {self.addendum}, {self.dedendum}, {self.root_radius}"
            )

    @property
    def straight_flank_depth(self) -> float:
        """Depth (x module) below the datum where the cutter's straight flank ends."""
        a = math.radians(self.pressure_angle_deg)
        return self.dedendum - self.root_radius * (1.0 - math.sin(a))


#: ISO 53:1998 basic rack type A: 20 deg, h_aP = 1.00 m, h_fP = 1.25 m, rho_fP = 0.38 m.
ISO_53_A = BasicRack()


@dataclass(frozen=True, slots=True)
class CutterTip:
    """The cutter tooth in the rack frame, all in mm.

    Rack frame: ``u`` along the wheel radius, zero on the rolling line (the wheel's
    reference circle), negative towards the wheel centre; ``v`` along the rack. The
    cutter tooth is centred on ``v = 0``: ``half_width`` is its half width on the
    rolling line, the tip line is at ``u = tip_u`` and the fillet centre at
    (``centre_u``, ``centre_v``) with radius ``fillet``. ``flank_end_u`` is where
    the straight flank meets the fillet.
    """

    half_width: float
    tip_u: float
    centre_u: float
    centre_v: float
    fillet: float
    flank_end_u: float


def cutter_tip(
    rack: BasicRack, module: float, shift: float, tooth_thickness: float
) -> CutterTip:
    """The cutter tooth that generates a wheel of reference tooth thickness (mm).

    ``tooth_thickness`` is the wheel's tooth thickness on the reference circle (mm),
    already including profile shift and thinning; the cutter fills the space, so its
    width on the rolling line is the pitch minus that thickness.
    """
    alpha = math.radians(rack.pressure_angle_deg)
    half_width = (math.pi * module - tooth_thickness) / 2.0
    tip_u = (shift - rack.dedendum) * module
    fillet = rack.root_radius * module
    tip_half = half_width + tip_u * math.tan(alpha)  # half width of the sharp tip
    if tip_half <= 0:
        raise ValueError(
            "the cutter tooth comes to a point before its tip: dedendum "
            f"{rack.dedendum} x module is too deep for this tooth thickness"
        )
    centre_u = tip_u + fillet
    centre_v = half_width + centre_u * math.tan(alpha) - fillet / math.cos(alpha)
    if centre_v < -1e-12 * module:
        largest = tip_half * math.cos(alpha) / (1.0 - math.sin(alpha)) / module
        raise ValueError(
            f"'root_radius' must be at most {largest:.4f} x module for this rack "
            f"and tooth thickness, got {rack.root_radius}"
        )
    centre_v = max(centre_v, 0.0)
    return CutterTip(
        half_width=half_width,
        tip_u=tip_u,
        centre_u=centre_u,
        centre_v=centre_v,
        fillet=fillet,
        flank_end_u=centre_u - fillet * math.sin(alpha),
    )
