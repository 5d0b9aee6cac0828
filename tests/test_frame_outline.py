"""Frame outlines: the rounded hull round circles, rounded rectangles and polygons.

Every expected value is derived beside the test from plane geometry; the outlines are
measured on their own exact edges (lines and arcs), sampled finely.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from wheelgen.frame.outline import (
    _outermost,
    edges_polyline,
    outline_distance,
    polygon_outline,
    rectangle_outline,
    rounded_hull,
)
from wheelgen.layout.collisions import inside_polygon


def area(loop: np.ndarray) -> float:
    x, y = loop[:, 0], loop[:, 1]
    return 0.5 * float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))


def closed_chain(edges) -> None:
    for a, b in zip(edges, edges[1:] + edges[:1]):
        assert a.points[-1] == b.points[0]


def test_hull_of_two_equal_circles_is_a_stadium():
    # derived: two circles of radius r, centres d apart: the hull is a stadium of area
    # pi r^2 + 2 r d and perimeter 2 pi r + 2 d
    r, d = 5.0, 30.0
    edges = rounded_hull([(0.0, 0.0, r), (d, 0.0, r)])
    closed_chain(list(edges))
    assert [e.kind for e in edges].count("line") == 2
    loop = edges_polyline(edges, 1e-4)
    # chords of at most 1e-4 mm sagitta cut about 2/3 of that along the arcs' length
    # (derived: a parabolic segment), 0.002 mm2 here
    cut = 2 / 3 * 1e-4 * 2 * math.pi * r
    assert area(loop) == pytest.approx(math.pi * r * r + 2 * r * d - cut, abs=1e-4)
    perimeter = float(np.sum(np.hypot(*np.diff(np.vstack((loop, loop[:1])), axis=0).T)))
    # chords are shorter than their arcs by theta^2 / 24 of the arcs (derived), 2e-4 mm
    assert perimeter == pytest.approx(2 * math.pi * r + 2 * d, abs=5e-4)


def test_sides_are_tangent_to_both_their_circles():
    circles = [(0.0, 0.0, 10.0), (40.0, 5.0, 4.0), (10.0, 45.0, 7.0), (5.0, 5.0, 2.0)]
    edges = rounded_hull(circles)
    closed_chain(list(edges))
    for e in edges:
        if e.kind != "line":
            continue
        (ax, ay), (bx, by) = e.points
        # derived: a tangent touches a circle where the distance from its centre to
        # the line equals the radius; both ends of each side lie on such a circle
        for px, py in e.points:
            (cx, cy, r) = min(
                circles, key=lambda c: abs(math.hypot(px - c[0], py - c[1]) - c[2])
            )
            dist = abs((bx - ax) * (ay - cy) - (ax - cx) * (by - ay)) / math.hypot(
                bx - ax, by - ay
            )
            assert dist == pytest.approx(r, abs=1e-6)


@settings(max_examples=40, deadline=None)
@given(
    st.lists(
        st.tuples(
            st.floats(-80, 80),
            st.floats(-80, 80),
            st.floats(0.5, 40),
        ),
        min_size=1,
        max_size=8,
    )
)
def test_hull_holds_every_circle_and_is_convex(circles):
    edges = rounded_hull(circles)
    loop = edges_polyline(edges, 0.001)
    assert area(loop) > 0  # counter-clockwise
    centres = np.array([(x, y) for x, y, _ in circles])
    inside = inside_polygon(centres, loop)
    dist = outline_distance(centres, loop)
    for (_, _, r), ins, d in zip(circles, inside, dist):
        # each circle lies within the hull (within the sampling of 0.001 mm chords
        # and the 1.2e-6 r bound of a missed arc)
        assert ins and d >= r - 2e-3 - 2e-6 * r
    # convex: every turn of the polyline goes left (or straight)
    a, b, c = loop, np.roll(loop, -1, axis=0), np.roll(loop, -2, axis=0)
    cross = (b[:, 0] - a[:, 0]) * (c[:, 1] - b[:, 1]) - (b[:, 1] - a[:, 1]) * (
        c[:, 0] - b[:, 0]
    )
    assert np.all(cross >= -1e-6)


def test_hull_holds_a_small_circle_between_two_far_ones():
    # found by the property test above: two large circles 120 mm apart whose common
    # tangent passes 0.024 mm inside a small circle between them, over a range of
    # directions narrower than the sampling step; derived: the small circle reaches
    # y = -59.8678 - 21.3058 = -81.1735, 0.024 mm beyond that tangent
    circles = [
        (-4.448944819908078, -59.86775478015392, 21.30575847067319),
        (-7.407277117457255, 8.347127798773414, 22.228903677261027),
        (-70.70794916829345, 43.733757429866074, 11.950321304057773),
        (-63.81606882170285, -44.19403106713963, 36.89007857753235),
        (45.663075633006144, 13.75411352636499, 36.94552682946598),
        (56.296644217205625, -43.14791998906229, 38.06901227324005),
        (-28.872282410853067, -18.812365379323793, 11.692311510614072),
    ]
    loop = edges_polyline(rounded_hull(circles), 0.0005)
    x, y, r = circles[0]
    d = outline_distance(np.array([(x, y)]), loop)[0]
    assert d >= r - 1e-3


@pytest.mark.parametrize(
    "circles",
    [
        [(0.0, 3.0, 1.0), (0.0, 4.0, 2.0)],  # touching from inside
        [(0.0, 0.0, 1.0), (0.0, 1e-12, 1.0)],  # equal but for float noise
    ],
)
def test_hull_of_a_circle_inside_another_is_the_outer_circle(circles):
    # derived: the hull of a circle and one inside it is the outer circle itself
    x, y, r = max(circles, key=lambda c: c[2])
    loop = edges_polyline(rounded_hull(circles), 0.0005)
    # a polygon inscribed with chords of sagitta s = 0.0005 mm lacks about
    # (4/3) s / r of the circle's area (derived: each segment is 2/3 chord x sagitta)
    assert area(loop) == pytest.approx(math.pi * r * r, rel=1.5 * 0.0005 / r)


def test_rounded_rectangle_area():
    # derived: each rounded corner removes a square of side r less a quarter circle,
    # r^2 (1 - pi / 4)
    w, h, r = 120.0, 70.0, 6.0
    loop = edges_polyline(rectangle_outline(-20.0, -10.0, w - 20.0, h - 10.0, r), 1e-4)
    assert area(loop) == pytest.approx(w * h - 4 * r * r * (1 - math.pi / 4), rel=1e-6)
    assert loop[:, 0].min() == pytest.approx(-20.0) and loop[
        :, 1
    ].max() == pytest.approx(h - 10.0)


def test_polygon_with_a_reflex_corner_is_rounded_both_ways():
    # an L of 60 x 60 with a 30 x 30 notch: five convex right corners lose
    # r^2 (1 - pi/4) each and the reflex one gains as much (derived)
    pts = [(0, 0), (60, 0), (60, 30), (30, 30), (30, 60), (0, 60)]
    r = 4.0
    edges = polygon_outline(pts, r)
    closed_chain(list(edges))
    loop = edges_polyline(edges, 1e-4)
    expected = 60 * 60 - 30 * 30 - 4 * r * r * (1 - math.pi / 4)
    assert area(loop) == pytest.approx(expected, rel=1e-6)
    # given clockwise, the same outline comes back counter-clockwise
    loop_cw = edges_polyline(polygon_outline(pts[::-1], r), 1e-4)
    assert area(loop_cw) == pytest.approx(expected, rel=1e-6)


def test_sharp_polygon_keeps_its_corners():
    pts = [(0.0, 0.0), (50.0, 0.0), (25.0, 40.0)]
    loop = edges_polyline(polygon_outline(pts, 0.0), 0.01)
    assert area(loop) == pytest.approx(0.5 * 50 * 40)


@settings(max_examples=60, deadline=None)
@given(
    st.lists(
        st.tuples(
            st.integers(-40, 40).map(float),
            st.integers(-40, 40).map(float),
            st.integers(1, 30).map(float),
        ),
        min_size=1,
        max_size=25,
        unique=True,
    )
)
def test_circles_inside_others_are_dropped_as_by_comparing_every_pair(circles):
    # derived: circle i lies inside circle j when |c_i c_j| + r_i <= r_j; of two equal
    # ones the later in sorted order is kept. The broad phase must drop the same ones.
    unique = sorted(circles)
    kept = []
    for i, (xi, yi, ri) in enumerate(unique):
        held = any(
            math.hypot(xi - xj, yi - yj) + ri <= rj + 1e-9
            and (rj > ri or (rj == ri and j > i))
            for j, (xj, yj, rj) in enumerate(unique)
            if j != i
        )
        if not held:
            kept.append(unique[i])
    assert _outermost(unique) == kept
