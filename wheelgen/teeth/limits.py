"""The limits every command judges teeth by, and the verdicts on one wheel's teeth.

One home for each number: ``wheelgen gear`` (the data sheet), ``wheelgen check`` and
the build all import these, so a wheel gets the same verdict from each of them. Lengths
in mm; coefficients marked "x module" are multiples of the module.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

from .involute_tooth import generate_tooth
from .spec import ToothSpec
from .triangular import triangular_tooth

__all__ = [
    "CONTACT_RATIO_ERROR",
    "CONTACT_RATIO_WARNING",
    "LIMIT_SLACK",
    "MIN_CLEARANCE",
    "MIN_TIP_THICKNESS",
    "ToothVerdict",
    "VerdictLevel",
    "short_of",
    "shift_to_avoid_undercut",
    "tip_thickness",
    "tooth_verdicts",
]

#: Smallest tooth thickness at the tip, x module, before a warning (common practice,
#: no source: 0.2 to 0.4 m is the usual lower limit for hardened to soft wheels; model
#: wheels in brass or plastic take the middle of that range).
MIN_TIP_THICKNESS = 0.25
#: Smallest tip-root clearance, x module, before a warning (common practice, no
#: source; ISO 53 gives 0.25 m for the basic rack).
MIN_CLEARANCE = 0.1
#: Transverse contact ratio below which a pair is refused / warned about (common
#: practice, no source: below 1 a tooth lets go before the next one takes over).
CONTACT_RATIO_ERROR = 1.0
CONTACT_RATIO_WARNING = 1.2
#: mm: a value within this of its limit counts as meeting it. Values are worked out
#: in floating point from numbers given to a micrometre at best, so 0.0999999999 mm of
#: backlash against a limit of 0.1 mm is the limit itself.
LIMIT_SLACK = 1e-6

VerdictLevel = Literal["error", "warning", "note"]


def short_of(value: float, limit: float, slack: float = LIMIT_SLACK) -> bool:
    """Does ``value`` fall short of the lower ``limit``? A value equal to it passes."""
    return value < limit - slack


@dataclass(frozen=True, slots=True)
class ToothVerdict:
    """One thing wrong with one wheel's teeth, worded without the wheel's name.

    ``check`` is the id the check engine reports it under (``"wheel.pointed_tip"``);
    ``shift`` is the profile shift that cures an undercut (``None`` otherwise).
    """

    check: str
    level: VerdictLevel
    message: str
    measured: str
    limit: str
    shift: float | None = None


def tip_thickness(spec: ToothSpec) -> float:
    """Arc thickness (mm) of a tooth on its tip circle; 0 when the flanks meet in a point.

    Involute: ``s_a = 2 r_a psi_a`` with ``psi_a`` half the angular thickness at the
    tip (ISO 21771:2007, tooth thickness at any circle). Triangular: the chord of the
    tip flat (or of the rounding's ends).
    """
    if spec.form == "involute":
        gen = generate_tooth(spec)
        if gen.pointed:
            return 0.0
        return 2 * gen.tip_radius * gen.half_angle_at(gen.tip_radius)
    tooth = triangular_tooth(spec)
    if tooth.pointed:
        return 0.0
    return 2 * tooth.tip_radius * math.sin(tooth.tip_flat_half_rad)


def shift_to_avoid_undercut(spec: ToothSpec) -> float:
    """Smallest profile shift (to 0.05, rounded up) at which the rack leaves no undercut.

    ``x_min = h - z sin^2(a) / 2`` for a rack whose straight flank reaches ``h`` modules
    below the datum line (SDP/SI D785 section 4.3, "undercut"); for ISO 53 type A
    (dedendum 1.25 m, fillet 0.38 m) ``h`` is 1.0 m.
    """
    alpha = math.radians(spec.pressure_angle_deg)
    h_flank = spec.dedendum - spec.root_radius * (1 - math.sin(alpha))
    x_min = h_flank - spec.teeth * math.sin(alpha) ** 2 / 2
    return math.ceil(x_min * 20 - 1e-9) / 20


def tooth_verdicts(spec: ToothSpec) -> tuple[ToothVerdict, ...]:
    """What is wrong with one wheel's teeth: pointed or thin tips, undercut (involute).

    Triangular teeth are judged by their pairs (the mesh simulator) and by the process
    checks; a triangle that ends in a point below its tip circle is only noted.
    """
    if spec.form != "involute":
        tooth = triangular_tooth(spec)
        if not tooth.pointed:
            return ()
        return (
            ToothVerdict(
                "wheel.pointed_tip",
                "note",
                f"pointed teeth: the flanks meet at {2 * tooth.apex_radius:.4f} mm, "
                "inside the tip circle",
                "tip thickness 0 mm",
                "a tip flat or rounding",
            ),
        )
    gen = generate_tooth(spec)
    m = spec.module
    out: list[ToothVerdict] = []
    need = MIN_TIP_THICKNESS * m
    if gen.pointed:
        out.append(
            ToothVerdict(
                "wheel.pointed_tip",
                "error",
                f"pointed teeth: the flanks meet at {2 * gen.tip_radius:.4f} mm, below "
                f"the tip circle {2 * gen.blank_tip_radius:.4f} mm",
                "tip thickness 0 mm",
                f"{need:.3f} mm ({MIN_TIP_THICKNESS} x module)",
            )
        )
    else:
        s_a = tip_thickness(spec)
        if short_of(s_a, need):
            out.append(
                ToothVerdict(
                    "wheel.pointed_tip",
                    "warning",
                    f"nearly pointed teeth: tip thickness {s_a:.4f} mm is under "
                    f"{MIN_TIP_THICKNESS} x module",
                    f"tip thickness {s_a:.3f} mm",
                    f"{need:.3f} mm ({MIN_TIP_THICKNESS} x module)",
                )
            )
    if gen.undercut:
        x_min = shift_to_avoid_undercut(spec)
        out.append(
            ToothVerdict(
                "wheel.undercut",
                "warning",
                f"undercut: the root fillet cuts the involute up to "
                f"{2 * gen.form_radius:.4f} mm (base circle {2 * gen.base_radius:.4f} "
                "mm), which weakens the teeth and shortens the working flank",
                f"form circle {2 * gen.form_radius:.3f} mm dia., base circle "
                f"{2 * gen.base_radius:.3f} mm",
                f"no undercut from shift {x_min:+.2f}",
                shift=x_min,
            )
        )
    return tuple(out)
