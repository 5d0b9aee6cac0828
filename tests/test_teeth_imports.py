"""The tooth layer checks its inputs (its imports: tests/test_layers.py)."""

from __future__ import annotations

import pytest

from wheelgen.teeth import ToothSpec


@pytest.mark.parametrize(
    ("kwargs", "message"),
    [
        ({"teeth": 2, "module": 1.0}, "'teeth' must be at least 3, got 2"),
        ({"teeth": 12, "module": 0.0}, "'module' must be > 0 mm"),
        (
            {"teeth": 12, "module": 1.0, "form": "cycloid"},
            "one of 'involute', 'triangular'",
        ),
        (
            {"teeth": 12, "module": 1.0, "pressure_angle_deg": 50.0},
            "from 5 to 35 degrees",
        ),
        ({"teeth": 12, "module": 1.0, "thinning": -0.1}, "'thinning' must be >= 0 mm"),
        ({"teeth": 12, "module": 1.0, "root_radius": -0.1}, "must be >= 0"),
    ],
)
def test_bad_specs_say_what_is_allowed(kwargs, message):
    with pytest.raises(ValueError, match=message.replace("(", r"\(")):
        ToothSpec(**kwargs)


def test_root_radius_too_big_for_the_cutter_names_the_largest():
    from wheelgen.teeth import outline_for

    # derived: a 25 deg cutter of dedendum 1.25 m has a tip half width of
    # pi/4 - 1.25 tan 25 = 0.2023 m, which takes a fillet of at most
    # 0.2023 cos 25 / (1 - sin 25) = 0.3175 m
    with pytest.raises(ValueError, match=r"at most 0\.317"):
        outline_for(ToothSpec(30, 1.0, pressure_angle_deg=25.0))
