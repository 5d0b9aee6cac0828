"""The build pipeline: checks, plan, part files (cached, parallel), sheets, manifest.

``build_design`` is what ``wheelgen build`` runs; it is also the library entry point.
Order of work:

1. run the checks; an error-level finding stops the build (:class:`BuildBlocked`)
   unless ``force``, which marks the manifest as unchecked;
2. plan the parts and refuse any name that is not a plain file name, and any size
   beyond the bounds (``export/part_limits.py``);
3. build each part's files into the cache (``--jobs`` processes), or reuse them
   (``export/cached_parts.py``, ``export/part_files.py``);
4. copy them into a staging folder beside the output, add the assembly STEP
   (``export/assembly_step.py``), the sheet writers' files (``export/sheets.py``) and
   the manifest, and only then swap the folder into place.

The CAD kernel is imported only when a part or the assembly actually has to be
built, so a fully cached rebuild never pays cadquery's start-up.
"""

from __future__ import annotations

import dataclasses
import shutil
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from ..design.model import Design
from ..findings import Finding
from ..layout.part_kinds import Part
from .assembly_step import ASSEMBLY_FILE, stage_assembly
from .build_options import BuildOptions
from .cache import CacheUnusable, PartCache, cache_root_for, part_key
from .cached_parts import CacheError, copy_part, make_parts
from .formats import DXF_CURVES, FORMATS, PLANAR_FORMATS
from .manifest import MANIFEST_NAME, make_manifest, write_manifest
from .output_folder import MARKER_NAME, check_replaceable, marker_text, real_target
from .part_files import PART_WRITERS, build_part_files, part_file_names
from .part_limits import PartSizeError, check_part_names, check_part_sizes
from .sheets import write_sheets
from .staging import Staging, safe_name

__all__ = [
    "ASSEMBLY_FILE",
    "DXF_CURVES",
    "FORMATS",
    "PART_WRITERS",
    "PLANAR_FORMATS",
    "BuildBlocked",
    "BuildOptions",
    "BuildResult",
    "CacheError",
    "PartSizeError",
    "build_design",
    "build_part_files",
    "default_output_dir",
    "part_file_names",
]


class BuildBlocked(Exception):
    """An error-level finding stops the build; ``findings`` holds them all."""

    def __init__(self, findings: Sequence[Finding]) -> None:
        super().__init__("a check found an error; nothing was exported")
        self.findings = list(findings)


@dataclass(slots=True)
class BuildResult:
    """What a build did; ``files`` are POSIX paths relative to ``out_dir``."""

    out_dir: Path
    files: list[str]
    checked: bool
    built: int
    reused: int
    cache_root: Path | None
    findings: list[Finding] = field(default_factory=list)
    manifest: dict[str, Any] = field(default_factory=dict)
    notes: list[str] = field(default_factory=list)


def default_output_dir(design: Design, base: Path = Path("output")) -> Path:
    """``output/<design name>``: the design's name must be a plain file name."""
    return Path(base) / safe_name(design.name, "design name", reserved=False)


class _Notes:
    """The notes of one build: kept, passed on to ``note``, and the parts remade."""

    def __init__(self, note: Callable[[str], None] | None) -> None:
        self.note = note
        self.texts: list[str] = []
        self.remade: set[str] = set()

    def __call__(self, text: str, part: str | None = None) -> None:
        self.texts.append(text)
        if part is not None:
            self.remade.add(part)
        if self.note is not None:
            self.note(text)


def build_design(
    design: Design,
    out_dir: Path | None = None,
    options: BuildOptions = BuildOptions(),
    progress: Callable[[str], None] | None = None,
    findings: Sequence[Finding] | None = None,
    parts: Sequence[Part] | None = None,
    note: Callable[[str], None] | None = None,
) -> BuildResult:
    """Check, plan and export ``design`` into ``out_dir`` (default ``output/<name>``).

    Parameters
    ----------
    design : Design
        A loaded design (``wheelgen.design.load_design``).
    out_dir : Path, optional
        The folder that will hold the files; replaced as a whole, only on success, and
        only if it is empty or an earlier build (``export/output_folder.py``). A
        symbolic link to a folder builds into that folder.
    options : BuildOptions
        Formats, jobs, force, cache and mesh chord tolerance (mm).
    progress : callable, optional
        Called with a part's name each time one is done (built or reused).
    findings, parts : optional
        Precomputed check findings and part plan (else computed here).
    note : callable, optional
        Called with a one-line note when the build works around something: a damaged
        cache entry made again, a cache that cannot be used. The notes are also in
        :attr:`BuildResult.notes`.

    Raises
    ------
    BuildBlocked
        A check found an error and ``options.force`` is false.
    UnsafeNameError
        A part or design name is not a plain file name.
    PartSizeError
        A planned part has a size beyond the bounds (refused before the kernel runs).
    OutputFolderError
        The output folder holds files wheelgen did not write, or is protected.
    OSError
        The output cannot be written (a read-only place, a full disk).
    """
    design, options = _settled(design, options)
    tell = _Notes(note)
    findings, checked = _checked(design, findings, options.force)
    parts = _planned(design, parts)
    target = real_target(
        Path(out_dir) if out_dir is not None else default_output_dir(design)
    )
    design_file = _design_file(design) if out_dir is None else None
    check_replaceable(target, design_file)
    key_options = options.key_options()
    with Staging(target) as stage:
        assert stage.dir is not None
        cache_root, use_cache = _open_cache(target, stage.dir, options, tell)
        cache = PartCache(cache_root)
        built, used = _stage_parts(design, parts, cache, options, stage, progress, tell)
        _close_cache(cache, use_cache, used)
        if design.process.kind == "print" and "stl" in options.formats:
            _write_fit_test(design, parts, stage, options)
        write_sheets(design, parts, findings, stage.dir)
        manifest = _stage_manifest(design, parts, findings, stage, checked, key_options)
        # files may have come into the folder while the parts were made
        check_replaceable(target, design_file)
        _commit(stage, tell)
    rel_files = [r["path"] for r in manifest["files"]] + [MANIFEST_NAME]
    return BuildResult(
        out_dir=target,
        files=rel_files,
        checked=checked,
        built=built + len(tell.remade),
        reused=len(parts) - built - len(tell.remade),
        cache_root=cache_root if use_cache else None,
        findings=findings,
        manifest=manifest,
        notes=tell.texts,
    )


def _settled(design: Design, options: BuildOptions) -> tuple[Design, BuildOptions]:
    """The design with its least-play requests settled, and one unit for the part
    files and the sheets: the option's, else the design's."""
    from ..checks.least_play import settle_play

    design = settle_play(design)
    units = options.units or design.units
    options = dataclasses.replace(options, units=units)
    if design.units != units:
        design = dataclasses.replace(design, units=units)
    return design, options


def _checked(
    design: Design, findings: Sequence[Finding] | None, force: bool
) -> tuple[list[Finding], bool]:
    """Every finding (the checks run unless given) and whether none is an error.

    Raises :class:`BuildBlocked` on an error unless ``force``.
    """
    from ..findings import has_errors

    if findings is None:
        from ..checks import run_checks

        findings = run_checks(design)
    findings = list(findings)
    checked = not has_errors(findings)
    if not checked and not force:
        raise BuildBlocked(findings)
    return findings, checked


def _planned(design: Design, parts: Sequence[Part] | None) -> list[Part]:
    """Every part to make (planned unless given), their names and sizes checked."""
    if parts is None:
        from ..parts import plan_parts

        parts = plan_parts(design)
    parts = list(parts)
    check_part_names(parts)
    check_part_sizes(parts)
    return parts


def _open_cache(
    target: Path, stage_dir: Path, options: BuildOptions, tell: _Notes
) -> tuple[Path, bool]:
    """The part cache's folder, and whether it is the lasting one beside the output.

    Without it (``--no-cache``, or one that cannot be used) a throw-away cache inside
    the staging folder is used, and removed before the swap.
    """
    use_cache = options.use_cache
    cache_root = cache_root_for(target)
    if use_cache:
        try:
            PartCache(cache_root).prepare()
        except CacheUnusable as exc:
            tell(f"{exc}; building without it (as with --no-cache)")
            use_cache = False
    if not use_cache:
        cache_root = stage_dir / ".work"
        PartCache(cache_root).prepare()
    return cache_root, use_cache


def _stage_parts(
    design: Design,
    parts: Sequence[Part],
    cache: PartCache,
    options: BuildOptions,
    stage: Staging,
    progress: Callable[[str], None] | None,
    tell: _Notes,
) -> tuple[int, list[str]]:
    """Make the parts missing from the cache, copy every part's files and the
    assembly into the staging folder; returns how many were made and the cache
    keys used."""
    key_options = options.key_options()
    keys = [part_key(p, key_options) for p in parts]
    built = make_parts(parts, keys, cache, options, progress, tell)
    for p, k in zip(parts, keys):
        copy_part(cache, k, p, options, stage, tell)
    used = list(keys)
    if "step" in options.formats and parts:
        used.append(stage_assembly(design, parts, keys, cache, options, stage, tell))
    return built, used


def _close_cache(cache: PartCache, lasting: bool, used: Sequence[str]) -> None:
    """Remove a throw-away cache; in a lasting one, mark the entries used and prune."""
    if not lasting:
        shutil.rmtree(cache.root, ignore_errors=True)
        return
    for k in used:
        cache.mark_used(k)
    cache.prune()


def _stage_manifest(
    design: Design,
    parts: Sequence[Part],
    findings: Sequence[Finding],
    stage: Staging,
    checked: bool,
    key_options: dict[str, Any],
) -> dict[str, Any]:
    """Write the manifest of every staged file, and the marker that says wheelgen
    wrote this folder; returns the manifest."""
    assert stage.dir is not None
    files = sorted(p for p in stage.dir.rglob("*") if p.is_file())
    manifest = make_manifest(
        design, parts, findings, stage.dir, files, checked, key_options
    )
    manifest_path = write_manifest(manifest, stage.path(MANIFEST_NAME))
    stage.path(MARKER_NAME).write_text(
        marker_text(manifest_path.read_bytes()), encoding="utf-8", newline="\n"
    )
    return manifest


def _commit(stage: Staging, tell: _Notes) -> None:
    """Swap the staging folder into place."""
    try:
        stage.commit()
    except KeyboardInterrupt:
        # a stop held back while the folders were swapped: the build is whole
        if not stage.committed:
            raise
        tell("a stop came as the finished build was moved into place; it is whole")


def _write_fit_test(
    design: Design, parts: Sequence[Part], stage: Staging, options: BuildOptions
) -> None:
    """A printed design's fit test coupon, beside the parts' STL files."""
    from ..workshop.print_plan import FIT_TEST_FILE
    from .fit_test import write_fit_test

    write_fit_test(design, parts, stage.path(FIT_TEST_FILE), options.mesh_tolerance)


def _design_file(design: Design) -> str | None:
    """The design file's name, if the design came from a file."""
    source = getattr(design, "source", "")
    return Path(source).name if source else None
