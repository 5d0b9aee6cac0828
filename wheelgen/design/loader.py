"""Read a train file (TOML, version 1) into a checked, immutable :class:`Design`.

The file is data: parsed with :mod:`tomllib`, never executed. Every problem found is
collected and raised together as one :class:`DesignError`, each naming the file, the
line where it can be found, the item (``wheel "w3"``, ``the 2nd [[mesh]]``) and the key.
"""

from __future__ import annotations

import hashlib
import os
import re
import stat
import tomllib
from pathlib import Path
from typing import Any

from .bounds import BOUNDS
from .display_tables import check_display_references, read_display_tables
from .errors import DesignError, Problem
from .model import Design, Where
from .names import design_name
from .references import check_references
from .schema import FileReader
from .settings_tables import (
    read_design_table,
    read_frame_table,
    read_pillars,
    read_process_table,
    read_stock,
)
from .train_tables import (
    read_arbors,
    read_defaults_table,
    read_drive_table,
    read_meshes,
    read_pinslots,
    read_targets,
    read_wheels,
)

__all__ = ["load_design", "loads_design", "TABLE_BOUNDS", "TOP_KEYS"]

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
#: The tables (and keys) a train file may have at its top.
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


def _read(rd: FileReader) -> Design:
    """Every table of the file, checked and put together as one :class:`Design`."""
    _check_size_and_nesting(rd)
    try:
        doc = tomllib.loads(rd.text)
    except tomllib.TOMLDecodeError as exc:
        msg = str(exc)
        m = re.search(r"line (\d+)", msg)
        rd.problem(
            Where(rd.file, line=int(m.group(1)) if m else None),
            f"the file is not valid TOML ({msg})",
            "TOML syntax, see docs/format.md",
        )
        raise rd.error() from None
    except (ValueError, RecursionError) as exc:
        # tomllib lets these through: an integer of more than 4300 digits
        # (ValueError from int()) and brackets nested deeper than Python's stack.
        found = (
            "lists or tables nested too deeply"
            if isinstance(exc, RecursionError)
            else "a number too long to read"
        )
        rd.problem(
            Where(rd.file),
            f"the file is not usable TOML ({found})",
            "TOML syntax, see docs/format.md",
        )
        raise rd.error() from None

    _check_document(rd, doc)
    rd.unknown_keys(doc, TOP_KEYS, ("", 0, ""))
    title, process = read_design_table(rd, doc)
    defaults = read_defaults_table(rd, doc)
    proc = read_process_table(rd, doc, process)
    frame = read_frame_table(rd, doc)
    arbors = read_arbors(rd, doc)
    wheels = read_wheels(rd, doc, defaults, proc)
    meshes = read_meshes(rd, doc, defaults)
    pinslots = read_pinslots(rd, doc)
    drive = read_drive_table(rd, doc)
    targets = read_targets(rd, doc)
    stock = read_stock(rd, doc)
    pillars = read_pillars(rd, doc)

    hands, dials, display, drive_input = read_display_tables(rd, doc)
    check_references(rd, arbors, wheels, meshes, pinslots, drive, targets)
    if rd.problems:
        raise rd.error()
    assert drive is not None  # the cross check reported a missing drive
    design = Design(
        title=title,
        name=design_name(Path(rd.file).stem),
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
        source=rd.file,
        sha256=hashlib.sha256(rd.text.encode("utf-8")).hexdigest(),
        units=rd.units,
    )
    check_display_references(rd, design)
    if rd.problems:
        raise rd.error()
    return design


def _check_size_and_nesting(rd: FileReader) -> None:
    """Refuse, before parsing, a file too large or with keys nested too deeply.

    tomllib's time grows with the square of a dotted key's length (50,000 levels
    take minutes), so deep keys are found by a scan that skips strings and comments.
    """
    size = len(rd.text.encode("utf-8", "surrogatepass"))
    limit = BOUNDS["file_bytes"]
    if not limit.holds(size):
        rd.problem(
            Where(rd.file),
            f"the file holds {size} bytes",
            f"a train file of {limit.allowed()}",
            f"Why: {limit.reason}.",
        )
        raise rd.error()
    for m in _DEEP_KEY.finditer(rd.text):
        if m.group("deep"):
            line = rd.text.count("\n", 0, m.start()) + 1
            rd.problem(
                Where(rd.file, line=line),
                f"a dotted key of more than {int(BOUNDS['nesting'].high)} parts",
                f"keys and lists nested {BOUNDS['nesting'].allowed()}",
                f"Why: {BOUNDS['nesting'].reason}.",
            )
            raise rd.error()


def _check_document(rd: FileReader, doc: dict[str, Any]) -> None:
    """Refuse a parsed file nested too deeply or with too many tables of a kind.

    Every later step (and every check) grows with these counts, so a file beyond
    them is refused here, before any work.
    """
    nesting = BOUNDS["nesting"]
    stack: list[tuple[Any, int]] = [(doc, 1)]
    while stack:
        value, depth = stack.pop()
        if depth > nesting.high:
            rd.problem(
                Where(rd.file),
                f"tables or lists nested more than {int(nesting.high)} levels deep",
                f"keys and lists nested {nesting.allowed()}",
                f"Why: {nesting.reason}.",
            )
            raise rd.error()
        children = value.values() if isinstance(value, dict) else value
        stack.extend((c, depth + 1) for c in children if isinstance(c, (dict, list)))
    for table, limit in TABLE_BOUNDS.items():
        items = doc.get(table)
        if isinstance(items, list) and not limit.holds(len(items)):
            rd.problem(
                Where(rd.file, f"[[{table}]]", line=rd.lines.line(table)),
                f"{len(items)} [[{table}]] tables",
                f"at most {int(limit.high)} [[{table}]] tables",
                f"Why: {limit.reason}.",
            )
    if rd.problems:
        raise rd.error()


def loads_design(text: str, filename: str = "<design>") -> Design:
    """Parse train-file text; raise :class:`DesignError` listing every problem."""
    return _read(FileReader(text, filename))


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
