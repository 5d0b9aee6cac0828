"""Read the display tables of a train file: ``[[hand]]``, ``[[dial]]``, ``[display]``, ``[input]``.

Every reader takes the file reader (its typed access and its list of problems) and the
parsed document, so a mistake here is reported with file, line, item and key like any
other. The tables are optional: a file without them loads as before, and every target's
arbor gets a hand by default (see :meth:`wheelgen.design.model.Design.readings`).

The parts made for the display take their names from the arbors: ``hand_<arbor>``,
``dial_<axis>`` (the innermost member of the dial's axis) and ``knob_<drive arbor>`` or
``crank_<drive arbor>``. Those names are checked here against every other name.
"""

from __future__ import annotations

import difflib
from typing import Any

from .model import Design, Dial, Display, DriveInput, Hand, Where, axis_root_of
from .schema import FileReader, bounded, bounded_length, choice, ordinal

__all__ = [
    "GRADUATIONS",
    "MAX_LABELS",
    "MAX_LABEL_CHARS",
    "hand_part_name",
    "dial_part_name",
    "input_part_name",
    "read_display_tables",
    "check_display_references",
]

#: Kinds of graduation a dial ring can carry.
GRADUATIONS = ("auto", "hours", "days", "month", "year", "degrees", "labels")
#: At most this many labels round one ring, each at most this many characters.
MAX_LABELS = 360
MAX_LABEL_CHARS = 24


def hand_part_name(arbor: str) -> str:
    """The part name of the hand on ``arbor``."""
    return f"hand_{arbor}"


def dial_part_name(axis: str) -> str:
    """The part name of the dial disc on the axis whose innermost member is ``axis``."""
    return f"dial_{axis}"


def input_part_name(kind: str, drive: str) -> str:
    """The part name of the knob or crank (``kind``) on the drive arbor."""
    return f"{kind}_{drive}"


_HAND_KEYS = (
    "arbor",
    "length",
    "tail",
    "counterweight",
    "width",
    "thickness",
    "seat",
    "rest",
)
_DIAL_KEYS = ("arbor", "radius", "graduations", "labels", "zero")
_DISPLAY_KEYS = (
    "readings",
    "dial_gap",
    "hand_gap",
    "dial_thickness",
    "hand_thickness",
)
_INPUT_KEYS = ("kind", "side", "diameter", "throw")


def read_display_tables(
    rd: FileReader, doc: dict[str, Any]
) -> tuple[tuple[Hand, ...], tuple[Dial, ...], Display, DriveInput]:
    """The hands, dial rings, display settings and drive input written in ``doc``."""
    return _hands(rd, doc), _dials(rd, doc), _display(rd, doc), _input(rd, doc)


def _hands(rd: FileReader, doc: dict[str, Any]) -> tuple[Hand, ...]:
    out = []
    for i, t in enumerate(rd.tables(doc, "hand")):
        item = f"the {ordinal(i + 1)} [[hand]]"
        arbor = t.get("arbor")
        if isinstance(arbor, str):
            item = f'the hand on arbor "{arbor}"'
        ctx = ("hand", i, item)
        rd.unknown_keys(t, _HAND_KEYS, ctx, required=("arbor",))
        arbor = rd.value(t, "arbor", "string", ctx, required=True)
        length = rd.value(t, "length", "length", ctx, check=bounded_length("size"))
        tail = rd.value(t, "tail", "length", ctx, check=bounded_length("size_or_zero"))
        weight = rd.value(
            t,
            "counterweight",
            "length",
            ctx,
            default=0.0,
            check=bounded_length("size_or_zero"),
        )
        width = rd.value(t, "width", "length", ctx, check=bounded_length("size"))
        thickness = rd.value(
            t, "thickness", "length", ctx, check=bounded_length("size")
        )
        seat = rd.value(
            t, "seat", "string", ctx, check=choice("square", "flat", "collet")
        )
        rest = rd.value(t, "rest", "number", ctx, default=0.0, check=bounded("bearing"))
        if arbor is None:
            continue
        out.append(
            Hand(
                arbor,
                length,
                tail,
                weight,
                width,
                thickness,
                seat,
                rest,
                where=rd.where("hand", i, item),
            )
        )
    return tuple(out)


def _dials(rd: FileReader, doc: dict[str, Any]) -> tuple[Dial, ...]:
    out = []
    for i, t in enumerate(rd.tables(doc, "dial")):
        item = f"the {ordinal(i + 1)} [[dial]]"
        arbor = t.get("arbor")
        if isinstance(arbor, str):
            item = f'the dial of arbor "{arbor}"'
        ctx = ("dial", i, item)
        rd.unknown_keys(t, _DIAL_KEYS, ctx, required=("arbor",))
        arbor = rd.value(t, "arbor", "string", ctx, required=True)
        radius = rd.value(t, "radius", "length", ctx, check=bounded_length("size"))
        kind = rd.value(t, "graduations", "string", ctx, check=choice(*GRADUATIONS))
        labels = _labels(rd, t, ctx)
        zero = rd.value(
            t, "zero", "number", ctx, default=90.0, check=bounded("bearing")
        )
        if labels and kind not in (None, "labels"):
            rd.problem(
                rd.where("dial", i, item, "labels"),
                f'labels with graduations = "{kind}"',
                "labels only with graduations = \"labels\" (or without 'graduations')",
            )
            continue
        if kind == "labels" and not labels:
            rd.problem(
                rd.where("dial", i, item, "graduations"),
                'graduations = "labels" without labels',
                'a list of labels, such as labels = ["high", "low"]',
            )
            continue
        if labels:
            kind = "labels"
        if arbor is None:
            continue
        out.append(
            Dial(
                arbor,
                radius,
                kind or "auto",
                labels,
                zero,
                where=rd.where("dial", i, item),
            )
        )
    return tuple(out)


def _labels(
    rd: FileReader, t: dict[str, Any], ctx: tuple[str, int, str]
) -> tuple[str, ...]:
    if "labels" not in t:
        return ()
    raw = t["labels"]
    allowed = (
        f"a list of 1 to {MAX_LABELS} texts of at most {MAX_LABEL_CHARS} characters,"
        ' such as ["new", "first quarter", "full", "last quarter"]'
    )
    ok = (
        isinstance(raw, list)
        and 1 <= len(raw) <= MAX_LABELS
        and all(
            isinstance(x, str) and 0 < len(x) <= MAX_LABEL_CHARS and x.isprintable()
            for x in raw
        )
    )
    if not ok:
        shown = repr(raw)
        shown = shown if len(shown) <= 40 else shown[:37] + "..."
        rd.problem(rd.where(*ctx, "labels"), f"labels = {shown}", allowed)
        return ()
    return tuple(raw)


def _display(rd: FileReader, doc: dict[str, Any]) -> Display:
    t = rd.table(doc, "display")
    if t is None:
        return Display()
    ctx = ("display", 0, "[display]")
    rd.unknown_keys(t, _DISPLAY_KEYS, ctx)
    base = Display()
    readings = rd.value(
        t,
        "readings",
        "string",
        ctx,
        default=base.readings,
        check=choice("targets", "none"),
    )
    dial_gap = rd.value(t, "dial_gap", "length", ctx, check=bounded_length("size"))
    hand_gap = rd.value(
        t,
        "hand_gap",
        "length",
        ctx,
        default=base.hand_gap,
        check=bounded_length("size"),
    )
    dial_t = rd.value(t, "dial_thickness", "length", ctx, check=bounded_length("size"))
    hand_t = rd.value(t, "hand_thickness", "length", ctx, check=bounded_length("size"))
    return Display(readings, dial_gap, hand_gap, dial_t, hand_t)


def _input(rd: FileReader, doc: dict[str, Any]) -> DriveInput:
    t = rd.table(doc, "input")
    if t is None:
        return DriveInput()
    ctx = ("input", 0, "[input]")
    rd.unknown_keys(t, _INPUT_KEYS, ctx)
    kind = rd.value(
        t, "kind", "string", ctx, default="knob", check=choice("knob", "crank", "none")
    )
    side = rd.value(t, "side", "string", ctx, check=choice("front", "back"))
    diameter = rd.value(t, "diameter", "length", ctx, check=bounded_length("size"))
    throw = rd.value(t, "throw", "length", ctx, check=bounded_length("size"))
    if throw is not None and kind != "crank":
        rd.problem(
            rd.where("input", 0, "[input]", "throw"),
            f"throw = {throw:g} on a {kind or 'knob'}",
            "'throw' only with kind = \"crank\"",
        )
    return DriveInput(
        kind or "knob", side, diameter, throw, rd.where("input", 0, "[input]")
    )


def check_display_references(rd: FileReader, design: Design) -> None:
    """Problems with what the display tables name: arbors, repeats and part names.

    Called once the rest of the file is known to be sound (every reference resolves,
    no cycles), with the design as it will be returned.
    """
    by_arbor = {a.name: a for a in design.arbors}
    file = rd.file

    def at(where: Where | None, key: str) -> Where:
        return rd.at_key(where, key) if where is not None else Where(file, key=key)

    def exists(where: Where | None, name: str) -> bool:
        if name in by_arbor:
            return True
        close = difflib.get_close_matches(name, list(by_arbor), n=1, cutoff=0.5)
        rd.problem(
            at(where, "arbor"),
            f'arbor "{name}" does not exist',
            "the name of one of the arbors: " + ", ".join(f'"{n}"' for n in by_arbor),
            f'Did you mean "{close[0]}"?' if close else "",
        )
        return False

    seen: dict[str, Where | None] = {}
    for h in design.hands:
        if not exists(h.where, h.arbor):
            continue
        if by_arbor[h.arbor].fixed:
            rd.problem(
                at(h.where, "arbor"),
                f'a hand on the fixed arbor "{h.arbor}"',
                "a hand on an arbor that turns (a fixed one shows nothing)",
            )
        if h.arbor in seen:
            rd.problem(
                at(h.where, "arbor"),
                f'a second [[hand]] on arbor "{h.arbor}"',
                "one hand on each arbor",
                f"The first is at {seen[h.arbor]}." if seen[h.arbor] else "",
            )
        seen[h.arbor] = h.where
    hands = {h.arbor for h in design.readings()}
    dials: dict[str, Where | None] = {}
    for d in design.dials:
        if not exists(d.where, d.arbor):
            continue
        if d.arbor in dials:
            rd.problem(
                at(d.where, "arbor"),
                f'a second [[dial]] for arbor "{d.arbor}"',
                "one dial ring for each hand",
            )
        elif d.arbor not in hands:
            rd.problem(
                at(d.where, "arbor"),
                f'a dial for arbor "{d.arbor}", which has no hand',
                "a dial for an arbor with a hand: add a [[hand]] on it, or make it a"
                " target",
            )
        dials[d.arbor] = d.where
    # the display parts' names must not clash with any other name
    names: dict[str, str] = {}
    for items, what in (
        (design.arbors, "arbor"),
        (design.wheels, "wheel"),
        (design.pinslots, "pin-and-slot coupling"),
    ):
        for it in items:
            names[it.name] = f'{what} "{it.name}"'
    derived: list[tuple[str, Where | None, str]] = []
    for h in design.readings():
        if h.arbor in by_arbor:
            derived.append((hand_part_name(h.arbor), h.where, "the hand"))
            root = axis_root_of(by_arbor, h.arbor)
            derived.append((dial_part_name(root), h.where, "its dial"))
    inp = design.drive_input
    if inp.kind != "none" and design.drive.arbor in by_arbor:
        name = input_part_name(inp.kind, design.drive.arbor)
        derived.append((name, inp.where or design.drive.where, f"the {inp.kind}"))
    for name, where, what in derived:
        if name in names:
            rd.problem(
                at(where, "arbor"),
                f'{what} would be the part "{name}", the name of {names[name]}',
                "names of arbors, wheels and couplings that leave the display's part"
                " names free (rename that item)",
            )
