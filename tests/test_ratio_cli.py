"""``wheelgen ratio`` through click: exit codes, messages, JSON, written snippet."""

from __future__ import annotations

import json
from fractions import Fraction

import pytest
from click.testing import CliRunner

from wheelgen.cli import main


def run(*args):
    return CliRunner().invoke(main, list(args))


def test_exact_target_lists_exact_trains_first():
    r = run("ratio", "254/19", "--teeth", "10-130", "--stages", "2", "--top", "3")
    assert r.exit_code == 0, r.output
    assert "exact trains in range:" in r.output
    # derived: 254/19 = (2 * 127) / 19; the fewest teeth: 20/19 x 127/10 (176 teeth)
    assert "20/19 x 127/10" in r.output


def test_json_candidates():
    r = run(
        "ratio", "13.36842", "--teeth", "10-60", "--stages", "2", "--top", "4", "--json"
    )
    data = json.loads(r.stdout)
    assert isinstance(data, list) and len(data) == 4
    for c in data:
        assert set(c) >= {"stages", "ratio", "error_ppm"}
        num = den = 1
        for a, b in c["stages"]:
            num, den = num * a, den * b
        assert Fraction(c["ratio"]) == Fraction(num, den)
        # the period's relative error (derived: target / ratio - 1)
        expected = float(Fraction("13.36842") / Fraction(c["ratio"]) - 1) * 1e6
        assert c["error_ppm"] == pytest.approx(expected, rel=1e-9, abs=1e-9)
    errors = [abs(c["error_ppm"]) for c in data]
    assert errors == sorted(errors)


def test_period_target_shows_drift():
    r = run(
        "ratio",
        "27.321661 d",
        "per",
        "365.2422 d",
        "--stages",
        "2",
        "--json",
        "--top",
        "1",
    )
    assert r.exit_code == 0, r.output
    assert "drift_deg_per_yr" in json.loads(r.stdout)[0]


def test_prime_factor_above_range_exits_1_and_says_what_to_relax():
    r = run("ratio", "254/19", "--teeth", "10-120", "--stages", "2")
    assert r.exit_code == 1
    assert "none" in r.stdout and "127" in r.stdout
    assert "nothing within 0 ppm" in r.stderr
    assert "--teeth 10-127" in r.stderr


def test_max_diameter_limits_teeth():
    # derived: m = 1, tip diameter 62 mm -> at most 60 teeth; 254/19 needs 127
    r = run("ratio", "254/19", "--max-diameter", "62", "--stages", "2")
    assert r.exit_code == 1
    assert "teeth 10-60 (from --max-diameter)" in r.stdout
    assert "--max-diameter 129 mm" in r.stderr


@pytest.mark.parametrize(
    "args",
    [
        ("ratio", "nonsense"),
        ("ratio", "3/2", "--teeth", "40-10"),
        ("ratio", "3/2", "--tolerance", "lots"),
        ("ratio", "3/2", "--stages", "5"),
        ("ratio", "3/2", "--module", "0", "--max-diameter", "40"),
        (
            "ratio",
            "3/2",
            "--stages",
            "1",
            "--stage-teeth",
            "10-20",
            "--stage-teeth",
            "10-20",
        ),
    ],
)
def test_bad_input_exits_2(args):
    r = run(*args)
    assert r.exit_code == 2, r.output
    assert "Traceback" not in r.output


def _check_met(path):
    # the lead's checker: load the snippet as it is and evaluate its target
    r = run("check", str(path), "--json")
    assert r.exit_code in (0, 1), r.output  # 2 would mean the snippet does not load
    report = json.loads(r.stdout)
    assert len(report["targets"]) == 1
    return report["targets"][0]


def test_written_snippet_loads_and_meets_exact_target(tmp_path):
    path = tmp_path / "train.toml"
    r = run(
        "ratio", "254/19", "--teeth", "10-130", "--stages", "3", "--write", str(path)
    )
    assert r.exit_code == 0, r.output
    target = _check_met(path)
    assert target["met"] is True
    assert target["error_ppm"] == 0


def test_written_snippet_meets_period_target_with_idler(tmp_path):
    path = tmp_path / "train.toml"
    r = run(
        "ratio",
        "27.321661 d per 365.2422 d",
        "--stages",
        "1",
        "--teeth",
        "10-150",
        "--sense",
        "same",
        "--tolerance",
        "2000ppm",
        "--module",
        "0.8",
        "--write",
        str(path),
    )
    assert r.exit_code == 0, r.output
    text = path.read_text()
    assert 'name = "idler_wheel"' in text and "module = 0.8" in text
    target = _check_met(path)
    assert target["met"] is True
    assert target["sense_ok"] is True


def test_written_snippet_three_stages(tmp_path):
    path = tmp_path / "train.toml"
    r = run(
        "ratio",
        "13.36842",
        "--stages",
        "3",
        "--tolerance",
        "1ppm",
        "--write",
        str(path),
    )
    assert r.exit_code == 0, r.output
    assert _check_met(path)["met"] is True
