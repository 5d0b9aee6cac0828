"""Triangular (straight-flanked) teeth: flank angle, depth, thickness and roundings
measured on the outline, plus soundness over a sweep. All check values are derived
from the definition (triangle of the given included angle, thickness on the pitch
circle half the pitch p = pi m, depth addendum + dedendum), stated beside each."""

from __future__ import annotations

import math

import numpy as np
import pytest

from wheelgen.teeth import ToothSpec, gear_data, min_root_radius_for_cutter, outline_for
from wheelgen.teeth.outline import circle_through


def _lines(outline):
    return [s for s in outline.tooth if s.kind == "line"]


def _arcs(outline):
    out = []
    for s in outline.tooth:
        if s.kind == "arc":
            centre, radius = circle_through(*s.points)
            out.append((centre, radius, s))
    return out


@pytest.mark.parametrize("angle", [30.0, 40.0, 60.0, 90.0])
@pytest.mark.parametrize("z", [8, 24, 120])
def test_flank_angle_is_the_included_angle(angle, z):
    outline = outline_for(
        ToothSpec(z, 1.0, form="triangular", tooth_angle_deg=angle, root_radius=0.05)
    )
    lo, hi = _lines(outline)
    d1 = lo.end - lo.start
    d2 = hi.start - hi.end  # both pointing towards the tip
    included = math.degrees(math.atan2(abs(d1[0] * d2[1] - d1[1] * d2[0]), d1 @ d2))
    assert included == pytest.approx(angle, abs=1e-9)


@pytest.mark.parametrize(
    ("z", "angle", "add", "ded"),
    [(40, 40.0, 1.0, 1.25), (200, 50.0, 0.8, 1.1), (12, 30.0, 1.0, 1.25)],
)
def test_depth_is_addendum_plus_dedendum(z, angle, add, ded):
    m = 1.5
    spec = ToothSpec(
        z,
        m,
        form="triangular",
        tooth_angle_deg=angle,
        addendum=add,
        dedendum=ded,
        root_radius=0.05,
    )
    outline = outline_for(spec)
    radius = np.hypot(*outline.tooth_polyline(1e-5).T)
    assert radius.max() == pytest.approx(m * z / 2 + add * m, abs=1e-9)
    assert radius.min() == pytest.approx(m * z / 2 - ded * m, abs=1e-6)
    assert gear_data(spec).depth_of_cut == pytest.approx((add + ded) * m, abs=1e-9)


@pytest.mark.parametrize(("z", "thinning"), [(10, 0.0), (36, 0.05), (150, 0.02)])
def test_thickness_on_the_pitch_circle_is_half_the_pitch(z, thinning):
    m = 2.0
    r = m * z / 2
    outline = outline_for(
        ToothSpec(z, m, form="triangular", thinning=thinning, root_radius=0.05)
    )
    lo, _ = _lines(outline)
    # where the lower flank crosses the pitch circle
    p, d = lo.start, lo.end - lo.start
    a, b, c = d @ d, 2 * p @ d, p @ p - r * r
    t = (-b + math.sqrt(b * b - 4 * a * c)) / (2 * a)
    q = p + t * d
    arc_thickness = 2 * r * abs(math.atan2(q[1], q[0]))
    assert arc_thickness == pytest.approx(math.pi * m / 2 - thinning, abs=1e-9)


def test_roundings_have_their_radius_and_touch_the_flank():
    m = 1.0
    spec = ToothSpec(300, m, form="triangular", root_radius=0.05, tip_radius=0.1)
    outline = outline_for(spec)
    lo, _ = _lines(outline)
    d = (lo.end - lo.start) / np.hypot(*(lo.end - lo.start))
    radii = sorted({round(r, 9) for _, r, _ in _arcs(outline)})
    assert 0.05 in radii and 0.1 in radii
    touching = 0
    for centre, radius, seg in _arcs(outline):
        # tangent: the arcs that end on the flank have their centre at their radius
        # from the flank line (root rounding below, tip rounding above)
        if np.allclose(seg.end, lo.start) or np.allclose(seg.start, lo.end):
            v = centre - lo.start
            assert abs(v[0] * d[1] - v[1] * d[0]) == pytest.approx(radius, abs=1e-9)
            touching += 1
    assert touching == 2


def test_root_rounding_too_big_for_the_space_becomes_one_rounding():
    # the default 0.38 m rounding does not fit the root of a 60 degree space of a
    # large wheel: one rounding tangent to both flanks, above the root circle
    spec = ToothSpec(120, 1.0, form="triangular")
    outline = outline_for(spec)
    arcs = [a for a in _arcs(outline) if a[1] == pytest.approx(0.38)]
    assert arcs, "the rounding is there"
    assert outline.radii["root"] > 60 - 1.25
    assert np.hypot(*outline.tooth_polyline(1e-5).T).min() == pytest.approx(
        outline.radii["root"], abs=1e-6
    )


def test_pointed_triangle_inside_the_tip_circle():
    # derived: the flanks pass the pitch circle at +-psi = +-(p/4)/r and lean in by
    # 45 degrees, so they meet at r cos psi + r sin psi / tan 45 = r + 0.7823 m for
    # r = 100 m - below an addendum of 1 m
    spec = ToothSpec(
        200, 1.0, form="triangular", tooth_angle_deg=90.0, root_radius=0.05
    )
    data = gear_data(spec)
    assert data.pointed
    psi = math.pi / 4 / 100
    apex = 100 * math.cos(psi) + 100 * math.sin(psi) / math.tan(math.radians(45))
    assert data.tip_diameter / 2 == pytest.approx(apex, abs=1e-9)
    radius = np.hypot(*outline_for(spec).tooth_polyline(1e-5).T)
    assert radius.max() == pytest.approx(apex, abs=1e-9)


def test_cutter_sets_the_smallest_root_rounding():
    # derived: an end mill leaves at least its own radius in an inside corner
    assert min_root_radius_for_cutter(1.0) == 0.5
    with pytest.raises(ValueError, match="cutter_diameter"):
        min_root_radius_for_cutter(0.0)


@pytest.mark.parametrize("z", [3, 4, 6, 9, 17, 40, 101, 300])
@pytest.mark.parametrize(
    "kw",
    [{}, {"root_radius": 0.0}, {"tip_radius": 0.2},
     {"tooth_angle_deg": 40.0, "root_radius": 0.1},
     {"addendum": 2.0, "tip_radius": 0.15}, {"tooth_angle_deg": 55.0, "dedendum": 0.8}],
)  # fmt: skip
def test_triangular_outlines_are_sound(z, kw):
    spec = ToothSpec(z, 1.0, form="triangular", **kw)
    outline = outline_for(spec)  # the constructor checks the chain is closed
    chain = outline.tooth
    n = len(chain)
    for i in range(n):
        assert np.allclose(
            chain[i].points, chain[n - 1 - i].points[::-1] * [1, -1], atol=1e-12
        )
    pts = outline.tooth_polyline(1e-3)
    ang = np.arctan2(pts[:, 1], pts[:, 0])
    half = math.pi / z
    assert ang.min() >= -half - 1e-12 and ang.max() <= half + 1e-12
    # the lower half stays below the axis, the upper above: the halves cannot cross
    k = len(pts) // 2
    lower = pts[: k - 1]
    assert (lower[:, 1] <= 1e-12).all()
    # radius grows monotonically up the lower straight flank
    lo = next(s for s in chain if s.kind == "line")
    assert np.hypot(*lo.end) > np.hypot(*lo.start)


def test_too_wide_a_tooth_angle_is_refused():
    # derived: beyond 180 - 360/z degrees the flanks of neighbouring teeth diverge
    # towards the centre and there is no space between them
    with pytest.raises(ValueError, match="at most 60 degrees for 3 teeth"):
        outline_for(ToothSpec(3, 1.0, form="triangular", tooth_angle_deg=90.0))
