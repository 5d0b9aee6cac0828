"""Exact rates of every arbor, as fractions of the drive arbor's rate.

The train is solved as one linear system over the rationals, so simple, compound and
epicyclic trains, and trains with several paths, are all handled the same way.

Unknowns: the absolute rate (turns per drive turn, counter-clockwise seen from the front
positive when the drive turns counter-clockwise) of every arbor. Equations:

- the drive arbor turns at 1; a ``fixed`` arbor at 0;
- an external mesh of wheels a (on arbor A) and b (on arbor B), whose axes are both
  still in a frame F turning at rate f, obeys the relation of Willis
  ``z_a (w_A - f) = -z_b (w_B - f)``. F is the fixed frame for two plate-mounted axes, or
  the frame of the carrier's arbor when a carried arbor meshes with an arbor on the
  carrier's own axis or with another arbor on the same carrier;
- a pin-and-slot coupling passes the mean rate on: ``w_pin = w_slot``.

Elimination (:mod:`.linear`, the one exact solver) keeps, for every reduced row, the
set of equations it came from, so a contradiction (a locked train) names the paths
that disagree.
"""

from __future__ import annotations

from collections import deque
from dataclasses import dataclass
from fractions import Fraction

from ..design.model import Design
from ..design.periods import scientific
from .linear import ExactSystem, Row

__all__ = [
    "Equation",
    "Conflict",
    "TrainSolution",
    "solve_rates",
    "axis_root",
    "mesh_frame",
    "rate_text",
]


@dataclass(frozen=True, slots=True)
class Equation:
    """``sum(coeffs[arbor] * w_arbor) == rhs``; ``label`` says where it comes from."""

    coeffs: tuple[tuple[str, Fraction], ...]
    rhs: Fraction
    label: str


@dataclass(frozen=True, slots=True)
class Conflict:
    """Two ways of driving one arbor that disagree: the train would lock."""

    arbor: str
    rate_one: Fraction | None
    path_one: tuple[str, ...]
    rate_two: Fraction | None
    path_two: tuple[str, ...]

    def message(self) -> str:
        if not self.path_one:  # one of many locks: only the first are explained
            return (
                f'arbor "{self.arbor}" is driven two ways that disagree as well, at '
                f"{_path_text(self.path_two)}; the train locks (only the first "
                f"{_CONFLICTS_EXPLAINED} such places are explained in full)"
            )
        r1, r2 = rate_text(self.rate_one), rate_text(self.rate_two)
        return (
            f'arbor "{self.arbor}" is driven two ways that disagree: through '
            f"{_path_text(self.path_one)} it turns {r1} times per drive turn, through "
            f"{_path_text(self.path_two)} it would turn {r2} times; the train locks"
        )


#: Links named in full in a message; a longer path names its ends and its length.
_PATH_SHOWN = 12


def _path_text(path: tuple[str, ...]) -> str:
    """'mesh a-b, mesh c-d' (the drive itself is implied unless it is all there is)."""
    links = [label for label in path if label != "the drive"]
    if len(links) > _PATH_SHOWN:
        head, tail = links[: _PATH_SHOWN // 2], links[-_PATH_SHOWN // 2 :]
        more = len(links) - len(head) - len(tail)
        links = [*head, f"... {more} more ...", *tail]
    return ", ".join(links) if links else "the drive"


def rate_text(rate: Fraction | None, digits: int = 40) -> str:
    """An exact rate as text (``"-127/38"``); one of thousands of digits, shortened.

    A long train can have rates like 3^-2000, whose exact fraction runs to pages and
    whose value no float holds: beyond ``digits`` characters it is written as
    ``"about 1.23e-954"``, worked out on the integers.
    """
    if rate is None:
        return "?"
    text = str(rate)
    return text if len(text) <= digits else f"about {scientific(rate)}"


@dataclass(frozen=True, slots=True)
class TrainSolution:
    """Rates in turns per drive turn; ``None`` where nothing determines the rate."""

    rates: dict[str, Fraction | None]
    conflicts: tuple[Conflict, ...]
    undriven: tuple[str, ...]
    bad_meshes: tuple[str, ...]  # meshes whose axes move against each other

    def rate(self, arbor: str) -> Fraction | None:
        return self.rates.get(arbor)


def axis_root(design: Design, arbor: str) -> str:
    """The innermost member of the coaxial group that ``arbor`` belongs to."""
    return design.axis_root(arbor)


def _frames(design: Design, arbor: str) -> list[str | None]:
    """Frames in which this arbor's axis stands still: its home frame, then the
    rotating frames of every member of its coaxial group (those turn about it)."""
    root = axis_root(design, arbor)
    group = [root]
    for name in group:  # the tubes around each member, outwards (depth is bounded)
        group.extend(design.sleeves_on(name))
    return [design.carrier_arbor(root)] + sorted(group)


def mesh_frame(design: Design, arbor_a: str, arbor_b: str) -> tuple[bool, str | None]:
    """The frame in which both axes stand still: ``(found, frame arbor or None)``."""
    fa, fb = _frames(design, arbor_a), _frames(design, arbor_b)
    for f in fa:
        if f in fb:
            return True, f
    return False, None


def _equations(design: Design) -> tuple[list[Equation], list[str]]:
    eqs: list[Equation] = [
        Equation(((design.drive.arbor, Fraction(1)),), Fraction(1), "the drive")
    ]
    bad: list[str] = []
    for a in design.arbors:
        if a.fixed:
            eqs.append(
                Equation(
                    ((a.name, Fraction(1)),), Fraction(0), f'fixed arbor "{a.name}"'
                )
            )
    for m in design.meshes:
        wa, wb = design.wheel(m.pair[0]), design.wheel(m.pair[1])
        ok, frame = mesh_frame(design, wa.arbor, wb.arbor)
        label = f"mesh {wa.name}-{wb.name}"
        if not ok:
            bad.append(label)
            continue
        coeffs: dict[str, Fraction] = {}
        coeffs[wa.arbor] = coeffs.get(wa.arbor, Fraction(0)) + wa.teeth
        coeffs[wb.arbor] = coeffs.get(wb.arbor, Fraction(0)) + wb.teeth
        if frame is not None:
            coeffs[frame] = coeffs.get(frame, Fraction(0)) - (wa.teeth + wb.teeth)
        eqs.append(
            Equation(
                tuple((k, v) for k, v in coeffs.items() if v != 0), Fraction(0), label
            )
        )
    for p in design.pinslots:
        pin_arbor, slot_arbor = design.wheel(p.pin).arbor, design.wheel(p.slot).arbor
        eqs.append(
            Equation(
                ((pin_arbor, Fraction(1)), (slot_arbor, Fraction(-1))),
                Fraction(0),
                f'pin-and-slot "{p.name}"',
            )
        )
    return eqs, bad


_ONE = "1"  # the rates' one symbol: the constant


def _system(eqs: list[Equation], use: list[int]) -> tuple[ExactSystem, list[Row]]:
    """The equations ``use`` in one system; the rows that contradict it."""
    system = ExactSystem()
    bad = []
    for i in use:
        eq = eqs[i]
        row = system.add(dict(eq.coeffs), {_ONE: eq.rhs}, i)
        if row is not None:
            bad.append(row)
    return system, bad


def _solve_subset(eqs: list[Equation], use: set[int]) -> dict[str, Fraction] | None:
    """Rates fixed by the equations ``use`` alone; ``None`` if they contradict."""
    system, bad = _system(eqs, sorted(use))
    if bad:
        return None
    return {p: rhs.get(_ONE, Fraction(0)) for p, rhs in system.solved().items()}


def _rate_from(eqs: list[Equation], use: set[int], arbor: str) -> Fraction | None:
    rates = _solve_subset(eqs, use)
    return None if rates is None else rates.get(arbor)


#: Equations beyond which a conflict is explained by propagation alone: the exact
#: search for shortest paths solves the system once per equation it tries to drop,
#: which grows with the cube of a train's length.
_EXPLAIN_LIMIT = 64
#: Conflicts explained with both paths; further ones name the closing link only.
_CONFLICTS_EXPLAINED = 20


def _propagate(
    eqs: list[Equation], use: set[int]
) -> tuple[dict[str, Fraction], dict[str, int]]:
    """Rates fixed one equation at a time (each with a single unknown left), and the
    equation that fixed each: linear in the size of the equations.

    Complete for chains and compound trains; an epicyclic loop whose rates follow only
    from two equations together is left to the elimination.
    """
    unknown = {i: len(eqs[i].coeffs) for i in use}
    holding: dict[str, list[int]] = {}
    for i in sorted(use):
        for k, _ in eqs[i].coeffs:
            holding.setdefault(k, []).append(i)
    rates: dict[str, Fraction] = {}
    why: dict[str, int] = {}
    todo = deque(i for i in sorted(use) if unknown[i] == 1)
    while todo:
        i = todo.popleft()
        eq = eqs[i]
        free = [(k, c) for k, c in eq.coeffs if k not in rates]
        if len(free) != 1:
            continue
        k, c = free[0]
        rates[k] = (eq.rhs - sum(v * rates[n] for n, v in eq.coeffs if n != k)) / c
        why[k] = i
        for j in holding[k]:
            unknown[j] -= 1
            if unknown[j] == 1:
                todo.append(j)
    return rates, why


def _derivation(eqs: list[Equation], use: set[int], arbor: str) -> set[int] | None:
    """The equations that fix ``arbor`` by propagation within ``use``, or None."""
    _, why = _propagate(eqs, use)
    if arbor not in why:
        return None
    path: set[int] = set()
    todo = [why[arbor]]
    while todo:
        i = todo.pop()
        if i in path:
            continue
        path.add(i)
        todo.extend(why[k] for k, _ in eqs[i].coeffs if k in why and why[k] != i)
    return path


def _shortest(
    eqs: list[Equation], use: set[int], arbor: str, keep: int | None
) -> set[int]:
    """Drop equations (last first) while the rest still fix the arbor's rate: one path.

    The search starts from the propagation's path where there is one; a path longer
    than :data:`_EXPLAIN_LIMIT` is taken as it is.
    """
    start = _derivation(eqs, use, arbor)
    path = set(use) if start is None else start
    if keep is not None and keep in use:
        path.add(keep)
    if len(path) > _EXPLAIN_LIMIT:
        return path
    for j in sorted(path, reverse=True):
        if j != keep and _rate_from(eqs, path - {j}, arbor) is not None:
            path.discard(j)
    return path


def solve_rates(design: Design) -> TrainSolution:
    """Solve the whole train exactly; report locked paths and undriven arbors."""
    eqs, bad = _equations(design)
    system = ExactSystem()
    conflicts: list[Conflict] = []
    for i, eq in enumerate(eqs):
        bad_row = system.add(dict(eq.coeffs), {_ONE: eq.rhs}, i)
        if bad_row is not None:
            if len(conflicts) < _CONFLICTS_EXPLAINED:
                conflicts.append(_explain(design, eqs, i, bad_row.sources - {i}))
            else:  # a train locked in many places: the first ones say enough
                names = [k for k, _ in eq.coeffs]
                conflicts.append(Conflict(names[-1], None, (), None, (eq.label,)))
    rates: dict[str, Fraction | None] = {a.name: None for a in design.arbors}
    for pivot, rhs in system.solved().items():
        rates[pivot] = rhs.get(_ONE, Fraction(0))
    undriven = tuple(a.name for a in design.arbors if rates[a.name] is None)
    return TrainSolution(rates, tuple(conflicts), undriven, tuple(bad))


def _explain(
    design: Design, eqs: list[Equation], index: int, others: frozenset[int]
) -> Conflict:
    """Describe a contradiction as two paths that give one arbor two different rates.

    ``others`` are the (consistent) equations the contradicting row came from. Path one
    is a smallest part of them that fixes the arbor's rate; path two is a smallest set
    that fixes it through the new equation ``index`` once one link of path one is cut.
    """
    eq = eqs[index]
    names = [k for k, _ in eq.coeffs]
    large = len(others) > _EXPLAIN_LIMIT
    earlier: dict[str, Fraction] = {}
    if large:
        earlier = _propagate(eqs, set(others))[0]
    if not all(k in earlier for k in names):
        earlier = _solve_subset(eqs, set(others)) or {}

    def labels(path: set[int]) -> tuple[str, ...]:
        return tuple(eqs[i].label for i in sorted(path))

    if large and all(k in earlier for k in names):
        # each cut below would solve the whole system again: for a long train, name
        # the longest path found and the closing link as the second one
        paths = {t: _shortest(eqs, set(others), t, None) for t in names}
        target = max(reversed(names), key=lambda t: len(paths[t]))
        rest = [(k, c) for k, c in eq.coeffs if k != target]
        implied = (eq.rhs - sum(c * earlier[k] for k, c in rest)) / dict(eq.coeffs)[
            target
        ]
        return Conflict(
            target, earlier[target], labels(paths[target]), implied, (eq.label,)
        )
    for target in reversed(names):
        rest = [(k, c) for k, c in eq.coeffs if k != target]
        if target not in earlier or not all(k in earlier for k, _ in rest):
            continue
        one = _shortest(eqs, set(others), target, None)
        everything = set(others) | {index}
        # Cut a mesh or coupling before an anchor (the drive, a fixed arbor): without
        # its anchor a closed loop of meshes still "fixes" every rate, at zero.
        for cut in sorted(one, key=lambda i: (len(eqs[i].coeffs) == 1, i)):
            rate_two = _rate_from(eqs, everything - {cut}, target)
            if rate_two is not None and rate_two != earlier[target]:
                two = _shortest(eqs, everything - {cut}, target, index)
                return Conflict(
                    target,
                    earlier[target],
                    labels(one),
                    _rate_from(eqs, two, target),
                    labels(two),
                )
        coeff = dict(eq.coeffs)[target]
        implied = (eq.rhs - sum(c * earlier[k] for k, c in rest)) / coeff
        return Conflict(
            target, earlier[target], labels(set(others)), implied, (eq.label,)
        )
    return Conflict(
        names[0] if names else "?", None, labels(set(others)), None, (eq.label,)
    )
