"""Problems found in a train file, gathered in one pass and reported together."""

from __future__ import annotations

from dataclasses import dataclass

from .model import Where

__all__ = ["Problem", "DesignError"]


@dataclass(frozen=True, slots=True)
class Problem:
    """One mistake: where it is, what was found, what is allowed, and maybe a hint."""

    where: Where
    found: str
    allowed: str
    hint: str = ""

    def __str__(self) -> str:
        text = f"{self.where}: {self.found}; allowed: {self.allowed}."
        if self.hint:
            text += f" {self.hint}"
        return text


class DesignError(ValueError):
    """The train file cannot be used; ``problems`` lists every mistake found."""

    def __init__(self, problems: list[Problem] | tuple[Problem, ...]) -> None:
        self.problems = tuple(problems)
        count = len(self.problems)
        head = f"{count} problem{'s' if count != 1 else ''} in the design file:"
        super().__init__("\n".join([head] + [f"- {p}" for p in self.problems]))
