"""The frame plan: pillars, cocks, holes, outline and the frame checks, measured on the
plan's numbers against sizes worked out here, independently of the frame package.

Tip radii are ISO 21771:2007's ``d_a = m z + 2 m (h_a* + x)``; a carried wheel's path
is the ring between ``R - r_a`` and ``R + r_a`` about its carrier's axis (derived); the
hole limits are ISO 286-2's H7 table; clearance holes ISO 273's medium series; the
least edge distance and hole spacing EN 1993-1-8:2005, Table 3.3 (e2 >= 1.2 d0, p1 >=
2.2 d0). The frame's own clearance and margin are the documented defaults (common
practice, no source).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from tests._demo import DEMO, DEMO_TEXT, demo_variant
from wheelgen.checks.engine import analyse
from wheelgen.design import DesignError, load_design, loads_design
from wheelgen.frame import frame_findings, frame_parts, plan_frame
from wheelgen.frame.outline import edges_polyline, outline_distance
from wheelgen.layout.collisions import inside_polygon
from wheelgen.layout.part_kinds import ArborPart, BearingPart, PillarPart, ScrewPart
from wheelgen.layout.train_layout import plan_layout
from wheelgen.parts import plan_parts

DATA = Path(__file__).parent / "data"
PAIR = (DATA / "layout" / "pair.toml").read_text(encoding="utf-8")


def tip(w) -> float:
    # ISO 21771:2007: d_a = m z + 2 m (h_a* + x); triangular teeth have no shift
    x = w.shift if w.form == "involute" else 0.0
    return w.module * (w.teeth / 2 + w.addendum + x)


def pair(rectangle: str = "", extra: str = "") -> str:
    text = PAIR.replace("FORM", "involute").replace("DISTANCE", "25.0")
    if rectangle:
        text = text.replace(
            "thickness = 2.0", f"thickness = 2.0\nrectangle = {rectangle}"
        )
    return text + extra


def errors(design, check: str | None = None):
    found = [f for f in frame_findings(design) if f.level == "error"]
    return [f for f in found if check is None or f.check == check]


# -- the format -------------------------------------------------------------------


def test_version_1_files_load_as_they_are():
    d = load_design(DEMO)
    f = d.frame
    assert (f.plates, f.thickness) == ((0.0, 40.0), 2.0)
    assert f.rectangle is None and f.polygon is None and f.pillars == 4
    assert f.screw == "M3" and d.pillars == ()
    assert all(a.pivot == "hole" for a in d.arbors)
    assert all(s.kind == "tube" for s in d.stock)


def test_new_frame_keys_load():
    d = loads_design(
        pair(
            '[-30.0, -30.0, 50.0, 30.0]\ncorner = 2.5\npillars = 3\nscrew = "M2.5"'
            "\nmargin = 5.0\nclearance = 0.8\npillar_diameter = 7.0"
        ),
        "pair.toml",
    )
    f = d.frame
    assert f.rectangle == (-30.0, -30.0, 50.0, 30.0) and f.corner == 2.5
    assert (f.pillars, f.screw, f.margin, f.clearance, f.pillar_diameter) == (
        3, "M2.5", 5.0, 0.8, 7.0,
    )  # fmt: skip


@pytest.mark.parametrize(
    ("change", "words"),
    [
        ("rectangle = [0.0, 0.0, -5.0, 10.0]", "x1 > x0"),
        ("polygon = [[0, 0], [10, 10], [10, 0], [0, 10]]", "do not cross"),
        ("polygon = [[0, 0], [10, 0]]", "at least 3 corners"),
        (
            "rectangle = [0.0, 0.0, 5.0, 5.0]\npolygon = [[0, 0], [9, 0], [0, 9]]",
            "one of them",
        ),
        ("pillars = 2", "from 3 to 12"),
        ('screw = "M7"', "'M2', 'M2.5', 'M3', 'M4', 'M5'"),
        ("pillar_diameter = 0.0", "a number from 0.01 to 2000 mm"),
    ],
)
def test_bad_frame_keys_say_what_is_allowed(change, words):
    text = pair().replace("thickness = 2.0", f"thickness = 2.0\n{change}")
    with pytest.raises(DesignError) as info:
        loads_design(text, "pair.toml")
    message = str(info.value)
    assert "[frame]" in message and words in message


def test_pillar_tables_need_three_and_a_frame():
    two = "\n[[pillar]]\nat = [0.0, 30.0]\n\n[[pillar]]\nat = [20.0, 30.0]\n"
    with pytest.raises(DesignError, match="at least 3 pillars"):
        loads_design(pair(extra=two), "pair.toml")
    three = two + "\n[[pillar]]\nat = [10.0, -30.0]\n"
    no_frame = pair(extra=three).replace(
        "[frame]\nplates = [0.0, 20.0]\nthickness = 2.0\n", ""
    )
    with pytest.raises(DesignError, match="no \\[frame\\]"):
        loads_design(no_frame, "pair.toml")
    d = loads_design(pair(extra=three), "pair.toml")
    assert [p.at for p in d.pillars] == [(0.0, 30.0), (20.0, 30.0), (10.0, -30.0)]


@pytest.mark.parametrize(
    ("stock", "words"),
    [
        ('kind = "bush"\noutside = 5.0\ninside = 3.0', "'width' is missing"),
        ("outside = 5.0\ninside = 3.0\nwidth = 4.0", "'width' on a tube"),
        ('kind = "washer"\noutside = 5.0\ninside = 3.0', "'tube', 'bush', 'bearing'"),
    ],
)
def test_stock_kinds(stock, words):
    with pytest.raises(DesignError) as info:
        loads_design(pair(extra=f"\n[[stock]]\n{stock}\n"), "pair.toml")
    assert words in str(info.value)


def test_pivot_only_on_an_arbor_turning_in_the_plates():
    text = DEMO_TEXT.replace(
        'name = "hours"          # tube', 'name = "hours"\npivot = "bush"  # tube'
    )
    with pytest.raises(DesignError, match="'pivot' only on an arbor"):
        loads_design(text, "demo.toml")


# -- the demo's frame ---------------------------------------------------------------


@pytest.fixture(scope="module")
def demo():
    design = load_design(DEMO)
    return design, plan_frame(design)


def test_demo_has_at_least_three_pillars_clear_of_every_wheel_and_path(demo):
    design, plan = demo
    layout = plan_layout(design)
    pos = layout.placing.positions
    r_pillar = 8.0 / 2  # milled M3: spigot 5 mm + 3 mm (documented default)
    clearance = 1.0  # milled (documented default)
    assert len(plan.pillars) >= 3
    for p in plan.pillars:
        for w in design.wheels:
            a = design.arbor(w.arbor)
            while a.around is not None:
                a = design.arbor(a.around)
            if a.carrier is None:
                gap = math.dist((p.x, p.y), pos[a.name]) - tip(w) - r_pillar
            else:  # a carried wheel sweeps a ring about its carrier's axis
                centre = layout.position(design.wheel(a.carrier).arbor)
                reach = math.dist(pos[a.name], centre)
                gap = math.dist((p.x, p.y), centre) - (reach + tip(w)) - r_pillar
            assert gap >= clearance - 1e-6, (p.name, w.name, gap)
        # the moon's coupling pin sweeps 8 +- 0.75 mm about the moon arbor
        ring = math.dist((p.x, p.y), pos["moon"])
        assert ring - r_pillar >= 8.75 + clearance


def test_demo_pillars_surround_every_pivot_and_stand_apart(demo):
    design, plan = demo
    pts = [(p.x, p.y) for p in plan.pillars]
    for plate in plan.plates:
        for h in plate.holes:
            if h.role in ("pivot", "held"):
                # inside the convex polygon of the pillars (counter-clockwise)
                for (ax, ay), (bx, by) in zip(pts, pts[1:] + pts[:1]):
                    assert (bx - ax) * (h.y - ay) - (by - ay) * (h.x - ax) >= 0, h.what
    for i, a in enumerate(pts):
        for b in pts[i + 1 :]:
            assert math.dist(a, b) >= 2 * 8.0 + 1.0  # two diameters and the clearance


def test_demo_cocks_hold_the_coupled_arbors(demo):
    design, plan = demo
    cocks = {c.arbor: c for c in plan.cocks}
    assert set(cocks) == {"moon", "moon_dial"}
    pos = plan_layout(design).placing.positions
    moon, dial = cocks["moon"], cocks["moon_dial"]
    assert (moon.x, moon.y) == pos["moon"] and (dial.x, dial.y) == pos["moon_dial"]
    # moon: held by the back plate; its cock between that plate (0) and moon_wheel
    # (9 to 11 mm), 1 mm clear; moon_dial: between moon_disc (13 to 14.5) and the
    # front plate (40): the pin's heights (11 to 14.5 mm) are left free
    assert moon.plate == moon.held_by == "back" and moon.bar_z1 <= 9.0 - 1.0
    assert moon.foot_z0 == 0.0 and moon.foot_z1 == moon.bar_z0
    assert dial.plate == dial.held_by == "front" and dial.bar_z0 >= 14.5 + 1.0
    assert dial.foot_z1 == 40.0 and dial.foot_z0 == dial.bar_z1
    for c in (moon, dial):
        assert c.bar_z1 <= 11.0 or c.bar_z0 >= 14.5  # never at the pin's heights
        # the pivot hole is the arbor's running bore: H7 at 2 mm, +10/0 um (ISO 286-2)
        assert (c.hole.low, c.hole.high) == (2.0, 2.01)
    # the two bearings of each arbor at least three diameters (6 mm) apart
    assert abs((moon.bar_z0 + moon.bar_z1) / 2 - (-1.0)) >= 6.0
    assert abs((dial.bar_z0 + dial.bar_z1) / 2 - 41.0) >= 6.0


def test_demo_every_turning_arbor_is_held_twice(demo):
    design, plan = demo
    spans = plan_layout(design).stacking.spans
    cocks = {c.arbor for c in plan.cocks}
    for name in ("main", "lay", "moon_lay", "moon", "moon_dial"):
        held = len(spans[name].plates) + (name in cocks)
        if name == "main":  # the front end turns in the fixed stud's bore
            held = len(spans[name].pivots)
        assert held == 2, name
    found = frame_findings(design)
    assert [f for f in found if f.level == "error"] == []
    assert {f.subject for f in found if f.check == "frame.held"} == {
        "arbor moon",
        "arbor moon_dial",
    }


def test_demo_holes_inside_the_outline_with_their_edge_distance(demo):
    design, plan = demo
    loop = edges_polyline(plan.outline, 0.005)
    for plate in plan.plates:
        centres = np.array([(h.x, h.y) for h in plate.holes])
        assert inside_polygon(centres, loop).all()
        dist = outline_distance(centres, loop)
        for h, d in zip(plate.holes, dist):
            # EN 1993-1-8, e2 >= 1.2 d0 (less the chords' 0.005 mm)
            assert d >= 1.2 * h.diameter - 0.005, h.what
        for i, a in enumerate(plate.holes):
            for b in plate.holes[i + 1 :]:
                # EN 1993-1-8, p1 >= 2.2 d0, shared as 1.1 (d1 + d2)
                assert (
                    math.dist((a.x, a.y), (b.x, b.y))
                    >= 1.1 * (a.diameter + b.diameter) - 1e-6
                )


def test_demo_outline_holds_every_fixed_wheel_with_the_margin(demo):
    design, plan = demo
    layout = plan_layout(design)
    loop = edges_polyline(plan.outline, 0.005)
    for w in design.wheels:
        root = w.arbor
        while design.arbor(root).around is not None:
            root = design.arbor(root).around
        if design.arbor(root).carrier is not None:
            continue
        c = np.array([layout.placing.positions[root]])
        # the polyline's chords lie up to 0.005 mm inside the exact arcs
        assert outline_distance(c, loop)[0] >= tip(w) + 3.0 - 0.005, w.name


def test_demo_plate_holes_follow_the_members_through_each_plate(demo):
    _, plan = demo
    back = {h.what: h for h in plan.plate("back").holes if h.role in ("pivot", "held")}
    front = {
        h.what: h for h in plan.plate("front").holes if h.role in ("pivot", "held")
    }
    assert set(back) == {"main", "lay", "moon_lay", "moon"}
    assert set(front) == {"stud", "lay", "moon_lay", "moon_dial"}
    # the fixed stud, outermost of the centre's tubes (3 mm arbor, hour tube 3.7, tide
    # tube 4.4, stud 5.1), is held in an H7 hole of its own 5.1 mm: +12/0 um (ISO 286-2)
    assert front["stud"].role == "held" and (front["stud"].low, front["stud"].high) == (
        5.1,
        5.112,
    )
    assert back["main"].role == "pivot" and back["main"].fit == "H7"
    mounting = [h for h in plan.plate("back").holes if h.role == "mounting"]
    assert [h.diameter for h in mounting] == [3.4, 3.4]  # ISO 273 medium, M3


def test_demo_parts_and_screws(demo):
    design, plan = demo
    parts = frame_parts(design)
    kinds = [p.kind for p in parts]
    assert kinds.count("plate") == 2 and kinds.count("pillar") == len(plan.pillars)
    assert kinds.count("cock") == 2
    screws = [p for p in parts if isinstance(p, ScrewPart)]
    # a milled pillar is riveted at the back: one screw each; a cock takes two
    assert len(screws) == len(plan.pillars) + 2 * 2
    pillar = next(p for p in parts if isinstance(p, PillarPart))
    # the spigots pass through the 2 mm plates; the body spans the 40 mm between them
    assert (pillar.spigot, pillar.back_spigot, pillar.front_spigot) == (5.0, 2.0, 2.0)
    assert pillar.length == 40.0 and pillar.placement.z == -2.0
    # the tapped hole is a 2.5 mm drill (M3 - P = 3 - 0.5, ISO 261 coarse pitch)
    assert pillar.front_hole == 2.5 and pillar.back_hole == 0.0
    # ISO 4762 preferred lengths; a pillar screw holds in the spigot by >= 1.5 d
    lengths = {s.name.split("_")[0]: s.length for s in screws}
    assert lengths["pillar"] == 5.0 and lengths["cock"] == 8.0
    everything = plan_parts(design)
    assert len({p.name for p in everything}) == len(everything)


# -- another process, stock and given outlines ------------------------------------------


def test_printed_frame_plain_pillars_two_screws_and_a_bearing():
    design = load_design(DATA / "frame" / "print_week.toml")
    plan = plan_frame(design)
    assert len(plan.pillars) == 3
    parts = frame_parts(design)
    pillar = next(p for p in parts if isinstance(p, PillarPart))
    # printed: 3 d + 1 = 10 mm for M3, no spigots, a pilot hole (2.5 mm) at each end
    assert pillar.diameter == 10.0 and pillar.spigot == 0.0
    assert pillar.back_hole == pillar.front_hole == 2.5
    screws = [p for p in parts if isinstance(p, ScrewPart)]
    assert len(screws) == 2 * 3
    holes = plan.plate("back").holes
    assert {h.diameter for h in holes if h.role == "screw"} == {3.4}  # ISO 273 medium
    crank = [h for h in holes if h.what == "crank"]
    assert [(h.role, h.diameter, h.fit) for h in crank] == [
        ("bearing", 7.0, "print press")
    ]
    bearings = [p for p in parts if isinstance(p, BearingPart)]
    assert {(b.inside, b.outside, b.width) for b in bearings} == {(3.0, 7.0, 3.0)}
    # flush with the plates' outer faces: back at -3, front at 27 - 3 = 24
    assert sorted(b.placement.z for b in bearings) == [-3.0, 24.0]
    assert errors(design) == []


def test_missing_bush_is_an_error():
    text = (
        (DATA / "frame" / "print_week.toml")
        .read_text()
        .replace('pivot = "bearing"', 'pivot = "bush"')
    )
    (f,) = errors(loads_design(text, "week.toml"), "frame.stock")
    assert f.subject == "arbor crank" and "no bush" in f.message


def test_hand_pillars_are_tapped_at_both_ends():
    design = demo_variant(('process = "mill"', 'process = "hand"'))
    pillar = next(p for p in frame_parts(design) if isinstance(p, PillarPart))
    assert pillar.spigot == 0.0 and pillar.diameter == 8.0
    assert pillar.back_hole == pillar.front_hole == 2.5


def test_worked_example_output_gets_a_cock_beyond_its_wheel():
    design = load_design(DATA / "two_stage.toml")
    plan = plan_frame(design)
    # "output" stands 20 mm from "lay", inside wheel_a (tip radius 25 mm, derived
    # 1 x (48/2 + 1)): it cannot run to the back plate
    assert plan_layout(design).stacking.spans["output"].plates == ("front",)
    (cock,) = plan.cocks
    assert cock.arbor == "output" and cock.plate == "back" and cock.held_by == "front"
    # between wheel_a (2 to 5 mm) and wheel_b (10 to 13 mm), 1 mm clear of each
    assert cock.bar_z0 >= 5.0 + 1.0 and cock.bar_z1 <= 10.0 - 1.0
    arbor = next(
        p for p in plan_parts(design) if isinstance(p, ArborPart) and p.name == "output"
    )
    assert arbor.placement.z == cock.bar_z0  # lengthened down to the cock
    # through the front plate (16 + 2 mm) and on to its hand: derived, the dial 3.5 mm
    # in front of the plate (clear of the M3 screw heads, 3 mm, by 0.5) and 1 mm thick,
    # the hand 1 mm further, 0.8 mm thick, the arbor 0.5 mm proud of it
    assert arbor.placement.z + arbor.length == pytest.approx(
        18.0 + 3.5 + 1 + 1 + 0.8 + 0.5
    )
    assert errors(design) == []


def test_tight_outline_is_refused_saying_where_room_is_lacking():
    design = loads_design(pair("[-17.0, -17.0, 37.0, 17.0]"), "tight.toml")
    (f,) = errors(design, "frame.pillar_room")
    assert "no room for 3 pillars" in f.message
    assert "lacking to the right (wheel wa, wheel wb)" in f.message
    assert "rectangle or polygon larger" in f.advice
    result = analyse(design)
    assert any(x.check == "frame.pillar_room" for x in result.findings)


def test_outline_with_room_at_one_end_names_the_place():
    design = loads_design(pair("[-26.0, -17.0, 37.0, 17.0]"), "tight.toml")
    (f,) = errors(design, "frame.pillar_room")
    assert "room for a pillar only near (-20.0, -11.0)" in f.message


def test_rectangle_with_room_gets_pillars_inside_it():
    design = loads_design(pair("[-30.0, -30.0, 50.0, 30.0]\npillars = 3"), "roomy.toml")
    plan = plan_frame(design)
    assert len(plan.pillars) == 3 and plan.outline_given
    assert errors(design) == []
    for p in plan.pillars:
        # inside, the 5 mm spigot hole 1.2 d = 6 mm from the edge
        assert -30.0 + 6.0 <= p.x <= 50.0 - 6.0 and -30.0 + 6.0 <= p.y <= 30.0 - 6.0


def test_given_pillar_in_a_wheel_is_an_error_naming_it():
    extra = (
        "\n[[pillar]]\nat = [0.0, 30.0]\n\n[[pillar]]\nat = [30.0, 20.0]\n"
        "\n[[pillar]]\nat = [10.0, -12.0]\n"
    )
    design = loads_design(pair(extra=extra), "pair.toml")
    found = errors(design, "frame.pillar_clearance")
    # derived: (10, -12) is 15.6 mm from wa's axis: inside its 16 mm tip circle
    assert [f.subject for f in found] == ["pillar_3 / wheel wa"]
    assert "overlaps it" in found[0].message


def test_pillars_too_close_together_lack_material():
    # derived: two 5 mm spigot holes need 1.1 (5 + 5) = 11 mm between centres
    # (EN 1993-1-8, p1 >= 2.2 d0); 10.5 mm leaves too little between them
    extra = (
        "\n[[pillar]]\nat = [0.0, 30.0]\n\n[[pillar]]\nat = [10.5, 30.0]\n"
        "\n[[pillar]]\nat = [25.0, -25.0]\n"
    )
    design = loads_design(pair(extra=extra), "pair.toml")
    found = errors(design, "frame.material")
    assert {f.subject for f in found} == {
        "back_plate: holes for pillar_1 and pillar_2",
        "front_plate: holes for pillar_1 and pillar_2",
    }
    assert "EN 1993-1-8" in found[0].limit
    spaced = loads_design(
        pair(extra=extra.replace("[10.5, 30.0]", "[11.5, 30.0]")), "p.toml"
    )
    assert errors(spaced, "frame.material") == []


def test_design_without_frame_says_so_and_has_no_frame_parts():
    bare = load_design(DATA / "checks" / "good_pair.toml")
    assert bare.frame is None
    (note,) = frame_findings(bare)
    assert note.check == "frame.none" and note.level == "note"
    assert frame_parts(bare) == ()


def test_frame_part_names_never_clash_with_the_design():
    text = (
        pair()
        .replace('name = "wb"', 'name = "back_plate"')
        .replace('"wb"', '"back_plate"')
    )
    design = loads_design(text, "clash.toml")
    names = [p.name for p in plan_parts(design)]
    assert "back_plate_frame" in names and len(names) == len(set(names))


def test_thin_pillars_are_an_error():
    # derived: a milled M3 pillar's 5 mm spigot with 0.75 mm of shoulder each side
    # needs 6.5 mm
    design = demo_variant(("thickness = 2.0", "thickness = 2.0\npillar_diameter = 6.0"))
    (f,) = errors(design, "frame.pillar_size")
    assert f.limit == ">= 6.500 mm"
    ok = demo_variant(("thickness = 2.0", "thickness = 2.0\npillar_diameter = 6.5"))
    assert errors(ok, "frame.pillar_size") == []


def test_small_train_gets_its_pillars_on_a_larger_plate():
    # two wheels of module 0.25 (tips 2.75 and 5.25 mm): three 10 mm printed pillars
    # could not stand apart on the line round them; the outline grows instead
    text = (DATA / "checks" / "print_fine.toml").read_text()
    design = loads_design(
        text.replace("[drive]", "[frame]\nplates = [-2.0, 10.0]\n\n[drive]", 1),
        "fine.toml",
    )
    plan = plan_frame(design)
    assert len(plan.pillars) == 4
    pts = [(p.x, p.y) for p in plan.pillars]
    for i, a in enumerate(pts):
        for b in pts[i + 1 :]:
            assert math.dist(a, b) >= 10.0 + 1.5  # bodies 1.5 mm apart (print)
    assert errors(design, "frame.pillar_room") == []


# --- the broad phases of the pillar search agree with testing everything ------------


@settings(max_examples=40, deadline=None)
@given(
    zones=st.lists(
        st.tuples(
            st.floats(-60, 60),
            st.floats(-60, 60),
            st.floats(0, 8),
            st.floats(0.5, 30),
            st.one_of(st.none(), st.tuples(st.floats(-60, 60), st.floats(-60, 60))),
        ),
        min_size=1,
        max_size=12,
    ),
    seed=st.integers(0, 2**16),
)
def test_pillar_places_clear_of_zones_as_by_testing_every_zone(zones, seed):
    # derived: a place is clear when its disc keeps the gap from every zone
    # (keepout.disc_gap); only the zones' reach boxes are searched
    from wheelgen.frame.keepout import Zone, disc_gap
    from wheelgen.frame.pillars import _clear

    zs = [
        Zone(
            f"z{i}",
            x,
            y,
            min(inner, outer / 2) if to is None else 0.0,
            outer,
            0,
            1,
            to=to,
        )
        for i, (x, y, inner, outer, to) in enumerate(zones)
    ]
    pts = np.random.default_rng(seed).uniform(-100, 100, (300, 2))
    every = np.ones(len(pts), dtype=bool)
    for z in zs:
        every &= disc_gap(pts[:, 0], pts[:, 1], 3.0, z) >= 2.0 - 1e-9
    assert np.array_equal(_clear(pts[:, 0], pts[:, 1], zs, 3.0, 2.0), every)


@settings(max_examples=40, deadline=None)
@given(
    st.lists(st.tuples(st.floats(-50, 50), st.floats(-50, 50)), min_size=1, max_size=30)
)
def test_a_convex_polygon_holds_every_pivot_when_it_holds_their_hull(pivots):
    # derived: a convex set holds points exactly when it holds their convex hull
    from wheelgen.frame.pillars import _encloses, _outer_pivots

    p = np.array(pivots)
    square = np.array([[[-30, -30], [30, -30], [30, 30], [-30, 30]]], dtype=float)
    assert bool(_encloses(square, _outer_pivots(p))[0]) == bool(_encloses(square, p)[0])
