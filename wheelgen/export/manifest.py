"""manifest.json: what was built, from which design, and the SHA-256 of every file.

Sizes: each file's ``bytes``; ``sizes`` with the total and the files and bytes of
each format (``"step"``, ``"dxf"``...); and each part's ``file_bytes`` per format, so
a user sees what will be sent to a shop before sending it.

The manifest holds no dates or machine paths (the design file's name, not its folder),
so two builds of the same design give the same manifest byte for byte. Next to it the
build writes its marker (``export/output_folder.py``), which names the manifest's hash:
together they prove that wheelgen wrote the folder.
"""

from __future__ import annotations

import hashlib
import json
from collections.abc import Iterable, Sequence
from pathlib import Path
from typing import Any

from ..design.model import Design
from ..findings import Finding
from ..layout.part_kinds import Part
from ..version import __version__
from ..workshop.file_sizes import part_file, size_summary
from .cache import part_parameters

__all__ = ["MANIFEST_NAME", "file_sha256", "make_manifest", "write_manifest"]

MANIFEST_NAME = "manifest.json"


def file_sha256(path: Path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for block in iter(lambda: fh.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


def make_manifest(
    design: Design,
    parts: Sequence[Part],
    findings: Iterable[Finding],
    root: Path,
    files: Iterable[Path],
    checked: bool,
    options: dict[str, Any],
) -> dict[str, Any]:
    """The manifest as a dict; ``files`` are paths inside ``root``."""
    rows: list[dict[str, Any]] = []
    for p in sorted(Path(f) for f in files):
        rel = p.relative_to(root).as_posix()
        rows.append({"path": rel, "sha256": file_sha256(p), "bytes": p.stat().st_size})
    rows.sort(key=lambda r: r["path"])
    found = [f.as_dict() for f in findings]
    per_part: dict[str, dict[str, int]] = {}
    for r in rows:
        owner = part_file(r["path"])
        if owner is not None:
            per_part.setdefault(owner[0], {})[owner[1]] = r["bytes"]
    return {
        "wheelgen": __version__,
        "design": {
            "name": getattr(design, "name", ""),
            "title": getattr(design, "title", ""),
            "sha256": getattr(design, "sha256", ""),
            # the file's name without its folder: two files whose names give one
            # output folder are told apart by it (export/output_folder.py)
            "file": Path(getattr(design, "source", "") or "").name,
        },
        "checked": checked,
        "status": "checked"
        if checked
        else "UNCHECKED: exported with --force past errors",
        "options": options,
        "findings": {
            "errors": sum(1 for f in found if f["level"] == "error"),
            "warnings": sum(1 for f in found if f["level"] == "warning"),
            "notes": sum(1 for f in found if f["level"] == "note"),
            "items": found,
        },
        "parts": [
            {
                "name": p.name,
                "kind": p.kind,
                "parameters": part_parameters(p),
                "file_bytes": per_part.get(p.name, {}),
            }
            for p in parts
        ],
        "files": rows,
        "sizes": size_summary((r["path"], r["bytes"]) for r in rows),
    }


def write_manifest(manifest: dict[str, Any], path: Path) -> Path:
    text = json.dumps(manifest, indent=2, sort_keys=True, ensure_ascii=False) + "\n"
    Path(path).write_text(text, encoding="utf-8", newline="\n")
    return path
