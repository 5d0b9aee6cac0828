"""Exact Gauss-Jordan elimination over the rationals, one equation at a time.

The one solver of the train's linear relations: the rates (:mod:`.rates`) and the
angles with their pin-and-slot deviations (:mod:`.angles`) both build their systems
here. An equation is ``sum(coeffs[x] * x) == rhs``, where the right-hand side is a
linear form in *symbols* (``{symbol: coefficient}``): the rates use one symbol, the
constant 1; the angles the drive's angle and each coupling's deviation. Every reduced
row keeps the set of equations it came from, so a contradiction can name its sources.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

__all__ = ["Form", "Row", "ExactSystem", "minus"]

#: A linear form: variable or symbol name -> exact coefficient (no zero entries).
Form = dict[str, Fraction]


def minus(a: Form, b: Form, c: Fraction) -> Form:
    """``a - c * b`` without zero entries."""
    out = dict(a)
    for k, v in b.items():
        out[k] = out.get(k, Fraction(0)) - c * v
    return {k: v for k, v in out.items() if v != 0}


@dataclass
class Row:
    """One reduced equation: ``coeffs . x == rhs``, from the equations ``sources``."""

    coeffs: Form
    rhs: Form
    sources: frozenset[int]


class ExactSystem:
    """A system in reduced row echelon form, one row per pivot variable.

    The pivot of a new row is its smallest variable name, so the same equations in
    the same order always give the same rows.
    """

    def __init__(self) -> None:
        self.rows: dict[str, Row] = {}
        # variable -> pivots of the rows that hold it: a new pivot is eliminated from
        # those rows only, not looked for in every row (a long train has thousands)
        self.holding: dict[str, set[str]] = {}

    def reduce(self, coeffs: Form, rhs: Form, sources: frozenset[int]) -> Row:
        """The equation with every pivot of the system eliminated from it."""
        # rows hold no other row's pivot, so subtracting one never brings a pivot in:
        # the pivots the equation holds at first are all there is to eliminate
        for pivot in [k for k in coeffs if k in self.rows]:
            row = self.rows[pivot]
            c = coeffs.get(pivot)
            if c:
                coeffs = minus(coeffs, row.coeffs, c)
                rhs = minus(rhs, row.rhs, c)
                sources = sources | row.sources
        return Row(coeffs, rhs, sources)

    def add(self, coeffs: Form, rhs: Form, index: int) -> Row | None:
        """Add equation number ``index``; return the contradicting row, if any.

        An equation that the others already imply adds nothing; one that contradicts
        them leaves a row with no variables and a right-hand side other than zero.
        """
        clean = {k: v for k, v in coeffs.items() if v != 0}
        row = self.reduce(
            clean, {k: v for k, v in rhs.items() if v != 0}, frozenset({index})
        )
        if not row.coeffs:
            return row if row.rhs else None
        pivot = min(row.coeffs)
        scale = row.coeffs[pivot]
        row = Row(
            {k: v / scale for k, v in row.coeffs.items()},
            {k: v / scale for k, v in row.rhs.items()},
            row.sources,
        )
        for name in sorted(self.holding.get(pivot, ())):
            other = self.rows[name]
            c = other.coeffs[pivot]
            before = set(other.coeffs)
            other.coeffs = minus(other.coeffs, row.coeffs, c)
            other.rhs = minus(other.rhs, row.rhs, c)
            other.sources = other.sources | row.sources
            self._hold(name, before, set(other.coeffs))
        self.rows[pivot] = row
        self._hold(pivot, set(), set(row.coeffs))
        return None

    def _hold(self, pivot: str, before: set[str], after: set[str]) -> None:
        for k in before - after:
            self.holding[k].discard(pivot)
        for k in after - before:
            self.holding.setdefault(k, set()).add(pivot)

    def solved(self) -> dict[str, Form]:
        """Each variable the system fixes, as a form in the symbols."""
        return {p: r.rhs for p, r in self.rows.items() if len(r.coeffs) == 1}
