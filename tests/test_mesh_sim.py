"""The 2D mesh simulator against the involute property and a hand-solvable case.

Reference outlines are built here from first principles (exact involute points joined
by short lines; triangles with sharp corners), independent of ``wheelgen.teeth``.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from _contact import rot, touch_angles

from wheelgen.checks.mesh_sim import MeshSimulation, simulate_mesh, tooth_table
from wheelgen.teeth.outline import Segment, WheelOutline


def _inv(a: float) -> float:
    return math.tan(a) - a


def _lines(points: np.ndarray) -> list[Segment]:
    return [Segment("line", points[i : i + 2]) for i in range(len(points) - 1)]


def _arc(r: float, a0: float, a1: float) -> Segment:
    am = 0.5 * (a0 + a1)
    pts = np.array([[r * math.cos(a), r * math.sin(a)] for a in (a0, am, a1)])
    return Segment("arc", pts)


def exact_involute(z: int, m: float, thinning: float = 0.0, alpha_deg: float = 20.0):
    """Involute wheel, x = 0, addendum 1 m, dedendum 1.25 m, 400 exact flank points.

    Half angular thickness at radius r: psi + inv(alpha) - inv(alpha_r), cos alpha_r =
    rb / r (tooth thickness at any circle, ISO 21771:2007 sec. 5.4, from memory). Below
    the base circle the flank runs radially down to a plain root arc. Chord error of the
    lines: (flank length / 400)^2 / (8 rho) < 1e-5 mm for these sizes (derived).
    """
    al = math.radians(alpha_deg)
    rp, p = m * z / 2, 2 * math.pi / z
    rb, ra, rf = rp * math.cos(al), rp + m, rp - 1.25 * m
    psi = (math.pi * m / 2 - thinning) / (2 * rp) + _inv(al)
    rr = np.linspace(max(rb, rf), ra, 400)
    ang = psi - np.array([_inv(math.acos(rb / r)) for r in rr])
    upper = np.column_stack((rr * np.cos(ang), rr * np.sin(ang)))
    lower = upper * [1.0, -1.0]
    foot = np.array([[rf * math.cos(ang[0]), rf * math.sin(ang[0])]])
    segs = [_arc(rf, -p / 2, -ang[0])]
    if rf < rb:
        segs += _lines(np.vstack((foot * [1.0, -1.0], lower[:1])))
    segs += _lines(lower)
    segs.append(_arc(ra, -ang[-1], ang[-1]))
    segs += _lines(upper[::-1])
    if rf < rb:
        segs += _lines(np.vstack((upper[:1], foot)))
    segs.append(_arc(rf, ang[0], p / 2))
    radii = {"pitch": rp, "base": rb, "tip": ra, "root": rf}
    return WheelOutline(z, tuple(segs), radii)


def _tri_points(
    z: int, r_tip: float, r_root: float, foot_deg: float
) -> list[np.ndarray]:
    """Corners of one sharp triangular tooth, flat (chord) root, gap middle first."""
    p, b = 2 * math.pi / z, math.radians(foot_deg)
    return [
        np.array([r * math.cos(a), r * math.sin(a)])
        for r, a in (
            (r_root, -p / 2),
            (r_root, -b),
            (r_tip, 0.0),
            (r_root, b),
            (r_root, p / 2),
        )
    ]


def triangle_wheel(
    z: int, r_tip: float, r_root: float, foot_deg: float
) -> WheelOutline:
    pts = np.array(_tri_points(z, r_tip, r_root, foot_deg))
    radii = {"pitch": (r_tip + r_root) / 2, "tip": r_tip, "root": r_root}
    return WheelOutline(z, tuple(_lines(pts)), radii)


def _wrap(a: float) -> float:
    return (a + math.pi) % (2 * math.pi) - math.pi


def _touch_angles(w1: tuple, w2: tuple, a: float, th1: float) -> list[float]:
    """Every driven angle at which a corner of one wheel lies on an edge of the other
    (the closed form of tests/_contact.py), for two wheels of sharp triangles."""

    def corners_edges(spec: tuple) -> tuple[list[np.ndarray], list[tuple]]:
        z = spec[0]
        vs, es = [], []
        for k in range(z):
            pts = [rot(q, 2 * math.pi * k / z) for q in _tri_points(*spec)]
            vs += pts[:-1]
            es += list(zip(pts[:-1], pts[1:], strict=True))
        return vs, es

    v1, e1 = corners_edges(w1)
    v2, e2 = corners_edges(w2)
    return touch_angles(v1, e1, v2, e2, a, th1)


# --- the involute property ---------------------------------------------------------


@pytest.fixture(scope="module")
def pair_20_40() -> tuple[WheelOutline, WheelOutline]:
    return exact_involute(20, 1.0, thinning=0.05), exact_involute(
        40, 1.0, thinning=0.05
    )


def test_involute_at_standard_centre_distance_has_no_transmission_error(pair_20_40):
    g1, g2 = pair_20_40
    sim = simulate_mesh(g1, g2, 30.0)  # derived: a = m (z1 + z2) / 2
    assert isinstance(sim, MeshSimulation)
    assert not sim.jams and not sim.contact_lost
    # conjugate flanks: zero within the simulator's own resolution (well below 0.01 deg)
    assert sim.te_peak_to_peak_deg <= sim.resolution_deg
    assert sim.te_peak_to_peak_deg < 1e-3
    # derived: at the standard centre distance the reference circles roll on each other,
    # so the circular backlash there is the sum of the two thinnings, 0.05 + 0.05 mm
    assert sim.backlash_mm == pytest.approx(0.10, abs=2e-4)
    # and the play is the same in every position (constant normal backlash)
    assert sim.backlash_max_deg - sim.backlash_deg < 1e-3


@pytest.mark.parametrize("spread", [0.1, 0.3, 0.6])
def test_involute_pulled_apart_keeps_zero_error_and_gains_backlash(pair_20_40, spread):
    g1, g2 = pair_20_40
    z1, z2, m, al = 20, 40, 1.0, math.radians(20.0)
    a0 = m * (z1 + z2) / 2
    sim = simulate_mesh(g1, g2, a0 + spread)
    assert sim.te_peak_to_peak_deg < 1e-3
    # derived: working pressure angle cos a_w = a0 cos a / a (ISO 21771, from memory);
    # tooth thickness on the working pitch circles s' = 2 r' (psi + inv a - inv a_w);
    # the driven wheel's free turn is (p' - s1' - s2') / r2'.
    aw = math.acos(a0 * math.cos(al) / (a0 + spread))
    psi1 = (math.pi * m / 2 - 0.05) / (m * z1)
    psi2 = (math.pi * m / 2 - 0.05) / (m * z2)
    play = (
        2 * math.pi / z2
        - 2 * (z1 / z2) * (psi1 + _inv(al) - _inv(aw))
        - 2 * (psi2 + _inv(al) - _inv(aw))
    )
    assert sim.backlash_deg == pytest.approx(math.degrees(play), abs=1e-3)
    # the usual shop estimate j = 2 da tan(alpha) more than the built-in 0.1 mm (KHK
    # Gear Technical Reference, "Backlash", from memory), a first-order estimate: within
    # 6 % up to spreads of 0.3 m (derived from the exact value above)
    if spread <= 0.3:
        assert sim.backlash_mm == pytest.approx(
            0.1 + 2 * spread * math.tan(al), rel=0.06
        )


def test_backlash_grows_with_the_centre_distance(pair_20_40):
    g1, g2 = pair_20_40
    plays = [
        simulate_mesh(g1, g2, 30.0 + d, steps=60).backlash_deg for d in (0, 0.2, 0.4)
    ]
    assert plays[0] < plays[1] < plays[2]


def test_involute_pushed_together_jams():
    g1, g2 = exact_involute(20, 1.0), exact_involute(40, 1.0)  # no thinning
    tight = simulate_mesh(g1, g2, 29.95, steps=60)
    assert tight.jams and tight.min_play_deg < -0.01
    # derived: zero thinning at the standard distance is exactly zero play
    just = simulate_mesh(g1, g2, 30.0, steps=60)
    assert not just.jams
    assert abs(just.min_play_deg) < 1e-3


def test_project_involute_generator_is_conjugate_too():
    from wheelgen.teeth.forms import outline_for
    from wheelgen.teeth.spec import ToothSpec

    g1 = outline_for(ToothSpec(12, 1.0, thinning=0.05))
    g2 = outline_for(ToothSpec(30, 1.0, thinning=0.05))
    sim = simulate_mesh(g1, g2, 21.0)
    assert not sim.jams
    assert sim.te_peak_to_peak_deg < 0.01
    assert sim.backlash_mm == pytest.approx(0.10, abs=1e-3)


# --- a case solved by hand -----------------------------------------------------------

TRI_1 = (12, 7.0, 5.2, 8.0)  # teeth, tip radius, root radius, half-angle of the foot
TRI_2 = (20, 11.0, 9.2, 5.0)
TRI_A = 16.6


@pytest.fixture(scope="module")
def tri_sim() -> MeshSimulation:
    return simulate_mesh(
        triangle_wheel(*TRI_1), triangle_wheel(*TRI_2), TRI_A, steps=120
    )


@pytest.mark.parametrize("step", [0, 17, 40, 77, 119])
def test_triangular_first_contact_matches_hand_solution(tri_sim, step):
    p2 = 2 * math.pi / TRI_2[0]
    th1 = math.radians(tri_sim.driver_deg[step])
    ideal = math.pi - p2 / 2 - th1 * TRI_1[0] / TRI_2[0]
    offsets = [_wrap(t - ideal) for t in _touch_angles(TRI_1, TRI_2, TRI_A, th1)]
    # the ideal position is free (these thin teeth have a lot of play), so turning the
    # driven wheel either way from it, the first touching is the contact
    drive = min(o for o in offsets if 0 < o < p2)
    coast = max(o for o in offsets if -p2 < o < 0)
    assert tri_sim.drive_deg[step] == pytest.approx(
        math.degrees(ideal + drive), abs=2e-4
    )
    assert tri_sim.coast_deg[step] == pytest.approx(
        math.degrees(ideal + coast), abs=2e-4
    )


def test_triangular_teeth_have_real_transmission_error(tri_sim):
    # derived from the hand solution: sample the drive contact over the pitch
    assert not tri_sim.jams and not tri_sim.contact_lost
    assert tri_sim.te_peak_to_peak_deg > 0.5
    assert tri_sim.backlash_deg > 5.0


def test_triangular_pair_pushed_onto_the_root_jams():
    # derived: tip 7.0 + root 9.2 = 16.2 mm; at 16.1 mm the driver's tips hit the root
    sim = simulate_mesh(triangle_wheel(*TRI_1), triangle_wheel(*TRI_2), 16.1, steps=40)
    assert sim.jams


def test_wheels_out_of_reach_lose_contact():
    # derived: tip radii 7.0 + 11.0 = 18.0 mm < 18.5 mm, the teeth never touch
    sim = simulate_mesh(triangle_wheel(*TRI_1), triangle_wheel(*TRI_2), 18.5, steps=40)
    assert sim.contact_lost
    assert math.isinf(sim.te_peak_to_peak_deg)


def test_other_sense_of_a_symmetric_pair_gives_the_same_numbers(tri_sim):
    other = simulate_mesh(
        triangle_wheel(*TRI_1), triangle_wheel(*TRI_2), TRI_A, steps=120, sense="cw"
    )
    assert other.backlash_deg == pytest.approx(tri_sim.backlash_deg, abs=1e-4)
    assert other.te_peak_to_peak_deg == pytest.approx(
        tri_sim.te_peak_to_peak_deg, abs=1e-3
    )


def test_tooth_table_of_a_triangle():
    # derived: a flank line from (r_root, foot angle) to (r_tip, 0); its polar angle at
    # the radius halfway is found by intersecting line and circle by hand below
    wheel = triangle_wheel(*TRI_1)
    table = tooth_table(wheel, 1e-4)
    r = 6.1
    p0 = np.array(
        [5.2 * math.cos(math.radians(8.0)), 5.2 * math.sin(math.radians(8.0))]
    )
    p1 = np.array([7.0, 0.0])
    d = p1 - p0
    qa, qb, qc = d @ d, p0 @ d, p0 @ p0 - r * r
    t = (-qb + math.sqrt(qb * qb - qa * qc)) / qa
    x, y = p0 + t * d
    expected = math.atan2(y, x)
    assert float(np.interp(r, table.radius, table.upper_rad)) == pytest.approx(
        expected, abs=1e-7
    )
    assert float(np.interp(r, table.radius, table.lower_rad)) == pytest.approx(
        expected, abs=1e-7
    )


@pytest.mark.parametrize(
    ("kwargs", "word"),
    [({"steps": 3}, "steps"), ({"pitches": 0}, "pitches"), ({"sense": "up"}, "sense")],
)
def test_bad_arguments_say_which(kwargs, word):
    g = triangle_wheel(*TRI_1)
    with pytest.raises(ValueError, match=word):
        simulate_mesh(g, g, 14.0, **kwargs)


def test_bad_centre_distance():
    g = triangle_wheel(*TRI_1)
    with pytest.raises(ValueError, match="centre_distance"):
        simulate_mesh(g, g, 0.0)
