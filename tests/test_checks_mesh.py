"""Wheel and mesh checks: each with a pair that passes and one that fails, and the gear
numbers behind them against published worked examples."""

from __future__ import annotations

from pathlib import Path

import pytest

from wheelgen.checks import run_checks
from wheelgen.checks.mesh_checks import (
    check_mesh,
    check_wheel,
    design_mesh_checks,
)
from wheelgen.design.loader import load_design
from wheelgen.design.model import Process
from wheelgen.findings import Finding
from wheelgen.layout.placement import tooth_spec
from wheelgen.teeth.involute_mesh import involute_mesh
from wheelgen.teeth.spec import ToothSpec

DATA = Path(__file__).parent / "data" / "checks"
NAMES = ("pin", "big")
SUBJECT = "mesh pin-big"


def _ids(findings: list[Finding]) -> set[str]:
    return {f.check for f in findings}


def _only(findings: list[Finding], check: str) -> list[Finding]:
    hits = [f for f in findings if f.check == check]
    for f in hits:
        assert f.subject in f.message  # every message names its subject
    return hits


def _mesh(spec1, spec2, **kw):
    return check_mesh(spec1, spec2, SUBJECT, names=NAMES, **kw)


# --- gear numbers against worked examples ---------------------------------------------


def test_contact_ratio_of_the_published_helical_pair():
    # SDP/SI "Elements of Metric Gear Technology" (D785) p. T-109, Table 11-1: m_n = 3,
    # alpha_n = 20, beta = 30, z = 12 / 60, x_n1 = 0.09809, a = 125 gives alpha_t =
    # 22.79588 deg, m_t = 3.46410, alpha_wt = 23.1126 deg, eps_alpha = 1.2939. Its
    # transverse section is a spur pair of module m_t and pressure angle alpha_t, with
    # addendum 3 mm = (3 / m_t) m_t and transverse shift x_n m_n / m_t.
    mt = 3.46410
    xt = 0.09809 * 3 / mt
    s1 = ToothSpec(12, mt, pressure_angle_deg=22.79588, shift=xt, addendum=3 / mt)
    s2 = ToothSpec(60, mt, pressure_angle_deg=22.79588, addendum=3 / mt)
    data = involute_mesh(s1, s2, 125.0)
    assert data.pressure_angle_at_centres_deg == pytest.approx(23.1126, abs=1e-4)
    # the table's tip diameters are rounded (48.153 against 48.158 here): +-0.002
    assert data.contact_ratio == pytest.approx(1.2939, abs=0.002)


def test_contact_ratio_of_a_standard_pair():
    # derived: contact ratio formula (docs/references.md section 7): m = 1, 20/40
    # teeth, standard centre distance: 1.6352
    data = involute_mesh(ToothSpec(20, 1.0), ToothSpec(40, 1.0))
    assert data.contact_ratio == pytest.approx(1.6352, abs=1e-4)
    assert data.contact_ratio_effective == pytest.approx(1.6352, abs=1e-4)


@pytest.mark.parametrize(
    ("m", "z1", "z2", "x1", "x2", "alpha_w", "a", "source"),
    [
        (
            3,
            12,
            24,
            0.6,
            0.36,
            26.0886,
            56.4999,
            "KHK Gear Technical Reference / SDP/SI D785 positive-shift table"
            " (from memory)",
        ),
        (
            8,
            22,
            118,
            0.0,
            0.5,
            21.0617,
            563.8999,
            "'Cent'r Dist'nce of Profile Shifted Gear Calc', scribd.com/doc/210760271",
        ),
    ],
)
def test_working_centre_distance_of_shifted_pairs(
    m, z1, z2, x1, x2, alpha_w, a, source
):
    data = involute_mesh(ToothSpec(z1, m, shift=x1), ToothSpec(z2, m, shift=x2))
    assert data.working_pressure_angle_deg == pytest.approx(alpha_w, abs=1e-4), source
    assert data.working_centre_distance == pytest.approx(a, abs=1e-4), source


# --- wheel checks

# Smallest tooth count without undercut for a rack of addendum 1 m (straight flank 1 m:
# dedendum 1.0, no tip fillet): Elements of Metric Gear Technology (SDP/SI D785),
# section 4.3, p. T-36 gives 32 for 14.5 deg and 18 for 20 deg; okdor.com, "prevent
# gear undercut in design" gives 12 for 25 deg (docs/references.md section 6).
UNDERCUT_LIMITS = [(14.5, 32), (20.0, 18), (25.0, 12)]


@pytest.mark.parametrize(("alpha", "z_min"), UNDERCUT_LIMITS)
def test_undercut_limit_matches_the_published_tooth_count(alpha, z_min):
    def spec(z):
        return ToothSpec(
            z, 1.0, pressure_angle_deg=alpha, dedendum=1.0, root_radius=0.0
        )

    assert _only(check_wheel(spec(z_min), "wheel pin"), "wheel.undercut") == []
    found = _only(check_wheel(spec(z_min - 1), "wheel pin"), "wheel.undercut")
    assert len(found) == 1 and found[0].level == "warning"
    assert "wheel pin" in found[0].message


def test_undercut_advice_gives_a_shift_that_cures_it():
    found = _only(check_wheel(ToothSpec(12, 1.0), "wheel pin"), "wheel.undercut")
    assert found
    # derived: x_min = 1 - z sin^2(20)/2 = 0.298 for the ISO 53 A rack (straight
    # flank 1 m)
    x = float(found[0].advice.split("shift = ")[1].split()[0])
    assert x == pytest.approx(0.30)
    assert (
        _only(check_wheel(ToothSpec(12, 1.0, shift=x), "wheel pin"), "wheel.undercut")
        == []
    )


def test_pointed_tip():
    # derived: z = 10, x = +1.0, h_a = 1 m: inv(alpha_a) > psi + inv(alpha), the
    # flanks meet
    found = _only(
        check_wheel(ToothSpec(10, 1.0, shift=1.0), "wheel pin"), "wheel.pointed_tip"
    )
    assert len(found) == 1 and found[0].level == "error"
    near = _only(
        check_wheel(ToothSpec(10, 1.0, shift=0.6), "wheel pin"), "wheel.pointed_tip"
    )
    assert len(near) == 1 and near[0].level == "warning"  # 0.18 m at the tip (derived)
    assert (
        _only(
            check_wheel(ToothSpec(10, 1.0, shift=0.3), "wheel pin"), "wheel.pointed_tip"
        )
        == []
    )


# --- mesh checks


def test_good_pair_has_no_findings():
    s1, s2 = ToothSpec(20, 1.0, thinning=0.025), ToothSpec(40, 1.0, thinning=0.025)
    assert _mesh(s1, s2, centre_distance=30.0) == []


def test_interference_by_the_one_to_one_limit():
    # Mechanical Engineering Design (McGraw-Hill), spur-gear chapter: the smallest
    # 20 deg full-depth pinion running 1:1 without interference has 13 teeth (from
    # memory); derived: 2/(3 sin^2 a)(1 + sqrt(1 + 3 sin^2 a)) = 12.3 for 20 deg
    # (docs/references.md section 6).
    assert involute_mesh(ToothSpec(13, 1.0), ToothSpec(13, 1.0)).reach_1 > 0
    data = involute_mesh(ToothSpec(12, 1.0), ToothSpec(12, 1.0))
    assert data.reach_1 < 0 and data.reach_2 < 0
    found = _only(
        _mesh(ToothSpec(12, 1.0), ToothSpec(12, 1.0), simulate=False),
        "mesh.interference",
    )
    assert {f.level for f in found} == {"warning"}
    assert any("interference point of pin" in f.message for f in found)
    clean = _mesh(ToothSpec(20, 1.0), ToothSpec(40, 1.0), simulate=False)
    assert "mesh.interference" not in _ids(clean)


def test_generated_undercut_teeth_do_not_jam_but_lose_contact():
    # derived (simulator): the rack cut away what the mate's tips would hit
    s = ToothSpec(8, 1.0, thinning=0.025)
    found = _mesh(s, s)
    assert "mesh.jam" not in _ids(found)
    assert "mesh.interference" in _ids(found)
    assert "mesh.transmission_error" in _ids(found)  # about 0.1 deg: off the involutes


@pytest.mark.parametrize(
    ("addendum", "level"), [(1.0, None), (0.7, "warning"), (0.5, "error")]
)
def test_contact_ratio_limits(addendum, level):
    # derived: 20/40 teeth with short addenda, eps from the formula of ISO 21771 /
    # SDP D785 sec. 11: 1.635 (1.0 m), about 1.14 (0.7 m), about 0.82 (0.5 m); limits
    # 1.2 / 1.0 (common practice, no source)
    s1 = ToothSpec(20, 1.0, addendum=addendum, thinning=0.025)
    s2 = ToothSpec(40, 1.0, addendum=addendum, thinning=0.025)
    found = _only(_mesh(s1, s2), "mesh.contact_ratio")
    if level is None:
        assert found == []
    else:
        assert [f.level for f in found] == [level]
        assert SUBJECT in found[0].message


def test_contact_ratio_below_one_is_seen_by_the_simulator_too():
    # The simulator knows nothing of the formula. Below 1 the involute contact ends
    # before the next pair meets; the tip corner then drives off the line of action and
    # the driven wheel falls behind: transmission error where a full pair has none.
    from wheelgen.checks.mesh_sim import simulate_mesh
    from wheelgen.teeth.forms import outline_for

    def te(addendum):
        s1 = ToothSpec(20, 1.0, addendum=addendum, thinning=0.025)
        s2 = ToothSpec(40, 1.0, addendum=addendum, thinning=0.025)
        sim = simulate_mesh(outline_for(s1), outline_for(s2), 30.0, steps=90)
        assert not sim.jams
        return sim.te_peak_to_peak_deg

    full, short = te(1.0), te(0.5)  # eps 1.635 and 0.885 (derived, formula)
    assert full < 1e-3
    assert short > 2e-3 and short > 10 * full


@pytest.mark.parametrize(
    ("addendum", "level"), [(1.0, None), (1.2, "warning"), (1.3, "error")]
)
def test_tip_root_clearance(addendum, level):
    # derived: c = dedendum - addendum = 0.25 / 0.05 / -0.05 m; warning below 0.1 m
    # (common practice, no source; ISO 53 gives 0.25 m)
    s1 = ToothSpec(20, 1.0, addendum=addendum)
    s2 = ToothSpec(40, 1.0)
    found = _only(_mesh(s1, s2, simulate=False), "mesh.clearance")
    if level is None:
        assert found == []
    else:
        assert [f.level for f in found] == [level]
        assert "tips of pin" in found[0].message


def test_backlash_smaller_than_the_process_holds():
    printed = Process(kind="print")
    tight = _mesh(
        ToothSpec(20, 1.0, thinning=0.025),
        ToothSpec(40, 1.0, thinning=0.025),
        process=printed,
        simulate=False,
    )
    found = _only(tight, "mesh.backlash")
    assert len(found) == 1 and found[0].level == "warning"
    loose = _mesh(
        ToothSpec(20, 1.0, thinning=0.1),
        ToothSpec(40, 1.0, thinning=0.1),
        process=printed,
        simulate=False,
    )
    assert _only(loose, "mesh.backlash") == []


def test_mismatched_wheels():
    found = _mesh(ToothSpec(20, 1.0), ToothSpec(40, 1.25))
    assert [f.check for f in found] == ["mesh.mismatch"]
    assert "modules" in found[0].message
    found = _mesh(ToothSpec(20, 1.0), ToothSpec(40, 1.0, pressure_angle_deg=14.5))
    assert [f.check for f in found] == ["mesh.mismatch"]
    assert "pressure angles" in found[0].message and SUBJECT in found[0].message


def test_centre_distance_checked_against_the_working_distance():
    # derived: a_w = 30.0 for 20/40 teeth, m = 1, no shift; total backlash 0.05 mm lets
    # the axes come 0.05 / (2 tan 20) = 0.069 mm closer before the flanks bind
    s1, s2 = ToothSpec(20, 1.0, thinning=0.025), ToothSpec(40, 1.0, thinning=0.025)
    assert (
        _only(
            _mesh(s1, s2, centre_distance=30.01, simulate=False), "mesh.centre_distance"
        )
        == []
    )
    # the mill's centre tolerance is 0.02 mm: exactly that passes, beyond it is an error
    assert not _only(
        _mesh(s1, s2, centre_distance=30.02, simulate=False), "mesh.centre_distance"
    )
    far = _only(
        _mesh(s1, s2, centre_distance=30.1, simulate=False), "mesh.centre_distance"
    )
    assert [f.level for f in far] == ["error"] and "far apart" in far[0].message
    close = _mesh(s1, s2, centre_distance=29.9)
    assert [f.level for f in _only(close, "mesh.centre_distance")] == ["error"]
    assert [f.level for f in _only(close, "mesh.jam")] == ["error"]


def test_triangular_teeth_get_a_verdict_from_the_simulator():
    # the triangular pair needs far more play than an involute one (non-conjugate
    # flanks)
    tight = [
        ToothSpec(z, 1.0, form="triangular", addendum=0.6, thinning=0.05)
        for z in (20, 60)
    ]
    loose = [
        ToothSpec(z, 1.0, form="triangular", addendum=0.6, thinning=0.2)
        for z in (20, 60)
    ]
    jammed = _mesh(*tight)
    assert "mesh.jam" in _ids(jammed)
    running = _mesh(*loose)
    assert not [f for f in running if f.level == "error"]
    te = _only(running, "mesh.transmission_error")
    assert len(te) == 1 and float(te[0].measured.split()[0]) > 0.05


# --- whole designs


def test_design_good_pair_passes():
    assert design_mesh_checks(load_design(DATA / "good_pair.toml")) == []


def test_design_axes_too_close():
    # the pair is judged where the layout puts it: at 29.9 mm it jams; that the axes
    # stand 0.1 mm too close is the cause, reported once with the jam under it
    found = design_mesh_checks(load_design(DATA / "close_axes.toml"))
    assert "mesh.jam" in {f.check for f in found if f.level == "error"}
    assert all(f.subject == "mesh w1-w2" for f in found)
    found = run_checks(load_design(DATA / "close_axes.toml"))
    # (the file has no [frame]: a note says so)
    (cause,) = [f for f in found if f.check != "frame.none"]
    assert (cause.level, cause.check, cause.subject) == (
        "error",
        "mesh.centre_distance",
        "mesh w1-w2",
    )
    assert "mesh.jam" in {f.check for f in cause.consequences}
    # derived: b is placed by its own 'at', so the fix moves it 0.1 mm along the
    # line of centres, to the working distance 30 mm from a
    assert [str(c) for c in cause.changes] == ['at = [30.0, 0.0] on arbor "b"']


def test_design_modules_differ():
    found = design_mesh_checks(load_design(DATA / "two_modules.toml"))
    assert [(f.check, f.subject) for f in found] == [("mesh.mismatch", "mesh w1-w2")]


def test_design_planet_checked_in_the_carrier_frame():
    assert design_mesh_checks(load_design(DATA / "planet_good.toml")) == []
    assert not _only(
        run_checks(load_design(DATA / "planet_good.toml")), "mesh.centre_distance"
    )
    found = run_checks(load_design(DATA / "planet_off.toml"))
    cd = _only(found, "mesh.centre_distance")
    assert len(cd) == 1 and cd[0].subject == "mesh planet_pinion-sun"
    # derived: the planet's 'at' is in the carrier's frame; the working distance of
    # 13 + 64 teeth at m = 0.8, x = +0.4 / -0.4 is m (z1 + z2) / 2 = 30.8 mm
    assert [str(c) for c in cd[0].changes] == ['at = [30.8, 0.0] on arbor "planet"']


def test_design_pairs_judged_at_the_distances_given():
    design = load_design(DATA / "good_pair.toml")
    assert design_mesh_checks(design, {1: 30.0}, simulate=False) == []
    # derived: 0.05 mm backlash closes at 0.05 / (2 tan 20 deg) = 0.069 mm closer
    found = design_mesh_checks(design, {1: 29.8}, simulate=False)
    assert "mesh.clearance" in {f.check for f in found}
    assert "mesh.centre_distance" not in {f.check for f in found}


def test_wheel_spec_takes_half_the_backlash_from_each_wheel():
    wheel = load_design(DATA / "good_pair.toml").wheel("w1")
    assert tooth_spec(wheel).thinning == pytest.approx(wheel.backlash / 2)


def test_design_with_teeth_that_cannot_be_made_reports_instead_of_stopping():
    # derived: thinning 4 / 2 = 2 mm is more than the pi m / 2 = 1.571 mm tooth
    found = design_mesh_checks(load_design(DATA / "bad_teeth.toml"))
    assert [(f.level, f.check, f.subject) for f in found] == [
        ("error", "wheel.teeth", "wheel w1")
    ]
    assert "wheel w1" in found[0].message


def test_axes_inside_the_base_circles():
    # derived: a0 cos(20 deg) = 30 * 0.9397 = 28.19 mm; at 25 mm there is no line of
    # action at all
    found = _mesh(ToothSpec(20, 1.0), ToothSpec(40, 1.0), centre_distance=25.0)
    assert [(f.level, f.check) for f in found] == [("error", "mesh.centre_distance")]
    assert SUBJECT in found[0].message


def test_jam_advice_names_the_backlash_that_frees_the_pair():
    # the advised 'backlash' (the same on both wheels, half of it off each tooth) is
    # tried on the outlines before it is advised: with it the pair turns freely, with
    # the process's smallest backlash to spare (mill: 0.02 mm). Flanks at equal angles
    # (tooth angle 60 - 180/z, docs/format.md), so backlash is the first remedy.
    def pair(backlash):
        return [
            ToothSpec(z, 1.0, form="triangular", tooth_angle_deg=60 - 180 / z,
                      addendum=0.6, thinning=backlash / 2)
            for z in (20, 60)
        ]  # fmt: skip

    (jam,) = _only(_mesh(*pair(0.05)), "mesh.jam")
    assert [c.key for c in jam.changes] == ["backlash", "backlash"]
    value = jam.changes[0].value
    assert isinstance(value, float) and 0.1 < value < 0.25 * 3.1416
    assert str(jam.changes[0]) in jam.advice
    assert not {"mesh.jam", "mesh.backlash"} & _ids(_mesh(*pair(value)))


def test_jam_far_beyond_thinner_teeth_advises_moving_the_arbors():
    # derived: 1 mm too close is an overlap of about 2 x 1 x tan(20 deg) = 0.73 mm of
    # arc: still thinner teeth; 3 mm too close overlaps more than a quarter pitch
    found = _mesh(ToothSpec(20, 1.0), ToothSpec(40, 1.0), centre_distance=28.6)
    (jam,) = _only(found, "mesh.jam")
    assert jam.changes == () and "move them apart" in jam.advice
