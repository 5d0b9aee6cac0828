"""How big the files of a build are: per file, per format and in all, for a person
deciding what to send to a shop or a printer.

Plain standard library (no CAD kernel). Sizes are bytes; :func:`size_text` writes them
with SI prefixes (1 kB = 1000 bytes), as file managers on most systems do.
"""

from __future__ import annotations

from collections.abc import Iterable
from pathlib import Path
from typing import Any

__all__ = ["file_format", "list_files", "part_file", "size_summary", "size_text"]


def file_format(path: str) -> str:
    """The format of a file by its name: the extension in lower case (``"step"``)."""
    name = path.rsplit("/", 1)[-1]
    return name.rsplit(".", 1)[-1].lower() if "." in name else ""


def part_file(path: str) -> tuple[str, str] | None:
    """(part name, format) of a part's file ``<format>/<part>.<format>``, else None."""
    folder, _, name = path.rpartition("/")
    fmt = file_format(name)
    if not fmt or folder != fmt:
        return None
    return name[: -len(fmt) - 1], fmt


def list_files(root: Path, skip: Iterable[str] = ()) -> list[tuple[str, int]]:
    """(POSIX path relative to ``root``, bytes) of every file under ``root``, sorted.

    Names in ``skip`` (relative paths) and hidden files and folders (a working
    folder such as ``.work``) are left out.
    """
    root = Path(root)
    leave = set(skip)
    out = []
    for p in sorted(root.rglob("*")):
        rel = p.relative_to(root).as_posix()
        hidden = any(part.startswith(".") for part in rel.split("/"))
        if p.is_file() and rel not in leave and not hidden:
            out.append((rel, p.stat().st_size))
    return sorted(out)


def size_summary(files: Iterable[tuple[str, int]]) -> dict[str, Any]:
    """Total bytes, and files and bytes per format, of ``(path, bytes)`` pairs."""
    formats: dict[str, dict[str, int]] = {}
    total = 0
    for path, size in files:
        row = formats.setdefault(file_format(path), {"files": 0, "bytes": 0})
        row["files"] += 1
        row["bytes"] += size
        total += size
    return {"total_bytes": total, "formats": dict(sorted(formats.items()))}


def size_text(size: int) -> str:
    """``size`` bytes as a short text: ``"512 B"``, ``"48.2 kB"``, ``"6.64 MB"``."""
    if size < 1000:
        return f"{size} B"
    text = ""
    for unit, scale in (("kB", 1e3), ("MB", 1e6), ("GB", 1e9)):
        value = size / scale
        digits = 2 if value < 9.995 else 1 if value < 99.95 else 0
        text = f"{value:.{digits}f} {unit}"
        if round(value, digits) < 1000:
            break
    return text
