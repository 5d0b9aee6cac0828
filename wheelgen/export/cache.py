"""Reuse part files from earlier builds: a cache keyed by what decides their bytes.

The key of a part is a SHA-256 of its parameters (its placement left out: the files
hold the part in its own frame), the wheelgen version, a fingerprint of wheelgen's own
source files (so that a changed or patched installation never reuses files the old code
wrote) and the export options. The
cache lives in ``.wheelgen-cache/`` beside the design's output folder (for
``output/<design>/`` that is ``output/.wheelgen-cache/``); delete it at any time. An
entry is a folder written under a temporary name and renamed when complete, so a
killed build never leaves a half entry that looks whole.

Upkeep: every build marks the entries it used, then removes entries no build has used for
:data:`KEEP_DAYS` days and temporary folders left by killed builds, so the cache does not
grow without bound as designs and wheelgen change.
"""

from __future__ import annotations

import dataclasses
import functools
import hashlib
import json
import os
import shutil
import tempfile
import time
from pathlib import Path
from typing import Any

from .. import __version__

__all__ = [
    "CACHE_DIR_NAME",
    "KEEP_DAYS",
    "PartCache",
    "cache_root_for",
    "part_key",
    "part_parameters",
]

CACHE_DIR_NAME = ".wheelgen-cache"
#: Entries unused for this many days are removed after a build.
KEEP_DAYS = 30
#: Temporary folders older than this (seconds) are left over from killed builds.
_STALE_TMP_S = 24 * 3600


def cache_root_for(out_dir: Path) -> Path:
    """Where the cache of a build into ``out_dir`` lives: beside it."""
    return Path(out_dir).absolute().parent / CACHE_DIR_NAME


def part_parameters(part: Any) -> dict[str, Any]:
    """Every field of a part as plain JSON data (nested specs included)."""
    return json.loads(json.dumps(dataclasses.asdict(part), default=str))


def _canonical(data: Any) -> bytes:
    return json.dumps(data, sort_keys=True, separators=(",", ":"), default=str).encode()


@functools.lru_cache(maxsize=1)
def code_fingerprint() -> str:
    """SHA-256 hex over wheelgen's ``.py`` files (path and bytes), in sorted order."""
    root = Path(__file__).resolve().parents[1]
    digest = hashlib.sha256()
    for path in sorted(root.rglob("*.py")):
        digest.update(path.relative_to(root).as_posix().encode() + b"\0")
        digest.update(path.read_bytes())
    return digest.hexdigest()


def part_key(part: Any, options: dict[str, Any]) -> str:
    """SHA-256 hex of the part's parameters (without placement), version, code and options."""
    params = part_parameters(part)
    params.pop("placement", None)
    return hashlib.sha256(
        _canonical(
            {
                "wheelgen": __version__,
                "code": code_fingerprint(),
                "part": params,
                "options": options,
            }
        )
    ).hexdigest()


class PartCache:
    """A folder of entries ``<root>/<key[:2]>/<key>/`` holding a part's files."""

    def __init__(self, root: Path) -> None:
        self.root = Path(root)

    def entry(self, key: str) -> Path:
        return self.root / key[:2] / key

    def has(self, key: str) -> bool:
        return (self.entry(key) / ".complete").is_file()

    def files(self, key: str) -> list[str]:
        """Relative paths (POSIX) of the entry's files, in sorted order."""
        data = json.loads((self.entry(key) / ".complete").read_text())
        return list(data["files"])

    def new_entry(self) -> Path:
        """A fresh temporary folder to write an entry into (then :meth:`publish` it)."""
        self.root.mkdir(parents=True, exist_ok=True)
        return Path(tempfile.mkdtemp(prefix=".tmp-", dir=self.root))

    def mark_used(self, key: str) -> None:
        """Record that a build used this entry now (its marker's modification time)."""
        marker = self.entry(key) / ".complete"
        if marker.is_file():
            os.utime(marker)

    def prune(self, keep_days: float = KEEP_DAYS, now: float | None = None) -> int:
        """Remove entries unused for ``keep_days`` and stale temporary folders.

        Returns how many folders were removed. Never raises for a folder that another
        build removes at the same time.
        """
        if not self.root.is_dir():
            return 0
        now = time.time() if now is None else now
        removed = 0
        for child in self.root.iterdir():
            if child.name.startswith(".tmp-"):
                if _age(child, now) > _STALE_TMP_S:
                    shutil.rmtree(child, ignore_errors=True)
                    removed += 1
                continue
            if not child.is_dir():
                continue
            for entry in child.iterdir():
                marker = entry / ".complete"
                if marker.is_file() and _age(marker, now) > keep_days * 86400:
                    shutil.rmtree(entry, ignore_errors=True)
                    removed += 1
        return removed

    def publish(self, key: str, tmp: Path, files: list[str]) -> None:
        (tmp / ".complete").write_text(json.dumps({"files": sorted(files)}))
        dest = self.entry(key)
        dest.parent.mkdir(parents=True, exist_ok=True)
        try:
            os.rename(tmp, dest)
        except OSError:
            # another process published the same key first: its files are identical
            shutil.rmtree(tmp, ignore_errors=True)


def _age(path: Path, now: float) -> float:
    try:
        return now - path.stat().st_mtime
    except OSError:  # removed meanwhile by another build
        return 0.0
