"""Reuse part files from earlier builds: a cache keyed by what decides their bytes.

The key of a part is a SHA-256 of its parameters (its placement left out: the files
hold the part in its own frame), the wheelgen version, a fingerprint of wheelgen's own
source files (so that a changed or patched installation never reuses files the old code
wrote) and the export options. The cache lives in ``.wheelgen-cache/`` beside the
design's output folder (for ``output/<design>/`` that is ``output/.wheelgen-cache/``);
delete it at any time. An entry is a folder written under a temporary name and renamed
when complete, so a killed build never leaves a half entry that looks whole.

An entry proves itself before it is used: its index (``.complete``) records the size
and SHA-256 of each of its files, and every file is read through that check, as a
regular file and never through a symbolic link (:meth:`PartCache.copy_verified`). A
file that is missing, changed, truncated or not a regular file, or an index that cannot
be read, makes the entry :class:`DamagedEntry`: the build then removes it and makes the
part again, so a damaged file is never shipped.

The cache is never shared between users: its folder is made private (mode 0700) and a
folder of that name that belongs to someone else, is a symbolic link or is open to
others is not used (:class:`CacheUnusable`); the build then goes on without the cache.

Upkeep: every build marks the entries it used, then removes entries no build has used for
:data:`KEEP_DAYS` days and temporary folders left by killed builds, so the cache does not
grow without bound as designs and wheelgen change.
"""

from __future__ import annotations

import dataclasses
import errno
import functools
import hashlib
import json
import os
import shutil
import stat
import tempfile
import time
from pathlib import Path
from typing import Any

from ..layout.part_kinds import Part
from ..version import __version__

__all__ = [
    "CACHE_DIR_NAME",
    "KEEP_DAYS",
    "CacheUnusable",
    "DamagedEntry",
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
#: An entry's index: its files with their sizes and SHA-256, written last.
_INDEX = ".complete"


def cache_root_for(out_dir: Path) -> Path:
    """Where the cache of a build into ``out_dir`` lives: beside it."""
    return Path(out_dir).absolute().parent / CACHE_DIR_NAME


def part_parameters(part: Part) -> dict[str, Any]:
    """Every field of a part as plain JSON data (nested specs included)."""
    data: dict[str, Any] = json.loads(json.dumps(dataclasses.asdict(part), default=str))
    return data


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


def part_key(part: Part, options: dict[str, Any]) -> str:
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


class DamagedEntry(Exception):
    """A cache entry that does not prove itself; the message says what is wrong."""


class CacheUnusable(Exception):
    """The cache folder cannot be used safely; the message says why."""


def _read_regular(path: Path, limit: int | None = None) -> bytes:
    """The bytes of a regular file, opened without following a symbolic link."""
    fd = os.open(path, os.O_RDONLY | getattr(os, "O_NOFOLLOW", 0))
    try:
        if not stat.S_ISREG(os.fstat(fd).st_mode):
            raise DamagedEntry(f"{path.name} is not a regular file")
        with os.fdopen(fd, "rb", closefd=False) as fh:
            return fh.read() if limit is None else fh.read(limit)
    finally:
        os.close(fd)


class PartCache:
    """A folder of entries ``<root>/<key[:2]>/<key>/`` holding a part's files."""

    def __init__(self, root: Path) -> None:
        self.root = Path(root)

    def entry(self, key: str) -> Path:
        return self.root / key[:2] / key

    def prepare(self) -> None:
        """Make the cache folder (private), or raise :class:`CacheUnusable`."""
        try:
            self.root.mkdir(mode=0o700, parents=True, exist_ok=True)
            info = os.lstat(self.root)
        except OSError as exc:
            raise CacheUnusable(
                f"the part cache {self.root} cannot be made ({exc.strerror or exc})"
            ) from None
        if not stat.S_ISDIR(info.st_mode):
            raise CacheUnusable(f"{self.root} is not a folder (a link, or a file)")
        if hasattr(os, "getuid") and info.st_uid != os.getuid():
            raise CacheUnusable(
                f"the part cache {self.root} belongs to another user; a cache is "
                "never shared"
            )
        if info.st_mode & 0o077:
            try:
                os.chmod(self.root, 0o700)
            except OSError:
                raise CacheUnusable(
                    f"the part cache {self.root} is open to other users and cannot "
                    "be made private"
                ) from None

    def index(self, key: str) -> dict[str, tuple[int, str]]:
        """The entry's files: relative path -> (bytes, SHA-256).

        Raises :class:`DamagedEntry` for an index that is missing, garbled or of an
        older kind, and ``FileNotFoundError`` when there is no entry at all.
        """
        folder = self.entry(key)
        if not folder.exists() and not folder.is_symlink():
            raise FileNotFoundError(folder)
        try:
            if folder.is_symlink() or not folder.is_dir():
                raise DamagedEntry("the entry is not a folder")
            data = json.loads(_read_regular(folder / _INDEX, 1 << 20))
            files = {
                str(rel): (int(row["bytes"]), str(row["sha256"]))
                for rel, row in data["files"].items()
            }
        except FileNotFoundError:
            raise DamagedEntry("its index is missing") from None
        except (OSError, ValueError, KeyError, TypeError, AttributeError):
            raise DamagedEntry("its index cannot be read") from None
        for rel in files:
            if rel.startswith(("/", ".")) or ".." in rel.split("/"):
                raise DamagedEntry(f"its index names {rel!r}")
        return files

    def check(self, key: str) -> bool:
        """True if the entry exists with every file a regular file of its size.

        False if there is no entry; :class:`DamagedEntry` if there is one that does
        not prove itself. The hashes are checked as each file is read
        (:meth:`read_verified`), so the bytes checked are the bytes used.
        """
        try:
            files = self.index(key)
        except FileNotFoundError:
            return False
        for rel, (size, _) in files.items():
            try:
                info = os.lstat(self.entry(key) / rel)
            except OSError:
                raise DamagedEntry(f"{rel} is missing") from None
            if not stat.S_ISREG(info.st_mode):
                raise DamagedEntry(f"{rel} is not a regular file")
            if info.st_size != size:
                raise DamagedEntry(f"{rel} has {info.st_size} bytes, not {size}")
        return True

    def has(self, key: str) -> bool:
        """True if the entry exists and every file proves itself (size and hash)."""
        try:
            return self.check(key) and all(
                self.read_verified(key, rel) is not None for rel in self.index(key)
            )
        except DamagedEntry:
            return False

    def files(self, key: str) -> list[str]:
        """Relative paths (POSIX) of the entry's files, in sorted order."""
        return sorted(self.index(key))

    def _file(self, key: str, rel: str) -> bytes:
        try:
            return _read_regular(self.entry(key) / rel)
        except FileNotFoundError:
            raise DamagedEntry(f"{rel} is missing") from None
        except OSError as exc:
            if exc.errno == errno.ELOOP:
                raise DamagedEntry(f"{rel} is a symbolic link") from None
            raise

    def read_verified(self, key: str, rel: str) -> bytes:
        """One file of the entry, after its size and hash were checked."""
        size, digest = self.index(key).get(rel, (None, None))
        if size is None:
            raise DamagedEntry(f"its index does not list {rel}")
        data = self._file(key, rel)
        if len(data) != size or hashlib.sha256(data).hexdigest() != digest:
            raise DamagedEntry(f"{rel} changed since it was written")
        return data

    def copy_verified(self, key: str, rel: str, dest: Path) -> None:
        """Write one file of the entry to ``dest``, only if it proves itself.

        The bytes written are the bytes checked: a file swapped after a check can
        never reach the output.
        """
        Path(dest).write_bytes(self.read_verified(key, rel))

    def new_entry(self) -> Path:
        """A fresh temporary folder to write an entry into (then :meth:`publish` it)."""
        self.root.mkdir(mode=0o700, parents=True, exist_ok=True)
        return Path(tempfile.mkdtemp(prefix=".tmp-", dir=self.root))

    def discard(self, key: str) -> None:
        """Remove an entry (first renamed aside, so no build sees half of it)."""
        folder = self.entry(key)
        if not folder.exists() and not folder.is_symlink():
            return
        aside = Path(tempfile.mkdtemp(prefix=".tmp-", dir=self.root))
        try:
            os.rename(folder, aside / "gone")
        except OSError:
            pass  # another build removed or replaced it meanwhile
        shutil.rmtree(aside, ignore_errors=True)

    def mark_used(self, key: str) -> None:
        """Record that a build used this entry now (its index's modification time)."""
        marker = self.entry(key) / _INDEX
        if marker.is_file() and not marker.is_symlink():
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
            if child.is_symlink() or not child.is_dir():
                continue
            for entry in child.iterdir():
                marker = entry / _INDEX
                if marker.is_file() and _age(marker, now) > keep_days * 86400:
                    shutil.rmtree(entry, ignore_errors=True)
                    removed += 1
        return removed

    def publish(self, key: str, tmp: Path, files: list[str]) -> None:
        """Index the files written into ``tmp`` (sizes and hashes) and make it entry
        ``key``; a damaged entry already there is replaced."""
        rows = {}
        for rel in sorted(files):
            data = (tmp / rel).read_bytes()
            rows[rel] = {"bytes": len(data), "sha256": hashlib.sha256(data).hexdigest()}
        (tmp / _INDEX).write_text(json.dumps({"files": rows}, sort_keys=True))
        dest = self.entry(key)
        dest.parent.mkdir(mode=0o700, parents=True, exist_ok=True)
        for _ in range(2):
            try:
                os.rename(tmp, dest)
                return
            except OSError:
                # another process published the same key first: its files are
                # identical if it proves itself; a damaged one is replaced
                if self.has(key):
                    break
                self.discard(key)
        shutil.rmtree(tmp, ignore_errors=True)


def _age(path: Path, now: float) -> float:
    try:
        return now - path.stat().st_mtime
    except OSError:  # removed meanwhile by another build
        return 0.0
