"""Dividing-head indexing against published tables and exact-fraction proofs.

Sources (docs/references.md section 12):
- ARMY: ordnance manual OD 16448, dividing-head chapter,
  armyordnance.tpub.com/od16448/od164480030.htm (plate circles, worked N = 6, 42).
- SCRIBD: "Dividing head practice", scribd.com/document/628433770 (N = 15; 15 degrees).
- TREATISE: "Practical Treatise on Milling and Milling Machines", en.wikisource.org,
  p. 58 (three plates index all divisions up to 50 and even ones up to 100, except 96).
- MH1916: Machinery's Handbook (1916), angular indexing, as quoted in a bookseller's
  excerpt (bookdepository.com listing): 1 degree and 35 degrees.
- MH-DIFF: Machinery's Handbook, "Differential Indexing" (from memory): gear ratio
  (A - N) * 40 / A; A > N: plate turns with the crank.
"""

from __future__ import annotations

from collections import Counter
from fractions import Fraction
from itertools import permutations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from wheelgen.workshop.indexing import (
    IndexPlan,
    angle_setting,
    crank_settings,
    indexing_plan,
    work_turns_per_division,
)
from wheelgen.workshop.plates import (
    CHANGE_GEARS,
    THREE_PLATE,
    TWO_SIDED,
    gear_set,
    plate_set,
)

ARMY = "ARMY: armyordnance.tpub.com/od16448/od164480030.htm"
SCRIBD = "SCRIBD: 'Dividing head practice', scribd.com/document/628433770"
MH1916 = "MH1916: Machinery's Handbook 1916 excerpt, angular indexing"
TREATISE = "TREATISE: Practical Treatise on Milling, en.wikisource.org, p. 58"
DERIVED_127 = (
    "derived with the method of Machinery's Handbook, 'Differential Indexing' "
    "(from memory)"
)


def _choices(plan: IndexPlan) -> set[tuple[int, int]]:
    assert plan.circle is not None
    return {(plan.holes, plan.circle), *plan.other_circles}


# --- simple indexing against published worked examples -----------------------------

# (N, plates, published whole turns, published (hole spaces, circle), source)
PUBLISHED_SIMPLE = [
    (6, THREE_PLATE, 6, (26, 39), ARMY),  # 6 2/3 turns: 26 spaces on the 39 circle
    (6, THREE_PLATE, 6, (12, 18), ARMY),  # ... or 12 on the 18 circle
    (42, TWO_SIDED, 0, (40, 42), ARMY),  # 20/21 turn: 40 spaces on the 42 circle
    (42, THREE_PLATE, 0, (20, 21), ARMY),  # ... or 20 on the 21 circle
    (15, THREE_PLATE, 2, (18, 27), SCRIBD),  # 2 2/3 turns: 18 holes on the 27 circle
    (15, (36,), 2, (24, 36), SCRIBD),  # ... or 24 holes on the 36 circle
    (53, TWO_SIDED, 0, (40, 53), "derived: 40/53 turn"),
]


@pytest.mark.parametrize(
    ("teeth", "plates", "turns", "published", "source"), PUBLISHED_SIMPLE
)
def test_simple_indexing_matches_published(teeth, plates, turns, published, source):
    plan = indexing_plan(teeth, plates=plates)
    assert plan.method == "simple", source
    assert plan.turns == turns, source
    assert published in _choices(plan), source
    # every offered choice is the same crank motion as the published one
    for holes, circle in _choices(plan):
        assert Fraction(holes, circle) == Fraction(*published), source


def test_fewest_hole_spaces_is_the_first_choice():
    # ranking rule of this tool (fewest holes to count); derived: 20/3 -> 2/3 on 15
    plan = indexing_plan(6)
    assert (plan.holes, plan.circle) == (10, 15)
    assert all(holes > plan.holes for holes, _ in plan.other_circles)


def test_three_plates_index_everything_published():
    # TREATISE: "all divisions up to 50, even numbers up to 100, except 96"
    claimed = list(range(2, 51)) + list(range(52, 101, 2))
    failing = [n for n in claimed if indexing_plan(n, gears=()).method != "simple"]
    assert failing == [96], TREATISE


def test_two_sided_plate_indexes_all_of_the_same_range():
    # derived: for each such N the reduced denominator of 40/N divides one of the
    # plate's circles (docs/references.md section 12)
    claimed = list(range(2, 51)) + list(range(52, 101, 2))
    assert all(indexing_plan(n, plates=TWO_SIDED).method == "simple" for n in claimed)


def test_whole_turns_need_no_circle():
    # 40:1 head, 40/N whole for N dividing 40 (ARMY: one crank turn = 1/40 rev)
    plan = indexing_plan(8)
    assert (plan.method, plan.turns, plan.holes, plan.circle) == ("simple", 5, 0, None)


# --- differential indexing ----------------------------------------------------------


def test_differential_127_three_plate():
    # DERIVED_127: A = 120, 40/120 = 1/3 turn (13 on the 39 or 7 on the 21 circle),
    # gear ratio (120 - 127) * 40 / 120 = -7/3: spindle 56 driving 24, plate against
    plan = indexing_plan(127)
    assert plan.method == "differential", DERIVED_127
    assert plan.approx_count == 120, DERIVED_127
    assert plan.crank_turns == Fraction(1, 3), DERIVED_127
    assert {(13, 39), (7, 21)} <= _choices(plan), DERIVED_127
    assert plan.gears is not None
    assert plan.gears.ratio == Fraction(-7, 3), DERIVED_127
    assert plan.gears.order == (56, 24), DERIVED_127
    assert plan.sense == "opposite", DERIVED_127
    # MH-DIFF (from memory): simple train, plate against the crank -> 2 idlers
    assert plan.gears.idlers == 2


def test_differential_127_two_sided():
    # DERIVED_127: A = 125 gives 8 holes on the 25 circle and ratio -16/25 = 64/100
    plan = indexing_plan(127, plates=TWO_SIDED)
    assert (plan.approx_count, plan.holes, plan.circle) == (125, 8, 25), DERIVED_127
    assert plan.gears is not None
    assert plan.gears.ratio == Fraction(-16, 25), DERIVED_127
    assert plan.gears.order == (64, 100), DERIVED_127


def test_differential_127_compound_when_no_simple_train():
    # DERIVED_127: A = 128, 5 holes on the 16 circle, ratio +5/16, e.g. 40/64 x 24/48.
    # Without a 56 no simple train fits any near count (derived by hand for this set).
    owned = (24, 24, 40, 48, 64)
    plan = indexing_plan(127, gears=owned)
    assert (plan.approx_count, plan.holes, plan.circle) == (128, 5, 16), DERIVED_127
    assert plan.gears is not None and plan.gears.compound
    assert plan.gears.ratio == Fraction(5, 16), DERIVED_127
    assert plan.sense == "same"
    # MH-DIFF (from memory): compound train, plate with the crank -> no idler
    assert plan.gears.idlers == 0


def test_simple_train_ranks_before_nearer_compound():
    # ranking rule of the brief: with the standard gears 127 uses A = 120 (simple
    # train 56/24) though A = 128 (compound, |A - N| = 1) also works
    plan = indexing_plan(127)
    assert plan.gears is not None and not plan.gears.compound
    assert indexing_plan(127, gears=(24, 24, 40, 48, 64)).approx_count == 128


def test_53_is_differential_on_three_plates():
    # derived: 53 is prime and no circle of the three-plate set is a multiple of it
    assert indexing_plan(53).method == "differential"


# --- exact proof for every count the tool says it can index -------------------------


def _prove(plan: IndexPlan, plates: tuple[int, ...], owned: tuple[int, ...]) -> None:
    """Exact kinematics, written out here independently of the module.

    Per division the crank turns c and the plate p (both relative to the frame, +
    in the crank's direction); the spindle turns s = c / ratio. The crank pin moves
    x = c - p relative to the plate, x = turns + holes / circle. The plate is locked
    (p = 0) for simple indexing, geared p = g * s for differential, with
    g = +-(product of drivers / product of driven), + when it turns with the crank.
    """
    n, ratio = plan.teeth, plan.ratio
    x = Fraction(plan.turns)
    if plan.circle is None:
        assert plan.holes == 0
    else:
        assert plan.circle in plates
        assert 0 < plan.holes < plan.circle
        x += Fraction(plan.holes, plan.circle)
    assert x == plan.crank_turns
    for holes, circle in plan.other_circles:
        assert circle in plates and Fraction(holes, circle) == x - plan.turns
    if plan.method == "simple":
        s = x / ratio  # c = x, p = 0
        assert s == Fraction(1, n)
        assert plan.gears is None
        return
    train = plan.gears
    assert plan.method == "differential" and train is not None
    used = Counter(train.drivers + train.driven)
    assert not used - Counter(owned), "a gear used more often than owned"
    assert len(train.drivers) == len(train.driven) in (1, 2)
    g = Fraction(1)
    for t in train.drivers:
        g *= t
    for t in train.driven:
        g /= t
    g = g if train.sense == "same" else -g
    # x = c - g * c / ratio  =>  c = x * ratio / (ratio - g)
    c = x * ratio / (ratio - g)
    s = c / ratio
    assert s == Fraction(1, n)
    # the crank is set exactly as for the near count
    assert plan.approx_count is not None and x == Fraction(ratio, plan.approx_count)
    # MH-DIFF (from memory): A > N -> plate with the crank
    assert (train.sense == "same") == (plan.approx_count > n)


@pytest.mark.parametrize("plates", [THREE_PLATE, TWO_SIDED], ids=["three", "two"])
def test_every_count_to_400_is_exact_or_explained(plates):
    methods = Counter()
    for n in range(2, 401):
        plan = indexing_plan(n, plates=plates)
        methods[plan.method] += 1
        if plan.method == "none":
            assert plan.suggestion and plan.suggested_circle is not None
            assert crank_settings(Fraction(40, n), plates) is None
            assert crank_settings(Fraction(40, n), (plan.suggested_circle,)) is not None
        else:
            _prove(plan, plates, CHANGE_GEARS)
    # derived: the runs above; differential must carry most primes beyond the plates
    assert methods["simple"] > 100 and methods["differential"] > 200


def _all_ratios(owned: tuple[int, ...]) -> set[Fraction]:
    ratios = set()
    for size in (2, 4):
        for pick in permutations(owned, size):
            value = Fraction(pick[0], pick[1])
            if size == 4:
                value *= Fraction(pick[2], pick[3])
            ratios.add(value)
    return ratios


def test_none_means_no_near_count_and_train_exists():
    # 383 (prime) with the three plates: brute force over every simple near count A
    # and every 2- or 4-gear train of the standard set finds nothing (derived here).
    plan = indexing_plan(383)
    assert plan.method == "none"
    ratios = _all_ratios(CHANGE_GEARS)
    for a in range(2, 40 * max(THREE_PLATE) + 1):
        if a != 383 and crank_settings(Fraction(40, a), THREE_PLATE) is not None:
            assert abs(Fraction((a - 383) * 40, a)) not in ratios
    # the suggested extra gear makes it possible
    assert plan.suggested_gear is not None
    fixed = indexing_plan(383, gears=CHANGE_GEARS + (plan.suggested_gear,))
    assert fixed.method == "differential"
    _prove(fixed, THREE_PLATE, CHANGE_GEARS + (plan.suggested_gear,))


def test_none_without_gears_suggests_a_circle():
    plan = indexing_plan(127, gears=())
    assert plan.method == "none" and plan.suggested_circle == 127
    assert "127-hole circle" in plan.suggestion
    assert indexing_plan(127, plates=(127,), gears=()).method == "simple"


@settings(max_examples=40, deadline=None)
@given(
    teeth=st.integers(2, 600),
    ratio=st.sampled_from([40, 60, 72, 90]),
    plates=st.lists(st.integers(10, 70), min_size=1, max_size=8),
    owned=st.lists(st.integers(20, 100), min_size=0, max_size=6),
)
def test_any_plan_found_is_exact(teeth, ratio, plates, owned):
    plan = indexing_plan(teeth, ratio, tuple(plates), tuple(owned))
    if plan.method == "none":
        assert plan.suggested_circle is not None
        assert crank_settings(Fraction(ratio, teeth), (plan.suggested_circle,))
    else:
        _prove(plan, tuple(plates), tuple(owned))


def test_work_turns_per_division_matches_the_127_derivation():
    # DERIVED_127: (1/3) / (40 - (-7/3)) = 1/127
    turns = work_turns_per_division(40, Fraction(1, 3), Fraction(-7, 3))
    assert turns == Fraction(1, 127)


# --- angular indexing ---------------------------------------------------------------

# (angle in degrees, whole turns, published (hole spaces, circle), source)
PUBLISHED_ANGLES = [
    (1, 0, (2, 18), MH1916),  # 2 holes on the 18 circle = 1 degree
    (1, 0, (3, 27), MH1916),  # 3 holes on the 27 circle = 1 degree
    (35, 3, (16, 18), MH1916),  # 3 turns + 16 holes on the 18 circle
    (15, 1, (18, 27), SCRIBD),  # 1 turn + 2/3: 18 holes on the 27 circle
]


@pytest.mark.parametrize(("angle", "turns", "published", "source"), PUBLISHED_ANGLES)
def test_angle_setting_matches_published(angle, turns, published, source):
    setting = angle_setting(angle)
    assert setting.found and setting.turns == turns, source
    assert setting.circle is not None
    offered = {(setting.holes, setting.circle), *setting.other_circles}
    assert published in offered, source
    # one crank turn is 9 degrees on a 40:1 head (ARMY)
    assert (setting.turns + Fraction(*published)) * 9 == angle, source


def test_angle_setting_decimal_and_not_found():
    assert angle_setting(0.5).crank_turns == Fraction(1, 18)  # derived: 0.5 * 40 / 360
    miss = angle_setting("0.1")
    # derived: 0.1 * 40 / 360 = 1/90 turn
    assert not miss.found and miss.suggested_circle == 90


# --- arguments ----------------------------------------------------------------------


@pytest.mark.parametrize(
    ("kwargs", "message"),
    [
        ({"teeth": 1}, "'teeth' must be a whole number from 2 to 10000 divisions"),
        ({"teeth": 12.0}, "'teeth' must be a whole number"),
        ({"teeth": True}, "'teeth' must be a whole number"),
        ({"teeth": 12, "ratio": 0}, "'ratio' must be a whole number from 1 to 1000"),
        (
            {"teeth": 12, "ratio": 10**7},
            "'ratio' must be a whole number from 1 to 1000",
        ),
        ({"teeth": 12, "plates": ()}, "'plates' must hold at least one hole circle"),
        ({"teeth": 12, "plates": (15, 1)}, "'plates' must be a whole number from 2"),
        ({"teeth": 12, "gears": (24, 0)}, "'gears' must be a whole number from 8"),
        ({"teeth": 12, "gears": (24,) * 17}, "'gears' may hold at most 16 entries"),
    ],
)
def test_bad_arguments_raise_value_error(kwargs, message):
    with pytest.raises(ValueError, match=message.replace("(", r"\(")):
        indexing_plan(**kwargs)


def test_angle_must_be_positive():
    with pytest.raises(ValueError, match="'angle_deg' must be greater than 0"):
        angle_setting(0)
    with pytest.raises(ValueError, match="'angle_deg' must be a number of degrees"):
        angle_setting("ten")
    with pytest.raises(ValueError, match="power of ten beyond 30"):
        angle_setting("1e999999")  # read without building a million-digit integer
    with pytest.raises(ValueError, match="'angle_deg' must be a number more than 0"):
        angle_setting(720)


def test_plate_and_gear_specs():
    assert plate_set("three-plate") == THREE_PLATE
    assert plate_set("Two-Sided") == TWO_SIDED
    assert plate_set("20, 15,15") == (15, 20)
    assert gear_set("standard") == CHANGE_GEARS
    assert gear_set("none") == ()
    assert gear_set("24,24,40") == (24, 24, 40)  # a count twice is two gears
    for bad in ("", "15,,16", "15,x", "1", "plates-of-gold"):
        with pytest.raises(ValueError, match="'plates'"):
            plate_set(bad)
    with pytest.raises(ValueError, match="'gears' must be a whole number from 8 to"):
        gear_set("24,5")


def test_sets_as_published():
    # ARMY: 22 circles on the two faces; three-plate set from memory (18 circles)
    assert len(TWO_SIDED) == 22 and 53 in TWO_SIDED and 66 in TWO_SIDED
    assert len(THREE_PLATE) == 18 and THREE_PLATE[0] == 15 and THREE_PLATE[-1] == 49
    assert Counter(CHANGE_GEARS)[24] == 2
