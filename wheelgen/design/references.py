"""The references between a train file's tables, checked once every table is read.

Names unique across arbors, wheels and pin-and-slot couplings (whatever their case:
they become file names); every name a table gives (an arbor's ``around`` or
``carrier``, a wheel's ``arbor``, a mesh's ``pair``, a coupling's ``pin`` and ``slot``,
the drive's and the targets' ``arbor``) that of an existing item, with a "did you
mean"; no cycles of ``around`` and ``carrier``, nesting within its bounds, meshing
wheels on different axes and of one pitch system, and every arbor placeable.
"""

from __future__ import annotations

import difflib
from typing import Any

from .bounds import BOUNDS
from .diametral_pitch import pitch_words
from .model import Arbor, Drive, Mesh, PinSlot, Target, Wheel, Where, axis_root_of
from .names import name_key
from .schema import FileReader, listed, show

__all__ = ["check_references"]


def _pitch_words(wheel: Wheel) -> str:
    """``wheel "a" (module 1 mm)`` or ``wheel "b" (32 diametral pitch)``."""
    return (
        f"wheel {show(wheel.name)} ({pitch_words(wheel.module, wheel.diametral_pitch)})"
    )


def check_references(
    rd: FileReader,
    arbors: list[Arbor],
    wheels: list[Wheel],
    meshes: list[Mesh],
    pinslots: list[PinSlot],
    drive: Drive | None,
    targets: list[Target],
) -> None:
    """Report names used twice and references to items that do not exist,
    then, if none, the structure those references make.
    """
    by_arbor = {a.name: a for a in arbors}
    by_wheel = {w.name: w for w in wheels}
    _check_unique_names(rd, (arbors, wheels, pinslots))
    if not arbors and not rd.arbor_tables:
        rd.problem(
            Where(rd.file, "[[arbor]]"),
            "no [[arbor]] tables",
            "at least one arbor",
        )
    for a in arbors:
        if a.around is not None:
            _refers(rd, a.where, "around", a.around, by_arbor, "arbor")
        if a.carrier is not None:
            _refers(rd, a.where, "carrier", a.carrier, by_wheel, "wheel")
    for w in wheels:
        _refers(rd, w.where, "arbor", w.arbor, by_arbor, "arbor")
    for m in meshes:
        for name in m.pair:
            _refers(rd, m.where, "pair", name, by_wheel, "wheel")
    for p in pinslots:
        _refers(rd, p.where, "pin", p.pin, by_wheel, "wheel")
        _refers(rd, p.where, "slot", p.slot, by_wheel, "wheel")
    if drive is not None:
        _check_drive(rd, drive, by_arbor)
    for t in targets:
        _refers(rd, t.where, "arbor", t.arbor, by_arbor, "arbor")
    if rd.problems:
        return
    if not _check_chains(rd, by_arbor, by_wheel):
        return
    _check_pairs(rd, by_arbor, by_wheel, meshes, pinslots)
    _check_placement(rd, by_arbor, by_wheel, meshes, pinslots)


def _check_unique_names(
    rd: FileReader, groups: tuple[list[Arbor], list[Wheel], list[PinSlot]]
) -> None:
    """Names unique across arbors, wheels and couplings, whatever their case."""
    # names become file names: two that a case-insensitive disk takes for one
    # file ("Sun", "sun") collide as surely as two equal ones
    seen: dict[str, tuple[str, Where | None]] = {}
    for items in groups:
        for it in items:
            key = name_key(it.name)
            if key in seen:
                first, where = seen[key]
                same = first == it.name
                rd.problem(
                    rd.at_key(it.where, "name"),
                    f"the name {show(it.name)} is used twice"
                    if same
                    else f"the names {show(first)} and {show(it.name)} differ "
                    "only in case",
                    "names unique across arbors, wheels and pin-and-slot couplings"
                    + (
                        "" if same else ", whatever their case (they become file names)"
                    ),
                    f"It is first used at {where}." if where else "",
                )
            else:
                seen[key] = (it.name, it.where)


def _refers(
    rd: FileReader,
    where: Where | None,
    key: str,
    name: str,
    pool: dict[str, Any],
    what: str,
) -> bool:
    """Does ``name`` (the value of ``key``) name one of ``pool``? If not, say so,
    with a "did you mean", unless that item's own problem is reported already."""
    if name in pool:
        return True
    if name in rd.broken.get(what, ()):
        return False  # that item's own problem is reported already
    if rd.full():  # a hint costs a comparison with every name
        rd.left_out += 1
        return False
    close = difflib.get_close_matches(name, list(pool), n=1, cutoff=0.5)
    w = rd.at_key(where, key)
    rd.problem(
        w,
        f"{what} {show(name)} does not exist",
        f"the name of one of the {what}s: " + listed(pool),
        f'Did you mean "{close[0]}"?' if close else "",
    )
    return False


def _check_drive(rd: FileReader, drive: Drive, by_arbor: dict[str, Arbor]) -> None:
    """The drive's arbor exists and can turn."""
    if _refers(rd, drive.where, "arbor", drive.arbor, by_arbor, "arbor"):
        if by_arbor[drive.arbor].fixed:
            rd.problem(
                rd.at_key(drive.where, "arbor"),
                f'the drive arbor "{drive.arbor}" is fixed',
                "an arbor that can turn",
            )


def _check_chains(
    rd: FileReader, by_arbor: dict[str, Arbor], by_wheel: dict[str, Wheel]
) -> bool:
    """'around' and 'carrier' chains end, within the nesting bounds; True if so."""

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
                rd.problem(
                    rd.at_key(a.where, "around" if a.around is not None else "carrier"),
                    "a cycle of 'around'/'carrier': "
                    + " -> ".join(show(n) for n in loop),
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
            too_deep |= _check_depth(rd, arbor, coaxial[name], carried[name])
    return not (bad or too_deep)


def _check_pairs(
    rd: FileReader,
    by_arbor: dict[str, Arbor],
    by_wheel: dict[str, Wheel],
    meshes: list[Mesh],
    pinslots: list[PinSlot],
) -> None:
    """Meshing wheels on arbors of different axes and of one pitch system; a
    coupling's wheels on two arbors."""

    def axis(name: str) -> str:
        return axis_root_of(by_arbor, name)

    for m in meshes:
        arbor_a, arbor_b = (by_wheel[n].arbor for n in m.pair)
        if arbor_a == arbor_b:
            rd.problem(
                rd.at_key(m.where, "pair"),
                f'both wheels sit on arbor "{arbor_a}"',
                "wheels on two different arbors",
            )
        elif axis(arbor_a) == axis(arbor_b):
            # Coaxial members turn about one axis: their wheels cannot engage.
            rd.problem(
                rd.at_key(m.where, "pair"),
                f'arbors "{arbor_a}" and "{arbor_b}" share one axis (one is a sleeve around the other)',
                "wheels on arbors with different axes",
            )
    for m in meshes:
        wa, wb = (by_wheel[n] for n in m.pair)
        if (wa.diametral_pitch is None) != (wb.diametral_pitch is None):
            rd.problem(
                rd.at_key(m.where, "pair"),
                f"{_pitch_words(wa)} meshes with {_pitch_words(wb)}",
                "two wheels of one system: both cut to a module or both to a "
                "diametral pitch (their tooth proportions differ)",
            )
    for p in pinslots:
        if by_wheel[p.pin].arbor == by_wheel[p.slot].arbor:
            rd.problem(
                rd.at_key(p.where, "slot"),
                f'pin wheel and slot wheel both sit on arbor "{by_wheel[p.pin].arbor}"',
                "wheels on two different arbors",
            )


def _check_depth(rd: FileReader, arbor: Arbor, coaxial: int, carried: int) -> bool:
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
            rd.problem(
                rd.at_key(arbor.where, key),
                f"{depth} {what}",
                f"at most {int(limit.high)}",
                f"Why: {limit.reason}.",
            )
            return True
    return False


def _check_placement(
    rd: FileReader,
    by_arbor: dict[str, Arbor],
    by_wheel: dict[str, Wheel],
    meshes: list[Mesh],
    pinslots: list[PinSlot],
) -> None:
    """Every arbor must be placeable: by 'at', by 'around', or by a bearing from a placed one."""

    def axis(name: str) -> str:
        return axis_root_of(by_arbor, name)

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
            rd.problem(
                rd.at_key(arbor.where, "at"),
                "the arbor cannot be placed: it has no 'at' and no [[mesh]] with a 'bearing' links it to a placed arbor",
                "'at = [x, y]' on the arbor, or a 'bearing' on one of its meshes",
            )
