"""Shared helpers for the solids/export tests: an exact involute outline built here.

The involute is computed in the test from its definition (polar form
theta(r) = psi_b - inv(arccos(r_b / r))), independently of wheelgen.teeth, so the
CAD layer is measured against the curve itself and not against its own input.
"""

from __future__ import annotations

import math

import numpy as np

from wheelgen.teeth.outline import Segment, WheelOutline


def inv(a: float) -> float:
    return math.tan(a) - a


def involute_half_angle(z: int, m: float, r: float, alpha_deg: float = 20.0) -> float:
    """Polar half angle (rad) of a zero-backlash, unshifted tooth at radius r (mm).

    Derived: half tooth angle at the reference circle is pi/(2z) (s = pi m / 2);
    along the involute the polar angle changes by inv(alpha_r) - inv(alpha).
    """
    alpha = math.radians(alpha_deg)
    rb = m * z * math.cos(alpha) / 2
    return math.pi / (2 * z) + inv(alpha) - inv(math.acos(min(1.0, rb / r)))


def involute_outline(z: int, m: float = 1.0, n_flank: int = 24) -> WheelOutline:
    """Standard tooth (ha = 1 m, hf = 1.25 m, 20 deg), root circle arcs, exact flanks."""
    alpha = math.radians(20.0)
    r = m * z / 2
    rb = r * math.cos(alpha)
    ra, rf = r + m, r - 1.25 * m
    r0 = max(rb, rf)
    # flank points evenly spaced in roll angle from r0 to ra
    t = np.linspace(
        math.sqrt((r0 / rb) ** 2 - 1), math.sqrt((ra / rb) ** 2 - 1), n_flank
    )
    radii = rb * np.sqrt(1 + t**2)
    th = np.array([involute_half_angle(z, m, q) for q in radii])
    pol = lambda rr, a: np.array([rr * math.cos(a), rr * math.sin(a)])  # noqa: E731
    lower = np.column_stack((radii * np.cos(-th), radii * np.sin(-th)))
    upper = lower[::-1] * np.array([1.0, -1.0])
    half = math.pi / z
    segs = []
    a_root = th[0]
    if rf < rb:
        segs.append(
            Segment(
                "arc",
                np.array(
                    [pol(rf, -half), pol(rf, -(half + a_root) / 2), pol(rf, -a_root)]
                ),
            )
        )
        segs.append(Segment("line", np.array([pol(rf, -a_root), lower[0]])))
    else:
        segs.append(
            Segment(
                "arc",
                np.array([pol(rf, -half), pol(rf, -(half + a_root) / 2), lower[0]]),
            )
        )
    segs.append(Segment("spline", lower))
    segs.append(Segment("arc", np.array([lower[-1], pol(ra, 0.0), upper[0]])))
    segs.append(Segment("spline", upper))
    if rf < rb:
        segs.append(Segment("line", np.array([upper[-1], pol(rf, a_root)])))
        segs.append(
            Segment(
                "arc",
                np.array(
                    [pol(rf, a_root), pol(rf, (half + a_root) / 2), pol(rf, half)]
                ),
            )
        )
    else:
        segs.append(
            Segment(
                "arc",
                np.array([upper[-1], pol(rf, (half + a_root) / 2), pol(rf, half)]),
            )
        )
    return WheelOutline(z, tuple(segs), {"pitch": r, "base": rb, "tip": ra, "root": rf})
