"""Reading a train file's values: typed, within their bounds, and located.

:class:`FileReader` holds one file being read: the lines of its tables and keys (tomllib
gives none), and the problems found so far. Each value is read through
:meth:`FileReader.value`: its kind (number, length with a unit, whole number, text,
true/false), its check (a bound of :data:`~wheelgen.design.bounds.BOUNDS` or a list of
choices), and, when it fails, a problem naming the file, line, item and key, what was
found and what is allowed. Unknown keys get a "did you mean". The table readers build on
this; nothing here knows which tables a train file has.
"""

from __future__ import annotations

import difflib
import json
import math
import re
from fractions import Fraction
from typing import Any, Callable

from .bounds import BOUNDS, Bound
from .errors import DesignError, Problem
from .model import Where
from .names import NAME_ALLOWED, RESERVED_NAMES, name_key, name_problem
from .periods import PeriodError, parse_period
from .units import LENGTH_FORMS, LengthError, Units, parse_length

__all__ = [
    "COORDINATE",
    "MAX_PERIOD_S",
    "MIN_PERIOD_S",
    "Bounded",
    "Check",
    "FileReader",
    "Lines",
    "bounded",
    "bounded_length",
    "choice",
    "expected",
    "finite_number",
    "listed",
    "ordinal",
    "position",
    "reason_of",
    "show",
    "type_name",
]

#: A key's check: None when the value is allowed, else what is allowed, in words.
Check = Callable[[Any], str | None]


class Bounded:
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


def bounded(name: str) -> Check:
    """The check of a key bounded in :data:`~wheelgen.design.bounds.BOUNDS`."""
    return Bounded(name)


def bounded_length(name: str) -> Check:
    """The check of a length key: its bound in mm, numbers or text with a unit."""
    return Bounded(name, length=True)


def reason_of(check: Check | None) -> str:
    """The reason of a bounded key's limits, as a sentence for the message's end."""
    if not isinstance(check, Bounded):
        return ""
    reason = check.bound.reason
    return f"Why: {reason}."


def choice(*options: str) -> Check:
    """The check of a key that takes one of ``options``."""

    def check(v: Any) -> str | None:
        return (
            None if v in options else "one of " + ", ".join(f"'{o}'" for o in options)
        )

    return check


def finite_number(v: Any) -> bool:
    """Is ``v`` a finite number (not true/false)?"""
    return isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)


def position(v: Any) -> float | None:
    """A coordinate of a list (``at``, ``plates``, ``rectangle``, ``polygon``) in mm: a
    number, or text with a unit; ``None`` when it is neither or out of bounds."""
    if isinstance(v, str):
        try:
            v = float(parse_length(v))
        except LengthError:
            return None
    if not finite_number(v) or not BOUNDS["position"].holds(v):
        return None
    return float(v)


#: How the coordinates of a list may be written, for messages.
COORDINATE = "each a number (mm) or text with its unit, " + BOUNDS["position"].allowed()


#: Periods from a microsecond to a million years: beyond them a float cannot hold the
#: derived rates and periods of a long train.
MIN_PERIOD_S = Fraction(BOUNDS["period_s"].low)
MAX_PERIOD_S = Fraction(BOUNDS["period_s"].high)
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


def listed(names: Any, shown: int = 20) -> str:
    """Names in quotes, the first ``shown`` of them: a large train has thousands."""
    names = list(names)
    if not names:
        return "(none defined)"
    text = ", ".join(f'"{n}"' for n in names[:shown])
    return text if len(names) <= shown else f"{text} and {len(names) - shown} more"


def ordinal(n: int) -> str:
    """``1st``, ``2nd``, ``11th``: the place of a table among its kind."""
    suffix = "th" if 10 <= n % 100 <= 20 else _ORDINAL.get(n % 10, "th")
    return f"{n}{suffix}"


def type_name(v: Any) -> str:
    """What kind of TOML value ``v`` is, in words."""
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


def expected(kind: str, check: Check | None) -> str:
    """What a key accepts, in words: the check's own phrase when it has one."""
    if check is not None:
        # A check asked about a value that fails every test (NaN compares false,
        # None is no option) answers with its full description.
        phrase = check(None if kind == "string" else math.nan)
        if phrase:
            return phrase
    return _KIND_PHRASE[kind]


def show(v: Any) -> str:
    """``v`` as the file would write it, cut short when long."""
    if isinstance(v, str):
        # JSON quoting shows a control character as an escape (``"sun\\n"``)
        text = json.dumps(v, ensure_ascii=False)
        return text if len(text) <= 60 else text[:56] + '..."'
    if isinstance(v, bool):
        return "true" if v else "false"
    text = repr(v)
    return text if len(text) <= 40 else text[:37] + "..."


class Lines:
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
        """The line of a key of a table (or of the table itself), if found."""
        if key and key in self.keys.get((table, index), {}):
            return self.keys[(table, index)][key]
        block = self.blocks.get((table, index))
        return block[0] if block else None


class FileReader:
    """One train file being read: its text, where its lines are, and every problem
    found so far (at most :data:`_PROBLEMS_SHOWN` described, the rest counted).

    The table readers (:mod:`.settings_tables`, :mod:`.train_tables`,
    :mod:`.display_tables`) and the cross references (:mod:`.references`) take it and
    read every value through it, so each value is checked and each problem says where.
    """

    def __init__(self, text: str, filename: str) -> None:
        self.text = text
        self.file = filename
        self.problems: list[Problem] = []
        self.lines = Lines(text)
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

    def where(self, table: str, index: int, item: str, key: str = "") -> Where:
        """Where an item (and one of its keys) is written in the file."""
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
        """Note a problem (counted only, once enough are described)."""
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

    def value(
        self,
        data: dict[str, Any],
        key: str,
        kind: str,
        ctx: tuple[str, int, str],
        *,
        required: bool = False,
        default: Any = None,
        check: Check | None = None,
    ) -> Any:
        """The value of ``key`` in ``data``, read as ``kind`` and checked.

        A length written with a unit becomes millimetres. A missing, mistyped or refused
        value is a problem (a missing one only when ``required``) and gives ``default``.
        """
        table, index, item = ctx
        if key not in data:
            if required:
                self.problem(
                    self.where(table, index, item, key),
                    f"'{key}' is missing",
                    f"{expected(kind, check)} (required)",
                )
            return default
        v = data[key]
        w = self.where(table, index, item, key)
        shown = f"{key} = {show(v)}"
        if kind == "length" and isinstance(v, str):
            try:
                mm = parse_length(v)
            except LengthError as exc:
                self.problem(w, f"{shown}: {exc}", expected(kind, check))
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
                w, f"{key} = {show(v)} ({type_name(v)})", expected(kind, check)
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
                    reason_of(check),
                )
                return default
        if check is not None:
            allowed = check(v)
            if allowed:
                self.problem(w, shown, allowed, reason_of(check))
                return default
        return v

    def unknown_keys(
        self,
        data: dict[str, Any],
        known: tuple[str, ...] | list[str],
        ctx: tuple[str, int, str],
        required: tuple[str, ...] = (),
    ) -> None:
        """Report every key of ``data`` not in ``known``, with a "did you mean"."""
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
        """The single table ``[name]`` of the document, or None if absent or not a table."""
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
                f"'{name}' is {type_name(v)}",
                f"a single table written [{name}]",
            )
            return None
        return v

    def tables(self, doc: dict[str, Any], name: str) -> list[dict[str, Any]]:
        """The tables ``[[name]]`` of the document (none if absent or not tables)."""
        if name not in doc:
            return []
        v = doc[name]
        if not isinstance(v, list) or not all(isinstance(t, dict) for t in v):
            self.problem(
                Where(self.file, f"[[{name}]]", line=self.lines.line(name)),
                f"'{name}' is {type_name(v)}",
                f"tables written [[{name}]], one per {name}",
            )
            return []
        return v

    def name_of(
        self, data: dict[str, Any], table: str, index: int
    ) -> tuple[str | None, str]:
        """The item's name (or None) and how to call it in messages."""
        anon = f"the {ordinal(index + 1)} [[{table}]]"
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
                f"name = {show(raw)} ({type_name(raw)})",
                "text: " + NAME_ALLOWED,
            )
            return None, anon
        item = f"{table} {show(raw)}"
        wrong = name_problem(raw)
        if wrong is not None:
            self.broken.setdefault(table, set()).add(raw)
            reserved = name_key(raw) in RESERVED_NAMES
            self.problem(
                self.where(table, index, item, "name"),
                f"name = {show(raw)}: {wrong}",
                "any other name (not " + ", ".join(sorted(RESERVED_NAMES)) + ")"
                if reserved
                else NAME_ALLOWED,
            )
            return None, item if reserved else anon
        return raw, item

    def pair_of_numbers(
        self,
        t: dict[str, Any],
        key: str,
        ctx: tuple[str, int, str],
        default: Any = None,
    ) -> Any:
        """``key = [a, b]``: two coordinates in mm (numbers or lengths with units)."""
        if key not in t:
            return default
        v = t[key]
        values = [position(x) for x in v] if isinstance(v, list) else []
        if len(values) != 2 or None in values:
            self.problem(
                self.where(ctx[0], ctx[1], ctx[2], key),
                f"{key} = {show(v)}",
                'two lengths in brackets, such as [0.0, 40.0] or ["0 in", "1.5 in"], '
                + COORDINATE,
                reason_of(bounded("position"))
                if isinstance(v, list) and len(v) == 2
                else "",
            )
            return default
        return (float(values[0] or 0.0), float(values[1] or 0.0))

    def period(
        self,
        t: dict[str, Any],
        key: str,
        ctx: tuple[str, int, str],
        required: bool = False,
    ) -> Fraction | None:
        """``key = "27.321661 d"``: a period as exact seconds, within the period bounds."""
        raw = self.value(t, key, "string", ctx, required=required, check=_period_text)
        if raw is None:
            return None
        try:
            value = parse_period(raw)
        except PeriodError as exc:
            self.problem(
                self.where(*ctx, key), f"{key} = {show(raw)}: {exc}", _PERIOD_ALLOWED
            )
            return None
        if not MIN_PERIOD_S <= value <= MAX_PERIOD_S:
            self.problem(
                self.where(*ctx, key),
                f"{key} = {show(raw)} is out of range",
                _PERIOD_ALLOWED,
            )
            return None
        return value
