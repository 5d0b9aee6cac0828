"""Exact rates: simple, compound and epicyclic trains, couplings, locks, loose arbors.

Check values come from outside the solver: a published worked exercise, calendar
relations from astronomy references, a rolling-contact simulation written here without
the relation of Willis, and products of tooth ratios worked out by hand.
"""

from __future__ import annotations

import math
from fractions import Fraction
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from wheelgen.design import load_design, loads_design
from wheelgen.kinematics import solve_rates
from wheelgen.kinematics.targets import arbor_period, arbor_sense

DEMO = Path(__file__).parents[1] / "wheelgen" / "designs" / "harbour_tide_clock.toml"


def design(body: str, drive: str = "a", period: str = "1 d", sense: str = "ccw"):
    head = (
        '[design]\ntitle = "test"\n\n'
        f'[drive]\narbor = "{drive}"\nperiod = "{period}"\nsense = "{sense}"\n\n'
    )
    return loads_design(head + body, "test.toml")


def arbors(*names: str, fixed: tuple[str, ...] = ()) -> str:
    out = []
    for i, name in enumerate(names):
        extra = "fixed = true\n" if name in fixed else ""
        out.append(f'[[arbor]]\nname = "{name}"\nat = [{40.0 * i}, 0.0]\n{extra}')
    return "\n".join(out)


def wheel(name: str, arbor: str, teeth: int) -> str:
    return f'[[wheel]]\nname = "{name}"\narbor = "{arbor}"\nteeth = {teeth}\n'


def mesh(a: str, b: str) -> str:
    return f'[[mesh]]\npair = ["{a}", "{b}"]\n'


# --- simple and compound trains -----------------------------------------------------


def test_external_mesh_reverses_and_scales():
    d = design(
        arbors("a", "b")
        + wheel("wa", "a", 40)
        + wheel("wb", "b", 10)
        + mesh("wa", "wb")
    )
    rates = solve_rates(d).rates
    # derived: one external mesh, driver 40 T, driven 10 T -> -40/10
    assert rates == {"a": 1, "b": Fraction(-4)}
    assert arbor_sense(d, rates["b"]) == "cw"
    assert arbor_period(d, rates["b"]) == Fraction(86400, 4)


def test_idler_restores_the_sense():
    body = (
        arbors("a", "i", "b")
        + wheel("wa", "a", 30)
        + wheel("wi", "i", 17)
        + wheel("wb", "b", 45)
        + mesh("wa", "wi")
        + mesh("wi", "wb")
    )
    rates = solve_rates(design(body)).rates
    # derived: (-30/17) * (-17/45) = 2/3; the idler's count cancels
    assert rates["b"] == Fraction(2, 3)


def test_drive_turning_clockwise_flips_every_reported_sense():
    body = (
        arbors("a", "b")
        + wheel("wa", "a", 20)
        + wheel("wb", "b", 20)
        + mesh("wa", "wb")
    )
    d = design(body, sense="cw")
    rates = solve_rates(d).rates
    assert arbor_sense(d, rates["a"]) == "cw"
    assert arbor_sense(d, rates["b"]) == "ccw"


def test_fixed_arbor_is_still():
    body = arbors("a", "s", fixed=("s",)) + wheel("wa", "a", 20)
    d = design(body)
    sol = solve_rates(d)
    assert sol.rates["s"] == 0
    assert arbor_sense(d, Fraction(0)) == "still"
    assert arbor_period(d, Fraction(0)) is None


def test_demo_clock_rates():
    d = load_design(DEMO)
    rates = solve_rates(d).rates
    # derived by hand from the demo's tooth counts:
    # hours: day 96 -> lay pinion 48, lay wheel 72 -> hour wheel 72:
    # (-96/48)(-72/72) = 2
    assert rates["hours"] == 2
    # stud: fixed
    assert rates["stud"] == 0
    # planet on the hour wheel, 66 T rolling on the fixed 11 T sun (relation of Willis):
    # 11 (0 - 2) = -66 (p - 2)  ->  p = 2 + 1/3 = 7/3
    assert rates["planet"] == Fraction(7, 3)
    # tide tube, 64 T driven by the 13 T planet pinion: 13 (7/3 - 2) = -64 (t - 2)
    assert rates["tide"] == 2 - Fraction(13, 3 * 64) == Fraction(371, 192)
    # coaxial tubes turn independently: hours and tide share an axis, not a rate
    assert rates["tide"] != rates["hours"]
    # moon: (-25/113)(-15/98); the pin-and-slot passes the mean rate on unchanged
    assert rates["moon"] == Fraction(25 * 15, 113 * 98) == Fraction(375, 11074)
    assert rates["moon_dial"] == rates["moon"]


# --- the relation of Willis --------------------------------------------------------


def planetary(sun: int, planet: int, drive_sense: str = "cw"):
    """An arm on the drive shaft, a fixed sun on a stud round it, one planet wheel."""
    body = (
        '[[arbor]]\nname = "shaft"\nat = [0.0, 0.0]\n'
        '[[arbor]]\nname = "stud"\naround = "shaft"\nfixed = true\n'
        f'[[arbor]]\nname = "pl"\ncarrier = "arm"\nat = [{(sun + planet) / 2}, 0.0]\n'
        + wheel("arm", "shaft", 60)
        + wheel("sunw", "stud", sun)
        + wheel("planetw", "pl", planet)
        + mesh("sunw", "planetw")
    )
    return design(body, drive="shaft", period="0.6 s", sense=drive_sense)


def test_published_exercise_arm_with_fixed_wheel():
    # qna.carrieradda.com/4222, an epicyclic train exercise with its worked solution
    # (docs/references.md section 14):
    # an arm carries wheels A (24 T) and B (30 T); the arm turns 100 rpm clockwise about
    # the centre of A, which is fixed; B turns 180 rpm clockwise.
    d = planetary(sun=24, planet=30, drive_sense="cw")  # 100 rpm: one turn in 0.6 s
    rate = solve_rates(d).rates["pl"]
    assert rate * 100 == 180  # rpm, published
    assert arbor_sense(d, rate) == "cw"  # published: clockwise
    assert arbor_period(d, rate) == Fraction(60, 180)  # s per turn at 180 rpm


def test_textbook_formula_for_a_planet_on_a_fixed_sun():
    # the table method for epicyclic trains, a common textbook method (from memory; fix
    # the arm, turn the sun once, then add the arm's motion): a planet of z_p on a fixed
    # sun of z_s turns (1 + z_s/z_p) times per turn of the arm.
    for sun, planet in [(24, 30), (11, 66), (20, 20), (17, 51)]:
        rate = solve_rates(planetary(sun, planet)).rates["pl"]
        assert rate == 1 + Fraction(sun, planet)


def compound_planetary(zs: int, zp1: int, zp2: int, zo: int):
    """Arm on the drive shaft; compound planet rolls on a fixed sun (zs, zp1) and drives
    an output tube round the shaft (zp2, zo)."""
    body = (
        '[[arbor]]\nname = "shaft"\nat = [0.0, 0.0]\n'
        '[[arbor]]\nname = "stud"\naround = "shaft"\nfixed = true\n'
        '[[arbor]]\nname = "out"\naround = "stud"\n'
        '[[arbor]]\nname = "pl"\ncarrier = "arm"\nat = [30.0, 0.0]\n'
        + wheel("arm", "shaft", 80)
        + wheel("sunw", "stud", zs)
        + wheel("p1", "pl", zp1)
        + wheel("p2", "pl", zp2)
        + wheel("outw", "out", zo)
        + mesh("sunw", "p1")
        + mesh("p2", "outw")
    )
    return design(body, drive="shaft")


def rolling_simulation(zs: int, zp1: int, zp2: int, zo: int, steps: int = 720) -> float:
    """Turns of the output per turn of the arm, by moving the parts in the fixed frame.

    derived independently of the relation of Willis: pitch circles of both stages touch
    on the line from the centre to the planet's axis (each stage scaled to the same
    centre distance R); at each small step of the arm, the planet's turn is chosen so
    that its material point touching the still sun has no tangential speed, then the
    output's turn so that its point of contact moves with the planet's.
    """
    big_r = 1.0
    r_s = big_r * zs / (zs + zp1)
    r_o = big_r * zo / (zp2 + zo)
    out_angle = 0.0
    d_c = 2 * math.pi / steps
    for k in range(steps):
        c = (k + 0.5) * d_c
        radial = (math.cos(c), math.sin(c))
        tangent = (-math.sin(c), math.cos(c))
        centre = (big_r * radial[0], big_r * radial[1])
        v_centre = (big_r * d_c * tangent[0], big_r * d_c * tangent[1])

        def spin(x, y):  # velocity of a unit turn about the origin of (x, y): J (x, y)
            return (-y, x)

        def dot(u, v):
            return u[0] * v[0] + u[1] * v[1]

        touch_sun = (r_s * radial[0], r_s * radial[1])
        arm_to_touch = spin(touch_sun[0] - centre[0], touch_sun[1] - centre[1])
        d_planet = -dot(v_centre, tangent) / dot(arm_to_touch, tangent)
        touch_out = (r_o * radial[0], r_o * radial[1])
        lever = spin(touch_out[0] - centre[0], touch_out[1] - centre[1])
        v_planet = (
            v_centre[0] + d_planet * lever[0],
            v_centre[1] + d_planet * lever[1],
        )
        out_angle += dot(v_planet, tangent) / dot(spin(*touch_out), tangent)
    return out_angle / (2 * math.pi)


@pytest.mark.parametrize(
    "teeth", [(20, 40, 41, 19), (11, 66, 13, 64), (30, 30, 31, 29), (15, 45, 12, 48)]
)
def test_compound_planetary_matches_rolling_simulation(teeth):
    rate = solve_rates(compound_planetary(*teeth)).rates["out"]
    assert float(rate) == pytest.approx(
        rolling_simulation(*teeth), rel=1e-12, abs=1e-12
    )


@settings(max_examples=30, deadline=None)
@given(st.tuples(*[st.integers(3, 200)] * 4))
def test_random_compound_planetaries_match_rolling_simulation(teeth):
    rate = solve_rates(compound_planetary(*teeth)).rates["out"]
    assert float(rate) == pytest.approx(
        rolling_simulation(*teeth, steps=64), rel=1e-9, abs=1e-12
    )


def test_reverted_train_with_nearly_equal_stages_is_a_big_reduction():
    # derived: 1 - (zs * zp2) / (zp1 * zo) = 1 - (20*41)/(40*19)... written out exactly
    rate = solve_rates(compound_planetary(20, 40, 41, 19)).rates["out"]
    assert rate == 1 - Fraction(20 * 41, 40 * 19)


# --- pin and slot --------------------------------------------------------------------


def test_pin_and_slot_passes_the_mean_rate_exactly():
    body = (
        arbors("a", "b", "c")
        + wheel("wa", "a", 30)
        + wheel("wb", "b", 45)
        + wheel("wc", "c", 20)
        + mesh("wa", "wb")
        + '[[pinslot]]\nname = "k"\npin = "wb"\nslot = "wc"\n'
        + "radius = 8.0\noffset = 0.8\n"
    )
    rates = solve_rates(design(body)).rates
    assert rates["c"] == rates["b"] == Fraction(-2, 3)

    # derived: the slot's angle for pin angle t is atan2(r sin t, r cos t - e)
    # (docs/references.md section 13); over one pin turn it gains
    # exactly one turn, however uneven on the way.
    r, e, n = 8.0, 0.8, 3600
    total, last = 0.0, math.atan2(0.0, r - e)
    for k in range(1, n + 1):
        t = 2 * math.pi * k / n
        now = math.atan2(r * math.sin(t), r * math.cos(t) - e)
        total += (now - last + math.pi) % (2 * math.pi) - math.pi
        last = now
    assert total == pytest.approx(2 * math.pi, abs=1e-9)


# --- calendar relations --------------------------------------------------------------
# The ratios are exact tooth-count relations; the day counts are published values.
# An encyclopedia mirror at wikiplanet.click, article on the 19-year lunisolar cycle:
#     19 tropical years = 6939.602 d, 235 synodic months = 6939.688 d,
#     254 sidereal months = 6939.702 d.
# en.m.wikiversity.org, "Astronomy college course/Saros cycle": 223 synodic months
#     = 223 x 29.530589 d ~ 6585.32 d;
#     242 draconic months = 242 x 27.212221 d ~ 6585.35 d.


def two_stage(z1: int, z2: int, z3: int, z4: int, period: str, target: str = ""):
    body = (
        arbors("a", "b", "c")
        + wheel("w1", "a", z1)
        + wheel("w2", "b", z2)
        + wheel("w3", "b", z3)
        + wheel("w4", "c", z4)
        + mesh("w1", "w2")
        + mesh("w3", "w4")
        + target
    )
    return design(body, period=period)


def test_lunisolar_19_year_relation():
    # one turn a tropical year in, one turn a synodic month out: 235/19 turns per year
    d = two_stage(47, 19, 50, 10, period="6939.602/19 d")
    rate = solve_rates(d).rates["c"]
    assert rate == Fraction(235, 19)  # 19 years = 235 months, exactly in teeth
    # the month this train shows, from the published year: 6939.602 d / 235
    assert arbor_period(d, rate) == Fraction("6939.602") * 86400 / 235
    # against the published month they agree to (6939.602 / 6939.688 - 1), -12.4 ppm
    published_month_s = Fraction("6939.688") * 86400 / 235
    ppm = float((arbor_period(d, rate) - published_month_s) / published_month_s) * 1e6
    assert ppm == pytest.approx((6939.602 / 6939.688 - 1) * 1e6, rel=1e-9)
    assert abs(ppm) < 13


def test_sidereal_months_in_19_years():
    # 254 sidereal months in 19 years (the same published article): 254/19 = 2*127/19
    d = two_stage(127, 19, 40, 20, period="1 yr")
    assert solve_rates(d).rates["c"] == Fraction(254, 19)


def test_eclipse_cycle_relation():
    # 242 draconic months = 223 synodic months: an arbor turned once a synodic month
    # drives one that turns 242/223 times, through an idler (sense kept)
    body = (
        arbors("a", "i", "b")
        + wheel("w1", "a", 242)
        + wheel("wi", "i", 40)
        + wheel("w2", "b", 223)
        + mesh("w1", "wi")
        + mesh("wi", "w2")
    )
    d = design(body, period="29.530589 d")
    rate = solve_rates(d).rates["b"]
    assert rate == Fraction(242, 223)
    # the period it shows is the draconic month of the published pair, to 6 ppm
    got_d = float(arbor_period(d, rate)) / 86400
    assert got_d == pytest.approx(29.530589 * 223 / 242, rel=1e-12)
    assert got_d == pytest.approx(27.212221, rel=6e-6)


# --- trees of random tooth counts -----------------------------------------------------


@st.composite
def random_tree(draw):
    """Arbors joined as a tree: each new arbor meshes with one earlier arbor, through a
    wheel of its own and a (maybe new) wheel on the earlier one."""
    count = draw(st.integers(2, 8))
    parents = [draw(st.integers(0, i - 1)) for i in range(1, count)]
    teeth = [(draw(st.integers(3, 2000)), draw(st.integers(3, 2000))) for _ in parents]
    return parents, teeth


@settings(max_examples=60, deadline=None)
@given(random_tree(), st.sampled_from(["ccw", "cw"]))
def test_tree_rates_are_products_of_tooth_ratios(tree, sense):
    parents, teeth = tree
    names = [f"a{i}" for i in range(len(parents) + 1)]
    body = arbors(*names)
    expected = {"a0": Fraction(1)}
    for child, (parent, (z_parent, z_child)) in enumerate(
        zip(parents, teeth, strict=True), start=1
    ):
        body += wheel(f"d{child}", names[parent], z_parent)
        body += wheel(f"e{child}", names[child], z_child)
        body += mesh(f"d{child}", f"e{child}")
        # derived: an external mesh gives -z_driver / z_driven
        expected[names[child]] = expected[names[parent]] * Fraction(-z_parent, z_child)
    d = design(body, drive="a0", sense=sense)
    sol = solve_rates(d)
    assert sol.rates == expected
    assert not sol.conflicts and not sol.undriven
    for rate in expected.values():
        same = (rate > 0) == (sense == "ccw")
        assert arbor_sense(d, rate) == ("ccw" if same else "cw")


# --- locks and loose arbors -----------------------------------------------------------


def test_locked_triangle_names_both_paths_and_both_rates():
    body = (
        arbors("a", "b", "c")
        + wheel("w1", "a", 40)
        + wheel("w2", "b", 10)
        + wheel("w3", "b", 30)
        + wheel("w4", "c", 12)
        + wheel("w5", "a", 20)
        + mesh("w1", "w2")
        + mesh("w3", "w4")
        + mesh("w5", "w4")
    )
    sol = solve_rates(design(body))
    (conflict,) = sol.conflicts
    assert conflict.arbor == "c"
    # derived: via b, (-40/10)(-30/12) = 10; directly, -20/12 = -5/3
    assert {conflict.rate_one, conflict.rate_two} == {Fraction(10), Fraction(-5, 3)}
    paths = {conflict.path_one, conflict.path_two}
    assert ("the drive", "mesh w1-w2", "mesh w3-w4") in paths
    assert ("the drive", "mesh w5-w4") in paths
    text = conflict.message()
    for fragment in ("mesh w1-w2, mesh w3-w4", "mesh w5-w4", "10", "-5/3", "locks"):
        assert fragment in text


def test_consistent_second_path_is_not_a_lock():
    # two paths that agree (derived: -40/20 both ways) are fine
    body = (
        arbors("a", "b")
        + wheel("w1", "a", 40)
        + wheel("w2", "b", 20)
        + wheel("w3", "a", 30)
        + wheel("w4", "b", 15)
        + mesh("w1", "w2")
        + mesh("w3", "w4")
    )
    sol = solve_rates(design(body))
    assert not sol.conflicts and sol.rates["b"] == -2


def test_drive_meshing_with_a_fixed_arbor_locks():
    body = (
        arbors("a", "s", fixed=("s",))
        + wheel("w1", "a", 20)
        + wheel("w2", "s", 30)
        + mesh("w1", "w2")
    )
    (conflict,) = solve_rates(design(body)).conflicts
    # derived: held still, "s" turns 0 times; driven from "a" it would turn -20/30
    assert conflict.arbor == "s"
    assert (conflict.rate_one, conflict.path_one) == (0, ('fixed arbor "s"',))
    assert (conflict.rate_two, conflict.path_two) == (
        Fraction(-2, 3),
        ("the drive", "mesh w1-w2"),
    )


def test_undriven_arbors_are_listed():
    body = (
        arbors("a", "b", "c", "d")
        + wheel("w1", "a", 20)
        + wheel("w2", "b", 20)
        + wheel("w3", "c", 20)
        + wheel("w4", "d", 20)
        + mesh("w1", "w2")
        + mesh("w3", "w4")  # c and d only drive each other
    )
    sol = solve_rates(design(body))
    assert sol.undriven == ("c", "d")
    assert sol.rates["c"] is None and sol.rates["b"] == -1


def test_carried_arbor_meshing_with_a_plate_arbor_is_flagged():
    body = (
        '[[arbor]]\nname = "shaft"\nat = [0.0, 0.0]\n'
        '[[arbor]]\nname = "side"\nat = [80.0, 0.0]\n'
        '[[arbor]]\nname = "pl"\ncarrier = "arm"\nat = [30.0, 0.0]\n'
        + wheel("arm", "shaft", 60)
        + wheel("wp", "pl", 20)
        + wheel("ws", "side", 20)
        + mesh("wp", "ws")
    )
    sol = solve_rates(design(body, drive="shaft"))
    assert sol.bad_meshes == ("mesh wp-ws",)


def test_a_lock_closing_a_long_loop_is_explained_without_solving_it_again():
    # derived: 199 meshes of 30:30 turn the last arbor at (-1)^199 = -1; closing it back
    # to the drive through 31:30 asks -30/31: the train locks. The explanation must not
    # solve the system once per link (that grew with the cube of the length).
    names = ["a"] + [f"x{i}" for i in range(1, 200)]
    body = arbors(*names)
    for i, name in enumerate(names):
        body += wheel(f"w{i}", name, 30) + wheel(f"p{i}", name, 30)
    for i in range(1, len(names)):
        body += mesh(f"p{i - 1}", f"w{i}")
    body += wheel("close_a", "a", 31) + wheel("close_z", names[-1], 30)
    body += mesh("close_z", "close_a")
    (conflict,) = solve_rates(design(body)).conflicts
    text = conflict.message()
    assert "more ..." in text and "mesh close_z-close_a" in text
    assert {conflict.rate_one, conflict.rate_two} >= {Fraction(-1)}


def test_a_train_locked_in_many_places_explains_the_first_twenty():
    body = arbors("a")
    for k in range(25):  # 25 pairs of arbors, each driven two ways that disagree
        b, c = f"b{k}", f"c{k}"
        body += f'[[arbor]]\nname = "{b}"\nat = [0.0, {40.0 * (k + 1)}]\n'
        body += f'[[arbor]]\nname = "{c}"\nat = [40.0, {40.0 * (k + 1)}]\n'
        body += wheel(f"a{k}", "a", 20) + wheel(f"ab{k}", b, 20)
        body += wheel(f"bc{k}", b, 20) + wheel(f"cb{k}", c, 20)
        body += wheel(f"ac{k}", "a", 20) + wheel(f"ca{k}", c, 21)
        body += mesh(f"a{k}", f"ab{k}") + mesh(f"bc{k}", f"cb{k}")
        body += mesh(f"ac{k}", f"ca{k}")
    conflicts = solve_rates(design(body)).conflicts
    assert len(conflicts) == 25
    assert all(c.path_one for c in conflicts[:20])
    assert all(not c.path_one and "first 20" in c.message() for c in conflicts[20:])
