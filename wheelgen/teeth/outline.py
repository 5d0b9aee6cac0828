"""A wheel's closed outline as a chain of exact segments, one tooth repeated z times.

This is the contract between the tooth generators (this package) and everything that
draws, meshes or builds solids from a wheel. All coordinates are millimetres in the
wheel's own frame, centre at the origin; angles in public are degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Iterator, Literal, cast

import numpy as np
from numpy.typing import NDArray

__all__ = ["Segment", "WheelOutline", "SegmentKind", "circle_through"]

FloatArray = NDArray[np.float64]
# numpy's stubs type indexing as Any: cast(FloatArray, ...) below only tells mypy.

SegmentKind = Literal["line", "arc", "spline"]


@dataclass(frozen=True, slots=True, eq=False)
class Segment:
    """One piece of the outline.

    ``points`` is an ``(n, 2)`` array in mm:

    - ``line``: 2 points, start and end;
    - ``arc``: 3 points, start, a point on the arc, end (a circular arc);
    - ``spline``: 2 or more exact points that a spline must pass through, in order.
    """

    kind: SegmentKind
    points: FloatArray

    def __post_init__(self) -> None:
        pts = np.asarray(self.points, dtype=float)
        if pts.ndim != 2 or pts.shape[1] != 2:
            raise ValueError(f"'points' must be an (n, 2) array, got shape {pts.shape}")
        need = {"line": 2, "arc": 3, "spline": 2}
        if self.kind not in need:
            raise ValueError(
                f"'kind' must be one of 'line', 'arc', 'spline', got {self.kind!r}"
            )
        if self.kind in ("line", "arc") and len(pts) != need[self.kind]:
            raise ValueError(
                f"a {self.kind} needs exactly {need[self.kind]} points, got {len(pts)}"
            )
        if len(pts) < need[self.kind]:
            raise ValueError(
                f"a {self.kind} needs at least {need[self.kind]} points, got {len(pts)}"
            )
        pts.setflags(write=False)
        object.__setattr__(self, "points", pts)

    @property
    def start(self) -> FloatArray:
        return cast(FloatArray, self.points[0])

    @property
    def end(self) -> FloatArray:
        return cast(FloatArray, self.points[-1])

    def rotated(self, angle_deg: float) -> "Segment":
        a = math.radians(angle_deg)
        rot = np.array([[math.cos(a), -math.sin(a)], [math.sin(a), math.cos(a)]])
        return Segment(self.kind, self.points @ rot.T)

    def polyline(self, chord_tol: float) -> FloatArray:
        """Points along the segment (start and end included) with chord error <= ``chord_tol`` mm.

        Splines are sampled on the chord-length cubic spline (not-a-knot) through their
        exact points; arcs on the circle through their three points; lines are their two
        ends.
        """
        if chord_tol <= 0:
            raise ValueError(f"'chord_tol' must be > 0 mm, got {chord_tol}")
        if self.kind == "line":
            return self.points.copy()
        if self.kind == "arc":
            return _arc_polyline(self.points, chord_tol)
        return _spline_polyline(self.points, chord_tol)


def _arc_polyline(p: FloatArray, chord_tol: float) -> FloatArray:
    centre, radius = circle_through(p[0], p[1], p[2])
    if radius is None:
        return p[[0, 2]].copy()
    a0, a1, a2 = (math.atan2(q[1] - centre[1], q[0] - centre[0]) for q in p)
    # sweep from a0 to a2 passing a1
    sweep = (a2 - a0) % (2 * math.pi)
    if (a1 - a0) % (2 * math.pi) > sweep:
        sweep -= 2 * math.pi
    # chord error of a step dt is r (1 - cos(dt/2))
    step = (
        2 * math.acos(max(-1.0, 1 - chord_tol / radius))
        if chord_tol < radius
        else math.pi / 2
    )
    n = max(2, int(math.ceil(abs(sweep) / step)) + 1)
    t = a0 + np.linspace(0.0, sweep, n)
    pts = np.column_stack(
        (centre[0] + radius * np.cos(t), centre[1] + radius * np.sin(t))
    )
    pts[0], pts[-1] = p[0], p[2]
    return pts


def circle_through(
    a: FloatArray, b: FloatArray, c: FloatArray
) -> tuple[FloatArray, float | None]:
    """Centre (mm) and radius of the circle through three points; radius None if collinear."""
    d = 2 * (a[0] * (b[1] - c[1]) + b[0] * (c[1] - a[1]) + c[0] * (a[1] - b[1]))
    if abs(d) < 1e-15:
        return a, None
    ux = (
        (a @ a) * (b[1] - c[1]) + (b @ b) * (c[1] - a[1]) + (c @ c) * (a[1] - b[1])
    ) / d
    uy = (
        (a @ a) * (c[0] - b[0]) + (b @ b) * (a[0] - c[0]) + (c @ c) * (b[0] - a[0])
    ) / d
    centre = np.array([ux, uy])
    return centre, float(np.hypot(*(a - centre)))


def _spline_polyline(p: FloatArray, chord_tol: float) -> FloatArray:
    # A C2 cubic spline through the exact points, parametrised by chord length with
    # not-a-knot ends (what a CAD kernel's interpolating B-spline does, within its end
    # conditions). Each span is cut so that its chord sagitta |S''| h^2 / 8 stays
    # within the tolerance; with chord-length parameters |S''| is about the curvature.
    if len(p) == 2:
        return p.copy()
    h = np.hypot(*np.diff(p, axis=0).T)
    keep = np.concatenate(([True], h > 0))
    p, h = p[keep], h[h > 0]
    if len(p) == 2:
        return p.copy()
    m = _second_derivatives(p, h)
    curv = np.maximum(np.hypot(*m[:-1].T), np.hypot(*m[1:].T))
    counts = np.clip(np.ceil(h * np.sqrt(curv / (8.0 * chord_tol))), 1, 100_000)
    counts = counts.astype(int)
    span = np.repeat(np.arange(len(h)), counts)
    first = np.repeat(np.cumsum(counts) - counts, counts)
    frac = (np.arange(counts.sum()) - first) / counts[span]
    hs = h[span][:, None]
    t = frac[:, None] * hs
    m0, m1, p0, p1 = m[span], m[span + 1], p[span], p[span + 1]
    pts = (
        m0 * (hs - t) ** 3 / (6 * hs)
        + m1 * t**3 / (6 * hs)
        + (p0 / hs - m0 * hs / 6) * (hs - t)
        + (p1 / hs - m1 * hs / 6) * t
    )
    return np.vstack((pts, p[-1:]))


def _second_derivatives(p: FloatArray, h: FloatArray) -> FloatArray:
    """Second derivatives at the knots of the not-a-knot cubic through ``p``."""
    n = len(p)
    if n == 3:
        # not-a-knot with one interior knot is the parabola through the three points
        d = (p[2] - p[1]) / h[1] - (p[1] - p[0]) / h[0]
        c = 2 * d / (h[0] + h[1])
        return np.vstack((c, c, c))
    a = np.zeros((n, n))
    rhs = np.zeros((n, 2))
    slopes = np.diff(p, axis=0) / h[:, None]
    i = np.arange(1, n - 1)
    a[i, i - 1] = h[:-1]
    a[i, i] = 2 * (h[:-1] + h[1:])
    a[i, i + 1] = h[1:]
    rhs[1:-1] = 6 * (slopes[1:] - slopes[:-1])
    a[0, :3] = [h[1], -(h[0] + h[1]), h[0]]
    a[-1, -3:] = [h[-1], -(h[-2] + h[-1]), h[-2]]
    # the stubs widen the result to floating[Any]; both inputs are float64
    return cast(FloatArray, np.linalg.solve(a, rhs))


@dataclass(frozen=True, slots=True, eq=False)
class WheelOutline:
    """Closed outline of a wheel: ``tooth`` is one tooth's chain, repeated ``teeth`` times.

    The chain runs counter-clockwise from angle ``-180/teeth`` degrees (middle of a tooth
    space) to ``+180/teeth`` degrees, so that tooth k is ``tooth`` rotated by ``360 k / teeth``
    and the end of tooth k is the start of tooth k+1. The tooth is centred on +X and is
    mirror-symmetric about the X axis unless the generator says otherwise.
    ``radii`` holds named circles in mm (``"pitch"``, ``"base"``, ``"tip"``, ``"root"``).
    """

    teeth: int
    tooth: tuple[Segment, ...]
    radii: dict[str, float] = field(default_factory=dict)

    def __post_init__(self) -> None:
        if self.teeth < 1:
            raise ValueError(f"'teeth' must be at least 1, got {self.teeth}")
        if not self.tooth:
            raise ValueError("a tooth needs at least one segment")
        for a, b in zip(self.tooth, self.tooth[1:]):
            if not np.allclose(a.end, b.start, atol=1e-9):
                raise ValueError(f"tooth chain is broken between {a.end} and {b.start}")
        nxt = self.tooth[0].rotated(360.0 / self.teeth)
        if not np.allclose(self.tooth[-1].end, nxt.start, atol=1e-9):
            raise ValueError("the end of one tooth is not the start of the next")

    @property
    def pitch_angle_deg(self) -> float:
        return 360.0 / self.teeth

    def segments(self) -> Iterator[Segment]:
        """Every segment of the closed outline, tooth after tooth, counter-clockwise."""
        for k in range(self.teeth):
            angle = k * self.pitch_angle_deg
            for seg in self.tooth:
                yield seg if k == 0 else seg.rotated(angle)

    def tooth_polyline(self, chord_tol: float = 0.001) -> FloatArray:
        """One tooth as points in mm, first point included, last point excluded."""
        parts = [seg.polyline(chord_tol)[:-1] for seg in self.tooth]
        return np.vstack(parts)

    def polyline(self, chord_tol: float = 0.001) -> FloatArray:
        """The whole closed outline as an ``(n, 2)`` array in mm (not repeating the first point)."""
        one = self.tooth_polyline(chord_tol)
        a = np.radians(np.arange(self.teeth) * self.pitch_angle_deg)
        c, s = np.cos(a)[:, None], np.sin(a)[:, None]
        x = c * one[:, 0] - s * one[:, 1]
        y = s * one[:, 0] + c * one[:, 1]
        return np.column_stack((x.ravel(), y.ravel()))

    def area(self, chord_tol: float = 0.0005) -> float:
        """Enclosed area in mm² (shoelace on a fine polyline)."""
        p = self.polyline(chord_tol)
        x, y = p[:, 0], p[:, 1]
        return 0.5 * float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))
