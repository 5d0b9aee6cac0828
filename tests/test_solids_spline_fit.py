"""Fitted flank B-splines: few poles, within tolerance of the exact curves, exact ends.

The fit is measured here against the exact involute (its polar equation) at 2001
points per flank, none of them a point the fit used; the CAD tests measure the same
curves again after a STEP round trip. No CAD kernel is needed.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from wheelgen.solids.spline_fit import (
    SPLINE_FIT_TOLERANCE,
    fit_segments,
    fit_spline,
    spline_fit_deviation,
)
from wheelgen.teeth.forms import outline_for
from wheelgen.teeth.involute_tooth import FLANK_POINTS, generate_tooth
from wheelgen.teeth.spec import ToothSpec
from wheelgen.teeth.trochoid import fillet_trochoid


def _flank_normal_error(gen, pts: np.ndarray) -> np.ndarray:
    """Distance (mm) of points from the lower flank's involute, along its normal.

    derived: the involute's polar equation theta(R) = -(psi + inv a) + inv(acos(rb/R))
    gives the error along the circle; the involute's normal meets the circle at the
    pressure angle a_R of that radius, cos a_R = rb / R, so the normal distance is
    the circumferential one times rb / R (to first order, for errors this small).
    """
    r = np.hypot(pts[:, 0], pts[:, 1])
    t = np.sqrt(np.maximum((r / gen.base_radius) ** 2 - 1, 0))
    theta = -(gen.half_angle_ref_rad + math.tan(gen.alpha_rad) - gen.alpha_rad) + (
        t - np.arctan(t)
    )
    along_circle = np.abs(np.arctan2(pts[:, 1], pts[:, 0]) - theta) * r
    return along_circle * gen.base_radius / r


SPECS = [(8, 1.0, 0.0), (12, 1.0, 0.0), (17, 1.0, 0.3), (60, 2.5, -0.3),
         (127, 1.0, 0.0), (400, 1.0, 0.0), (20, 10.0, 0.0)]  # fmt: skip


@pytest.mark.parametrize(("z", "m", "x"), SPECS)
def test_fitted_flank_lies_on_the_exact_involute(z, m, x):
    spec = ToothSpec(z, m, shift=x)
    gen = generate_tooth(spec)
    flank = [s for s in outline_for(spec).tooth if s.kind == "spline"][1]
    fit = fit_spline(flank.points)
    pts = fit.evaluate(np.linspace(0.0, 1.0, 2001))
    # the reference spline through the exact points keeps within 2e-7 m of the
    # involute (tests/test_teeth_involute.py); the fit within the tolerance of that
    assert _flank_normal_error(gen, pts).max() <= SPLINE_FIT_TOLERANCE + 2e-7 * m
    # and it reaches both ends of the flank exactly: they are the edge's vertices
    assert np.array_equal(fit.poles[0], flank.points[0])
    assert np.array_equal(fit.poles[-1], flank.points[-1])


@pytest.mark.parametrize(("z", "m", "x"), SPECS)
def test_fitted_fillet_lies_on_the_exact_trochoid(z, m, x):
    from scipy.spatial import cKDTree

    spec = ToothSpec(z, m, shift=x)
    gen = generate_tooth(spec)
    fillet = [s for s in outline_for(spec).tooth if s.kind == "spline"][0]
    fit = fit_spline(fillet.points)
    q = -math.pi / z  # the generator's frame -> tooth frame
    rot = np.array([[math.cos(q), -math.sin(q)], [math.sin(q), math.cos(q)]])
    beta = np.linspace(0.0, gen.junction_beta_rad, 400_001)
    exact = fillet_trochoid(gen.cutter, gen.ref_radius, beta) @ rot.T
    # the first point is snapped onto the root circle and the last onto the involute
    # (both within nanometres), so check the inside of the curve
    pts = fit.evaluate(np.linspace(0.0, 1.0, 2001))[1:-1]
    d, i = cKDTree(exact).query(pts)
    # the exact polyline is so dense (steps of at most ~5e-6 m) that its own chord
    # error is below 1e-11 m; the nearest vertex is within half a step of the foot
    step = float(np.hypot(*np.diff(exact, axis=0).T).max())
    assert d.max() <= SPLINE_FIT_TOLERANCE + 2e-7 * m + step / 2


def test_few_poles_where_36_points_were_interpolated():
    # a 127-tooth module-1 wheel: measured 4 poles per flank and 7 per fillet
    fits = fit_segments(outline_for(ToothSpec(127, 1.0)).tooth)
    poles = [len(f.poles) for f in fits if f is not None]
    assert poles[1] <= 5 and poles[0] <= 8
    assert max(poles) < FLANK_POINTS


def test_upper_flank_reuses_the_lower_fit_mirrored():
    tooth = outline_for(ToothSpec(40, 1.0)).tooth
    fits = fit_segments(tooth)
    splines = [(s, f) for s, f in zip(tooth, fits) if f is not None]
    (_, low_fillet), (_, low), (up_seg, up), (_, up_fillet) = splines
    assert np.array_equal(up.poles, low.poles[::-1] * [1.0, -1.0])
    assert np.array_equal(up.poles[0], up_seg.points[0])
    assert np.array_equal(up_fillet.poles, low_fillet.poles[::-1] * [1.0, -1.0])
    # the same curve run backwards: a point at u is the mirror of the point at 1 - u
    u = np.linspace(0.0, 1.0, 11)
    assert np.allclose(up.evaluate(u), low.evaluate(1 - u) * [1, -1], atol=1e-12)


def test_turned_fit_ends_where_the_turned_segment_ends():
    outline = outline_for(ToothSpec(33, 1.0))
    seg = outline.tooth[2]
    fit = fit_spline(seg.points)
    for k in (1, 7, 32):
        a = k * outline.pitch_angle_deg
        assert np.array_equal(fit.rotated(a).poles[0], seg.rotated(a).points[0])
        assert np.array_equal(fit.rotated(a).poles[-1], seg.rotated(a).points[-1])


def test_deviation_is_what_an_independent_check_measures():
    seg = outline_for(ToothSpec(25, 1.0)).tooth[2]
    fit = fit_spline(seg.points)
    # spline_fit_deviation samples 4 times denser than the fit's own check
    again = spline_fit_deviation(seg.points, fit)
    assert again <= SPLINE_FIT_TOLERANCE
    assert again == pytest.approx(fit.deviation, rel=0.05)


def test_unreachable_tolerance_falls_back_to_interpolating_every_point():
    seg = outline_for(ToothSpec(25, 1.0)).tooth[2]
    fit = fit_spline(seg.points, tolerance=1e-15)
    assert len(fit.poles) == len(seg.points)
    # it passes through every exact point (at their chord-length parameters)
    s = np.concatenate(([0.0], np.cumsum(np.hypot(*np.diff(seg.points, axis=0).T))))
    assert np.abs(fit.evaluate(s / s[-1]) - seg.points).max() < 1e-12


def test_bad_input_says_what_is_allowed():
    with pytest.raises(ValueError, match=r"an \(n, 2\) array"):
        fit_spline(np.zeros((3, 3)))
    with pytest.raises(ValueError, match="'tolerance' must be > 0 mm"):
        fit_spline(np.array([[0.0, 0.0], [1.0, 0.0], [2.0, 1.0]]), tolerance=0.0)
