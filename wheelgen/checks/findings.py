"""One findings model for every check: what was found, how bad, and what to change."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Iterable, Literal

__all__ = [
    "Finding",
    "Level",
    "LEVELS",
    "has_errors",
    "sort_findings",
    "findings_table",
]

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
        }


def has_errors(findings: Iterable[Finding]) -> bool:
    return any(f.level == "error" for f in findings)


def sort_findings(findings: Iterable[Finding]) -> list[Finding]:
    """Errors first, then warnings, then notes; stable within a level."""
    return sorted(findings, key=lambda f: LEVELS.index(f.level))


def findings_table(findings: Iterable[Finding]) -> str:
    """Plain-text table, one finding a paragraph, worst first."""
    rows = sort_findings(findings)
    if not rows:
        return "No findings: every check passed."
    lines = []
    for f in rows:
        head = f"{f.level.upper():7s} {f.check:24s} {f.subject}"
        lines.append(head)
        lines.append(f"        {f.message}")
        extra = []
        if f.measured:
            extra.append(f"measured {f.measured}")
        if f.limit:
            extra.append(f"limit {f.limit}")
        if extra:
            lines.append("        " + "; ".join(extra))
        if f.advice:
            lines.append(f"        change: {f.advice}")
    counts = {lvl: sum(1 for f in rows if f.level == lvl) for lvl in LEVELS}
    lines.append(
        f"{counts['error']} error(s), {counts['warning']} warning(s), {counts['note']} note(s)"
    )
    return "\n".join(lines)
