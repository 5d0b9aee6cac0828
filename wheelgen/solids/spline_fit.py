"""The fewest-pole cubic B-spline that stays within a tolerance of a spline segment.

A ``spline`` segment of an outline is a list of exact points (36 per involute flank).
Interpolating every point gives a curve with as many poles, far more than the accuracy
needs, and each pole is written out three times per flank in a STEP file. Here the
curve is approximated instead: a clamped cubic B-spline through the segment's two end
points, fitted by least squares to samples of the reference curve (6 between two
exact points), with knots added one at a time (in the middle of the worst span)
until every check point lies within the tolerance, and then each knot dropped that
the others can do without. The CAD layer builds its edges from the result and the
DXF writer draws it with the same control points.

The reference curve is the chord-length, not-a-knot cubic through the exact points
(:meth:`wheelgen.teeth.outline.Segment.polyline` samples the same curve); the tooth
tests show it keeps within 2e-7 module of the true involute and trochoid. The fit is
checked at 16 points between two exact points and at the exact points themselves,
none of them a fitting sample, by the distance from each check point to the fitted
curve (foot point found by Newton's method), so the tolerance bounds the geometric
deviation, not a parametric one; :func:`spline_fit_deviation` measures it again, 64
points to a span, and the tests against the exact involute and trochoid.

Plain numbers only (numpy, scipy), no CAD kernel: the DXF writer uses it without
starting the kernel. Lengths in mm.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from functools import lru_cache

import numpy as np
from numpy.typing import NDArray
from scipy.interpolate import BSpline, CubicSpline

from ..teeth.outline import Segment

__all__ = [
    "SPLINE_FIT_TOLERANCE",
    "SplineFit",
    "fit_segments",
    "fit_spline",
    "spline_fit_deviation",
]

FloatArray = NDArray[np.float64]

#: Largest distance (mm) from the reference curve to the fitted B-spline: 0.05 um,
#: half the 0.1 um the exported flanks must keep to the exact curve, the other half
#: left for the reference spline (2e-7 module, tested in the tooth layer) and margin.
SPLINE_FIT_TOLERANCE = 5e-5
_DEGREE = 3
_MAX_POLES = 200  # a cap; more poles than exact points are never used
_SAMPLES_PER_SPAN = 6  # fitting samples between two exact points
_CHECKS_PER_SPAN = 16  # check points between two exact points (none a fitting sample)
_VERIFY_PER_SPAN = 64  # points between two exact points for spline_fit_deviation
_REPARAMETRISE = 1  # foot-point corrections of the sample parameters per fit


@dataclass(frozen=True, slots=True, eq=False)
class SplineFit:
    """A clamped B-spline in the plane: ``poles`` (n, 2) in mm, distinct ``knots``
    from 0 to 1 with their ``multiplicities`` (the ends ``degree + 1``).

    The first and last poles are the segment's exact end points.
    """

    degree: int
    knots: tuple[float, ...]
    multiplicities: tuple[int, ...]
    poles: FloatArray
    deviation: float  # largest distance (mm) found from the reference curve

    def __post_init__(self) -> None:
        poles = np.array(self.poles, dtype=float)
        poles.setflags(write=False)  # fits are shared (see fit_spline): never edited
        object.__setattr__(self, "poles", poles)

    def full_knots(self) -> FloatArray:
        """The knot vector with every knot repeated by its multiplicity."""
        return np.repeat(np.array(self.knots), self.multiplicities)

    def rotated(self, angle_deg: float) -> SplineFit:
        """The same curve turned by ``angle_deg`` about the origin.

        The rotation is computed exactly as :meth:`Segment.rotated` computes it, so an
        end pole turns to the very same numbers as the segment's turned end point.
        """
        a = math.radians(angle_deg)
        rot = np.array([[math.cos(a), -math.sin(a)], [math.sin(a), math.cos(a)]])
        return SplineFit(
            self.degree,
            self.knots,
            self.multiplicities,
            self.poles @ rot.T,
            self.deviation,
        )

    def mirrored_reversed(self) -> SplineFit:
        """The curve mirrored about the X axis and run the other way.

        This is how a symmetric tooth's upper flank follows from its lower one.
        """
        return SplineFit(
            self.degree,
            tuple(1.0 - k for k in reversed(self.knots)),
            tuple(reversed(self.multiplicities)),
            self.poles[::-1] * np.array([1.0, -1.0]),
            self.deviation,
        )

    def evaluate(self, u: FloatArray) -> FloatArray:
        """Points (mm) at parameters ``u`` in [0, 1]."""
        return np.asarray(
            BSpline(self.full_knots(), self.poles, self.degree)(u), dtype=float
        )


def _reference(points: FloatArray) -> tuple[CubicSpline, float]:
    """The chord-length not-a-knot cubic through the points, and its parameter span."""
    s = np.concatenate(([0.0], np.cumsum(np.hypot(*np.diff(points, axis=0).T))))
    return CubicSpline(s, points, bc_type="not-a-knot"), float(s[-1])


def _between(s: FloatArray, per_span: int, offset: float) -> FloatArray:
    """``per_span`` parameters in every span of ``s``, starting ``offset`` into it."""
    frac = (np.arange(per_span) + offset) / per_span
    return (s[:-1, None] + np.diff(s)[:, None] * frac[None, :]).ravel()


def _foot(
    spline: BSpline, target: FloatArray, u: FloatArray, steps: int = 6
) -> FloatArray:
    """Parameters of the points of ``spline`` nearest ``target`` (Newton from ``u``)."""
    for _ in range(steps):
        r = spline(u) - target
        a = spline(u, 1)
        g = (a * a).sum(axis=1) + (r * spline(u, 2)).sum(axis=1)
        f = (r * a).sum(axis=1)
        step = np.divide(f, g, out=np.zeros_like(f), where=g > 0)
        u = np.clip(u - step, 0.0, 1.0)
    return u


def _least_squares(
    q: FloatArray, u: FloatArray, t: FloatArray, degree: int
) -> FloatArray:
    """Poles of the spline on knots ``t`` nearest the samples ``q`` at ``u``, ends fixed."""
    b = BSpline.design_matrix(u, t, degree).toarray()
    rhs = q - np.outer(b[:, 0], q[0]) - np.outer(b[:, -1], q[-1])
    inner = np.linalg.lstsq(b[:, 1:-1], rhs, rcond=None)[0]
    return np.vstack((q[0], inner, q[-1]))


def _fit_on(
    q: FloatArray, u: FloatArray, t: FloatArray, degree: int
) -> tuple[BSpline, FloatArray]:
    for _ in range(_REPARAMETRISE):
        spline = BSpline.construct_fast(t, _least_squares(q, u, t, degree), degree)
        u = _foot(spline, q, u, 3)
        u[0], u[-1] = 0.0, 1.0
    return BSpline.construct_fast(t, _least_squares(q, u, t, degree), degree), u


def _interpolating(points: FloatArray) -> SplineFit:
    """The C2 cubic through every exact point (chord-length, not-a-knot ends)."""
    ref, length = _reference(points)
    s = ref.x / length
    # not-a-knot: the second and last-but-one points are not knots
    knots = (0.0, *s[2:-2].tolist(), 1.0)
    mults = (4, *([1] * (len(knots) - 2)), 4)
    t = np.repeat(np.array(knots), mults)
    spline = BSpline.construct_fast(
        t, np.asarray(_interpolation_poles(points, s, t)), _DEGREE
    )
    return SplineFit(_DEGREE, knots, mults, np.asarray(spline.c), 0.0)


def _interpolation_poles(
    points: FloatArray, s: FloatArray, t: FloatArray
) -> FloatArray:
    b = BSpline.design_matrix(s, t, _DEGREE).toarray()
    poles = np.linalg.solve(b, points)
    poles[0], poles[-1] = points[0], points[-1]
    return np.asarray(poles, dtype=float)


def spline_fit_deviation(points: FloatArray, fit: SplineFit) -> float:
    """Largest distance (mm) from the reference curve through ``points`` to ``fit``.

    Measured at ``_VERIFY_PER_SPAN`` points between each pair of exact points and at
    the exact points themselves, none of them a fitting sample.
    """
    ref, length = _reference(points)
    s = np.concatenate((_between(ref.x, _VERIFY_PER_SPAN, 0.5), ref.x))
    target = ref(s)
    spline = BSpline(fit.full_knots(), fit.poles, fit.degree)
    u = _foot(spline, target, s / length, 10)
    return float(np.hypot(*(spline(u) - target).T).max())


def fit_spline(
    points: FloatArray, tolerance: float = SPLINE_FIT_TOLERANCE
) -> SplineFit:
    """The cubic B-spline with the fewest poles found within ``tolerance`` mm.

    Parameters
    ----------
    points : (n, 2) array
        The exact points of a ``spline`` segment, in order, in mm.
    tolerance : float
        Largest allowed distance (mm) from the reference curve through ``points``.

    Returns
    -------
    SplineFit
        Starts at one cubic span (4 poles) and adds a knot in the middle of the worst
        span until the deviation is within ``tolerance``, then drops each knot the
        rest can do without; the interpolating spline of all points if the tolerance
        is never reached with fewer poles than points.
    """
    p = np.asarray(points, dtype=float)
    if p.ndim != 2 or p.shape[1] != 2 or len(p) < 2:
        raise ValueError(f"'points' must be an (n, 2) array, n >= 2; got {p.shape}")
    if tolerance <= 0:
        raise ValueError(f"'tolerance' must be > 0 mm, got {tolerance}")
    return _fit_kept(np.ascontiguousarray(p).tobytes(), float(tolerance))


@lru_cache(maxsize=256)
def _fit_kept(points: bytes, tolerance: float) -> SplineFit:
    p = np.frombuffer(points, dtype=float).reshape(-1, 2)
    if len(p) == 2:
        line = np.vstack((p[0], (2 * p[0] + p[1]) / 3, (p[0] + 2 * p[1]) / 3, p[1]))
        return SplineFit(_DEGREE, (0.0, 1.0), (4, 4), line, 0.0)
    ref, length = _reference(p)
    s_fit = np.concatenate((_between(ref.x, _SAMPLES_PER_SPAN, 0.0), ref.x[-1:]))
    q = ref(s_fit)
    q[0], q[-1] = p[0], p[-1]  # the ends exactly: they are the edge's vertices
    u0 = s_fit / length
    check_s = np.concatenate((_between(ref.x, _CHECKS_PER_SPAN, 0.5), ref.x))
    check = ref(check_s)

    def attempt(inner: list[float]) -> tuple[BSpline, FloatArray, FloatArray]:
        t = np.concatenate(([0.0] * 4, inner, [1.0] * 4))
        spline, u_fit = _fit_on(q, u0, t, _DEGREE)
        # start each check point's foot search from its neighbours' fitted parameters
        u = _foot(spline, check, np.interp(check_s, s_fit, u_fit), 2)
        return spline, u, np.hypot(*(spline(u) - check).T)

    inner: list[float] = []
    limit = min(_MAX_POLES, len(p) - 1)
    while len(inner) + _DEGREE + 1 <= limit:
        spline, u, dist = attempt(inner)
        if float(dist.max()) <= tolerance:
            # greedy splitting can leave knots the final set does not need
            i = 0
            while i < len(inner):
                trial = inner[:i] + inner[i + 1 :]
                fewer, _, d = attempt(trial)
                if float(d.max()) <= tolerance:
                    inner, spline, dist = trial, fewer, d
                else:
                    i += 1
            knots = (0.0, *inner, 1.0)
            mults = (4, *([1] * len(inner)), 4)
            return SplineFit(
                _DEGREE, knots, mults, np.asarray(spline.c), float(dist.max())
            )
        # split the span holding the worst check point at its parameter middle
        edges = np.array([0.0, *inner, 1.0])
        span = int(np.searchsorted(edges, u[int(dist.argmax())])) - 1
        span = min(max(span, 0), len(edges) - 2)
        inner = sorted([*inner, 0.5 * (edges[span] + edges[span + 1])])
    fit = _interpolating(p)
    return SplineFit(
        fit.degree,
        fit.knots,
        fit.multiplicities,
        fit.poles,
        spline_fit_deviation(p, fit),
    )


def fit_segments(
    segments: Sequence[Segment], tolerance: float = SPLINE_FIT_TOLERANCE
) -> tuple[SplineFit | None, ...]:
    """The fit of every ``spline`` segment of a chain (None for lines and arcs).

    A segment that is another one mirrored about the X axis and reversed (the upper
    flank of a symmetric tooth) gets that one's fit mirrored, not a fit of its own.
    """
    fits: list[SplineFit | None] = []
    done: dict[bytes, SplineFit] = {}
    flip = np.array([1.0, -1.0])
    for seg in segments:
        if seg.kind != "spline":
            fits.append(None)
            continue
        key = np.ascontiguousarray(seg.points).tobytes()
        mirror = np.ascontiguousarray(seg.points[::-1] * flip).tobytes()
        if key in done:
            fit = done[key]
        elif mirror in done:
            fit = done[mirror].mirrored_reversed()
        else:
            fit = fit_spline(seg.points, tolerance)
        done[key] = fit
        fits.append(fit)
    return tuple(fits)
