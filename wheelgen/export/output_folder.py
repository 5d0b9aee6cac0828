"""Which folder a build may replace: only one that wheelgen can prove it wrote.

A build replaces its output folder as a whole. Before it does, the folder must be

- absent or empty; or
- an earlier build: it holds wheelgen's marker (:data:`MARKER_NAME`, which names the
  SHA-256 of the manifest it was written with), that ``manifest.json``, and nothing
  else but the files the manifest lists, each still with its listed size and hash.

Anything else is refused (:class:`OutputFolderError`) with the names of the files that
wheelgen did not write or that were changed since, so nothing of the user's is lost:
a project folder that happens to hold a ``manifest.json``, an edited sheet, a ``.git``
folder. A folder (or a folder inside it) without write permission is refused too: the
user protected it. ``-o`` may be a symbolic link to a folder: the build goes into the
folder it points to, and the link stays.

Two design files whose names map to one design name (``Uhr_ä.toml`` and ``Uhr_ö.toml``
both give ``Uhr__``), or to names equal but for case, would share the default output
folder; the manifest records the design file's name, and the build refuses to replace
the output of another file there.
"""

from __future__ import annotations

import hashlib
import json
import os
import stat
from pathlib import Path
from typing import Any

from ..version import __version__
from .manifest import MANIFEST_NAME, file_sha256

__all__ = [
    "MARKER_NAME",
    "OutputFolderError",
    "check_replaceable",
    "marker_text",
    "real_target",
]

#: wheelgen's own marker in every output folder it writes.
MARKER_NAME = ".wheelgen-build"
# Names listed in a refusal; the count of the rest follows.
_LISTED = 8


class OutputFolderError(ValueError):
    """The output folder cannot be replaced: the message says why and what to do."""


def marker_text(manifest_bytes: bytes) -> str:
    """The marker's contents for a manifest: the version and the manifest's SHA-256."""
    data = {
        "wheelgen": __version__,
        "manifest_sha256": hashlib.sha256(manifest_bytes).hexdigest(),
    }
    return json.dumps(data, indent=2, sort_keys=True) + "\n"


def real_target(target: Path) -> Path:
    """The folder a build into ``target`` writes: a symbolic link's folder, followed.

    Raises :class:`OutputFolderError` for a link that points nowhere.
    """
    target = Path(target).absolute()
    if target.is_symlink():
        real = target.resolve()
        if not real.exists():
            raise OutputFolderError(
                f"{target} is a symbolic link to {real}, which does not exist; "
                "make that folder first, or choose another -o"
            )
        return real
    return target


def _listed(names: list[str]) -> str:
    shown = ", ".join(names[:_LISTED])
    more = len(names) - _LISTED
    return shown + (f" and {more} more" if more > 0 else "")


def check_replaceable(target: Path, design_file: str | None = None) -> None:
    """Raise :class:`OutputFolderError` unless a build may replace ``target``.

    ``design_file`` is the design file's name (no folder) when ``target`` is the default
    output folder: an earlier build there from a file of another name is refused too.
    """
    target = Path(target)
    if not os.path.lexists(target):
        return
    if target.is_symlink() or not target.is_dir():
        raise OutputFolderError(
            f"{target} exists and is not a folder; choose a new or empty folder with -o"
        )
    entries = list(target.iterdir())
    if not entries:
        _writable(target, [])
        return
    marker = target / MARKER_NAME
    manifest_path = target / MANIFEST_NAME
    if not _regular(marker):
        has_manifest = _regular(manifest_path)
        raise OutputFolderError(
            f"{target} is not a folder wheelgen wrote (it has no {MARKER_NAME} "
            "marker"
            + (f"; its {MANIFEST_NAME} is not proof enough" if has_manifest else "")
            + f"), and the build replaces its output folder as a whole: it holds "
            f"{_listed(sorted(p.name for p in entries))}. Nothing was changed. Choose "
            "a new or empty folder with -o, or move those files away"
        )
    manifest = _manifest(target, marker, manifest_path)
    if design_file is not None:
        earlier = manifest.get("design", {}).get("file")
        if isinstance(earlier, str) and earlier != design_file:
            raise OutputFolderError(
                f"{target} holds the build of {earlier!r}, not of {design_file!r}: "
                "both file names give the same output folder. Rename one of the "
                "files, or build into another folder with -o"
            )
    listed = _listed_files(manifest)
    listed_dirs = {str(Path(rel).parent.as_posix()) for rel in listed}
    listed_dirs |= {p.as_posix() for rel in listed_dirs for p in Path(rel).parents}
    foreign, changed, dirs = [], [], []
    for folder, subdirs, files in os.walk(target):
        here = Path(folder)
        dirs.append(here)
        keep = []
        for name in sorted(subdirs + files):
            path = here / name
            rel = path.relative_to(target).as_posix()
            if path.is_symlink():
                foreign.append(rel)  # a link, even to a file of ours, is not ours
            elif name in subdirs:
                if rel in listed_dirs:
                    keep.append(name)
                else:
                    foreign.append(rel + "/")
            elif rel in (MARKER_NAME, MANIFEST_NAME):
                continue
            elif rel not in listed or not _regular(path):
                foreign.append(rel)
            elif not _same(path, *listed[rel]):
                changed.append(rel)
        subdirs[:] = keep
    if foreign or changed:
        parts = []
        if foreign:
            parts.append(f"files wheelgen did not write: {_listed(foreign)}")
        if changed:
            parts.append(f"files changed since it wrote them: {_listed(changed)}")
        raise OutputFolderError(
            f"{target} holds {'; and '.join(parts)}. The build replaces the folder "
            "as a whole, so nothing was changed: move those files away (or delete "
            "them), or build into another folder with -o"
        )
    _writable(target, dirs)


def _regular(path: Path) -> bool:
    try:
        return stat.S_ISREG(os.lstat(path).st_mode)
    except OSError:
        return False


def _manifest(target: Path, marker: Path, manifest_path: Path) -> dict[str, Any]:
    """The earlier build's manifest, if the marker vouches for it."""
    refuse = OutputFolderError(
        f"{target} has a {MARKER_NAME} marker, but its {MANIFEST_NAME} is missing, "
        "unreadable or not the one the marker names (changed by hand?); nothing was "
        "changed: move the folder away, or build into another folder with -o"
    )
    try:
        vouched = json.loads(marker.read_text(encoding="utf-8"))["manifest_sha256"]
        raw = manifest_path.read_bytes() if _regular(manifest_path) else b""
        data = json.loads(raw.decode("utf-8"))
    except (OSError, ValueError, KeyError, TypeError):
        raise refuse from None
    if hashlib.sha256(raw).hexdigest() != vouched or not isinstance(data, dict):
        raise refuse
    return data


def _listed_files(manifest: dict[str, Any]) -> dict[str, tuple[object, object]]:
    """Each listed file's size and SHA-256 as the manifest gives them (unchecked)."""
    out: dict[str, tuple[object, object]] = {}
    for row in manifest.get("files", []):
        if isinstance(row, dict) and isinstance(row.get("path"), str):
            out[row["path"]] = (row.get("bytes"), row.get("sha256"))
    return out


def _same(path: Path, size: object, digest: object) -> bool:
    try:
        return path.stat().st_size == size and file_sha256(path) == digest
    except OSError:
        return False


def _writable(target: Path, dirs: list[Path]) -> None:
    for folder in [target, *dirs]:
        # the owner's write bit says "protected" even to an administrator, whom
        # access() always lets write
        protected = not os.lstat(folder).st_mode & stat.S_IWUSR
        if protected or not os.access(folder, os.W_OK | os.X_OK):
            where = "" if folder == target else f" (its folder {folder.name})"
            raise OutputFolderError(
                f"{target} is write-protected{where}; wheelgen does not replace a "
                "folder you protected. Make it writable (chmod -R u+w) or build into "
                "another folder with -o"
            )
