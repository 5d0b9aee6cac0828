"""The train-file loader: what it accepts, its defaults, and how it reports mistakes.

Every mistake must come back as one paragraph naming the file, the item and the key,
what was found and what is allowed; all mistakes of one pass are reported together.
"""

from __future__ import annotations

import re
from fractions import Fraction
from pathlib import Path

import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

from wheelgen.design import DesignError, load_design, loads_design
from wheelgen.design.names import RESERVED_NAMES
from wheelgen.design.train_tables import MAX_TEETH, MIN_TEETH

DATA = Path(__file__).parent / "data"

# A small valid design; the error cases below each change one thing in it.
BASE = """\
[design]
title = "Base"

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
teeth = 40

[[wheel]]
name = "w2"
arbor = "b"
teeth = 10

[[mesh]]
pair = ["w1", "w2"]
bearing = 0.0
"""


def problems_of(text: str) -> tuple[str, ...]:
    with pytest.raises(DesignError) as info:
        loads_design(text, "base.toml")
    return tuple(str(p) for p in info.value.problems)


def test_base_design_loads():
    d = loads_design(BASE, "base.toml")
    assert d.title == "Base"
    assert [a.name for a in d.arbors] == ["a", "b"]
    assert d.drive.period_s == 3600  # derived: 1 h = 3600 s


def test_worked_example_of_the_format_document_loads():
    # tests/data/two_stage.toml is the worked example printed in docs/format.md
    d = load_design(DATA / "two_stage.toml")
    assert d.title == "Two-stage 12:1 reduction"
    assert d.name == "two_stage"
    assert [w.teeth for w in d.wheels] == [12, 48, 10, 30]
    assert d.wheel("wheel_b").spokes == 4
    assert d.targets[0].period_s == 12 * 3600  # derived: 12 h in seconds
    assert d.targets[0].sense == "ccw"
    assert len(d.sha256) == 64


def test_worked_example_is_the_one_in_the_docs():
    # the document must show the very file the test loads, so that it stays true
    doc = (Path(__file__).parents[1] / "docs" / "format.md").read_text(encoding="utf-8")
    example = (DATA / "two_stage.toml").read_text(encoding="utf-8")
    body = "\n".join(line for line in example.splitlines() if not line.startswith("#"))
    assert body.strip() in doc


def test_defaults_apply_and_wheel_keys_override():
    text = BASE.replace(
        "[drive]", '[defaults]\nmodule = 0.8\nform = "triangular"\n\n[drive]'
    ).replace("teeth = 10", "teeth = 10\nmodule = 1.5")
    d = loads_design(text, "base.toml")
    assert d.wheel("w1").module == 0.8
    assert d.wheel("w1").form == "triangular"
    assert d.wheel("w2").module == 1.5


def test_documented_defaults():
    # derived: the defaults docs/format.md promises; ISO 53:1998 type A rack for the
    # tooth proportions (addendum 1.00 m, dedendum 1.25 m, root radius 0.38 m; from
    # memory, docs/references.md section 8)
    d = loads_design(BASE, "base.toml")
    w = d.wheel("w1")
    assert (w.module, w.form, w.pressure_angle_deg, w.face_width) == (
        1.0,
        "involute",
        20.0,
        3.0,
    )
    assert (w.addendum, w.dedendum, w.root_radius) == (1.0, 1.25, 0.38)
    assert (w.tip_radius, w.hub_diameter, w.hub_length, w.spokes) == (0.0, 0.0, 0.0, 0)
    assert (w.bore, w.rim, w.seat, w.backlash, w.shift) == (
        None,
        None,
        "round",
        0.05,
        0.0,
    )
    assert d.process.kind == "mill" and d.process.fit == "H7/g6"
    assert d.drive.sense == "ccw"
    assert d.frame is None


def test_extra_keys_of_this_project_are_read():
    text = (
        BASE.replace(
            "teeth = 10",
            "teeth = 10\naddendum = 0.9\ndedendum = 1.4\nroot_radius = 0.3\n"
            "tip_radius = 0.1\nhub_diameter = 6.0\nhub_length = 4.0",
        )
        + """
[process]
min_wall = 0.8
min_module_hand = 0.6
min_layers = 5

[[stock]]
outside = 6.0
inside = 4.0

[[target]]
arbor = "b"
turns = "4"
tolerance = "30 s"
"""
    )
    d = loads_design(text, "base.toml")
    w = d.wheel("w2")
    assert (w.addendum, w.dedendum, w.root_radius, w.tip_radius) == (0.9, 1.4, 0.3, 0.1)
    assert (w.hub_diameter, w.hub_length) == (6.0, 4.0)
    assert (d.process.min_wall, d.process.min_module_hand, d.process.min_layers) == (
        0.8,
        0.6,
        5,
    )
    assert (d.stock[0].outside, d.stock[0].inside) == (6.0, 4.0)
    t = d.targets[0]
    assert t.turns == 4 and t.tolerance_s == 30 and t.tolerance_ppm is None


@pytest.mark.parametrize(
    ("written", "ppm", "seconds"),
    [
        (None, 1.0, None),  # the documented default: 1 ppm
        ('"20 ppm"', 20.0, None),
        ('"0.5 ppm"', 0.5, None),
        ('"30 s"', None, Fraction(30)),
        ('"2 min"', None, Fraction(120)),
        ('"0 s"', None, Fraction(0)),
    ],
)
def test_tolerance_forms(written, ppm, seconds):
    line = "" if written is None else f"tolerance = {written}\n"
    text = BASE + f'\n[[target]]\narbor = "b"\nperiod = "15 min"\n{line}'
    t = loads_design(text, "base.toml").targets[0]
    assert (t.tolerance_ppm, t.tolerance_s) == (ppm, seconds)


def test_period_is_read_exactly():
    text = BASE + '\n[[target]]\narbor = "b"\nperiod = "27.321661 d"\n'
    t = loads_design(text, "base.toml").targets[0]
    # derived: 27.321661 d * 86400 s/d, kept as an exact decimal
    assert t.period_s == Fraction("27.321661") * 86400


def test_yr_is_the_julian_year():
    # train-format.md: yr = 365.25 d
    text = BASE.replace('period = "1 h"', 'period = "1 yr"')
    assert (
        loads_design(text, "base.toml").drive.period_s == Fraction(36525, 100) * 86400
    )


# --- mistakes -----------------------------------------------------------------------
# (name, change to BASE, fragments that the one problem must contain)
CASES = [
    (
        "bad TOML",
        lambda t: t.replace('title = "Base"', 'title = "Base'),
        ["base.toml", "line 2", "not valid TOML"],
    ),
    (
        "missing required key",
        lambda t: t.replace("teeth = 40\n", ""),
        ['wheel "w1"', "key 'teeth'", "missing", "from 3 to 2000"],
    ),
    (
        "wrong type",
        lambda t: t.replace("teeth = 40", 'teeth = "forty"'),
        ['wheel "w1"', "key 'teeth'", '"forty" (text)', "whole number"],
    ),
    (
        "unknown key with a typo",
        lambda t: t.replace("teeth = 40", "teeth = 40\nface_widht = 3.0"),
        ['wheel "w1"', "key 'face_widht'", "unknown key", "Did you mean 'face_width'?"],
    ),
    (
        "typo of a required key",
        # two problems: the unknown key, and 'teeth' missing
        lambda t: t.replace("teeth = 40", "tooth = 40"),
        ['wheel "w1"', "key 'tooth'", "Did you mean 'teeth'?"],
        2,
    ),
    (
        "unknown name",
        lambda t: t.replace('arbor = "b"\nteeth', 'arbor = "bb"\nteeth'),
        ['wheel "w2"', "key 'arbor'", 'arbor "bb" does not exist', 'Did you mean "b"?'],
    ),
    (
        "duplicate name",
        lambda t: t + '\n[[arbor]]\nname = "w1"\nat = [9.0, 9.0]\n',
        [
            'wheel "w1"',
            "key 'name'",
            "used twice",
            'first used at base.toml, line 29, arbor "w1"',
        ],
    ),
    (
        "name that is not a safe file name",
        lambda t: t + '\n[[arbor]]\nname = "../x"\nat = [9.0, 9.0]\n',
        ['arbor "../x"', "key 'name'", "not a safe file name", "letters, digits"],
    ),
    (
        "reserved name",
        lambda t: t + '\n[[arbor]]\nname = "manifest"\nat = [9.0, 9.0]\n',
        ['arbor "manifest"', "key 'name'", "build's own files"],
    ),
    (
        "too few teeth",
        lambda t: t.replace("teeth = 40", "teeth = 2"),
        ['wheel "w1"', "key 'teeth'", "teeth = 2", "from 3 to 2000"],
    ),
    (
        "too many teeth",
        lambda t: t.replace("teeth = 40", "teeth = 2001"),
        ['wheel "w1"', "key 'teeth'", "teeth = 2001", "from 3 to 2000"],
    ),
    (
        "zero module",
        lambda t: t.replace("teeth = 40", "teeth = 40\nmodule = 0"),
        ['wheel "w1"', "key 'module'", "module = 0", "from 0.05 to 50 mm"],
    ),
    (
        "negative face width",
        lambda t: t.replace("teeth = 40", "teeth = 40\nface_width = -1.5"),
        ['wheel "w1"', "key 'face_width'", "-1.5", "from 0.01 to 2000 mm"],
    ),
    (
        "pressure angle too large",
        lambda t: t.replace("teeth = 40", "teeth = 40\npressure_angle = 40"),
        ['wheel "w1"', "key 'pressure_angle'", "40", "from 10 to 35 degrees"],
    ),
    (
        "pressure angle too small",
        lambda t: t.replace("teeth = 40", "teeth = 40\npressure_angle = 9.5"),
        ['wheel "w1"', "key 'pressure_angle'", "9.5", "from 10 to 35 degrees"],
    ),
    (
        "wheel on an arbor that does not exist",
        lambda t: t.replace('arbor = "a"\nteeth', 'arbor = "nowhere"\nteeth'),
        ['wheel "w1"', "key 'arbor'", 'arbor "nowhere" does not exist', '"a", "b"'],
    ),
    (
        "carried arbor without at",
        lambda t: t + '\n[[arbor]]\nname = "p"\ncarrier = "w1"\n',
        ['arbor "p"', "key 'carrier'", "without 'at'", "at = [x, y]"],
    ),
    (
        "cycle of around",
        lambda t: (
            t + '\n[[arbor]]\nname = "s1"\naround = "s2"\n'
            '\n[[arbor]]\nname = "s2"\naround = "s1"\n'
        ),
        ['arbor "s1"', "key 'around'", "cycle", '"s1" -> "s2" -> "s1"'],
    ),
    (
        "mesh of a wheel with itself",
        lambda t: t.replace('pair = ["w1", "w2"]', 'pair = ["w2", "w2"]'),
        ["the 1st [[mesh]]", "key 'pair'", 'wheel "w2" meshes with itself'],
    ),
    (
        "mesh of two coaxial arbors",
        lambda t: t.replace('name = "b"', 'name = "b"\naround = "a"').replace(
            "bearing = 0.0\n", ""
        ),
        ["the 1st [[mesh]]", "key 'pair'", "share one axis"],
    ),
    (
        "period with an unknown unit",
        lambda t: t.replace('period = "1 h"', 'period = "1 fortnight"'),
        ["[drive]", "key 'period'", "unknown unit 'fortnight'", "s, min, h, d, yr"],
    ),
    (
        "period of the wrong type",
        lambda t: t.replace('period = "1 h"', "period = 3600"),
        ["[drive]", "key 'period'", "3600", '"1 d"'],
    ),
    (
        "unplaceable arbor",
        lambda t: t.replace("bearing = 0.0\n", ""),
        ['arbor "b"', "key 'at'", "cannot be placed", "bearing"],
    ),
    (
        "missing table",
        lambda t: t.replace('[drive]\narbor = "a"\nperiod = "1 h"\n', ""),
        ["[drive]", "missing", "required"],
    ),
    (
        "misspelt table",
        lambda t: (
            t.replace("[[mesh]]", "[[meshes]]")
            .replace('pair = ["w1", "w2"]\nbearing = 0.0\n', 'pair = ["w1", "w2"]\n')
            .replace('name = "b"', 'name = "b"\nat = [50.0, 0.0]')
        ),
        ["key 'meshes'", "unknown key", "Did you mean 'mesh'?"],
    ),
    (
        "unknown process",
        lambda t: t.replace('title = "Base"', 'title = "Base"\nprocess = "laser"'),
        ["[design]", "key 'process'", "'print', 'mill', 'hand'"],
    ),
    (
        "target with period and turns",
        lambda t: t + '\n[[target]]\narbor = "b"\nperiod = "1 h"\nturns = "4"\n',
        ['the 1st [[target]] (arbor "b")', "key 'turns'", "both 'period' and 'turns'"],
    ),
    (
        "bad tolerance",
        lambda t: (
            t + '\n[[target]]\narbor = "b"\nturns = "4"\ntolerance = "5 furlongs"\n'
        ),
        ['the 1st [[target]] (arbor "b")', "key 'tolerance'", "ppm"],
    ),
    (
        "stock with inside larger than outside",
        lambda t: t + "\n[[stock]]\noutside = 4.0\ninside = 5.0\n",
        ["the 1st [[stock]]", "key 'inside'", "smaller than the outside"],
    ),
    (
        "pin and slot on one wheel",
        lambda t: (
            t + '\n[[pinslot]]\nname = "c"\npin = "w2"\nslot = "w2"\n'
            "radius = 5.0\noffset = 0.5\n"
        ),
        ['pinslot "c"', "key 'slot'", "both pin and slot"],
    ),
]


@pytest.mark.parametrize("row", CASES, ids=[c[0] for c in CASES])
def test_each_mistake_is_reported_with_file_item_and_key(row):
    case, change, fragments, count = (*row, 1)[:4]
    problems = problems_of(change(BASE))
    assert len(problems) == count, problems
    text = problems[0]
    for fragment in fragments:
        assert fragment in text, (case, fragment, text)
    for problem in problems:
        assert problem.startswith("base.toml"), problem
        assert "allowed:" in problem


def test_messages_give_the_line_of_the_key():
    text = BASE.replace("teeth = 10", "teeth = 1")
    (problem,) = problems_of(text)
    line = next(i for i, s in enumerate(text.splitlines(), 1) if s == "teeth = 1")
    assert f"line {line}," in problem


def test_all_problems_of_one_pass_are_reported_together():
    text = (
        BASE.replace("teeth = 40", "teeth = 2")  # out of range
        .replace('arbor = "b"\nteeth', 'arbor = "bx"\nteeth')  # unknown arbor
        .replace('period = "1 h"', 'period = "1 hr"')  # unknown unit
        .replace('title = "Base"', 'title = "Base"\ncolour = "red"')  # unknown key
    )
    problems = problems_of(text)
    assert len(problems) == 4, problems
    joined = "\n".join(problems)
    for fragment in ("teeth = 2", 'arbor "bx"', "'hr'", "'colour'"):
        assert fragment in joined
    # w1 is broken (teeth): its mesh must not also say "wheel w1 does not exist"
    assert 'wheel "w1" does not exist' not in joined


def test_design_error_text_lists_every_problem():
    with pytest.raises(DesignError) as info:
        loads_design(
            BASE.replace("teeth = 40", "teeth = 2").replace("teeth = 10", "teeth = 0")
        )
    text = str(info.value)
    assert text.startswith("2 problems in the design file:")
    assert text.count("\n- ") == 2


@pytest.mark.parametrize(
    "junk",
    [
        "a = " + "9" * 5000,  # tomllib raises a plain ValueError for this
        "a = " + "[" * 5000,  # ... and RecursionError for this
        BASE.replace('period = "1 h"', 'period = "1e99999999 s"'),  # a huge integer
        BASE + '[[target]]\narbor = "b"\nturns = "1e99999999"\n',
        BASE + '[[target]]\narbor = "b"\nturns = "4"\ntolerance = "1e999 ppm"\n',
    ],
)
def test_pathological_input_is_a_design_error(junk):
    with pytest.raises(DesignError):
        loads_design(junk, "junk.toml")


@pytest.mark.parametrize(
    "period", ['"1e400 d"', '"0 s"', '"-1 h"', '"1e-9 s"', '"2000000 yr"', '"h"']
)
def test_periods_out_of_range_are_refused(period):
    (problem,) = problems_of(BASE.replace('period = "1 h"', f"period = {period}"))
    assert "key 'period'" in problem


def test_unreadable_file(tmp_path):
    with pytest.raises(DesignError, match="cannot be read"):
        load_design(tmp_path / "absent.toml")
    bad = tmp_path / "latin1.toml"
    bad.write_bytes(b'[design]\ntitle = "caf\xe9"\n')
    with pytest.raises(DesignError, match="not UTF-8"):
        load_design(bad)


# --- properties ---------------------------------------------------------------------
WHEEL_VALUES = {
    # key -> (a valid value, a value outside what is allowed)
    "teeth": (MIN_TEETH, MAX_TEETH + 1),
    "module": (0.5, -0.5),
    "face_width": (2.0, 0.0),
    "pressure_angle": (14.5, 35.5),
    "spokes": (5, 2),
    "backlash": (0.0, -0.01),
    "shift": (0.3, 2.5),
}


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    key=st.sampled_from(sorted(WHEEL_VALUES)),
    which=st.sampled_from(["w1", "w2"]),
)
def test_any_bad_wheel_value_names_the_wheel_and_key(key, which):
    good, bad = WHEEL_VALUES[key]
    teeth = "teeth = 40" if which == "w1" else "teeth = 10"
    if key == "teeth":
        text = BASE.replace(teeth, f"teeth = {bad}")
    else:
        text = BASE.replace(teeth, f"{teeth}\n{key} = {bad}")
    (problem,) = problems_of(text)
    assert f'wheel "{which}"' in problem and f"key '{key}'" in problem
    # and the valid value loads
    fixed = text.replace(f"{key} = {bad}", f"{key} = {good}")
    loads_design(fixed, "base.toml")


@settings(max_examples=40, deadline=None)
@example(name="-:")  # once said only "starts with '-'", hiding the unsafe ':'
@given(
    name=st.text(
        # printable characters only: TOML strings may not hold control characters
        st.characters(min_codepoint=32, blacklist_categories=("Cc", "Cs")),
        min_size=1,
        max_size=12,
    ).filter(lambda s: re.fullmatch(r"[A-Za-z0-9_-]+", s) is None)
)
def test_unsafe_names_are_refused(name):
    quoted = name.replace("\\", "\\\\").replace('"', '\\"')
    text = BASE.replace('name = "w2"', f'name = "{quoted}"')
    problems = problems_of(text)
    assert any("not a safe file name" in p for p in problems), problems


def test_reserved_names_are_listed():
    # docs/format.md lists them; keep the two in step
    doc = (Path(__file__).parents[1] / "docs" / "format.md").read_text(encoding="utf-8")
    for name in RESERVED_NAMES:
        assert f"`{name}`" in doc


def test_triangular_root_rounding_follows_the_form_and_the_cutter():
    # derived: the format's defaults (0.38 m involute, 0.1 m triangular); when milling,
    # the end mill leaves its own radius in the root, so the rounding is at least
    # cutter / 2 (issue rule, no source needed: it is the cutter's geometry).
    tri = BASE.replace("teeth = 10\n", 'teeth = 10\nform = "triangular"\n', 1)
    hand = loads_design(
        tri.replace('title = "Base"', 'title = "Base"\nprocess = "hand"'), "t.toml"
    )
    assert hand.wheel("w2").root_radius == pytest.approx(0.1)
    assert hand.wheel("w1").root_radius == pytest.approx(0.38)
    milled = loads_design(tri + "\n[process]\ncutter = 0.8\n", "t.toml")
    assert milled.wheel("w2").root_radius == pytest.approx(0.4)  # 0.8 / 2 / module 1
    too_small = tri.replace(
        'form = "triangular"\n', 'form = "triangular"\nroot_radius = 0.2\n'
    )
    (message,) = problems_of(too_small + "\n[process]\ncutter = 0.8\n")
    assert (
        'wheel "w2"' in message
        and "root_radius" in message
        and "cutter radius" in message
    )


# --- one name rule, hostile files and numbers -----------------------------------------


@pytest.mark.parametrize(
    ("name", "why"),
    [
        ("sun\n", "control character U+000A"),  # '$' once matched before a newline
        ("-rf", "starts with '-'"),  # a file name read as an option by every tool
        ("x" * 65, "65 characters"),
        ("Uhr_ä", "not a safe file name"),
        ("MANIFEST", "kept for the build's own files"),  # reserved whatever the case
    ],
)
def test_the_name_rule_matches_whole_names(name, why):
    quoted = name.replace("\n", "\\n")
    problems = problems_of(BASE.replace('name = "w2"', f'name = "{quoted}"'))
    assert any(why in p for p in problems), problems


def test_check_and_build_use_one_name_rule():
    # whatever the loader accepts, the build accepts, and the other way round
    from wheelgen.design.names import name_problem
    from wheelgen.export.staging import UnsafeNameError, safe_name

    for name in ["w1", "_x", "a-b", "A9", "-rf", "sun\n", "a.b", "", "x" * 65, "ä"]:
        loads = name_problem(name) is None
        try:
            safe_name(name)
            builds = True
        except UnsafeNameError:
            builds = False
        assert loads == builds, name


def test_names_that_differ_only_in_case_collide():
    # on case-insensitive disks "W1.step" and "w1.step" are one file
    text = BASE.replace('name = "w2"', 'name = "W1"')
    (problem,) = [p for p in problems_of(text) if "case" in p]
    assert '"w1" and "W1" differ only in case' in problem


@pytest.mark.parametrize(
    ("title", "why"),
    [("Clock\\u0007bell", "control character U+0007"), ("x" * 201, "200 characters")],
)
def test_titles_are_one_printable_line(title, why):
    (problem,) = problems_of(BASE.replace('title = "Base"', f'title = "{title}"'))
    assert "key 'title'" in problem and why in problem


@pytest.mark.parametrize(
    ("key", "value", "allowed"),
    [
        ("module", "1e10", "from 0.05 to 50 mm"),
        ("module", "9.2e18", "from 0.05 to 50 mm"),
        ("module", "1e300", "from 0.05 to 50 mm"),
        ("module", "nan", "from 0.05 to 50 mm"),
        ("module", "1" + "0" * 400, "from 0.05 to 50 mm"),  # an int no float holds
        ("face_width", "5e-324", "from 0.01 to 2000 mm"),
        ("rim", "1e308", "from 0.01 to 2000 mm"),
        ("height", "-inf", "from -10000 to 10000 mm"),
        ("backlash", "11", "from 0 to 10 mm"),
    ],
)
def test_hostile_numbers_are_refused_with_the_reason(key, value, allowed):
    text = BASE.replace("teeth = 40\n", f"teeth = 40\nspokes = 4\n{key} = {value}\n")
    (problem,) = problems_of(text)
    assert f"key '{key}'" in problem and allowed in problem and "Why:" in problem


def test_a_wheel_too_large_across_is_refused():
    # derived: 2000 teeth at module 3 is 6006 mm across, past the 5000 mm bound
    text = BASE.replace("teeth = 40\n", "teeth = 2000\nmodule = 3\n")
    (problem,) = problems_of(text)
    assert "6006 mm across" in problem and "at most 5000 mm" in problem


def test_arbor_and_frame_sizes_are_bounded():
    text = BASE.replace('name = "b"\n', 'name = "b"\ndiameter = 1e-300\n')
    text += "\n[frame]\nthickness = 1e308\n"
    problems = problems_of(text)
    assert any("key 'diameter'" in p for p in problems)
    assert any("key 'thickness'" in p for p in problems)


def _chain(count: int, key: str) -> str:
    tables = [f'[[arbor]]\nname = "t0"\n{key} = "a"\n']
    tables += [
        f'[[arbor]]\nname = "t{i}"\naround = "t{i - 1}"\n' for i in range(1, count)
    ]
    return "\n".join(tables)


def test_tubes_nest_at_most_32_deep():
    # derived: 32 is the coaxial_depth bound; the arbor "a" itself is the first member
    assert loads_design(BASE + _chain(31, "around"), "t.toml")
    (problem,) = problems_of(BASE + _chain(32, "around"))
    assert "33 tubes nested on one axis" in problem and 'arbor "t31"' in problem


def test_too_many_tables_are_refused_before_any_work():
    from wheelgen.design.bounds import BOUNDS

    most = int(BOUNDS["arbors"].high)
    text = BASE + "".join(f'[[arbor]]\nname = "x{i}"\n' for i in range(most))
    (problem,) = problems_of(text)
    assert f"{most + 2} [[arbor]] tables" in problem and f"at most {most}" in problem


def test_keys_nested_too_deeply_are_refused_before_parsing():
    (problem,) = problems_of(BASE + "a" + ".b" * 50_000 + " = 1\n")
    assert "dotted key of more than 8 parts" in problem
    (problem,) = problems_of(BASE + "x = " + "[" * 20 + "]" * 20 + "\n")
    assert "nested more than 8 levels deep" in problem


def test_only_regular_files_of_bounded_size_are_read(tmp_path):
    with pytest.raises(DesignError, match="not a regular file"):
        load_design("/dev/null")
    with pytest.raises(DesignError, match="it is a folder"):
        load_design(tmp_path)
    big = tmp_path / "big.toml"
    big.write_bytes(b"#" * (4 * 2**20 + 1))
    with pytest.raises(DesignError, match="at most 4 MiB"):
        load_design(big)


def test_many_mistakes_are_listed_up_to_a_limit():
    text = BASE + "".join(f'[[mesh]]\npair = ["w1", "nope{i}"]\n' for i in range(300))
    with pytest.raises(DesignError) as info:
        loads_design(text, "t.toml")
    problems = info.value.problems
    assert len(problems) == 101 and "more problems, not listed" in str(problems[-1])


def test_the_format_document_gives_every_bounded_range():
    # docs/format.md and the bounds table must tell the same story
    from wheelgen.design.bounds import _show
    from wheelgen.design.settings_tables import PROCESS_KEYS
    from wheelgen.design.train_tables import WHEEL_KEYS

    doc = (Path(__file__).parents[1] / "docs" / "format.md").read_text(encoding="utf-8")
    sections = {s.split("\n", 1)[0]: s for s in doc.split("\n## ")}
    tables = [
        ("`[[wheel]]`", {k: v[2] for k, v in WHEEL_KEYS.items()}),
        ("`[process]`", {k: v[1] for k, v in PROCESS_KEYS.items()}),
    ]
    for heading, checks in tables:
        lines = sections[heading].splitlines()
        for key, check in checks.items():
            bound = getattr(check, "bound", None)
            if bound is None or bound.phrase:
                continue
            (row,) = [line for line in lines if line.startswith(f"| `{key}` |")]
            kind = row.split("|")[2].replace("−", "-")
            assert f"{_show(bound.low)}..{_show(bound.high)}" in kind, (key, kind)
