"""``wheelgen build``: check, then export every part (STEP, STL, 3MF, DXF, SVG).

The CAD kernel is imported inside the build only when a part must be made, so this
module (and ``wheelgen --help``) starts without cadquery.
"""

from __future__ import annotations

import dataclasses
import errno
import signal
import sys
from collections.abc import Sequence
from pathlib import Path
from typing import Any

import click

from ..design.model import Design
from ..design.units import UNITS, Units
from ..export.formats import DXF_CURVES, FORMATS, MESH_TOLERANCE
from ..findings import Finding
from ._common import (
    DEFAULT_DESIGN,
    EXIT_FINDINGS,
    EXIT_INPUT,
    EXIT_OK,
    echo_json,
    load_or_exit,
)
from ._options import Bounded

__all__ = ["DEFAULT_DESIGN", "build_command"]


def _parse_formats(text: str) -> tuple[str, ...]:
    items = [t.strip().lower() for t in text.split(",") if t.strip()]
    bad = [t for t in items if t not in FORMATS]
    if bad or not items:
        raise click.BadParameter(
            f"{', '.join(bad) or 'nothing'}; allowed: a comma-separated list of "
            f"{', '.join(FORMATS)}",
            param_hint="'--formats'",
        )
    return tuple(f for f in FORMATS if f in items)


@click.command("build")
@click.argument("design", type=click.Path(dir_okay=False), required=False)
@click.option(
    "-o",
    "--output",
    "output",
    type=click.Path(file_okay=False),
    help="Folder for the files, replaced as a whole on success, and only if it is new, "
    "empty or an earlier build (else nothing is changed and the foreign files are "
    "named). A link to a folder builds into that folder. Default: "
    "output/<design name>.",
)
@click.option(
    "--formats",
    default=",".join(FORMATS),
    show_default=True,
    help="Comma-separated formats to write (dxf and svg only for flat parts: wheels,"
    " plates, hands, dials, crank arms).",
)
@click.option(
    "--jobs",
    "-j",
    type=Bounded("option.build.jobs"),
    default=1,
    show_default=True,
    help="Build parts in this many processes (same files for any number).",
)
@click.option(
    "--force",
    is_flag=True,
    help="Export despite error-level findings; the manifest says UNCHECKED.",
)
@click.option(
    "--tolerance",
    type=Bounded("option.build.tolerance"),
    default=MESH_TOLERANCE,
    show_default=True,
    help="Largest chord deviation of STL/3MF meshes, and of DXF arcs from the "
    "exact flanks with --dxf-curves arcs, mm.",
)
@click.option(
    "--dxf-curves",
    type=click.Choice(DXF_CURVES),
    default=DXF_CURVES[0],
    show_default=True,
    help="How DXF files draw curved flanks: 'splines' (B-splines with control and "
    "fit points, for CAD and most CAM) or 'arcs' (lines and arcs only, within "
    "--tolerance, for laser and router programs that cannot read splines).",
)
@click.option(
    "--units",
    type=click.Choice(UNITS),
    default=None,
    help="Units of the sheets, the drawings' labels and the DXF files (the parts are "
    "the same size either way).  [default: the design's [design] units, else mm]",
)
@click.option(
    "--no-cache",
    is_flag=True,
    help="Rebuild every part; do not read or write the part cache.",
)
@click.option(
    "--json",
    "as_json",
    is_flag=True,
    help="Print one JSON object on stdout (progress goes to stderr).",
)
def build_command(
    design: str | None,
    output: str | None,
    formats: str,
    jobs: int,
    force: bool,
    tolerance: float,
    dxf_curves: str,
    units: Units | None,
    no_cache: bool,
    as_json: bool,
) -> None:
    """Check DESIGN and write its parts, ready for the workshop or the printer.

    DESIGN is a train file (TOML); without it the bundled demo is built. Every
    part is made: wheels, arbors, tubes and pins, the frame (the two plates, the
    pillars between them and a cock for any arbor one plate alone holds), and the
    display (a hand for every target, a dial behind each axis's hands, a knob or
    crank on the drive). Files go
    to output/<design name>/ (or -o DIR): step/<part>.step and step/assembly.step
    (every part in place, with the screws and any bushes or bearings), stl/ and 3mf/
    meshes lying on z = 0, dxf/ and svg/ 1:1 drawings of every wheel, plate, hand
    and crank arm (a dial's svg is its face to print and glue on, its dxf has the
    graduations on the ENGRAVE layer) and the dimensioned 1:1 drawing of every
    arbor, tube and collar, the workshop sheets (cutting.csv: cutter, indexing and inspection sizes of every
    wheel and how far to feed the cutter to reach them, with cutters/<wheel>.svg,
    the 1:1 form cutter of triangular teeth; parts.csv: bill of parts with screws;
    drilling/<plate>.csv and .svg: the outline and every hole's position from the
    drive arbor; drawings/elevation.svg: the sectional elevation, every part at its
    true heights; assembly.csv: the order in which the parts go together; for a
    printed design print.csv instead of cutting.csv, with each part's orientation,
    the build plates bed/bed-1.3mf, ... and the fit test coupon stl/fit-test.stl),
    report.html (one page
    with drawings, findings, motion, an animated preview and the size of every
    file), and manifest.json with the SHA-256 and size of each file. DXF files hold
    the outline, bore, windows, slots, pin holes and holes for carried arbors as cut
    lines, and the marks of pins and hub bosses, each on its own layer. The sheets,
    the labels of the drawings and the DXF files are in the design's units
    ([design] units, or --units): millimetres, or inches.
    Everything is written to a staging folder first and moved into place only when
    all of it succeeded. The output folder is replaced only if wheelgen wrote it (its
    .wheelgen-build marker and manifest.json list every file in it, unchanged); a
    folder holding anything else, or write-protected, is left alone with exit 2.

    Parts whose parameters did not change are copied from the cache in
    .wheelgen-cache/ next to the output folder (output/.wheelgen-cache/ by default).
    Each cached file is checked against the size and SHA-256 recorded with it; a
    damaged entry is made again (with a note), never shipped. The cache is private to
    you; entries no build has used for 30 days are removed, and the folder may be
    deleted at any time.

    Ctrl-C or SIGTERM stops the build and its worker processes; the previous output
    stays as it was.

    Exit status: 0 built; 1 a check found an error (nothing written; see --force)
    or a part could not be made; 2 the design, an option or the output folder cannot
    be used; 130 (Ctrl-C) or 143 (SIGTERM) stopped.
    """
    from ..export.build import BuildOptions

    fmt = _parse_formats(formats)
    d = load_or_exit(design)
    if units is not None and units != d.units:
        d = dataclasses.replace(d, units=units)  # the sheets follow --units too
    options = BuildOptions(
        formats=fmt,
        jobs=jobs,
        force=force,
        use_cache=not no_cache,
        mesh_tolerance=tolerance,
        dxf_curves=dxf_curves,
        units=units,
    )
    out_dir = Path(output) if output else None
    stopped, previous = _stop_on_sigterm()
    try:
        _run(d, out_dir, options, force, as_json, stopped)
    finally:
        for sig, handler in previous.items():
            signal.signal(sig, handler)


def _run(
    d: Any,
    out_dir: Path | None,
    options: Any,
    force: bool,
    as_json: bool,
    stopped: list[int],
) -> None:
    from ..export.build import BuildBlocked, CacheError, PartSizeError, build_design
    from ..export.output_folder import OutputFolderError
    from ..export.staging import UnsafeNameError

    bar: Any = None
    notes: list[str] = []
    from ..findings import findings_table

    try:
        from ..checks import run_checks
        from ..parts import plan_parts

        findings = run_checks(d)
        parts = plan_parts(d) if not _blocked(findings, force) else ()

        def step(_name: str) -> None:
            # the bar starts with the first part: a build refused before any part is
            # made prints only its reason
            nonlocal bar
            if bar is None:
                bar = click.progressbar(
                    length=len(parts),
                    label="building parts",
                    file=sys.stderr,
                    show_pos=True,
                )
                bar.__enter__()
            bar.update(1)

        result = build_design(
            d,
            out_dir,
            options,
            progress=step,
            findings=findings,
            parts=parts,
            note=notes.append,
        )
    except BuildBlocked as exc:
        _close(bar)
        if as_json:
            echo_json(
                {
                    "design": d.name,
                    "built": False,
                    "findings": [f.as_dict() for f in exc.findings],
                }
            )
        else:
            click.echo(findings_table(exc.findings))
            click.echo(
                "Nothing exported: fix the errors above, or use --force.", err=True
            )
        sys.exit(EXIT_FINDINGS)
    except KeyboardInterrupt:
        _close(bar)
        signum = stopped[0] if stopped else signal.SIGINT
        click.echo(
            f"wheelgen: stopped ({signal.Signals(signum).name}); nothing was changed "
            "in the output folder",
            err=True,
        )
        sys.exit(128 + int(signum))
    except (UnsafeNameError, OutputFolderError, PartSizeError, CacheError) as exc:
        _close(bar)
        click.echo(f"wheelgen: {exc}", err=True)
        sys.exit(EXIT_INPUT)
    except OSError as exc:
        _close(bar)
        click.echo(f"wheelgen: {_os_error_text(exc, out_dir, d)}", err=True)
        sys.exit(EXIT_INPUT)
    except Exception as exc:  # noqa: BLE001  (kernel/layout failure: message, exit 1)
        _close(bar)
        if type(exc).__name__ != "CadBuildError" and not isinstance(exc, ValueError):
            raise
        click.echo(f"wheelgen: could not build: {exc}", err=True)
        sys.exit(EXIT_FINDINGS)
    _close(bar)
    for text in notes:
        click.echo(f"wheelgen: note: {text}", err=True)
    status = "checked" if result.checked else "UNCHECKED (--force past errors)"
    if as_json:
        echo_json(
            {
                "design": d.name,
                "built": True,
                "output": str(result.out_dir),
                "checked": result.checked,
                "parts_built": result.built,
                "parts_reused": result.reused,
                "cache": None if result.cache_root is None else str(result.cache_root),
                "files": result.files,
                "sizes": result.manifest.get("sizes", {}),
                "findings": [f.as_dict() for f in result.findings],
                "notes": result.notes,
            }
        )
    else:
        click.echo(
            f"{d.title}: {len(result.files)} files in {result.out_dir} ({status}); "
            f"{result.built} part(s) built, {result.reused} reused from the cache"
        )
        click.echo(_sizes_line(result.manifest.get("sizes", {})))
        if result.findings:  # warnings and notes (and, with --force, the errors)
            click.echo(findings_table(result.findings))
    sys.exit(EXIT_OK)


def _sizes_line(sizes: dict[str, Any]) -> str:
    from ..workshop.file_sizes import size_text

    per = ", ".join(
        f"{fmt.upper() or 'other'} {size_text(row['bytes'])}"
        for fmt, row in sizes.get("formats", {}).items()
    )
    return f"Sizes: {size_text(sizes.get('total_bytes', 0))} in all ({per})."


def _stop_on_sigterm() -> tuple[list[int], dict[int, Any]]:
    """Make SIGTERM stop the build as Ctrl-C does (cleanly, workers too).

    Returns where the stopping signal is recorded, and the handlers to put back.
    """
    received: list[int] = []

    def stop(signum: int, frame: Any) -> None:
        received.append(signum)
        raise KeyboardInterrupt

    previous: dict[int, Any] = {}
    for sig in (signal.SIGTERM, signal.SIGINT):
        previous[sig] = signal.signal(sig, stop)
    return received, previous


# What to do about an operating-system error, by its errno.
_OS_FIXES = {
    errno.EACCES: "choose a folder you may write to with -o",
    errno.EPERM: "choose a folder you may write to with -o",
    errno.EROFS: "the disk is read-only: choose another place with -o",
    errno.ENOSPC: "free some space (the part cache .wheelgen-cache beside the output "
    "may be deleted), or build onto another disk with -o",
    errno.EDQUOT: "your disk quota is used up: free some space, or build elsewhere "
    "with -o",
    errno.EBUSY: "the folder is in use (a mount point, or open in another program): "
    "close what uses it, or choose another folder with -o",
    errno.ENOENT: "choose a folder on an ordinary disk with -o",
    errno.ENOTDIR: "a part of the path is a file, not a folder: choose another -o",
    errno.ENAMETOOLONG: "choose a shorter path with -o",
}


def _os_error_text(exc: OSError, out_dir: Path | None, design: Design) -> str:
    """One line: what could not be done, where, and what to do about it."""
    where = exc.filename or out_dir or "the output folder"
    if ".staging-" in str(where):  # the build's own temporary folder: name its place
        where = Path(str(where)).parent
    fix = _OS_FIXES.get(exc.errno or 0, "check the output folder, or choose another -o")
    if "cache" in str(exc) or ".wheelgen-cache" in str(where):
        fix += "; or build without the part cache (--no-cache)"
    target = out_dir if out_dir is not None else Path("output") / design.name
    reason = exc.strerror or str(exc)
    return (
        f"cannot write the build of {design.name} into {target}: {reason} "
        f"({where}); {fix}. The previous output is untouched."
    )


def _blocked(findings: Sequence[Finding], force: bool) -> bool:
    from ..findings import has_errors

    return has_errors(findings) and not force


def _close(bar: Any) -> None:
    if bar is not None:
        bar.__exit__(None, None, None)
