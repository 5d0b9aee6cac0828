"""The convex hull the frame's pillars and the build plates' plans are drawn with
(``wheelgen.layout.collisions.convex_hull_order``), against hulls worked out by hand
and against the definition of a convex hull (derived: every point lies on or inside
each edge of a convex polygon turning one way)."""

from __future__ import annotations

import numpy as np
import pytest

from wheelgen.layout.collisions import convex_hull_order


def _grid(n: int) -> np.ndarray:
    xs, ys = np.meshgrid(np.arange(n, dtype=float), np.arange(n, dtype=float))
    return np.column_stack((xs.ravel(), ys.ravel()))


def test_a_square_grid_has_its_four_corners():
    pts = _grid(5)
    hull = pts[convex_hull_order(pts, collinear=False)]
    # derived: the 5 x 5 grid's hull is the square (0,0) (4,0) (4,4) (0,4), ccw
    assert hull.tolist() == [[0, 0], [4, 0], [4, 4], [0, 4]]


def test_points_on_the_sides_are_kept_when_asked():
    pts = _grid(5)
    hull = pts[convex_hull_order(pts)]
    # derived: the 16 points on the square's sides, ccw from (0, 0)
    assert len(hull) == 16
    assert hull[0].tolist() == [0, 0] and hull[1].tolist() == [1, 0]
    assert not any((0 < x < 4) and (0 < y < 4) for x, y in hull)


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_every_point_lies_inside_a_counter_clockwise_hull(seed):
    rng = np.random.default_rng(seed)
    pts = rng.normal(size=(5000, 2)) * (40.0, 15.0) + (120.0, -30.0)
    idx = convex_hull_order(pts, collinear=False)
    hull = pts[idx]
    a, b = hull, np.roll(hull, -1, axis=0)
    edge = b - a
    rel = pts[:, None, :] - a[None, :, :]
    cross = edge[None, :, 0] * rel[:, :, 1] - edge[None, :, 1] * rel[:, :, 0]
    assert (cross >= -1e-9).all()  # every point on the left of every edge
    # and every corner is a real corner: it turns left
    nxt = np.roll(edge, -1, axis=0)
    turn = edge[:, 0] * nxt[:, 1] - edge[:, 1] * nxt[:, 0]
    assert (turn > 0).all()
    # derived: the extreme points in x and y are corners of the hull
    for k in (pts[:, 0].argmin(), pts[:, 0].argmax(), pts[:, 1].argmax()):
        assert k in idx


def test_a_few_points_and_repeats():
    pts = np.array([[0.0, 0.0], [2.0, 0.0], [1.0, 1.0], [2.0, 0.0], [1.0, 0.2]])
    hull = pts[convex_hull_order(pts, collinear=False)]
    assert hull.tolist() == [[0, 0], [2, 0], [1, 1]]  # derived: the triangle
