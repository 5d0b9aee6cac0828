"""Every part made once into the part cache, and copied from it, each file checked.

A part's entry is keyed by its parameters and the options that decide its bytes; a
damaged entry is made again (once), and a cache that keeps changing under the build
is a :class:`CacheError`.
"""

from __future__ import annotations

import shutil
from collections.abc import Callable, Sequence
from pathlib import Path

from ..layout.part_kinds import Part
from .build_options import BuildOptions
from .cache import DamagedEntry, PartCache, part_key
from .part_files import BREP_FILE, build_part_files
from .staging import Staging
from .workers import build_parallel

__all__ = [
    "CacheError",
    "changing_cache",
    "build_into_cache",
    "copy_part",
    "make_parts",
    "read_part_file",
]


def build_into_cache(part: Part, options: BuildOptions, cache_root: Path) -> str:
    """Worker: build one part's files into a cache entry; returns its key."""
    cache = PartCache(cache_root)
    key = part_key(part, options.key_options())
    try:
        if cache.check(key):
            return key
    except DamagedEntry:
        cache.discard(key)
    tmp = cache.new_entry()
    try:
        files = build_part_files(part, options, tmp)
        if (tmp / BREP_FILE).is_file():
            files.append(BREP_FILE)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    cache.publish(key, tmp, files)
    return key


class CacheError(OSError):
    """The part cache keeps changing under the build; build again with --no-cache."""


def changing_cache(cache: PartCache) -> CacheError:
    """The error of a cache that changed under the build twice in a row."""
    return CacheError(
        f"the part cache {cache.root} changed while the build read it, twice; build "
        "again, or with --no-cache"
    )


def copy_part(
    cache: PartCache,
    key: str,
    part: Part,
    options: BuildOptions,
    stage: Staging,
    tell: Callable[..., None],
) -> None:
    """Copy a part's files from its entry, each checked; a damaged entry is made again."""
    for attempt in (1, 2):
        try:
            for rel in cache.files(key):
                if rel != BREP_FILE:
                    cache.copy_verified(key, rel, stage.path(rel))
            return
        except (DamagedEntry, FileNotFoundError) as exc:
            if attempt == 2:
                raise changing_cache(cache) from None
            _remake(cache, key, part, options, tell, exc)


def read_part_file(
    cache: PartCache,
    key: str,
    part: Part,
    rel: str,
    options: BuildOptions,
    tell: Callable[..., None],
) -> bytes:
    """One file of a part's entry, checked; a damaged entry is made again first."""
    try:
        return cache.read_verified(key, rel)
    except (DamagedEntry, FileNotFoundError) as exc:
        _remake(cache, key, part, options, tell, exc)
    try:
        return cache.read_verified(key, rel)
    except (DamagedEntry, FileNotFoundError):
        raise changing_cache(cache) from None


def _remake(
    cache: PartCache,
    key: str,
    part: Part,
    options: BuildOptions,
    tell: Callable[..., None],
    exc: Exception,
) -> None:
    what = exc if isinstance(exc, DamagedEntry) else "it is gone"
    tell(
        f"part {part.name}: its cache entry is damaged ({what}); making it again",
        part.name,
    )
    cache.discard(key)
    build_into_cache(part, options, cache.root)


def make_parts(
    parts: Sequence[Part],
    keys: Sequence[str],
    cache: PartCache,
    options: BuildOptions,
    progress: Callable[[str], None] | None,
    tell: Callable[..., None],
) -> int:
    """Make every part whose entry is missing or damaged; returns how many.

    ``keys`` are the parts' cache keys; parts of one key are made once. A part already
    in the cache is reported to ``progress`` first, then each part as it is made.
    """
    todo = _missing(parts, keys, cache, tell)
    for p, k in zip(parts, keys):
        if k not in todo and progress is not None:
            progress(p.name)
    if options.jobs > 1 and len(todo) > 1:
        build_parallel(build_into_cache, todo, options, cache.root, progress)
    else:
        for p in todo.values():
            build_into_cache(p, options, cache.root)
            if progress is not None:
                progress(p.name)
    return len(todo)


def _missing(
    parts: Sequence[Part],
    keys: Sequence[str],
    cache: PartCache,
    tell: Callable[..., None],
) -> dict[str, Part]:
    """Key -> part of every part not whole in the cache (a damaged entry is removed)."""
    todo: dict[str, Part] = {}
    whole: set[str] = set()
    for p, k in zip(parts, keys):
        if k in todo or k in whole:
            continue
        try:
            if cache.check(k):
                whole.add(k)
                continue
        except DamagedEntry as exc:
            tell(f"part {p.name}: its cache entry is damaged ({exc}); making it again")
            cache.discard(k)
        todo[k] = p
    return todo
