"""The bill of parts: stock, sizes and volume estimates.

Volumes are checked against plain solid geometry (derived: cylinder pi/4 d^2 L, tube
pi/4 (D^2 - d^2) L) and against bounds every toothed outline must respect (its area lies
between the root circle's and the tip circle's).
"""

from __future__ import annotations

import csv
import io
import math
from pathlib import Path

import pytest

from tests._demo import DEMO
from wheelgen.design import load_design
from wheelgen.display import display_plan
from wheelgen.layout import train_parts
from wheelgen.layout.part_kinds import (
    ArborPart,
    PinBoss,
    PinPart,
    SleevePart,
    WheelPart,
)
from wheelgen.teeth import gear_data
from wheelgen.teeth.spec import ToothSpec
from wheelgen.workshop.parts_bill import (
    PARTS_COLUMNS,
    bill_rows,
    parts_csv,
    parts_sheet_writer,
    wheel_profile_area,
)


class _Tube:
    def __init__(self, outside: float, inside: float) -> None:
        self.outside, self.inside = outside, inside


class _Design:
    """Only what the bill reads from a design: the tubes on hand."""

    def __init__(self, stock: tuple[_Tube, ...] = ()) -> None:
        self.stock = stock


def _wheel(bore: float = 0.0, **kw) -> WheelPart:
    spec = ToothSpec(teeth=40, module=1.0)
    return WheelPart(name="w", tooth=spec, face_width=3.0, bore=bore, **kw)


def test_rod_and_tube_volumes() -> None:
    rows = bill_rows(
        _Design(),
        [
            ArborPart("a", 3.0, 40.0),
            PinPart("p", 1.5, 4.0),
            SleevePart("s", inside=3.0, outside=5.0, length=20.0),
        ],
    )
    a, p, s = rows
    # derived: cylinder and tube volumes
    assert a.volume == pytest.approx(math.pi / 4 * 3.0**2 * 40.0, rel=1e-12)
    assert p.volume == pytest.approx(math.pi / 4 * 1.5**2 * 4.0, rel=1e-12)
    assert s.volume == pytest.approx(math.pi / 4 * (5.0**2 - 3.0**2) * 20.0, rel=1e-12)
    assert (a.stock, a.stock_outside) == ("rod", 3.0)
    assert (s.stock, s.stock_outside, s.stock_inside) == ("tube", 5.0, 3.0)
    assert s.stock_text == "tube 5 x 3 mm"


def test_collar_adds_a_ring_and_sets_the_size() -> None:
    plain = SleevePart("s", inside=3.0, outside=5.0, length=20.0)
    collared = SleevePart("s", 3.0, 5.0, 20.0, collars=((0.0, 1.0, 8.0),))
    (r0,), (r1,) = bill_rows(_Design(), [plain]), bill_rows(_Design(), [collared])
    # derived: the collar is a ring 8 x 5 mm, 1 mm long
    assert r1.volume - r0.volume == pytest.approx(math.pi / 4 * (64 - 25) * 1.0)
    assert r1.diameter == 8.0 and "collars" in r1.note


def test_tube_from_stock_is_named() -> None:
    sleeve = SleevePart("s", inside=3.0, outside=5.0, length=20.0)
    (row,) = bill_rows(_Design((_Tube(5.0, 3.0),)), [sleeve])
    assert "stock list" in row.note


def test_wheel_area_lies_between_root_and_tip_circles() -> None:
    part = _wheel()
    data = gear_data(part.tooth)
    area = wheel_profile_area(part)
    assert (
        math.pi / 4 * data.root_diameter**2 < area < math.pi / 4 * data.tip_diameter**2
    )
    # derived: teeth and spaces share the band between root and tip about equally, so
    # the area is near the circle of the mean of root and tip radii
    mean_r = (data.root_diameter + data.tip_diameter) / 4
    assert area == pytest.approx(math.pi * mean_r**2, rel=0.02)


def test_bore_spokes_and_pin_boss_change_the_volume() -> None:
    solid, bored = _wheel(), _wheel(bore=4.0)
    (v0,), (v1,) = (bill_rows(_Design(), [p]) for p in (solid, bored))
    # derived: the bore removes pi/4 d^2 times the face width
    assert v0.volume - v1.volume == pytest.approx(math.pi / 4 * 16 * 3.0, rel=1e-3)
    (spoked,) = bill_rows(_Design(), [_wheel(bore=4.0, spokes=4, rim=3.0)])
    assert spoked.volume < 0.8 * v1.volume and "4 spokes" in spoked.note
    boss = PinBoss(radius=8.0, diameter=1.5, length=3.0)
    (pinned,) = bill_rows(_Design(), [_wheel(bore=4.0, pin=boss)])
    assert pinned.volume - v1.volume == pytest.approx(math.pi / 4 * 1.5**2 * 3.0)
    assert pinned.length == pytest.approx(6.0)


def test_demo_bill_and_csv(tmp_path: Path) -> None:
    design = load_design(DEMO)
    # the made parts, one row each (bought screws of one size share a row)
    parts = train_parts(design) + display_plan(design).parts()
    paths = parts_sheet_writer(design, parts, [], tmp_path)
    assert paths == [tmp_path / "parts.csv"]
    text = paths[0].read_text(encoding="utf-8")
    assert text == parts_csv(bill_rows(design, parts))
    table = list(csv.DictReader(io.StringIO(text)))
    assert tuple(table[0].keys()) == PARTS_COLUMNS
    assert [t["part"] for t in table] == [p.name for p in parts]
    for t, part in zip(table, parts):
        assert int(t["quantity"]) >= 1
        assert float(t["volume_mm3"]) > 0
        if isinstance(part, WheelPart):
            assert t["stock"] == "sheet"
            assert float(t["sheet_thickness_mm"]) == pytest.approx(part.face_width)
            tip = gear_data(part.tooth).tip_diameter
            assert float(t["overall_diameter_mm"]) == pytest.approx(tip, abs=5e-4)
        elif isinstance(part, SleevePart):
            assert t["stock"] == "tube"
            assert float(t["stock_inside_mm"]) == pytest.approx(part.inside, abs=5e-4)
        elif part.kind in ("hand", "dial"):
            assert t["stock"] == "sheet"
            assert float(t["sheet_thickness_mm"]) == pytest.approx(part.thickness)
        else:
            assert t["stock"] == "rod"
            assert float(t["stock_outside_mm"]) == pytest.approx(
                part.diameter, abs=5e-4
            )
