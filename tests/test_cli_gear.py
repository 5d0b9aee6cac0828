"""``wheelgen gear``: the data sheet, the JSON object, the SVG and exit codes.

Check values (docs/references.md): section 4 (W_k for z = 20, m = 1: 7.6604, derived
with the ISO 21771 formula, as the handbook tables print it), section 5 (34.4130 over
1.728 pins for 32 teeth, Machinery's Handbook's example as reproduced at
ashokagears.net), section 7 (KHK / SDP D785 shifted pair: a = 56.4999, a_w = 26.0886
deg, from memory) and section 11 (form cutters, Modern Machine Shop Practice, 1887).
"""

from __future__ import annotations

import json
import re

import pytest
from click.testing import CliRunner

from wheelgen.cli import main


def _run(*args: str):
    return CliRunner().invoke(main, ["gear", *args])


def test_sheet_text():
    result = _run("--teeth", "20", "--module", "1")
    assert result.exit_code == 0, result.output
    text = result.output
    assert "pitch diameter        20.0000 mm" in text
    assert "span over 3 teeth     7.6604 mm" in text  # section 4
    assert "form cutter           No. 6" in text  # section 11: 17-20 teeth
    assert "free of undercut" in text


def test_json_keys_and_values():
    result = _run("--teeth", "32", "--module", "1", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    for key in (
        "pitch_diameter", "base_diameter", "tip_diameter", "root_diameter",
        "span_teeth",
        "span_width", "over_pins", "pin_diameter", "cutter_number",
    ):  # fmt: skip
        assert key in data
    assert data["over_pins"] == pytest.approx(34.4130, abs=5e-5)  # section 5
    assert data["pin_diameter"] == pytest.approx(1.728)
    assert data["cutter_number"] == 4


def test_mate_adds_the_mesh():
    args = [
        "-z",
        "12",
        "-m",
        "3",
        "--shift",
        "0.6",
        "--mate",
        "24",
        "--mate-shift",
        "0.36",
    ]
    result = _run(*args, "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert data["centre_distance"] == pytest.approx(56.4999, abs=5e-5)  # section 6
    assert data["working_pressure_angle"] == pytest.approx(26.0886, abs=5e-5)
    assert 1.0 < data["contact_ratio"] < 2.0
    assert data["mate"]["teeth"] == 24
    text = _run(*args).output
    assert "mesh:" in text and "working pressure angle 26.0886 deg" in text
    assert "centre distance       56.4999 mm" in text


def test_backlash_is_split_between_the_wheels():
    result = _run("-z", "30", "-m", "1", "--mate", "45", "--backlash", "0.1", "--json")
    data = json.loads(result.output)
    # derived: each wheel thinned by 0.05 mm -> 0.1 mm at the standard distance
    assert data["backlash"] == pytest.approx(0.1, abs=1e-9)
    assert data["pitch_thickness"] == pytest.approx(3.14159265 / 2 - 0.05, abs=1e-6)


def test_svg_file_written(tmp_path):
    target = tmp_path / "wheel.svg"
    result = _run("-z", "15", "-m", "2", "--svg", str(target))
    assert result.exit_code == 0, result.output
    text = target.read_text()
    assert re.search(r'width="[\d.]+mm"', text)
    assert '<circle id="base"' in text and '<path id="outline"' in text
    assert str(target) in result.output


def test_triangular_form():
    result = _run("-z", "40", "-m", "1", "--form", "triangular", "--tooth-angle", "50",
                  "--root-radius", "0.05", "--addendum", "1.0", "--dedendum", "1.25",
                  "--json")  # fmt: skip
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert data["form"] == "triangular"
    # involute-only quantities are not there at all (the triangular sheet has its own)
    assert "span_width" not in data and "base_diameter" not in data
    # derived: tip and root circles m z / 2 +- addendum / dedendum x m
    assert data["tip_diameter"] == pytest.approx(42.0)
    assert data["root_diameter"] == pytest.approx(37.5)


def test_undercut_and_pointed_warnings_in_text():
    result = _run("-z", "8", "-m", "1", "--shift", "1.0")
    assert result.exit_code == 0
    assert "POINTED" in result.output and "warning: pointed teeth" in result.output
    assert "THIS WHEEL IS UNDERCUT" in _run("-z", "10", "-m", "1").output


@pytest.mark.parametrize(
    ("args", "message"),
    [
        (["-z", "2", "-m", "1"], "allowed: a whole number from 3 to 2000"),
        (["-z", "20", "-m", "-1"], "allowed: a number from 0.05 to 50 mm"),
        (["-z", "20", "-m", "nan"], "allowed: a number from 0.05 to 50 mm"),
        (["-z", "20", "-m", "1", "--pin", "nan"], "'--pin': nan is out of range"),
        (["-z", "20", "-m", "1", "--pin", "1e999999"], "1e999999 is out of range"),
        (["-z", "20", "-m", "1", "--backlash", "inf"], "from 0 to 10 mm"),
        (["-z", "1" + "0" * 5000, "-m", "1"], "too long to be a number"),
        (["-z", "4", "-m", "1", "--shift", "-0.5"], "cuts through the root"),
        (["-z", "20", "-m", "1", "--centre-distance", "30"], "needs '--mate'"),
        (
            ["-z", "20", "-m", "1", "--mate", "20", "--centre-distance", "5"],
            "'--centre-distance' must be more than",
        ),
    ],
)
def test_unusable_input_exits_2_without_traceback(args, message):
    result = _run(*args)
    assert result.exit_code == 2
    assert message in result.stderr
    assert "Traceback" not in result.output + result.stderr
