"""The display tables of the train file: defaults, restyling, and every mistake named."""

from __future__ import annotations

from pathlib import Path

import pytest

from tests._demo import DEMO, DEMO_TEXT
from wheelgen.design import DesignError, load_design, loads_design

ROOT = Path(__file__).resolve().parents[1]


def _problems(extra: str) -> list[str]:
    with pytest.raises(DesignError) as info:
        loads_design(DEMO_TEXT + extra, "demo.toml")
    return [str(p) for p in info.value.problems]


def test_every_target_gets_a_hand_by_default():
    design = load_design(DEMO)
    hands = design.readings()
    assert [h.arbor for h in hands] == [t.arbor for t in design.targets]
    assert all(h.from_target for h in hands)
    assert design.drive_input.kind == "knob" and design.drive_input.side is None


def test_a_hand_table_restyles_the_default_one():
    design = loads_design(
        DEMO_TEXT + '\n[[hand]]\narbor = "tide"\nlength = 30.0\ncounterweight = 6.0\n',
        "demo.toml",
    )
    hands = {h.arbor: h for h in design.readings()}
    assert len(design.readings()) == 3
    assert hands["tide"].length == 30.0 and not hands["tide"].from_target
    assert hands["tide"].counterweight == 6.0


def test_readings_none_keeps_only_the_listed_hands():
    text = DEMO_TEXT.replace(
        '[[dial]]\narbor = "hours"\ngraduations = "hours"\n', ""
    ).replace(
        '[[dial]]\narbor = "tide"\nlabels = ["high water", "ebb", "low water", "flood"]\n',
        "",
    )
    design = loads_design(
        text + '\n[display]\nreadings = "none"\n\n[[hand]]\narbor = "moon_dial"\n',
        "demo.toml",
    )
    assert [h.arbor for h in design.readings()] == ["moon_dial"]


def test_every_file_of_the_first_format_still_loads():
    files = sorted((ROOT / "tests" / "data").rglob("*.toml")) + [DEMO]
    loaded = 0
    for path in files:
        text = path.read_text()
        if "W2_HEIGHT" in text:  # a template filled in by its tests
            continue
        try:
            load_design(path)
        except DesignError as exc:
            # files that are wrong on purpose are wrong for other reasons
            assert not any(
                "hand" in str(p) or "dial" in str(p) for p in exc.problems
            ), path
        loaded += 1
    assert loaded > 20


@pytest.mark.parametrize(
    ("extra", "expected"),
    [
        (
            '\n[[hand]]\narbor = "tide"\nlenght = 3.0\n',
            "unknown key 'lenght'",
        ),
        ('\n[[hand]]\narbor = "stud"\n', 'a hand on the fixed arbor "stud"'),
        ('\n[[hand]]\narbor = "lay"\n\n[[hand]]\narbor = "lay"\n', "a second [[hand]]"),
        ('\n[[hand]]\narbor = "tides"\n', 'arbor "tides" does not exist'),
        ('\n[[dial]]\narbor = "lay"\n', 'a dial for arbor "lay", which has no hand'),
        (
            '\n[[hand]]\narbor = "lay"\n\n[[dial]]\narbor = "lay"\n'
            'graduations = "hours"\nlabels = ["a"]\n',
            'labels with graduations = "hours"',
        ),
        (
            '\n[[hand]]\narbor = "lay"\n\n[[dial]]\narbor = "lay"\n'
            'graduations = "labels"\n',
            'graduations = "labels" without labels',
        ),
        ('\n[input]\nkind = "knob"\nthrow = 20.0\n', "'throw' only with kind"),
        ('\n[input]\nside = "top"\n', "one of 'front', 'back'"),
        ("\n[display]\nhand_gap = 0.0\n", "hand_gap = 0.0"),
        ('\n[[hand]]\narbor = "lay"\nseat = "round"\n', "one of 'square', 'flat'"),
    ],
)
def test_mistakes_name_the_item_and_key(extra: str, expected: str) -> None:
    problems = _problems(extra)
    assert any(expected in p for p in problems), problems
    assert all("demo.toml" in p for p in problems)


def test_the_line_of_the_mistake_is_given():
    extra = '\n[[hand]]\narbor = "tide"\nlength = -3.0\n'
    (problem,) = _problems(extra)
    line = DEMO_TEXT.count("\n") + 4  # derived: the 'length' line of the table added
    assert f"line {line}" in problem and "key 'length'" in problem


def test_a_part_name_the_display_needs_is_refused_elsewhere():
    text = DEMO_TEXT.replace('name = "lay"  ', 'name = "hand_tide"  ').replace(
        'arbor = "lay"\n', 'arbor = "hand_tide"\n'
    )
    with pytest.raises(DesignError) as info:
        loads_design(text, "demo.toml")
    assert any('"hand_tide"' in str(p) for p in info.value.problems)
