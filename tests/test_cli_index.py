"""``wheelgen index``: exit codes, machinist's text and the JSON object.

Check values as in tests/test_indexing.py (sources: docs/references.md section 12):
- ARMY: ordnance manual OD 16448, dividing-head chapter,
  armyordnance.tpub.com/od16448/od164480030.htm, N = 42 -> 20 on the 21 circle.
- DERIVED_127: derived with the method of Machinery's Handbook, "Differential
  Indexing" (from memory): A = 120, 1/3 turn, spindle 56 driving 24, -7/3.
- MH1916: Machinery's Handbook (1916), angular indexing, as quoted in a bookseller's
  excerpt: 35 degrees -> 3 turns + 16 on the 18.
"""

from __future__ import annotations

import json
from fractions import Fraction

from click.testing import CliRunner

from wheelgen.cli import main


def _run(*args: str):
    return CliRunner().invoke(main, ["index", *args])


def test_simple_text():
    # ARMY: 42 divisions -> 20/21 turn, 20 spaces on the 21 circle
    result = _run("42")
    assert result.exit_code == 0, result.output
    assert "simple indexing" in result.output
    assert "20 hole spaces on the 21-hole circle" in result.output
    assert "20/21 turn" in result.output


def test_differential_text_names_gears_sense_and_idlers():
    result = _run("127")  # DERIVED_127
    assert result.exit_code == 0, result.output
    text = result.output
    assert "differential indexing" in text
    assert "as for 120 divisions" in text
    assert "spindle 56 drives 24" in text
    assert "against the crank: 2 idlers" in text
    assert "Unlock the index plate" in text
    assert "= 1/127 turn of the work" in text


def test_json_differential():
    result = _run("127", "--json")  # DERIVED_127
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert data["method"] == "differential"
    assert data["gears"] == [56, 24] and data["sense"] == "against"
    assert data["idlers"] == 2 and data["approx_count"] == 120
    assert Fraction(data["gear_ratio"]) == Fraction(-7, 3)
    # turns + holes/circle is the 1/3 crank turn of A = 120
    assert data["turns"] + Fraction(data["holes"], data["circle"]) == Fraction(1, 3)


def test_json_simple_has_no_gears():
    result = _run("6", "--json", "--plates", "two-sided")
    assert result.exit_code == 0
    data = json.loads(result.output)
    assert data["method"] == "simple"
    assert data["gears"] is None and data["sense"] is None
    # ARMY: 6 2/3 turns per division
    assert data["turns"] + Fraction(data["holes"], data["circle"]) == Fraction(20, 3)
    assert data["plates"][0] == 24


def test_plate_list_option():
    # ARMY: 42 -> 40 spaces on the 42 circle when only that circle is offered
    data = json.loads(_run("42", "--plates", "42", "--json").output)
    assert (data["holes"], data["circle"]) == (40, 42)


def test_nothing_possible_exits_1_with_suggestion():
    result = _run("127", "--gears", "none")
    assert result.exit_code == 1
    assert "no indexing found" in result.output
    assert "127-hole circle" in result.output


def test_nothing_possible_json():
    result = _run("383", "--json")  # derived: see test_indexing (brute force)
    assert result.exit_code == 1
    data = json.loads(result.output)
    assert data["method"] == "none" and data["suggested_circle"] == 383
    assert data["suggested_gear"] is not None


def test_angle():
    result = _run("--angle", "35")  # MH1916
    assert result.exit_code == 0, result.output
    assert "3 whole turns + 16 hole spaces on the 18-hole circle" in result.output
    miss = _run("--angle", "0.1")  # derived: 0.1 * 40 / 360 = 1/90
    assert miss.exit_code == 1 and "90-hole circle" in miss.output


def test_bad_input_exits_2_without_traceback():
    for args, message in [
        (("1",), "1 is out of range; allowed: a whole number from 2 to 10000"),
        (("127", "--ratio", "1e7"), "allowed: a whole number from 1 to 1000"),
        (("127", "--ratio", "nan"), "'nan' is not a whole number"),
        (("127", "--plates", "15," * 200 + "16"), "'plates' may list at most 100"),
        (("--angle", "1e999999"), "power of ten beyond 30"),
        (("127", "--plates", "15,,16"), "'plates' must be a comma-separated list"),
        (("127", "--plates", "gold"), "'plates' must be one of 'three-plate'"),
        (("127", "--gears", "24,x"), "'gears' must be a comma-separated list"),
        (("127", "--ratio", "0"), "0 is out of range; allowed: a whole number from 1"),
        (("127", "--angle", "3"), "give either TEETH or --angle"),
        ((), "give either TEETH or --angle"),
    ]:
        result = _run(*args)
        assert result.exit_code == 2, (args, result.output)
        assert message in result.stderr, (args, result.stderr)
        assert "Traceback" not in result.output + result.stderr
