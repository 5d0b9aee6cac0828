"""The ratio search against an independent brute force on small ranges.

The brute force below is written plainly: nested loops over every tooth count, exact
fractions, no numpy and nothing from the module under test except the result type.
"""

from __future__ import annotations

import itertools
import math
from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from wheelgen.kinematics.ratio_search import (
    MAX_TOP,
    Limits,
    SearchTooLarge,
    exact_trains,
    relaxations,
    search_cost,
    search_trains,
    stage_counts,
    teeth_for_diameter,
)


def _plain(spec):
    """The counts of a range ``(lo, hi)`` or a set, as a plain sorted list."""
    if isinstance(spec, frozenset):
        return sorted(spec)
    return list(range(spec[0], spec[1] + 1))


def brute_force(target, teeth, stages, stage_teeth=(), max_total=None, sense="either"):
    """Every train: {sorted stages: (|error|, wheels, total, largest, widest, idler,
    error)}. ``teeth`` and each of ``stage_teeth`` are ranges or sets of counts."""
    out = {}
    for k in range(1, stages + 1):
        ranges = []
        for i in range(k):
            own = _plain(stage_teeth[i]) if i < len(stage_teeth) else _plain(teeth)
            ranges.append([z for z in own if z in set(_plain(teeth))])
        if not all(ranges):
            continue
        reverses = k % 2 == 1
        idler = None
        if (sense == "same" and reverses) or (sense == "opposite" and not reverses):
            idler = ranges[-1][0]
        for drivers in itertools.product(*ranges):
            for driven in itertools.product(*ranges):
                total = sum(drivers) + sum(driven) + (idler or 0)
                if max_total is not None and total > max_total:
                    continue
                ratio = Fraction(math.prod(drivers), math.prod(driven))
                error = target / ratio - 1  # the period's relative error
                stages_ = tuple(sorted(zip(drivers, driven, strict=True)))
                largest = max(max(drivers), max(driven))
                widest = max(a + b for a, b in stages_)
                wheels = 2 * k + (idler is not None)
                out[stages_] = (
                    abs(error),
                    wheels,
                    total,
                    largest,
                    widest,
                    idler,
                    error,
                )
    return out


def ranked(bf, top):
    return sorted(bf.items(), key=lambda kv: (kv[1][:5], kv[0]))[:top]


def assert_same_as_brute_force(target, limits, top=8):
    bf = brute_force(
        target,
        limits.teeth,
        limits.stages,
        limits.stage_teeth,
        limits.max_teeth_total,
        limits.sense,
    )
    got = search_trains(target, limits, top=top)
    want = ranked(bf, top)
    assert [tuple(sorted(t.stages)) for t in got] == [s for s, _ in want]
    assert [t.error for t in got] == [v[6] for _, v in want]
    assert [t.idler for t in got] == [v[5] for _, v in want]
    # every exact train, as a set
    exact_bf = {s for s, v in bf.items() if v[0] == 0}
    exact_got = {tuple(sorted(t.stages)) for t in exact_trains(target, limits)}
    assert exact_got == exact_bf
    return got, bf


@pytest.mark.parametrize(
    ("target", "teeth", "stages"),
    [
        (Fraction(7, 3), (5, 14), 2),  # exact trains exist
        (Fraction(254, 19), (8, 20), 2),  # 127 > 20: none exact
        (Fraction("3.14159265"), (6, 18), 2),  # a decimal
        (Fraction("13.36822823"), (5, 10), 3),  # three stages
        (Fraction(1, 5), (4, 12), 2),  # a reduction
        (Fraction(12), (6, 10), 3),
    ],
)
def test_matches_brute_force(target, teeth, stages):
    assert_same_as_brute_force(target, Limits(teeth=teeth, stages=stages))


def test_matches_brute_force_with_tooth_total_and_sense():
    limits = Limits(teeth=(6, 16), stages=2, max_teeth_total=52, sense="same")
    got, _ = assert_same_as_brute_force(Fraction(37, 11), limits)
    assert all(not t.reverses for t in got)
    assert all(t.teeth_total <= 52 for t in got)


def test_matches_brute_force_opposite_sense_needs_idler_on_two_stages():
    limits = Limits(teeth=(6, 14), stages=2, sense="opposite")
    got, _ = assert_same_as_brute_force(Fraction(5, 2), limits)
    assert all(t.reverses for t in got)
    two_stage = [t for t in got if len(t.stages) == 2]
    assert two_stage and all(t.idler == 6 for t in two_stage)


def test_matches_brute_force_with_stage_ranges():
    limits = Limits(teeth=(5, 20), stages=2, stage_teeth=((5, 9), (12, 20)))
    got, _ = assert_same_as_brute_force(Fraction(17, 6), limits)
    for t in got:
        if len(t.stages) == 2:  # shown in stage order: each stage in its own range
            assert all(5 <= z <= 9 for z in t.stages[0])
            assert all(12 <= z <= 20 for z in t.stages[1])


@settings(max_examples=25, deadline=None)
@given(
    num=st.integers(1, 400),
    den=st.integers(1, 400),
    lo=st.integers(3, 12),
    width=st.integers(0, 6),
    stages=st.integers(1, 2),
)
def test_matches_brute_force_random(num, den, lo, width, stages):
    assert_same_as_brute_force(
        Fraction(num, den), Limits(teeth=(lo, lo + width), stages=stages), top=5
    )


def test_prime_factor_above_range_has_no_exact_train_and_closest_is_found():
    # 58/7 = 2 * 29 / 7 and 29 is prime, above the largest count 20 (derived)
    target = Fraction(58, 7)
    limits = Limits(teeth=(5, 20), stages=2)
    assert exact_trains(target, limits) == []
    got, bf = assert_same_as_brute_force(target, limits, top=3)
    assert abs(got[0].error) == min(v[0] for v in bf.values()) > 0
    # with 29 teeth allowed it becomes exact: 29/7 x 2/1 -> e.g. 29/7 x 10/5
    wider = search_trains(target, Limits(teeth=(5, 29), stages=2), top=1)
    assert wider[0].error == 0


def test_four_stage_exact_target_by_divisibility():
    # derived: 254/19 with teeth up to 130 needs the prime 127 on a driver
    target = Fraction(254, 19)
    limits = Limits(teeth=(10, 130), stages=4)
    best = search_trains(target, limits, top=3)
    assert best[0].error == 0 and len(best[0].stages) == 2
    assert all(
        127 in [a for a, _ in t.stages] for t in exact_trains(target, limits, 50)
    )


def test_one_pairing_keeps_one_train_per_wheel_set():
    target = Fraction("13.36822823")
    limits = Limits(teeth=(10, 60), stages=3)
    every = search_trains(target, limits, top=20)
    one = search_trains(target, limits, top=20, one_pairing=True)
    assert one[0].error == every[0].error
    sets = [
        (sorted(a for a, _ in t.stages), sorted(b for _, b in t.stages)) for t in one
    ]
    assert len({repr(s) for s in sets}) == len(sets)


def test_results_are_ranked_and_unique():
    got = search_trains(
        Fraction("2.71828183"), Limits(teeth=(10, 80), stages=3), top=15
    )
    keys = [t.rank_key() for t in got]
    assert keys == sorted(keys)
    assert len({tuple(sorted(t.stages)) for t in got}) == len(got)
    assert all(
        t.ratio
        == Fraction(
            math.prod(a for a, _ in t.stages), math.prod(b for _, b in t.stages)
        )
        for t in got
    )


def test_relaxations_name_the_limit():
    # 254/19 cannot be exact with teeth <= 120 (127 is prime): raising the top
    # count helps
    rel = relaxations(Fraction(254, 19), Limits(teeth=(10, 120), stages=2), Fraction(0))
    assert rel[0].limit == "simplest" and rel[0].value == Fraction(254, 19)
    assert "127" in rel[0].note
    teeth = [r for r in rel if r.limit == "teeth_max"]
    assert teeth and teeth[0].value == 127


def test_teeth_for_diameter():
    # derived: tip diameter m (z + 2) <= D  ->  z <= D / m - 2
    assert teeth_for_diameter(1.0, 62.0) == 60
    assert teeth_for_diameter(0.5, 52.0) == 102
    assert teeth_for_diameter(0.8, 50.0) == 60  # 50 / 0.8 - 2 = 60.5
    with pytest.raises(ValueError, match="module"):
        teeth_for_diameter(0.0, 10.0)


@pytest.mark.parametrize(
    ("kwargs", "message"),
    [
        ({"teeth": (10, 5)}, "teeth"),
        ({"stages": 5}, "stages"),
        ({"stages": 1, "stage_teeth": ((5, 9), (5, 9))}, "per-stage"),
        ({"max_teeth_total": 1}, "max_teeth_total"),
        ({"sense": "cw"}, "sense"),
        ({"teeth": frozenset({0, 12})}, "teeth"),
        ({"teeth": (10, 5000)}, "largest count"),
        ({"stages": 2, "stage_teeth": (frozenset(),)}, "stage 1"),
    ],
)
def test_bad_limits(kwargs, message):
    with pytest.raises(ValueError, match=message):
        Limits(**kwargs)


@pytest.mark.parametrize(
    ("target", "teeth", "stages", "stage_teeth"),
    [
        # the workshop's own list: ranges and single counts together
        (Fraction(12), frozenset({10, 12, 15, 30, 36, 40, 84}), 2, ()),
        (
            Fraction("3.14159265"),
            frozenset([*range(12, 21), 24, 30, *range(36, 41)]),
            2,
            (),
        ),
        (Fraction(254, 19), frozenset({19, 20, 38, 40, 57, 127}), 3, ()),
        # a list for one stage, a range for the other
        (Fraction(17, 6), (5, 20), 2, (frozenset({5, 7, 9, 11}), (12, 20))),
    ],
)
def test_tooth_lists_match_brute_force(target, teeth, stages, stage_teeth):
    limits = Limits(teeth=teeth, stages=stages, stage_teeth=stage_teeth)
    got, _ = assert_same_as_brute_force(target, limits)
    allowed = set(_plain(teeth))
    for t in got:  # a tooth list is honoured: no other count appears
        assert all(a in allowed and b in allowed for a, b in t.stages)
        for i, (a, b) in enumerate(t.stages):
            if i < len(stage_teeth) and len(t.stages) == stages:
                assert {a, b} <= set(_plain(stage_teeth[i]))


def test_stage_counts_intersect_the_overall_set():
    limits = Limits(
        teeth=frozenset({12, 15, 84, 90}), stages=2, stage_teeth=((10, 85),)
    )
    assert stage_counts(limits, 2) == ((12, 15, 84), (12, 15, 84, 90))
    assert stage_counts(Limits(teeth=(10, 20), stage_teeth=((30, 40),)), 1) is None


def test_longer_list_starts_with_the_shorter():
    # the list of the best 40 begins with the list of the best 10 (the ranking is total)
    target, limits = Fraction("0.0027379093"), Limits(teeth=(10, 60), stages=3)
    short = search_trains(target, limits, top=10, one_pairing=True)
    long = search_trains(target, limits, top=40, one_pairing=True)
    assert [t.stages for t in long[:10]] == [t.stages for t in short]


def test_cost_is_estimated_and_a_large_search_refused():
    # derived: 4 stages of teeth 10..300 form |P_2|*(|P_2|+1)/2 products, |P_2| being
    # some 24,000 distinct two-wheel products; far beyond the time budget
    limits = Limits(teeth=(10, 300), stages=4)
    cost = search_cost(limits)
    assert cost.stages == 4 and cost.products > 10**8
    with pytest.raises(SearchTooLarge, match="teeth 10-300") as info:
        search_trains(Fraction(12), limits)
    assert info.value.cost == cost
    # a small search fits: its estimate is far below the budget
    assert search_cost(Limits(teeth=(10, 60), stages=2)).seconds < 1


def test_top_is_bounded():
    with pytest.raises(ValueError, match="top"):
        search_trains(Fraction(12), Limits(), top=MAX_TOP + 1)


def test_bad_target():
    with pytest.raises(ValueError, match="positive"):
        search_trains(Fraction(0), Limits())
