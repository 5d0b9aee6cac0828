"""The cutting sheet against published gear measurements and the gear data sheet.

Sources (sections of docs/references.md in brackets):
- MH-PINS: Machinery's Handbook, "Checking Gear Size by Measurement over Wires or
  Pins", as reproduced at ashokagears.net/gear-size.html (5): 32 teeth, 20 deg,
  pins 1.728/P, 34.4130 at 1 DP = m 1 in mm.
- SPAN: W_k = m cos a [pi (k - 0.5) + z inv a] + 2 x m sin a, tandwiel.info
  "Measurement over multiple teeth" (4); values for m = 1 are derived from it and
  match the handbook tables as remembered (from memory).
- SDP-SPAN: Elements of Metric Gear Technology (SDP/SI D785) section 10.2 and KHK's Gear
  Technical Reference, span table, m 3, z 24, x +0.4: k = 4, W = 32.8266 (4; from
  memory, the formula gives the same).
- ROSE: Modern Machine Shop Practice (1887), table of involute form cutters (11).
- ARMY: ordnance manual OD 16448, dividing-head chapter, armyordnance.tpub.com/od16448/
  od164480030.htm (12): 42 divisions = 40 spaces on the 42 circle or 20 on the 21.
- ISO 21771:2007 tip diameter d_a = m z + 2 m (h_a + x); ISO 53:1998 type A full depth
  2.25 m (8; both from memory).
"""

from __future__ import annotations

import csv
import io
from fractions import Fraction
from pathlib import Path

import pytest

from tests._demo import DEMO
from wheelgen.design import load_design
from wheelgen.layout.part_kinds import ArborPart, WheelPart
from wheelgen.parts import plan_parts
from wheelgen.teeth import gear_data
from wheelgen.teeth.spec import ToothSpec
from wheelgen.workshop.cutting import (
    CUTTING_COLUMNS,
    cutting_csv,
    cutting_rows,
    cutting_sheet_writer,
    indexing_text,
)


def _wheel(teeth: int, module: float = 1.0, shift: float = 0.0, **kw) -> WheelPart:
    spec = ToothSpec(teeth=teeth, module=module, shift=shift, **kw)
    return WheelPart(name=f"w{teeth}", tooth=spec, face_width=3.0, bore=3.0)


def test_over_pins_matches_machinerys_handbook() -> None:
    (row,) = cutting_rows([_wheel(32)])
    assert row.pin_diameter == pytest.approx(1.728, abs=1e-9), "MH-PINS: 1.728/P"
    # MH-PINS prints 4 decimals (34.4130 at 1 DP)
    assert row.over_pins == pytest.approx(34.4130, abs=5e-5), "MH-PINS"


@pytest.mark.parametrize(
    ("teeth", "k", "published", "source"),
    [
        (12, 2, 4.5963, "SPAN table, m 1, 20 deg"),
        (20, 3, 7.6604, "SPAN table, m 1, 20 deg"),
        (30, 4, 10.7526, "SPAN table, m 1, 20 deg"),
    ],
)
def test_span_matches_table(teeth: int, k: int, published: float, source: str) -> None:
    (row,) = cutting_rows([_wheel(teeth)])
    assert row.span_teeth == k, source
    assert row.span_width == pytest.approx(published, abs=5e-5), source


def test_span_of_shifted_wheel_matches_worked_example() -> None:
    (row,) = cutting_rows([_wheel(24, module=3.0, shift=0.4)])
    assert row.span_teeth == 4, "SDP-SPAN"
    assert row.span_width == pytest.approx(32.8266, abs=5e-5), "SDP-SPAN"


def test_blank_and_depth_of_unshifted_wheel() -> None:
    (row,) = cutting_rows([_wheel(40, module=1.5)])
    # ISO 21771: d_a = m (z + 2) = 63 mm; ISO 53 type A: h = 2.25 m = 3.375 mm
    assert row.blank_diameter == pytest.approx(63.0, abs=1e-6)
    assert row.full_depth == pytest.approx(3.375, abs=1e-6)


@pytest.mark.parametrize(
    ("teeth", "number"),
    [(12, 8), (13, 8), (16, 7), (25, 5), (34, 4), (54, 3), (134, 2), (135, 1)],
)
def test_form_cutter_numbers(teeth: int, number: int) -> None:
    (row,) = cutting_rows([_wheel(teeth)])
    assert row.cutter_number == number, "ROSE cutter ranges"


def test_triangular_wheel_has_no_involute_items() -> None:
    (row,) = cutting_rows([_wheel(40, form="triangular")])
    assert row.cutter_number is None and row.cutter_range is None
    assert row.span_width is None
    # checked over pins on its straight flanks instead (tests/test_workshop_cutter.py)
    assert row.cutter is not None and row.over_pins == row.cutter.over_pins
    assert row.blank_diameter > 40.0  # tip above the reference circle m z


def test_indexing_of_42_matches_the_manual() -> None:
    (row,) = cutting_rows([_wheel(42)])
    plan = row.indexing
    assert plan.method == "simple"
    # ARMY: 20/21 turn per division
    assert Fraction(plan.holes, plan.circle) == Fraction(20, 21)
    assert indexing_text(plan).startswith("simple ")


def test_other_parts_are_skipped() -> None:
    rows = cutting_rows([ArborPart("a", 3.0, 40.0), _wheel(20)])
    assert [r.wheel for r in rows] == ["w20"]


def test_demo_sheet_equals_gear_data_sheet() -> None:
    # derived: the cutting sheet must print the gear data sheet's own numbers
    design = load_design(DEMO)
    parts = plan_parts(design)
    wheels = [p for p in parts if isinstance(p, WheelPart)]
    rows = cutting_rows(parts)
    assert [r.wheel for r in rows] == [w.name for w in wheels]
    for part, row in zip(wheels, rows):
        data = gear_data(part.tooth)
        assert row.span_teeth == data.span_teeth, part.name
        assert row.span_width == data.span_width, part.name
        if part.tooth.form == "involute":
            assert row.pin_diameter == data.pin_diameter, part.name
            assert row.over_pins == data.over_pins, part.name
        assert row.blank_diameter == data.blank_diameter, part.name
        assert row.full_depth == pytest.approx(data.depth_of_cut, abs=1e-9), part.name


def test_csv_round_trip(tmp_path: Path) -> None:
    design = load_design(DEMO)
    parts = plan_parts(design)
    paths = cutting_sheet_writer(design, parts, [], tmp_path)
    assert paths[0] == tmp_path / "cutting.csv"
    text = paths[0].read_text(encoding="utf-8")
    assert text == cutting_csv(cutting_rows(parts))
    table = list(csv.DictReader(io.StringIO(text)))
    assert tuple(table[0].keys()) == CUTTING_COLUMNS
    rows = {r.wheel: r for r in cutting_rows(parts)}
    assert set(rows) == {t["wheel"] for t in table}
    for t in table:
        r = rows[t["wheel"]]
        assert int(t["teeth"]) == r.teeth
        if r.over_pins is None:
            assert t["over_pins_mm"] == "" and t["span_width_mm"] == ""
        else:
            # the CSV prints 4 decimals
            assert float(t["over_pins_mm"]) == pytest.approx(r.over_pins, abs=5e-5)
            if r.span_width is not None:
                assert float(t["span_width_mm"]) == pytest.approx(
                    r.span_width, abs=5e-5
                )
                assert int(t["span_teeth_k"]) == r.span_teeth


def test_cutter_notes_for_small_and_shifted_wheels() -> None:
    # ROSE (docs/references.md section 11): the 8-cutter set starts at 12 teeth (No. 8)
    (small,) = cutting_rows([_wheel(11, shift=0.4)])
    assert small.cutter_number is None
    assert any("no cutter of the 8-cutter set" in w for w in small.warnings)
    assert any("profile shift x = +0.4" in w for w in small.warnings)
    (plain,) = cutting_rows([_wheel(40)])
    assert not any("cutter" in w or "shift" in w for w in plain.warnings)
    sheet = list(csv.DictReader(io.StringIO(cutting_csv([small, plain]))))
    assert "no cutter" in sheet[0]["notes"] and sheet[1]["notes"] == ""
    assert list(sheet[0]) == list(CUTTING_COLUMNS)
