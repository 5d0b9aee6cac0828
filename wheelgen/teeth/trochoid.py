"""The root fillet a rack cutter leaves: the envelope of its tip fillet while rolling.

Frames as in :mod:`wheelgen.teeth.rack`; the result is in the wheel frame with the
tooth space centred on +X. Radians inside this module only.
"""

from __future__ import annotations

import math

import numpy as np

from .rack import CutterTip

__all__ = ["fillet_end_beta", "fillet_trochoid"]


def fillet_end_beta(pressure_angle_rad: float) -> float:
    """Fillet arc parameter (rad) where the fillet meets the straight flank."""
    return math.pi / 2.0 - pressure_angle_rad


def fillet_trochoid(
    tip: CutterTip, ref_radius: float, beta_rad: np.ndarray
) -> np.ndarray:
    """Points (mm) of the root trochoid for fillet arc parameters ``beta_rad``.

    ``beta`` runs from 0 (the fillet touching the tip line: the point lands on the
    root circle) to ``pi/2 - alpha`` (the fillet meeting the straight flank). The
    point of the fillet with outward normal (-cos b, sin b) is cutting when that
    normal passes through the pitch point (Willis: the common normal of generated
    and generating profile passes through the pitch point); this fixes the roll
    angle phi = -(v_c + u_c tan b) / r. The wheel-frame point is the rack point
    turned back by phi. Valid for a fillet centre on either side of the rolling line.
    """
    b = np.asarray(beta_rad, dtype=float)
    r = ref_radius
    phi = -(tip.centre_v + tip.centre_u * np.tan(b)) / r
    pu = tip.centre_u - tip.fillet * np.cos(b)
    pv = tip.centre_v + tip.fillet * np.sin(b)
    # the rack has moved r*phi along v while the wheel turned by phi
    gx, gy = r + pu, pv + r * phi
    c, s = np.cos(phi), np.sin(phi)
    return np.column_stack((c * gx + s * gy, -s * gx + c * gy))
