"""Command-line numbers checked against the bounds table, with the bound's reason.

click's own ``float`` accepts ``nan``, ``inf`` and ``1e999999`` (which is ``inf``), and
its ``int`` passes Python's message about ``sys.set_int_max_str_digits()`` through. A
:class:`Bounded` option reads the text itself and refuses anything that is not a
finite number within its :data:`~wheelgen.design.bounds.BOUNDS` entry, naming both
ends and why.
"""

from __future__ import annotations

import math
import re
from typing import Any

import click

from ..design.bounds import BOUNDS, Bound
from ..design.units import LENGTH_FORMS, LengthError, parse_length

__all__ = ["Bounded", "Length"]

# A plain decimal number with an optional power of ten; anything longer than this many
# characters is no number a person types (and int() refuses past 4300 digits).
_LONGEST = 40
_WHOLE = re.compile(r"[+-]?\d+")


class Bounded(click.ParamType):  # type: ignore[type-arg]  # generic only in newer click stubs
    """A number option (or argument) within the bound ``name`` of the bounds table."""

    def __init__(self, name: str) -> None:
        self.bound: Bound = BOUNDS[name]
        self.name = "integer" if self.bound.whole else "float"

    def get_metavar(
        self, param: click.Parameter, *args: Any, **kwargs: Any
    ) -> str | None:
        if isinstance(param, click.Argument):
            return None  # an argument shows its own name
        return "INTEGER" if self.bound.whole else "FLOAT"

    def convert(
        self, value: Any, param: click.Parameter | None, ctx: click.Context | None
    ) -> Any:
        if isinstance(value, (int, float)) and not isinstance(value, bool):
            # a default, or a value given in code
            return self._checked(value, repr(value), param, ctx)
        text = str(value).strip()
        if len(text) > _LONGEST:
            self.fail(
                f"{text[: _LONGEST - 3]!r}... is too long to be a number", param, ctx
            )
        try:
            number: int | float = float(text)
        except ValueError:
            self.fail(f"{text!r} is not a number", param, ctx)
        if self.bound.whole:
            if not (math.isfinite(number) and float(number).is_integer()):
                self.fail(f"{text!r} is not a whole number", param, ctx)
            # "40" exactly; "40.0" and "4e1" by way of the float
            number = int(text) if _WHOLE.fullmatch(text) else int(number)
        return self._checked(number, text, param, ctx)

    def _checked(
        self,
        number: int | float,
        shown: str,
        param: click.Parameter | None,
        ctx: click.Context | None,
    ) -> int | float:
        if self.bound.holds(number):
            return number
        self.fail(
            f"{shown} is out of range; allowed: {self.bound.allowed()}. "
            f"Why: {self.bound.reason}.",
            param,
            ctx,
        )


class Length(Bounded):
    """A length option: a number of millimetres, or text with its unit (``"0.108in"``,
    ``"1/8 in"``), read exactly and checked in mm against the bound ``name``."""

    def get_metavar(
        self, param: click.Parameter, *args: Any, **kwargs: Any
    ) -> str | None:
        return None if isinstance(param, click.Argument) else "LENGTH"

    def convert(
        self, value: Any, param: click.Parameter | None, ctx: click.Context | None
    ) -> Any:
        text = value.strip() if isinstance(value, str) else ""
        if not text or _is_float(text):  # a plain number: mm, as Bounded reads it
            return super().convert(value, param, ctx)
        if len(text) > _LONGEST:
            self.fail(
                f"{text[: _LONGEST - 3]!r}... is too long to be a length", param, ctx
            )
        try:
            mm = float(parse_length(text))
        except LengthError as exc:
            self.fail(f"{exc}; write mm as a number, or {LENGTH_FORMS}", param, ctx)
        return self._checked(mm, f"{text} ({mm:g} mm)", param, ctx)


def _is_float(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True
