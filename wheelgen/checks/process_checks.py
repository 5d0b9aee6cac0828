"""Can the chosen process make each wheel? Printing, milling and hand-filing limits.

Lengths in mm. The limits come from ``[process]``:

- print: a nozzle-wide line must fit in the tooth tip and in the root of the space
  (``nozzle``), walls and webs at least ``min_wall`` (two nozzle widths unless set), the
  face at least ``min_layers`` layers (``layer``);
- mill: the end mill (``cutter``) must reach the root of the tooth space, and fit the
  pin slots and the spoke windows;
- hand: the module must be at least ``min_module_hand``.

Tooth widths are measured on the generated outline, so they hold for any tooth form.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from functools import lru_cache

import numpy as np

from ..design.model import Design, Process, Wheel
from ..design.process_limits import wall_floor, wall_minimum
from ..findings import Change, Finding, Level
from ..layout.placement import tooth_spec
from ..layout.sleeves import size_sleeves, wheel_bore
from ..layout.wheel_profile import seat_extent
from ..teeth.forms import outline_for
from ..teeth.limits import short_of
from ..teeth.outline import WheelOutline
from ..teeth.spec import ToothSpec
from .mesh_sim import ToothTable, tooth_table

__all__ = [
    "tooth_width_at",
    "space_width_at",
    "cutter_depth_lost",
    "check_process",
    "check_cutter_fits",
    "design_process_checks",
]

_CHORD_TOL = 1e-4  # mm; widths are wanted to a micrometre or so


@lru_cache(maxsize=256)
def _table(outline: WheelOutline) -> ToothTable:
    # outlines compare by identity and outline_for hands out one per spec: a large
    # train's repeated wheels are tabulated once
    return tooth_table(outline, _CHORD_TOL, grid=2048)


def tooth_width_at(outline: WheelOutline, radius: float) -> float:
    """Arc width (mm) of one tooth at ``radius`` mm; 0 above the tip."""
    t = _table(outline)
    return _tooth_width(t, radius)


def _tooth_width(t: ToothTable, radius: float) -> float:
    if radius > t.r_max:
        return 0.0
    if radius < t.r_min:
        return 2 * math.pi * radius / round(2 * math.pi / t.pitch_rad)
    up = float(np.interp(radius, t.radius, t.upper_rad))
    dn = float(np.interp(radius, t.radius, t.lower_rad))
    if math.isnan(up) or math.isnan(dn):
        return 0.0
    return max(0.0, radius * (up + dn))


def space_width_at(outline: WheelOutline, radius: float) -> float:
    """Arc width (mm) of one tooth space at ``radius`` mm; 0 below the root."""
    t = _table(outline)
    return _space_width(t, radius)


def _space_width(t: ToothTable, radius: float) -> float:
    if radius < t.r_min:
        return 0.0
    return max(0.0, radius * t.pitch_rad - _tooth_width(t, radius))


@lru_cache(maxsize=256)
def cutter_depth_lost(outline: WheelOutline, cutter: float) -> float:
    """How far (mm) above the root circle an end mill of diameter ``cutter`` stops.

    The mill is fed down the middle of a tooth space (its axis parallel to the wheel's)
    until it touches the flanks; 0 when it reaches the root circle. ``inf`` if it does
    not fit between the tips at all.
    """
    if cutter <= 0:
        raise ValueError(f"'cutter' must be > 0 mm, got {cutter}")
    rho = cutter / 2
    pts = outline.tooth_polyline(_CHORD_TOL)
    z = outline.teeth
    pitch = 2 * math.pi / z
    # the space between this tooth and the next: both flanks in play
    c, s = math.cos(pitch), math.sin(pitch)
    nxt = pts @ np.array([[c, s], [-s, c]])
    chain = np.vstack((pts, nxt))
    seg_a, seg_d = chain[:-1], np.diff(chain, axis=0)
    seg_dd = np.maximum(np.einsum("ij,ij->i", seg_d, seg_d), 1e-300)
    r_all = np.hypot(chain[:, 0], chain[:, 1])
    r_root, r_tip = float(r_all.min()), float(r_all.max())
    bis = np.array([math.cos(pitch / 2), math.sin(pitch / 2)])

    def clear(rc: float) -> bool:
        # exact distance from the mill's centre to every segment of the two flanks
        q = rc * bis - seg_a
        t = np.clip(np.einsum("ij,ij->i", q, seg_d) / seg_dd, 0.0, 1.0)
        d = np.hypot(*(q - t[:, None] * seg_d).T)
        return bool(d.min() >= rho * (1 - 1e-12))

    lo_rc, hi_rc = r_root + rho, r_tip + rho
    if clear(lo_rc):
        return 0.0
    if not clear(hi_rc):
        return math.inf
    for _ in range(60):
        mid = 0.5 * (lo_rc + hi_rc)
        if clear(mid):
            hi_rc = mid
        else:
            lo_rc = mid
    return max(0.0, hi_rc - rho - r_root)


def _mm(value: float) -> str:
    return f"{value:.3f} mm"


def check_cutter_fits(
    cutter: float, width: float, subject: str, what: str
) -> list[Finding]:
    """An error if an end mill of diameter ``cutter`` mm is wider than ``width`` mm."""
    if not short_of(width, cutter):
        return []
    # the next size down in 0.05 mm steps (end mills are sold so; common practice)
    smaller = math.floor(width * 20 + 1e-9) / 20
    changes = (Change("process", "", "cutter", smaller),) if smaller > 0 else ()
    use = f"set {changes[0]}" if changes else "use a smaller end mill"
    return [
        Finding(
            "error",
            "process.cutter_fit",
            subject,
            f"{subject}: the {cutter:g} mm end mill is wider than the {what}",
            measured=f"{what} {_mm(width)}",
            limit=f"end mill {cutter:g} mm",
            advice=f"{use}, or widen the {what}",
            changes=changes,
        )
    ]


def check_process(
    spec: ToothSpec,
    process: Process,
    subject: str,
    *,
    face_width: float | None = None,
    web: float | None = None,
    rim: float | None = None,
    outline: WheelOutline | None = None,
) -> list[Finding]:
    """Process checks on one wheel.

    Parameters
    ----------
    spec
        The wheel's teeth.
    process
        How it is made and the limits (``[process]``).
    subject
        Names the wheel in the findings (``"wheel w3"``).
    face_width
        Axial thickness of the toothed rim, mm (print: layers).
    web
        Radial width of solid material between the bore and the root circle, mm.
    rim
        Radial width of the rim below the root circle of a spoked wheel, mm.
    outline
        The wheel's outline if already built.
    """
    out: list[Finding] = []
    kind = process.kind
    m = spec.module
    if kind == "hand":
        limit = float(getattr(process, "min_module_hand", 0.5))
        if m < limit:
            out.append(
                Finding(
                    "error",
                    "process.hand_module",
                    subject,
                    f"{subject}: teeth of module {m:g} are too small to file by hand",
                    measured=f"module {m:g} mm",
                    limit=f"module {limit:g} mm",
                    advice="use a larger module, or make this wheel by milling "
                    '(process = "mill") or set [process] min_module_hand',
                )
            )
    wall = wall_minimum(process)
    floor = wall_floor(process)
    for what, value in (("web", web), ("rim", rim)):
        if value is not None and short_of(value, wall):
            # below what the process can make at all it is an error
            too_thin: Level = (
                "error" if value <= 0 or short_of(value, floor) else "warning"
            )
            cure = (
                "a wider 'rim'"
                if what == "rim"
                else "a thinner arbor or sleeve under it, more teeth or a larger module"
            )
            out.append(
                Finding(
                    too_thin,
                    "process.wall",
                    subject,
                    f"{subject}: the {what} below the teeth is thinner than the "
                    "process makes reliably",
                    measured=f"{what} {_mm(value)}",
                    limit=_mm(wall),
                    advice=f"make the {what} thicker: {cure}",
                )
            )
    if kind not in ("print", "mill"):
        return out
    shape = outline if outline is not None else outline_for(spec)
    table = _table(shape)
    if kind == "print":
        nozzle = process.nozzle
        r_tip, r_root = table.r_max, table.r_min
        tip = _tooth_width(table, r_tip - nozzle / 2)
        if short_of(tip, nozzle):
            out.append(
                Finding(
                    "error",
                    "process.tip_width",
                    subject,
                    f"{subject}: half a nozzle below the tip the teeth are narrower "
                    "than one printed line; the tips will be lost",
                    measured=_mm(tip),
                    limit=f"nozzle {nozzle:g} mm",
                    advice="use a larger module or a finer nozzle",
                )
            )
        gap = _space_width(table, r_root + nozzle / 2)
        if short_of(gap, nozzle):
            out.append(
                Finding(
                    "error",
                    "process.root_gap",
                    subject,
                    f"{subject}: half a nozzle above the root the tooth spaces are "
                    "narrower than one printed line; they will fill up",
                    measured=_mm(gap),
                    limit=f"nozzle {nozzle:g} mm",
                    advice="use a larger module or a finer nozzle",
                )
            )
        if face_width is not None:
            need = process.min_layers * process.layer
            layers = Change("wheel", subject.split()[-1], "face_width", need)
            if short_of(face_width, need):
                out.append(
                    Finding(
                        "error",
                        "process.face_layers",
                        subject,
                        f"{subject}: the face is only {face_width / process.layer:.1f} "
                        "layers thick",
                        measured=f"face width {_mm(face_width)}",
                        limit=f"{process.min_layers} layers of {process.layer:g} mm",
                        advice=f"set {layers}",
                        changes=(layers,),
                    )
                )
    else:
        lost = cutter_depth_lost(shape, process.cutter)
        # the mate's tip needs the standard clearance (dedendum - addendum) m; a mill
        # that stops higher than that leaves material the mate's tips will hit
        allowance = (spec.dedendum - spec.addendum) * m
        # below 1 % of the module the loss is the polyline's own chord error
        if lost > 0.01 * m:
            level: Level = "error" if lost > allowance else "warning"
            stop = (
                "does not fit between the teeth at all"
                if math.isinf(lost)
                else (f"stops {_mm(lost)} above the root circle")
            )
            out.append(
                Finding(
                    level,
                    "process.cutter_root",
                    subject,
                    f"{subject}: the {process.cutter:g} mm end mill {stop}",
                    measured="no fit"
                    if math.isinf(lost)
                    else f"{_mm(lost)} left at the root",
                    limit=f"{_mm(allowance)} (clearance for the mate's tips)",
                    advice="use a smaller end mill or a larger module",
                )
            )
    return out


def design_process_checks(
    design: Design, bores: Mapping[str, float] | None = None
) -> list[Finding]:
    """Process checks on every wheel and pin slot of ``design``, and on ``[process]``.

    ``bores`` maps wheel names to bore diameters (mm); by default each wheel's bore is
    the one the parts get (:func:`wheelgen.layout.sleeves.wheel_bore`).
    """
    process = design.process
    out: list[Finding] = _min_wall_findings(process)
    sizes = size_sleeves(design)
    for wheel in design.wheels:
        subject = f"wheel {wheel.name}"
        try:
            spec = tooth_spec(wheel)
            shape = outline_for(spec) if process.kind in ("print", "mill") else None
        except ValueError:
            continue  # reported by the wheel checks (wheel.teeth)
        if bores is not None and wheel.name in bores:
            bore = bores[wheel.name]
        else:
            bore = wheel_bore(design, sizes, wheel).diameter
        web, rim = _web_and_rim(wheel, spec, bore)
        out += check_process(
            spec,
            process,
            subject,
            face_width=wheel.face_width,
            web=web,
            rim=rim,
            outline=shape,
        )
        if process.kind == "mill" and wheel.spokes and wheel.rim is not None:
            root = wheel.module * (wheel.teeth / 2 + wheel.shift - wheel.dedendum)
            hub = max(wheel.hub_diameter / 2, seat_extent(wheel.seat, bore))
            hub += wall_minimum(process)
            window = root - wheel.rim - hub
            out += check_cutter_fits(
                process.cutter, window, subject, "spoke windows (radial room)"
            )
    if process.kind == "mill":
        for link in design.pinslots:
            out += check_cutter_fits(
                process.cutter, link.pin_diameter, f"coupling {link.name}", "pin slot"
            )
    return out


def _min_wall_findings(process: Process) -> list[Finding]:
    """``process.min_wall``: a ``min_wall`` the process cannot make (print: two lines)."""
    floor = wall_floor(process)
    if process.min_wall is None or not short_of(process.min_wall, floor):
        return []
    return [
        Finding(
            "error",
            "process.min_wall",
            "[process]",
            f"[process] min_wall = {process.min_wall:g} mm is thinner than a printer "
            f"can make a wall: two lines of the {process.nozzle:g} mm nozzle side by "
            f"side; parts are sized to {floor:g} mm",
            measured=_mm(process.min_wall),
            limit=f"{_mm(floor)} (2 x nozzle)",
            advice=f"set {Change('process', '', 'min_wall', floor)}, or leave it out",
            changes=(Change("process", "", "min_wall", floor),),
        )
    ]


def _web_and_rim(
    wheel: Wheel, spec: ToothSpec, bore: float
) -> tuple[float | None, float | None]:
    root = spec.module * (spec.teeth / 2 + spec.shift - spec.dedendum)
    if wheel.spokes:
        return None, wheel.rim
    return root - seat_extent(wheel.seat, bore), None
