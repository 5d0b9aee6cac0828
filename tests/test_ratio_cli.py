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
    # derived: 254/19 = (2 * 127) / 19 needs the prime 127 on a driver
    rows = [line for line in r.output.splitlines() if "254/19" in line]
    assert len(rows) == 4 and all("127/" in row for row in rows[1:])


def test_trains_that_fit_come_first():
    r = run(
        "ratio",
        "254/19",
        "--teeth",
        "10-130",
        "--stages",
        "2",
        "--top",
        "200",
        "--json",
    )
    assert r.exit_code == 0, r.output
    data = json.loads(r.stdout)
    fits = [c["fits"] for c in data]
    assert fits == sorted(fits, reverse=True) and fits[0] and not fits[-1]
    # derived: in 20/19 x 127/10 (the fewest teeth) the 127-tooth driver on lay1
    # (tip radius 64.5 mm at module 1) reaches over the input arbor, which stands
    # (20 + 19) / 2 = 19.5 mm from lay1 and runs from plate to plate
    fewest = [c for c in data if c["stages"] == [[20, 19], [127, 10]]]
    assert fewest and fewest[0]["fits"] is False
    assert any("input" in p for p in fewest[0]["layout_problems"])
    assert fewest[0]["largest_tip_diameter_mm"] == 129


def test_json_candidates():
    r = run(
        "ratio",
        "13.36842",
        "--teeth",
        "10-60",
        "--stages",
        "2",
        "--top",
        "4",
        "--json",
        "--tolerance",
        "1000ppm",
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
        ("ratio", "3/2", "--teeth", "12,,15"),
        ("ratio", "3/2", "--teeth", "2-40"),
        ("ratio", "3/2", "--teeth", "12-20,x"),
        ("ratio", "3/2", "--coaxial", "--stages", "3"),
        ("ratio", "3/2", "--max-shift", "0.5"),
        ("ratio", "3/2", "--coaxial", "--max-shift", "9"),
        ("ratio", "3/2", "--plates", "lots"),
        ("ratio", "3/2", "--teeth", "51,53", "--plates", "three-plate"),
        ("ratio", "3/2", "--stage-module", "1", "--stage-module", "1", "--stages", "1"),
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
        "2",
        "--teeth",
        "17-150",
        "--sense",
        "opposite",
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


def test_tooth_list_is_honoured():
    r = run(
        "ratio",
        "3.14159265",
        "--teeth",
        "12-20,24,30,36-40",
        "--stages",
        "2",
        "--top",
        "20",
        "--json",
        "--tolerance",
        "2000ppm",
    )
    assert r.exit_code == 0, r.output
    allowed = {*range(12, 21), 24, 30, *range(36, 41)}
    data = json.loads(r.stdout)
    assert data
    assert all(z in allowed for c in data for stage in c["stages"] for z in stage)


def test_plates_keep_counts_that_index_simply():
    # The three-plate set indexes "all divisions up to 50, even numbers up to 100,
    # except 96" on a 40:1 head (Practical Treatise on Milling and Milling Machines,
    # p. 58). Derived: a count z indexes simply when the denominator of 40/z in lowest
    # terms divides one of the hole circles.
    plates = (15, 16, 17, 18, 19, 20, 21, 23, 27, 29, 31, 33, 37, 39, 41, 43, 47, 49)

    def simple(z):
        return any(c % Fraction(40, z).denominator == 0 for c in plates)

    assert simple(48) and simple(100) and not simple(96) and not simple(51)
    r = run(
        "ratio",
        "2.9530589",
        "--teeth",
        "40-120",
        "--plates",
        "three-plate",
        "--stages",
        "2",
        "--top",
        "30",
        "--json",
        "--tolerance",
        "5000ppm",
    )
    assert r.exit_code == 0, r.output
    counts = {z for c in json.loads(r.stdout) for stage in c["stages"] for z in stage}
    assert counts and all(simple(z) for z in counts)
    assert 96 not in counts
    text = run(
        "ratio", "3/2", "--teeth", "40-120", "--plates", "15,16", "--stages", "1"
    )
    assert "indexed simply on 15,16 at 40:1" in text.output


def test_coaxial_one_twelfth_offers_only_exact_reverted_trains(tmp_path):
    path = tmp_path / "motion.toml"
    r = run(
        "ratio",
        "1/12",
        "--coaxial",
        "--teeth",
        "8-90",
        "--top",
        "40",
        "--json",
        "--write",
        str(path),
    )
    assert r.exit_code == 0, r.output
    data = json.loads(r.stdout)
    assert len(data) > 10
    for c in data:
        (a1, b1), (a2, b2) = c["stages"]
        assert a1 + b1 == a2 + b2  # one module: equal tooth sums
        assert Fraction(a1 * a2, b1 * b2) == Fraction(1, 12)
        assert Fraction(c["ratio"]) == Fraction(1, 12) and c["coaxial"]
    text = path.read_text()
    assert 'around = "input"' in text
    checked = run("check", str(path), "--json")
    assert checked.exit_code == 0, checked.output  # passes as written, no edit
    assert json.loads(checked.stdout)["targets"][0]["met"] is True


def test_coaxial_with_profile_shift_is_reported_and_passes_check(tmp_path):
    # derived: 12/36 x 10/40 = 1/12 with tooth sums 48 and 50 needs stage one opened
    # from 24 to 25 mm at module 1, a shift sum of about 1.1 (see test_ratio_coaxial)
    path = tmp_path / "shifted.toml"
    args = ["ratio", "1/12", "--coaxial", "--teeth", "10,12,36,40"]
    assert run(*args).exit_code == 1  # no exact coaxial train without shift
    r = run(*args, "--max-shift", "1.2", "--write", str(path))
    assert r.exit_code == 0, r.output
    assert "profile shift" in r.output and "both stages at 25 mm" in r.output
    assert "shift = " in path.read_text()
    checked = run("check", str(path))
    assert checked.exit_code == 0, checked.output


def test_coaxial_miss_suggests_profile_shift():
    r = run("ratio", "1/12", "--coaxial", "--teeth", "10,12,36,40")
    assert r.exit_code == 1
    assert "--max-shift 1.1" in r.stderr or "--max-shift 1.2" in r.stderr


def test_large_search_is_refused_with_what_to_narrow():
    r = run("ratio", "12", "--teeth", "10-300", "--stages", "4")
    assert r.exit_code == 2
    assert "budget" in r.stderr and "--stages 3" in r.stderr
    assert "narrow --teeth to 10-" in r.stderr


def test_written_three_stage_train_passes_check(tmp_path):
    path = tmp_path / "year.toml"
    r = run(
        "ratio",
        "365.2422 d per 1 d",
        "--stages",
        "3",
        "--tolerance",
        "2ppm",
        "--write",
        str(path),
    )
    assert r.exit_code == 0, r.output
    assert "[frame]" in path.read_text()  # arbors run from plate to plate
    checked = run("check", str(path))
    assert checked.exit_code == 0, checked.output
