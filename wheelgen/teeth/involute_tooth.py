"""An involute wheel's tooth as a rack cutter generates it (ISO 53 basic rack).

The flank is the exact involute; the root is the trochoid the cutter's tip fillet
leaves, so small tooth counts show their real undercut. Where the trochoid cuts into
the involute (undercut) the two are joined at their computed intersection; otherwise
they meet tangentially where the fillet meets the cutter's straight flank.
Public lengths in mm, angles in degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from .involute import _inv, _inverse_inv, involute_polar
from .outline import Segment, WheelOutline
from .rack import BasicRack, CutterTip, cutter_tip
from .spec import ToothSpec
from .trochoid import fillet_end_beta, fillet_trochoid

__all__ = ["FLANK_POINTS", "GeneratedTooth", "generate_tooth", "involute_outline"]

#: Exact points per flank spline (Chebyshev-spaced in roll angle, so denser at both
#: ends, where the involute curves most and where spline end conditions act).
#: Measured (tests/test_teeth_involute.py): a chord-length cubic spline through 36
#: points keeps within 2e-7 x module (not-a-knot ends) or 1e-5 x module (natural
#: ends) of the true curve, i.e. inside 0.1 micrometre up to module 10.
FLANK_POINTS = 36
#: Exact points per root-trochoid spline (Chebyshev-spaced in the fillet parameter).
TROCHOID_POINTS = 36


@dataclass(frozen=True, slots=True)
class GeneratedTooth:
    """Everything the generation fixes about one involute wheel (mm, radians inside).

    ``form_radius`` is where the involute begins (the junction with the root
    trochoid); ``tip_radius`` is the tip actually reached (the pointed-tip radius if
    the flanks meet below the blank's tip circle). ``half_angle_ref_rad`` is half
    the tooth's angular thickness on the reference circle.
    """

    teeth: int
    module: float
    alpha_rad: float
    shift: float
    ref_radius: float
    base_radius: float
    blank_tip_radius: float
    tip_radius: float
    root_radius: float
    form_radius: float
    form_roll_rad: float
    tip_roll_rad: float
    half_angle_ref_rad: float
    undercut: bool
    pointed: bool
    junction_beta_rad: float
    cutter: CutterTip

    @property
    def base_start_angle_rad(self) -> float:
        """Polar angle where the lower flank's involute leaves the base circle."""
        return -(self.half_angle_ref_rad + _inv(self.alpha_rad))

    def half_angle_at(self, radius: float) -> float:
        """Half the angular tooth thickness (rad) at ``radius`` mm (>= base radius)."""
        a = math.acos(min(1.0, self.base_radius / radius))
        return self.half_angle_ref_rad + _inv(self.alpha_rad) - _inv(a)


def _cheb(a: float, b: float, n: int) -> np.ndarray:
    k = np.arange(n)
    out = a + (b - a) * (1.0 - np.cos(np.pi * k / (n - 1))) / 2.0
    out[0], out[-1] = a, b
    return out


def rack_of(spec: ToothSpec) -> BasicRack:
    """The generating basic rack of an involute ``spec``."""
    return BasicRack(
        pressure_angle_deg=spec.pressure_angle_deg,
        addendum=spec.addendum,
        dedendum=spec.dedendum,
        root_radius=spec.root_radius,
    )


@lru_cache(maxsize=1024)  # specs are frozen and the result immutable; a train or a
# tooth-count search asks for the same wheels again and again
def generate_tooth(spec: ToothSpec) -> GeneratedTooth:
    """Generate the involute tooth of ``spec`` (form must be ``"involute"``)."""
    if spec.form != "involute":
        raise ValueError(f"'form' must be 'involute' here, got {spec.form!r}")
    z, m, x = spec.teeth, spec.module, spec.shift
    rack = rack_of(spec)
    alpha = math.radians(spec.pressure_angle_deg)
    r = m * z / 2.0
    rb = r * math.cos(alpha)
    ra = r + (spec.addendum + x) * m
    rf = r + (x - spec.dedendum) * m
    if rf <= 0:
        raise ValueError(
            f"the root circle vanishes: shift {x} is too negative for {z} teeth"
        )
    # ISO 21771: s = m (pi/2 + 2 x tan alpha); thinning removed on top
    s = m * (math.pi / 2.0 + 2.0 * x * math.tan(alpha)) - spec.thinning
    if s <= 0:
        raise ValueError(f"'thinning' {spec.thinning} mm leaves no tooth")
    psi = s / (2.0 * r)
    tip = cutter_tip(rack, m, x, s)

    theta_b = -(psi + _inv(alpha))
    turn = -math.pi / z  # space frame (space on +X) -> tooth frame (tooth on +X)
    beta_f = fillet_end_beta(alpha)
    # Where the straight flank meets the fillet, the cutter generates the involute at
    # roll t_F: the contact lies on the line of action at (r sin^2 a + u_F)/sin a
    # from the base-circle tangent point. Negative: the flank cuts below the
    # interference point, i.e. undercut.
    t_f = (r * math.sin(alpha) ** 2 + tip.flank_end_u) / (math.sin(alpha) * rb)
    undercut = t_f < -1e-12
    if not undercut:
        t_f = max(t_f, 0.0)
        beta_j = beta_f
        t_j = t_f
    else:
        beta_j, t_j = _undercut_junction(tip, r, rb, theta_b, turn, beta_f)
    form_radius = rb * math.sqrt(1.0 + t_j * t_j)
    # With very few teeth the fillet trochoids of the two flanks of one tooth can
    # cross below it (the cutter severs the tooth), or those of one space can cross
    # in the space; both leave no usable tooth.
    probe = _tooth_frame_trochoid(tip, r, turn, np.linspace(0.0, beta_j, 257))
    angle = np.arctan2(probe[:, 1], probe[:, 0])
    if probe[:, 1].max() > 1e-12 * m or angle.min() < turn - 1e-12:
        raise ValueError(
            f"the cutter cuts through the root of the tooth ({z} teeth, shift {x}): "
            "use more teeth or a larger shift"
        )

    # pointed tip: the flanks meet where inv(a_R) = psi + inv(alpha)
    half_tip = psi + _inv(alpha) - _inv(math.acos(rb / ra)) if ra > rb else 1.0
    pointed = half_tip <= 0.0
    if pointed:
        tip_r = rb / math.cos(_inverse_inv(psi + _inv(alpha)))
    else:
        tip_r = ra
    if tip_r <= form_radius + 1e-9 * m:
        raise ValueError(
            f"no involute left between the root fillet ({2 * form_radius:.4f} mm) and "
            f"the tip ({2 * tip_r:.4f} mm): check shift, addendum and dedendum"
        )
    t_a = math.sqrt((tip_r / rb) ** 2 - 1.0)
    return GeneratedTooth(
        teeth=z,
        module=m,
        alpha_rad=alpha,
        shift=x,
        ref_radius=r,
        base_radius=rb,
        blank_tip_radius=ra,
        tip_radius=tip_r,
        root_radius=rf,
        form_radius=form_radius,
        form_roll_rad=t_j,
        tip_roll_rad=t_a,
        half_angle_ref_rad=psi,
        undercut=undercut,
        pointed=pointed,
        junction_beta_rad=beta_j,
        cutter=tip,
    )


def _tooth_frame_trochoid(
    tip: CutterTip, r: float, turn: float, beta: np.ndarray
) -> np.ndarray:
    p = fillet_trochoid(tip, r, beta)
    c, s = math.cos(turn), math.sin(turn)
    return np.column_stack((c * p[:, 0] - s * p[:, 1], s * p[:, 0] + c * p[:, 1]))


def _undercut_junction(
    tip: CutterTip, r: float, rb: float, theta_b: float, turn: float, beta_f: float
) -> tuple[float, float]:
    """Fillet parameter and involute roll (rad) where the trochoid cuts the involute.

    g(beta) = polar angle of the trochoid point minus that of the involute at the
    same radius. Below the crossing the trochoid lies inside the involute (g > 0,
    it bounds the material); above, it runs in the space. The boundary switches at
    the last + to - change, found on a grid and refined by bisection to machine
    precision.
    """

    def g(beta: np.ndarray) -> np.ndarray:
        p = _tooth_frame_trochoid(tip, r, turn, beta)
        rad = np.hypot(p[:, 0], p[:, 1])
        ang = np.arctan2(p[:, 1], p[:, 0])
        t = np.sqrt(np.maximum((rad / rb) ** 2 - 1.0, 0.0))
        out = ang - (theta_b + t - np.arctan(t))
        return np.where(rad > rb, out, 1.0)

    grid = np.linspace(0.0, beta_f, 401)
    gv = g(grid)
    change = np.nonzero((gv[:-1] > 0) & (gv[1:] <= 0))[0]
    if len(change) == 0:  # pragma: no cover - geometry says this cannot happen
        raise ValueError("could not join the root trochoid to the involute flank")
    lo, hi = float(grid[change[-1]]), float(grid[change[-1] + 1])
    for _ in range(80):
        mid = 0.5 * (lo + hi)
        if mid in (lo, hi):
            break
        if g(np.array([mid]))[0] > 0:
            lo = mid
        else:
            hi = mid
    beta_j = lo
    p = _tooth_frame_trochoid(tip, r, turn, np.array([beta_j]))[0]
    rad = math.hypot(p[0], p[1])
    return beta_j, math.sqrt(max((rad / rb) ** 2 - 1.0, 0.0))


def _arc(radius: float, a0: float, a1: float) -> Segment:
    am = 0.5 * (a0 + a1)
    return Segment(
        "arc",
        np.array(
            [
                [radius * math.cos(a0), radius * math.sin(a0)],
                [radius * math.cos(am), radius * math.sin(am)],
                [radius * math.cos(a1), radius * math.sin(a1)],
            ]
        ),
    )


def _mirror_reversed(seg: Segment) -> Segment:
    pts = seg.points[::-1] * np.array([1.0, -1.0])
    return Segment(seg.kind, pts)


def involute_outline(spec: ToothSpec) -> WheelOutline:
    """The wheel outline of an involute ``spec``, generated by its basic rack.

    One tooth's chain: half root arc, root trochoid (spline), lower involute flank
    (spline), tip arc, upper flank, upper trochoid, half root arc. Spline points are
    exact: the flank points lie on the involute to rounding error, the trochoid
    points on the trochoid.
    """
    gen = generate_tooth(spec)
    z = gen.teeth
    r, rb = gen.ref_radius, gen.base_radius
    turn = -math.pi / z
    tip = gen.cutter

    lower: list[Segment] = []
    root_half = tip.centre_v / r  # the cutter's flat tip rolls out the root circle
    if root_half > 1e-12:
        lower.append(_arc(gen.root_radius, turn, turn + root_half))
    beta = _cheb(0.0, gen.junction_beta_rad, TROCHOID_POINTS)
    troch = _tooth_frame_trochoid(tip, r, turn, beta)
    troch[0] = [
        gen.root_radius * math.cos(turn + root_half),
        gen.root_radius * math.sin(turn + root_half),
    ]
    rolls = _cheb(gen.form_roll_rad, gen.tip_roll_rad, FLANK_POINTS)
    flank = involute_polar(rb, gen.base_start_angle_rad, rolls, sense=1)
    # the junction point belongs to both curves; take the involute's (exact) one
    troch[-1] = flank[0]
    if gen.pointed:
        flank[-1] = [gen.tip_radius, 0.0]
    lower.append(Segment("spline", troch))
    lower.append(Segment("spline", flank))
    chain = list(lower)
    if not gen.pointed:
        a_tip = math.atan2(flank[-1, 1], flank[-1, 0])
        chain.append(_arc(gen.tip_radius, a_tip, -a_tip))
    chain.extend(_mirror_reversed(seg) for seg in reversed(lower))
    radii = {
        "pitch": r,
        "base": rb,
        "tip": gen.tip_radius,
        "root": gen.root_radius,
        "form": gen.form_radius,
    }
    return WheelOutline(teeth=z, tooth=tuple(chain), radii=radii)
