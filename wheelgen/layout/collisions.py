"""Interference between wheels, arbors and sleeves on different axes (mm).

Every wheel, hub, arbor, sleeve and collar is a *body*: a z-range and a round or toothed
section. Two bodies on different axes whose z-ranges overlap are compared in the plane:

- first by their circles (a wheel's nominal tip circle, a shaft's outside);
- where those overlap, by the exact tooth outline (:func:`wheelgen.teeth.forms.outline_for`):
  a wheel that turns relative to the other body sweeps the disc of its outline's largest
  radius; a wheel that stands still relative to it (both fixed, say) keeps its exact
  outline, at the angle it is placed at (0).
- a carried axis circles its carrier's axis: against anything not turning with the
  carrier, the nearest approach of that circle counts.

Meshing pairs are left out (their teeth interlock by design), as are a carried arbor and
the wheel that carries it, and members of one coaxial group (see hidden seats).

The pin of a pin-and-slot coupling turns with its wheel, so it sweeps a ring about the
pin wheel's axis (radii ``r - d/2`` to ``r + d/2``) from that wheel's front face to the
pin's end (:func:`find_pin_clashes`). Every body in that z-range on any axis, the
coaxial ones included, is compared with the ring in the same two steps, by the range
of its distances from the pin's axis; only the coupling's slot wheel is left out (the
pin runs in its slot).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache

import numpy as np

from ..design.model import Design, PinSlot
from ..kinematics.rates import axis_root
from ..teeth.forms import outline_for
from ..teeth.spec import ToothSpec
from .pinslot_geometry import pin_boss
from .placement import nominal_tip_radius, tooth_spec
from .proximity import overlapping_pairs
from .train_layout import Layout

__all__ = [
    "CONTACT_TOLERANCE",
    "Body",
    "Clash",
    "PinClash",
    "PinSweep",
    "bodies",
    "convex_hull_order",
    "find_clashes",
    "find_pin_clashes",
    "inside_polygon",
    "pin_sweeps",
    "signed_distance",
    "nominal_tip_radius",
    "outline_radius",
]

#: mm: overlaps below this are numerical noise, not interference.
CONTACT_TOLERANCE = 1e-6


@dataclass(frozen=True, slots=True)
class Body:
    """A solid of revolution or a toothed slab on one axis, ``z0`` to ``z1`` (mm)."""

    label: str  # "wheel w1", "hub of wheel w1", "arbor main", "collar of stud"
    kind: str  # "teeth" | "round"
    member: str  # arbor or sleeve it belongs to
    axis: str  # axis root
    z0: float
    z1: float
    radius: float  # tip circle (teeth) or outside radius (round)
    wheel: str | None = None  # the wheel a teeth or hub body belongs to


@dataclass(frozen=True, slots=True)
class Clash:
    """Two bodies that overlap by ``depth`` mm in the plane, between ``z0`` and ``z1``."""

    first: Body
    second: Body
    depth: float
    z0: float
    z1: float


@lru_cache(maxsize=256)
def _polyline(spec: ToothSpec) -> np.ndarray:
    return outline_for(spec).polyline(0.002)


def outline_radius(spec: ToothSpec) -> float:
    """Largest radius (mm) of the generated outline: the disc a turning wheel sweeps."""
    return float(np.max(np.hypot(*_polyline(spec).T)))


def bodies(layout: Layout) -> list[Body]:
    """Every body of the layout, in the fixed frame with carriers at angle 0."""
    design = layout.design
    out: list[Body] = []
    for w in design.wheels:
        if layout.position(w.arbor) is None:
            continue
        root = axis_root(design, w.arbor)
        spec = tooth_spec(w)
        top = w.height + w.face_width
        out.append(
            Body(
                f"wheel {w.name}", "teeth", w.arbor, root, w.height, top,
                nominal_tip_radius(spec), w.name,
            )
        )  # fmt: skip
        if w.hub_diameter > 0 and w.hub_length > 0:
            out.append(
                Body(
                    f"hub of wheel {w.name}", "round", w.arbor, root, top,
                    top + w.hub_length, w.hub_diameter / 2, w.name,
                )
            )  # fmt: skip
    for name, span in layout.stacking.spans.items():
        if layout.position(name) is None or span.length <= 0:
            continue
        root = axis_root(design, name)
        kind = "sleeve" if span.kind == "sleeve" else "arbor"
        out.append(
            Body(
                f"{kind} {name}",
                "round",
                name,
                root,
                span.z0,
                span.z1,
                layout.outside(name) / 2,
            )
        )
        for z0, z1, d in span.collars:
            out.append(Body(f"collar of {name}", "round", name, root, z0, z1, d / 2))
    return out


def _frame(design: Design, root: str) -> str | None:
    return design.carrier_arbor(root)


def _rate(rates: dict[str, Fraction | None], member: str | None) -> Fraction | None:
    return Fraction(0) if member is None else rates.get(member)


def _skip(design: Design, a: Body, b: Body, meshes: set[frozenset[str]]) -> bool:
    if a.axis == b.axis:
        return True
    if a.wheel and b.wheel and frozenset((a.wheel, b.wheel)) in meshes:
        return True
    for x, y in ((a, b), (b, a)):
        # a carried arbor turns in the wheel (and hub) that carries it
        carrier = design.arbor(y.axis).carrier
        if x.wheel is not None and carrier == x.wheel and y.wheel is None:
            return True
    return False


def signed_distance(point: np.ndarray, poly: np.ndarray) -> float:
    """Distance (mm) from ``point`` to the closed polygon ``poly``; negative inside."""
    a = poly
    b = np.roll(poly, -1, axis=0)
    ab = b - a
    ap = point - a
    t = np.clip(
        np.einsum("ij,ij->i", ap, ab)
        / np.maximum(np.einsum("ij,ij->i", ab, ab), 1e-300),
        0,
        1,
    )
    d = float(np.min(np.hypot(*(ap - t[:, None] * ab).T)))
    inside = bool(inside_polygon(np.asarray(point, float).reshape(1, 2), poly)[0])
    return -d if inside else d


def inside_polygon(points: np.ndarray, poly: np.ndarray) -> np.ndarray:
    """Which of ``points`` (``(m, 2)``, mm) lie inside the closed polygon ``poly``
    (even-odd rule, a ray towards +X)."""
    a = poly
    b = np.roll(poly, -1, axis=0)
    px, py = points[:, 0][:, None], points[:, 1][:, None]
    cross = (a[:, 1] > py) != (b[:, 1] > py)
    with np.errstate(divide="ignore", invalid="ignore"):
        xs = a[:, 0] + (py - a[:, 1]) * (b[:, 0] - a[:, 0]) / (b[:, 1] - a[:, 1])
    inside: np.ndarray = (np.count_nonzero(cross & (xs > px), axis=1) % 2) == 1
    return inside


def convex_hull_order(points: np.ndarray, collinear: bool = True) -> np.ndarray:
    """Indices of the convex hull of ``points`` (``(n, 2)``), counter-clockwise from
    the lowest-leftmost point; points on a side are kept unless ``collinear`` is false.

    Andrew's monotone chain (A. M. Andrew, "Another efficient algorithm for convex
    hulls in two dimensions", Information Processing Letters 9 (1979) 216-219). Points
    strictly inside the polygon of the extreme points are set aside first (they cannot
    be on the hull), so a mesh of many thousand vertices costs little more than a sort.
    """
    pts = np.asarray(points, dtype=np.float64)
    keep = np.arange(len(pts))
    if len(pts) > 16:
        s, d = pts[:, 0] + pts[:, 1], pts[:, 0] - pts[:, 1]
        extremes = np.unique(
            [f(v) for v in (pts[:, 0], pts[:, 1], s, d) for f in (np.argmin, np.argmax)]
        )
        ring = extremes[_chain_hull(pts[extremes], collinear=False)]
        if len(ring) >= 3:
            a, b = pts[ring], pts[np.roll(ring, -1)]
            rel = pts[:, None, :] - a[None, :, :]
            edge = b - a
            cross = edge[None, :, 0] * rel[:, :, 1] - edge[None, :, 1] * rel[:, :, 0]
            scale = max(1.0, float(np.abs(pts).max()))
            keep = np.flatnonzero(~np.all(cross > 1e-9 * scale * scale, axis=1))
    order: np.ndarray = keep[_chain_hull(pts[keep], collinear)]
    return order


def _chain_hull(pts: np.ndarray, collinear: bool) -> np.ndarray:
    """The monotone chain itself, on every point of ``pts``."""
    order = np.lexsort((pts[:, 1], pts[:, 0]))
    limit = -1e-9 if collinear else 1e-9

    def cross(o: int, a: int, b: int) -> float:
        return float(
            (pts[a, 0] - pts[o, 0]) * (pts[b, 1] - pts[o, 1])
            - (pts[a, 1] - pts[o, 1]) * (pts[b, 0] - pts[o, 0])
        )

    def chain(seq: np.ndarray) -> list[int]:
        out: list[int] = []
        for i in seq:
            while len(out) >= 2 and cross(out[-2], out[-1], int(i)) < limit:
                out.pop()
            out.append(int(i))
        return out

    lower, upper = chain(order), chain(order[::-1])
    return np.array(lower[:-1] + upper[:-1], dtype=int)


def _polygon_depth(pa: np.ndarray, pb: np.ndarray) -> float:
    """Largest depth (mm) of a vertex of one polygon inside the other; <= 0 if apart."""
    depth = -math.inf
    for p, q in ((pa, pb), (pb, pa)):
        inside = p[inside_polygon(p, q)]
        for pt in inside[:: max(1, len(inside) // 400)]:
            depth = max(depth, -signed_distance(pt, q))
    if depth == -math.inf:
        # apart: minus the smallest gap, from a thinned set of vertices
        depth = -min(signed_distance(pt, pb) for pt in pa[:: max(1, len(pa) // 200)])
    return depth


def _reach_boxes(layout: Layout, items: list[Body]) -> tuple[np.ndarray, np.ndarray]:
    """Boxes (x, y, z) that hold each body wherever its carrier turns it (mm)."""
    low = np.empty((len(items), 3))
    high = np.empty((len(items), 3))
    centres: dict[str, tuple[np.ndarray, float]] = {}
    for k, body in enumerate(items):
        if body.axis not in centres:
            centres[body.axis] = _centre(layout, body.axis)
        c, eccentric = centres[body.axis]
        reach = eccentric + body.radius
        low[k] = (c[0] - reach, c[1] - reach, body.z0)
        high[k] = (c[0] + reach, c[1] + reach, body.z1)
    return low, high


def find_clashes(layout: Layout, rates: dict[str, Fraction | None]) -> list[Clash]:
    """Every pair of bodies on different axes that overlap (mm); ``rates`` per arbor."""
    design = layout.design
    meshes = {frozenset(m.pair) for m in design.meshes}
    items = bodies(layout)
    clashes: list[Clash] = []
    # only bodies whose reach overlaps by more than the tolerance can clash
    for i, j in overlapping_pairs(*_reach_boxes(layout, items), CONTACT_TOLERANCE):
        a, b = items[i], items[j]
        z0, z1 = max(a.z0, b.z0), min(a.z1, b.z1)
        if _skip(design, a, b, meshes):
            continue
        depth = _depth(layout, rates, a, b)
        if depth > CONTACT_TOLERANCE:
            clashes.append(Clash(a, b, depth, z0, z1))
    return clashes


def _depth(
    layout: Layout, rates: dict[str, Fraction | None], a: Body, b: Body
) -> float:
    design = layout.design
    pa = np.array(layout.placing.positions[a.axis])
    pb = np.array(layout.placing.positions[b.axis])
    fa, fb = _frame(design, a.axis), _frame(design, b.axis)
    fixed_distance = _fixed_distance(design, a.axis, b.axis)
    if fixed_distance:
        d = float(np.hypot(*(pa - pb)))
    else:
        d = _nearest_approach(layout, a.axis, b.axis)
    if a.radius + b.radius - d <= CONTACT_TOLERANCE:
        return a.radius + b.radius - d
    ra = _swept(design, a)
    rb = _swept(design, b)
    if ra + rb - d <= CONTACT_TOLERANCE or not fixed_distance:
        return ra + rb - d
    # same relative position all the time: a body standing still relative to the
    # other keeps its exact outline
    frame = fa if fa == fb else (fa if fa is not None else fb)
    frame_rate = _rate(rates, frame)
    still_a = _still(a, rates, frame_rate)
    still_b = _still(b, rates, frame_rate)
    if still_a and still_b:
        return _polygon_depth(_outline(design, a) + pa, _outline(design, b) + pb)
    if still_a:
        return rb - signed_distance(pb, _outline(design, a) + pa)
    if still_b:
        return ra - signed_distance(pa, _outline(design, b) + pb)
    return ra + rb - d


def _fixed_distance(design: Design, a: str, b: str) -> bool:
    """Do axis roots ``a`` and ``b`` keep one distance however the carriers turn?"""
    fa, fb = _frame(design, a), _frame(design, b)
    return (
        fa == fb
        or fa is not None
        and axis_root(design, fa) == b
        or fb is not None
        and axis_root(design, fb) == a
    )


def _swept(design: Design, body: Body) -> float:
    """Radius (mm) of the disc a body sweeps when it turns: its outline's largest."""
    if body.kind != "teeth" or body.wheel is None:
        return body.radius
    try:
        return outline_radius(tooth_spec(design.wheel(body.wheel)))
    except (ImportError, ValueError):  # no generator for this form yet: the tip circle
        return body.radius


def _outline(design: Design, body: Body) -> np.ndarray:
    """The toothed outline of ``body``'s wheel about its own axis (mm)."""
    if body.wheel is None:
        raise ValueError(f"{body.label} is no wheel's teeth")
    return _polyline(tooth_spec(design.wheel(body.wheel)))


def _still(
    body: Body, rates: dict[str, Fraction | None], frame_rate: Fraction | None
) -> bool:
    """Does a toothed body stand still in the frame both axes share?"""
    if body.kind != "teeth" or frame_rate is None:
        return False
    rate = rates.get(body.member)
    return rate is not None and rate == frame_rate


def _nearest_approach(layout: Layout, a: str, b: str) -> float:
    """Smallest distance (mm) between two axes when at least one circles a carrier."""
    return _approach(layout, a, b)[0]


def _centre(layout: Layout, root: str) -> tuple[np.ndarray, float]:
    """The point an axis root circles (its own position if not carried) and how far
    from it the axis runs (mm)."""
    design = layout.design
    pos = layout.placing.positions
    frame = _frame(design, root)
    if frame is None:
        return np.array(pos[root]), 0.0
    c = np.array(pos[axis_root(design, frame)])
    return c, float(np.hypot(*(np.array(pos[root]) - c)))


def _approach(layout: Layout, a: str, b: str) -> tuple[float, float]:
    """Smallest and largest distance (mm) between two axes that circle carriers."""
    ca, ea = _centre(layout, a)
    cb, eb = _centre(layout, b)
    apart = float(np.hypot(*(ca - cb)))
    far = apart + ea + eb
    if eb == 0.0:
        return abs(apart - ea), far
    if ea == 0.0:
        return abs(apart - eb), far
    # both circle (different) carriers: the conservative nearest approach
    return max(0.0, apart - ea - eb), far


@dataclass(frozen=True, slots=True)
class PinSweep:
    """The ring a coupling's pin sweeps about its wheel's axis (mm).

    Radii ``inner`` to ``outer`` about axis root ``axis``, from ``z0`` (the pin wheel's
    front face) to ``z1`` (the pin's end).
    """

    pinslot: str
    pin_wheel: str
    slot_wheel: str
    axis: str
    member: str
    inner: float
    outer: float
    z0: float
    z1: float


@dataclass(frozen=True, slots=True)
class PinClash:
    """A body that reaches ``depth`` mm into a pin's ring between ``z0`` and ``z1``."""

    sweep: PinSweep
    body: Body
    depth: float
    z0: float
    z1: float


def pin_sweeps(layout: Layout) -> list[PinSweep]:
    """The ring of every placed pin-and-slot coupling whose sizes can be worked out.

    A coupling whose offset or stacking is impossible is left out: the pin-and-slot
    checks (``pinslot.offset``, ``pinslot.stacking``) report it.
    """
    design = layout.design
    out = []
    for p in design.pinslots:
        wheel = design.wheel(p.pin)
        if layout.position(wheel.arbor) is None:
            continue
        try:
            boss = pin_boss(design, p)
        except ValueError:
            continue
        front = wheel.height + wheel.face_width
        out.append(_sweep(design, p, boss.radius, boss.diameter, front, boss.length))
    return out


def _sweep(
    design: Design, p: PinSlot, r: float, d: float, front: float, length: float
) -> PinSweep:
    member = design.wheel(p.pin).arbor
    return PinSweep(
        p.name, p.pin, p.slot, axis_root(design, member), member,
        r - d / 2, r + d / 2, front, front + length,
    )  # fmt: skip


def find_pin_clashes(
    layout: Layout, rates: dict[str, Fraction | None]
) -> list[PinClash]:
    """Every body that meets a pin's swept ring (mm); ``rates`` per arbor.

    The coupling's own slot wheel is left out; its arbor is not (the pin must clear it
    where it carries the slot wheel, inside the pin's z-range).
    """
    items = bodies(layout)
    clashes: list[PinClash] = []
    low, high = _reach_boxes(layout, items)
    for sweep in pin_sweeps(layout):
        # only bodies whose reach meets the ring's can touch it
        c, eccentric = _centre(layout, sweep.axis)
        reach = eccentric + sweep.outer
        ring_low = np.array([c[0] - reach, c[1] - reach, sweep.z0])
        ring_high = np.array([c[0] + reach, c[1] + reach, sweep.z1])
        overlap = np.minimum(high, ring_high) - np.maximum(low, ring_low)
        near = np.flatnonzero(np.all(overlap > CONTACT_TOLERANCE, axis=1))
        for body in (items[k] for k in near):
            if body.kind == "teeth" and body.wheel == sweep.slot_wheel:
                continue
            z0, z1 = max(sweep.z0, body.z0), min(sweep.z1, body.z1)
            if z1 - z0 <= CONTACT_TOLERANCE:
                continue
            depth = _ring_depth(layout, rates, sweep, body)
            if depth > CONTACT_TOLERANCE:
                clashes.append(PinClash(sweep, body, depth, z0, z1))
    return clashes


def _ring_overlap(sweep: PinSweep, near: float, far: float) -> float:
    """Depth (mm) of a body in the ring; <= 0 if apart.

    The body's distances from the pin's axis run from ``near`` to ``far`` (mm); the
    depth is the smaller radial move that clears the ring, inwards or outwards.
    """
    return min(sweep.outer - max(near, 0.0), far - sweep.inner)


def _ring_depth(
    layout: Layout, rates: dict[str, Fraction | None], sweep: PinSweep, body: Body
) -> float:
    design = layout.design
    pa = np.array(layout.placing.positions[sweep.axis])
    pb = np.array(layout.placing.positions[body.axis])
    fixed_distance = _fixed_distance(design, sweep.axis, body.axis)
    if fixed_distance:
        near = far = float(np.hypot(*(pa - pb)))
    else:
        near, far = _approach(layout, sweep.axis, body.axis)
    depth = _ring_overlap(sweep, near - body.radius, far + body.radius)
    if depth <= CONTACT_TOLERANCE:
        return depth
    swept = _swept(design, body)
    depth = _ring_overlap(sweep, near - swept, far + swept)
    if depth <= CONTACT_TOLERANCE or not fixed_distance:
        return depth
    # a wheel standing still relative to the pin's axis keeps its exact outline: its
    # distances from that axis run from the polygon's (0 if it holds the axis) to its
    # farthest vertex's
    fa, fb = _frame(design, sweep.axis), _frame(design, body.axis)
    frame = fa if fa == fb else (fa if fa is not None else fb)
    if body.wheel is None or not _still(body, rates, _rate(rates, frame)):
        return depth
    poly = _polyline(tooth_spec(design.wheel(body.wheel))) + pb
    outline_near = signed_distance(pa, poly)
    outline_far = float(np.max(np.hypot(*(poly - pa).T)))
    return _ring_overlap(sweep, outline_near, outline_far)
