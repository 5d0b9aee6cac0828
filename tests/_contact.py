"""Where a sharp corner of one wheel touches a straight flank of the other, by hand.

Used by the tests that check the mesh simulator and the pair's data sheet against a
contact worked out in closed form. The driver turns about the origin, the driven wheel
about ``(a, 0)``; corners and flanks are given in each wheel's own frame (mm).
"""

from __future__ import annotations

import math

import numpy as np

__all__ = ["rot", "touch_angles"]

Flank = tuple[np.ndarray, np.ndarray]


def rot(v: np.ndarray, a: float) -> np.ndarray:
    """``v`` turned by ``a`` radians counter-clockwise."""
    c, s = math.cos(a), math.sin(a)
    return np.array([c * v[0] - s * v[1], s * v[0] + c * v[1]])


def touch_angles(
    corners1: list[np.ndarray],
    flanks1: list[Flank],
    corners2: list[np.ndarray],
    flanks2: list[Flank],
    a: float,
    th1: float,
) -> list[float]:
    """Every driven angle (radians) at which a corner of one wheel lies on a flank of
    the other, the driver turned by ``th1``.

    Derived by hand: a driver corner at polar (rho, beta) about the driven centre lies
    on the driven flank n.x = c (normal angle nu, driven frame) turned by t2 when
    rho cos(beta - nu - t2) = c, so t2 = beta - nu -+ acos(c / rho). A driven corner
    (|w|, beta_w) lies on the driver's turned flank n'.x = c' when
    n'.C + |w| cos(beta_w + t2 - nu') = c'. A root counts only if the touching point
    lies within the flank (between its two ends).
    """
    centre = np.array([a, 0.0])
    out: list[float] = []
    for v in corners1:
        vv = rot(v, th1) - centre
        rho, beta = math.hypot(*vv), math.atan2(vv[1], vv[0])
        for p0, p1 in flanks2:
            d = p1 - p0
            n = np.array([d[1], -d[0]]) / math.hypot(*d)
            c, nu = float(n @ p0), math.atan2(n[1], n[0])
            if abs(c) <= rho:
                for sg in (1.0, -1.0):
                    t2 = beta - nu - sg * math.acos(c / rho)
                    t = float((rot(vv, -t2) - p0) @ d / (d @ d))
                    if -1e-12 <= t <= 1 + 1e-12:
                        out.append(t2)
    for w in corners2:
        rw, bw = math.hypot(*w), math.atan2(w[1], w[0])
        for p0, p1 in flanks1:
            q0, q1 = rot(p0, th1), rot(p1, th1)
            d = q1 - q0
            n = np.array([d[1], -d[0]]) / math.hypot(*d)
            c, nu = float(n @ q0), math.atan2(n[1], n[0])
            q = (c - float(n @ centre)) / rw
            if abs(q) <= 1:
                for sg in (1.0, -1.0):
                    t2 = nu - bw + sg * math.acos(q)
                    t = float((centre + rot(w, t2) - q0) @ d / (d @ d))
                    if -1e-12 <= t <= 1 + 1e-12:
                        out.append(t2)
    return out
