"""Triangular (straight-flanked) teeth, as on early instruments and hand-cut models.

The basic tooth is a triangle of the given included angle whose thickness on the
pitch circle is half the pitch (p = pi m); it is cut off by the tip circle
(``addendum`` x m above the pitch circle) and the root circle (``dedendum`` x m
below), with optional tip and root rounding. The thinning (half the backlash) turns
each flank about the wheel's centre by ``thinning / (2 r)`` towards the tooth's middle,
as if the wheel itself had turned: the flank keeps its distance from the centre, so its
angle to the radius at the pitch circle (what must match on two wheels that run
together) does not change, and the play grows by exactly the backlash. The tooth as
cut is then ``thinning / r`` radians more pointed than the basic one. Lengths in mm,
angles in degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .outline import Segment, WheelOutline
from .spec import ToothSpec

__all__ = [
    "TriangularTooth",
    "min_root_radius_for_cutter",
    "triangular_outline",
    "triangular_tooth",
]


def min_root_radius_for_cutter(cutter_diameter: float) -> float:
    """Smallest root rounding (mm) a milling cutter of ``cutter_diameter`` mm can leave.

    An end mill cannot cut an inside corner tighter than its own radius.
    """
    if cutter_diameter <= 0:
        raise ValueError(f"'cutter_diameter' must be > 0 mm, got {cutter_diameter}")
    return cutter_diameter / 2.0


@dataclass(frozen=True, slots=True)
class TriangularTooth:
    """The laid-out triangular tooth (mm; angles in radians inside).

    ``tip_radius`` and ``root_radius`` are the radii actually reached; ``pointed``
    says the triangle ends in a sharp apex below the tip circle.
    """

    teeth: int
    ref_radius: float
    tip_radius: float
    root_radius: float
    apex_radius: float
    pointed: bool
    tip_rounded: bool
    half_angle_rad: float  # half the included angle of the tooth as cut (thinned)
    tip_flat_half_rad: float  # half the angular width of the tip arc (0 if none)
    root_flat_half_rad: float  # half the angular width of the root arc (0 if none)
    flank_offset: float  # distance of each flank line from the wheel's centre
    v_radius: float  # where the flanks of neighbouring teeth meet (the space's V)
    segments: tuple[Segment, ...]

    @property
    def pitch_flank_angle_deg(self) -> float:
        """Angle (degrees) between a flank and the radius where it crosses the pitch
        circle: the flank line passes ``flank_offset`` from the centre, so the angle is
        asin(flank_offset / pitch radius)."""
        return math.degrees(math.asin(min(1.0, self.flank_offset / self.ref_radius)))


def _arc3(centre: np.ndarray, radius: float, p0: np.ndarray, p1: np.ndarray) -> Segment:
    a0 = math.atan2(p0[1] - centre[1], p0[0] - centre[0])
    a1 = math.atan2(p1[1] - centre[1], p1[0] - centre[0])
    da = (a1 - a0 + math.pi) % (2 * math.pi) - math.pi  # the short way round
    am = a0 + da / 2
    mid = centre + radius * np.array([math.cos(am), math.sin(am)])
    return Segment("arc", np.array([p0, mid, p1]))


def _polar(radius: float, angle: float) -> np.ndarray:
    return np.array([radius * math.cos(angle), radius * math.sin(angle)])


def triangular_tooth(spec: ToothSpec) -> TriangularTooth:
    """Lay out the triangular tooth of ``spec`` (form must be ``"triangular"``)."""
    if spec.form != "triangular":
        raise ValueError(f"'form' must be 'triangular' here, got {spec.form!r}")
    z, m = spec.teeth, spec.module
    r = m * z / 2.0
    ra = r + spec.addendum * m
    rf = r + (-spec.dedendum) * m
    if rf <= 0:
        raise ValueError(f"the root circle vanishes: dedendum {spec.dedendum} too deep")
    s = math.pi * m / 2.0 - spec.thinning
    if s <= 0:
        raise ValueError(f"'thinning' {spec.thinning} mm leaves no tooth")
    psi = s / (2.0 * r)
    # the basic flank turned about the centre by thinning / (2 r) towards the middle
    gam = math.radians(spec.tooth_angle_deg) / 2.0 + spec.thinning / (2.0 * r)
    half_space = math.pi / z
    # lower flank of the tooth on +X: through the pitch point at angle -psi, leaning
    # towards the tooth axis by the half included angle; n points into the space
    d = np.array([math.cos(gam), math.sin(gam)])
    n = np.array([math.sin(gam), -math.cos(gam)])
    p0 = _polar(r, -psi)
    c = float(n @ p0)
    apex_x = r * math.cos(psi) + r * math.sin(psi) / math.tan(gam)
    rho_f, rho_t = spec.root_radius * m, spec.tip_radius * m
    e_space = np.array([math.cos(half_space), -math.sin(half_space)])
    v_sin = math.sin(gam + half_space)  # sine of the half angle of the V space
    if gam + half_space > math.pi / 2 + 1e-12:
        # the flanks of neighbouring teeth would diverge towards the centre
        most = 180.0 - 360.0 / z - math.degrees(spec.thinning / r)
        raise ValueError(
            f"'tooth_angle_deg' must be at most {most:.4g} degrees for {z} teeth "
            f"thinned by {spec.thinning:g} mm, got {spec.tooth_angle_deg}"
        )

    def on_line(p: np.ndarray) -> float:
        return float(d @ (p - c * n))  # position along the flank

    # ---- root end of the lower flank
    t_v = c / v_sin  # where the flank meets the space axis
    root_segs: list[Segment] = []
    root_flat_half = 0.0

    def v_round() -> tuple[np.ndarray, float]:
        # rounding tangent to both flanks of the space, centred on the space axis
        q = (t_v + rho_f / v_sin) * e_space
        bottom = q - rho_f * e_space
        root_segs.append(_arc3(q, rho_f, bottom, q - rho_f * n))
        return q - rho_f * n, float(np.hypot(*bottom))

    if t_v >= rf:  # V-shaped space, root circle never reached
        if rho_f > 0 and v_sin < 1.0 - 1e-12:  # (a flat 180 degree V needs none)
            flank_lo, root_actual = v_round()
        else:
            flank_lo, root_actual = t_v * e_space, t_v
    elif rho_f > 0:
        lam = math.sqrt((rf + rho_f) ** 2 - (c + rho_f) ** 2)
        q = (c + rho_f) * n + lam * d
        if math.atan2(q[1], q[0]) <= -half_space:
            # the roundings of the two flanks would cross in the middle of the space:
            # one rounding tangent to both flanks, which stays above the root circle
            flank_lo, root_actual = v_round()
        else:
            root_actual = rf
            flank_lo = q - rho_f * n
            on_root = q * (rf / float(np.hypot(*q)))
            a_q = math.atan2(on_root[1], on_root[0])
            if a_q > -half_space + 1e-12:
                root_segs.append(_arc(rf, -half_space, a_q))
                root_flat_half = a_q + half_space
            root_segs.append(_arc3(q, rho_f, on_root, flank_lo))
    else:
        root_actual = rf
        lam = math.sqrt(rf * rf - c * c)
        flank_lo = c * n + lam * d
        a_lo = math.atan2(flank_lo[1], flank_lo[0])
        root_segs.append(_arc(rf, -half_space, a_lo))
        root_flat_half = a_lo + half_space

    # ---- tip end of the lower flank
    tip_segs: list[Segment] = []
    pointed = False
    tip_rounded = rho_t > 0
    flat_half = 0.0

    def full_round(rho: float) -> tuple[np.ndarray, float]:
        q = np.array([apex_x - rho / math.sin(gam), 0.0])
        t = q + rho * n
        top = np.array([q[0] + rho, 0.0])
        tip_segs.append(_arc3(q, rho, t, top))
        tip_segs.append(_arc3(q, rho, top, t * np.array([1.0, -1.0])))
        return t, float(top[0])

    if apex_x <= ra:
        if rho_t > 0:
            flank_hi, tip_actual = full_round(rho_t)
        else:
            flank_hi, tip_actual, pointed = np.array([apex_x, 0.0]), apex_x, True
    else:
        tip_actual = ra
        if rho_t > 0:
            lam = math.sqrt((ra - rho_t) ** 2 - (c - rho_t) ** 2)
            q = (c - rho_t) * n + lam * d
            if q[1] >= 0:  # corner roundings would overlap: round the whole tip
                flank_hi, tip_actual = full_round(rho_t)
            else:
                flank_hi = q + rho_t * n
                on_tip = q * (ra / float(np.hypot(*q)))
                tip_segs.append(_arc3(q, rho_t, flank_hi, on_tip))
                flat_half = -math.atan2(on_tip[1], on_tip[0])
                tip_segs.append(_arc(ra, -flat_half, flat_half))
                tip_segs.append(
                    _arc3(
                        q * np.array([1.0, -1.0]),
                        rho_t,
                        on_tip * np.array([1.0, -1.0]),
                        flank_hi * np.array([1.0, -1.0]),
                    )
                )
        else:
            lam = math.sqrt(ra * ra - c * c)
            flank_hi = c * n + lam * d
            flat_half = -math.atan2(flank_hi[1], flank_hi[0])
            tip_segs.append(_arc(ra, -flat_half, flat_half))

    if on_line(flank_hi) <= on_line(flank_lo) + 1e-9 * m:
        raise ValueError(
            "tip and root rounding leave no straight flank: reduce 'tip_radius', "
            "'root_radius' or the depth"
        )
    lower = [*root_segs, Segment("line", np.array([flank_lo, flank_hi]))]
    if pointed:
        lower[-1] = Segment("line", np.array([flank_lo, [apex_x, 0.0]]))
    chain = [*lower, *tip_segs]
    for seg in reversed(lower):
        chain.append(Segment(seg.kind, seg.points[::-1] * np.array([1.0, -1.0])))
    return TriangularTooth(
        teeth=z,
        ref_radius=r,
        tip_radius=tip_actual,
        root_radius=root_actual,
        apex_radius=apex_x,
        pointed=pointed,
        tip_rounded=tip_rounded and not pointed,
        half_angle_rad=gam,
        tip_flat_half_rad=flat_half,
        root_flat_half_rad=root_flat_half,
        flank_offset=c,
        v_radius=t_v,
        segments=tuple(chain),
    )


def _arc(radius: float, a0: float, a1: float) -> Segment:
    am = 0.5 * (a0 + a1)
    return Segment(
        "arc", np.array([_polar(radius, a0), _polar(radius, am), _polar(radius, a1)])
    )


def triangular_outline(spec: ToothSpec) -> WheelOutline:
    """The wheel outline of a triangular ``spec``."""
    tooth = triangular_tooth(spec)
    radii = {
        "pitch": tooth.ref_radius,
        "tip": tooth.tip_radius,
        "root": tooth.root_radius,
    }
    return WheelOutline(teeth=spec.teeth, tooth=tooth.segments, radii=radii)
