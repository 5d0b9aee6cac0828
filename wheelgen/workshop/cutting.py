"""The cutting sheet: what the machinist needs to cut and inspect each wheel.

One row per wheel part, in the order of the part plan: teeth, module, form, blank
(tip) diameter, full depth, form-cutter number (involute only), the dividing-head
setting, and the inspection values (span ``W_k`` over ``k`` teeth and the dimension
over two pins). Every gear value comes from :func:`wheelgen.teeth.gear_data`, so the
sheet and the gear data sheet cannot disagree; the indexing from
:func:`wheelgen.workshop.indexing.indexing_plan`. Lengths in mm; the sheet is written
in the design's units (:class:`wheelgen.design.units.Lengths`), each column naming
its unit, and its tooth size as the module (mm) or the diametral pitch (inches).

The span and over-pins sizes are those of the tooth as cut, thinned by half the
backlash; the cutter reaches them when fed in ``infeed`` from the blank's rim, a
little more than the full depth (:func:`extra_infeed`). Triangular teeth get their form
cutter (the space angle, its tip and shoulder roundings, :mod:`wheelgen.teeth.
triangular_cut`) and are checked over pins that touch the flanks on the pitch circle.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Sequence

from ..design.model import Design
from ..design.units import MM, Lengths, lengths_of
from ..findings import Finding
from ..layout.part_kinds import Part, WheelPart
from ..teeth.gear_data import gear_data
from ..teeth.triangular_cut import TriangularCut, triangular_cut
from .csv_text import csv_text
from .cutter_drawing import cutter_svg
from .indexing import IndexPlan, indexing_plan

__all__ = [
    "CuttingRow",
    "CUTTING_COLUMNS",
    "CUTTING_FILE",
    "cutting_columns",
    "cutting_rows",
    "indexing_text",
    "cutting_csv",
    "cutting_sheet_writer",
    "cutter_drawing_file",
    "extra_infeed",
    "holes_text",
    "pitch_text",
]

#: File name of the cutting sheet inside the build output.
CUTTING_FILE = "cutting.csv"


@dataclass(frozen=True, slots=True)
class CuttingRow:
    """One wheel on the cutting sheet; lengths in mm, angles in degrees.

    ``blank_diameter`` is the diameter to turn the blank to and ``full_depth`` the depth
    from blank to root, both from the gear data sheet. ``cutter_number`` is the
    involute form-cutter number, diametral-pitch set numbering (None for other forms
    and below 12 teeth), ``cutter_range`` its tooth range in words;
    ``span_teeth``/``span_width`` and ``pin_diameter``/``over_pins`` are None where
    the gear data gives no such measurement (triangular teeth). ``bore`` is the seat
    hole (diameter, or across flats) and ``bore_fit`` what sets it; ``holes`` are the
    running bores ``(x, y, diameter)`` of the arbors the wheel carries, in the wheel's
    own frame (x towards the middle of a tooth).
    """

    wheel: str
    teeth: int
    module: float
    form: str
    angle_deg: float  # pressure angle (involute) or included tooth angle (triangular)
    shift: float
    face_width: float
    blank_diameter: float
    full_depth: float
    cutter_number: int | None
    cutter_range: str | None
    indexing: IndexPlan
    span_teeth: int | None
    span_width: float | None
    pin_diameter: float | None
    over_pins: float | None
    warnings: tuple[str, ...] = ()
    bore: float = 0.0
    bore_fit: str = ""
    holes: tuple[tuple[float, float, float], ...] = ()
    diametral_pitch: float | None = None  # teeth per inch, for a DP wheel
    thinning: float = 0.0
    infeed: float = 0.0
    cutter: TriangularCut | None = None

    @property
    def extra_infeed(self) -> float:
        """How much further than the full depth the cutter goes in (mm)."""
        return self.infeed - self.full_depth


def cutting_columns(lengths: Lengths = MM) -> tuple[str, ...]:
    """The CSV header in ``lengths``' units, in column order; units are in the names.

    In inches the tooth size is the diametral pitch, in millimetres the module.
    """
    col = lengths.col
    return (
        "wheel",
        "teeth",
        "diametral_pitch" if lengths.inches else "module_mm",
        "form",
        "angle_deg",
        "shift",
        col("face_width"),
        col("blank_diameter"),
        col("full_depth"),
        "cutter_number",
        "indexing",
        "span_teeth_k",
        col("span_width"),
        col("pin_diameter"),
        col("over_pins"),
        col("bore"),
        "bore_fit",
        col("arbor_holes"),
        col("thinning"),
        col("infeed"),
        "space_angle_deg",
        col("cutter_tip_width"),
        col("cutter_tip_radius"),
        col("cutter_shoulder_radius"),
        "cutter_drawing",
        "notes",
    )


#: CSV header in millimetres, in column order; units are in the names.
CUTTING_COLUMNS: tuple[str, ...] = cutting_columns()


def cutter_drawing_file(wheel: str) -> str:
    """Where the 1:1 drawing of a triangular wheel's form cutter goes in the build."""
    return f"cutters/{wheel}.svg"


def extra_infeed(thinning: float, pressure_angle_deg: float) -> float:
    """Feed (mm) beyond the full depth that thins an involute tooth by ``thinning``.

    ISO 21771:2007 gives the tooth thickness on the reference circle as
    s = m (pi / 2 + 2 x tan a): moving the cutter in by d = x m takes 2 d tan a off
    it, so the thinning needs d = thinning / (2 tan a) (derived).
    """
    return thinning / (2.0 * math.tan(math.radians(pressure_angle_deg)))


def cutting_rows(parts: Sequence[Part]) -> tuple[CuttingRow, ...]:
    """The cutting sheet's rows: one per :class:`WheelPart` in ``parts``, in order.

    Other parts (arbors, sleeves, pins) are skipped.
    """
    rows = []
    for part in parts:
        if not isinstance(part, WheelPart):
            continue
        spec = part.tooth
        data = gear_data(spec)
        involute = spec.form == "involute"
        cut = None if involute else triangular_cut(spec)
        if cut is None:
            infeed = data.depth_of_cut + extra_infeed(
                spec.thinning, spec.pressure_angle_deg
            )
            pin, pins = data.pin_diameter, data.over_pins
        else:
            infeed, pin, pins = cut.infeed, cut.pin_diameter, cut.over_pins
        rows.append(
            CuttingRow(
                wheel=part.name,
                teeth=spec.teeth,
                module=spec.module,
                form=spec.form,
                angle_deg=spec.pressure_angle_deg if involute else spec.tooth_angle_deg,
                shift=spec.shift if involute else 0.0,
                face_width=part.face_width,
                blank_diameter=data.blank_diameter,
                full_depth=data.depth_of_cut if cut is None else cut.full_depth,
                cutter_number=data.cutter_number if involute else None,
                cutter_range=data.cutter_range if involute else None,
                indexing=indexing_plan(spec.teeth),
                span_teeth=data.span_teeth,
                span_width=data.span_width,
                pin_diameter=pin,
                over_pins=pins,
                warnings=tuple(data.warnings) + _cutter_notes(spec, data.cutter_number),
                bore=part.bore,
                bore_fit=part.bore_fit,
                holes=part.holes,
                diametral_pitch=spec.diametral_pitch,
                thinning=spec.thinning,
                infeed=infeed,
                cutter=cut,
            )
        )
    return tuple(rows)


def _cutter_notes(spec: Any, number: int | None) -> tuple[str, ...]:
    """What a machinist with a set of 8 involute form cutters must know for ``spec``."""
    if spec.form != "involute":
        return ()
    notes = []
    if number is None:
        notes.append(
            f"no cutter of the 8-cutter set is made for {spec.teeth} teeth (No. 8 starts "
            "at 12): use a cutter ground for this count, or profile-cut from the DXF"
        )
    if spec.shift != 0:
        notes.append(
            f"profile shift x = {spec.shift:+g}: form cutters are made for unshifted "
            "teeth and give this tooth only approximately; generate it (hob or shaper) "
            "or profile-cut it from the DXF, and check it with the span and over-pins "
            "sizes given here, which include the shift"
        )
    return tuple(notes)


def indexing_text(plan: IndexPlan) -> str:
    """The dividing-head setting in a few words, e.g. ``"2 turns + 6/15"``.

    ``h/c`` reads "h hole spaces on the c-hole circle".
    """
    if plan.method == "none":
        return "not indexable: " + plan.suggestion
    setting = f"{plan.turns} turn{'' if plan.turns == 1 else 's'}" if plan.turns else ""
    if plan.holes:
        holes = f"{plan.holes}/{plan.circle}"
        setting = f"{setting} + {holes}" if setting else holes
    if plan.method == "simple":
        return f"simple {setting} ({plan.ratio}:1)"
    assert plan.gears is not None
    gears = "-".join(str(g) for g in plan.gears.order)
    return (
        f"differential {setting} as for {plan.approx_count} ({plan.ratio}:1), "
        f"gears {gears}, plate {plan.gears.plate_words} crank, {plan.gears.idlers} idler(s)"
    )


def pitch_text(row: CuttingRow, lengths: Lengths = MM) -> str:
    """The tooth size as the sheet's pitch column gives it: the module in mm, or in
    inches the diametral pitch (25.4 / module for a module wheel)."""
    if not lengths.inches:
        return f"{row.module:g}"
    dp = row.diametral_pitch
    return f"{dp:g}" if dp is not None else f"{25.4 / row.module:.4g}"


def _system_note(row: CuttingRow, lengths: Lengths) -> tuple[str, ...]:
    """Which cutters, when the pitch column does not say it in the cutter's own terms."""
    if row.diametral_pitch is not None and not lengths.inches:
        return (
            f"cut to {row.diametral_pitch:g} diametral pitch (module {row.module:g} "
            f"mm): a {row.diametral_pitch:g} DP cutter",
        )
    if row.diametral_pitch is None and lengths.inches:
        return (f"cut to module {row.module:g} mm: a module cutter, not a DP one",)
    return ()


def _csv_row(row: CuttingRow, lengths: Lengths) -> list[str]:
    num = lengths.num
    cut = row.cutter
    return [
        row.wheel,
        str(row.teeth),
        pitch_text(row, lengths),
        row.form,
        f"{row.angle_deg:g}",
        f"{row.shift:g}",
        lengths.short(row.face_width),
        num(row.blank_diameter, 3),
        num(row.full_depth, 3),
        "" if row.cutter_number is None else str(row.cutter_number),
        indexing_text(row.indexing),
        "" if row.span_teeth is None else str(row.span_teeth),
        num(row.span_width, 4),
        num(row.pin_diameter, 3),
        num(row.over_pins, 4),
        num(row.bore, 3),
        row.bore_fit,
        holes_text(row.holes, lengths),
        num(row.thinning, 4),
        num(row.infeed, 4),
        "" if cut is None else f"{cut.space_angle_deg:.4f}",
        "" if cut is None else num(cut.tip_width, 4),
        "" if cut is None else num(cut.tip_radius, 4),
        "" if cut is None else num(cut.shoulder_radius, 4),
        "" if cut is None else cutter_drawing_file(row.wheel),
        "; ".join(
            _system_note(row, lengths) + row.warnings + _infeed_note(row, lengths)
        ),
    ]


def _infeed_note(row: CuttingRow, lengths: Lengths = MM) -> tuple[str, ...]:
    """The feed in words: where the thinning comes from and what to measure."""
    if row.thinning <= 0:
        return ()
    check = "over pins" if row.span_width is None else "span and over-pins sizes"
    return (
        f"the {check} include the backlash thinning of {lengths.fixed(row.thinning)}: "
        f"feed the cutter {lengths.fixed(row.infeed)} from the rim, "
        f"{lengths.fixed(row.extra_infeed)} beyond the full depth",
    )


def holes_text(
    holes: Sequence[tuple[float, float, float]], lengths: Lengths = MM
) -> str:
    """``"2.005 at (30.771, -1.343)"`` for each hole, joined by ``"; "``."""
    n = lengths.num
    return "; ".join(f"{n(d)} at ({n(x)}, {n(y)})" for x, y, d in holes)


def cutting_csv(rows: Sequence[CuttingRow], lengths: Lengths = MM) -> str:
    """The cutting sheet as CSV text (header first, ``\\n`` line ends), its lengths
    in ``lengths``' units."""
    return csv_text(cutting_columns(lengths), (_csv_row(row, lengths) for row in rows))


def cutting_sheet_writer(
    design: Design,
    parts: Sequence[Part],
    findings: Sequence[Finding],
    staging_dir: Path,
) -> list[Path]:
    """Sheet writer for ``wheelgen build``: ``cutting.csv`` and the cutter drawings.

    A printed design gets no cutting sheet (its print sheet says how to make the
    parts); every triangular wheel of another gets ``cutters/<wheel>.svg``.
    """
    if design.process.kind == "print":
        return []
    path = Path(staging_dir) / CUTTING_FILE
    rows = cutting_rows(parts)
    u = lengths_of(design)
    path.write_text(cutting_csv(rows, u), encoding="utf-8")
    written = [path]
    specs = {p.name: p.tooth for p in parts if isinstance(p, WheelPart)}
    for row in rows:
        if row.cutter is None:
            continue
        drawing = Path(staging_dir) / cutter_drawing_file(row.wheel)
        drawing.parent.mkdir(exist_ok=True)
        drawing.write_text(
            cutter_svg(row.wheel, specs[row.wheel], row.cutter, u), encoding="utf-8"
        )
        written.append(drawing)
    return written
