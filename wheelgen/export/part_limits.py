"""What the build refuses of planned parts before the CAD kernel runs: names that
are not plain file names or that one disk takes for one, and sizes beyond the bounds.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence
from typing import Any

from ..design.bounds import BOUNDS
from ..design.names import name_key
from ..layout.part_kinds import Part
from .staging import UnsafeNameError, safe_name

__all__ = ["PartSizeError", "check_part_names", "check_part_sizes"]


def check_part_names(parts: Sequence[Part]) -> None:
    """The name rule on every part, and no two names one file on any disk."""
    seen: dict[str, str] = {}
    for p in parts:
        safe_name(p.name)
        key = name_key(p.name)
        if key in seen:
            same = seen[key] == p.name
            raise UnsafeNameError(
                f"two parts are called {p.name!r}; part names must differ"
                if same
                else f"parts {seen[key]!r} and {p.name!r} differ only in case: on a "
                "case-insensitive disk their files are one; rename one of them"
            )
        seen[key] = p.name


class PartSizeError(ValueError):
    """A planned part has a size the CAD kernel cannot make (out of its bounds)."""


def check_part_sizes(parts: Sequence[Part]) -> None:
    """Refuse, before the kernel runs, a part with a size beyond the bounds table.

    The loader bounds every key of a design; this catches what follows from them (and
    parts handed in by a script): every number of a part must be finite and within
    the ``position`` bound, its main sizes within ``size``, its module and teeth within
    theirs.
    """
    for p in parts:
        for path, value in _numbers(p):
            limit = BOUNDS[_PART_BOUND.get(path, "position")]
            if not limit.holds(value):
                raise PartSizeError(
                    f"part {p.name!r}: {path} = {value!r}; allowed: "
                    f"{limit.allowed()}. Why: {limit.reason}"
                )


# Part fields with a bound of their own; every other number is a position.
_PART_BOUND = {
    **dict.fromkeys(
        ("face_width", "bore", "diameter", "length", "inside", "outside", "thickness"),
        "size",
    ),
    "tooth.module": "module",
    "tooth.teeth": "teeth",
}


def _numbers(value: Any, path: str = "") -> list[tuple[str, int | float]]:
    """Every number of a part (its placement and tooth spec too), by dotted path."""
    out: list[tuple[str, int | float]] = []
    if dataclasses.is_dataclass(value) and not isinstance(value, type):
        for f in dataclasses.fields(value):
            out += _numbers(getattr(value, f.name), f"{path}.{f.name}".lstrip("."))
    elif isinstance(value, (tuple, list)):
        for k, item in enumerate(value):
            out += _numbers(item, f"{path}[{k}]")
    elif isinstance(value, (int, float)) and not isinstance(value, bool):
        out.append((path, value))
    return out
