"""Read the tables that set up the whole design: ``[design]``, ``[process]``,
``[frame]``, ``[[pillar]]`` and ``[[stock]]``.

Each reader takes the :class:`~wheelgen.design.schema.FileReader` and the parsed
document, and returns the table's dataclass (or what the file may leave out as ``None``);
every mistake is a problem of the reader, with its file, line and key.
"""

from __future__ import annotations

import re
from typing import Any

from .bounds import BOUNDS
from .model import Frame, PillarSpec, Process, Stock, Where
from .names import control_characters
from .schema import (
    COORDINATE,
    Check,
    FileReader,
    bounded,
    bounded_length,
    choice,
    ordinal,
    position,
    reason_of,
    show,
)
from .screws import SCREWS
from .units import UNITS

__all__ = [
    "FRAME_KEYS",
    "PROCESS_KEYS",
    "read_design_table",
    "read_frame_table",
    "read_pillars",
    "read_process_table",
    "read_stock",
]

#: Keys of the [frame] table.
FRAME_KEYS = (
    "plates",
    "thickness",
    "margin",
    "clearance",
    "rectangle",
    "polygon",
    "corner",
    "pillars",
    "pillar_diameter",
    "screw",
)


PROCESS_KEYS: dict[str, tuple[str, Check | None]] = {
    "nozzle": ("length", bounded_length("nozzle")),
    "layer": ("length", bounded_length("layer")),
    "clearance": ("length", bounded_length("play")),
    "cutter": ("length", bounded_length("cutter")),
    "fit": ("string", None),
    "min_wall": ("length", bounded_length("size")),
    "min_module_hand": ("number", bounded("module")),
    "min_backlash": ("length", bounded_length("play")),
    "centre_tolerance": ("length", bounded_length("centre_tolerance")),
    "min_layers": ("integer", bounded("min_layers")),
}


def _title(v: Any) -> str | None:
    limit = BOUNDS["title_length"]
    if not isinstance(v, str):
        return f"text of {limit.allowed()}, without control characters"
    bad = control_characters(v)
    if bad:
        return (
            f"printable text (it holds the control character {bad[0]}; "
            "a title is one line)"
        )
    if not limit.holds(len(v)):
        return f"text of {limit.allowed()} (it has {len(v)})"
    return None


def _signed_area(pts: tuple[tuple[float, float], ...]) -> float:
    """Shoelace area (mm2), positive for corners counter-clockwise."""
    n = len(pts)
    return 0.5 * sum(
        pts[i][0] * pts[(i + 1) % n][1] - pts[(i + 1) % n][0] * pts[i][1]
        for i in range(n)
    )


def _crosses_itself(pts: tuple[tuple[float, float], ...]) -> bool:
    """Do two sides of the closed polygon that are not neighbours touch or cross?"""

    def orient(
        a: tuple[float, float], b: tuple[float, float], c: tuple[float, float]
    ) -> float:
        return (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])

    def meet(
        p: tuple[float, float],
        q: tuple[float, float],
        r: tuple[float, float],
        s: tuple[float, float],
    ) -> bool:
        d1, d2 = orient(r, s, p), orient(r, s, q)
        d3, d4 = orient(p, q, r), orient(p, q, s)
        if (
            ((d1 > 0) != (d2 > 0))
            and ((d3 > 0) != (d4 > 0))
            and 0 not in (d1, d2, d3, d4)
        ):
            return True

        def on(
            a: tuple[float, float], b: tuple[float, float], c: tuple[float, float]
        ) -> bool:
            return (
                orient(a, b, c) == 0
                and min(a[0], b[0]) <= c[0] <= max(a[0], b[0])
                and min(a[1], b[1]) <= c[1] <= max(a[1], b[1])
            )

        return on(r, s, p) or on(r, s, q) or on(p, q, r) or on(p, q, s)

    n = len(pts)
    if len(set(pts)) != n:
        return True
    sides = [(pts[i], pts[(i + 1) % n]) for i in range(n)]
    for i in range(n):
        for j in range(i + 1, n):
            if j == i + 1 or (i == 0 and j == n - 1):
                continue
            if meet(*sides[i], *sides[j]):
                return True
    return False


def read_design_table(rd: FileReader, doc: dict[str, Any]) -> tuple[str, str]:
    """``[design]``: the title and the process; sets the file's units on the reader."""
    t = rd.table(doc, "design", required=True)
    if t is None:
        return "", "mill"
    ctx = ("design", 0, "[design]")
    rd.unknown_keys(t, ("title", "process", "units"), ctx, required=("title",))
    title = rd.value(t, "title", "string", ctx, required=True, default="", check=_title)
    process = rd.value(
        t,
        "process",
        "string",
        ctx,
        default="mill",
        check=choice("print", "mill", "hand"),
    )
    rd.units = rd.value(t, "units", "string", ctx, default="mm", check=choice(*UNITS))
    return title, process


def read_process_table(rd: FileReader, doc: dict[str, Any], kind: str) -> Process:
    """``[process]``: the limits of the process ``kind`` (print, mill or hand)."""
    t = rd.table(doc, "process")
    if t is None:
        return Process(kind=kind)  # type: ignore[arg-type]  # checked by choice above
    ctx = ("process", 0, "[process]")
    rd.unknown_keys(t, (*PROCESS_KEYS, "bed"), ctx)
    values: dict[str, Any] = {}
    bed = _bed_size(rd, t, ctx)
    if bed is not None:
        values["bed"] = bed
    for key, (vkind, check) in PROCESS_KEYS.items():
        v = rd.value(t, key, vkind, ctx, check=check)
        if v is not None:
            values[key] = v
    fit = values.get("fit")
    if fit is not None and not re.match(r"^[A-Z]{1,2}\d{1,2}/[a-z]{1,2}\d{1,2}$", fit):
        rd.problem(
            rd.where("process", 0, "[process]", "fit"),
            f"fit = {show(fit)}",
            'an ISO 286 fit such as "H7/g6", "H7/h6" or "H8/f7"',
        )
        values.pop("fit")
    return Process(kind=kind, **values)  # type: ignore[arg-type]  # checked by choice above


def _bed_size(
    rd: FileReader, t: dict[str, Any], ctx: tuple[str, int, str]
) -> tuple[float, float] | None:
    """``bed = [x, y]``: the printer's build plate in mm, or None if not given."""
    if "bed" not in t:
        return None
    v = t["bed"]
    bound = BOUNDS["bed"]
    values = [position(x) for x in v] if isinstance(v, list) else []
    if len(values) != 2 or not all(x is not None and bound.holds(x) for x in values):
        rd.problem(
            rd.where(*ctx, "bed"),
            f"bed = {show(v)}",
            'two lengths in brackets, such as [250.0, 210.0] or ["10 in", "8 in"], '
            "each " + bound.allowed(),
            reason_of(bounded("bed")) if isinstance(v, list) and len(v) == 2 else "",
        )
        return None
    return (float(values[0] or 0.0), float(values[1] or 0.0))


def read_frame_table(rd: FileReader, doc: dict[str, Any]) -> Frame | None:
    """``[frame]``: the plates, their outline and pillars, or None without one."""
    t = rd.table(doc, "frame")
    if t is None:
        return None
    ctx = ("frame", 0, "[frame]")
    rd.unknown_keys(t, FRAME_KEYS, ctx)
    plates = rd.pair_of_numbers(t, "plates", ctx, default=(0.0, 40.0))
    if plates[1] <= plates[0]:
        rd.problem(
            rd.where("frame", 0, "[frame]", "plates"),
            f"plates = {list(plates)}",
            "[back, front] with front > back (mm)",
        )
    thickness = rd.value(
        t, "thickness", "length", ctx, default=2.0, check=bounded_length("size")
    )
    margin = rd.value(t, "margin", "length", ctx, check=bounded_length("size_or_zero"))
    clearance = rd.value(
        t, "clearance", "length", ctx, check=bounded_length("size_or_zero")
    )
    corner = rd.value(
        t, "corner", "length", ctx, default=3.0, check=bounded_length("size_or_zero")
    )
    pillars = rd.value(
        t, "pillars", "integer", ctx, default=4, check=bounded("pillars")
    )
    pillar_d = rd.value(
        t, "pillar_diameter", "length", ctx, check=bounded_length("size")
    )
    screw = rd.value(t, "screw", "string", ctx, default="M3", check=choice(*SCREWS))
    rectangle = _rectangle(rd, t, ctx)
    polygon = _polygon(rd, t, ctx)
    if rectangle is not None and polygon is not None:
        rd.problem(
            rd.where("frame", 0, "[frame]", "polygon"),
            "both 'rectangle' and 'polygon'",
            "one of them, or neither (the outline is then found round the wheels)",
        )
        polygon = None
    return Frame(
        plates=plates,
        thickness=thickness,
        margin=margin,
        clearance=clearance,
        rectangle=rectangle,
        polygon=polygon,
        corner=corner,
        pillars=pillars,
        pillar_diameter=pillar_d,
        screw=screw,
    )


def _rectangle(
    rd: FileReader, t: dict[str, Any], ctx: tuple[str, int, str]
) -> tuple[float, float, float, float] | None:
    """``rectangle = [x0, y0, x1, y1]`` of the plates in mm, or None."""
    if "rectangle" not in t:
        return None
    v = t["rectangle"]
    allowed = "four lengths [x0, y0, x1, y1] with x1 > x0 and y1 > y0, " + COORDINATE
    values = [position(x) for x in v] if isinstance(v, list) else []
    if len(values) != 4 or None in values:
        rd.problem(rd.where(*ctx, "rectangle"), f"rectangle = {show(v)}", allowed)
        return None
    x0, y0, x1, y1 = (float(x) for x in values if x is not None)
    if x1 <= x0 or y1 <= y0:
        rd.problem(rd.where(*ctx, "rectangle"), f"rectangle = {show(v)}", allowed)
        return None
    return (x0, y0, x1, y1)


def _polygon(
    rd: FileReader, t: dict[str, Any], ctx: tuple[str, int, str]
) -> tuple[tuple[float, float], ...] | None:
    """``polygon = [[x, y], ...]`` of the plates in mm, or None; its sides may not cross."""
    if "polygon" not in t:
        return None
    v = t["polygon"]
    corners = BOUNDS["frame_corners"]
    allowed = (
        f"a list of at least {int(corners.low)} corners [[x, y], ...] (at most "
        f"{int(corners.high)}; {COORDINATE}) that do not cross, such as"
        " [[-50, -40], [60, -40], [60, 50], [-50, 50]]"
    )
    points = (
        [[position(x) for x in p] if isinstance(p, list) else [None] for p in v]
        if isinstance(v, list) and corners.holds(len(v))
        else [[None]]
    )
    if not all(len(p) == 2 and None not in p for p in points):
        rd.problem(rd.where(*ctx, "polygon"), f"polygon = {show(v)}", allowed)
        return None
    pts = tuple((float(p[0] or 0.0), float(p[1] or 0.0)) for p in points)
    if _crosses_itself(pts) or abs(_signed_area(pts)) < 1e-9:
        rd.problem(
            rd.where(*ctx, "polygon"),
            "polygon: its sides cross, or it encloses no area",
            allowed,
        )
        return None
    return pts


def read_pillars(rd: FileReader, doc: dict[str, Any]) -> list[PillarSpec]:
    """The ``[[pillar]]`` tables: where the pillars stand (three or more, with a [frame])."""
    out = []
    tables = rd.tables(doc, "pillar")
    for i, t in enumerate(tables):
        item = f"the {ordinal(i + 1)} [[pillar]]"
        ctx = ("pillar", i, item)
        rd.unknown_keys(t, ("at",), ctx, required=("at",))
        at = rd.pair_of_numbers(t, "at", ctx)
        if at is None:
            if "at" not in t:
                rd.problem(
                    rd.where(*ctx, "at"),
                    "'at' is missing",
                    "two numbers [x, y] (mm), the pillar's axis (required)",
                )
            continue
        out.append(PillarSpec(at, i + 1, rd.where("pillar", i, item)))
    if tables and len(tables) < 3:
        rd.problem(
            Where(rd.file, "[[pillar]]", line=rd.lines.line("pillar")),
            f"{len(tables)} [[pillar]] table(s)",
            "at least 3 pillars (three hold the plates parallel), or none: they are"
            " then placed automatically",
        )
    if tables and "frame" not in doc:
        rd.problem(
            Where(rd.file, "[[pillar]]", line=rd.lines.line("pillar")),
            "[[pillar]] tables but no [frame]",
            "a [frame] table with the plates the pillars stand between",
        )
    return out


def read_stock(rd: FileReader, doc: dict[str, Any]) -> list[Stock]:
    """The ``[[stock]]`` tables: the tubes, bushes, bearings and rods on hand."""
    out = []
    for i, t in enumerate(rd.tables(doc, "stock")):
        item = f"the {ordinal(i + 1)} [[stock]]"
        ctx = ("stock", i, item)
        rd.unknown_keys(
            t,
            ("kind", "outside", "inside", "width"),
            ctx,
            required=("outside",),
        )
        kind = rd.value(
            t,
            "kind",
            "string",
            ctx,
            default="tube",
            check=choice("tube", "bush", "bearing", "rod"),
        )
        outside = rd.value(
            t, "outside", "length", ctx, required=True, check=bounded_length("size")
        )
        if kind == "rod":
            for key in ("inside", "width"):
                if key in t:
                    rd.problem(
                        rd.where("stock", i, item, key),
                        f"'{key}' on a rod",
                        "only 'outside' on a rod (it is solid and cut to length)",
                    )
            if outside is not None and "inside" not in t and "width" not in t:
                out.append(Stock(outside, 0.0, rd.where("stock", i, item), kind))
            continue
        inside = rd.value(
            t, "inside", "length", ctx, required=True, check=bounded_length("size")
        )
        width = rd.value(t, "width", "length", ctx, check=bounded_length("size"))
        if kind in ("bush", "bearing") and width is None and "width" not in t:
            rd.problem(
                rd.where("stock", i, item, "width"),
                f"'width' is missing on a {kind}",
                f"the {kind}'s axial width in mm (required for a {kind})",
            )
            continue
        if kind == "tube" and "width" in t:
            rd.problem(
                rd.where("stock", i, item, "width"),
                "'width' on a tube",
                "'width' only on a bush or a bearing (a tube is cut to length)",
            )
            continue
        if outside is not None and inside is not None:
            if inside >= outside:
                rd.problem(
                    rd.where("stock", i, item, "inside"),
                    f"inside = {inside:g} >= outside = {outside:g}",
                    "an inside diameter smaller than the outside (mm)",
                )
                continue
            out.append(
                Stock(
                    outside,
                    inside,
                    rd.where("stock", i, item),
                    kind,
                    width if kind != "tube" else None,
                )
            )
    return out
