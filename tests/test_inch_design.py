"""A design written entirely in inches: it checks, builds, and gives the very parts of
the same design written in millimetres, with its sheets and DXF files in inches.

tests/data/inch_motion_work.toml is written in inches with 32 diametral pitch wheels;
tests/data/inch_motion_work_mm.toml is the same design written by hand in millimetres
(each length its inch size times 25.4, derived, and the 32 DP wheels as module 0.79375
mm with the fine-pitch proportions written out). Check values:

- [Mott] R. L. Mott, *Machine Elements in Mechanical Design*, 4th ed., Table 8-4:
  fine pitch (P >= 20) addendum 1/P, dedendum 1.200/P + 0.002 in;
- [PIC] PIC Design, "Spur Gear Data" table: whole depth 0.0708 in at 32 DP;
- [ISO 286] ISO 286-2:2010, Table 2 (IT7 over 3 to 6 mm: 12 um) and Table 17 (g
  over 3 to 6 mm: upper -4 um), the fit the stock tube is chosen with;
- the DXF reference (Autodesk, "DXF Reference", HEADER section group codes):
  $INSUNITS 1 is inches, 4 millimetres.
"""

from __future__ import annotations

import csv
import dataclasses
import io
from pathlib import Path

import pytest

from wheelgen.checks import analyse
from wheelgen.design import load_design, loads_design
from wheelgen.design.errors import DesignError
from wheelgen.findings import has_errors
from wheelgen.parts import plan_parts
from wheelgen.workshop.cutting import cutting_csv, cutting_rows
from wheelgen.workshop.drilling import drilling_csv
from wheelgen.workshop.parts_bill import bill_rows, parts_csv

DATA = Path(__file__).parent / "data"
INCH_FILE = DATA / "inch_motion_work.toml"
MM_FILE = DATA / "inch_motion_work_mm.toml"
INCH = 25.4


@pytest.fixture(scope="module")
def inch():
    return load_design(INCH_FILE)


@pytest.fixture(scope="module")
def mm():
    return load_design(MM_FILE)


def _rows(text: str) -> list[dict[str, str]]:
    return list(csv.DictReader(io.StringIO(text)))


def test_the_inch_file_reads_as_its_millimetre_twin(inch, mm):
    assert inch.units == "in" and mm.units == "mm"
    assert inch.arbors == mm.arbors
    assert inch.frame == mm.frame
    assert inch.stock == mm.stock
    assert inch.process == mm.process
    for a, b in zip(inch.wheels, mm.wheels, strict=True):
        assert a.diametral_pitch == 32 and b.diametral_pitch is None
        # the DP wheel is the module wheel of 25.4 / 32 with the fine-pitch rack
        assert dataclasses.replace(a, diametral_pitch=None) == b
    wheel = inch.wheel("cannon_pinion")
    assert wheel.module == 0.79375  # derived: 25.4 / 32
    assert wheel.dedendum == pytest.approx(1.2 + 0.002 * 32)  # [Mott], x 1/P
    assert wheel.face_width == 3.175  # "1/8 in", derived: 25.4 / 8


def test_both_check_clean_and_alike(inch, mm):
    a, b = analyse(inch), analyse(mm)
    assert not has_errors(a.findings) and not has_errors(b.findings)
    assert [(f.level, f.check, f.subject) for f in a.findings] == [
        (f.level, f.check, f.subject) for f in b.findings
    ]


def test_the_cutting_sheet_is_in_inches(inch, mm):
    rows = {
        r["wheel"]: r
        for r in _rows(cutting_csv(cutting_rows(plan_parts(inch)), _u(inch)))
    }
    assert "blank_diameter_in" in rows["cannon_pinion"]
    assert "module_mm" not in rows["cannon_pinion"]
    pinion = rows["cannon_pinion"]
    assert pinion["diametral_pitch"] == "32"
    assert pinion["blank_diameter_in"] == "0.6875"  # derived: (20 + 2) / 32
    assert pinion["full_depth_in"] == "0.0708"  # [PIC] 32 DP
    assert pinion["face_width_in"] == "0.125"
    # derived: (64 + 2 - 2 x 0.2) / 32 = 2.05 in, the shift taken off the tip
    assert rows["hour_wheel"]["blank_diameter_in"] == "2.0500"
    # the same wheels in millimetres
    metric = {r["wheel"]: r for r in _rows(cutting_csv(cutting_rows(plan_parts(mm))))}
    # derived: 0.6875 x 25.4 = 17.4625 mm, to the sheet's 0.001 mm
    assert float(metric["cannon_pinion"]["blank_diameter_mm"]) == pytest.approx(
        17.4625, abs=5e-4
    )
    for name, row in rows.items():
        assert float(row["over_pins_in"]) * INCH == pytest.approx(
            float(metric[name]["over_pins_mm"]), abs=0.5e-4 * INCH
        )


def test_the_parts_sheet_gives_inch_stock_with_fractions(inch):
    rows = {
        r["part"]: r
        for r in _rows(parts_csv(bill_rows(inch, plan_parts(inch)), _u(inch)))
    }
    # the arbors are turned with a shoulder from bar bought in 32nds of an inch
    # (derived: the 1/8 in centre's 0.189 in shoulder plus 0.5 mm turning allowance
    # is 0.2087 in, next 32nd up 7/32; the 3/32 in lay's 0.1417 in shoulder: 3/16)
    assert rows["centre"]["stock_size"] == "rod 0.2188 in (7/32)"
    assert rows["centre"]["stock_outside_in"] == "0.2188"
    assert "shoulders up to 0.189 in" in rows["centre"]["note"]
    assert rows["lay"]["stock_size"] == "rod 0.1875 in (3/16)"
    assert rows["back_plate"]["stock_size"] == "sheet 0.0938 in (3/32)"
    # the stock tube of the list, 3/16 x 0.1252 in, runs on the 1/8 in centre arbor
    assert rows["hour"]["stock_size"] == "tube 0.1875 in (3/16) x 0.1252 in"
    assert "bush 5/32 x 0.094 x 3/32 in" in rows
    # a bore on fractional rod names the rod as the trade does; its limits to 0.0001 in
    assert rows["cannon_pinion"]["note"] == "bore H7/g6 on 1/8 in: 0.1250 to 0.1255 in"


def test_the_stock_tube_is_chosen_with_the_iso_286_fit(inch):
    # [ISO 286] H7 on 3.175 mm (over 3 to 6): 3.175 to 3.187 mm; g6 shaft up to
    # 3.171 mm. The tube's bore of 0.1252 in = 3.18008 mm lies in the hole zone.
    sleeve = next(p for p in plan_parts(inch) if p.name == "hour")
    assert sleeve.inside == pytest.approx(0.1252 * INCH, abs=1e-9)
    assert 3.175 <= sleeve.inside <= 3.175 + 0.012
    assert sleeve.outside == pytest.approx(0.1875 * INCH, abs=1e-9)
    (note,) = [f for f in analyse(inch).findings if f.check == "layout.stock"]
    assert "(3/16 x 0.1252 in; bore on 3.175 mm, H7/g6)" in note.message


def test_the_drilling_chart_is_in_inches(inch):
    rows = _rows(drilling_csv(inch, "back"))
    assert set(rows[0]) >= {"x_in", "y_in", "diameter_in", "low_in", "high_in"}
    lay = next(r for r in rows if r["member"] == "lay")
    # derived: the centre distance (20 + 60) / (2 x 32) = 1.25 in on the x axis
    assert lay["x_in"] == "1.2500" and lay["y_in"] == "0.0000"
    assert lay["diameter_in"] == "0.1563"  # the 5/32 in bush's seat


def _u(design):
    from wheelgen.design.units import lengths_of

    return lengths_of(design)


def _text(**change: str) -> str:
    text = INCH_FILE.read_text(encoding="utf-8")
    for old, new in change.items():
        assert old in text
        text = text.replace(old, new)
    return text


def test_a_module_wheel_meshing_a_dp_wheel_is_refused():
    text = _text(**{"teeth = 60\n": "teeth = 60\nmodule = 0.8\n"})
    with pytest.raises(DesignError) as err:
        loads_design(text, "mixed.toml")
    message = str(err.value)
    assert 'wheel "cannon_pinion" (32 diametral pitch)' in message
    assert 'wheel "minute_wheel" (module 0.8 mm)' in message
    assert "key 'pair'" in message


def test_module_and_diametral_pitch_together_are_refused():
    text = _text(**{"diametral_pitch = 32\n": "diametral_pitch = 32\nmodule = 1\n"})
    with pytest.raises(DesignError, match="both 'module' and 'diametral_pitch'"):
        loads_design(text, "both.toml")
    text = _text(**{"teeth = 60\n": "teeth = 60\nmodule = 0.8\ndiametral_pitch = 32\n"})
    with pytest.raises(DesignError, match="both 'module' and 'diametral_pitch'"):
        loads_design(text, "both.toml")


@pytest.mark.parametrize(
    ("old", "new", "words"),
    [
        ('face_width = "1/8 in"', 'face_width = "1/8 ft"', "unknown unit 'ft'"),
        ('face_width = "1/8 in"', 'face_width = "100 in"', "2540 mm"),
        ('height = "3/8 in"', 'height = "3/8"', "not a number and a unit"),
        ('units = "in"', 'units = "cm"', "'units'"),
        ('plates = ["0 in", "1 in"]', 'plates = ["0 in", "1 ft"]', "'plates'"),
    ],
)
def test_lengths_that_cannot_be_read_name_their_place(old, new, words):
    with pytest.raises(DesignError) as err:
        loads_design(_text(**{old: new}), "bad.toml")
    message = str(err.value)
    assert words in message
    assert "bad.toml, line" in message


# -- the build --------------------------------------------------------------------


def _build(design, out: Path) -> Path:
    from wheelgen.export.build import BuildOptions, build_design

    build_design(design, out, BuildOptions(use_cache=False))
    return out


@pytest.fixture(scope="module")
def builds(inch, mm, tmp_path_factory):
    pytest.importorskip("cadquery")
    root = tmp_path_factory.mktemp("inch")
    return _build(inch, root / "in"), _build(mm, root / "mm")


@pytest.mark.cad
def test_the_parts_are_the_same_whatever_the_units(builds):
    inch, mm = builds
    for kind in ("step", "stl", "3mf"):
        names = sorted(p.name for p in (inch / kind).iterdir())
        assert names == sorted(p.name for p in (mm / kind).iterdir())
        assert names
        for name in names:
            # the same solids to the byte: the lengths are the same floats (the
            # assembly names the design after its file)
            a = (inch / kind / name).read_bytes()
            b = (mm / kind / name).read_bytes().replace(b"work_mm", b"work")
            assert a == b, f"{kind}/{name}"


@pytest.mark.cad
def test_dxf_files_are_in_inches_at_true_size(builds):
    import ezdxf

    inch, mm = builds
    names = sorted(p.name for p in (inch / "dxf").iterdir())
    assert names and names == sorted(p.name for p in (mm / "dxf").iterdir())
    for name in names:
        a, b = ezdxf.readfile(inch / "dxf" / name), ezdxf.readfile(mm / "dxf" / name)
        assert a.header["$INSUNITS"] == 1  # the DXF reference: inches
        assert b.header["$INSUNITS"] == 4  # millimetres
        ea, eb = list(a.modelspace()), list(b.modelspace())
        assert [e.dxftype() for e in ea] == [e.dxftype() for e in eb]
        for x, y in zip(ea, eb, strict=True):
            assert x.dxf.layer == y.dxf.layer
            for pa, pb in zip(_points(x), _points(y), strict=True):
                assert pa * INCH == pytest.approx(pb, abs=1e-9), f"{name}: {x}"


def _points(e) -> list[float]:
    """The numbers that place an entity, in its drawing's units."""
    kind = e.dxftype()
    if kind == "LINE":
        return [*e.dxf.start, *e.dxf.end]
    if kind in ("CIRCLE", "ARC"):
        return [*e.dxf.center, e.dxf.radius]
    if kind == "SPLINE":
        return [c for p in e.control_points for c in p]
    if kind == "LWPOLYLINE":
        return [c for p in e.get_points("xy") for c in p]
    if kind in ("TEXT", "MTEXT"):
        return [*e.dxf.insert, e.dxf.get("height", 0.0)]
    raise AssertionError(f"unexpected {kind}")


@pytest.mark.cad
def test_svg_templates_stay_true_size_and_say_inches(builds):
    import re

    inch, mm = builds
    for name in sorted(p.name for p in (inch / "svg").iterdir()):
        a = (inch / "svg" / name).read_text(encoding="utf-8")
        b = (mm / "svg" / name).read_text(encoding="utf-8")
        outline = re.compile(r'<g id="outline".*?</g>', re.S)
        # the same outline at the same scale (the page is in mm either way)
        assert outline.search(a).group(0) == outline.search(b).group(0), name
    wheel = (inch / "svg" / "hour_wheel.svg").read_text(encoding="utf-8")
    assert "32 diametral pitch" in wheel
    assert "d = 2 in" in wheel  # derived: 64 / 32
    assert ">2 in</text>" in wheel  # the check bar
    plate = (inch / "svg" / "back_plate.svg").read_text(encoding="utf-8")
    assert "0.0938 in (3/32) sheet" in plate


@pytest.mark.cad
def test_the_build_sheets_are_in_inches(builds):
    inch, mm = builds
    header = (inch / "cutting.csv").read_text(encoding="utf-8").splitlines()[0]
    assert "blank_diameter_in" in header and "_mm" not in header
    header = (inch / "parts.csv").read_text(encoding="utf-8").splitlines()[0]
    assert "stock_size" in header and "_mm" not in header
    assert "_mm" not in (inch / "drilling" / "back.csv").read_text().splitlines()[0]
    assert "blank_diameter_mm" in (mm / "cutting.csv").read_text().splitlines()[0]


@pytest.mark.cad
def test_build_units_option_writes_a_millimetre_design_in_inches(tmp_path):
    import ezdxf
    from click.testing import CliRunner

    from wheelgen.cli import main

    pytest.importorskip("cadquery")
    out = tmp_path / "out"
    result = CliRunner().invoke(
        main,
        ["build", str(MM_FILE), "--units", "in", "--formats", "dxf", "-o", str(out)],
    )
    assert result.exit_code == 0, result.output
    header = (out / "cutting.csv").read_text(encoding="utf-8").splitlines()[0]
    assert "blank_diameter_in" in header
    assert ezdxf.readfile(out / "dxf" / "hour_wheel.dxf").header["$INSUNITS"] == 1
