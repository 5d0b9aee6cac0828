"""The build pipeline: checks, plan, part files (cached, parallel), sheets, manifest.

``build_design`` is what ``wheelgen build`` runs; it is also the library entry point.
Order of work:

1. run the checks; an error-level finding stops the build (:class:`BuildBlocked`)
   unless ``force``, which marks the manifest as unchecked;
2. plan the parts and refuse any name that is not a plain file name;
3. build each part's files into the cache (``--jobs`` processes), or reuse them;
4. copy them into a staging folder beside the output, add the assembly STEP, the
   sheet writers' files and the manifest, and only then swap the folder into place.

The CAD kernel is imported only when a part or the assembly actually has to be
built, so a fully cached rebuild never pays cadquery's start-up.
"""

from __future__ import annotations

import dataclasses
import hashlib
import io
import json
import math
import multiprocessing
import os
import shutil
import signal
import sys
import threading
from collections.abc import Callable, Sequence
from concurrent.futures import ProcessPoolExecutor, as_completed
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from ..design.bounds import BOUNDS
from ..design.names import name_key
from ..design.units import UNITS, Lengths
from ..layout.part_kinds import BOUGHT_KINDS, DISPLAY_KINDS, FLAT_KINDS, TURNED_KINDS
from ..version import __version__
from . import sheets
from .cache import CacheUnusable, DamagedEntry, PartCache, cache_root_for, part_key
from .formats import DXF_CURVES, FORMATS, MESH_TOLERANCE, PLANAR_FORMATS
from .manifest import MANIFEST_NAME, make_manifest, write_manifest
from .output_folder import MARKER_NAME, check_replaceable, marker_text, real_target
from .staging import Staging, UnsafeNameError, inside, safe_name

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

#: The assembly's file, inside the output folder.
ASSEMBLY_FILE = "step/assembly.step"
_MESH_ANGLE_DEG = 30.0

# part colours in the assembly (RGB 0..1): brass wheels, steel arbors, bronze sleeves,
# pale brass plates and cocks, steel pillars, dark screws, dark hands on a pale dial, a
# wooden knob or crank
_COLOURS = {
    "wheel": (0.80, 0.62, 0.25),
    "arbor": (0.62, 0.64, 0.68),
    "sleeve": (0.70, 0.45, 0.25),
    "collar": (0.74, 0.52, 0.30),
    "pin": (0.30, 0.30, 0.32),
    "plate": (0.86, 0.78, 0.55),
    "pillar": (0.55, 0.57, 0.60),
    "cock": (0.78, 0.66, 0.38),
    "screw": (0.20, 0.20, 0.22),
    "bearing": (0.45, 0.47, 0.50),
    "hand": (0.12, 0.14, 0.22),
    "dial": (0.93, 0.91, 0.84),
    "knob": (0.45, 0.30, 0.18),
    "crank": (0.45, 0.30, 0.18),
}


@dataclass(frozen=True, slots=True)
class BuildOptions:
    """How to build: formats, jobs, force past errors, cache, mesh tolerance (mm).

    ``dxf_curves`` says how DXF files draw curves: ``"splines"`` (control and fit
    points) or ``"arcs"`` (lines and arcs only, within ``mesh_tolerance``). ``units``
    is what the sheets, the drawings' labels and the DXF files are written in
    (``"mm"`` or ``"in"``); ``None`` takes the design's (``[design] units``).
    """

    formats: tuple[str, ...] = FORMATS
    jobs: int = 1
    force: bool = False
    use_cache: bool = True
    mesh_tolerance: float = MESH_TOLERANCE
    dxf_curves: str = DXF_CURVES[0]
    units: str | None = None

    def __post_init__(self) -> None:
        bad = [f for f in self.formats if f not in FORMATS]
        if bad or not self.formats:
            raise ValueError(
                f"'formats' must be some of {', '.join(FORMATS)},"
                f" got {', '.join(bad) or 'none'}"
            )
        for name, value, bound in (
            ("jobs", self.jobs, BOUNDS["option.build.jobs"]),
            ("mesh_tolerance", self.mesh_tolerance, BOUNDS["option.build.tolerance"]),
        ):
            if not bound.holds(value):
                raise ValueError(f"'{name}' must be {bound.allowed()}, got {value!r}")
        if self.dxf_curves not in DXF_CURVES:
            raise ValueError(
                f"'dxf_curves' must be one of {', '.join(DXF_CURVES)},"
                f" got {self.dxf_curves!r}"
            )
        if self.units is not None and self.units not in UNITS:
            raise ValueError(
                f"'units' must be one of {', '.join(UNITS)} or None, got {self.units!r}"
            )

    def key_options(self) -> dict[str, Any]:
        """The options that decide a part's bytes (part of its cache key)."""
        return {
            "formats": sorted(set(self.formats)),
            "mesh_tolerance": self.mesh_tolerance,
            "mesh_angle_deg": _MESH_ANGLE_DEG,
            "dxf_curves": self.dxf_curves,
            "units": self.units or "mm",
        }


class BuildBlocked(Exception):
    """An error-level finding stops the build; ``findings`` holds them all."""

    def __init__(self, findings: Sequence[Any]) -> None:
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
    findings: list[Any] = field(default_factory=list)
    manifest: dict[str, Any] = field(default_factory=dict)
    notes: list[str] = field(default_factory=list)


def default_output_dir(design: Any, base: Path = Path("output")) -> Path:
    """``output/<design name>``: the design's name must be a plain file name."""
    return Path(base) / safe_name(design.name, "design name", reserved=False)


def part_file_names(part: Any, formats: Sequence[str]) -> list[tuple[str, str]]:
    """(format, relative path) of every file the part gets.

    Bought parts (screws, bushes, bearings) get none: they are only in the assembly.
    """
    if part.kind in BOUGHT_KINDS:
        return []
    out = []
    for fmt in FORMATS:
        if fmt not in formats:
            continue
        if fmt in PLANAR_FORMATS and part.kind not in FLAT_KINDS | TURNED_KINDS:
            continue
        out.append((fmt, f"{fmt}/{part.name}.{fmt}"))
    return out


class _PartWork:
    """One part's solid, mesh and flat profile, each made on first use."""

    def __init__(
        self,
        part: Any,
        tolerance: float,
        dxf_curves: str = "splines",
        units: str = "mm",
    ) -> None:
        self.part = part
        self.tolerance = tolerance
        self.dxf_curves = dxf_curves
        self.units = units
        self._solid: Any = None
        self._mesh: Any = None
        self._profile: Any = None

    @property
    def solid(self) -> Any:
        if self._solid is None:
            from ..solids.part import make_part
            from ..solids.wheel import wheel_from_profile

            # booleans check their own results (solids.wheel.check_solid); a plain
            # prism of a closed profile is not re-checked here (0.3-1 s a wheel):
            # the export tests re-import and validate every kind of part
            if self.part.kind == "wheel":
                self._solid = wheel_from_profile(self.part, self.profile)
            else:
                self._solid = make_part(self.part)
        return self._solid

    @property
    def mesh(self) -> Any:
        if self._mesh is None:
            from .mesh import mesh_shape

            self._mesh = mesh_shape(self.solid, self.tolerance, _MESH_ANGLE_DEG)
        return self._mesh

    @property
    def profile(self) -> Any:
        """A wheel's flat profile; a plate's outline as a closed polyline (mm)."""
        if self._profile is None:
            if self.part.kind == "plate":
                from ..frame.outline import edges_polyline

                self._profile = edges_polyline(self.part.outline, 0.005)
                return self._profile
            if self.part.kind in DISPLAY_KINDS:
                from ..display.outlines import flat_profile

                self._profile = flat_profile(self.part)
                return self._profile
            from ..layout.wheel_profile import plate_profile
            from ..teeth.forms import outline_for

            self._profile = plate_profile(self.part, outline_for(self.part.tooth))
        return self._profile


def _write_step(w: _PartWork, path: Path) -> None:
    from .step import write_step

    write_step(w.solid, path, w.part.name)


def _write_stl(w: _PartWork, path: Path) -> None:
    from .mesh import write_stl

    write_stl(w.mesh, path, w.part.name)


def _write_3mf(w: _PartWork, path: Path) -> None:
    from .mesh import write_3mf

    write_3mf(w.mesh, path, w.part.name)


def _face_pins(part: Any) -> list[tuple[float, float, float]]:
    """(x, y, diameter) in mm of a pin standing on the wheel's face, to be marked."""
    pin = part.pin
    if pin is None or pin.hole_only:  # a through hole is drawn as a hole already
        return []
    a = math.radians(pin.angle_deg)
    return [(pin.radius * math.cos(a), pin.radius * math.sin(a), pin.diameter)]


def _lengths(units: str) -> Lengths:
    """The formatter of a build's units (``"mm"`` or ``"in"``)."""
    return Lengths("in" if units == "in" else "mm")


def _write_dxf(w: _PartWork, path: Path) -> None:
    if w.part.kind in TURNED_KINDS:
        from ..workshop.turned_drawing import turned_sheet
        from .dxf import write_sheet_dxf

        write_sheet_dxf(turned_sheet(w.part, _lengths(w.units)), path, w.units)
        return
    if w.part.kind == "plate":
        from .dxf import write_plate_dxf

        write_plate_dxf(w.part, path, w.units)
        return
    if w.part.kind in DISPLAY_KINDS:
        from .dxf import write_flat_dxf

        engraving = None
        if w.part.kind == "dial":
            engraving = (w.part.circles, w.part.strokes, w.part.texts)
        write_flat_dxf(
            w.profile, path, w.part.name, engraving, w.profile.marks, w.units
        )
        return
    from .dxf import write_dxf

    hub = w.part.hub_diameter if w.part.hub_length > 0 else 0.0
    write_dxf(
        w.profile,
        path,
        w.part.name,
        curves=w.dxf_curves,
        tolerance=w.tolerance,
        pins=_face_pins(w.part),
        hub_diameter=hub,
        units=w.units,
    )


def _write_svg(w: _PartWork, path: Path) -> None:
    if w.part.kind in TURNED_KINDS:
        from ..workshop.turned_drawing import sheet_svg, turned_sheet

        sheet = turned_sheet(w.part, _lengths(w.units))
        path.write_text(sheet_svg(sheet), encoding="utf-8", newline="\n")
        return
    if w.part.kind == "plate":
        from .svg_template import write_plate_svg

        write_plate_svg(w.part, path, w.profile, units=w.units)
        return
    if w.part.kind in DISPLAY_KINDS:
        from .face_svg import write_face_svg

        write_face_svg(w.part, w.profile, path, units=w.units)
        return
    from .svg_template import write_svg

    write_svg(
        w.profile,
        path,
        w.part.name,
        w.part.tooth.teeth,
        w.part.tooth.module,
        pins=_face_pins(w.part),
        units=w.units,
        diametral_pitch=w.part.tooth.diametral_pitch,
    )


#: Format -> writer(part work, path). Tests replace an entry to simulate a failure.
PART_WRITERS: dict[str, Callable[[_PartWork, Path], None]] = {
    "step": _write_step,
    "stl": _write_stl,
    "3mf": _write_3mf,
    "dxf": _write_dxf,
    "svg": _write_svg,
}
_BREP = "solid.brep"  # kept in the cache entry only, for the assembly


def build_part_files(part: Any, options: BuildOptions, dest: Path) -> list[str]:
    """Write every file of ``part`` under ``dest``; returns their relative paths."""
    safe_name(part.name)
    work = _PartWork(
        part, options.mesh_tolerance, options.dxf_curves, options.units or "mm"
    )
    written = []
    for fmt, rel in part_file_names(part, options.formats):
        path = inside(dest, rel)
        path.parent.mkdir(parents=True, exist_ok=True)
        PART_WRITERS[fmt](work, path)
        written.append(rel)
    if "step" in options.formats:
        work.solid.exportBrep(str(dest / _BREP))
    return written


def _build_into_cache(part: Any, options: BuildOptions, cache_root: Path) -> str:
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
        if (tmp / _BREP).is_file():
            files.append(_BREP)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    cache.publish(key, tmp, files)
    return key


# -- worker processes: they stop with the build, and by themselves if it dies ---------
_WATCH_S = 0.5  # how often a worker looks for a stop or for its parent's death


def _worker_start(stop: Any) -> None:
    """Initializer of every worker: follow the parent, ignore Ctrl-C.

    A worker stops when the build sets ``stop`` (an interrupted or failed build) and
    when its parent dies (killed outright: it can clean up nothing); Ctrl-C reaches
    the whole process group, but only the parent decides what happens then.
    """
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    signal.signal(signal.SIGTERM, signal.SIG_DFL)
    parent = os.getppid()
    _die_with_parent()

    def watch() -> None:
        while not stop.wait(_WATCH_S):
            if os.getppid() != parent:
                break
        os._exit(1)  # nothing of a stopped part is kept: its entry is temporary

    threading.Thread(target=watch, name="wheelgen-watch", daemon=True).start()


def _die_with_parent() -> None:
    """On Linux, have the kernel end this process when its parent ends (at once,
    even inside a long kernel call that holds the interpreter)."""
    if not sys.platform.startswith("linux"):
        return
    try:
        import ctypes

        libc = ctypes.CDLL(None, use_errno=True)
        pr_set_pdeathsig = 1  # from <sys/prctl.h>
        libc.prctl(pr_set_pdeathsig, signal.SIGKILL, 0, 0, 0)
    except (OSError, AttributeError):
        pass  # the watching thread still ends the worker, a little later


def _build_parallel(
    todo: dict[str, Any],
    options: BuildOptions,
    cache_root: Path,
    progress: Callable[[str], None] | None,
) -> None:
    # fork is the fastest start (no re-import of the kernel, notes §7), but a parent
    # that already ran the kernel has its thread pools, and a forked child can hang on
    # their locks: then start clean processes instead
    kernel_loaded = "OCP" in sys.modules
    ctx = multiprocessing.get_context("forkserver" if kernel_loaded else "fork")
    stop = ctx.Event()
    pool = ProcessPoolExecutor(
        min(options.jobs, len(todo)),
        mp_context=ctx,
        initializer=_worker_start,
        initargs=(stop,),
    )
    try:
        futures = {
            pool.submit(_build_into_cache, p, options, cache_root): p
            for p in todo.values()
        }
        for fut in as_completed(futures):
            fut.result()
            if progress is not None:
                progress(futures[fut].name)
    except BaseException:
        # interrupted (Ctrl-C, SIGTERM) or a part failed: the workers stop now
        stop.set()
        pool.shutdown(wait=True, cancel_futures=True)
        raise
    pool.shutdown(wait=True)


def _assembly_key(design: Any, parts: Sequence[Any], keys: Sequence[str]) -> str:
    data = {
        "wheelgen": __version__,
        "design": design.name,
        "parts": [
            [
                p.name,
                p.kind,
                k,
                [p.placement.x, p.placement.y, p.placement.z, p.placement.angle_deg],
            ]
            for p, k in zip(parts, keys)
        ],
    }
    return hashlib.sha256(json.dumps(data, sort_keys=True).encode()).hexdigest()


def _write_assembly(
    design: Any, parts: Sequence[Any], breps: Sequence[bytes], path: Path
) -> None:
    import cadquery as cq

    from .step import write_step_assembly

    items = []
    for p, brep in zip(parts, breps):
        shape = cq.Shape.importBrep(io.BytesIO(brep))
        pl = p.placement
        loc = cq.Location(cq.Vector(pl.x, pl.y, pl.z), cq.Vector(0, 0, 1), pl.angle_deg)
        items.append((p.name, shape, loc, _COLOURS.get(p.kind, (0.5, 0.5, 0.5))))
    write_step_assembly(
        safe_name(design.name, "design name", reserved=False), items, path
    )


def _check_names(parts: Sequence[Any]) -> None:
    """The name rule on every part, and no two names one file on any disk."""
    seen: dict[str, str] = {}
    for p in parts:
        safe_name(p.name)
        key = name_key(p.name)
        if key in seen:
            same = seen[key] == p.name
            raise UnsafeNameError(
                f"two parts are called {p.name!r}; part names must differ"
                if same
                else f"parts {seen[key]!r} and {p.name!r} differ only in case: on a "
                "case-insensitive disk their files are one; rename one of them"
            )
        seen[key] = p.name


class PartSizeError(ValueError):
    """A planned part has a size the CAD kernel cannot make (out of its bounds)."""


def _check_part_sizes(parts: Sequence[Any]) -> None:
    """Refuse, before the kernel runs, a part with a size beyond the bounds table.

    The loader bounds every key of a design; this catches what follows from them (and
    parts handed in by a script): every number of a part must be finite and within
    the ``position`` bound, its main sizes within ``size``, its module and teeth within
    theirs.
    """
    for p in parts:
        for path, value in _numbers(p):
            limit = BOUNDS[_PART_BOUND.get(path, "position")]
            if not limit.holds(value):
                raise PartSizeError(
                    f"part {p.name!r}: {path} = {value!r}; allowed: "
                    f"{limit.allowed()}. Why: {limit.reason}"
                )


# Part fields with a bound of their own; every other number is a position.
_PART_BOUND = {
    **dict.fromkeys(
        ("face_width", "bore", "diameter", "length", "inside", "outside", "thickness"),
        "size",
    ),
    "tooth.module": "module",
    "tooth.teeth": "teeth",
}


def _numbers(value: Any, path: str = "") -> list[tuple[str, int | float]]:
    """Every number of a part (its placement and tooth spec too), by dotted path."""
    out: list[tuple[str, int | float]] = []
    if dataclasses.is_dataclass(value) and not isinstance(value, type):
        for f in dataclasses.fields(value):
            out += _numbers(getattr(value, f.name), f"{path}.{f.name}".lstrip("."))
    elif isinstance(value, (tuple, list)):
        for k, item in enumerate(value):
            out += _numbers(item, f"{path}[{k}]")
    elif isinstance(value, (int, float)) and not isinstance(value, bool):
        out.append((path, value))
    return out


def build_design(
    design: Any,
    out_dir: Path | None = None,
    options: BuildOptions = BuildOptions(),
    progress: Callable[[str], None] | None = None,
    findings: Sequence[Any] | None = None,
    parts: Sequence[Any] | None = None,
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
    from ..checks.least_play import settle_play
    from ..findings import has_errors

    design = settle_play(design)
    # one unit for the part files and the sheets: the option's, else the design's
    units = options.units or getattr(design, "units", "mm")
    options = dataclasses.replace(options, units=units)
    if getattr(design, "units", units) != units:
        design = dataclasses.replace(design, units=units)
    notes: list[str] = []
    remade: set[str] = set()

    def tell(text: str, part: str | None = None) -> None:
        notes.append(text)
        if part is not None:
            remade.add(part)
        if note is not None:
            note(text)

    if findings is None:
        from ..checks import run_checks

        findings = run_checks(design)
    findings = list(findings)
    checked = not has_errors(findings)
    if not checked and not options.force:
        raise BuildBlocked(findings)
    if parts is None:
        from ..parts import plan_parts

        parts = plan_parts(design)
    parts = list(parts)
    _check_names(parts)
    _check_part_sizes(parts)
    default = out_dir is None
    target = real_target(
        Path(out_dir) if out_dir is not None else default_output_dir(design)
    )
    design_file = _design_file(design) if default else None
    check_replaceable(target, design_file)
    key_options = options.key_options()
    with Staging(target) as stage:
        assert stage.dir is not None
        use_cache = options.use_cache
        cache_root = cache_root_for(target)
        if use_cache:
            try:
                PartCache(cache_root).prepare()
            except CacheUnusable as exc:
                tell(f"{exc}; building without it (as with --no-cache)")
                use_cache = False
        if not use_cache:
            cache_root = stage.dir / ".work"
            PartCache(cache_root).prepare()
        cache = PartCache(cache_root)
        keys = [part_key(p, key_options) for p in parts]
        todo: dict[str, Any] = {}
        whole: set[str] = set()
        for p, k in zip(parts, keys):
            if k in todo or k in whole:
                continue
            try:
                if cache.check(k):
                    whole.add(k)
                    continue
            except DamagedEntry as exc:
                tell(
                    f"part {p.name}: its cache entry is damaged ({exc}); making it again"
                )
                cache.discard(k)
            todo[k] = p
        built = len(todo)
        for p, k in zip(parts, keys):
            if k not in todo and progress is not None:
                progress(p.name)
        if options.jobs > 1 and len(todo) > 1:
            _build_parallel(todo, options, cache_root, progress)
        else:
            for p in todo.values():
                _build_into_cache(p, options, cache_root)
                if progress is not None:
                    progress(p.name)
        for p, k in zip(parts, keys):
            _copy_part(cache, k, p, options, stage, tell)
        used = list(keys)
        if "step" in options.formats and parts:
            akey = _assembly_key(design, parts, keys)
            used.append(akey)
            for attempt in (1, 2):
                try:
                    if not cache.check(akey):
                        breps = [
                            _verified(cache, k, p, _BREP, options, tell)
                            for p, k in zip(parts, keys)
                        ]
                        _make_assembly(design, parts, breps, cache, akey)
                    cache.copy_verified(akey, ASSEMBLY_FILE, stage.path(ASSEMBLY_FILE))
                    break
                except DamagedEntry as exc:
                    if attempt == 2:
                        raise _changing(cache) from None
                    tell(
                        f"the assembly's cache entry is damaged ({exc}); making it again"
                    )
                    cache.discard(akey)
        if not use_cache:
            shutil.rmtree(cache_root, ignore_errors=True)
        else:
            for k in used:
                cache.mark_used(k)
            cache.prune()
        if design.process.kind == "print" and "stl" in options.formats:
            _write_fit_test(design, parts, stage, options)
        for writer in sheets.SHEET_WRITERS:  # read now: others may extend it
            for written in writer(design, parts, findings, stage.dir):
                resolved = Path(written).resolve()
                if (
                    not resolved.is_relative_to(stage.dir.resolve())
                    or not resolved.is_file()
                ):
                    raise UnsafeNameError(
                        f"sheet writer {getattr(writer, '__name__', writer)!r} returned"
                        f" {written}, which is not a file inside the output folder"
                    )
        files = sorted(p for p in stage.dir.rglob("*") if p.is_file())
        manifest = make_manifest(
            design, parts, findings, stage.dir, files, checked, key_options
        )
        manifest_path = write_manifest(manifest, stage.path(MANIFEST_NAME))
        stage.path(MARKER_NAME).write_text(
            marker_text(manifest_path.read_bytes()), encoding="utf-8", newline="\n"
        )
        # files may have come into the folder while the parts were made
        check_replaceable(target, design_file)
        try:
            stage.commit()
        except KeyboardInterrupt:
            # a stop held back while the folders were swapped: the build is whole
            if not stage.committed:
                raise
            tell("a stop came as the finished build was moved into place; it is whole")
    rel_files = [r["path"] for r in manifest["files"]] + [MANIFEST_NAME]
    return BuildResult(
        out_dir=target,
        files=rel_files,
        checked=checked,
        built=built + len(remade),
        reused=len(parts) - built - len(remade),
        cache_root=cache_root if use_cache else None,
        findings=findings,
        manifest=manifest,
        notes=notes,
    )


def _write_fit_test(
    design: Any, parts: Sequence[Any], stage: Staging, options: BuildOptions
) -> None:
    """A printed design's fit test coupon, beside the parts' STL files."""
    from ..workshop.print_plan import FIT_TEST_FILE
    from .fit_test import write_fit_test

    write_fit_test(design, parts, stage.path(FIT_TEST_FILE), options.mesh_tolerance)


def _design_file(design: Any) -> str | None:
    source = getattr(design, "source", "")
    return Path(source).name if source else None


class CacheError(OSError):
    """The part cache keeps changing under the build; build again with --no-cache."""


def _changing(cache: PartCache) -> CacheError:
    return CacheError(
        f"the part cache {cache.root} changed while the build read it, twice; build "
        "again, or with --no-cache"
    )


def _copy_part(
    cache: PartCache,
    key: str,
    part: Any,
    options: BuildOptions,
    stage: Staging,
    tell: Callable[..., None],
) -> None:
    """Copy a part's files from its entry, each checked; a damaged entry is made again."""
    for attempt in (1, 2):
        try:
            for rel in cache.files(key):
                if rel != _BREP:
                    cache.copy_verified(key, rel, stage.path(rel))
            return
        except (DamagedEntry, FileNotFoundError) as exc:
            if attempt == 2:
                raise _changing(cache) from None
            _remake(cache, key, part, options, tell, exc)


def _verified(
    cache: PartCache,
    key: str,
    part: Any,
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
        raise _changing(cache) from None


def _remake(
    cache: PartCache,
    key: str,
    part: Any,
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
    _build_into_cache(part, options, cache.root)


def _make_assembly(
    design: Any,
    parts: Sequence[Any],
    breps: Sequence[bytes],
    cache: PartCache,
    akey: str,
) -> None:
    tmp = cache.new_entry()
    try:
        dest = inside(tmp, ASSEMBLY_FILE)
        dest.parent.mkdir(parents=True)
        _write_assembly(design, parts, breps, dest)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    cache.publish(akey, tmp, [ASSEMBLY_FILE])
