"""Physical bounds of every number wheelgen reads, in one table, each with its reason.

A design file, a command-line option or a library call may hold any number a float can
hold: ``1e308``, ``5e-324``, ``nan``. Far beyond what a workshop makes, the numbers stop
meaning anything and the work stops being bounded: tooth outlines are sampled in
millimetres, so a module of ``1e10`` takes minutes and gigabytes, and the CAD kernel
cannot make a face ``5e-324`` mm wide. Every such number is refused before any work, by
the :class:`Bound` of its quantity in :data:`BOUNDS`.

The loader (``design/schema.py``), the command line (``cli/_options.py``) and the build
(``export/part_limits.py``) all look their bounds up here, so a limit is written once. This
module imports only the standard library, so every layer may use it.

The table has four parts:

- *sizes and shapes* of the parts, as a design file gives them;
- *periods and rates* of the train;
- *counts* of items in a design and the size of the file itself, which bound the work
  of every check (the checks grow no faster than these counts);
- *command-line options* that are not design quantities (``option.<command>.<name>``).

To add a bound: add a row to :data:`BOUNDS` under the part it belongs to, named after
the quantity (``"module"``) or, for an option of one command only,
``"option.<command>.<name>"``; give both ends, the unit and the reason in one sentence a
user can act on; then look it up with :func:`bound` where the number is read.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

__all__ = ["BOUNDS", "Bound", "bound"]

Number = int | float | Fraction


def _show(value: Number) -> str:
    """A bound's end as people write it: ``2000``, ``0.05``, ``1e-06``."""
    if isinstance(value, Fraction) and value.denominator != 1:
        value = float(value)
    number = float(value)
    if number.is_integer() and abs(number) < 1e9:
        return str(int(number))
    return f"{number:g}"


@dataclass(frozen=True, slots=True)
class Bound:
    """The smallest and largest value of one quantity, its unit and why.

    ``low`` and ``high`` are both allowed, except ``low`` when ``above_low`` (a length
    that must be more than 0). ``or_zero`` also allows 0 below ``low`` (a hub of
    diameter 0 is no hub). ``whole`` asks for a whole number. ``phrase`` replaces the
    generated "a number from ... to ..." where the ends read better in other units.
    """

    low: Number
    high: Number
    unit: str
    reason: str
    whole: bool = False
    above_low: bool = False
    or_zero: bool = False
    phrase: str = ""

    def holds(self, value: object) -> bool:
        """Is ``value`` a finite number (whole, if asked) within the bound?"""
        if isinstance(value, bool) or not isinstance(value, (int, float, Fraction)):
            return False
        if isinstance(value, float) and not math.isfinite(value):
            return False
        if self.whole and not (isinstance(value, int) or float(value).is_integer()):
            return False
        if self.or_zero and value == 0:
            return True
        above = value > self.low if self.above_low else value >= self.low
        return above and value <= self.high

    def allowed(self) -> str:
        """What the bound allows, in words: ``"a number from 0.05 to 50 mm"``."""
        if self.phrase:
            return self.phrase
        kind = "a whole number" if self.whole else "a number"
        unit = f" {self.unit}" if self.unit else ""
        low, high = _show(self.low), _show(self.high)
        if self.above_low:
            text = f"{kind} more than {low} and at most {high}{unit}"
        else:
            text = f"{kind} from {low} to {high}{unit}"
        return f"0, or {text}" if self.or_zero else text

    def problem(self, value: object) -> str | None:
        """``None`` when ``value`` holds, else what is allowed (for a message)."""
        return None if self.holds(value) else self.allowed()


# Seconds in a Julian year (derived: 365.25 * 86400), for the period bounds.
_YEAR_S = Fraction(36525 * 864)

#: Levels of keys and lists a train file may nest (it needs three).
_NESTING = 8

_SIZE_REASON = (
    "0.01 mm is finer than any workshop process holds (and still far above the CAD "
    "kernel's own tolerance of 1e-7 mm); 2 m is larger than any part of a model or "
    "a turret clock"
)

#: Every bound, by quantity. Rows are grouped as the module docstring says.
BOUNDS: dict[str, Bound] = {
    # -- sizes and shapes of the parts (design file; `wheelgen gear`) ------------------
    "module": Bound(
        0.05, 50, "mm",
        "0.05 mm is about the finest module cut for instruments and watches; a wheel "
        "of more than 50 mm module is industrial gearing, and tooth outlines are "
        "sampled in millimetres, so larger wheels only cost work (common practice, "
        "no source)",
    ),
    # the module's bound in teeth per inch of pitch diameter (derived: 25.4 / m)
    "diametral_pitch": Bound(
        Fraction(127, 250), 508, "teeth per inch", "the same wheels as a module of "
        "0.05 to 50 mm (diametral pitch = 25.4 / module)",
    ),
    "teeth": Bound(
        3, 2000, "", "fewer than 3 teeth cannot turn a mate; 2000 teeth is more than "
        "the largest count a dividing head or a printer reproduces usefully",
        whole=True,
    ),
    "wheel_diameter": Bound(
        0, 5000, "mm", "a wheel more than 5 m across (module times teeth, plus the "
        "teeth) fits no workshop machine, printer bed or floor",
    ),
    "size": Bound(0.01, 2000, "mm", _SIZE_REASON),
    "size_or_zero": Bound(0.01, 2000, "mm", _SIZE_REASON, or_zero=True),
    "play": Bound(
        0, 10, "mm", "running play and clearance are tenths of a millimetre; 10 mm is "
        "a gap, not a fit",
    ),
    "position": Bound(
        -10_000, 10_000, "mm", "a frame larger than 10 m is no model; within it a "
        "position keeps a precision far below a micrometre",
    ),
    "bearing": Bound(
        -360, 360, "degrees", "a direction: -360 to 360 degrees covers every way of "
        "writing it",
    ),
    "reading": Bound(
        -100_000, 100_000, "", "a reading on a dial, in its own units (hours, days, "
        "degrees or a label's number): a hundred thousand is more than any dial shows",
    ),
    "pressure_angle": Bound(
        10, 35, "degrees", "involute teeth outside 10 to 35 degrees are undercut or "
        "pointed at any practical tooth count",
    ),
    "tooth_angle": Bound(
        20, 120, "degrees", "a triangular tooth narrower than 20 degrees breaks, one "
        "wider than 120 degrees no longer drives",
    ),
    "shift": Bound(
        -1, 2, "", "profile shift coefficients beyond -1 to 2 give undercut or pointed "
        "teeth",
    ),
    "addendum": Bound(
        0.1, 2, "modules", "teeth shorter than 0.1 or longer than 2 modules above the "
        "pitch circle do not mesh",
    ),
    "dedendum": Bound(
        0.1, 3, "modules", "tooth spaces shallower than 0.1 or deeper than 3 modules "
        "below the pitch circle leave no tooth root or no wheel",
    ),
    "root_radius": Bound(
        0, 1, "modules", "a root rounding of more than a module does not fit a space",
    ),
    "tip_radius": Bound(
        0, 1, "modules", "a tip rounding of more than a module does not fit a tooth",
    ),
    "spokes": Bound(
        3, 8, "", "fewer than 3 spokes do not hold a rim true; more than 8 leave "
        "windows too small to cut", whole=True, or_zero=True,
        phrase="0 (solid web) or a whole number from 3 to 8",
    ),
    # the frame
    "pillars": Bound(
        3, 12, "pillars", "three pillars hold two plates parallel; a frame needs no "
        "more than twelve", whole=True,
    ),
    "frame_corners": Bound(
        3, 1000, "corners", "a plate's outline of a thousand corners is already a "
        "drawn curve; every check of the outline compares its sides in pairs",
        whole=True,
    ),
    # process limits
    "nozzle": Bound(
        0.05, 5, "mm", "printer nozzles are made from about 0.1 to 2 mm (common "
        "practice, no source)",
    ),
    "layer": Bound(
        0.01, 2, "mm", "printed layers are from about 0.025 mm (resin) to 1 mm "
        "(common practice, no source)",
    ),
    "cutter": Bound(
        0.05, 50, "mm", "end mills for profiles are sold from about 0.1 to 25 mm "
        "(common practice, no source)",
    ),
    "centre_tolerance": Bound(
        0.0001, 10, "mm", "an arbor hole is placed to a few hundredths of a "
        "millimetre; 0.1 micrometre is beyond any measuring tool in a workshop",
    ),
    "min_layers": Bound(
        1, 100, "layers", "a face of at least 1 and at most 100 layers", whole=True,
    ),
    "bed": Bound(
        20, 2000, "mm", "printer beds are made from about 100 mm (small desk "
        "printers) to a metre or two (large-format machines); below 20 mm no part of a "
        "train fits (common practice, no source)",
    ),
    # -- periods and rates ----------------------------------------------------------------
    "period_s": Bound(
        Fraction(1, 10**6), 10**6 * _YEAR_S, "s", "beyond a microsecond and a "
        "million years a float cannot hold the derived rates and periods of a long "
        "train", phrase="from 1e-6 s to 1e6 yr",
    ),
    "turns": Bound(
        Fraction(1, 10**12), Fraction(10**12), "", "a train of at most a few dozen "
        "stages turns within 1e-12 to 1e12 of its drive", phrase="from 1e-12 to 1e12",
    ),
    "tolerance_ppm": Bound(
        0, 10**6, "ppm", "1e6 ppm is an error as large as the period itself",
    ),
    # -- counts: the size of a design and of its file -----------------------------------
    # The checks' work grows with these counts (no faster than linearly, measured by
    # benchmarks/bench_large_train.py); a larger train is refused, not ground through.
    "arbors": Bound(
        1, 2000, "arbors", "the largest geared mechanisms have a few hundred arbors; "
        "2000 keeps every check within seconds",
    ),
    "wheels": Bound(0, 4000, "wheels", "two wheels on each of 2000 arbors"),
    "meshes": Bound(0, 4000, "meshes", "two meshes for each of 2000 arbors"),
    "pinslots": Bound(
        0, 200, "couplings", "a pin-and-slot coupling serves one uneven output; 200 is "
        "far more than any mechanism has",
    ),
    "targets": Bound(0, 2000, "targets", "at most one target for each arbor"),
    "stock": Bound(0, 1000, "tubes", "a shelf of 1000 tube sizes is more than any "
        "supplier lists"),
    "hands": Bound(0, 2000, "hands", "at most one hand on each arbor"),
    "dials": Bound(0, 2000, "dials", "at most one dial for each arbor"),
    "pillar_tables": Bound(
        0, 64, "pillars", "pillars placed by hand: a frame of more than 64 is a "
        "wall",
    ),
    "coaxial_depth": Bound(
        1, 32, "tubes", "each tube on an axis adds two walls and a running clearance; "
        "real mechanisms nest fewer than a dozen",
    ),
    "carrier_depth": Bound(
        1, 8, "carriers", "a carried arbor on a wheel that itself rides on a carrier, "
        "and so on: three levels are rare, eight are none",
    ),
    "name_length": Bound(1, 64, "characters", "names become file names of parts"),
    "title_length": Bound(
        0, 200, "characters", "the title heads every sheet and drawing",
    ),
    "file_bytes": Bound(
        0, 4 * 2**20, "bytes", "the largest train allowed is well under 1 MB of "
        "TOML; a larger file is not a train file", phrase="at most 4 MiB",
    ),
    "nesting": Bound(
        1, _NESTING, "levels", "the train format nests at most three levels ([[wheel]], "
        "at = [x, y]); deeper keys or lists are never a train file",
        whole=True, phrase=f"at most {_NESTING} levels deep",
    ),
    # -- command-line options that are not design quantities ------------------------------
    "option.build.jobs": Bound(
        1, 64, "processes", "each process holds a CAD kernel of several hundred MB",
        whole=True,
    ),
    "option.build.tolerance": Bound(
        0.0005, 1, "mm", "finer STL/3MF meshes than 0.5 micrometre only grow the "
        "files; coarser than 1 mm loses the teeth",
    ),
    "option.motion.turns": Bound(
        0, 10**6, "turns", "a million turns or cycles is more than any plot shows",
        above_low=True,
    ),
    "option.motion.samples": Bound(
        2, 100_000, "samples", "100000 rows per arbor is more than a plot or a "
        "spreadsheet shows, and keeps the table in memory", whole=True,
    ),
    "option.motion.table": Bound(
        1, 2_000_000, "values", "samples times arbors in a CSV table or a plot: two "
        "million values is more than a spreadsheet opens", whole=True,
    ),
    "option.ratio.stages": Bound(
        1, 4, "stages", "four stages of counts up to 150 already come within 1e-9 ppm "
        "of any ratio; a fifth would only cost time (the search grows with n**5)",
        whole=True,
    ),
    "option.ratio.top": Bound(
        1, 10_000, "trains", "10000 rows are more than anyone reads, and the cost of "
        "the list grows with its length", whole=True,
    ),
    "option.ratio.shift_sum": Bound(
        0, 2, "", "the train format allows a shift of 2 per wheel, but more than 1 per "
        "wheel points the tips of the small wheels a motion work uses (common "
        "practice, no source)",
    ),
    "option.ratio.target_chars": Bound(
        1, 40, "characters", "40 characters of number hold any measured ratio; a longer "
        "number would first be built as a huge integer", whole=True,
    ),
    "option.ratio.target_exponent": Bound(
        0, 30, "", "a target is a ratio of turns the train format can hold; 10**30 "
        "reaches far past it, so a larger exponent is refused before any arithmetic",
        whole=True,
    ),
    "option.index.divisions": Bound(
        2, 10_000, "divisions", "a dividing head is read to one hole space: beyond "
        "10000 divisions the steps are too small to set", whole=True,
    ),
    "option.index.ratio": Bound(
        1, 1000, "", "worm dividing heads and rotary tables are made from about "
        "4:1 to 360:1 (common practice, no source)", whole=True,
    ),
    "option.index.holes": Bound(
        2, 1000, "holes", "index plates carry circles of about 15 to 400 holes "
        "(common practice, no source)", whole=True,
    ),
    "option.index.circles": Bound(
        1, 100, "circles", "a set of index plates has a few dozen circles at most",
        whole=True,
    ),
    "option.index.gear_teeth": Bound(
        8, 1000, "teeth", "change gears are made from about 20 to 130 teeth (common "
        "practice, no source)", whole=True,
    ),
    "option.index.gears": Bound(
        0, 16, "gears", "a set of change gears holds about a dozen; the search tries "
        "every train of up to four of them", whole=True,
    ),
    "option.index.angle": Bound(
        0, 360, "degrees", "one move of the work is less than a turn", above_low=True,
    ),
}  # fmt: skip


def bound(name: str) -> Bound:
    """The bound of quantity ``name``; a ``KeyError`` names the known ones."""
    try:
        return BOUNDS[name]
    except KeyError:
        raise KeyError(
            f"no bound called {name!r}; known: {', '.join(sorted(BOUNDS))}"
        ) from None
