"""Involute teeth as the rack generates them: involute function, exact flank points,
spline accuracy, the root trochoid, undercut, and a simulated rack cutter.

Sources (docs/references.md sections 3 and 6):
- INV_SHEET: "Involute Function for Gears", a gear shop's table,
  scribd.com/doc/171344826
- CALCLIB: calculatorlib.com/involute-function-calculator, inv 20 deg = 0.014904
- MH_INV: Machinery's Handbook, 27th ed., involute function tables, p. 104 (from memory)
- SDP_T36: Elements of Metric Gear Technology (SDP/SI D785), section 4.3, p. T-36:
  z_c = 32 at 14.5 deg, 18 at 20 deg
- OKDOR: okdor.com/prevent-gear-undercut-in-design: 12 teeth at 25 deg
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.interpolate import CubicSpline

from wheelgen.teeth import (
    ToothSpec,
    inverse_involute_deg,
    involute_function,
    outline_for,
)
from wheelgen.teeth.gear_data import undercut_limit_teeth
from wheelgen.teeth.involute import involute_points
from wheelgen.teeth.involute_tooth import generate_tooth, involute_outline
from wheelgen.teeth.trochoid import fillet_trochoid

INVOLUTE_TABLE = [
    (14.5, 0.00554, 5e-6, "INV_SHEET (prints 5 decimals)"),
    (20.0, 0.014904, 5e-7, "CALCLIB (prints 6 decimals)"),
    (25.0, 0.029975, 5e-7, "MH_INV, from memory (6 decimals)"),
]


@pytest.mark.parametrize(("alpha_deg", "published", "tol", "source"), INVOLUTE_TABLE)
def test_involute_function_matches_table(alpha_deg, published, tol, source):
    assert involute_function(alpha_deg) == pytest.approx(published, abs=tol), source


@pytest.mark.parametrize("alpha_deg", [0.5, 5.0, 14.5, 20.0, 26.0886, 40.0, 60.0, 80.0])
def test_inverse_involute_round_trip(alpha_deg):
    # derived: inverse of inv(a) = tan a - a
    assert inverse_involute_deg(involute_function(alpha_deg)) == pytest.approx(
        alpha_deg, abs=1e-10
    )


def test_involute_points_unwrap_the_base_circle():
    # derived: the involute point at roll t lies at rb sqrt(1 + t^2), and the string
    # unwound from the base circle has length rb t (the tangent from the point).
    pts = involute_points(10.0, 0.0, 60.0, 7)
    t = np.radians(np.linspace(0.0, 60.0, 7))
    assert np.allclose(np.hypot(pts[:, 0], pts[:, 1]), 10.0 * np.sqrt(1 + t * t))
    tangent_pt = 10.0 * np.column_stack((np.cos(t), np.sin(t)))
    assert np.allclose(np.hypot(*(pts - tangent_pt).T), 10.0 * t)


def _parts(outline):
    """The lower trochoid and lower flank spline of one tooth."""
    splines = [s for s in outline.tooth if s.kind == "spline"]
    return splines[0], splines[1]


def _involute_error(gen, pts):
    """Circumferential distance (mm) of points from the lower flank's involute,
    from its polar equation theta(R) = -(psi + inv a) + inv(acos(rb / R))."""
    radius = np.hypot(pts[:, 0], pts[:, 1])
    t = np.sqrt(np.maximum((radius / gen.base_radius) ** 2 - 1, 0))
    theta = -(gen.half_angle_ref_rad + math.tan(gen.alpha_rad) - gen.alpha_rad) + (
        t - np.arctan(t)
    )
    return np.abs(np.arctan2(pts[:, 1], pts[:, 0]) - theta) * radius


CASES = [
    (z, x, m, th)
    for z in (5, 8, 12, 17, 25, 60, 150, 300)
    for x in (-0.3, 0.0, 0.5, 1.0)
    for m, th in ((1.0, 0.0), (2.5, 0.04))
]


@pytest.mark.parametrize(("z", "x", "m", "thinning"), CASES)
def test_flank_points_lie_on_the_involute(z, x, m, thinning):
    try:
        spec = ToothSpec(z, m, shift=x, thinning=thinning)
        outline = outline_for(spec)
    except ValueError:
        pytest.skip("no usable tooth for this spec")
    gen = generate_tooth(spec)
    _, flank = _parts(outline)
    assert _involute_error(gen, flank.points).max() < 1e-9
    # the flank runs from where the involute begins to the tip
    radius = np.hypot(*flank.points.T)
    assert radius[0] == pytest.approx(gen.form_radius, abs=1e-9)
    assert radius[-1] == pytest.approx(gen.tip_radius, abs=1e-9)
    # the upper flank is the mirror image: same points, y negated, reversed
    upper = [s for s in outline.tooth if s.kind == "spline"][2]
    assert np.allclose(upper.points[::-1] * [1, -1], flank.points, atol=1e-12)


@pytest.mark.parametrize("bc", ["not-a-knot", "natural"])
@pytest.mark.parametrize(
    ("z", "x"), [(6, 0.0), (12, 0.0), (17, 0.3), (40, -0.5), (300, 1.0)]
)
def test_spline_through_flank_points_stays_within_a_tenth_micrometre(z, x, bc):
    # module 10 mm, the coarsest we promise 0.1 um for; chord-length parameters as a
    # CAD kernel's interpolating spline uses; both common end conditions.
    spec = ToothSpec(z, 10.0, shift=x)
    gen = generate_tooth(spec)
    troch, flank = _parts(outline_for(spec))
    for seg in (flank, troch):
        p = seg.points
        s = np.concatenate(([0.0], np.cumsum(np.hypot(*np.diff(p, axis=0).T))))
        fine = CubicSpline(s, p, bc_type=bc)(np.linspace(0.0, s[-1], 3000))
        if seg is flank:
            err = _involute_error(gen, fine)
            # normal distance is at most the circumferential one
            assert err.max() < 1e-4, f"flank {err.max():.2e} mm"
        else:
            beta = np.linspace(0.0, gen.junction_beta_rad, 40001)
            exact = _tooth_frame(gen, fillet_trochoid(gen.cutter, gen.ref_radius, beta))
            err = _distance_to_polyline(fine[::10], exact)
            assert err < 1e-4, f"trochoid {err:.2e} mm"


def _tooth_frame(gen, pts):
    q = -math.pi / gen.teeth
    c, s = math.cos(q), math.sin(q)
    return np.column_stack(
        (c * pts[:, 0] - s * pts[:, 1], s * pts[:, 0] + c * pts[:, 1])
    )


def _distance_to_polyline(points, poly):
    a, b = poly[:-1], poly[1:]
    ab = b - a
    l2 = (ab**2).sum(1)
    worst = 0.0
    for p in points:
        t = np.clip(((p - a) * ab).sum(1) / l2, 0, 1)
        worst = max(worst, float(np.hypot(*(a + t[:, None] * ab - p).T).min()))
    return worst


@pytest.mark.parametrize("z", [18, 25, 40, 100])
def test_trochoid_meets_involute_tangentially_without_undercut(z):
    gen = generate_tooth(ToothSpec(z, 1.0))
    assert not gen.undercut
    _, flank = _parts(outline_for(ToothSpec(z, 1.0)))
    # the trochoid's own end point (before it is snapped to the involute) is the
    # involute's first point: where the cutter's fillet meets its straight flank
    end = _tooth_frame(
        gen,
        fillet_trochoid(gen.cutter, gen.ref_radius, np.array([gen.junction_beta_rad])),
    )[0]
    assert np.allclose(end, flank.points[0], atol=1e-9)
    # and the two curves share their direction there
    b = gen.junction_beta_rad
    near = _tooth_frame(
        gen, fillet_trochoid(gen.cutter, gen.ref_radius, np.array([b - 1e-6, b]))
    )
    d1 = near[1] - near[0]
    d2 = flank.points[1] - flank.points[0]
    turn = math.atan2(d1[0] * d2[1] - d1[1] * d2[0], d1 @ d2)
    assert abs(turn) < 2e-3  # limited by the chord of the first flank step


@pytest.mark.parametrize("z", [4, 6, 8, 10, 12, 14])
def test_undercut_junction_is_on_both_curves(z):
    spec = ToothSpec(z, 1.0)
    gen = generate_tooth(spec)
    assert gen.undercut and gen.form_radius > gen.base_radius
    troch, _ = _parts(outline_for(spec))
    exact_end = _tooth_frame(
        gen,
        fillet_trochoid(gen.cutter, gen.ref_radius, np.array([gen.junction_beta_rad])),
    )[0]
    assert np.allclose(exact_end, troch.points[-1], atol=1e-9)
    assert _involute_error(gen, troch.points[-1:])[0] < 1e-9


# Undercut with a "full depth" rack whose straight flank reaches exactly 1.0 m below
# the datum (dedendum 1.0, sharp tip): the textbook case, limit 2 / sin^2(alpha).
@pytest.mark.parametrize(
    ("alpha", "last_undercut", "first_free", "source"),
    [(20.0, 17, 18, "SDP_T36"), (14.5, 31, 32, "SDP_T36"), (25.0, 11, 12, "OKDOR")],
)
def test_generated_undercut_starts_at_the_textbook_limit(
    alpha, last_undercut, first_free, source
):
    def spec(z):
        return ToothSpec(
            z, 1.0, pressure_angle_deg=alpha, dedendum=1.0, root_radius=0.0
        )

    assert generate_tooth(spec(last_undercut)).undercut, source
    assert not generate_tooth(spec(first_free)).undercut, source
    assert undercut_limit_teeth(alpha) == pytest.approx(
        2 / math.sin(math.radians(alpha)) ** 2
    )


def test_iso53_rack_fillet_ends_just_short_of_one_module():
    # ISO 53 type A (h_fP 1.25, rho_fP 0.38): the straight flank ends at
    # 1.25 - 0.38 (1 - sin 20) = 0.99997 m (derived), so 17 teeth are undercut by a
    # hair and 18 are not, as with the textbook rack.
    assert generate_tooth(ToothSpec(17, 1.0)).undercut
    assert not generate_tooth(ToothSpec(18, 1.0)).undercut


# ---------------------------------------------------------------- rack simulation
def rack_depth(spec, points, step=2e-4):
    """For each point (tooth frame, mm) the deepest it lies inside the rack cutter
    over all roll angles (rad, spaced ``step``) that bring it within the cutter's
    reach; > 0 means the cutter removes it. Written from the cutter's definition:
    straight flanks at the pressure angle, width on the rolling line = pitch minus
    tooth thickness, tip line dedendum below the datum line, corners rounded with
    the root radius, rolling without slip on the reference circle."""
    m, z, x = spec.module, spec.teeth, spec.shift
    a = math.radians(spec.pressure_angle_deg)
    r = m * z / 2
    s = m * (math.pi / 2 + 2 * x * math.tan(a)) - spec.thinning
    w0 = (math.pi * m - s) / 2
    ut = (x - spec.dedendum) * m
    uroot = (x + spec.addendum) * m
    rho = spec.root_radius * m
    uc = ut + rho
    vc = max(w0 + uc * math.tan(a) - rho / math.cos(a), 0.0)
    q = math.pi / z  # tooth frame -> frame with the space on +X
    px = math.cos(q) * points[:, 0] - math.sin(q) * points[:, 1]
    py = math.sin(q) * points[:, 0] + math.cos(q) * points[:, 1]
    ang = np.arctan2(py, px)
    phis = np.arange(-math.pi / 2 - ang.max(), math.pi / 2 - ang.min() + step, step)
    best = np.full(len(points), -np.inf)
    for chunk in np.array_split(phis, max(1, len(phis) // 500)):
        c, sn = np.cos(chunk)[:, None], np.sin(chunk)[:, None]
        u = c * px - sn * py - r
        v = sn * px + c * py - r * chunk[:, None]
        pitch = math.pi * m
        v = np.abs(v - pitch * np.round(v / pitch))
        d_flank = (w0 + u * math.tan(a) - v) * math.cos(a)
        d_tip = u - ut
        du, dv = u - uc, v - vc
        corner = (du <= 0) & (dv >= 0) & (np.arctan2(dv, -du) <= math.pi / 2 - a)
        inside = np.where(
            corner,
            np.minimum(rho - np.hypot(du, dv), d_tip),
            np.minimum(d_flank, d_tip),
        )
        best = np.maximum(best, np.maximum(inside, u - uroot).max(axis=0))
    return best


RACK_CASES = [
    (3, 0.0, {}),
    (4, 0.5, {}),
    (5, -0.5, {}),
    (6, 0.0, {}),
    (8, 1.0, {}),
    (10, -0.5, {}),
    (12, 0.0, {"thinning": 0.05}),
    (17, 0.0, {}),
    (20, 0.3, {"pressure_angle_deg": 14.5}),
    (24, 0.0, {"pressure_angle_deg": 25.0, "root_radius": 0.2}),
    (40, -0.5, {"dedendum": 1.4, "root_radius": 0.39}),
    (100, 1.0, {}),
]


@pytest.mark.parametrize(("z", "x", "extra"), RACK_CASES)
def test_outline_is_what_a_rack_cutter_leaves(z, x, extra):
    spec = ToothSpec(z, 1.0, shift=x, **extra)
    outline = involute_outline(spec)
    pts, on_spline = [], []
    for seg in outline.tooth:
        p = seg.polyline(1e-4)
        pts.append(p)
        on_spline.append(np.full(len(p), seg.kind == "spline"))
    pts, on_spline = np.vstack(pts), np.concatenate(on_spline)
    depth = rack_depth(spec, pts)
    # no point of the outline lies inside the cutter at any moment ...
    assert depth.max() < 2e-6
    # ... and every flank and fillet point is touched by it at some moment
    # (what remains is the roll-angle step of the simulation)
    assert depth[on_spline].min() > -2e-6


def test_severed_tooth_is_refused():
    # 4 teeth at shift -0.5: the two fillet trochoids cross below the tooth
    with pytest.raises(ValueError, match="cuts through the root"):
        outline_for(ToothSpec(4, 1.0, shift=-0.5))


def test_pointed_tooth_ends_in_a_point():
    spec = ToothSpec(8, 1.0, shift=1.0)
    gen = generate_tooth(spec)
    assert gen.pointed and gen.tip_radius < gen.blank_tip_radius
    outline = outline_for(spec)
    assert all(
        s.kind != "arc" or np.hypot(*s.points[1]) < gen.tip_radius
        for s in outline.tooth
    )
    assert max(np.hypot(*s.points.T).max() for s in outline.tooth) == pytest.approx(
        gen.tip_radius, abs=1e-12
    )
