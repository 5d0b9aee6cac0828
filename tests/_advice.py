"""Follow a finding's advice the way a user would: edit the train file, check again.

A :class:`~wheelgen.findings.Change` names a table, an item, a key and a value of
the train format. :func:`apply_to_text` makes that edit in the TOML text (read with
``tomllib``, written back by the small writer below, which knows the value types the
format uses), so a key the format does not have fails the test at load time.
"""

from __future__ import annotations

import tomllib
from typing import Any

from wheelgen.design import loads_design
from wheelgen.design.model import Design
from wheelgen.findings import Change, Finding

__all__ = ["apply_to_text", "dump_toml", "recheck"]

_SINGLE = ("design", "defaults", "process", "frame", "drive", "display", "input")
_ARRAYS = ("arbor", "wheel", "mesh", "pinslot", "target", "stock", "hand", "dial")


def _value(v: Any) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, str):
        return '"' + v.replace("\\", "\\\\").replace('"', '\\"') + '"'
    if isinstance(v, (int, float)):
        return repr(v)
    if isinstance(v, (list, tuple)):
        return "[" + ", ".join(_value(x) for x in v) + "]"
    raise TypeError(f"no TOML form for {v!r}")


def dump_toml(doc: dict[str, Any]) -> str:
    """TOML text of a train-file document (tables and arrays of tables of plain values)."""
    out: list[str] = []
    for name in _SINGLE:
        if name in doc:
            out.append(f"[{name}]")
            out += [f"{k} = {_value(v)}" for k, v in doc[name].items()]
            out.append("")
    for name in _ARRAYS:
        for table in doc.get(name, []):
            out.append(f"[[{name}]]")
            out += [f"{k} = {_value(v)}" for k, v in table.items()]
            out.append("")
    return "\n".join(out)


def apply_to_text(text: str, changes: tuple[Change, ...]) -> str:
    """The train file ``text`` with every change made, as a user would make it."""
    doc = tomllib.loads(text)
    for c in changes:
        value = list(c.value) if isinstance(c.value, tuple) else c.value
        if c.table in _SINGLE:
            doc.setdefault(c.table, {})[c.key] = value
            continue
        tables = doc.setdefault(c.table, [])
        if c.table == "mesh":
            target = tables[int(c.name) - 1]
        elif c.table in ("hand", "dial"):  # one per arbor; a default one is written out
            found = [t for t in tables if t.get("arbor") == c.name]
            if not found:
                found = [{"arbor": c.name}]
                tables.append(found[0])
            (target,) = found
        else:
            (target,) = [t for t in tables if t.get("name") == c.name]
        target[c.key] = value
    return dump_toml(doc)


def recheck(text: str, finding: Finding, run: Any) -> tuple[Design, list[Finding]]:
    """Apply ``finding``'s changes to ``text``, load it and run ``run(design)`` again.

    Returns the new design and every finding of the new run, consequences included.
    """
    assert finding.changes, f"{finding.check} {finding.subject}: no change to apply"
    for change in finding.changes:
        # the advice line names the same edit as the structured change
        assert str(change) in finding.advice, (str(change), finding.advice)
    design = loads_design(apply_to_text(text, finding.changes), "edited.toml")
    found = [g for f in run(design) for g in f.every()]
    return design, found
