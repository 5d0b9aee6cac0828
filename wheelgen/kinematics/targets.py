"""Targets: the period an arbor must have, how close the train comes, and the drift."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from ..design.model import Design, Target
from ..design.periods import UNIT_SECONDS, as_float
from .rates import TrainSolution

__all__ = ["TargetResult", "evaluate_targets", "arbor_period", "arbor_sense"]

_YEAR_S = UNIT_SECONDS["yr"]


@dataclass(frozen=True, slots=True)
class TargetResult:
    """One target's verdict. Periods in seconds (exact where they are known)."""

    target: Target
    wanted_s: Fraction | None  # None for a 'turns' target on a drive without period
    got_s: Fraction | None  # None when the arbor does not turn or is undriven
    wanted_turns: Fraction  # turns per drive turn, magnitude
    got_turns: Fraction | None  # signed turns per drive turn
    error_ppm: float | None  # (got period - wanted period) / wanted period * 1e6
    drift_deg_per_year: (
        float | None
    )  # got angle - wanted angle after one year (365.25 d)
    sense_ok: bool
    met: bool

    @property
    def arbor(self) -> str:
        return self.target.arbor


def arbor_period(design: Design, rate: Fraction | None) -> Fraction | None:
    """Seconds per turn of an arbor turning ``rate`` times per drive turn (None if still)."""
    if rate is None or rate == 0:
        return None
    return design.drive.period_s / abs(rate)


def arbor_sense(design: Design, rate: Fraction | None) -> str:
    """'ccw', 'cw' or 'still', seen from the front."""
    if rate is None:
        return "undriven"
    if rate == 0:
        return "still"
    same = rate > 0
    if design.drive.sense == "ccw":
        return "ccw" if same else "cw"
    return "cw" if same else "ccw"


def evaluate_targets(design: Design, solution: TrainSolution) -> list[TargetResult]:
    out = []
    drive_s = design.drive.period_s
    for t in design.targets:
        rate = solution.rate(t.arbor)
        if t.turns is not None:
            wanted_turns = t.turns
        else:
            assert t.period_s is not None  # the loader insists on one of the two
            wanted_turns = drive_s / t.period_s
        wanted_s = drive_s / wanted_turns
        got_s = arbor_period(design, rate)
        error_ppm = drift = None
        if got_s is not None:
            error_ppm = as_float((got_s - wanted_s) / wanted_s * 1_000_000)
            # rates in turns per second; their difference over a year, in degrees
            drift = as_float((1 / got_s - 1 / wanted_s) * _YEAR_S * 360)
        sense = arbor_sense(design, rate)
        sense_ok = t.sense == "either" or sense == t.sense
        met = False
        if got_s is not None and error_ppm is not None:
            if t.tolerance_s is not None:
                within = abs(got_s - wanted_s) <= t.tolerance_s
            else:
                tol = t.tolerance_ppm if t.tolerance_ppm is not None else 1.0
                # exact comparison: |got - wanted| * 1e6 <= tol * wanted; str() so that
                # "0.1 ppm" is 1/10, not the nearest binary float
                within = (
                    abs(got_s - wanted_s) * 1_000_000 <= Fraction(str(tol)) * wanted_s
                )
            met = within and sense_ok
        out.append(
            TargetResult(
                t, wanted_s, got_s, wanted_turns, rate, error_ppm, drift, sense_ok, met
            )
        )
    return out
