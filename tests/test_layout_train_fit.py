"""Laying out a found train: arbor places, profile shift, and the fit verdict."""

from __future__ import annotations

import itertools
import math
from fractions import Fraction

import pytest

from wheelgen.checks.train_fit import (
    SHAFT_DIAMETER,
    design_of,
    fit_train,
    plan_train,
    shift_reach,
)
from wheelgen.design.loader import loads_design
from wheelgen.kinematics.ratio_search import Coaxial, Limits, Train, search_trains
from wheelgen.kinematics.snippet import train_snippet
from wheelgen.layout import arbor_positions


def _inv(a):
    return math.tan(a) - a


def test_shift_reach_is_the_shifted_centre_distance():
    # ISO 21771:2007: inv a_w = inv a + 2 tan a (x1 + x2) / (z1 + z2) and
    # a = m (z1 + z2) / 2 cos a / cos a_w; solved here by bisection (derived)
    alpha = math.radians(20.0)
    want = _inv(alpha) + 2 * math.tan(alpha) * 1.0 / 48
    lo, hi = alpha, math.radians(60)
    for _ in range(100):
        mid = (lo + hi) / 2
        lo, hi = (mid, hi) if _inv(mid) < want else (lo, mid)
    expected = 0.8 * 48 / 2 * math.cos(alpha) / math.cos(lo)
    assert shift_reach(1.0)(48, Fraction(4, 5)) == pytest.approx(expected, rel=1e-12)
    assert shift_reach(0.0)(48, Fraction(1)) == pytest.approx(24.0, rel=1e-12)
    with pytest.raises(ValueError, match="max_shift"):
        shift_reach(-0.1)


def _tips_clear_other_arbors(train, modules=1.0):
    """Measured on the written file: every tip circle against every other shaft."""
    fit = fit_train(train, modules)
    design = loads_design(train_snippet(train, fit.plan), "<t>")
    at = arbor_positions(design)
    clear = math.inf
    for w, arbor in itertools.product(design.wheels, at):
        if arbor == w.arbor or (arbor, w.arbor) in (
            ("input", "output"),
            ("output", "input"),
        ):
            continue
        # standard tip radius m (z/2 + 1 + x) (ISO 21771 with the ISO 53 rack)
        tip = w.module * (w.teeth / 2 + 1 + w.shift)
        clear = min(clear, math.dist(at[w.arbor], at[arbor]) - tip - SHAFT_DIAMETER / 2)
    return fit, clear


def test_fitting_trains_clear_every_arbor():
    trains = search_trains(
        Fraction(10000, 3652422), Limits(teeth=(10, 120), stages=3), top=40
    )
    verdicts = [_tips_clear_other_arbors(t) for t in trains]
    assert any(f.fits for f, _ in verdicts) and any(not f.fits for f, _ in verdicts)
    for fit, clear in verdicts:
        if fit.fits:
            assert clear >= -1e-9
        else:  # what the layout check found: a wheel over an arbor, or two wheels
            assert {p.check for p in fit.problems} <= {
                "layout.cuts_arbor",
                "layout.wheel_collision",
            }


def test_wheel_over_an_arbor_is_found():
    # derived: 20/19 x 127/10 at module 1 puts lay1 (20 + 19) / 2 = 19.5 mm from the
    # input arbor; the 127-tooth driver on lay1 has a tip radius of 64.5 mm, so it
    # covers the input's 3 mm shaft by 64.5 + 1.5 - 19.5 = 46.5 mm
    train = Train(((20, 19), (127, 10)), Fraction(254, 19), Fraction(0))
    fit = fit_train(train)
    assert not fit.fits
    assert any("46.500 mm" in p.message and "input" in p.message for p in fit.problems)
    assert fit.largest_diameter == pytest.approx(129.0)


def test_coaxial_plan_puts_the_output_round_the_input():
    best = search_trains(
        Fraction(1, 12), Limits(teeth=(8, 60), stages=2, coaxial=Coaxial()), top=1
    )[0]
    plan = plan_train(best, 1.0)
    arbors = {a.name: a for a in plan.arbors}
    assert arbors["output"].around == "input" and arbors["input"].at == (0.0, 0.0)
    assert [m.bearing_deg for m in plan.meshes] == [0.0, None]
    design = loads_design(train_snippet(best, plan), "<t>")
    at = arbor_positions(design)
    # derived: 8/32 x 10/30 at module 1, both stages 40 teeth: lay1 20 mm out
    assert at["lay1"] == pytest.approx((20.0, 0.0))
    back, front = plan.plates
    assert all(
        back <= w.height and w.height + plan.face_width <= front for w in plan.wheels
    )


def test_stage_modules_are_written_per_wheel():
    train = Train(
        ((12, 36), (10, 40)),
        Fraction(1, 12),
        Fraction(0),
        None,
        Fraction(0),
        Fraction(24),
    )
    fit = fit_train(train, (1.0, 0.96))
    text = train_snippet(train, fit.plan)
    assert "module = 0.96" in text and fit.fits
    design = loads_design(text, "<t>")
    # derived: 0.96 * (10 + 40) / 2 = 24 mm = 1.0 * (12 + 36) / 2
    assert arbor_positions(design)["lay1"] == pytest.approx((24.0, 0.0))


@pytest.mark.parametrize(
    ("target", "limits", "modules"),
    [
        (Fraction("0.0027379093"), Limits(teeth=(10, 80), stages=3), 1.0),
        (Fraction(254, 19), Limits(teeth=(10, 130), stages=2, sense="opposite"), 0.8),
        (
            Fraction(1, 12),
            Limits(
                teeth=(8, 60),
                stages=2,
                coaxial=Coaxial((Fraction(1), Fraction("0.9")), shift_reach(1.0)),
            ),
            (1.0, 0.9),
        ),
    ],
)
def test_design_of_a_plan_is_what_the_loader_reads(target, limits, modules):
    for train in search_trains(target, limits, top=12):
        ms = modules if isinstance(modules, float) else modules[: len(train.stages)]
        plan = plan_train(train, ms)
        fast = design_of(plan)
        read = loads_design(train_snippet(train, plan), "<t>")
        for part in ("arbors", "wheels", "meshes", "frame", "drive", "process"):
            assert getattr(fast, part) == getattr(read, part), part


def test_modules_must_match_a_coaxial_train():
    train = search_trains(
        Fraction(1, 12), Limits(teeth=(8, 60), stages=2, coaxial=Coaxial()), top=1
    )[0]
    with pytest.raises(ValueError, match="centre distance"):
        plan_train(train, (1.0, 0.5))
