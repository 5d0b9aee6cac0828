"""Read the tables of the train itself: ``[defaults]``, ``[drive]``, ``[[arbor]]``,
``[[wheel]]``, ``[[mesh]]``, ``[[pinslot]]`` and ``[[target]]``.

Each reader takes the :class:`~wheelgen.design.schema.FileReader` and the parsed
document and returns the items it could read; an item with a mistake is reported and
left out (and its name marked broken, so a reference to it is not reported again).
Whether the names the items give each other exist is :mod:`.references`' work.
"""

from __future__ import annotations

import re
from fractions import Fraction
from typing import Any

from .bounds import BOUNDS
from .diametral_pitch import inch_rack, module_of_dp
from .model import Arbor, Drive, Mesh, PinSlot, Process, Target, Wheel
from .periods import UNIT_SECONDS, PeriodError, parse_number, parse_period
from .schema import (
    MAX_PERIOD_S,
    Check,
    FileReader,
    bounded,
    bounded_length,
    choice,
    ordinal,
    show,
)
from .tooth_defaults import milled_root_radius, tooth_defaults

__all__ = [
    "LEAST_PLAY_CHOICES",
    "MAX_TEETH",
    "MAX_TURNS",
    "MIN_TEETH",
    "MIN_TURNS",
    "WHEEL_KEYS",
    "read_arbors",
    "read_defaults_table",
    "read_drive_table",
    "read_meshes",
    "read_pinslots",
    "read_targets",
    "read_wheels",
]

#: The fewest and most teeth a wheel may have.
MIN_TEETH = int(BOUNDS["teeth"].low)
MAX_TEETH = int(BOUNDS["teeth"].high)
#: Turns per drive turn that a target may ask for.
MIN_TURNS, MAX_TURNS = Fraction(BOUNDS["turns"].low), Fraction(BOUNDS["turns"].high)


#: Per-wheel keys that [defaults] may also set: key -> (default, kind, check).
WHEEL_KEYS: dict[str, tuple[Any, str, Check | None]] = {
    "module": (1.0, "number", bounded("module")),
    "form": ("involute", "string", choice("involute", "triangular")),
    "pressure_angle": (20.0, "number", bounded("pressure_angle")),
    # None: by form, tooth count and process (design/tooth_defaults.py)
    "tooth_angle": (None, "number", bounded("tooth_angle")),
    "face_width": (3.0, "length", bounded_length("size")),
    "shift": (0.0, "number", bounded("shift")),
    "backlash": (None, "length", bounded_length("play")),
    "addendum": (None, "number", bounded("addendum")),
    "dedendum": (None, "number", bounded("dedendum")),
    "root_radius": (None, "number", bounded("root_radius")),
    "tip_radius": (None, "number", bounded("tip_radius")),
    "bore": (None, "length", bounded_length("size")),
    "seat": ("round", "string", choice("round", "square", "hex", "pinned")),
    "spokes": (0, "integer", bounded("spokes")),
    "rim": (None, "length", bounded_length("size")),
    "hub_diameter": (0.0, "length", bounded_length("size_or_zero")),
    "hub_length": (0.0, "length", bounded_length("size_or_zero")),
    # None: a module wheel; a number makes the wheel a diametral-pitch wheel
    "diametral_pitch": (None, "number", bounded("diametral_pitch")),
}


#: What ``least_play`` (in [[mesh]] and [defaults]) accepts; "none" turns it off.
LEAST_PLAY_CHOICES = ("backlash", "addendum", "none")


#: What a wheel may give for the size of its teeth, for messages.
_ONE_PITCH = (
    "one of them: a module in mm, or a diametral pitch in teeth per inch (the "
    "module is then 25.4 / diametral_pitch)"
)


# Wheel field names that differ from the file's keys.
_WHEEL_FIELD = {
    "pressure_angle": "pressure_angle_deg",
    "tooth_angle": "tooth_angle_deg",
}


def read_defaults_table(rd: FileReader, doc: dict[str, Any]) -> dict[str, Any]:
    """``[defaults]``: every wheel key's value for wheels that do not set it."""
    t = rd.table(doc, "defaults")
    out = {k: spec[0] for k, spec in WHEEL_KEYS.items()}
    if t is None:
        return out
    ctx = ("defaults", 0, "[defaults]")
    rd.unknown_keys(t, (*WHEEL_KEYS, "least_play"), ctx)
    for key, (default, kind, check) in WHEEL_KEYS.items():
        out[key] = rd.value(t, key, kind, ctx, default=default, check=check)
    out["least_play"] = rd.value(
        t, "least_play", "string", ctx, check=choice(*LEAST_PLAY_CHOICES)
    )
    if {"module", "diametral_pitch"} <= set(t):
        rd.problem(
            rd.where("defaults", 0, "[defaults]", "diametral_pitch"),
            "both 'module' and 'diametral_pitch'",
            _ONE_PITCH,
        )
    return out


def read_drive_table(rd: FileReader, doc: dict[str, Any]) -> Drive | None:
    """``[drive]``: the driven arbor, its period and sense, or None if unusable."""
    t = rd.table(doc, "drive", required=True)
    if t is None:
        return None
    ctx = ("drive", 0, "[drive]")
    rd.unknown_keys(t, ("arbor", "period", "sense"), ctx, required=("arbor", "period"))
    arbor = rd.value(t, "arbor", "string", ctx, required=True)
    period = rd.period(t, "period", ctx, required=True)
    sense = rd.value(
        t, "sense", "string", ctx, default="ccw", check=choice("ccw", "cw")
    )
    if arbor is None or period is None:
        return None
    return Drive(
        arbor=arbor,
        period_s=period,
        sense=sense,
        where=rd.where("drive", 0, "[drive]", "arbor"),
    )


def read_arbors(rd: FileReader, doc: dict[str, Any]) -> list[Arbor]:
    """The ``[[arbor]]`` tables; counts them on the reader, broken or not."""
    out = []
    known = ("name", "at", "diameter", "around", "fixed", "carrier", "pivot")
    rd.arbor_tables = len(rd.tables(doc, "arbor"))
    for i, t in enumerate(rd.tables(doc, "arbor")):
        name, item = rd.name_of(t, "arbor", i)
        ctx = ("arbor", i, item)
        rd.unknown_keys(t, known, ctx, required=("name",))
        at = rd.pair_of_numbers(t, "at", ctx)
        diameter = rd.value(
            t, "diameter", "length", ctx, default=3.0, check=bounded_length("size")
        )
        around = rd.value(t, "around", "string", ctx)
        fixed = rd.value(t, "fixed", "bool", ctx, default=False)
        carrier = rd.value(t, "carrier", "string", ctx)
        pivot = rd.value(
            t,
            "pivot",
            "string",
            ctx,
            default="hole",
            check=choice("hole", "bush", "bearing"),
        )
        w = rd.where("arbor", i, item)
        if around is not None and carrier is not None:
            rd.problem(
                rd.where("arbor", i, item, "carrier"),
                "both 'around' and 'carrier'",
                "one of them: a sleeve follows the axis of the member it surrounds",
            )
        if around is not None and at is not None:
            rd.problem(
                rd.where("arbor", i, item, "at"),
                "both 'around' and 'at'",
                "no 'at' on a sleeve: it sits on the axis of the member it surrounds",
            )
        if carrier is not None and at is None:
            rd.problem(
                rd.where("arbor", i, item, "carrier"),
                "a carried arbor without 'at'",
                "'at = [x, y]', its position in the carrier wheel's frame (mm)",
            )
        if carrier is not None and fixed:
            rd.problem(
                rd.where("arbor", i, item, "fixed"),
                "a carried arbor that is also fixed",
                "'fixed' only on arbors held by the frame",
            )
        if pivot != "hole" and (around is not None or carrier is not None or fixed):
            rd.problem(
                rd.where("arbor", i, item, "pivot"),
                f'pivot = "{pivot}" on a sleeve, a carried or a fixed arbor',
                "'pivot' only on an arbor that turns in the plates",
            )
        if name is not None:
            out.append(Arbor(name, at, diameter, around, fixed, carrier, pivot, w))
    return out


def read_wheels(
    rd: FileReader, doc: dict[str, Any], defaults: dict[str, Any], proc: Process
) -> list[Wheel]:
    """The ``[[wheel]]`` tables, each completed from ``[defaults]`` and its tooth form."""
    out = []
    known = ("name", "arbor", "teeth", "height") + tuple(WHEEL_KEYS)
    for i, t in enumerate(rd.tables(doc, "wheel")):
        name, item = rd.name_of(t, "wheel", i)
        ctx = ("wheel", i, item)
        rd.unknown_keys(t, known, ctx, required=("name", "arbor", "teeth"))
        arbor = rd.value(t, "arbor", "string", ctx, required=True)
        teeth = rd.value(
            t,
            "teeth",
            "integer",
            ctx,
            required=True,
            check=lambda v: (
                None
                if MIN_TEETH <= v <= MAX_TEETH
                else f"a whole number from {MIN_TEETH} to {MAX_TEETH}"
            ),
        )
        height = rd.value(
            t, "height", "length", ctx, default=0.0, check=bounded_length("position")
        )
        fields: dict[str, Any] = {}
        for key, (_, kind, check) in WHEEL_KEYS.items():
            fields[_WHEEL_FIELD.get(key, key)] = rd.value(
                t, key, kind, ctx, default=defaults[key], check=check
            )
        if name is None or arbor is None or teeth is None:
            if name is not None:
                rd.broken["wheel"].add(name)
            continue
        for key, (default, _, _) in WHEEL_KEYS.items():
            field_name = _WHEEL_FIELD.get(key, key)
            if fields[field_name] is None and default is not None:
                fields[field_name] = default
        given = fields["root_radius"]
        _pitch(rd, t, fields, ctx)
        by_form = tooth_defaults(fields["form"], teeth, fields["module"], proc)
        for field_name, value in by_form.items():
            if fields[field_name] is None:
                fields[field_name] = value
        if fields["form"] == "triangular" and proc.kind == "mill":
            # The end mill leaves its own radius in the V: the root rounding may not
            # be smaller than the cutter's radius.
            least = milled_root_radius(proc, fields["module"])
            if given is not None and given < least - 1e-12:
                rd.problem(
                    rd.where("wheel", i, item, "root_radius"),
                    f"root_radius = {given:g} modules ({given * fields['module']:g} mm)",
                    f"at least the cutter radius, {least:.4g} modules ({proc.cutter / 2:g} mm), "
                    "when the process is milling",
                )
        if not _wheel_fits(rd, fields, teeth, ("wheel", i, item)):
            rd.broken["wheel"].add(name)
            continue
        out.append(
            Wheel(
                name=name,
                arbor=arbor,
                teeth=teeth,
                height=height,
                where=rd.where("wheel", i, item),
                **fields,
            )
        )
    return out


def _pitch(
    rd: FileReader, t: dict[str, Any], fields: dict[str, Any], ctx: tuple[str, int, str]
) -> None:
    """Settle a wheel's module or diametral pitch, and a DP wheel's proportions.

    The wheel's own ``module`` or ``diametral_pitch`` wins over ``[defaults]``'s.
    A diametral pitch P gives the module 25.4 / P mm and, for involute teeth, the
    inch standard's dedendum and rack tip radius where neither the wheel nor
    ``[defaults]`` sets them (:func:`~wheelgen.design.diametral_pitch.inch_rack`).
    """
    own = [k for k in ("module", "diametral_pitch") if k in t]
    if len(own) == 2:
        rd.problem(
            rd.where(*ctx, "diametral_pitch"),
            "both 'module' and 'diametral_pitch'",
            _ONE_PITCH,
        )
    if own[:1] == ["module"]:
        fields["diametral_pitch"] = None
    dp = fields["diametral_pitch"]
    if dp is None:
        return
    fields["module"] = module_of_dp(dp)
    if fields["form"] != "involute":
        return
    rack = inch_rack(dp, fields["pressure_angle_deg"])
    for key in ("dedendum", "root_radius"):
        if fields[key] is None:  # set by neither the wheel nor [defaults]
            fields[key] = getattr(rack, key)


def _wheel_fits(
    rd: FileReader, fields: dict[str, Any], teeth: int, ctx: tuple[str, int, str]
) -> bool:
    """Is the wheel, teeth included, within the ``wheel_diameter`` bound?"""
    limit = BOUNDS["wheel_diameter"]
    module = fields["module"]
    shift = max(fields["shift"], 0.0) if fields["form"] == "involute" else 0.0
    across = module * (teeth + 2 * (fields["addendum"] + shift))
    if limit.holds(across):
        return True
    rd.problem(
        rd.where(*ctx, "teeth"),
        f"teeth = {teeth} at module {module:g} mm make a wheel {across:.0f} mm across",
        f"a wheel at most {float(limit.high):g} mm across (fewer teeth or a "
        "smaller module)",
        f"Why: {limit.reason}.",
    )
    return False


def read_meshes(
    rd: FileReader, doc: dict[str, Any], defaults: dict[str, Any]
) -> list[Mesh]:
    """The ``[[mesh]]`` tables: which two wheels engage, and how."""
    out = []
    for i, t in enumerate(rd.tables(doc, "mesh")):
        item = f"the {ordinal(i + 1)} [[mesh]]"
        ctx = ("mesh", i, item)
        rd.unknown_keys(t, ("pair", "bearing", "least_play"), ctx, required=("pair",))
        pair = t.get("pair")
        if pair is None:
            rd.problem(
                rd.where("mesh", i, item, "pair"),
                "'pair' is missing",
                'two wheel names, such as pair = ["w1", "w2"]',
            )
            continue
        if (
            not isinstance(pair, list)
            or len(pair) != 2
            or not all(isinstance(p, str) for p in pair)
        ):
            rd.problem(
                rd.where("mesh", i, item, "pair"),
                f"pair = {show(pair)}",
                'two wheel names, such as pair = ["w1", "w2"]',
            )
            continue
        item = f"the {ordinal(i + 1)} [[mesh]] ({show(pair[0])}-{show(pair[1])})"
        ctx = ("mesh", i, item)
        if pair[0] == pair[1]:
            rd.problem(
                rd.where("mesh", i, item, "pair"),
                f"wheel {show(pair[0])} meshes with itself",
                "two different wheels",
            )
            continue
        bearing = rd.value(t, "bearing", "number", ctx, check=bounded("bearing"))
        least = rd.value(
            t,
            "least_play",
            "string",
            ctx,
            default=defaults.get("least_play"),
            check=choice(*LEAST_PLAY_CHOICES),
        )
        out.append(
            Mesh(
                (pair[0], pair[1]),
                bearing,
                i + 1,
                rd.where("mesh", i, item),
                least_play=None if least in (None, "none") else least,
            )
        )
    return out


def read_pinslots(rd: FileReader, doc: dict[str, Any]) -> list[PinSlot]:
    """The ``[[pinslot]]`` tables: pin-and-slot couplings between two wheels."""
    out = []
    known = (
        "name",
        "pin",
        "slot",
        "radius",
        "offset",
        "bearing",
        "pin_diameter",
        "pin_part",
    )
    for i, t in enumerate(rd.tables(doc, "pinslot")):
        name, item = rd.name_of(t, "pinslot", i)
        ctx = ("pinslot", i, item)
        rd.unknown_keys(
            t, known, ctx, required=("name", "pin", "slot", "radius", "offset")
        )
        pin = rd.value(t, "pin", "string", ctx, required=True)
        slot = rd.value(t, "slot", "string", ctx, required=True)
        radius = rd.value(
            t, "radius", "length", ctx, required=True, check=bounded_length("size")
        )
        offset = rd.value(
            t,
            "offset",
            "length",
            ctx,
            required=True,
            check=bounded_length("size_or_zero"),
        )
        bearing = rd.value(
            t, "bearing", "number", ctx, default=0.0, check=bounded("bearing")
        )
        pin_d = rd.value(
            t, "pin_diameter", "length", ctx, default=1.0, check=bounded_length("size")
        )
        part = rd.value(
            t,
            "pin_part",
            "string",
            ctx,
            default="boss",
            check=choice("boss", "separate"),
        )
        if pin is not None and pin == slot:
            rd.problem(
                rd.where("pinslot", i, item, "slot"),
                f"wheel {show(pin)} is both pin and slot",
                "two different wheels",
            )
            pin = None
        # 'name is None' spelled out so that type checkers narrow it to str below
        if name is None or None in (pin, slot, radius, offset):
            if name is not None:
                rd.broken["pinslot"].add(name)
            continue
        out.append(
            PinSlot(
                name,
                pin,
                slot,
                radius,
                offset,
                bearing,
                pin_d,
                part,
                rd.where("pinslot", i, item),
            )
        )
    return out


def read_targets(rd: FileReader, doc: dict[str, Any]) -> list[Target]:
    """The ``[[target]]`` tables: the periods or turns the train must give."""
    out = []
    for i, t in enumerate(rd.tables(doc, "target")):
        item = f"the {ordinal(i + 1)} [[target]]"
        ctx = ("target", i, item)
        rd.unknown_keys(
            t,
            ("arbor", "period", "turns", "tolerance", "sense"),
            ctx,
            required=("arbor",),
        )
        arbor = rd.value(t, "arbor", "string", ctx, required=True)
        if arbor is not None:
            item = f"the {ordinal(i + 1)} [[target]] (arbor {show(arbor)})"
            ctx = ("target", i, item)
        period = rd.period(t, "period", ctx)
        turns = _turns(rd, t, ctx)
        if ("period" in t) == ("turns" in t):
            rd.problem(
                rd.where("target", i, item, "turns" if "turns" in t else "period"),
                "both 'period' and 'turns'"
                if "period" in t
                else "neither 'period' nor 'turns'",
                "exactly one of them",
            )
        tol_ppm, tol_s = _tolerance(rd, t, ctx)
        sense = rd.value(
            t,
            "sense",
            "string",
            ctx,
            default="either",
            check=choice("cw", "ccw", "either"),
        )
        if arbor is None or (period is None and turns is None):
            continue
        out.append(
            Target(
                arbor,
                period,
                turns,
                tol_ppm,
                tol_s,
                sense,
                i + 1,
                rd.where("target", i, item),
            )
        )
    return out


def _turns(
    rd: FileReader, t: dict[str, Any], ctx: tuple[str, int, str]
) -> Fraction | None:
    """``turns``: an exact positive number of output turns per drive turn, or None."""
    if "turns" not in t:
        return None
    raw = t["turns"]
    allowed = 'a positive exact fraction such as "254/19", or a number'
    try:
        if isinstance(raw, bool) or not isinstance(raw, (str, int, float)):
            raise ValueError
        value = parse_number(str(raw))  # at most 40 characters, 1e-30 to 1e30
    except ValueError:
        rd.problem(rd.where(*ctx, "turns"), f"turns = {show(raw)}", allowed)
        return None
    if value <= 0:
        rd.problem(
            rd.where(*ctx, "turns"),
            f"turns = {show(raw)}",
            allowed + " (use 'sense' for the direction)",
        )
        return None
    if not MIN_TURNS <= value <= MAX_TURNS:
        rd.problem(
            rd.where(*ctx, "turns"),
            f"turns = {show(raw)} is out of range",
            allowed + ", from 1e-12 to 1e12",
        )
        return None
    return value


def _tolerance(
    rd: FileReader, t: dict[str, Any], ctx: tuple[str, int, str]
) -> tuple[float | None, Fraction | None]:
    """``tolerance``: (ppm, None), (None, seconds), or (None, None) when refused."""
    if "tolerance" not in t:
        return 1.0, None  # default: 1 ppm
    raw = t["tolerance"]
    allowed = (
        'a relative tolerance such as "20 ppm" (at most 1e6 ppm), or an absolute '
        'time with a unit s, min, h, d or yr, such as "30 s"'
    )
    if isinstance(raw, str):
        m = re.match(r"^\s*([0-9]*\.?[0-9]+(?:[eE][+-]?\d+)?)\s*ppm\s*$", raw)
        if m:
            ppm = float(m.group(1))
            if ppm <= 1e6:
                return ppm, None
        else:
            try:
                tol_s = parse_period(raw)
                if tol_s <= MAX_PERIOD_S:
                    return None, tol_s
            except PeriodError:
                pass
            zero = re.match(r"^\s*0+(\.0*)?\s*([a-z]+)\s*$", raw)
            if zero and zero.group(2) in UNIT_SECONDS:
                return None, Fraction(0)  # "0 s": the period must be exact
    rd.problem(rd.where(*ctx, "tolerance"), f"tolerance = {show(raw)}", allowed)
    return None, None
