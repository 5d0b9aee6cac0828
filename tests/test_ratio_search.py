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
    Limits,
    exact_trains,
    relaxations,
    search_trains,
    teeth_for_diameter,
)


def brute_force(target, teeth, stages, stage_teeth=(), max_total=None, sense="either"):
    """Every train: {sorted stages: (|error|, wheels, total, largest, widest, idler,
    error)}."""
    out = {}
    for k in range(1, stages + 1):
        ranges = []
        for i in range(k):
            lo, hi = stage_teeth[i] if i < len(stage_teeth) else teeth
            ranges.append(range(max(lo, teeth[0]), min(hi, teeth[1]) + 1))
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
    ],
)
def test_bad_limits(kwargs, message):
    with pytest.raises(ValueError, match=message):
        Limits(**kwargs)


def test_bad_target():
    with pytest.raises(ValueError, match="positive"):
        search_trains(Fraction(0), Limits())


def test_numeric_layer_does_not_import_cadquery():
    import subprocess
    import sys

    code = (
        "import sys, wheelgen.kinematics.ratio_search, wheelgen.kinematics.snippet, "
        "wheelgen.kinematics.ratio_target, wheelgen.cli.ratio; "
        "print('cadquery' in sys.modules)"
    )
    out = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, check=True
    )
    assert out.stdout.strip() == "False"
