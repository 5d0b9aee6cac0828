"""``wheelgen check``: exit codes 0/1/2, the JSON keys, no traceback on any input."""

from __future__ import annotations

import json
import subprocess
import sys
from fractions import Fraction
from pathlib import Path

import pytest
from click.testing import CliRunner
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from tests._demo import DEMO
from wheelgen.cli.check import check_command

DATA = Path(__file__).parent / "data"


def run(path: Path, *args: str):
    return CliRunner().invoke(check_command, [str(path), *args])


def write(tmp_path: Path, text: str, name: str = "design.toml") -> Path:
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


# A design that loads; the cases below add to it or change it.
TRAIN = (DATA / "two_stage.toml").read_text(encoding="utf-8")


def test_demo_passes_with_exit_0():
    result = run(DEMO)
    assert result.exit_code == 0, result.output
    assert "371/192" in result.output  # the tide tube, derived in test_kinematics_rates
    assert "Traceback" not in result.output


def test_json_keys_and_exact_fractions():
    result = run(DEMO, "--json")
    assert result.exit_code == 0
    data = json.loads(result.output)
    rows = {r["name"]: r for r in data["arbors"]}
    for row in rows.values():
        assert {"name", "turns_per_drive_turn", "period_s", "sense"} <= set(row)
    # exact fraction strings; derived by hand in test_kinematics_rates
    assert rows["tide"]["turns_per_drive_turn"] == "371/192"
    assert rows["lay"]["turns_per_drive_turn"] == "-2"
    # derived: the drive turns clockwise seen from the front; -2 turns against it
    assert rows["lay"]["sense"] == "ccw"
    assert rows["hours"]["sense"] == "cw"
    assert rows["stud"]["sense"] == "still" and rows["stud"]["period_s"] is None
    assert rows["hours"]["period_s"] == 43200.0  # derived: 1 d / 2
    for t in data["targets"]:
        assert {"arbor", "wanted_s", "got_s", "error_ppm", "met"} <= set(t)
    for f in data["findings"]:
        assert {"level", "check", "subject", "message"} <= set(f)
    assert Fraction(rows["moon_dial"]["turns_per_drive_turn"]) == Fraction(375, 11074)


def test_worked_example_passes(tmp_path):
    result = run(DATA / "two_stage.toml", "--json")
    assert result.exit_code == 0
    data = json.loads(result.output)
    rates = {r["name"]: r["turns_per_drive_turn"] for r in data["arbors"]}
    # derived: (-12/48) and (-12/48)(-10/30)
    assert rates == {"input": "1", "lay": "-1/4", "output": "1/12"}
    (target,) = data["targets"]
    assert target["met"] and target["error_ppm"] == 0 and target["got_s"] == 43200.0


def test_missed_target_gives_exit_1(tmp_path):
    p = write(tmp_path, TRAIN.replace('period = "12 h"', 'period = "11.9 h"'))
    result = run(p)
    assert result.exit_code == 1
    assert "target.missed" in result.output and "MISSED" in result.output
    data = json.loads(run(p, "--json").output)
    assert data["targets"][0]["met"] is False
    assert any(
        f["check"] == "target.missed" and f["level"] == "error"
        for f in data["findings"]
    )


def test_wrong_sense_gives_exit_1(tmp_path):
    p = write(tmp_path, TRAIN.replace('sense = "ccw"', 'sense = "cw"'))
    result = run(p)
    assert result.exit_code == 1
    assert "target.sense" in result.output


LOCK = """
[[wheel]]
name = "short_cut"
arbor = "input"
teeth = 20
height = 14.0

[[mesh]]
pair = ["short_cut", "wheel_b"]
"""


def test_locked_train_gives_exit_1_and_names_both_paths(tmp_path):
    p = write(tmp_path, TRAIN + LOCK)
    result = run(p)
    assert result.exit_code == 1
    assert "train.locked" in result.output
    out = " ".join(result.output.split())
    # derived: through the lay shaft 1/12; straight from the input, -20/30 = -2/3
    assert "mesh pinion_a-wheel_a, mesh pinion_b-wheel_b" in out
    assert "mesh short_cut-wheel_b" in out
    assert "1/12" in out and "-2/3" in out


def test_undriven_arbor_gives_exit_1(tmp_path):
    extra = '\n[[arbor]]\nname = "loose"\nat = [60.0, 0.0]\n'
    result = run(write(tmp_path, TRAIN + extra))
    assert result.exit_code == 1
    assert "train.undriven" in result.output and '"loose"' in result.output


def test_unloadable_design_gives_exit_2_with_message_on_stderr(tmp_path):
    p = write(tmp_path, TRAIN.replace("teeth = 48", "teeth = 1"))
    result = CliRunner().invoke(check_command, [str(p)])
    assert result.exit_code == 2
    assert 'wheel "wheel_a"' in result.stderr and "key 'teeth'" in result.stderr
    assert result.stdout == ""  # nothing written
    assert result.exception is None or isinstance(result.exception, SystemExit)


def test_missing_file_gives_exit_2(tmp_path):
    result = run(tmp_path / "absent.toml")
    assert result.exit_code == 2
    assert "cannot be read" in result.output


# Each mistake the issue lists: exit 2, and the message names the item (and the key).
MISTAKES = [
    (lambda t: t.replace("[design]", "[design"), ["line 3"]),
    (lambda t: t.replace("teeth = 12\n", ""), ['wheel "pinion_a"', "key 'teeth'"]),
    (
        lambda t: t.replace("teeth = 12", 'teeth = "12"'),
        ['wheel "pinion_a"', "key 'teeth'"],
    ),
    (lambda t: t.replace("spokes = 4", "spoke = 4"), ['wheel "wheel_b"', "'spokes'"]),
    (
        lambda t: t.replace('arbor = "lay"\nteeth = 48', 'arbor = "lays"\nteeth = 48'),
        ['wheel "wheel_a"', "key 'arbor'", '"lay"'],
    ),
    (
        lambda t: t.replace('name = "wheel_b"', 'name = "wheel_a"'),
        ['"wheel_a"', "twice"],
    ),
    (
        lambda t: t.replace('name = "lay"', 'name = "lay shaft"'),
        ['arbor "lay shaft"', "'name'"],
    ),
    (
        lambda t: t.replace("teeth = 30", "teeth = 2001"),
        ['wheel "wheel_b"', "key 'teeth'"],
    ),
    (
        lambda t: t.replace("module = 1.0", "module = -1.0"),
        ["[defaults]", "key 'module'"],
    ),
    (
        lambda t: t.replace("face_width = 3.0", "face_width = 0"),
        ["[defaults]", "key 'face_width'"],
    ),
    (
        lambda t: t.replace("teeth = 30", "teeth = 30\npressure_angle = 45"),
        ['wheel "wheel_b"', "key 'pressure_angle'"],
    ),
    (
        lambda t: t.replace('arbor = "output"\nteeth', 'arbor = "out"\nteeth'),
        ['wheel "wheel_b"', "key 'arbor'"],
    ),
    (
        lambda t: t + '\n[[arbor]]\nname = "epi"\ncarrier = "wheel_b"\n',
        ['arbor "epi"', "'at'"],
    ),
    (
        lambda t: (
            t
            + '\n[[arbor]]\nname = "t1"\naround = "t2"\n'
            + '[[arbor]]\nname = "t2"\naround = "t1"\n'
        ),
        ['arbor "t1"', "cycle"],
    ),
    (
        lambda t: t.replace(
            'pair = ["pinion_b", "wheel_b"]', 'pair = ["wheel_b", "wheel_b"]'
        ),
        ["the 2nd [[mesh]]", "itself"],
    ),
    (
        lambda t: t.replace('period = "12 h"', 'period = "12 hours"'),
        ['[[target]] (arbor "output")', "key 'period'"],
    ),
    (
        lambda t: t.replace("bearing = 90.0\n", ""),
        ['arbor "output"', "cannot be placed"],
    ),
]


@pytest.mark.parametrize(("change", "fragments"), MISTAKES)
def test_every_listed_mistake_exits_2_and_names_the_item(tmp_path, change, fragments):
    result = run(write(tmp_path, change(TRAIN)))
    assert result.exit_code == 2, result.output
    assert "Traceback" not in result.output
    assert str(tmp_path / "design.toml") in result.output
    for fragment in fragments:
        assert fragment in result.output, (fragment, result.output)


@settings(
    max_examples=60,
    deadline=None,
    suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow],
)
@given(
    st.one_of(
        st.text(max_size=300),
        st.binary(max_size=300).map(lambda b: b.decode("latin-1")),
        # TOML-looking junk: fragments of a real file, shuffled and cut
        st.lists(st.sampled_from(TRAIN.splitlines()), max_size=40).map("\n".join),
    )
)
def test_junk_never_gives_a_traceback(tmp_path, junk):
    p = tmp_path / "junk.toml"
    p.write_text(junk, encoding="utf-8", errors="surrogateescape")
    result = CliRunner().invoke(check_command, [str(p)])
    assert "Traceback" not in result.output
    assert result.exception is None or isinstance(result.exception, SystemExit), (
        result.exception
    )
    assert result.exit_code in (0, 1, 2)
    if result.exit_code == 2:
        assert "junk.toml" in result.output


@settings(
    max_examples=30,
    deadline=None,
    suppress_health_check=[HealthCheck.function_scoped_fixture],
)
@given(st.randoms(use_true_random=False))
def test_dropping_lines_never_gives_a_traceback(tmp_path, rnd):
    lines = TRAIN.splitlines()
    for _ in range(rnd.randint(1, 6)):
        lines.pop(rnd.randrange(len(lines)))
    p = write(tmp_path, "\n".join(lines))
    result = CliRunner().invoke(check_command, [str(p), "--json"])
    assert result.exception is None or isinstance(result.exception, SystemExit), (
        result.exception
    )
    assert result.exit_code in (0, 1, 2)
    if result.exit_code in (0, 1):
        json.loads(result.stdout)


def test_installed_command_runs_the_demo():
    exe = Path(sys.executable).parent / "wheelgen"
    if not exe.exists():
        pytest.skip("no installed 'wheelgen' script next to this interpreter")
    done = subprocess.run(
        [str(exe), "check", str(DEMO)], capture_output=True, text=True
    )
    assert done.returncode == 0, done.stderr
    bad = subprocess.run(
        [str(exe), "check", str(DATA / "absent.toml")], capture_output=True, text=True
    )
    assert bad.returncode == 2 and "Traceback" not in bad.stderr


# Mistakes that do not hide one another: any mix of them is reported in full.
INDEPENDENT = [
    (lambda t: t.replace("teeth = 12", "teeth = 2"), "wheel \"pinion_a\", key 'teeth'"),
    (
        lambda t: t.replace("teeth = 48", "teeth = 48\npressure_angle = 5"),
        "wheel \"wheel_a\", key 'pressure_angle'",
    ),
    (
        lambda t: t.replace("spokes = 4", "spokes = 4\nface_width = -2"),
        "wheel \"wheel_b\", key 'face_width'",
    ),
    (
        lambda t: t.replace('period = "1 h"', 'period = "1 hour"'),
        "[drive], key 'period'",
    ),
    (lambda t: t.replace('title = "Two', 'titel = "Two'), "[design], key 'titel'"),
    (
        lambda t: t.replace(
            'period = "12 h"', 'period = "12 h"\ntolerance = "3 parsecs"'
        ),
        "key 'tolerance'",
    ),
    (
        lambda t: t.replace('arbor = "output"\nteeth', 'arbor = "outptu"\nteeth'),
        "wheel \"wheel_b\", key 'arbor'",
    ),
]


@settings(
    max_examples=25,
    deadline=None,
    suppress_health_check=[HealthCheck.function_scoped_fixture],
)
@given(st.sets(st.integers(0, len(INDEPENDENT) - 1), min_size=1))
def test_any_mix_of_mistakes_is_reported_together(tmp_path, chosen):
    text = TRAIN
    for i in sorted(chosen):
        text = INDEPENDENT[i][0](text)
    result = run(write(tmp_path, text))
    assert result.exit_code == 2
    assert "Traceback" not in result.output
    for i in chosen:
        assert INDEPENDENT[i][1] in result.output, (INDEPENDENT[i][1], result.output)
    # one problem each, but 'titel' for 'title' is two: the unknown key, the missing one
    count = len(chosen) + (1 if 4 in chosen else 0)
    noun = "problem" if count == 1 else "problems"
    assert f"{count} {noun} in the design file" in result.output


def _steep_train(stages: int) -> str:
    # derived: each stage turns the next arbor 10/2000 times, so arbor k turns
    # 200^-k times per drive turn; from about k = 134 no float holds its period
    out = [
        '[design]\ntitle = "steep"\n[defaults]\nmodule = 0.05\nface_width = 1.0\n'
        '[drive]\narbor = "a0"\nperiod = "1 s"\n'
    ]
    for i in range(stages):
        at = "at = [0.0, 0.0]\n" if i == 0 else ""
        out.append(f'[[arbor]]\nname = "a{i}"\n{at}diameter = 1.0\n')
        out.append(
            f'[[wheel]]\nname = "w{i}"\narbor = "a{i}"\nteeth = 2000\n'
            f"height = {2.0 + 3 * (i % 3)}\n"
        )
        out.append(
            f'[[wheel]]\nname = "p{i}"\narbor = "a{i}"\nteeth = 10\n'
            f"height = {2.0 + 3 * ((i + 1) % 3)}\n"
        )
        if i:
            out.append(f'[[mesh]]\npair = ["p{i - 1}", "w{i}"]\nbearing = 0.0\n')
    out.append('[[target]]\narbor = "a139"\nperiod = "1 h"\n')
    return "\n".join(out)


def test_rates_no_float_holds_are_reported_without_a_traceback(tmp_path):
    from wheelgen.design import load_design
    from wheelgen.kinematics.rates import solve_rates
    from wheelgen.workshop.preview import preview_plan

    path = tmp_path / "steep.toml"
    path.write_text(_steep_train(140))
    result = run(path)
    assert result.exit_code == 1, result.output  # a missed target, not a crash
    assert "about -1.434e-320" in result.output  # derived: -(10/2000)^139
    assert "2.20833e+312 yr" in result.output
    data = json.loads(run(path, "--json").stdout)
    last = data["arbors"][-1]
    assert Fraction(last["turns_per_drive_turn"]) == Fraction(-1, 200**139)
    assert last["period_s"] is None  # JSON has no number that large
    assert data["targets"][0]["error_ppm"] is None
    design = load_design(path)
    preview_plan(design, solve_rates(design))  # the report's animation, too
