"""The fit test coupon of a printed design, as numbers: pins and holes at the design's
running clearance and at steps either side, each labelled in raised digits.

A printer makes holes a little small and pins a little large, by an amount that
depends on the printer, the plastic and the slicer's settings; the coupon shows which
clearance gives a running fit on this printer before the parts are printed. The solid
is made by :mod:`wheelgen.export.fit_test`. Lengths in mm.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

from ..design.model import Design
from ..design.process_limits import PRINT_WALL_LINES
from ..layout.part_kinds import ArborPart, Part
from .print_plan import PART_SPACING

__all__ = ["FIT_STEP", "FIT_STEPS", "FitTestPlan", "digit_bars", "fit_test_plan"]

#: Steps of radial clearance either side of the design's, mm (common practice, no
#: source: a 0.05 mm step is about what one slicer setting changes).
FIT_STEP = 0.05
FIT_STEPS = (-2, -1, 0, 1, 2)


@dataclass(frozen=True, slots=True)
class FitTestPlan:
    """The fit test coupon as numbers (mm).

    Two plates ``plate`` x ``plate_depth`` x ``thickness``, side by side along y: the
    **hole plate** (y from 0) with a hole of ``hole_diameters[i]`` at
    ``(xs[i], hole_y)`` and a plain hole of ``nominal`` at ``(ref_x, hole_y)``; the
    **pin plate** (y from ``pin_plate_y``) with a pin of ``pin_diameters[i]`` at
    ``(xs[i], pin_y)``, ``pin_length`` tall, and a plain pin of ``nominal`` at
    ``(ref_x, pin_y)``. Each is labelled ``labels[i]``: its radial clearance in
    hundredths of a millimetre (``clearances[i]``), in raised digits ``digit_height``
    tall and ``relief`` high just below it; the plain ones read 0. Push the plain pin
    into each hole and each pin into the plain hole: the smallest label that turns freely
    is the clearance this printer needs.
    """

    nominal: float
    clearances: tuple[float, ...]
    hole_diameters: tuple[float, ...]
    pin_diameters: tuple[float, ...]
    labels: tuple[str, ...]
    xs: tuple[float, ...]
    ref_x: float
    hole_y: float
    pin_y: float
    pin_plate_y: float
    plate: float
    plate_depth: float
    thickness: float
    pin_length: float
    digit_height: float
    relief: float


def fit_test_plan(design: Design, parts: Sequence[Part]) -> FitTestPlan:
    """The coupon for ``design``: its most common arbor diameter (3 mm if none) at the
    design's running clearance (``[process] clearance``) and two steps either side.

    The nominal diameter grows where the thinnest pin would otherwise be narrower than
    the two nozzle lines a printed wall needs.
    """
    diameters = [p.diameter for p in parts if isinstance(p, ArborPart)]
    nominal = (
        max(set(diameters), key=lambda d: (diameters.count(d), -d))
        if diameters
        else 3.0
    )
    c = design.process.clearance
    # a step whose label would read 0 (under half a hundredth of a millimetre) could
    # not be told from the plain hole or pin, so it is left out
    clearances = tuple(
        round(c + k * FIT_STEP, 4)
        for k in FIT_STEPS
        if round((c + k * FIT_STEP) * 100) >= 1
    )
    layer = design.process.layer
    nozzle = design.process.nozzle
    # the thinnest pin keeps two nozzle lines across, whatever the clearance
    nominal = max(nominal, 2 * max(clearances) + 2 * PRINT_WALL_LINES * nozzle)
    digit_h = max(5.0, 10 * nozzle)
    pitch = max(nominal + 2 * max(clearances) + 6.0, 1.6 * digit_h + 4.0)
    n = len(clearances) + 1
    xs = tuple(pitch * (k + 1.5) for k in range(len(clearances)))
    ref_x = pitch * 0.5
    plate = pitch * n
    relief = max(3 * layer, 0.6)
    depth = nominal + 2 * max(clearances) + digit_h + 12.0
    return FitTestPlan(
        nominal=nominal,
        clearances=clearances,
        hole_diameters=tuple(nominal + 2 * k for k in clearances),
        pin_diameters=tuple(nominal - 2 * k for k in clearances),
        labels=tuple(f"{round(k * 100):d}" for k in clearances),
        xs=xs,
        ref_x=ref_x,
        hole_y=depth - 4.0 - (nominal / 2 + max(clearances)),
        pin_y=depth + PART_SPACING + depth - 4.0 - nominal / 2,
        pin_plate_y=depth + PART_SPACING,
        plate=plate,
        plate_depth=depth,
        thickness=max(3.0, 10 * layer),
        pin_length=max(6.0, 2 * nominal),
        digit_height=digit_h,
        relief=relief,
    )


# Seven-segment digits: segments a..g as (x0, y0, x1, y1) in a 0..1 x 0..2 cell.
_SEGMENTS = {
    "a": (0.0, 2.0, 1.0, 2.0),
    "b": (1.0, 1.0, 1.0, 2.0),
    "c": (1.0, 0.0, 1.0, 1.0),
    "d": (0.0, 0.0, 1.0, 0.0),
    "e": (0.0, 0.0, 0.0, 1.0),
    "f": (0.0, 1.0, 0.0, 2.0),
    "g": (0.0, 1.0, 1.0, 1.0),
}
_DIGITS = {
    "0": "abcdef",
    "1": "bc",
    "2": "abged",
    "3": "abgcd",
    "4": "fgbc",
    "5": "afgcd",
    "6": "afgedc",
    "7": "abc",
    "8": "abcdefg",
    "9": "abcdfg",
}


def digit_bars(
    text: str, x_mid: float, y_top: float, height: float, stroke: float
) -> list[tuple[float, float, float, float]]:
    """Rectangles ``(x0, y0, x1, y1)`` (mm) that write ``text`` in seven-segment digits
    ``height`` tall, centred on ``x_mid``, their top at ``y_top``; bars ``stroke``
    wide."""
    w = height / 2
    gap = w * 0.6
    total = len(text) * w + (len(text) - 1) * gap
    bars = []
    for k, ch in enumerate(text):
        x0 = x_mid - total / 2 + k * (w + gap)
        y0 = y_top - height
        for seg in _DIGITS[ch]:
            sx0, sy0, sx1, sy1 = _SEGMENTS[seg]
            ax, ay = x0 + sx0 * w, y0 + sy0 * w
            bx, by = x0 + sx1 * w, y0 + sy1 * w
            h = stroke / 2
            bars.append(
                (min(ax, bx) - h, min(ay, by) - h, max(ax, bx) + h, max(ay, by) + h)
            )
    return bars
