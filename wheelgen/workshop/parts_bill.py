"""The bill of parts: every part with its stock, quantity, overall size and volume.

Stock is what the part is cut from: sheet of the wheel's face width or the plate's
thickness (or a hand's, a dial's or a crank arm's), round rod for arbors (the bar a
shouldered arbor is turned from), pins, pillars, knobs and collars, tube (outside x
inside diameter) for sleeves, a block for a cock; a sleeve whose sizes match a tube
listed in the design's ``[[stock]]`` says so. Every fitted diameter of an arbor, tube
or collar is listed with its ISO 286 zone and limits (``fitted_diameters_mm``), and
the wheels' bores with theirs. Bought parts (screws, bushes, bearings) are counted: one row per
size, with how many and what they fix. The volume is an estimate from plain numbers,
not from the CAD kernel: a wheel's flat profile area (toothed outline minus bore,
windows, slot and pin hole, from the same profile the solids are extruded from) times
its face width, plus hub boss and pin boss; a plate's outline area minus its holes,
times its thickness; a sleeve is a round tube plus its collars (seat flats ignored).
For printed parts that is the plastic used at 100 % infill. Lengths in mm, volumes in
mm³; the sheet is written in the design's units (:class:`wheelgen.design.units.Lengths`:
inches to 0.0001 in and volumes in cubic inches, stock sizes with their inch fraction
where they are one).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Sequence

import numpy as np

from ..design.model import Design
from ..design.units import MM, MM_PER_INCH, Lengths, inch_fraction, lengths_of
from ..display.outlines import FlatProfile, flat_profile
from ..findings import Finding
from ..frame.outline import edges_polyline
from ..frame.plan import plan_frame
from ..layout.part_kinds import (
    ArborPart,
    BearingPart,
    CockPart,
    CollarPart,
    CrankPart,
    DialPart,
    HandPart,
    KnobPart,
    Part,
    PillarPart,
    PinPart,
    PlatePart,
    ScrewPart,
    SleevePart,
    WheelPart,
)
from ..layout.wheel_profile import plate_profile
from ..teeth.forms import outline_for
from .csv_text import csv_text

__all__ = [
    "BillRow",
    "PARTS_COLUMNS",
    "PARTS_FILE",
    "bill_rows",
    "fitted_diameters",
    "parts_columns",
    "wheel_profile_area",
    "parts_csv",
    "parts_sheet_writer",
    "volume_text",
]

#: File name of the bill of parts inside the build output.
PARTS_FILE = "parts.csv"

# Polylines for areas: 0.002 mm chord error changes a 1 mm-module wheel's area by far
# less than 0.1 % (derived: sagitta error times perimeter), and stays quick.
_AREA_TOL = 0.002


@dataclass(frozen=True, slots=True)
class BillRow:
    """One line of the bill; lengths in mm, volume in mm³.

    ``stock`` is ``"sheet"``, ``"rod"``, ``"tube"``, ``"block"`` or ``"bought"``;
    ``thickness`` is the sheet or block thickness, ``stock_outside``/``stock_inside``
    the rod or tube diameters. ``diameter`` x ``length`` is the part's overall size
    (largest diameter or across, axial length).
    """

    part: str
    kind: str
    stock: str
    thickness: float | None
    stock_outside: float | None
    stock_inside: float | None
    quantity: int
    diameter: float
    length: float
    volume: float
    note: str = ""
    bore: float | None = None
    fits: str = ""

    @property
    def stock_text(self) -> str:
        """The stock in words, e.g. ``"sheet 3 mm"``, ``"tube 5 x 3.2 mm"``."""
        return self.stock_words()

    def stock_words(self, lengths: Lengths = MM) -> str:
        """The stock in words in ``lengths``' units, with the inch fraction of a size
        the trade sells by fractions: ``"rod 0.125 in (1/8)"``."""
        size = lengths.stock
        if self.stock == "sheet":
            return f"sheet {size(self.thickness or 0.0)}"
        if self.stock == "block":
            return f"block {size(self.thickness or 0.0)} thick"
        if self.stock == "bought":
            return "bought"
        if self.stock == "tube" and not lengths.inches and not _fraction_sized(self):
            return f"tube {self.stock_outside:g} x {self.stock_inside:g} mm"
        if self.stock == "tube":
            return (
                f"tube {size(self.stock_outside or 0.0)} x "
                f"{size(self.stock_inside or 0.0)}"
            )
        return f"rod {size(self.stock_outside or 0.0)}"


def _fraction_sized(row: BillRow) -> bool:
    return any(
        v is not None and inch_fraction(v) is not None
        for v in (row.stock_outside, row.stock_inside)
    )


def parts_columns(lengths: Lengths = MM) -> tuple[str, ...]:
    """The CSV header in ``lengths``' units, in column order; units are in the names."""
    col = lengths.col
    # inch stock is sold by fractions: the sizes in words, with them, in inches
    words = ("stock_size",) if lengths.inches else ()
    return (
        "part",
        "kind",
        "quantity",
        "stock",
        *words,
        col("sheet_thickness"),
        col("stock_outside"),
        col("stock_inside"),
        col("overall_diameter"),
        col("overall_length"),
        col("volume") + "3",
        col("bore"),
        col("fitted_diameters"),
        "note",
    )


#: CSV header in millimetres, in column order; units are in the names.
PARTS_COLUMNS: tuple[str, ...] = parts_columns()


def _loop_area(loop: np.ndarray) -> float:
    x, y = loop[:, 0], loop[:, 1]
    return abs(0.5 * float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1))))


def wheel_profile_area(part: WheelPart) -> float:
    """Area (mm²) of the wheel's flat profile: outline minus every hole through it."""
    outline = outline_for(part.tooth)
    profile = plate_profile(part, outline)
    area = outline.area(_AREA_TOL)
    for hole in profile.holes:
        if hole.circle is not None:
            area -= math.pi * hole.circle[2] ** 2  # exact; a polygon would fall short
        else:
            area -= _loop_area(hole.polyline(_AREA_TOL))
    return area


def _wheel_row(part: WheelPart, u: Lengths = MM) -> BillRow:
    outline = outline_for(part.tooth)
    tip = float(outline.radii.get("tip", np.hypot(*outline.polyline(0.01).T).max()))
    volume = wheel_profile_area(part) * part.face_width
    length = part.face_width
    notes = []
    if part.hub_diameter > 0 and part.hub_length > 0:
        volume += math.pi / 4 * (part.hub_diameter**2 - part.bore**2) * part.hub_length
        length += part.hub_length
        notes.append(f"hub {u.short(part.hub_diameter)} x {u.text(part.hub_length)}")
    if part.pin is not None and not part.pin.hole_only:
        volume += math.pi / 4 * part.pin.diameter**2 * part.pin.length
        length = max(length, part.face_width + part.pin.length)
        notes.append(
            f"pin boss {u.short(part.pin.diameter)} x {u.text(part.pin.length)}"
        )
    if part.spokes:
        notes.append(f"{part.spokes} spokes")
    if part.bore_fit:
        notes.append(f"bore {part.bore_fit}")
    fits = ""
    if part.bore_fit:
        fits = f"bore {u.short(part.bore)} {part.bore_fit}"
    for x, y, d in part.holes:
        notes.append(
            f"bore {u.num(d)} {u.unit} at ({u.num(x)}, {u.num(y)}) for a carried arbor"
        )
    return BillRow(
        part=part.name,
        kind="wheel",
        stock="sheet",
        thickness=part.face_width,
        stock_outside=None,
        stock_inside=None,
        quantity=1,
        diameter=2 * tip,
        length=length,
        volume=volume,
        note="; ".join(notes),
        bore=part.bore,
        fits=fits,
    )


def _tube_note(design: Design, part: SleevePart) -> str:
    for tube in getattr(design, "stock", ()):
        if (
            getattr(tube, "kind", "tube") == "tube"
            and math.isclose(tube.outside, part.outside, abs_tol=1e-6)
            and math.isclose(tube.inside, part.inside, abs_tol=1e-6)
        ):
            return "tube from the design's stock list"
    return ""


def _limits(zone: str, low: float, high: float, u: Lengths = MM) -> str:
    """``"g6 2.992-2.998"``, or the size alone where no ISO zone applies."""
    if zone:
        return f"{zone} {u.num(low)}-{u.num(high)}"
    return u.short(low)


def fitted_diameters(part: ArborPart | SleevePart | CollarPart, u: Lengths = MM) -> str:
    """Every fitted diameter of a turned part with its zone and limits (in ``u``'s
    unit), joined by ``"; "``: ``"pivot 3 g6 2.992-2.998 (back_plate)"``."""
    out: list[str] = []
    if isinstance(part, (SleevePart, CollarPart)) and part.bore_low > 0:
        limits = _limits(part.bore_zone, part.bore_low, part.bore_high, u)
        out.append(f"bore {u.short(part.inside)} {limits}")
    if isinstance(part, CollarPart):
        return "; ".join(out)
    seen: set[tuple[str, float, str, str]] = set()
    for s in part.sections:
        if not s.zone and s.role in ("plain", "shoulder", "collar"):
            continue
        size = s.across if s.across else s.diameter
        key = (s.role, size, s.zone, s.what)
        if key in seen:
            continue
        seen.add(key)
        across = f" across flats ({s.shape})" if s.across else ""
        what = f" ({s.what})" if s.what else ""
        limits = _limits(s.zone, s.low, s.high, u)
        out.append(f"{s.role} {u.short(size)}{across} {limits}{what}")
    return "; ".join(out)


def _turned_volume(
    outside: float,
    inside: float,
    length: float,
    collars: Sequence[tuple[float, float, float]],
) -> tuple[float, float]:
    """Volume (mm³) and largest diameter (mm) of a round bar or tube with collars."""
    volume = math.pi / 4 * (outside**2 - inside**2) * length
    largest = outside
    for z0, z1, d in collars:
        if d > outside:
            volume += math.pi / 4 * (d**2 - outside**2) * (z1 - z0)
            largest = max(largest, d)
    return volume, largest


def _made_how(
    design: Design, stock: float, largest: float, outside: float, u: Lengths = MM
) -> str:
    """How a turned part's stock is worked, in words (nothing when printed)."""
    process = getattr(getattr(design, "process", None), "kind", "mill")
    if process == "print":
        return "printed"
    if stock > 0 and largest > outside + 1e-9:
        return f"turned from {u.stock(stock)} bar; shoulders up to {u.text(largest)}"
    if stock > 0 and stock > outside + 1e-9:
        return f"turned from {u.stock(stock)} bar"
    return ""


def _sleeve_row(design: Design, part: SleevePart, u: Lengths = MM) -> BillRow:
    volume, largest = _turned_volume(
        part.outside, part.inside, part.length, part.collars
    )
    notes = [n for n in (_tube_note(design, part),) if n]
    how = _made_how(design, part.stock, largest, part.outside, u)
    if how:
        notes.append(how)
    elif largest > part.outside:
        notes.append(f"collars up to {u.text(largest)}: turn from larger stock")
    return BillRow(
        part=part.name,
        kind="sleeve",
        stock="tube",
        thickness=None,
        stock_outside=part.outside,
        stock_inside=part.inside,
        quantity=1,
        diameter=largest,
        length=part.length,
        volume=volume,
        note="; ".join(notes),
        bore=part.inside,
        fits=fitted_diameters(part, u),
    )


def _rod_row(design: Design, part: ArborPart | PinPart, u: Lengths = MM) -> BillRow:
    collars = part.collars if isinstance(part, ArborPart) else ()
    volume, largest = _turned_volume(part.diameter, 0.0, part.length, collars)
    stock = part.stock if isinstance(part, ArborPart) and part.stock > 0 else 0.0
    return BillRow(
        part=part.name,
        kind=part.kind,
        stock="rod",
        thickness=None,
        stock_outside=stock or part.diameter,
        stock_inside=None,
        quantity=1,
        diameter=largest,
        length=part.length,
        volume=volume,
        note=_made_how(design, stock, largest, part.diameter, u),
        fits=fitted_diameters(part, u) if isinstance(part, ArborPart) else "",
    )


def _collar_row(design: Design, part: CollarPart, u: Lengths = MM) -> BillRow:
    volume, _ = _turned_volume(part.outside, part.inside, part.length, ())
    printed = getattr(getattr(design, "process", None), "kind", "mill") == "print"
    return BillRow(
        part=part.name,
        kind="collar",
        stock="rod",
        thickness=None,
        stock_outside=part.outside,
        stock_inside=None,
        quantity=1,
        diameter=part.outside,
        length=part.length,
        volume=volume,
        note=(
            f"{'printed ' if printed else ''}collar on {part.member}, fixed with"
            f" {part.fixing}"
        ),
        bore=part.inside,
        fits=fitted_diameters(part, u),
    )


def _plate_row(part: PlatePart, u: Lengths = MM) -> BillRow:
    loop = edges_polyline(part.outline, _AREA_TOL)
    area = _loop_area(loop) - sum(math.pi / 4 * h.diameter**2 for h in part.holes)
    w = float(loop[:, 0].max() - loop[:, 0].min())
    h = float(loop[:, 1].max() - loop[:, 1].min())
    return BillRow(
        part=part.name,
        kind="plate",
        stock="sheet",
        thickness=part.thickness,
        stock_outside=None,
        stock_inside=None,
        quantity=1,
        diameter=max(w, h),
        length=part.thickness,
        volume=area * part.thickness,
        note=f"{_across(w, h, u)}, {len(part.holes)} holes (drilling chart)",
    )


def _pillar_row(part: PillarPart, u: Lengths = MM) -> BillRow:
    r = part.diameter / 2
    volume = math.pi * r**2 * part.length
    length = part.length
    notes = []
    if part.spigot > 0:
        spigots = part.back_spigot + part.front_spigot
        volume += math.pi / 4 * part.spigot**2 * spigots
        length += spigots
        notes.append(
            f"turned; spigots {u.text(part.spigot)} at each end through the plates;"
            " back end riveted over"
        )
    for end, d, depth in (
        ("back", part.back_hole, part.back_depth),
        ("front", part.front_hole, part.front_depth),
    ):
        if d > 0 and depth > 0:
            volume -= math.pi / 4 * d**2 * depth
            notes.append(
                f"{end} end drilled {u.text(d)} x {u.short(depth)} deep and tapped"
            )
    return BillRow(
        part=part.name,
        kind="pillar",
        stock="rod",
        thickness=None,
        stock_outside=part.diameter,
        stock_inside=None,
        quantity=1,
        diameter=part.diameter,
        length=length,
        volume=volume,
        note="; ".join(notes),
    )


def _cock_how(design: Design, part: CockPart) -> str:
    """How to line the cock's pivot up with the plate that holds its arbor."""
    if getattr(design, "frame", None) is not None:
        for c in plan_frame(design).cocks:
            if c.name == part.name and c.plate != c.held_by:
                return (
                    f"screw it on, then ream its pivot hole in line with the {c.held_by}"
                    " plate's (a rod through both)"
                )
    return "screw it on, then ream its pivot hole through the plate's"


def _cock_row(design: Design, part: CockPart, u: Lengths = MM) -> BillRow:
    w = part.width
    bar = (part.length * w + math.pi / 4 * w**2) * part.thickness
    foot = ((part.length - part.foot_from) * w + math.pi / 4 * w**2) * part.foot_height
    holes = math.pi / 4 * part.pivot_hole**2 * part.thickness
    holes += len(part.screws) * math.pi / 4 * part.screw_hole**2 * part.screw_depth
    height = part.thickness + part.foot_height
    return BillRow(
        part=part.name,
        kind="cock",
        stock="block",
        thickness=height,
        stock_outside=None,
        stock_inside=None,
        quantity=1,
        diameter=part.length + w,
        length=height,
        volume=bar + foot - holes,
        note=(
            f"bar {u.text(w)} wide, {u.text(part.thickness)} thick, pivot hole"
            f" {u.text(part.pivot_hole)}; foot {u.text(part.foot_height)} high with"
            f" {len(part.screws)} holes {u.text(part.screw_hole)} x"
            f" {u.short(part.screw_depth)} deep, tapped; {_cock_how(design, part)}"
        ),
    )


def _bought_rows(
    parts: Sequence[ScrewPart | BearingPart], u: Lengths = MM
) -> list[BillRow]:
    groups: dict[tuple[Any, ...], list[ScrewPart | BearingPart]] = {}
    for p in parts:
        if isinstance(p, ScrewPart):
            key: tuple[Any, ...] = ("screw", p.size, p.length, p.head_diameter)
        else:
            key = (p.stock_kind, p.outside, p.inside, p.width)
        groups.setdefault(key, []).append(p)

    rows = []
    for key, items in groups.items():
        first = items[0]
        if isinstance(first, ScrewPart):
            name = f"{first.size} x {first.length:g} screw"  # metric: mm always
            note = "socket head cap screw, ISO 4762"
            diameter, length = first.head_diameter, first.length + first.head_height
            volume = (
                math.pi
                / 4
                * (
                    first.head_diameter**2 * first.head_height
                    + first.core**2 * first.length
                )
            )
        else:
            name = (
                f"{first.stock_kind} {u.trade(first.outside)} x {u.trade(first.inside)}"
                f" x {u.trade(first.width)}"
            )
            if u.inches:
                name += " in"
            note = "from the design's stock list"
            diameter, length = first.outside, first.width
            volume = math.pi / 4 * (first.outside**2 - first.inside**2) * first.width
        rows.append(
            BillRow(
                part=name,
                kind=key[0],
                stock="bought",
                thickness=None,
                stock_outside=None,
                stock_inside=None,
                quantity=len(items),
                diameter=diameter,
                length=length,
                volume=volume * len(items),
                note=f"{note}; " + ", ".join(p.name for p in items),
            )
        )
    return rows


def _flat_area(profile: FlatProfile) -> float:
    """Area (mm²) of a display part's flat profile: outline minus its holes."""
    area = _loop_area(profile.outline.polyline(_AREA_TOL))
    for hole in profile.holes:
        if hole.circle is not None:
            area -= math.pi * hole.circle[2] ** 2
        else:
            area -= _loop_area(hole.polyline(_AREA_TOL))
    return area


def _display_row(
    part: HandPart | DialPart | CrankPart | KnobPart, u: Lengths = MM
) -> BillRow:
    area = _flat_area(flat_profile(part))
    if isinstance(part, KnobPart):
        return BillRow(
            part.name, part.kind, "rod", None, part.diameter, None, 1,
            part.diameter, part.length, area * part.length, f"{part.seat} seat",
        )  # fmt: skip
    volume = area * part.thickness
    notes = []
    if isinstance(part, HandPart):
        diameter = 2 * max(part.length, part.tail)
        length = part.thickness + part.collet_length
        if part.collet > 0:
            volume += area_ring(part.collet, part.across) * part.collet_length
            notes.append(
                f"collet {u.short(part.collet)} x {u.text(part.collet_length)}"
            )
        notes.append(f"{part.seat} seat")
    elif isinstance(part, DialPart):
        diameter = 2 * part.radius
        length = part.foot_length + part.thickness
        feet = len(part.feet)
        volume += feet * (
            math.pi / 4 * part.foot_diameter**2 * part.foot_length
            + math.pi / 4 * part.foot_pin**2 * part.pin_length
        )
        if feet:
            notes.append(
                f"{feet} feet {u.short(part.foot_diameter)} x"
                f" {u.text(part.foot_length)}, each with a {u.text(part.foot_pin)} pin"
                " through the front plate (rivet or glue it behind); face printed 1:1"
                " (svg) or engraved (dxf layer ENGRAVE)"
            )
    else:
        diameter = 2 * (part.throw + part.arm / 2)
        length = part.thickness + part.handle_length
        volume += math.pi / 4 * part.handle_diameter**2 * part.handle_length
        notes.append(
            f"handle {u.short(part.handle_diameter)} x {u.text(part.handle_length)}"
        )
    return BillRow(
        part.name, part.kind, "sheet", part.thickness, None, None, 1,
        diameter, length, volume, "; ".join(notes),
    )  # fmt: skip


def area_ring(outside: float, inside: float) -> float:
    """Area (mm²) of a ring ``outside`` by ``inside`` mm across."""
    return math.pi / 4 * (outside**2 - inside**2)


def bill_rows(design: Design, parts: Sequence[Part]) -> tuple[BillRow, ...]:
    """One row per made part, in the order of the part plan, then one row per size
    of bought part (screws, bushes, bearings) with the count."""
    rows = []
    bought = []
    u = lengths_of(design)
    for part in parts:
        if isinstance(part, WheelPart):
            rows.append(_wheel_row(part, u))
        elif isinstance(part, SleevePart):
            rows.append(_sleeve_row(design, part, u))
        elif isinstance(part, (ArborPart, PinPart)):
            rows.append(_rod_row(design, part, u))
        elif isinstance(part, CollarPart):
            rows.append(_collar_row(design, part, u))
        elif isinstance(part, PlatePart):
            rows.append(_plate_row(part, u))
        elif isinstance(part, PillarPart):
            rows.append(_pillar_row(part, u))
        elif isinstance(part, CockPart):
            rows.append(_cock_row(design, part, u))
        elif isinstance(part, (ScrewPart, BearingPart)):
            bought.append(part)
        elif isinstance(part, (HandPart, DialPart, CrankPart, KnobPart)):
            rows.append(_display_row(part, u))
        else:
            raise ValueError(f"unknown part kind {type(part).__name__!r}")
    return tuple(rows + _bought_rows(bought, u))


def _across(w: float, h: float, u: Lengths) -> str:
    """A plate's size: ``"84.0 x 60.5 mm"``, ``"3.3071 x 2.3819 in"``."""
    if u.inches:
        return f"{u.num(w)} x {u.num(h)} in"
    return f"{w:.1f} x {h:.1f} mm"


def volume_text(mm3: float | None, lengths: Lengths = MM) -> str:
    """A volume in ``lengths``' cube: mm³ to 0.1, in³ to 0.0001."""
    if mm3 is None:
        return ""
    if lengths.inches:
        return f"{mm3 / float(MM_PER_INCH) ** 3:.4f}"
    return f"{mm3:.1f}"


def parts_csv(rows: Sequence[BillRow], lengths: Lengths = MM) -> str:
    """The bill of parts as CSV text (header first, ``\\n`` line ends), its lengths
    in ``lengths``' units."""
    num = lengths.num
    return csv_text(
        parts_columns(lengths),
        (
            [
                r.part,
                r.kind,
                str(r.quantity),
                r.stock,
                *([r.stock_words(lengths)] if lengths.inches else []),
                num(r.thickness),
                num(r.stock_outside),
                num(r.stock_inside),
                num(r.diameter),
                num(r.length),
                volume_text(r.volume, lengths),
                num(r.bore),
                r.fits,
                r.note,
            ]
            for r in rows
        ),
    )


def parts_sheet_writer(
    design: Design,
    parts: Sequence[Part],
    findings: Sequence[Finding],
    staging_dir: Path,
) -> list[Path]:
    """Sheet writer for ``wheelgen build``: writes ``parts.csv`` into ``staging_dir``."""
    path = Path(staging_dir) / PARTS_FILE
    text = parts_csv(bill_rows(design, parts), lengths_of(design))
    path.write_text(text, encoding="utf-8")
    return [path]
