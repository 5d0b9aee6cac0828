"""Coaxial (reverted) trains: the output comes back to the input's axis.

Checked against a plain brute force (nested loops over every tooth count, exact
fractions, nothing from the search module but its types) and against a motion work
worked out by hand.

No published motion work with equal tooth sums in both stages could be found with the
reference search available while this was written (the handbooks found name the
wheels but give no counts), so the motion-work check values below are derived, and
marked as such.
"""

from __future__ import annotations

import functools
import itertools
import math
from fractions import Fraction

import pytest

from wheelgen.checks.train_fit import fit_train, shift_reach
from wheelgen.kinematics.ratio_search import (
    Coaxial,
    Limits,
    exact_trains,
    relaxations,
    search_trains,
)


def coaxial_brute_force(target, counts, modules=(1, 1), reach=None, max_total=None):
    """{stages: rank key} of every two-stage train whose centre distances agree.

    ``reach(sum, module)`` (mm) lets the shorter stage be opened up to that distance.
    """
    m1, m2 = (Fraction(m) for m in modules)
    alike = m1 == m2
    reach = functools.lru_cache(maxsize=None)(reach) if reach else None
    out = {}
    one = [(a, b, m1 * (a + b) / 2) for a, b in itertools.product(counts, repeat=2)]
    two = [(a, b, m2 * (a + b) / 2) for a, b in itertools.product(counts, repeat=2)]
    for (a1, b1, c1), (a2, b2, c2) in itertools.product(one, two):
        if max_total is not None and a1 + b1 + a2 + b2 > max_total:
            continue
        if c1 != c2:
            if reach is None:
                continue
            short_sum, short_m, long_c = (
                (a1 + b1, m1, c2) if c1 < c2 else (a2 + b2, m2, c1)
            )
            if long_c > reach(short_sum, short_m) + 1e-9:
                continue
        ratio = Fraction(a1 * a2, b1 * b2)
        error = target / ratio - 1
        stages = ((a1, b1), (a2, b2))
        key = tuple(sorted(stages)) if alike else stages
        rank = (
            abs(error),
            abs(c1 - c2),
            a1 + b1 + a2 + b2,
            max(a1, b1, a2, b2),
            max(a1 + b1, a2 + b2),
            tuple(sorted(stages)),
        )
        if key not in out or rank < out[key][0]:
            out[key] = (rank, error)
    return out


def assert_same(target, counts, coaxial, top=12, max_total=None):
    limits = Limits(
        teeth=frozenset(counts), stages=2, coaxial=coaxial, max_teeth_total=max_total
    )
    got = search_trains(target, limits, top=top)
    bf = coaxial_brute_force(
        target, counts, coaxial.modules, coaxial.reach, max_total=max_total
    )
    want = sorted(bf.items(), key=lambda kv: kv[1][0])[:top]
    alike = len(set(coaxial.modules)) == 1
    shown = [tuple(sorted(t.stages)) if alike else t.stages for t in got]
    assert shown == [k for k, _ in want]
    assert [t.error for t in got] == [v[1] for _, v in want]
    assert [t.spread for t in got] == [v[0][1] for _, v in want]
    exact_bf = {k for k, v in bf.items() if v[1] == 0}
    exact_got = {
        tuple(sorted(t.stages)) if alike else t.stages
        for t in exact_trains(target, limits)
    }
    assert exact_got == exact_bf
    return got


@pytest.mark.parametrize(
    ("target", "counts"),
    [
        (Fraction(1, 12), range(8, 29)),
        (Fraction(7, 3), range(6, 22)),
        (Fraction("0.0833"), range(8, 26)),  # no exact train: the closest ones
        (Fraction(1, 12), [8, 10, 12, 16, 20, 24, 30, 32, 36, 40, 45, 48]),
    ],
)
def test_matches_brute_force(target, counts):
    assert_same(target, list(counts), Coaxial())


def test_matches_brute_force_with_two_modules():
    # stage 2 at module 0.96: 0.96 * 50 = 1.0 * 48, so 12/36 x 10/40 is coaxial
    counts = [8, 9, 10, 12, 15, 16, 18, 20, 24, 27, 30, 32, 36, 40]
    got = assert_same(Fraction(1, 12), counts, Coaxial((Fraction(1), Fraction("0.96"))))
    assert ((12, 36), (10, 40)) in [t.stages for t in got]


def test_matches_brute_force_with_profile_shift():
    assert_same(Fraction("0.0833"), list(range(8, 24)), Coaxial(reach=shift_reach(0.8)))


def test_matches_brute_force_with_tooth_total():
    assert_same(Fraction(1, 12), list(range(8, 30)), Coaxial(), max_total=90)


def test_every_coaxial_train_for_one_twelfth_is_exact_and_reverted():
    limits = Limits(teeth=(8, 120), stages=2, coaxial=Coaxial())
    exact = exact_trains(Fraction(1, 12), limits)
    trains = search_trains(Fraction(1, 12), limits, top=len(exact) + 1)
    assert len(exact) >= 30
    # the exact ones come first, the same as the divisibility search finds
    assert [t.stages for t in trains[:-1]] == [t.stages for t in exact]
    assert trains[-1].error != 0
    for t in exact:
        (a1, b1), (a2, b2) = t.stages
        assert a1 + b1 == a2 + b2  # equal tooth sums: one module, equal centres
        assert Fraction(a1 * a2, b1 * b2) == Fraction(1, 12) and t.error == 0
        assert t.centre == Fraction(a1 + b1, 2) and t.spread == 0


def test_motion_work_derived():
    # derived: 1/12 = (1/3)(1/4). Stage one a/(3a) has the tooth sum 4a, stage two
    # c/(4c) the sum 5c; equal sums need 4a = 5c, so a = 5t, c = 4t: 5t/15t x 4t/16t.
    # With no wheel under 8 teeth the smallest is t = 2: 10/30 x 8/32, sums 40 and 40.
    limits = Limits(teeth=(8, 60), stages=2, coaxial=Coaxial())
    best = search_trains(Fraction(1, 12), limits, top=1)[0]
    assert sorted(best.stages) == [(8, 32), (10, 30)]
    assert best.teeth_total == 80 and best.centre == 20  # mm at module 1
    # derived the same way from 1/12 = (1/2)(1/6): a/(2a) sum 3a, c/(6c) sum 7c,
    # 3a = 7c -> a = 7t, c = 3t; t = 4 gives 28/56 x 12/72, both sums 84
    every = {tuple(sorted(t.stages)) for t in exact_trains(Fraction(1, 12), limits)}
    assert ((8, 32), (10, 30)) in every
    assert ((8, 36), (12, 32)) in every  # derived: 8*12 / (36*32) = 1/12, sums 44
    wider = Limits(teeth=(8, 72), stages=2, coaxial=Coaxial())
    every = {tuple(sorted(t.stages)) for t in exact_trains(Fraction(1, 12), wider)}
    assert ((12, 72), (28, 56)) in every


def test_unequal_sums_are_met_by_profile_shift_and_reported():
    # derived: 12/36 x 10/40 = 120/1440 = 1/12 with tooth sums 48 and 50. At module 1
    # the centre distances are 24 and 25 mm; opening stage one to 25 mm needs the shift
    # sum x1 + x2 = (z1 + z2)(inv a_w - inv a) / (2 tan a), cos a_w = 24 cos 20 / 25
    # (ISO 21771:2007, working pressure angle and centre distance of a shifted pair).
    alpha = math.radians(20.0)
    alpha_w = math.acos(24 * math.cos(alpha) / 25)

    def inv(a):
        return math.tan(a) - a

    x_sum = 48 * (inv(alpha_w) - inv(alpha)) / (2 * math.tan(alpha))
    counts = frozenset({10, 12, 36, 40})
    plain = Limits(teeth=counts, stages=2, coaxial=Coaxial())
    assert exact_trains(Fraction(1, 12), plain) == []  # sums 48 and 50 differ
    shifted = Limits(
        teeth=counts, stages=2, coaxial=Coaxial(reach=shift_reach(x_sum + 0.01))
    )
    best = search_trains(Fraction(1, 12), shifted, top=1)[0]
    assert sorted(best.stages) == [(10, 40), (12, 36)] and best.error == 0
    assert best.spread == 1 and best.centre == 25
    fit = fit_train(best, 1.0)
    shifts = dict(fit.shifts)
    n = best.stages.index((12, 36)) + 1  # the shorter stage is opened
    assert set(shifts) == {f"driver{n}", f"driven{n}"}
    assert shifts[f"driver{n}"] + shifts[f"driven{n}"] == pytest.approx(x_sum, abs=2e-4)
    # a little less shift than needed is not enough
    short = Limits(
        teeth=counts, stages=2, coaxial=Coaxial(reach=shift_reach(x_sum - 0.01))
    )
    assert exact_trains(Fraction(1, 12), short) == []


def test_coaxial_limits():
    with pytest.raises(ValueError, match="two stages"):
        Limits(stages=3, coaxial=Coaxial())
    with pytest.raises(ValueError, match="opposite"):
        Limits(stages=2, sense="opposite", coaxial=Coaxial())
    with pytest.raises(ValueError, match="modules"):
        Coaxial((Fraction(1), Fraction(0)))


def test_relaxation_names_dropping_coaxial():
    # derived: with one module and teeth 8..20 no reverted pair of stages gives 1/25
    # (a/b * c/d = 1/25 needs b d = 25 a c; the largest stage reduction is 20/8)
    limits = Limits(teeth=(8, 20), stages=2, coaxial=Coaxial())
    rel = relaxations(Fraction(1, 25), limits, Fraction(0))
    assert all(r.limit != "stages" for r in rel)
    assert any(r.limit == "teeth_max" for r in rel)
