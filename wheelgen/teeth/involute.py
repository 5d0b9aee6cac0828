"""The involute of a circle: the involute function, its inverse and flank points.

Angles in degrees at the boundary, radians inside; lengths in mm.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import NDArray

__all__ = [
    "inverse_involute_deg",
    "involute_function",
    "involute_points",
    "involute_polar",
]

FloatArray = NDArray[np.float64]


def involute_function(alpha_deg: float) -> float:
    """inv(alpha) = tan(alpha) - alpha, with alpha in degrees; the result in radians."""
    a = math.radians(alpha_deg)
    return math.tan(a) - a


def _inv(a: float) -> float:
    return math.tan(a) - a


def _inverse_inv(value: float) -> float:
    """alpha (rad) with tan(alpha) - alpha = value, for 0 <= value."""
    if value < 0:
        raise ValueError(f"'value' must be >= 0, got {value}")
    if value == 0:
        return 0.0
    # start from the series inverse (good for small values), then Newton on
    # f(a) = tan a - a - v, f'(a) = tan^2 a; converges in a few steps.
    a = float(math.pow(3.0 * value, 1.0 / 3.0))
    a = min(a, 1.5)
    for _ in range(60):
        t = math.tan(a)
        step = (t - a - value) / (t * t)
        a_new = a - step
        if a_new <= 0:
            a_new = a / 2
        elif a_new >= math.pi / 2:
            a_new = (a + math.pi / 2) / 2
        if abs(a_new - a) < 1e-16:
            a = a_new
            break
        a = a_new
    return a


def inverse_involute_deg(value: float) -> float:
    """The angle in degrees whose involute function (radians) is ``value`` (>= 0)."""
    return math.degrees(_inverse_inv(value))


def involute_points(
    base_radius: float, roll_from_deg: float, roll_to_deg: float, count: int = 24
) -> FloatArray:
    """Points on one involute flank: a ``(count, 2)`` array of x, y in mm.

    The involute starts on the base circle (``base_radius`` mm) on +X and unwinds
    counter-clockwise; ``roll`` is the roll angle in degrees, evenly spaced.
    """
    if count < 2:
        raise ValueError(f"'count' must be at least 2, got {count}")
    roll_rad = np.radians(np.linspace(roll_from_deg, roll_to_deg, count))
    cos_r, sin_r = np.cos(roll_rad), np.sin(roll_rad)
    x, y = cos_r + roll_rad * sin_r, sin_r - roll_rad * cos_r
    return base_radius * np.column_stack((x, y))


def involute_polar(
    base_radius: float, start_angle_rad: float, roll_rad: FloatArray, sense: int = 1
) -> FloatArray:
    """Exact involute points (mm) for roll angles ``roll_rad`` (radians, >= 0).

    The involute leaves the base circle at polar angle ``start_angle_rad`` and turns
    towards increasing angle for ``sense = 1`` (decreasing for ``-1``). Computed in
    polar form r = rb sqrt(1 + t^2), theta = start + sense (t - atan t), which keeps
    full double precision (no cancellation near the base circle).
    """
    t = np.asarray(roll_rad, dtype=float)
    radius = base_radius * np.sqrt(1.0 + t * t)
    theta = start_angle_rad + sense * (t - np.arctan(t))
    return np.column_stack((radius * np.cos(theta), radius * np.sin(theta)))
