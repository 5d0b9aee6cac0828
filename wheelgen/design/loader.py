"""Read a train file (TOML, version 1) into a checked, immutable :class:`Design`.

The file is data: parsed with :mod:`tomllib`, never executed. Every problem found is
collected and raised together as one :class:`DesignError`, each naming the file, the
line where it can be found, the item (``wheel "w3"``, ``the 2nd [[mesh]]``) and the key.
"""

from __future__ import annotations

import difflib
import hashlib
import json
import math
import os
import re
import stat
import tomllib
from fractions import Fraction
from pathlib import Path
from typing import Any, Callable

from .bounds import BOUNDS, Bound
from .diametral_pitch import inch_rack, module_of_dp, pitch_words
from .errors import DesignError, Problem
from .model import (
    Arbor,
    Design,
    Drive,
    Frame,
    Mesh,
    PillarSpec,
    PinSlot,
    Process,
    Stock,
    Target,
    Wheel,
    Where,
    axis_root_of,
)
from .names import (
    NAME_ALLOWED,
    RESERVED_NAMES,
    control_characters,
    design_name,
    name_key,
    name_problem,
)
from .periods import UNIT_SECONDS, PeriodError, parse_number, parse_period
from .screws import SCREWS
from .tooth_defaults import milled_root_radius, tooth_defaults
from .units import LENGTH_FORMS, UNITS, LengthError, Units, parse_length

__all__ = [
    "load_design",
    "loads_design",
    "MIN_TEETH",
    "MAX_TEETH",
    "RESERVED_NAMES",
    "TABLE_BOUNDS",
]

MIN_TEETH = int(BOUNDS["teeth"].low)
MAX_TEETH = int(BOUNDS["teeth"].high)
#: How many tables of each kind a file may hold: the bound that limits each count.
TABLE_BOUNDS = {
    "arbor": BOUNDS["arbors"],
    "wheel": BOUNDS["wheels"],
    "mesh": BOUNDS["meshes"],
    "pinslot": BOUNDS["pinslots"],
    "target": BOUNDS["targets"],
    "stock": BOUNDS["stock"],
    "pillar": BOUNDS["pillar_tables"],
    "hand": BOUNDS["hands"],
    "dial": BOUNDS["dials"],
}

TOP_KEYS = (
    "design",
    "defaults",
    "process",
    "frame",
    "drive",
    "arbor",
    "wheel",
    "mesh",
    "pinslot",
    "target",
    "stock",
    "pillar",
    # the display (wheelgen.design.display_tables)
    "display",
    "hand",
    "dial",
    "input",
)

# Per-wheel keys that [defaults] may also set: key -> (default, kind, check)
_Check = Callable[[Any], str | None]


class _Bounded:
    """A key's check from :data:`~wheelgen.design.bounds.BOUNDS`; keeps the bound for
    its reason. A length's check also names the ways to write a length with a unit
    (the bound is in mm whatever unit the file used)."""

    def __init__(self, name: str, length: bool = False) -> None:
        self.bound: Bound = BOUNDS[name]
        self.length = length

    def __call__(self, v: Any) -> str | None:
        problem = self.bound.problem(v)
        if problem is None or not self.length:
            return problem
        return f"{problem}, or the length as text with its unit: {LENGTH_FORMS}"


def _bounded(name: str) -> _Check:
    return _Bounded(name)


def _length(name: str) -> _Check:
    """The check of a length key: its bound in mm, numbers or text with a unit."""
    return _Bounded(name, length=True)


def _title(v: Any) -> str | None:
    limit = BOUNDS["title_length"]
    if not isinstance(v, str):
        return f"text of {limit.allowed()}, without control characters"
    bad = control_characters(v)
    if bad:
        return (
            f"printable text (it holds the control character {bad[0]}; "
            "a title is one line)"
        )
    if not limit.holds(len(v)):
        return f"text of {limit.allowed()} (it has {len(v)})"
    return None


# A dotted key of more parts than the nesting bound, found by a scan that skips strings
# and comments (matched as tokens of their own, so a dot inside them never counts).
# Possessive runs (``++``) and a run of key characters skipped as one token keep the scan
# linear: a long run of digits is tried once, not once per character.
_BARE = r"[A-Za-z0-9_-]++"
_BASIC = r'"(?:[^"\\\n]|\\.)*+"'
_LITERAL = r"'[^'\n]*+'"
_PART = rf"(?:{_BARE}|{_BASIC}|{_LITERAL})"
_DEEP_KEY = re.compile(
    rf"(?P<deep>{_PART}(?:[ \t]*\.[ \t]*{_PART}){{{int(BOUNDS['nesting'].high)},}})"
    rf'|"""[\s\S]*?"""|' + r"'''[\s\S]*?'''|" + rf"{_BASIC}|{_LITERAL}|#[^\n]*+"
    rf"|{_BARE}"
)


def _reason(check: _Check | None) -> str:
    """The reason of a bounded key's limits, as a sentence for the message's end."""
    if not isinstance(check, _Bounded):
        return ""
    reason = check.bound.reason
    return f"Why: {reason}."


def _choice(*options: str) -> _Check:
    def check(v: Any) -> str | None:
        return (
            None if v in options else "one of " + ", ".join(f"'{o}'" for o in options)
        )

    return check


def _finite_number(v: Any) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)


def _position(v: Any) -> float | None:
    """A coordinate of a list (``at``, ``plates``, ``rectangle``, ``polygon``) in mm: a
    number, or text with a unit; ``None`` when it is neither or out of bounds."""
    if isinstance(v, str):
        try:
            v = float(parse_length(v))
        except LengthError:
            return None
    if not _finite_number(v) or not BOUNDS["position"].holds(v):
        return None
    return float(v)


#: How the coordinates of a list may be written, for messages.
_COORDINATE = (
    "each a number (mm) or text with its unit, " + BOUNDS["position"].allowed()
)


def _signed_area(pts: tuple[tuple[float, float], ...]) -> float:
    """Shoelace area (mm2), positive for corners counter-clockwise."""
    n = len(pts)
    return 0.5 * sum(
        pts[i][0] * pts[(i + 1) % n][1] - pts[(i + 1) % n][0] * pts[i][1]
        for i in range(n)
    )


def _crosses_itself(pts: tuple[tuple[float, float], ...]) -> bool:
    """Do two sides of the closed polygon that are not neighbours touch or cross?"""

    def orient(
        a: tuple[float, float], b: tuple[float, float], c: tuple[float, float]
    ) -> float:
        return (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])

    def meet(
        p: tuple[float, float],
        q: tuple[float, float],
        r: tuple[float, float],
        s: tuple[float, float],
    ) -> bool:
        d1, d2 = orient(r, s, p), orient(r, s, q)
        d3, d4 = orient(p, q, r), orient(p, q, s)
        if (
            ((d1 > 0) != (d2 > 0))
            and ((d3 > 0) != (d4 > 0))
            and 0 not in (d1, d2, d3, d4)
        ):
            return True

        def on(
            a: tuple[float, float], b: tuple[float, float], c: tuple[float, float]
        ) -> bool:
            return (
                orient(a, b, c) == 0
                and min(a[0], b[0]) <= c[0] <= max(a[0], b[0])
                and min(a[1], b[1]) <= c[1] <= max(a[1], b[1])
            )

        return on(r, s, p) or on(r, s, q) or on(p, q, r) or on(p, q, s)

    n = len(pts)
    if len(set(pts)) != n:
        return True
    sides = [(pts[i], pts[(i + 1) % n]) for i in range(n)]
    for i in range(n):
        for j in range(i + 1, n):
            if j == i + 1 or (i == 0 and j == n - 1):
                continue
            if meet(*sides[i], *sides[j]):
                return True
    return False


WHEEL_KEYS: dict[str, tuple[Any, str, _Check | None]] = {
    "module": (1.0, "number", _bounded("module")),
    "form": ("involute", "string", _choice("involute", "triangular")),
    "pressure_angle": (20.0, "number", _bounded("pressure_angle")),
    # None: by form, tooth count and process (design/tooth_defaults.py)
    "tooth_angle": (None, "number", _bounded("tooth_angle")),
    "face_width": (3.0, "length", _length("size")),
    "shift": (0.0, "number", _bounded("shift")),
    "backlash": (None, "length", _length("play")),
    "addendum": (None, "number", _bounded("addendum")),
    "dedendum": (None, "number", _bounded("dedendum")),
    "root_radius": (None, "number", _bounded("root_radius")),
    "tip_radius": (None, "number", _bounded("tip_radius")),
    "bore": (None, "length", _length("size")),
    "seat": ("round", "string", _choice("round", "square", "hex", "pinned")),
    "spokes": (0, "integer", _bounded("spokes")),
    "rim": (None, "length", _length("size")),
    "hub_diameter": (0.0, "length", _length("size_or_zero")),
    "hub_length": (0.0, "length", _length("size_or_zero")),
    # None: a module wheel; a number makes the wheel a diametral-pitch wheel
    "diametral_pitch": (None, "number", _bounded("diametral_pitch")),
}
#: What ``least_play`` (in [[mesh]] and [defaults]) accepts; "none" turns it off.
LEAST_PLAY_CHOICES = ("backlash", "addendum", "none")
#: What a wheel may give for the size of its teeth, for messages.
_ONE_PITCH = (
    "one of them: a module in mm, or a diametral pitch in teeth per inch (the "
    "module is then 25.4 / diametral_pitch)"
)
# Wheel field names that differ from the file's keys.
_WHEEL_FIELD = {
    "pressure_angle": "pressure_angle_deg",
    "tooth_angle": "tooth_angle_deg",
}

#: Keys of the [frame] table.
FRAME_KEYS = (
    "plates",
    "thickness",
    "margin",
    "clearance",
    "rectangle",
    "polygon",
    "corner",
    "pillars",
    "pillar_diameter",
    "screw",
)

PROCESS_KEYS: dict[str, tuple[str, _Check | None]] = {
    "nozzle": ("length", _length("nozzle")),
    "layer": ("length", _length("layer")),
    "clearance": ("length", _length("play")),
    "cutter": ("length", _length("cutter")),
    "fit": ("string", None),
    "min_wall": ("length", _length("size")),
    "min_module_hand": ("number", _bounded("module")),
    "min_backlash": ("length", _length("play")),
    "centre_tolerance": ("length", _length("centre_tolerance")),
    "min_layers": ("integer", _bounded("min_layers")),
}

#: Periods from a microsecond to a million years: beyond them a float cannot hold the
#: derived rates and periods of a long train.
MIN_PERIOD_S = Fraction(BOUNDS["period_s"].low)
MAX_PERIOD_S = Fraction(BOUNDS["period_s"].high)
#: Turns per drive turn that a target may ask for.
MIN_TURNS, MAX_TURNS = Fraction(BOUNDS["turns"].low), Fraction(BOUNDS["turns"].high)
_PERIOD_ALLOWED = (
    'a positive number and a unit (s, min, h, d, yr), such as "27.321661 d", '
    + BOUNDS["period_s"].allowed()
)


def _period_text(v: Any) -> str | None:
    # called on a string value; for a wrong type it describes what is wanted
    return None if isinstance(v, str) else 'text such as "1 d" or "27.321661 d"'


#: Problems described in full; a file with more is mostly not a train file.
_PROBLEMS_SHOWN = 100

_ORDINAL = {1: "st", 2: "nd", 3: "rd"}


def _listed(names: Any, shown: int = 20) -> str:
    """Names in quotes, the first ``shown`` of them: a large train has thousands."""
    names = list(names)
    if not names:
        return "(none defined)"
    text = ", ".join(f'"{n}"' for n in names[:shown])
    return text if len(names) <= shown else f"{text} and {len(names) - shown} more"


def _ordinal(n: int) -> str:
    suffix = "th" if 10 <= n % 100 <= 20 else _ORDINAL.get(n % 10, "th")
    return f"{n}{suffix}"


def _type_name(v: Any) -> str:
    if isinstance(v, bool):
        return "true/false"
    if isinstance(v, int):
        return "a whole number"
    if isinstance(v, float):
        return "a number"
    if isinstance(v, str):
        return "text"
    if isinstance(v, list):
        return "a list"
    if isinstance(v, dict):
        return "a table"
    return type(v).__name__


_KIND_PHRASE = {
    "number": "a number",
    "length": f"a number (mm) or text with its unit: {LENGTH_FORMS}",
    "integer": "a whole number",
    "string": "text in quotes",
    "bool": "true or false",
}


def _expected(kind: str, check: _Check | None) -> str:
    """What a key accepts, in words: the check's own phrase when it has one."""
    if check is not None:
        # A check asked about a value that fails every test (NaN compares false,
        # None is no option) answers with its full description.
        phrase = check(None if kind == "string" else math.nan)
        if phrase:
            return phrase
    return _KIND_PHRASE[kind]


def _show(v: Any) -> str:
    if isinstance(v, str):
        # JSON quoting shows a control character as an escape (``"sun\\n"``)
        text = json.dumps(v, ensure_ascii=False)
        return text if len(text) <= 60 else text[:56] + '..."'
    if isinstance(v, bool):
        return "true" if v else "false"
    text = repr(v)
    return text if len(text) <= 40 else text[:37] + "..."


class _Lines:
    """Finds the line of a table or key in the source text (tomllib gives none)."""

    _HEADER = re.compile(r"^\s*(\[\[?)\s*([A-Za-z0-9_.-]+)\s*\]\]?")
    _KEY = re.compile(r"^\s*([A-Za-z0-9_-]+)\s*=")

    def __init__(self, text: str) -> None:
        self.blocks: dict[tuple[str, int], tuple[int, int]] = {}
        self.keys: dict[tuple[str, int], dict[str, int]] = {}
        lines = text.splitlines()
        counts: dict[str, int] = {}
        current: tuple[str, int] = ("", 0)
        self.keys[current] = {}
        start = 1
        for number, line in enumerate(lines, start=1):
            head = self._HEADER.match(line)
            if head:
                self.blocks[current] = (start, number - 1)
                table = head.group(2)
                counts[table] = counts.get(table, 0) + 1
                current = (table, counts[table] - 1 if head.group(1) == "[[" else 0)
                self.keys.setdefault(current, {})
                start = number
                continue
            key = self._KEY.match(line)
            if key:
                self.keys.setdefault(current, {}).setdefault(key.group(1), number)
        self.blocks[current] = (start, len(lines))

    def line(self, table: str, index: int = 0, key: str = "") -> int | None:
        if key and key in self.keys.get((table, index), {}):
            return self.keys[(table, index)][key]
        block = self.blocks.get((table, index))
        return block[0] if block else None


def _pitch_words(wheel: Wheel) -> str:
    """``wheel "a" (module 1 mm)`` or ``wheel "b" (32 diametral pitch)``."""
    return f"wheel {_show(wheel.name)} ({pitch_words(wheel.module, wheel.diametral_pitch)})"


def _axis(by_arbor: dict[str, Arbor], name: str) -> str:
    """The innermost member of the coaxial group of arbor ``name`` (no cycles left)."""
    return axis_root_of(by_arbor, name)


class _Loader:
    def __init__(self, text: str, filename: str) -> None:
        self.text = text
        self.file = filename
        self.problems: list[Problem] = []
        self.lines = _Lines(text)
        # Names of items already reported as broken: references to them are not
        # reported again as "does not exist".
        self.broken: dict[str, set[str]] = {
            "arbor": set(),
            "wheel": set(),
            "pinslot": set(),
        }
        self.arbor_tables = 0  # how many [[arbor]] tables the file has, broken or not
        self.units: Units = "mm"  # [design] units: what the sheets are written in
        self.left_out = 0  # problems found after the first _PROBLEMS_SHOWN

    # -- reporting -------------------------------------------------------------------
    def where(self, table: str, index: int, item: str, key: str = "") -> Where:
        return Where(self.file, item, key, self.lines.line(table, index, key))

    def at_key(self, where: Where | None, key: str) -> Where:
        """The same item, pointing at one of its keys (and that key's line)."""
        if where is None:
            return Where(self.file, key=key)
        line = where.line
        for block, (start, _) in self.lines.blocks.items():
            if start == where.line:
                line = self.lines.keys.get(block, {}).get(key, line)
        return Where(self.file, where.item, key, line)

    def problem(self, where: Where, found: str, allowed: str, hint: str = "") -> None:
        if self.full():
            self.left_out += 1
            return
        self.problems.append(Problem(where, found, allowed, hint))

    def full(self) -> bool:
        """Enough problems to report: later ones are counted, not described."""
        return len(self.problems) >= _PROBLEMS_SHOWN

    def error(self) -> DesignError:
        """Every problem found, and how many more were left out."""
        problems = list(self.problems)
        if self.left_out:
            problems.append(
                Problem(
                    Where(self.file),
                    f"{self.left_out} more problems, not listed",
                    "a file with fewer mistakes: fix the ones above and check again",
                )
            )
        return DesignError(problems)

    # -- typed access ----------------------------------------------------------------
    def value(
        self,
        data: dict[str, Any],
        key: str,
        kind: str,
        ctx: tuple[str, int, str],
        *,
        required: bool = False,
        default: Any = None,
        check: _Check | None = None,
    ) -> Any:
        table, index, item = ctx
        if key not in data:
            if required:
                self.problem(
                    self.where(table, index, item, key),
                    f"'{key}' is missing",
                    f"{_expected(kind, check)} (required)",
                )
            return default
        v = data[key]
        w = self.where(table, index, item, key)
        shown = f"{key} = {_show(v)}"
        if kind == "length" and isinstance(v, str):
            try:
                mm = parse_length(v)
            except LengthError as exc:
                self.problem(w, f"{shown}: {exc}", _expected(kind, check))
                return default
            # read exactly, then the nearest float: "1/8 in" and 3.175 are one number
            v = float(mm)
            shown += f" ({v:g} mm)"
            kind = "number"
        ok = {
            "number": isinstance(v, (int, float)) and not isinstance(v, bool),
            "length": isinstance(v, (int, float)) and not isinstance(v, bool),
            "integer": isinstance(v, int) and not isinstance(v, bool),
            "string": isinstance(v, str),
            "bool": isinstance(v, bool),
        }[kind]
        if kind == "integer" and isinstance(v, float) and v.is_integer():
            ok, v = True, int(v)
        if not ok:
            self.problem(
                w, f"{key} = {_show(v)} ({_type_name(v)})", _expected(kind, check)
            )
            return default
        if kind in ("number", "length"):
            try:
                v = float(v)
            except OverflowError:  # an integer of hundreds of digits
                v = math.inf
            if not math.isfinite(v):
                self.problem(
                    w,
                    f"{key} = {v}",
                    check(math.nan) or "a finite number"
                    if check
                    else "a finite number",
                    _reason(check),
                )
                return default
        if check is not None:
            allowed = check(v)
            if allowed:
                self.problem(w, shown, allowed, _reason(check))
                return default
        return v

    def unknown_keys(
        self,
        data: dict[str, Any],
        known: tuple[str, ...] | list[str],
        ctx: tuple[str, int, str],
        required: tuple[str, ...] = (),
    ) -> None:
        table, index, item = ctx
        # A key already written cannot be the one mistyped; a required key that is
        # missing is the likeliest meant ('tooth' -> 'teeth', not 'tooth_angle').
        unused = [k for k in known if k not in data]
        for key in data:
            if key in known:
                continue
            if self.full():  # a hint costs a comparison with every known key
                self.left_out += 1
                continue
            close = difflib.get_close_matches(
                key, [k for k in required if k not in data], n=1, cutoff=0.5
            )
            close = close or difflib.get_close_matches(key, unused, n=1, cutoff=0.6)
            hint = f"Did you mean '{close[0]}'?" if close else ""
            self.problem(
                self.where(table, index, item, key),
                f"unknown key '{key}'",
                "the keys " + ", ".join(f"'{k}'" for k in known),
                hint,
            )

    def table(
        self, doc: dict[str, Any], name: str, required: bool = False
    ) -> dict[str, Any] | None:
        if name not in doc:
            if required:
                self.problem(
                    Where(self.file, f"[{name}]"),
                    f"the table [{name}] is missing",
                    f"a [{name}] table (required)",
                )
            return None
        v = doc[name]
        if not isinstance(v, dict):
            self.problem(
                Where(self.file, f"[{name}]", line=self.lines.line(name)),
                f"'{name}' is {_type_name(v)}",
                f"a single table written [{name}]",
            )
            return None
        return v

    def tables(self, doc: dict[str, Any], name: str) -> list[dict[str, Any]]:
        if name not in doc:
            return []
        v = doc[name]
        if not isinstance(v, list) or not all(isinstance(t, dict) for t in v):
            self.problem(
                Where(self.file, f"[[{name}]]", line=self.lines.line(name)),
                f"'{name}' is {_type_name(v)}",
                f"tables written [[{name}]], one per {name}",
            )
            return []
        return v

    def name_of(
        self, data: dict[str, Any], table: str, index: int
    ) -> tuple[str | None, str]:
        """The item's name (or None) and how to call it in messages."""
        anon = f"the {_ordinal(index + 1)} [[{table}]]"
        raw = data.get("name")
        if raw is None:
            self.problem(
                self.where(table, index, anon, "name"),
                "'name' is missing",
                NAME_ALLOWED,
            )
            return None, anon
        if not isinstance(raw, str):
            self.problem(
                self.where(table, index, anon, "name"),
                f"name = {_show(raw)} ({_type_name(raw)})",
                "text: " + NAME_ALLOWED,
            )
            return None, anon
        item = f"{table} {_show(raw)}"
        wrong = name_problem(raw)
        if wrong is not None:
            self.broken.setdefault(table, set()).add(raw)
            reserved = name_key(raw) in RESERVED_NAMES
            self.problem(
                self.where(table, index, item, "name"),
                f"name = {_show(raw)}: {wrong}",
                "any other name (not " + ", ".join(sorted(RESERVED_NAMES)) + ")"
                if reserved
                else NAME_ALLOWED,
            )
            return None, item if reserved else anon
        return raw, item

    # -- the whole file --------------------------------------------------------------
    def load(self) -> Design:
        self.check_size_and_nesting()
        try:
            doc = tomllib.loads(self.text)
        except tomllib.TOMLDecodeError as exc:
            msg = str(exc)
            m = re.search(r"line (\d+)", msg)
            self.problem(
                Where(self.file, line=int(m.group(1)) if m else None),
                f"the file is not valid TOML ({msg})",
                "TOML syntax, see docs/format.md",
            )
            raise self.error() from None
        except (ValueError, RecursionError) as exc:
            # tomllib lets these through: an integer of more than 4300 digits
            # (ValueError from int()) and brackets nested deeper than Python's stack.
            found = (
                "lists or tables nested too deeply"
                if isinstance(exc, RecursionError)
                else "a number too long to read"
            )
            self.problem(
                Where(self.file),
                f"the file is not usable TOML ({found})",
                "TOML syntax, see docs/format.md",
            )
            raise self.error() from None

        self.check_document(doc)
        self.unknown_keys(doc, TOP_KEYS, ("", 0, ""))
        title, process = self.design_table(doc)
        defaults = self.defaults_table(doc)
        proc = self.process_table(doc, process)
        frame = self.frame_table(doc)
        arbors = self.arbors(doc)
        wheels = self.wheels(doc, defaults, proc)
        meshes = self.meshes(doc, defaults)
        pinslots = self.pinslots(doc)
        drive = self.drive_table(doc)
        targets = self.targets(doc)
        stock = self.stock(doc)
        pillars = self.pillars(doc)
        # imported here: that module builds on this one's readers
        from .display_tables import check_display_references, read_display_tables

        hands, dials, display, drive_input = read_display_tables(self, doc)
        self.cross_check(arbors, wheels, meshes, pinslots, drive, targets)
        if self.problems:
            raise self.error()
        assert drive is not None  # the cross check reported a missing drive
        design = Design(
            title=title,
            name=design_name(Path(self.file).stem),
            drive=drive,
            arbors=tuple(arbors),
            wheels=tuple(wheels),
            meshes=tuple(meshes),
            pinslots=tuple(pinslots),
            targets=tuple(targets),
            stock=tuple(stock),
            process=proc,
            frame=frame,
            pillars=tuple(pillars),
            hands=hands,
            dials=dials,
            display=display,
            drive_input=drive_input,
            source=self.file,
            sha256=hashlib.sha256(self.text.encode("utf-8")).hexdigest(),
            units=self.units,
        )
        check_display_references(self, design)
        if self.problems:
            raise self.error()
        return design

    def check_size_and_nesting(self) -> None:
        """Refuse, before parsing, a file too large or with keys nested too deeply.

        tomllib's time grows with the square of a dotted key's length (50,000 levels
        take minutes), so deep keys are found by a scan that skips strings and comments.
        """
        size = len(self.text.encode("utf-8", "surrogatepass"))
        limit = BOUNDS["file_bytes"]
        if not limit.holds(size):
            self.problem(
                Where(self.file),
                f"the file holds {size} bytes",
                f"a train file of {limit.allowed()}",
                f"Why: {limit.reason}.",
            )
            raise self.error()
        for m in _DEEP_KEY.finditer(self.text):
            if m.group("deep"):
                line = self.text.count("\n", 0, m.start()) + 1
                self.problem(
                    Where(self.file, line=line),
                    f"a dotted key of more than {int(BOUNDS['nesting'].high)} parts",
                    f"keys and lists nested {BOUNDS['nesting'].allowed()}",
                    f"Why: {BOUNDS['nesting'].reason}.",
                )
                raise self.error()

    def check_document(self, doc: dict[str, Any]) -> None:
        """Refuse a parsed file nested too deeply or with too many tables of a kind.

        Every later step (and every check) grows with these counts, so a file beyond
        them is refused here, before any work.
        """
        nesting = BOUNDS["nesting"]
        stack: list[tuple[Any, int]] = [(doc, 1)]
        while stack:
            value, depth = stack.pop()
            if depth > nesting.high:
                self.problem(
                    Where(self.file),
                    f"tables or lists nested more than {int(nesting.high)} levels deep",
                    f"keys and lists nested {nesting.allowed()}",
                    f"Why: {nesting.reason}.",
                )
                raise self.error()
            children = value.values() if isinstance(value, dict) else value
            stack.extend(
                (c, depth + 1) for c in children if isinstance(c, (dict, list))
            )
        for table, limit in TABLE_BOUNDS.items():
            items = doc.get(table)
            if isinstance(items, list) and not limit.holds(len(items)):
                self.problem(
                    Where(self.file, f"[[{table}]]", line=self.lines.line(table)),
                    f"{len(items)} [[{table}]] tables",
                    f"at most {int(limit.high)} [[{table}]] tables",
                    f"Why: {limit.reason}.",
                )
        if self.problems:
            raise self.error()

    def design_table(self, doc: dict[str, Any]) -> tuple[str, str]:
        t = self.table(doc, "design", required=True)
        if t is None:
            return "", "mill"
        ctx = ("design", 0, "[design]")
        self.unknown_keys(t, ("title", "process", "units"), ctx, required=("title",))
        title = self.value(
            t, "title", "string", ctx, required=True, default="", check=_title
        )
        process = self.value(
            t,
            "process",
            "string",
            ctx,
            default="mill",
            check=_choice("print", "mill", "hand"),
        )
        self.units = self.value(
            t, "units", "string", ctx, default="mm", check=_choice(*UNITS)
        )
        return title, process

    def defaults_table(self, doc: dict[str, Any]) -> dict[str, Any]:
        t = self.table(doc, "defaults")
        out = {k: spec[0] for k, spec in WHEEL_KEYS.items()}
        if t is None:
            return out
        ctx = ("defaults", 0, "[defaults]")
        self.unknown_keys(t, (*WHEEL_KEYS, "least_play"), ctx)
        for key, (default, kind, check) in WHEEL_KEYS.items():
            out[key] = self.value(t, key, kind, ctx, default=default, check=check)
        out["least_play"] = self.value(
            t, "least_play", "string", ctx, check=_choice(*LEAST_PLAY_CHOICES)
        )
        if {"module", "diametral_pitch"} <= set(t):
            self.problem(
                self.where("defaults", 0, "[defaults]", "diametral_pitch"),
                "both 'module' and 'diametral_pitch'",
                _ONE_PITCH,
            )
        return out

    def process_table(self, doc: dict[str, Any], kind: str) -> Process:
        t = self.table(doc, "process")
        if t is None:
            return Process(kind=kind)  # type: ignore[arg-type]  # checked by _choice above
        ctx = ("process", 0, "[process]")
        self.unknown_keys(t, (*PROCESS_KEYS, "bed"), ctx)
        values: dict[str, Any] = {}
        bed = self.bed_size(t, ctx)
        if bed is not None:
            values["bed"] = bed
        for key, (vkind, check) in PROCESS_KEYS.items():
            v = self.value(t, key, vkind, ctx, check=check)
            if v is not None:
                values[key] = v
        fit = values.get("fit")
        if fit is not None and not re.match(
            r"^[A-Z]{1,2}\d{1,2}/[a-z]{1,2}\d{1,2}$", fit
        ):
            self.problem(
                self.where("process", 0, "[process]", "fit"),
                f"fit = {_show(fit)}",
                'an ISO 286 fit such as "H7/g6", "H7/h6" or "H8/f7"',
            )
            values.pop("fit")
        return Process(kind=kind, **values)  # type: ignore[arg-type]  # checked by _choice above

    def bed_size(
        self, t: dict[str, Any], ctx: tuple[str, int, str]
    ) -> tuple[float, float] | None:
        """``bed = [x, y]``: the printer's build plate in mm, or None if not given."""
        if "bed" not in t:
            return None
        v = t["bed"]
        bound = BOUNDS["bed"]
        values = [_position(x) for x in v] if isinstance(v, list) else []
        if len(values) != 2 or not all(
            x is not None and bound.holds(x) for x in values
        ):
            self.problem(
                self.where(*ctx, "bed"),
                f"bed = {_show(v)}",
                'two lengths in brackets, such as [250.0, 210.0] or ["10 in", "8 in"], '
                "each " + bound.allowed(),
                _reason(_bounded("bed")) if isinstance(v, list) and len(v) == 2 else "",
            )
            return None
        return (float(values[0] or 0.0), float(values[1] or 0.0))

    def frame_table(self, doc: dict[str, Any]) -> Frame | None:
        t = self.table(doc, "frame")
        if t is None:
            return None
        ctx = ("frame", 0, "[frame]")
        self.unknown_keys(t, FRAME_KEYS, ctx)
        plates = self.pair_of_numbers(t, "plates", ctx, default=(0.0, 40.0))
        if plates[1] <= plates[0]:
            self.problem(
                self.where("frame", 0, "[frame]", "plates"),
                f"plates = {list(plates)}",
                "[back, front] with front > back (mm)",
            )
        thickness = self.value(
            t, "thickness", "length", ctx, default=2.0, check=_length("size")
        )
        margin = self.value(t, "margin", "length", ctx, check=_length("size_or_zero"))
        clearance = self.value(
            t, "clearance", "length", ctx, check=_length("size_or_zero")
        )
        corner = self.value(
            t, "corner", "length", ctx, default=3.0, check=_length("size_or_zero")
        )
        pillars = self.value(
            t, "pillars", "integer", ctx, default=4, check=_bounded("pillars")
        )
        pillar_d = self.value(
            t, "pillar_diameter", "length", ctx, check=_length("size")
        )
        screw = self.value(
            t, "screw", "string", ctx, default="M3", check=_choice(*SCREWS)
        )
        rectangle = self.rectangle(t, ctx)
        polygon = self.polygon(t, ctx)
        if rectangle is not None and polygon is not None:
            self.problem(
                self.where("frame", 0, "[frame]", "polygon"),
                "both 'rectangle' and 'polygon'",
                "one of them, or neither (the outline is then found round the wheels)",
            )
            polygon = None
        return Frame(
            plates=plates,
            thickness=thickness,
            margin=margin,
            clearance=clearance,
            rectangle=rectangle,
            polygon=polygon,
            corner=corner,
            pillars=pillars,
            pillar_diameter=pillar_d,
            screw=screw,
        )

    def rectangle(
        self, t: dict[str, Any], ctx: tuple[str, int, str]
    ) -> tuple[float, float, float, float] | None:
        if "rectangle" not in t:
            return None
        v = t["rectangle"]
        allowed = (
            "four lengths [x0, y0, x1, y1] with x1 > x0 and y1 > y0, " + _COORDINATE
        )
        values = [_position(x) for x in v] if isinstance(v, list) else []
        if len(values) != 4 or None in values:
            self.problem(
                self.where(*ctx, "rectangle"), f"rectangle = {_show(v)}", allowed
            )
            return None
        x0, y0, x1, y1 = (float(x) for x in values if x is not None)
        if x1 <= x0 or y1 <= y0:
            self.problem(
                self.where(*ctx, "rectangle"), f"rectangle = {_show(v)}", allowed
            )
            return None
        return (x0, y0, x1, y1)

    def polygon(
        self, t: dict[str, Any], ctx: tuple[str, int, str]
    ) -> tuple[tuple[float, float], ...] | None:
        if "polygon" not in t:
            return None
        v = t["polygon"]
        corners = BOUNDS["frame_corners"]
        allowed = (
            f"a list of at least {int(corners.low)} corners [[x, y], ...] (at most "
            f"{int(corners.high)}; {_COORDINATE}) that do not cross, such as"
            " [[-50, -40], [60, -40], [60, 50], [-50, 50]]"
        )
        points = (
            [[_position(x) for x in p] if isinstance(p, list) else [None] for p in v]
            if isinstance(v, list) and corners.holds(len(v))
            else [[None]]
        )
        if not all(len(p) == 2 and None not in p for p in points):
            self.problem(self.where(*ctx, "polygon"), f"polygon = {_show(v)}", allowed)
            return None
        pts = tuple((float(p[0] or 0.0), float(p[1] or 0.0)) for p in points)
        if _crosses_itself(pts) or abs(_signed_area(pts)) < 1e-9:
            self.problem(
                self.where(*ctx, "polygon"),
                "polygon: its sides cross, or it encloses no area",
                allowed,
            )
            return None
        return pts

    def pillars(self, doc: dict[str, Any]) -> list[PillarSpec]:
        out = []
        tables = self.tables(doc, "pillar")
        for i, t in enumerate(tables):
            item = f"the {_ordinal(i + 1)} [[pillar]]"
            ctx = ("pillar", i, item)
            self.unknown_keys(t, ("at",), ctx, required=("at",))
            at = self.pair_of_numbers(t, "at", ctx)
            if at is None:
                if "at" not in t:
                    self.problem(
                        self.where(*ctx, "at"),
                        "'at' is missing",
                        "two numbers [x, y] (mm), the pillar's axis (required)",
                    )
                continue
            out.append(PillarSpec(at, i + 1, self.where("pillar", i, item)))
        if tables and len(tables) < 3:
            self.problem(
                Where(self.file, "[[pillar]]", line=self.lines.line("pillar")),
                f"{len(tables)} [[pillar]] table(s)",
                "at least 3 pillars (three hold the plates parallel), or none: they are"
                " then placed automatically",
            )
        if tables and "frame" not in doc:
            self.problem(
                Where(self.file, "[[pillar]]", line=self.lines.line("pillar")),
                "[[pillar]] tables but no [frame]",
                "a [frame] table with the plates the pillars stand between",
            )
        return out

    def pair_of_numbers(
        self,
        t: dict[str, Any],
        key: str,
        ctx: tuple[str, int, str],
        default: Any = None,
    ) -> Any:
        if key not in t:
            return default
        v = t[key]
        values = [_position(x) for x in v] if isinstance(v, list) else []
        if len(values) != 2 or None in values:
            self.problem(
                self.where(ctx[0], ctx[1], ctx[2], key),
                f"{key} = {_show(v)}",
                'two lengths in brackets, such as [0.0, 40.0] or ["0 in", "1.5 in"], '
                + _COORDINATE,
                _reason(_bounded("position"))
                if isinstance(v, list) and len(v) == 2
                else "",
            )
            return default
        return (float(values[0] or 0.0), float(values[1] or 0.0))

    def drive_table(self, doc: dict[str, Any]) -> Drive | None:
        t = self.table(doc, "drive", required=True)
        if t is None:
            return None
        ctx = ("drive", 0, "[drive]")
        self.unknown_keys(
            t, ("arbor", "period", "sense"), ctx, required=("arbor", "period")
        )
        arbor = self.value(t, "arbor", "string", ctx, required=True)
        period = self.period(t, "period", ctx, required=True)
        sense = self.value(
            t, "sense", "string", ctx, default="ccw", check=_choice("ccw", "cw")
        )
        if arbor is None or period is None:
            return None
        return Drive(
            arbor=arbor,
            period_s=period,
            sense=sense,
            where=self.where("drive", 0, "[drive]", "arbor"),
        )

    def period(
        self,
        t: dict[str, Any],
        key: str,
        ctx: tuple[str, int, str],
        required: bool = False,
    ) -> Fraction | None:
        raw = self.value(t, key, "string", ctx, required=required, check=_period_text)
        if raw is None:
            return None
        try:
            value = parse_period(raw)
        except PeriodError as exc:
            self.problem(
                self.where(*ctx, key), f"{key} = {_show(raw)}: {exc}", _PERIOD_ALLOWED
            )
            return None
        if not MIN_PERIOD_S <= value <= MAX_PERIOD_S:
            self.problem(
                self.where(*ctx, key),
                f"{key} = {_show(raw)} is out of range",
                _PERIOD_ALLOWED,
            )
            return None
        return value

    def arbors(self, doc: dict[str, Any]) -> list[Arbor]:
        out = []
        known = ("name", "at", "diameter", "around", "fixed", "carrier", "pivot")
        self.arbor_tables = len(self.tables(doc, "arbor"))
        for i, t in enumerate(self.tables(doc, "arbor")):
            name, item = self.name_of(t, "arbor", i)
            ctx = ("arbor", i, item)
            self.unknown_keys(t, known, ctx, required=("name",))
            at = self.pair_of_numbers(t, "at", ctx)
            diameter = self.value(
                t, "diameter", "length", ctx, default=3.0, check=_length("size")
            )
            around = self.value(t, "around", "string", ctx)
            fixed = self.value(t, "fixed", "bool", ctx, default=False)
            carrier = self.value(t, "carrier", "string", ctx)
            pivot = self.value(
                t,
                "pivot",
                "string",
                ctx,
                default="hole",
                check=_choice("hole", "bush", "bearing"),
            )
            w = self.where("arbor", i, item)
            if around is not None and carrier is not None:
                self.problem(
                    self.where("arbor", i, item, "carrier"),
                    "both 'around' and 'carrier'",
                    "one of them: a sleeve follows the axis of the member it surrounds",
                )
            if around is not None and at is not None:
                self.problem(
                    self.where("arbor", i, item, "at"),
                    "both 'around' and 'at'",
                    "no 'at' on a sleeve: it sits on the axis of the member it surrounds",
                )
            if carrier is not None and at is None:
                self.problem(
                    self.where("arbor", i, item, "carrier"),
                    "a carried arbor without 'at'",
                    "'at = [x, y]', its position in the carrier wheel's frame (mm)",
                )
            if carrier is not None and fixed:
                self.problem(
                    self.where("arbor", i, item, "fixed"),
                    "a carried arbor that is also fixed",
                    "'fixed' only on arbors held by the frame",
                )
            if pivot != "hole" and (around is not None or carrier is not None or fixed):
                self.problem(
                    self.where("arbor", i, item, "pivot"),
                    f'pivot = "{pivot}" on a sleeve, a carried or a fixed arbor',
                    "'pivot' only on an arbor that turns in the plates",
                )
            if name is not None:
                out.append(Arbor(name, at, diameter, around, fixed, carrier, pivot, w))
        return out

    def wheels(
        self, doc: dict[str, Any], defaults: dict[str, Any], proc: Process
    ) -> list[Wheel]:
        out = []
        known = ("name", "arbor", "teeth", "height") + tuple(WHEEL_KEYS)
        for i, t in enumerate(self.tables(doc, "wheel")):
            name, item = self.name_of(t, "wheel", i)
            ctx = ("wheel", i, item)
            self.unknown_keys(t, known, ctx, required=("name", "arbor", "teeth"))
            arbor = self.value(t, "arbor", "string", ctx, required=True)
            teeth = self.value(
                t,
                "teeth",
                "integer",
                ctx,
                required=True,
                check=lambda v: (
                    None
                    if MIN_TEETH <= v <= MAX_TEETH
                    else f"a whole number from {MIN_TEETH} to {MAX_TEETH}"
                ),
            )
            height = self.value(
                t, "height", "length", ctx, default=0.0, check=_length("position")
            )
            fields: dict[str, Any] = {}
            for key, (_, kind, check) in WHEEL_KEYS.items():
                fields[_WHEEL_FIELD.get(key, key)] = self.value(
                    t, key, kind, ctx, default=defaults[key], check=check
                )
            if name is None or arbor is None or teeth is None:
                if name is not None:
                    self.broken["wheel"].add(name)
                continue
            for key, (default, _, _) in WHEEL_KEYS.items():
                field_name = _WHEEL_FIELD.get(key, key)
                if fields[field_name] is None and default is not None:
                    fields[field_name] = default
            given = fields["root_radius"]
            self.pitch(t, fields, ctx)
            by_form = tooth_defaults(fields["form"], teeth, fields["module"], proc)
            for field_name, value in by_form.items():
                if fields[field_name] is None:
                    fields[field_name] = value
            if fields["form"] == "triangular" and proc.kind == "mill":
                # The end mill leaves its own radius in the V: the root rounding may not
                # be smaller than the cutter's radius.
                least = milled_root_radius(proc, fields["module"])
                if given is not None and given < least - 1e-12:
                    self.problem(
                        self.where("wheel", i, item, "root_radius"),
                        f"root_radius = {given:g} modules ({given * fields['module']:g} mm)",
                        f"at least the cutter radius, {least:.4g} modules ({proc.cutter / 2:g} mm), "
                        "when the process is milling",
                    )
            if not self.wheel_fits(fields, teeth, ("wheel", i, item)):
                self.broken["wheel"].add(name)
                continue
            out.append(
                Wheel(
                    name=name,
                    arbor=arbor,
                    teeth=teeth,
                    height=height,
                    where=self.where("wheel", i, item),
                    **fields,
                )
            )
        return out

    def pitch(
        self, t: dict[str, Any], fields: dict[str, Any], ctx: tuple[str, int, str]
    ) -> None:
        """Settle a wheel's module or diametral pitch, and a DP wheel's proportions.

        The wheel's own ``module`` or ``diametral_pitch`` wins over ``[defaults]``'s.
        A diametral pitch P gives the module 25.4 / P mm and, for involute teeth, the
        inch standard's dedendum and rack tip radius where neither the wheel nor
        ``[defaults]`` sets them (:func:`~wheelgen.design.diametral_pitch.inch_rack`).
        """
        own = [k for k in ("module", "diametral_pitch") if k in t]
        if len(own) == 2:
            self.problem(
                self.where(*ctx, "diametral_pitch"),
                "both 'module' and 'diametral_pitch'",
                _ONE_PITCH,
            )
        if own[:1] == ["module"]:
            fields["diametral_pitch"] = None
        dp = fields["diametral_pitch"]
        if dp is None:
            return
        fields["module"] = module_of_dp(dp)
        if fields["form"] != "involute":
            return
        rack = inch_rack(dp, fields["pressure_angle_deg"])
        for key in ("dedendum", "root_radius"):
            if fields[key] is None:  # set by neither the wheel nor [defaults]
                fields[key] = getattr(rack, key)

    def wheel_fits(
        self, fields: dict[str, Any], teeth: int, ctx: tuple[str, int, str]
    ) -> bool:
        """Is the wheel, teeth included, within the ``wheel_diameter`` bound?"""
        limit = BOUNDS["wheel_diameter"]
        module = fields["module"]
        shift = max(fields["shift"], 0.0) if fields["form"] == "involute" else 0.0
        across = module * (teeth + 2 * (fields["addendum"] + shift))
        if limit.holds(across):
            return True
        self.problem(
            self.where(*ctx, "teeth"),
            f"teeth = {teeth} at module {module:g} mm make a wheel {across:.0f} mm "
            "across",
            f"a wheel at most {float(limit.high):g} mm across (fewer teeth or a "
            "smaller module)",
            f"Why: {limit.reason}.",
        )
        return False

    def meshes(self, doc: dict[str, Any], defaults: dict[str, Any]) -> list[Mesh]:
        out = []
        for i, t in enumerate(self.tables(doc, "mesh")):
            item = f"the {_ordinal(i + 1)} [[mesh]]"
            ctx = ("mesh", i, item)
            self.unknown_keys(
                t, ("pair", "bearing", "least_play"), ctx, required=("pair",)
            )
            pair = t.get("pair")
            if pair is None:
                self.problem(
                    self.where("mesh", i, item, "pair"),
                    "'pair' is missing",
                    'two wheel names, such as pair = ["w1", "w2"]',
                )
                continue
            if (
                not isinstance(pair, list)
                or len(pair) != 2
                or not all(isinstance(p, str) for p in pair)
            ):
                self.problem(
                    self.where("mesh", i, item, "pair"),
                    f"pair = {_show(pair)}",
                    'two wheel names, such as pair = ["w1", "w2"]',
                )
                continue
            item = f"the {_ordinal(i + 1)} [[mesh]] ({_show(pair[0])}-{_show(pair[1])})"
            ctx = ("mesh", i, item)
            if pair[0] == pair[1]:
                self.problem(
                    self.where("mesh", i, item, "pair"),
                    f"wheel {_show(pair[0])} meshes with itself",
                    "two different wheels",
                )
                continue
            bearing = self.value(t, "bearing", "number", ctx, check=_bounded("bearing"))
            least = self.value(
                t,
                "least_play",
                "string",
                ctx,
                default=defaults.get("least_play"),
                check=_choice(*LEAST_PLAY_CHOICES),
            )
            out.append(
                Mesh(
                    (pair[0], pair[1]),
                    bearing,
                    i + 1,
                    self.where("mesh", i, item),
                    least_play=None if least in (None, "none") else least,
                )
            )
        return out

    def pinslots(self, doc: dict[str, Any]) -> list[PinSlot]:
        out = []
        known = (
            "name",
            "pin",
            "slot",
            "radius",
            "offset",
            "bearing",
            "pin_diameter",
            "pin_part",
        )
        for i, t in enumerate(self.tables(doc, "pinslot")):
            name, item = self.name_of(t, "pinslot", i)
            ctx = ("pinslot", i, item)
            self.unknown_keys(
                t, known, ctx, required=("name", "pin", "slot", "radius", "offset")
            )
            pin = self.value(t, "pin", "string", ctx, required=True)
            slot = self.value(t, "slot", "string", ctx, required=True)
            radius = self.value(
                t, "radius", "length", ctx, required=True, check=_length("size")
            )
            offset = self.value(
                t,
                "offset",
                "length",
                ctx,
                required=True,
                check=_length("size_or_zero"),
            )
            bearing = self.value(
                t, "bearing", "number", ctx, default=0.0, check=_bounded("bearing")
            )
            pin_d = self.value(
                t, "pin_diameter", "length", ctx, default=1.0, check=_length("size")
            )
            part = self.value(
                t,
                "pin_part",
                "string",
                ctx,
                default="boss",
                check=_choice("boss", "separate"),
            )
            if pin is not None and pin == slot:
                self.problem(
                    self.where("pinslot", i, item, "slot"),
                    f"wheel {_show(pin)} is both pin and slot",
                    "two different wheels",
                )
                pin = None
            # 'name is None' spelled out so that type checkers narrow it to str below
            if name is None or None in (pin, slot, radius, offset):
                if name is not None:
                    self.broken["pinslot"].add(name)
                continue
            out.append(
                PinSlot(
                    name,
                    pin,
                    slot,
                    radius,
                    offset,
                    bearing,
                    pin_d,
                    part,
                    self.where("pinslot", i, item),
                )
            )
        return out

    def targets(self, doc: dict[str, Any]) -> list[Target]:
        out = []
        for i, t in enumerate(self.tables(doc, "target")):
            item = f"the {_ordinal(i + 1)} [[target]]"
            ctx = ("target", i, item)
            self.unknown_keys(
                t,
                ("arbor", "period", "turns", "tolerance", "sense"),
                ctx,
                required=("arbor",),
            )
            arbor = self.value(t, "arbor", "string", ctx, required=True)
            if arbor is not None:
                item = f"the {_ordinal(i + 1)} [[target]] (arbor {_show(arbor)})"
                ctx = ("target", i, item)
            period = self.period(t, "period", ctx)
            turns = self.turns(t, ctx)
            if ("period" in t) == ("turns" in t):
                self.problem(
                    self.where(
                        "target", i, item, "turns" if "turns" in t else "period"
                    ),
                    "both 'period' and 'turns'"
                    if "period" in t
                    else "neither 'period' nor 'turns'",
                    "exactly one of them",
                )
            tol_ppm, tol_s = self.tolerance(t, ctx)
            sense = self.value(
                t,
                "sense",
                "string",
                ctx,
                default="either",
                check=_choice("cw", "ccw", "either"),
            )
            if arbor is None or (period is None and turns is None):
                continue
            out.append(
                Target(
                    arbor,
                    period,
                    turns,
                    tol_ppm,
                    tol_s,
                    sense,
                    i + 1,
                    self.where("target", i, item),
                )
            )
        return out

    def turns(self, t: dict[str, Any], ctx: tuple[str, int, str]) -> Fraction | None:
        if "turns" not in t:
            return None
        raw = t["turns"]
        allowed = 'a positive exact fraction such as "254/19", or a number'
        try:
            if isinstance(raw, bool) or not isinstance(raw, (str, int, float)):
                raise ValueError
            value = parse_number(str(raw))  # at most 40 characters, 1e-30 to 1e30
        except ValueError:
            self.problem(self.where(*ctx, "turns"), f"turns = {_show(raw)}", allowed)
            return None
        if value <= 0:
            self.problem(
                self.where(*ctx, "turns"),
                f"turns = {_show(raw)}",
                allowed + " (use 'sense' for the direction)",
            )
            return None
        if not MIN_TURNS <= value <= MAX_TURNS:
            self.problem(
                self.where(*ctx, "turns"),
                f"turns = {_show(raw)} is out of range",
                allowed + ", from 1e-12 to 1e12",
            )
            return None
        return value

    def tolerance(
        self, t: dict[str, Any], ctx: tuple[str, int, str]
    ) -> tuple[float | None, Fraction | None]:
        if "tolerance" not in t:
            return 1.0, None  # default: 1 ppm
        raw = t["tolerance"]
        allowed = (
            'a relative tolerance such as "20 ppm" (at most 1e6 ppm), or an absolute '
            'time with a unit s, min, h, d or yr, such as "30 s"'
        )
        if isinstance(raw, str):
            m = re.match(r"^\s*([0-9]*\.?[0-9]+(?:[eE][+-]?\d+)?)\s*ppm\s*$", raw)
            if m:
                ppm = float(m.group(1))
                if ppm <= 1e6:
                    return ppm, None
            else:
                try:
                    tol_s = parse_period(raw)
                    if tol_s <= MAX_PERIOD_S:
                        return None, tol_s
                except PeriodError:
                    pass
                zero = re.match(r"^\s*0+(\.0*)?\s*([a-z]+)\s*$", raw)
                if zero and zero.group(2) in UNIT_SECONDS:
                    return None, Fraction(0)  # "0 s": the period must be exact
        self.problem(
            self.where(*ctx, "tolerance"), f"tolerance = {_show(raw)}", allowed
        )
        return None, None

    def stock(self, doc: dict[str, Any]) -> list[Stock]:
        out = []
        for i, t in enumerate(self.tables(doc, "stock")):
            item = f"the {_ordinal(i + 1)} [[stock]]"
            ctx = ("stock", i, item)
            self.unknown_keys(
                t,
                ("kind", "outside", "inside", "width"),
                ctx,
                required=("outside",),
            )
            kind = self.value(
                t,
                "kind",
                "string",
                ctx,
                default="tube",
                check=_choice("tube", "bush", "bearing", "rod"),
            )
            outside = self.value(
                t, "outside", "length", ctx, required=True, check=_length("size")
            )
            if kind == "rod":
                for key in ("inside", "width"):
                    if key in t:
                        self.problem(
                            self.where("stock", i, item, key),
                            f"'{key}' on a rod",
                            "only 'outside' on a rod (it is solid and cut to length)",
                        )
                if outside is not None and "inside" not in t and "width" not in t:
                    out.append(Stock(outside, 0.0, self.where("stock", i, item), kind))
                continue
            inside = self.value(
                t, "inside", "length", ctx, required=True, check=_length("size")
            )
            width = self.value(t, "width", "length", ctx, check=_length("size"))
            if kind in ("bush", "bearing") and width is None and "width" not in t:
                self.problem(
                    self.where("stock", i, item, "width"),
                    f"'width' is missing on a {kind}",
                    f"the {kind}'s axial width in mm (required for a {kind})",
                )
                continue
            if kind == "tube" and "width" in t:
                self.problem(
                    self.where("stock", i, item, "width"),
                    "'width' on a tube",
                    "'width' only on a bush or a bearing (a tube is cut to length)",
                )
                continue
            if outside is not None and inside is not None:
                if inside >= outside:
                    self.problem(
                        self.where("stock", i, item, "inside"),
                        f"inside = {inside:g} >= outside = {outside:g}",
                        "an inside diameter smaller than the outside (mm)",
                    )
                    continue
                out.append(
                    Stock(
                        outside,
                        inside,
                        self.where("stock", i, item),
                        kind,
                        width if kind != "tube" else None,
                    )
                )
        return out

    # -- relations between items ------------------------------------------------------
    def cross_check(
        self,
        arbors: list[Arbor],
        wheels: list[Wheel],
        meshes: list[Mesh],
        pinslots: list[PinSlot],
        drive: Drive | None,
        targets: list[Target],
    ) -> None:
        by_arbor = {a.name: a for a in arbors}
        by_wheel = {w.name: w for w in wheels}
        # names become file names: two that a case-insensitive disk takes for one
        # file ("Sun", "sun") collide as surely as two equal ones
        seen: dict[str, tuple[str, Where | None]] = {}
        for items in (arbors, wheels, pinslots):
            for it in items:
                key = name_key(it.name)
                if key in seen:
                    first, where = seen[key]
                    same = first == it.name
                    self.problem(
                        self.at_key(it.where, "name"),
                        f"the name {_show(it.name)} is used twice"
                        if same
                        else f"the names {_show(first)} and {_show(it.name)} differ "
                        "only in case",
                        "names unique across arbors, wheels and pin-and-slot couplings"
                        + (
                            ""
                            if same
                            else ", whatever their case (they become file names)"
                        ),
                        f"It is first used at {where}." if where else "",
                    )
                else:
                    seen[key] = (it.name, it.where)

        def ref(
            where: Where | None, key: str, name: str, pool: dict[str, Any], what: str
        ) -> bool:
            if name in pool:
                return True
            if name in self.broken.get(what, ()):
                return False  # that item's own problem is reported already
            if self.full():  # a hint costs a comparison with every name
                self.left_out += 1
                return False
            close = difflib.get_close_matches(name, list(pool), n=1, cutoff=0.5)
            w = self.at_key(where, key)
            self.problem(
                w,
                f"{what} {_show(name)} does not exist",
                f"the name of one of the {what}s: " + _listed(pool),
                f'Did you mean "{close[0]}"?' if close else "",
            )
            return False

        if not arbors and not self.arbor_tables:
            self.problem(
                Where(self.file, "[[arbor]]"),
                "no [[arbor]] tables",
                "at least one arbor",
            )
        for a in arbors:
            if a.around is not None:
                ref(a.where, "around", a.around, by_arbor, "arbor")
            if a.carrier is not None:
                ref(a.where, "carrier", a.carrier, by_wheel, "wheel")
        for w in wheels:
            ref(w.where, "arbor", w.arbor, by_arbor, "arbor")
        for m in meshes:
            for name in m.pair:
                ref(m.where, "pair", name, by_wheel, "wheel")
        for p in pinslots:
            ref(p.where, "pin", p.pin, by_wheel, "wheel")
            ref(p.where, "slot", p.slot, by_wheel, "wheel")
        if drive is not None and ref(
            drive.where, "arbor", drive.arbor, by_arbor, "arbor"
        ):
            if by_arbor[drive.arbor].fixed:
                self.problem(
                    self.at_key(drive.where, "arbor"),
                    f'the drive arbor "{drive.arbor}" is fixed',
                    "an arbor that can turn",
                )
        for t in targets:
            ref(t.where, "arbor", t.arbor, by_arbor, "arbor")
        if self.problems:
            return
        self.check_structure(by_arbor, by_wheel, meshes, pinslots)

    def check_structure(
        self,
        by_arbor: dict[str, Arbor],
        by_wheel: dict[str, Wheel],
        meshes: list[Mesh],
        pinslots: list[PinSlot],
    ) -> None:
        # 'around' chains must end; carriers must not carry themselves (directly or not).
        def parent(a: Arbor) -> str | None:
            if a.around is not None:
                return a.around
            if a.carrier is not None:
                return by_wheel[a.carrier].arbor
            return None

        # One walk per chain, each arbor visited once: depth of tubes on one axis and of
        # carriers riding on carriers, both bounded (every later step follows them).
        coaxial: dict[str, int] = {}
        carried: dict[str, int] = {}
        bad: set[str] = set()
        too_deep = False
        for a in by_arbor.values():
            path: list[str] = []
            on_path: dict[str, int] = {}
            cur: str | None = a.name
            looped = False
            while cur is not None and cur not in coaxial and cur not in bad:
                if cur in on_path:
                    loop = path[on_path[cur] :] + [cur]
                    self.problem(
                        self.at_key(
                            a.where, "around" if a.around is not None else "carrier"
                        ),
                        "a cycle of 'around'/'carrier': "
                        + " -> ".join(_show(n) for n in loop),
                        "each arbor surrounds or rides on a member that does not, in turn, lead back to it",
                    )
                    looped = True
                    break
                on_path[cur] = len(path)
                path.append(cur)
                cur = parent(by_arbor[cur])
            if looped or cur in bad:
                bad.update(path)  # a cycle, or a chain that runs into one
                continue
            for name in reversed(path):
                arbor = by_arbor[name]
                up = parent(arbor)
                coaxial[name] = coaxial[arbor.around] + 1 if arbor.around else 1
                carried[name] = (carried[up] if up else 0) + bool(arbor.carrier)
                too_deep |= self.check_depth(arbor, coaxial[name], carried[name])
        if bad or too_deep:
            return

        def axis(name: str) -> str:
            return _axis(by_arbor, name)

        for m in meshes:
            arbor_a, arbor_b = (by_wheel[n].arbor for n in m.pair)
            if arbor_a == arbor_b:
                self.problem(
                    self.at_key(m.where, "pair"),
                    f'both wheels sit on arbor "{arbor_a}"',
                    "wheels on two different arbors",
                )
            elif axis(arbor_a) == axis(arbor_b):
                # Coaxial members turn about one axis: their wheels cannot engage.
                self.problem(
                    self.at_key(m.where, "pair"),
                    f'arbors "{arbor_a}" and "{arbor_b}" share one axis (one is a sleeve around the other)',
                    "wheels on arbors with different axes",
                )
        for m in meshes:
            wa, wb = (by_wheel[n] for n in m.pair)
            if (wa.diametral_pitch is None) != (wb.diametral_pitch is None):
                self.problem(
                    self.at_key(m.where, "pair"),
                    f"{_pitch_words(wa)} meshes with {_pitch_words(wb)}",
                    "two wheels of one system: both cut to a module or both to a "
                    "diametral pitch (their tooth proportions differ)",
                )
        for p in pinslots:
            if by_wheel[p.pin].arbor == by_wheel[p.slot].arbor:
                self.problem(
                    self.at_key(p.where, "slot"),
                    f'pin wheel and slot wheel both sit on arbor "{by_wheel[p.pin].arbor}"',
                    "wheels on two different arbors",
                )
        self.check_placement(by_arbor, by_wheel, meshes, pinslots)

    def check_depth(self, arbor: Arbor, coaxial: int, carried: int) -> bool:
        """Report the arbor that first goes past a nesting bound; True if it does."""
        for depth, limit, key, what in (
            (coaxial, BOUNDS["coaxial_depth"], "around", "tubes nested on one axis"),
            (
                carried,
                BOUNDS["carrier_depth"],
                "carrier",
                "carriers riding on carriers",
            ),
        ):
            if depth == int(limit.high) + 1:
                self.problem(
                    self.at_key(arbor.where, key),
                    f"{depth} {what}",
                    f"at most {int(limit.high)}",
                    f"Why: {limit.reason}.",
                )
                return True
        return False

    def check_placement(
        self,
        by_arbor: dict[str, Arbor],
        by_wheel: dict[str, Wheel],
        meshes: list[Mesh],
        pinslots: list[PinSlot],
    ) -> None:
        """Every arbor must be placeable: by 'at', by 'around', or by a bearing from a placed one."""

        def axis(name: str) -> str:
            return _axis(by_arbor, name)

        placed = {axis(a.name) for a in by_arbor.values() if a.at is not None}
        links: list[tuple[str, str]] = []
        for m in meshes:
            if m.bearing_deg is not None:
                a, b = (axis(by_wheel[n].arbor) for n in m.pair)
                links.append((a, b))
        for p in pinslots:
            links.append((axis(by_wheel[p.pin].arbor), axis(by_wheel[p.slot].arbor)))
        # placed axes spread along the links: each axis and link visited once
        linked: dict[str, list[str]] = {}
        for a, b in links:
            linked.setdefault(a, []).append(b)
            linked.setdefault(b, []).append(a)
        todo = list(placed)
        while todo:
            for other in linked.get(todo.pop(), ()):
                if other not in placed:
                    placed.add(other)
                    todo.append(other)
        for name, arbor in by_arbor.items():
            if axis(name) not in placed and arbor.around is None:
                self.problem(
                    self.at_key(arbor.where, "at"),
                    "the arbor cannot be placed: it has no 'at' and no [[mesh]] with a 'bearing' links it to a placed arbor",
                    "'at = [x, y]' on the arbor, or a 'bearing' on one of its meshes",
                )


def loads_design(text: str, filename: str = "<design>") -> Design:
    """Parse train-file text; raise :class:`DesignError` listing every problem."""
    return _Loader(text, filename).load()


def load_design(path: str | Path) -> Design:
    """Read and check a train file; raise :class:`DesignError` listing every problem.

    Only a regular file is read (a folder, a pipe or a device such as ``/dev/zero`` is
    refused without reading from it), and only up to the ``file_bytes`` bound.
    """
    p = Path(path)

    def refuse(found: str, allowed: str = "a readable TOML file") -> DesignError:
        return DesignError([Problem(Where(str(p)), found, allowed)])

    limit = BOUNDS["file_bytes"]
    try:
        # O_NONBLOCK: opening a pipe must not wait for a writer; a regular file ignores it
        fd = os.open(p, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
    except OSError as exc:
        raise refuse(f"the file cannot be read ({exc.strerror or exc})") from None
    try:
        info = os.fstat(fd)
        if not stat.S_ISREG(info.st_mode):
            kind = "a folder" if stat.S_ISDIR(info.st_mode) else "not a regular file"
            raise refuse(f"it is {kind}", "a regular TOML file") from None
        if not limit.holds(info.st_size):
            raise refuse(
                f"the file holds {info.st_size} bytes",
                f"a train file of {limit.allowed()}",
            ) from None
        with os.fdopen(fd, "rb", closefd=False) as fh:
            raw = fh.read(int(limit.high) + 1)
    except OSError as exc:
        raise refuse(f"the file cannot be read ({exc.strerror or exc})") from None
    finally:
        os.close(fd)
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise DesignError(
            [
                Problem(
                    Where(str(p)),
                    f"the file is not UTF-8 text (byte {exc.start})",
                    "a UTF-8 TOML file",
                )
            ]
        ) from None
    return loads_design(text, str(p))
