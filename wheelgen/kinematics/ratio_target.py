"""A wanted train ratio, read from text: ``"254/19"``, ``"13.36842"`` or two periods.

Ratio means *turns of the output per turn of the input* throughout the ratio search
(for a compound train: product of driver teeth / product of driven teeth).
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from fractions import Fraction

from ..design.periods import UNIT_SECONDS, parse_period
from ..design.train_tables import MAX_TURNS, MIN_TURNS
from .ratio_search import MAX_TARGET_CHARS, MAX_TARGET_EXPONENT

__all__ = ["RatioTarget", "parse_target", "YEAR_S"]

#: The year used for drift figures: 365.25 d in seconds (derived: 365.25 * 86400).
YEAR_S: Fraction = UNIT_SECONDS["yr"]

_INTEGER_OR_FRACTION = re.compile(r"^\s*(\d+)\s*(?:/\s*(\d+))?\s*$")
_DECIMAL = re.compile(r"^\s*(?:\d+\.\d*|\.\d+|\d+(?:\.\d*)?[eE][+-]?\d+)\s*$")
_PER = re.compile(r"\s+per\s+", re.IGNORECASE)


@dataclass(frozen=True, slots=True)
class RatioTarget:
    """A wanted ratio, kept exact.

    ``value`` is turns of the output per turn of the input. ``exact`` is true when it
    was written as a whole number or a fraction: then only an equal ratio meets it.
    Decimals and periods are measured values: the search looks for the closest.
    ``output_period_s`` and ``input_period_s`` (seconds) are set for period targets.
    """

    value: Fraction
    exact: bool
    text: str
    output_period_s: Fraction | None = None
    input_period_s: Fraction | None = None

    @property
    def is_period(self) -> bool:
        return self.output_period_s is not None

    def drift_deg_per_yr(self, ratio: Fraction) -> float | None:
        """How fast a train of ``ratio`` runs away from the wanted output, degrees/year.

        Positive when the output runs fast. ``None`` for targets without periods.
        drift = 360 * (1/got_period - 1/wanted_period) * year, with
        got_period = input_period / ratio (derived: rates in turns per second).
        """
        if self.output_period_s is None or self.input_period_s is None:
            return None
        got_rate = Fraction(ratio) / self.input_period_s
        wanted_rate = 1 / self.output_period_s
        return float(360 * (got_rate - wanted_rate) * YEAR_S)


def parse_target(text: str) -> RatioTarget:
    """Read a target ratio.

    Forms accepted:

    - ``"254/19"`` or ``"12"``: an exact ratio (turns of output per turn of input);
    - ``"13.36842"`` (or ``"1.2e1"``): a decimal, read exactly but treated as measured;
    - ``"27.321661 d per 365.2422 d"``: the output's period per the input's period,
      i.e. the output turns ``365.2422 / 27.321661`` times per turn of the input.
      Units as in the train format: s, min, h, d, yr.

    Raises ``ValueError`` with what is allowed when the text is none of these.
    """
    if not isinstance(text, str) or not text.strip():
        raise ValueError(
            'the target is empty; write e.g. "254/19", "13.368" or '
            '"27.321661 d per 365.2422 d"'
        )
    parts = _PER.split(text.strip())
    if len(parts) == 1:
        _check_number_text(text)
    if len(parts) == 2:
        output_s = parse_period(parts[0])
        input_s = parse_period(parts[1])
        return RatioTarget(
            value=_in_range(input_s / output_s, text),
            exact=False,
            text=text.strip(),
            output_period_s=output_s,
            input_period_s=input_s,
        )
    if len(parts) > 2:
        raise ValueError(f"{text!r}: 'per' may appear once ('<period> per <period>')")
    match = _INTEGER_OR_FRACTION.match(text)
    if match is not None:
        num = int(match.group(1))
        den = int(match.group(2) or 1)
        if num == 0 or den == 0:
            raise ValueError(f"{text!r}: the ratio must be positive and finite")
        value = _in_range(Fraction(num, den), text)
        return RatioTarget(value=value, exact=True, text=text.strip())
    if _DECIMAL.match(text):
        value = Fraction(text.strip())
        if value <= 0:
            raise ValueError(f"{text!r}: the ratio must be positive")
        return RatioTarget(value=_in_range(value, text), exact=False, text=text.strip())
    raise ValueError(
        f'{text!r} is not a target; allowed: a fraction "254/19", a whole number, '
        'a decimal "13.36842", or two periods "27.321661 d per 365.2422 d" '
        "(units s, min, h, d, yr)"
    )


def _check_number_text(text: str) -> None:
    """Refuse numbers too long to be typed on purpose before reading them."""
    if len(text.strip()) > MAX_TARGET_CHARS:
        raise ValueError(
            f"{text.strip()[:20]!r}... has more than {MAX_TARGET_CHARS} characters; "
            "a target needs far fewer (write a fraction or a shorter decimal)"
        )
    exponent = re.search(r"[eE]([+-]?\d+)", text)
    if exponent is not None and abs(int(exponent.group(1))) > MAX_TARGET_EXPONENT:
        raise ValueError(
            f"{text.strip()!r}: a power of ten beyond {MAX_TARGET_EXPONENT}; "
            f"allowed: a ratio from {float(MIN_TURNS):g} to {float(MAX_TURNS):g}"
        )


def _in_range(value: Fraction, text: str) -> Fraction:
    """The wanted turns per turn must lie where a target of the train format may."""
    if not MIN_TURNS <= value <= MAX_TURNS:
        raise ValueError(
            f"{text.strip()!r} is a ratio of {float(value):.3g}; allowed: from "
            f"{float(MIN_TURNS):g} to {float(MAX_TURNS):g} turns of the output per "
            "turn of the input"
        )
    return value
