"""Wheels, arbors, sleeves and pins as solids: shape of the B-rep, sizes and volumes."""

from __future__ import annotations

import math

import numpy as np
import pytest

from wheelgen.layout.part_kinds import (
    ArborPart,
    PinBoss,
    PinPart,
    SleevePart,
    SlotCut,
    WheelPart,
)
from wheelgen.layout.wheel_profile import Hole, plate_profile, spoke_sizes
from wheelgen.teeth.forms import outline_for
from wheelgen.teeth.spec import ToothSpec


def _closed(hole: Hole) -> bool:
    segs = hole.segments
    return all(
        np.allclose(a.end, b.start, atol=1e-9)
        for a, b in zip(segs, segs[1:] + segs[:1])
    )


def _signed_area(loop: np.ndarray) -> float:
    x, y = loop[:, 0], loop[:, 1]
    return 0.5 * float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))


@pytest.mark.parametrize(("spokes", "rho"), [(3, 1.0), (5, 0.5), (8, 0.0)])
def test_windows_are_closed_ccw_and_clear_of_rim_hub_and_arms(spokes, rho):
    part = WheelPart(
        "w",
        ToothSpec(60, 1.0),
        3.0,
        5.0,
        spokes=spokes,
        rim=3.0,
        round_radius=rho,
        hub_diameter=12.0,
    )
    prof = plate_profile(part, outline_for(part.tooth))
    windows = [h for h in prof.holes if h.role == "window"]
    assert len(windows) == spokes
    r_in, r_out, arm = spoke_sizes(part, prof.root_radius)
    # the rules: rim 3 mm under the root circle, windows one rim outside the hub
    assert r_out == pytest.approx(prof.root_radius - 3.0)
    assert r_in == pytest.approx(6.0 + 3.0) and arm == 3.0
    for w in windows:
        assert _closed(w)
        pts = w.polyline(0.001)
        assert _signed_area(pts) > 0  # counter-clockwise
        r = np.hypot(pts[:, 0], pts[:, 1])
        assert r.min() >= r_in - 1e-9 and r.max() <= r_out + 1e-9
    # between two windows stands an arm at least the arm width wide: the distance of
    # every window point from the arm's centre line (on +X, between windows 0 and
    # n-1) is at least half the arm width
    near = np.vstack([windows[0].polyline(0.001), windows[-1].polyline(0.001)])
    ahead = near[near[:, 0] > 0]
    assert np.abs(ahead[:, 1]).min() >= arm / 2 - 1e-9


def test_window_fillets_are_tangent_arcs_of_the_cutter_radius():
    part = WheelPart(
        "w", ToothSpec(60, 1.0), 3.0, 5.0, spokes=4, rim=3.0, round_radius=0.8
    )
    prof = plate_profile(part, outline_for(part.tooth))
    window = next(h for h in prof.holes if h.role == "window")
    arcs = [s for s in window.segments if s.kind == "arc"]
    small = []
    for s in arcs:
        a, b, c = s.points
        # circumradius of the three points (derived: R = abc / 4 area)
        la, lb, lc = (
            np.linalg.norm(b - c),
            np.linalg.norm(a - c),
            np.linalg.norm(a - b),
        )
        u, v = b - a, c - a
        area = abs(u[0] * v[1] - u[1] * v[0]) / 2
        small.append(la * lb * lc / (4 * area))
    assert sorted(small)[:4] == pytest.approx([0.8] * 4, abs=1e-9)
    # tangency: each line meets its neighbouring arcs without a kink
    segs = window.segments
    for i, s in enumerate(segs):
        if s.kind != "line":
            continue
        d = (s.end - s.start) / np.linalg.norm(s.end - s.start)
        nxt = segs[(i + 1) % len(segs)]
        a, m, c = nxt.points
        ctr = _centre(a, m, c)
        assert (
            abs(np.dot(d, a - ctr)) < 1e-9
        )  # radius at the joint is normal to the line


def _centre(a, b, c):
    # derived, not the outline's own formula: the centre x is as far from b and c as
    # from a, |x - b|^2 = |x - a|^2, which is the linear 2 (b - a) . x = b.b - a.a
    rows = 2 * np.array([b - a, c - a])
    return np.linalg.solve(rows, [b @ b - a @ a, c @ c - a @ a])


def test_too_many_spokes_for_a_small_wheel_is_refused():
    part = WheelPart(
        "tiny", ToothSpec(12, 1.0), 3.0, 3.0, spokes=6, rim=2.0, round_radius=0.5
    )
    with pytest.raises(ValueError, match="tiny: no room"):
        plate_profile(part, outline_for(part.tooth))


@pytest.mark.parametrize(("seat", "sides"), [("square", 4), ("hex", 6)])
def test_polygon_seats_have_the_bore_across_flats(seat, sides):
    part = WheelPart("w", ToothSpec(30, 1.0), 3.0, 4.0, seat=seat)
    prof = plate_profile(part, outline_for(part.tooth))
    bore = prof.holes[0]
    pts = bore.polyline(0.0005)
    # derived: a regular polygon with across-flats F has area n (F/2)^2 tan(pi/n)
    assert _signed_area(pts) == pytest.approx(
        sides * 4.0 * math.tan(math.pi / sides), rel=1e-5
    )
    assert np.abs(pts[:, 0]).max() == pytest.approx(2.0, abs=1e-9)  # a flat faces +X


cq = pytest.importorskip("cadquery")


@pytest.mark.cad
# (106, 0.3): the two half root arcs' radii differ in the last bit there
@pytest.mark.parametrize(("z", "m"), [(40, 1.0), (106, 0.3)])
def test_plain_wheel_is_one_prism_of_exact_edges(z, m):
    from wheelgen.solids.wheel import make_wheel

    part = WheelPart("w", ToothSpec(z, m), 3.0, 4.0)
    outline = outline_for(part.tooth)
    solid = make_wheel(part, outline)
    assert solid.isValid()
    top = solid.faces(">Z").Edges()
    kinds = [e.geomType() for e in top]
    per_tooth = len(outline.tooth)
    # one edge per outline segment plus the bore: no polyline, no boolean debris;
    # the two half root arcs between teeth are one arc (one edge)
    assert len(top) == z * (per_tooth - 1) + 1
    assert kinds.count("BSPLINE") == z * sum(s.kind == "spline" for s in outline.tooth)
    # derived: volume = (outline area - bore area) x face width
    exact = (outline.area(0.0001) - math.pi * 4.0) * 3.0
    assert solid.Volume() == pytest.approx(exact, rel=1e-5)


@pytest.mark.cad
def test_features_change_the_volume_by_their_own_volume():
    from wheelgen.solids.wheel import make_wheel

    spec = ToothSpec(48, 1.0)
    outline = outline_for(spec)
    base = make_wheel(WheelPart("w", spec, 3.0, 4.0), outline).Volume()
    # hub boss: derived, an annulus (D 10, d 4) 5 mm long
    hub = make_wheel(
        WheelPart("w", spec, 3.0, 4.0, hub_diameter=10.0, hub_length=5.0), outline
    )
    assert hub.isValid()
    assert hub.Volume() - base == pytest.approx(
        math.pi / 4 * (100 - 16) * 5.0, rel=1e-9
    )
    # pin boss: derived, a cylinder d 1.5 x 4
    pin = make_wheel(
        WheelPart("w", spec, 3.0, 4.0, pin=PinBoss(15.0, 1.5, 4.0)), outline
    )
    assert pin.Volume() - base == pytest.approx(math.pi / 4 * 1.5**2 * 4.0, rel=1e-9)
    # a separate pin's hole instead: the same cylinder through the face width
    hole = make_wheel(
        WheelPart("w", spec, 3.0, 4.0, pin=PinBoss(15.0, 1.5, 4.0, hole_only=True)),
        outline,
    )
    assert base - hole.Volume() == pytest.approx(math.pi / 4 * 1.5**2 * 3.0, rel=1e-9)
    # radial slot: derived, stadium area = 2 w L + pi w^2 / 4 with L = outer - inner
    slot = make_wheel(
        WheelPart("w", spec, 3.0, 4.0, slot=SlotCut(8.0, 18.0, 2.0)), outline
    )
    assert slot.isValid()
    assert base - slot.Volume() == pytest.approx((2.0 * 10.0 + math.pi) * 3.0, rel=1e-9)


@pytest.mark.cad
def test_slot_running_into_the_bore_is_cut():
    from wheelgen.solids.wheel import make_wheel

    spec = ToothSpec(48, 1.0)
    solid = make_wheel(WheelPart("w", spec, 3.0, 4.0, slot=SlotCut(1.0, 18.0, 2.0)))
    assert solid.isValid() and len(solid.Solids()) == 1
    # the slot opens into the bore: one hole, reaching r = 18 + 2/2 = 19 mm on +X
    (hole,) = solid.faces("<Z").innerWires()
    bb = hole.BoundingBox()
    assert bb.xmax == pytest.approx(19.0, abs=1e-6)
    assert bb.xmin == pytest.approx(-2.0, abs=1e-6)  # the bore, r = 2 mm


@pytest.mark.cad
def test_pinned_seat_has_a_cross_hole_through_the_hub():
    from wheelgen.layout.wheel_profile import cross_pin_diameter
    from wheelgen.solids.wheel import make_wheel

    spec = ToothSpec(30, 1.0)
    plain = make_wheel(WheelPart("w", spec, 3.0, 3.0, hub_diameter=9.0, hub_length=6.0))
    pinned = make_wheel(
        WheelPart("w", spec, 3.0, 3.0, seat="pinned", hub_diameter=9.0, hub_length=6.0)
    )
    assert pinned.isValid()
    d = cross_pin_diameter(3.0)
    assert d == 1.0
    # the removed volume is two holes through the hub wall, each a bit under
    # pi/4 d^2 (9-3)/2 = 2.356 mm3 (the walls are curved): between 0.9x and 1.1x
    removed = plain.Volume() - pinned.Volume()
    assert 0.9 * 2 * 2.356 < removed < 1.1 * 2 * 2.356


@pytest.mark.cad
@pytest.mark.parametrize(
    ("part", "volume"),
    [
        # derived: pi/4 d^2 L
        (ArborPart("a", 3.0, 40.0), math.pi / 4 * 9.0 * 40.0),
        (PinPart("p", 1.0, 5.0), math.pi / 4 * 1.0 * 5.0),
        # derived: tube pi/4 (D^2 - d^2) L, plus a collar ring pi/4 (8^2 - 5^2) x 1
        (
            SleevePart("s", 3.0, 5.0, 20.0, collars=((0.0, 1.0, 8.0),)),
            math.pi / 4 * (25 - 9) * 20.0 + math.pi / 4 * (64 - 25) * 1.0,
        ),
        # derived: a square seat 4 mm long milled on 5 mm stock, flats 5 cos 45 apart:
        # removes (pi/4 D^2 - F^2) x 4 with F^2 = D^2 / 2
        (
            SleevePart("q", 3.0, 5.0, 20.0, seats=((5.0, 9.0, "square"),)),
            math.pi / 4 * (25 - 9) * 20.0 - (math.pi / 4 * 25 - 12.5) * 4.0,
        ),
    ],
    ids=["arbor", "pin", "sleeve-collar", "sleeve-square"],
)
def test_round_parts_have_their_volume(part, volume):
    from wheelgen.solids.part import make_part

    solid = make_part(part)
    assert solid.isValid()
    assert solid.Volume() == pytest.approx(volume, rel=1e-7)
    bb = solid.BoundingBox()
    assert bb.zmin == pytest.approx(0.0) and bb.zmax == pytest.approx(part.length)


@pytest.mark.cad
def test_library_doc_examples_run(tmp_path, monkeypatch):
    import re
    from pathlib import Path

    root = Path(__file__).resolve().parents[1]
    text = (root / "docs" / "library.md").read_text()
    blocks = re.findall(r"```python\n(.*?)```", text, flags=re.S)
    assert len(blocks) >= 2
    # the first example: one wheel from parameters
    scope: dict = {}
    exec(compile(blocks[0], "library.md", "exec"), scope)  # noqa: S102  (our own docs)
    assert scope["wheel"].isValid()
    assert scope["result"].val() is scope["wheel"]
    # the last example: numbers only (run from the repository root, as written)
    numbers: dict = {}
    monkeypatch.chdir(root)
    exec(compile(blocks[-1], "library.md", "exec"), numbers)  # noqa: S102
    assert str(numbers["result"].solution.rate("tide")) == "371/192"
    # ISO 21771 span, as the handbook tables print it (docs/references.md section 4):
    # z = 20, k = 3, W = 7.6604 mm
    assert round(numbers["sheet"].span_width, 4) == 7.6604
