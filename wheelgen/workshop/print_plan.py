"""How a printed design's parts go on the printer: orientation, build plates, fit test.

Every part is modelled with its axis along z. On the printer:

- a flat part (wheel, plate, hand, dial, crank arm, cock) lies on its larger flat
  face: its teeth and holes are then drawn by the nozzle in the plane, where a printer
  is most accurate;
- a tube, pillar, knob or short rod stands upright, so that its bore and outside are
  round (printed lying, a round section comes out flattened on its underside);
- a long rod (longer than :data:`LONG_ROD_RATIO` times its diameter) lies flat: standing
  up it would wobble under the nozzle and break at the first layer lines;
- an arbor whose diameter is a ``kind = "rod"`` of the design's ``[[stock]]`` list is
  cut from that rod and not printed.

The parts to print are laid out on as many build plates (``[process] bed``) as they
need, each :data:`PART_SPACING` mm from the next and from the plate's edges. The fit
test coupon (:mod:`wheelgen.workshop.fit_coupon`) tries the design's running
clearance before the parts are printed. Lengths in mm; the sheet is written in the
design's units (:class:`wheelgen.design.units.Lengths`), each column naming its unit.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Sequence

import numpy as np

from ..checks.bed_check import EDGE_SPACING
from ..design.model import Design
from ..design.units import MM, Lengths, lengths_of
from ..layout.part_kinds import BOUGHT_KINDS, ArborPart, Part, PinPart
from .csv_text import csv_text
from .stl_file import read_stl

__all__ = [
    "BED_DIR",
    "BedSlot",
    "FIT_TEST_FILE",
    "PRINT_FILE",
    "PrintLayout",
    "bed_file",
    "print_layout",
    "printed",
    "LONG_ROD_RATIO",
    "ORIENTATIONS",
    "PART_SPACING",
    "PRINT_COLUMNS",
    "print_columns",
    "PrintRow",
    "orient_vertices",
    "orientation",
    "pack_beds",
    "print_csv",
]

#: A rod longer than this many diameters is printed lying down (common practice, no
#: source: a slender upright print wobbles under the nozzle).
LONG_ROD_RATIO = 4.0
#: Gap between parts on a build plate and between a part and the plate's edge, mm:
#: the one ``wheelgen check`` keeps when it judges whether a part fits the plate.
PART_SPACING = EDGE_SPACING
#: Orientation -> what the sheet says.
ORIENTATIONS: dict[str, str] = {
    "flat": "flat on its larger face",
    "upright": "upright, axis vertical",
    "lying": "lying, axis along the plate",
    "stock rod": "not printed: cut from stock rod",
}
_FLAT_KINDS = frozenset({"wheel", "plate", "hand", "dial", "crank", "cock"})


def _stock_rod(design: Design, diameter: float) -> bool:
    return any(
        getattr(s, "kind", "") == "rod"
        and math.isclose(s.outside, diameter, abs_tol=1e-6)
        for s in getattr(design, "stock", ())
    )


def orientation(part: Part, design: Design) -> str:
    """How ``part`` goes on the printer: a key of :data:`ORIENTATIONS`."""
    if part.kind in _FLAT_KINDS:
        return "flat"
    if isinstance(part, ArborPart) and _stock_rod(design, part.diameter):
        return "stock rod"
    if isinstance(part, (ArborPart, PinPart)):
        if part.length > LONG_ROD_RATIO * part.diameter:
            return "lying"
    return "upright"


def _end_area(v: np.ndarray, f: np.ndarray, top: bool) -> float:
    """Area (mm²) of the triangles lying in the part's lowest (or highest) plane."""
    z = v[:, 2]
    level = z.max() if top else z.min()
    tol = 1e-6 * max(1.0, float(np.ptp(z)))
    on = np.all(np.abs(z[f] - level) < tol, axis=1)
    a, b, c = v[f[on, 0]], v[f[on, 1]], v[f[on, 2]]
    return float(0.5 * np.abs(np.cross(b - a, c - a)[:, 2]).sum())


def orient_vertices(v: np.ndarray, f: np.ndarray, how: str) -> np.ndarray:
    """The part's mesh turned for the printer, its lowest point at z = 0.

    ``v`` (n, 3) vertices in the part's own frame (axis along z), ``f`` (m, 3) its
    triangles. ``"lying"`` turns the axis onto y; ``"flat"`` and ``"upright"`` keep it
    vertical and put the end with the larger flat area down (a rotation about x by
    180 degrees, so the mesh stays a proper solid).
    """
    out = np.array(v, dtype=np.float64)
    if how == "lying":
        out = out[:, [0, 2, 1]] * np.array([1.0, 1.0, -1.0])  # (x, y, z) -> (x, z, -y)
    elif _end_area(out, f, top=True) > _end_area(out, f, top=False) + 1e-9:
        out = out * np.array([1.0, -1.0, -1.0])
    out[:, 2] -= out[:, 2].min()
    return out


@dataclass(frozen=True, slots=True)
class BedSlot:
    """Where one part goes: build plate ``bed`` (1, 2, ...; 0 if larger than a plate),
    the lower-left corner ``x``, ``y`` of its footprint ``width`` x ``depth`` (mm)."""

    name: str
    bed: int
    x: float
    y: float
    width: float
    depth: float


def pack_beds(
    sizes: Sequence[tuple[str, float, float]],
    bed: tuple[float, float],
    spacing: float = PART_SPACING,
) -> tuple[BedSlot, ...]:
    """Lay footprints ``(name, width, depth)`` (mm) out on plates of ``bed`` (x, y).

    Rows from the front-left corner, the deepest parts first (shelf packing); a part
    that fits only turned a quarter turn is turned; every part keeps ``spacing`` from
    the next and from the plate's edges. A part larger than the plate gets bed 0. The
    result is in the order of ``sizes``.
    """
    bx, by = bed
    usable = (bx - 2 * spacing, by - 2 * spacing)
    order = sorted(range(len(sizes)), key=lambda i: (-max(sizes[i][1:]), sizes[i][0]))
    slots: dict[int, BedSlot] = {}
    plates: list[list[float]] = []  # per plate: [row_y, row_depth, cursor_x]
    for i in order:
        name, w, d = sizes[i]
        if (w > usable[0] or d > usable[1]) and w <= usable[1] and d <= usable[0]:
            w, d = d, w
        if w > usable[0] or d > usable[1]:
            slots[i] = BedSlot(name, 0, 0.0, 0.0, w, d)
            continue
        placed = False
        for k, (row_y, row_d, cur_x) in enumerate(plates):
            if cur_x + w <= spacing + usable[0] + 1e-9 and d <= row_d + 1e-9:
                slots[i] = BedSlot(name, k + 1, cur_x, row_y, w, d)
                plates[k][2] = cur_x + w + spacing
                placed = True
                break
            new_y = row_y + row_d + spacing
            if new_y + d <= spacing + usable[1] + 1e-9:
                slots[i] = BedSlot(name, k + 1, spacing, new_y, w, d)
                plates[k] = [new_y, d, spacing + w + spacing]
                placed = True
                break
        if not placed:
            plates.append([spacing, d, spacing + w + spacing])
            slots[i] = BedSlot(name, len(plates), spacing, spacing, w, d)
    return tuple(slots[i] for i in range(len(sizes)))


@dataclass(frozen=True, slots=True)
class PrintRow:
    """One line of the print sheet (mm)."""

    part: str
    kind: str
    orientation: str
    bed: int | None
    x: float | None
    y: float | None
    width: float | None
    depth: float | None
    height: float | None
    note: str = ""


def print_columns(lengths: Lengths = MM) -> tuple[str, ...]:
    """The header of ``print.csv`` in ``lengths``' units, in column order."""
    col = lengths.col
    return (
        "part",
        "kind",
        "orientation",
        "bed",
        col("x"),
        col("y"),
        col("width"),
        col("depth"),
        col("height"),
        "note",
    )


#: CSV header of ``print.csv`` in millimetres, in column order; units are in the names.
PRINT_COLUMNS: tuple[str, ...] = print_columns()


def print_csv(rows: Sequence[PrintRow], lengths: Lengths = MM) -> str:
    """The print sheet as CSV text (header first, ``\\n`` line ends), its lengths in
    ``lengths``' units (0.01 mm, or 0.0001 in)."""

    def num(v: float | None) -> str:
        return lengths.num(v, 2)

    return csv_text(
        print_columns(lengths),
        (
            [
                r.part,
                r.kind,
                ORIENTATIONS[r.orientation],
                "" if r.bed is None else str(r.bed),
                num(r.x),
                num(r.y),
                num(r.width),
                num(r.depth),
                num(r.height),
                r.note,
            ]
            for r in rows
        ),
    )


def printed(part: Part) -> bool:
    """Is ``part`` one the printer makes (not bought)?"""
    return part.kind not in BOUGHT_KINDS


#: File name of the print sheet inside the build output.
PRINT_FILE = "print.csv"
#: Folder of the build plates.
BED_DIR = "bed"
#: The fit test coupon (written by the build with the part files).
FIT_TEST_FILE = "stl/fit-test.stl"


def bed_file(number: int) -> str:
    """The 3MF of build plate ``number`` (1, 2, ...) inside the build output."""
    return f"{BED_DIR}/bed-{number}.3mf"


@dataclass(frozen=True, slots=True)
class PrintLayout:
    """The print sheet's rows and, per build plate (numbered from 1), its parts as
    ``(name, vertices, triangles)`` where they stand on the plate (mm); ``bed`` is
    the plate's size x, y."""

    rows: tuple[PrintRow, ...]
    plates: tuple[tuple[int, list[tuple[str, np.ndarray, np.ndarray]]], ...]
    bed: tuple[float, float]


def print_layout(
    design: Design, parts: Sequence[Part], staging_dir: Path | None
) -> PrintLayout:
    """Orient and place every printed part of ``design`` from its STL in
    ``staging_dir`` (``stl/<part>.stl``); parts without an STL (or without a folder)
    get their orientation only."""
    folder = Path(staging_dir) if staging_dir is not None else None
    rows: list[PrintRow] = []
    meshes: dict[str, tuple[np.ndarray, np.ndarray]] = {}
    sizes: list[tuple[str, float, float]] = []
    for part in parts:
        if not printed(part):
            continue
        how = orientation(part, design)
        stl = None if folder is None else folder / "stl" / f"{part.name}.stl"
        if how == "stock rod" or stl is None or not stl.is_file():
            rows.append(
                PrintRow(part.name, part.kind, how, None, None, None, None, None, None)
            )
            continue
        v, f = read_stl(stl)
        v = orient_vertices(v, f, how)
        lo, hi = v.min(axis=0), v.max(axis=0)
        meshes[part.name] = (v - np.array([lo[0], lo[1], 0.0]), f)
        sizes.append((part.name, float(hi[0] - lo[0]), float(hi[1] - lo[1])))
        rows.append(
            PrintRow(
                part.name, part.kind, how, None, None, None, None, None, float(hi[2])
            )
        )
    slots = {s.name: s for s in pack_beds(sizes, design.process.bed)}
    bx, by = design.process.bed
    u = lengths_of(design)
    plates: dict[int, list[tuple[str, np.ndarray, np.ndarray]]] = {}
    out_rows = []
    for row in rows:
        slot = slots.get(row.part)
        if slot is None:
            note = (
                "cut to length from the stock rod"
                if row.orientation == "stock rod"
                else "no STL written: build with the stl format for the plates"
            )
            out_rows.append(replace(row, note=note))
            continue
        if slot.bed == 0:
            out_rows.append(
                replace(
                    row,
                    width=slot.width,
                    depth=slot.depth,
                    note=f"larger than the {u.short(bx)} x {u.text(by)} plate: "
                    "on no plate",
                )
            )
            continue
        v, f = meshes[row.part]
        turned = not np.isclose(float(np.ptp(v[:, 0])), slot.width)
        if turned:  # a quarter turn about z: (x, y) -> (y, -x), then back to x >= 0
            v = v[:, [1, 0, 2]] * np.array([1.0, -1.0, 1.0])
            v[:, 1] -= v[:, 1].min()
        placed = v + np.array([slot.x, slot.y, 0.0])
        plates.setdefault(slot.bed, []).append((row.part, placed, f))
        out_rows.append(
            replace(
                row,
                bed=slot.bed,
                x=slot.x,
                y=slot.y,
                width=slot.width,
                depth=slot.depth,
                note="turned a quarter turn" if turned else "",
            )
        )
    if folder is not None and (folder / FIT_TEST_FILE).is_file():
        out_rows.append(
            PrintRow(
                "fit-test",
                "coupon",
                "flat",
                None,
                None,
                None,
                None,
                None,
                None,
                "print it first: the fits it tries are in the report",
            )
        )
    return PrintLayout(
        tuple(out_rows), tuple(sorted(plates.items())), design.process.bed
    )
