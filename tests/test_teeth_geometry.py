"""Geometry properties of generated outlines: closed, z-fold and mirror symmetric,
free of self-crossings over a sweep of tooth counts and shifts, and with the area an
independent integration gives."""

from __future__ import annotations

import itertools
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from wheelgen.teeth import ToothSpec, outline_for
from wheelgen.teeth.involute_tooth import generate_tooth
from wheelgen.teeth.trochoid import fillet_trochoid

# specs that cannot be generated say so with one of these messages
REFUSALS = ("root circle vanishes", "cuts through the root", "no involute left")


def _outline_or_refusal(spec):
    try:
        return outline_for(spec)
    except ValueError as exc:
        assert any(word in str(exc) for word in REFUSALS), str(exc)
        # only tiny wheels with negative shift may be refused
        assert spec.teeth <= 6 and spec.shift < 0, (spec, str(exc))
        return None


def _crossings(chain: np.ndarray, closed: bool) -> int:
    """Proper crossings between non-neighbouring edges of a polyline."""
    a = chain if closed else chain[:-1]
    d = (np.roll(chain, -1, axis=0) - chain) if closed else np.diff(chain, axis=0)
    n = len(a)

    def cross(u, v):
        return u[..., 0] * v[..., 1] - u[..., 1] * v[..., 0]

    count = 0
    for start in range(0, n, 300):
        ia = np.arange(start, min(n, start + 300))
        p, r = a[ia][:, None, :], d[ia][:, None, :]
        qp = a[None, :, :] - p
        denom = cross(r, d[None, :, :])
        with np.errstate(divide="ignore", invalid="ignore"):
            t = cross(qp, d[None, :, :]) / denom
            u = cross(qp, r) / denom
        hit = (np.abs(denom) > 1e-300) & (t > 1e-9) & (t < 1 - 1e-9)
        hit &= (u > 1e-9) & (u < 1 - 1e-9)
        gap = np.abs(ia[:, None] - np.arange(n)[None, :])
        hit &= gap > 1
        if closed:
            hit &= gap < n - 1
        count += int(hit.sum())
    return count // 2


def _three_teeth(outline, chord_tol=2e-3):
    one = outline.tooth_polyline(chord_tol)
    parts = []
    for k in (-1, 0, 1):
        a = 2 * math.pi * k / outline.teeth
        c, s = math.cos(a), math.sin(a)
        parts.append(
            np.column_stack(
                (c * one[:, 0] - s * one[:, 1], s * one[:, 0] + c * one[:, 1])
            )
        )
    return np.vstack(parts)


SWEEP_Z = list(range(3, 21)) + [23, 27, 31, 40, 55, 80, 101, 135, 170, 210, 256, 300]
SWEEP_X = [-0.5, -0.25, 0.0, 0.25, 0.5, 0.75, 1.0]


def test_sweep_outlines_are_closed_symmetric_and_do_not_cross_themselves():
    made = 0
    for z in SWEEP_Z:
        for x in SWEEP_X:
            spec = ToothSpec(z, 1.0, shift=x)
            outline = _outline_or_refusal(spec)
            if outline is None:
                continue
            made += 1
            _check_outline(outline, spec)
    assert made >= len(SWEEP_Z) * len(SWEEP_X) - 4


def _check_outline(outline, spec):
    z = spec.teeth
    chain = outline.tooth
    # closed: each segment starts where the last ended, the tooth ends where the
    # next one starts (the WheelOutline constructor checks this too)
    for a, b in itertools.pairwise(chain):
        assert np.allclose(a.end, b.start, atol=1e-12)
    half = math.pi / z
    assert math.atan2(chain[0].start[1], chain[0].start[0]) == pytest.approx(
        -half, abs=1e-12
    )
    assert math.atan2(chain[-1].end[1], chain[-1].end[0]) == pytest.approx(
        half, abs=1e-12
    )
    # mirror symmetric: segment i and segment n-1-i are mirror images
    n = len(chain)
    for i in range(n):
        mirrored = chain[n - 1 - i].points[::-1] * [1.0, -1.0]
        assert chain[i].kind == chain[n - 1 - i].kind
        assert np.allclose(chain[i].points, mirrored, atol=1e-12)
    # stays in its own sector: the lower half below the axis, above the space middle,
    # so teeth further apart cannot meet; then no crossing among three neighbours
    pts = outline.tooth_polyline(2e-3)
    ang = np.arctan2(pts[:, 1], pts[:, 0])
    assert ang.min() >= -half - 1e-12 and ang.max() <= half + 1e-12
    assert _crossings(_three_teeth(outline), closed=False) == 0
    # z-fold: the whole polyline is the tooth turned by 360/z, k times
    whole = outline.polyline(2e-3)
    k = len(pts)
    a = 2 * math.pi / z
    turned = pts @ np.array([[math.cos(a), math.sin(a)], [-math.sin(a), math.cos(a)]])
    assert np.allclose(whole[k : 2 * k], turned, atol=1e-12)


@settings(max_examples=30, deadline=None)
@given(
    z=st.integers(3, 300),
    x=st.floats(-0.5, 1.0),
    thinning=st.floats(0.0, 0.08),
    alpha=st.sampled_from([14.5, 20.0, 25.0]),
)
def test_random_outlines_are_sound(z, x, thinning, alpha):
    # ISO 53's 0.38 m fillet does not fit a 25 degree cutter tip (it would need
    # 0.32 m or less); use 0.25 m there
    fillet = 0.25 if alpha > 20 else 0.38
    spec = ToothSpec(
        z, 1.0, shift=x, thinning=thinning, pressure_angle_deg=alpha, root_radius=fillet
    )
    try:
        outline = outline_for(spec)
    except ValueError as exc:
        assert any(word in str(exc) for word in REFUSALS), str(exc)
        assert z <= 12 and x < 0.1, (spec, str(exc))
        return
    _check_outline(outline, spec)


def test_whole_small_wheel_polygon_does_not_cross_itself():
    for z, x in ((3, 0.0), (5, 0.0), (7, -0.2), (11, 1.0)):
        outline = outline_for(ToothSpec(z, 1.0, shift=x))
        assert _crossings(outline.polyline(2e-3), closed=True) == 0


# ------------------------------------------------------------------------- area
def _line_integral(fun, t0, t1, n=80):
    """Integral of (x dy - y dx) / 2 along fun(t) by Gauss-Legendre, derivative by
    central differences: independent of the outline's points and polyline."""
    xg, wg = np.polynomial.legendre.leggauss(n)
    t = 0.5 * (t1 - t0) * xg + 0.5 * (t1 + t0)
    h = 1e-6
    p = fun(t)
    dp = (fun(t + h) - fun(t - h)) / (2 * h)
    return float(
        0.5 * (t1 - t0) * np.dot(wg, 0.5 * (p[:, 0] * dp[:, 1] - p[:, 1] * dp[:, 0]))
    )


def _area_by_integration(spec):
    """Green's theorem over one tooth: sector integrals for the root and tip arcs,
    the involute written out (r = rb sqrt(1+t^2), theta = theta0 + t - atan t) and
    the trochoid as a parametric curve; z times twice the lower half."""
    g = generate_tooth(spec)
    z = spec.teeth
    q = -math.pi / z
    root_half = g.cutter.centre_v / g.ref_radius
    total = 0.5 * g.root_radius**2 * root_half  # root arc sector

    def troch(beta):
        p = fillet_trochoid(g.cutter, g.ref_radius, beta)
        c, s = math.cos(q), math.sin(q)
        return np.column_stack((c * p[:, 0] - s * p[:, 1], s * p[:, 0] + c * p[:, 1]))

    total += _line_integral(troch, 0.0, g.junction_beta_rad)
    theta0 = -(g.half_angle_ref_rad + math.tan(g.alpha_rad) - g.alpha_rad)

    def invol(t):
        rad = g.base_radius * np.sqrt(1 + t * t)
        th = theta0 + t - np.arctan(t)
        return np.column_stack((rad * np.cos(th), rad * np.sin(th)))

    total += _line_integral(invol, g.form_roll_rad, g.tip_roll_rad)
    if not g.pointed:
        tip_half = g.half_angle_at(g.tip_radius)
        total += 0.5 * g.tip_radius**2 * tip_half
    return 2 * z * total


@pytest.mark.parametrize(
    ("z", "x", "m"),
    [
        (6, 0.0, 1.0),
        (12, 0.5, 2.0),
        (17, 0.0, 1.0),
        (40, -0.4, 0.5),
        (127, 0.2, 1.0),
        (8, 1.0, 1.0),
    ],
)
def test_area_matches_independent_integration(z, x, m):
    spec = ToothSpec(z, m, shift=x)
    expected = _area_by_integration(spec)
    outline = outline_for(spec)
    tol = 1e-7 * m
    # an inscribed polyline loses at most about chord_tol x perimeter
    poly = outline.polyline(tol)
    perimeter = float(np.hypot(*(np.roll(poly, -1, axis=0) - poly).T).sum())
    assert outline.area(chord_tol=tol) == pytest.approx(expected, abs=tol * perimeter)


def test_area_sits_between_root_and_tip_discs():
    # derived: a wheel is more than its root disc and less than its tip disc; for a
    # standard wheel with many teeth it is near the reference disc (half the tooth
    # ring is tooth, to first order)
    spec = ToothSpec(300, 1.0)
    area = outline_for(spec).area()
    assert math.pi * 148.75**2 < area < math.pi * 151**2
    assert area == pytest.approx(math.pi * 150**2, rel=2e-3)
