"""Solids: every part of the plan as a cadquery solid (the only layer with the kernel).

The names below are imported lazily, so ``import wheelgen.solids`` alone does not start
the CAD kernel. The flat profile every wheel solid is extruded from is plain numbers and
lives in :mod:`wheelgen.layout.wheel_profile`.
"""

from __future__ import annotations

from typing import Any

__all__ = [
    "CadBuildError",
    "design_assembly",
    "design_parts",
    "make_arbor",
    "make_bearing",
    "make_cock",
    "make_crank",
    "make_dial",
    "make_hand",
    "make_knob",
    "make_part",
    "make_pillar",
    "make_plate",
    "make_screw",
    "make_pin",
    "make_sleeve",
    "make_wheel",
]

_WHERE = {
    "make_part": ".part",
    "design_parts": ".part",
    "design_assembly": ".part",
    "make_wheel": ".wheel",
    "make_arbor": ".arbor",
    "make_hand": ".display",
    "make_dial": ".display",
    "make_knob": ".display",
    "make_crank": ".display",
    "make_sleeve": ".sleeve",
    "make_pin": ".pin",
    "make_plate": ".frame",
    "make_pillar": ".frame",
    "make_cock": ".frame",
    "make_screw": ".frame",
    "make_bearing": ".frame",
    "CadBuildError": ".profile",
}


def __getattr__(name: str) -> Any:
    if name in _WHERE:
        from importlib import import_module

        return getattr(import_module(_WHERE[name], __name__), name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
