"""One findings model for every check: what was found, how bad, and what to change.

A finding may carry *changes*: edits of the train file (a key of the format, on one
item, set to a value) that clear it. A finding may also carry *consequences*: the
findings it brings with it, which go away when it is put right. Such a finding is a
cause; the summary counts causes.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Iterable, Literal, Union

__all__ = [
    "Change",
    "ChangeValue",
    "Finding",
    "Level",
    "LEVELS",
    "count_levels",
    "format_value",
    "has_errors",
    "ordinal",
    "sort_findings",
    "findings_table",
]

ChangeValue = Union[float, int, str, tuple[float, ...]]


def ordinal(n: int) -> str:
    """``1st``, ``2nd``, ``3rd``, ``11th``, ``21st``."""
    if 10 <= n % 100 <= 20:
        return f"{n}th"
    return f"{n}{ {1: 'st', 2: 'nd', 3: 'rd'}.get(n % 10, 'th') }"


def format_value(value: ChangeValue) -> str:
    """A value as it is written in a train file: ``0.15``, ``[30.8, 0.0]``, ``"H7/g6"``."""
    if isinstance(value, tuple):
        return "[" + ", ".join(format_value(v) for v in value) + "]"
    if isinstance(value, str):
        return f'"{value}"'
    if isinstance(value, bool) or isinstance(value, int):
        return str(value)
    text = f"{value:.4f}".rstrip("0")
    return text + "0" if text.endswith(".") else text


@dataclass(frozen=True, slots=True)
class Change:
    """One edit of the train file: set ``key`` to ``value`` on one item.

    ``table`` is the file's table (``"arbor"``, ``"wheel"``, ``"mesh"``, ``"pinslot"``,
    ``"hand"``, ``"dial"``, ``"process"``, ``"frame"``, ``"display"``); ``name`` the item's
    name, a mesh's 1-based position as text, the arbor of a ``[[hand]]`` or
    ``[[dial]]``, or ``""`` for a single table; ``key`` a key of that table.
    Numbers are rounded to what :func:`format_value` prints, so the text and the value
    are the same edit.
    """

    table: str
    name: str
    key: str
    value: ChangeValue

    def __post_init__(self) -> None:
        v = self.value
        if isinstance(v, float):
            object.__setattr__(self, "value", round(v, 4) + 0.0)
        elif isinstance(v, tuple):
            object.__setattr__(self, "value", tuple(round(x, 4) + 0.0 for x in v))

    @property
    def item(self) -> str:
        """The item as messages name it: ``arbor "planet"``, ``the 2nd [[mesh]]``."""
        if self.table in ("process", "frame", "design", "defaults", "display", "input"):
            return f"[{self.table}]"
        if self.table in ("hand", "dial"):
            return f'the [[{self.table}]] of arbor "{self.name}"'
        if self.table == "mesh":
            return f"the {ordinal(int(self.name))} [[mesh]]"
        return f'{self.table} "{self.name}"'

    def __str__(self) -> str:
        return f"{self.key} = {format_value(self.value)} on {self.item}"

    def as_dict(self) -> dict[str, Any]:
        value = list(self.value) if isinstance(self.value, tuple) else self.value
        return {"table": self.table, "name": self.name, "key": self.key, "value": value}


Level = Literal["error", "warning", "note"]
#: Levels from worst to mildest; an ``error`` stops export.
LEVELS: tuple[Level, ...] = ("error", "warning", "note")


@dataclass(frozen=True, slots=True)
class Finding:
    """One result of one check.

    ``check`` is our own id (``"train.locked"``, ``"mesh.contact_ratio"``);
    ``subject`` names the item (``"wheel w3"``, ``"mesh w1-w2"``, ``"arbor moon"``).
    ``measured`` and ``limit`` are short strings with their units ("1.08", "0.4 mm").
    """

    level: Level
    check: str
    subject: str
    message: str
    measured: str = ""
    limit: str = ""
    advice: str = ""
    changes: tuple[Change, ...] = ()
    consequences: tuple["Finding", ...] = ()

    def __post_init__(self) -> None:
        if self.level not in LEVELS:
            raise ValueError(
                f"'level' must be one of {', '.join(LEVELS)}, got {self.level!r}"
            )

    def as_dict(self) -> dict[str, Any]:
        return {
            "level": self.level,
            "check": self.check,
            "subject": self.subject,
            "message": self.message,
            "measured": self.measured,
            "limit": self.limit,
            "advice": self.advice,
            "changes": [c.as_dict() for c in self.changes],
            "consequences": [f.as_dict() for f in self.consequences],
        }

    def every(self) -> Iterable[Finding]:
        """This finding and all its consequences, depth first."""
        yield self
        for f in self.consequences:
            yield from f.every()


def has_errors(findings: Iterable[Finding]) -> bool:
    return any(f.level == "error" for f in findings)


def count_levels(findings: Iterable[Finding]) -> dict[Level, int]:
    """Causes (top-level findings) per level."""
    rows = list(findings)
    return {lvl: sum(1 for f in rows if f.level == lvl) for lvl in LEVELS}


def sort_findings(findings: Iterable[Finding]) -> list[Finding]:
    """Errors first, then warnings, then notes; stable within a level."""
    return sorted(findings, key=lambda f: LEVELS.index(f.level))


def _paragraph(f: Finding, indent: str, brief: bool = False) -> list[str]:
    lines = [f"{indent}{f.level.upper():7s} {f.check:24s} {f.subject}"]
    body = indent + " " * 8
    lines.append(f"{body}{f.message}")
    if brief:  # a consequence: what to change is its cause's advice
        return lines
    extra = []
    if f.measured:
        extra.append(f"measured {f.measured}")
    if f.limit:
        extra.append(f"limit {f.limit}")
    if extra:
        lines.append(body + "; ".join(extra))
    if f.advice:
        lines.append(f"{body}change: {f.advice}")
    if f.consequences:
        lines.append(f"{body}brings with it (gone once this is put right):")
        for c in sort_findings(f.consequences):
            lines.extend(_paragraph(c, body + "  ", brief=True))
    return lines


def findings_table(findings: Iterable[Finding]) -> str:
    """Plain-text table, one finding a paragraph, worst first, consequences under
    their cause; the summary counts causes."""
    rows = sort_findings(findings)
    if not rows:
        return "No findings: every check passed."
    lines = []
    for f in rows:
        lines.extend(_paragraph(f, ""))
    counts = count_levels(rows)
    brought = sum(len(list(f.every())) - 1 for f in rows)
    tail = (
        f" ({brought} more finding(s) follow from them, listed under their cause)"
        if brought
        else ""
    )
    lines.append(
        f"{counts['error']} error(s), {counts['warning']} warning(s), "
        f"{counts['note']} note(s){tail}"
    )
    return "\n".join(lines)
