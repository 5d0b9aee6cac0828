"""Coaxial nested sleeves: sizes from the ISO 286 fit, stacking, hidden seats, stock."""

import itertools
import math
from pathlib import Path

import pytest

from wheelgen.checks.layout_checks import layout_findings
from wheelgen.design.loader import loads_design
from wheelgen.layout.part_kinds import ArborPart, SleevePart
from wheelgen.layout.train_layout import plan_layout
from wheelgen.parts import plan_parts

DATA = Path(__file__).parent / "data" / "layout"


def nested(w2_height: float = 24.0, extra: str = "") -> object:
    text = (DATA / "nested.toml").read_text().replace("W2_HEIGHT", repr(w2_height))
    return loads_design(text + extra, "nested.toml")


# Each tube runs on the member inside it: bore limits = nominal + H7 and the member
# inside is made to g6 (ISO 286-2, docs/references.md section 9: <=3: H7 +10/0,
# g6 -2/-8; 3-6: H7 +12/0, g6 -4/-12). Outside: derived, (bore max + 2 x 0.3 mm wall)
# rounded up to 0.1 mm: 3.010 + 0.6 -> 3.7; 3.712 + 0.6 -> 4.4; 4.412 + 0.6 -> 5.1.
TUBES = [
    ("t1", 3.0, (3.000, 3.010), (2.992, 2.998), 3.7),
    ("t2", 3.7, (3.700, 3.712), (3.688, 3.696), 4.4),
    ("t3", 4.4, (4.400, 4.412), (4.388, 4.396), 5.1),
]


@pytest.mark.parametrize(("name", "shaft", "hole", "shaft_limits", "outside"), TUBES)
def test_four_deep_group_sizes_each_tube_by_the_fit(
    name, shaft, hole, shaft_limits, outside
):
    size = plan_layout(nested()).sizes[name]
    assert size.bore.shaft == pytest.approx(shaft)
    assert (size.bore.low, size.bore.high) == pytest.approx(hole, abs=1e-9)
    assert (size.bore.shaft_low, size.bore.shaft_high) == pytest.approx(
        shaft_limits, abs=1e-9
    )
    assert hole[0] <= size.inside <= hole[1]
    assert size.outside == pytest.approx(outside)
    assert size.wall >= 0.3


def test_inner_tubes_are_longer_and_every_seat_is_exposed():
    layout = plan_layout(nested())
    spans = layout.stacking.spans
    order = ["main", "t1", "t2", "t3"]
    for inner, outer in itertools.pairwise(order):
        assert spans[inner].z0 <= spans[outer].z0 and spans[outer].z1 <= spans[inner].z1
        for seat in spans[inner].seats:
            assert seat.z1 <= spans[outer].z0 or seat.z0 >= spans[outer].z1
    assert layout.stacking.hidden == ()
    # a collar behind each outer tube's back end, as wide as that tube (1 mm long)
    assert spans["t2"].collars == ((17.0, 18.0, 5.1),)
    assert spans["t1"].collars == ((16.0, 17.0, 4.4),)


def test_hidden_seat_is_an_error_naming_wheel_and_tube():
    design = nested(w2_height=19.0)  # w2 (19..22) would sit under t3 (18..21)
    findings = [
        f for f in layout_findings(design, None) if f.check == "layout.hidden_seat"
    ]
    assert findings and findings[0].level == "error"
    assert '"w2"' in findings[0].message and '"t3"' in findings[0].message


def test_parts_carry_seats_and_placements():
    parts = {p.name: p for p in plan_parts(nested())}
    t2 = parts["t2"]
    assert isinstance(t2, SleevePart)
    assert t2.placement.z == pytest.approx(17.0)
    assert t2.seats == ((7.0, 10.0, "round"),)  # w2 at 24..27, relative to 17
    # derived: plate to plate is -2..42 mm; the drive's default knob stands at the dials'
    # level, 3.5 mm in front of the front plate (clear of the M3 screw heads, 3 mm, by
    # 0.5), and 1 mm (the hand gap) further, 8 mm long, so the shaft runs on to 54.5
    assert isinstance(parts["main"], ArborPart) and parts[
        "main"
    ].length == pytest.approx(56.5)
    bare = {p.name: p for p in plan_parts(nested(extra='\n[input]\nkind = "none"\n'))}
    assert bare["main"].length == pytest.approx(44.0)  # derived: -2..42 mm
    # fixed on the outside of its 5.1 mm tube, the bore opened by the H7/g6 running
    # fit as docs/format.md says: H7 over 3 up to 6 mm is 0 to +12 um (ISO 286-1:2010,
    # Table 1, IT7 = 12 um; EI = 0 for H), modelled in the middle of its zone
    assert parts["w3"].bore == pytest.approx(5.106)
    assert parts["w3"].bore_fit == "H7/g6 on 5.1 mm: 5.100 to 5.112 mm"


def test_stock_tube_is_chosen_and_reported():
    stock = "\n[[stock]]\noutside = 4.0\ninside = 3.0\n\n[[stock]]\noutside = 6.0\ninside = 3.0\n"
    design = nested(extra=stock)
    size = plan_layout(design).sizes["t1"]
    assert (size.outside, size.inside) == (4.0, 3.0)  # the smallest that fits
    notes = [f for f in layout_findings(design, None) if f.check == "layout.stock"]
    assert any("4 x 3 mm" in f.message for f in notes)
    # t2 would run on 4.0: nothing on hand has a bore within 4.000..4.012
    assert plan_layout(design).sizes["t2"].stock is None
    assert any(
        f.subject == "sleeve t2" and "no stock tube fits" in f.message for f in notes
    )


def test_printed_tubes_use_the_radial_clearance_and_two_nozzle_walls():
    text = (DATA / "nested.toml").read_text().replace("W2_HEIGHT", "24.0")
    text = text.replace(
        'process = "mill"\n\n[process]\nfit = "H7/g6"',
        'process = "print"\n\n[process]\nclearance = 0.2\nnozzle = 0.4',
    )
    design = loads_design(text, "p.toml")
    size = plan_layout(design).sizes["t1"]
    # derived: radial clearance 0.2 -> bore 3.0 + 2 x 0.2; wall 2 x 0.4 nozzle -> 3.4 + 1.6
    assert size.inside == pytest.approx(3.4)
    assert size.outside == pytest.approx(5.0)


def test_square_seat_keeps_the_wall_across_its_flats():
    text = (DATA / "nested.toml").read_text().replace("W2_HEIGHT", "24.0")
    text = text.replace(
        'arbor = "t1"\nteeth = 20\n', 'arbor = "t1"\nteeth = 20\nseat = "square"\n'
    )
    size = plan_layout(loads_design(text, "sq.toml")).sizes["t1"]
    # derived: flats = outside cos 45 deg must leave 0.3 mm on a 3.010 mm bore
    assert size.outside == pytest.approx(
        math.ceil((3.010 + 0.6) / math.cos(math.pi / 4) * 10) / 10
    )
    assert size.wall >= 0.3
