"""Apply a finding's changes to a loaded design: the file as it would read after the edit.

The check engine uses this to find a cause's consequences (what goes away once the
cause is put right); a :class:`~wheelgen.findings.Change` names the train file's
own table, item and key, so the same edit can be made in the file by hand.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import fields, replace
from typing import Any

from ..design.model import Design, Dial, Frame, Hand
from ..findings import Change

__all__ = ["apply_changes"]

# keys of the train file whose dataclass field has another name
_FIELD = {
    "pressure_angle": "pressure_angle_deg",
    "tooth_angle": "tooth_angle_deg",
    "bearing": "bearing_deg",
}


def _set(obj: Any, change: Change) -> Any:
    name = _FIELD.get(change.key, change.key)
    if name not in {f.name for f in fields(obj)}:
        raise ValueError(f"{change.item} has no key '{change.key}'")
    value = change.value
    if isinstance(value, tuple):
        value = tuple(float(v) for v in value)
    return replace(obj, **{name: value})


#: The file's arrays of tables: the design's field, and the item's name in a change.
_ARRAYS: dict[str, tuple[str, Callable[[Any], str]]] = {
    "arbor": ("arbors", lambda a: a.name),
    "wheel": ("wheels", lambda w: w.name),
    "mesh": ("meshes", lambda m: str(m.index)),
    "pinslot": ("pinslots", lambda p: p.name),
    "hand": ("hands", lambda h: h.arbor),
    "dial": ("dials", lambda d: d.arbor),
}
#: Tables of the display that a change may add when the file has none for that arbor
#: (a hand or a dial ring made by default): the file then gains the table.
_ADDED: dict[str, Callable[[str], Any]] = {"hand": Hand, "dial": Dial}
#: Single tables: the design's field.
_SINGLE = {"process": "process", "display": "display", "input": "drive_input"}


def apply_changes(design: Design, changes: tuple[Change, ...]) -> Design:
    """``design`` with every change made; ``ValueError`` for an item or key it lacks."""
    for c in changes:
        if c.table in _ARRAYS:
            field, name_of = _ARRAYS[c.table]
            items = getattr(design, field)
            if not any(name_of(x) == c.name for x in items):
                if c.table not in _ADDED:
                    raise ValueError(f"there is no {c.item}")
                items = items + (_ADDED[c.table](c.name),)
            new: dict[str, Any] = {
                field: tuple(_set(x, c) if name_of(x) == c.name else x for x in items)
            }
            design = replace(design, **new)
        elif c.table in _SINGLE:
            field = _SINGLE[c.table]
            design = replace(design, **{field: _set(getattr(design, field), c)})
        elif c.table == "frame":
            design = replace(design, frame=_set(design.frame or Frame(), c))
        else:
            raise ValueError(f"cannot change {c.item}")
    return design
