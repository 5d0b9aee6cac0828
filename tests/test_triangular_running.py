"""Triangular teeth that run by default, the least running play on request, and advice
for a pair that jams which, applied, clears the jam.

External truth here is the mesh simulator (tested against hand-solved contacts in
test_mesh_sim.py and test_triangular_data_sheet.py) and derivations written beside the
checks. Every design is loaded from TOML text and checked as ``wheelgen check`` does.
"""

from __future__ import annotations

import json
import math
import os
import re

import pytest
from click.testing import CliRunner

from wheelgen.checks import analyse
from wheelgen.checks.least_play import pair_play, settle_play
from wheelgen.cli import main
from wheelgen.design import DesignError, loads_design
from wheelgen.design.model import Design, Process
from wheelgen.design.process_limits import min_backlash
from wheelgen.design.tooth_defaults import (
    TRIANGULAR_BACKLASH_FACTOR,
    default_tooth_angle_deg,
    tooth_defaults,
)
from wheelgen.findings import format_value
from wheelgen.layout.placement import tooth_spec
from wheelgen.teeth import ToothSpec, outline_for

PROCESSES = ("hand", "mill", "print")
#: The pairs that jammed with the old defaults (60 degree teeth, addendum 1.0 m).
SIX_PAIRS = ((15, 60), (32, 48), (20, 127), (38, 64), (12, 12), (100, 150))


def pair_toml(
    z1: int,
    z2: int,
    process: str = "hand",
    *,
    defaults: str = "",
    wheel1: str = "",
    wheel2: str = "",
    mesh: str = "",
    module: float = 1.0,
) -> str:
    return f"""
[design]
title = "pair"
process = "{process}"

[defaults]
form = "triangular"
module = {module}
{defaults}

[drive]
arbor = "a"
period = "1 h"

[[arbor]]
name = "a"
at = [0.0, 0.0]

[[arbor]]
name = "b"

[[wheel]]
name = "w1"
arbor = "a"
teeth = {z1}
{wheel1}

[[wheel]]
name = "w2"
arbor = "b"
teeth = {z2}
{wheel2}

[[mesh]]
pair = ["w1", "w2"]
bearing = 0.0
{mesh}
"""


def load(text: str) -> Design:
    return loads_design(text, "pair.toml")


def serious(design: Design) -> list:
    # whether the pair runs; a printed wheel larger than the printer's plate is
    # another matter (process.bed: the grid's 300-tooth wheels are 300 mm across)
    return [
        f
        for f in analyse(design).findings
        if f.level in ("error", "warning") and f.check != "process.bed"
    ]


def least_play_mm(design: Design) -> float:
    w1, w2 = design.wheels
    s1, s2 = tooth_spec(w1), tooth_spec(w2)
    play, _ = pair_play(s1, s2, s1.module * (s1.teeth + s2.teeth) / 2)
    return play


# --- the defaults -----------------------------------------------------------------


@pytest.mark.parametrize("z", [10, 13, 40, 300])
@pytest.mark.parametrize("thinning", [0.0, 0.2])
def test_default_tooth_angle_puts_the_flanks_at_30_degrees(z, thinning):
    # derived: the basic tooth's flank crosses the pitch circle 90/z degrees from the
    # tooth's middle and leans in by b/2, so it meets the radius at b/2 + 90/z; with
    # b = 60 - 180/z that is 30 degrees. Thinning turns the flank about the centre,
    # which keeps its distance from the centre and so the angle. Measured on the outline.
    b = default_tooth_angle_deg(z)
    assert b == pytest.approx(60.0 - 180.0 / z)
    spec = ToothSpec(z, 2.0, form="triangular", tooth_angle_deg=b, addendum=0.6,
                     dedendum=0.85, thinning=thinning)  # fmt: skip
    line = next(s for s in outline_for(spec).tooth if s.kind == "line")
    p, d = line.start, line.end - line.start
    r = spec.module * z / 2
    aa, bb, cc = d @ d, 2 * p @ d, p @ p - r * r
    q = p + (-bb + math.sqrt(bb * bb - 4 * aa * cc)) / (2 * aa) * d
    angle = math.degrees(math.acos(abs(q @ d) / (math.hypot(*q) * math.hypot(*d))))
    assert angle == pytest.approx(30.0, abs=1e-9)


def test_defaults_by_form_and_process():
    # derived: each wheel's backlash is 2 k m / z plus the process's smallest backlash
    # (docs/format.md), rounded up to a micrometre
    k = TRIANGULAR_BACKLASH_FACTOR
    hand = tooth_defaults("triangular", 10, 1.0, Process(kind="hand"))
    assert hand["backlash"] == pytest.approx(2 * k / 10 + 0.05)
    assert hand["addendum"] == 0.6 and hand["dedendum"] == 0.85
    assert hand["tooth_angle_deg"] == pytest.approx(42.0)
    printed = tooth_defaults("triangular", 300, 2.0, Process(kind="print"))
    assert printed["backlash"] == pytest.approx(2 * k * 2.0 / 300 + 0.1)  # 0.12 mm
    odd = tooth_defaults("triangular", 7, 1.0, Process(kind="mill"))
    assert odd["backlash"] == pytest.approx(0.449)  # 3 / 7 + 0.02 = 0.4486 up to 0.449
    # the end mill leaves its radius in the root: 1 mm cutter on module 1 -> 0.5 m
    assert (
        tooth_defaults("triangular", 20, 1.0, Process(kind="mill"))["root_radius"]
        == 0.5
    )
    assert (
        tooth_defaults("triangular", 20, 5.0, Process(kind="mill"))["root_radius"]
        == 0.1
    )
    # involute wheels keep the ISO 53 type A basic rack
    inv = tooth_defaults("involute", 20, 1.0, Process(kind="hand"))
    assert (inv["addendum"], inv["dedendum"], inv["root_radius"]) == (1.0, 1.25, 0.38)


@pytest.mark.parametrize("process", PROCESSES)
@pytest.mark.parametrize(("z1", "z2"), SIX_PAIRS)
def test_the_six_pairs_run_with_every_default(z1, z2, process):
    design = load(pair_toml(z1, z2, process))
    assert serious(design) == []
    # and with the process's smallest backlash to spare (mm on the pitch circle)
    assert least_play_mm(design) >= min_backlash(Process(kind=process))


@pytest.mark.parametrize(
    ("process", "module", "cutter"),
    [("hand", 0.5, None), ("print", 3.0, None), ("mill", 0.5, 0.5)],
)
def test_the_six_pairs_run_at_other_modules(process, module, cutter):
    # derived: every proportion is in modules, so the geometry scales; the process's
    # margin (mm) is added on top of the default backlash and stays to spare. A milled
    # root takes the cutter's radius, which scales too while the cutter is no wider
    # than the module (docs/format.md)
    extra = "" if cutter is None else f"[process]\ncutter = {cutter}\n\n"
    for z1, z2 in SIX_PAIRS:
        text = pair_toml(z1, z2, process, module=module)
        design = load(text.replace("[defaults]", extra + "[defaults]"))
        assert serious(design) == [], (z1, z2)


def _grid_check(counts: tuple[int, ...], process: str) -> list[tuple[int, int, str]]:
    bad = []
    for z1 in counts:
        for z2 in counts:
            for f in serious(load(pair_toml(z1, z2, process))):
                bad.append((z1, z2, f"{f.level} {f.check}: {f.measured}"))
    return bad


# A sample of the grid from 10 to 300 teeth: the smallest counts (where straight
# flanks need the most play) densely, the rest spread out; both orders of each pair.
GRID_SAMPLE = {
    "hand": (10, 11, 13, 17, 29, 60, 143, 300),
    "mill": (10, 12, 24, 101, 300),
    "print": (10, 15, 37, 211, 300),
}


@pytest.mark.parametrize("process", PROCESSES)
def test_default_pairs_run_over_a_grid_of_tooth_counts(process):
    assert _grid_check(GRID_SAMPLE[process], process) == []


FULL_GRID = tuple(
    sorted(set(range(10, 31)) | set(range(32, 61, 4)) | set(range(70, 301, 10)))
)


@pytest.mark.slow
@pytest.mark.skipif(
    not os.environ.get("WHEELGEN_FULL_GRID"),
    reason="the full grid (2809 pairs a process, some minutes): set WHEELGEN_FULL_GRID=1",
)
@pytest.mark.parametrize("process", PROCESSES)
def test_default_pairs_run_over_the_full_grid(process):
    assert _grid_check(FULL_GRID, process) == []


def test_user_values_are_kept():
    design = load(
        pair_toml(
            20, 60, defaults="addendum = 0.5",
            wheel1="tooth_angle = 50.0\nbacklash = 0.3\ntip_radius = 0.1",
        )
    )  # fmt: skip
    w1, w2 = design.wheels
    assert (w1.tooth_angle_deg, w1.backlash, w1.tip_radius) == (50.0, 0.3, 0.1)
    assert w1.addendum == w2.addendum == 0.5
    # what the user left out takes the default for its own tooth count
    assert w2.tooth_angle_deg == pytest.approx(57.0)
    assert w2.backlash == pytest.approx(2 * TRIANGULAR_BACKLASH_FACTOR / 60 + 0.05)


# --- advice that clears a jam -------------------------------------------------------

_SETTING = re.compile(r'(\w+) = ([\d.]+) on wheel "(\w+)"')


def _options(finding) -> list[dict[str, list[str]]]:
    """Each alternative of the advice as the settings it makes, per wheel name; the
    first is the finding's own structured change."""
    advice = finding.advice
    head = advice.split(". Each leaves", 1)[0]
    assert head.startswith("set ")
    out = []
    for text in head[4:].split("; or "):
        keys: dict[str, list[str]] = {}
        for key, value, wheel in _SETTING.findall(text):
            keys.setdefault(wheel, []).append(f"{key} = {value}")
        assert keys, f"advice option not understood: {text!r}"
        out.append(keys)
    first = {}
    for c in finding.changes:
        first.setdefault(c.name, []).append(f"{c.key} = {format_value(c.value)}")
    assert first == out[0]
    return out


def _merge(table: str, *settings: str) -> str:
    """The lines of a wheel table with ``settings`` (``"key = value"``) written over."""
    values = dict(line.split(" = ", 1) for line in table.splitlines() if line)
    values.update(line.split(" = ", 1) for line in settings if line)
    return "\n".join(f"{k} = {v}" for k, v in values.items())


def _apply(z1, z2, process, defaults, wheel1, wheel2, keys):
    return load(
        pair_toml(
            z1, z2, process, defaults=defaults,
            wheel1=_merge(wheel1, *keys.get("w1", [])),
            wheel2=_merge(wheel2, *keys.get("w2", [])),
        )
    )  # fmt: skip


JAMS = [
    # (z1, z2, process, [defaults], wheel 1, wheel 2): user values that jam
    (20, 60, "hand", "tooth_angle = 60.0\nbacklash = 0.05", "", ""),  # old defaults
    (15, 60, "hand", "", "backlash = 0.0", "backlash = 0.0"),
    (32, 48, "mill", "addendum = 0.9\ndedendum = 1.25", "", ""),
    (12, 30, "print", "", "tooth_angle = 60.0", ""),
]


@pytest.mark.parametrize(("z1", "z2", "process", "defaults", "wheel1", "wheel2"), JAMS)
def test_jam_advice_names_what_to_change_and_applying_it_clears_the_jam(
    z1, z2, process, defaults, wheel1, wheel2
):
    design = load(pair_toml(z1, z2, process, defaults=defaults, wheel1=wheel1,
                            wheel2=wheel2))  # fmt: skip
    (jam,) = [f for f in analyse(design).findings if f.check == "mesh.jam"]
    options = _options(jam)
    assert options
    for keys in options:
        fixed = _apply(z1, z2, process, defaults, wheel1, wheel2, keys)
        left = {f.check for f in serious(fixed)}
        assert not left & {"mesh.jam", "mesh.backlash"}, (keys, left)
    # and the tool's own choice runs too (backlash where it helps; tips that reach the
    # mate's root need shorter teeth)
    mode = re.search(r'least_play = "(\w+)" on this \[\[mesh\]\]', jam.advice)[1]
    chosen = load(pair_toml(z1, z2, process, defaults=defaults, wheel1=wheel1,
                            wheel2=wheel2, mesh=f'least_play = "{mode}"'))  # fmt: skip
    assert not {f.check for f in serious(chosen)} & {"mesh.jam", "mesh.backlash"}


def test_a_pair_that_runs_too_tight_is_warned_with_advice_that_works():
    # derived: 100/150 teeth need about k (1/100 + 1/150) = 0.023 mm of backlash to
    # run, so 0.04 mm leaves less than the 0.05 mm hand work needs
    design = load(pair_toml(100, 150, "hand", defaults="backlash = 0.04"))
    (tight,) = [f for f in serious(design) if f.check == "mesh.backlash"]
    assert tight.level == "warning"
    for keys in _options(tight):
        fixed = _apply(100, 150, "hand", "backlash = 0.04", "", "", keys)
        assert serious(fixed) == [], keys


# --- least running play on request --------------------------------------------------


def _note(design: Design) -> str:
    (note,) = [f for f in analyse(design).findings if f.check == "mesh.least_play"]
    assert note.level == "note"
    return note.message


def test_least_backlash_is_the_least_that_runs_plus_the_margin():
    design = load(pair_toml(15, 60, "hand", mesh='least_play = "backlash"'))
    settled = settle_play(design)
    w1, w2 = settled.wheels
    assert w1.backlash == w2.backlash
    margin = 0.05  # hand work (docs/format.md, [process] min_backlash)
    assert least_play_mm(settled) >= margin
    # one micrometre less and the play falls short of the margin: it is the least
    less = load(
        pair_toml(15, 60, "hand", defaults=f"backlash = {w1.backlash - 0.001:.3f}")
    )
    assert least_play_mm(less) < margin
    assert serious(settled) == []
    text = _note(design)
    assert f"backlash {w1.backlash:g} mm on w1" in text and "least play" in text
    # it is well below the default's, which holds for every pair from 10 to 300 teeth
    assert w1.backlash < load(pair_toml(15, 60, "hand")).wheels[0].backlash


def test_least_addendum_cut_keeps_the_backlash():
    design = load(
        pair_toml(20, 127, "hand", defaults="backlash = 0.06",
                  mesh='least_play = "addendum"')
    )  # fmt: skip
    settled = settle_play(design)
    w1, w2 = settled.wheels
    assert w1.backlash == w2.backlash == 0.06
    assert w1.addendum == w2.addendum < 0.6
    assert least_play_mm(settled) >= 0.05
    longer = load(
        pair_toml(20, 127, "hand",
                  defaults=f"backlash = 0.06\naddendum = {w1.addendum + 0.001:.3f}")
    )  # fmt: skip
    assert least_play_mm(longer) < 0.05
    assert "cut by" in _note(design)


def test_least_play_from_the_defaults_applies_to_every_mesh_unless_it_says_none():
    text = (
        pair_toml(20, 40, "mill", defaults='least_play = "backlash"')
        + """
[[arbor]]
name = "c"

[[wheel]]
name = "w3"
arbor = "c"
teeth = 30

[[mesh]]
pair = ["w2", "w3"]
bearing = 90.0
least_play = "none"
"""
    )
    design = load(text)
    assert [m.least_play for m in design.meshes] == ["backlash", None]
    settled = settle_play(design)
    w1, w2, w3 = settled.wheels
    plain = load(text.replace('least_play = "backlash"', ""))
    # w2 also meshes with w3, which asked for nothing: it never gets less backlash
    # than it had, so that mesh loses no play
    assert w2.backlash >= plain.wheels[1].backlash
    assert w1.backlash < plain.wheels[0].backlash
    assert w3.backlash == plain.wheels[2].backlash
    # the pair that asked runs with less backlash than the defaults give it
    assert (
        w1.backlash + w2.backlash < plain.wheels[0].backlash + plain.wheels[1].backlash
    )
    assert [m.chosen != "" for m in settled.meshes] == [True, False]
    assert settle_play(settled) is settled  # already settled: nothing to do


def test_least_play_on_an_involute_mesh():
    text = pair_toml(20, 40, "print", mesh='least_play = "backlash"').replace(
        'form = "triangular"', 'form = "involute"'
    )
    settled = settle_play(load(text))
    # derived: involute flanks are conjugate, so the least backlash that runs is
    # about zero and the choice is about the print margin, 0.1 mm
    assert settled.wheels[0].backlash == pytest.approx(0.1, abs=0.003)
    assert least_play_mm(settled) >= 0.1


def test_unknown_least_play_value_is_refused():
    with pytest.raises(DesignError, match=r"'backlash', 'addendum', 'none'"):
        load(pair_toml(20, 40, mesh='least_play = "smallest"'))


def test_check_reports_the_choice(tmp_path):
    path = tmp_path / "pair.toml"
    path.write_text(pair_toml(32, 48, "hand", mesh='least_play = "backlash"'))
    result = CliRunner().invoke(main, ["check", str(path), "--json"])
    assert result.exit_code == 0, result.output
    found = json.loads(result.output)["findings"]
    assert [f["check"] for f in found if f["check"] == "mesh.least_play"] == [
        "mesh.least_play"
    ]


@pytest.mark.parametrize(
    ("z1", "z2", "extra", "flags"),
    [
        (20, 127, "", []),
        (12, 12, "", []),
        (12, 30, "tooth_angle = 60.0\nbacklash = 0.05",
         ["--tooth-angle", "60", "--backlash", "0.05"]),
        (100, 150, "backlash = 0.03", ["--backlash", "0.03"]),
    ],
)  # fmt: skip
def test_gear_and_check_agree_on_a_pair(z1, z2, extra, flags):
    design = load(pair_toml(z1, z2, "print", defaults=extra))
    args = ["gear", "--form", "triangular", "-z", str(z1), "-m", "1", "--mate",
            str(z2), "--process", "print", "--json", *flags]  # fmt: skip
    result = CliRunner().invoke(main, args)
    assert result.exit_code == 0, result.output
    sheet = json.loads(result.output)
    assert sheet["least_play"] == pytest.approx(least_play_mm(design), abs=1e-12)
    w1, w2 = design.wheels
    assert sheet["thinning"] == pytest.approx(w1.backlash / 2)
    assert sheet["mate"]["thinning"] == pytest.approx(w2.backlash / 2)
    # the same verdicts, and the same advice, from both commands
    names = {"wheel": "w1", "mate": "w2", "mesh": "mesh w1-w2"}
    gear = {(names[f["subject"]], f["check"], f["level"]) for f in sheet["findings"]}
    check = {
        (f.subject.removeprefix("wheel "), f.check, f.level)
        for f in analyse(design).findings
        if f.check.startswith(("mesh.", "wheel."))
    }
    assert gear == check
