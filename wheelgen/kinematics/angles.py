"""The angle of every arbor over time, uneven motion of pin-and-slot couplings included.

The train's relations are linear in the arbors' angles, just as in
:mod:`wheelgen.kinematics.rates`, except that a pin-and-slot coupling ``k`` adds

    theta_slot - theta_pin = delta_k,

where ``delta_k`` is the coupling's deviation (see :mod:`.pinslot_motion`), a nonlinear
function of the driving wheel's angle relative to the frame that holds both axes. We
solve the linear system exactly over the rationals with the drive's angle ``T`` and each
``delta_k`` as symbols on the right-hand side (:mod:`.linear`, the same exact solver
as the rates'), so every arbor's angle is

    theta_a = rate_a * T + sum_k c_ak * delta_k          (rate_a, c_ak exact Fractions).

``rate_a`` is the exact mean rate of the kinematics; ``c_ak`` is the signed ratio of the
meshes between the coupling and the arbor. Each ``delta_k`` is then evaluated, upstream
couplings first, from the angle of the coupling's driving side (the pin wheel, or the slot
wheel when that one is driven from the drive side).

Conventions: degrees, counter-clockwise seen from the front, cumulative (not wrapped), in
the fixed frame. At ``t = 0`` every arbor is at 0 and every coupling at rest (pin and
slot on the offset line), so a coupling contributes no deviation there. Time in seconds;
the drive turns once per ``design.drive.period_s`` in its ``sense``.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from fractions import Fraction

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..design.model import Design, PinSlot
from .linear import ExactSystem, Row, minus
from .pinslot_motion import (
    check_offset,
    deviation_from_pin_deg,
    deviation_from_slot_deg,
)
from .rates import mesh_frame

__all__ = [
    "CouplingPlan",
    "AngleModel",
    "angle_model",
    "drive_angle_deg",
    "arbor_angles",
    "arbor_deviations",
    "coupling_deviations",
]

FloatArray = NDArray[np.float64]

_DRIVE = "<drive>"  # the symbol of the drive's angle; no design name contains '<'


@dataclass(frozen=True, slots=True)
class CouplingPlan:
    """How one coupling's deviation is evaluated.

    ``driver`` is ``"pin"`` or ``"slot"``: the side whose angle is known first. Its angle
    relative to ``frame`` (an arbor, or ``None`` for the fixed frame) is
    ``rate * T + sum(depends[j] * delta_j)``, ``rate`` in turns per drive turn.
    """

    pinslot: PinSlot
    driver: str
    frame: str | None
    rate: Fraction
    depends: tuple[tuple[str, Fraction], ...]


@dataclass(frozen=True, slots=True)
class AngleModel:
    """Exact linear form of every driven arbor's angle.

    ``rates[a]`` in turns per drive turn (the kinematics' mean rate), ``terms[a]`` the
    coefficients of the coupling deviations, ``couplings`` in evaluation order.
    Arbors that nothing drives are left out.
    """

    rates: dict[str, Fraction]
    terms: dict[str, dict[str, Fraction]]
    couplings: tuple[CouplingPlan, ...]

    def uneven(self) -> tuple[str, ...]:
        """Arbors whose angle carries a coupling's deviation, in design order."""
        return tuple(
            a for a, t in self.terms.items() if any(c != 0 for c in t.values())
        )

    def cycle_turns(self, coupling: str) -> Fraction | None:
        """Drive turns for one full cycle of the coupling's deviation (``None``: still)."""
        for c in self.couplings:
            if c.pinslot.name == coupling:
                return None if c.rate == 0 else 1 / abs(c.rate)
        raise KeyError(coupling)


@dataclass
class _Equation:
    coeffs: dict[str, Fraction]  # over arbors
    rhs: dict[str, Fraction]  # over symbols: the drive angle and the deviations
    label: str


def _equations(design: Design) -> list[_Equation]:
    one = Fraction(1)
    rows = [_Equation({design.drive.arbor: one}, {_DRIVE: one}, "the drive")]
    for a in design.arbors:
        if a.fixed:
            rows.append(_Equation({a.name: one}, {}, f'fixed arbor "{a.name}"'))
    for m in design.meshes:
        wa, wb = design.wheel(m.pair[0]), design.wheel(m.pair[1])
        ok, frame = mesh_frame(design, wa.arbor, wb.arbor)
        if not ok:
            continue  # reported by the kinematics as a mesh whose axes move apart
        # Willis: z_a (theta_A - theta_F) + z_b (theta_B - theta_F) = 0; the constant
        # is zero because every angle is counted from the rest position at t = 0.
        coeffs: dict[str, Fraction] = {}
        for arbor, z in ((wa.arbor, wa.teeth), (wb.arbor, wb.teeth)):
            coeffs[arbor] = coeffs.get(arbor, Fraction(0)) + z
        if frame is not None:
            coeffs[frame] = coeffs.get(frame, Fraction(0)) - (wa.teeth + wb.teeth)
        rows.append(_Equation({k: v for k, v in coeffs.items() if v}, {}, m.label))
    for p in design.pinslots:
        pa, sa = design.wheel(p.pin).arbor, design.wheel(p.slot).arbor
        rows.append(
            _Equation({sa: one, pa: -one}, {p.name: one}, f'pin-and-slot "{p.name}"')
        )
    return rows


def _solve(design: Design) -> dict[str, Row]:
    """Reduced row echelon form, one row per pivot arbor (exact, :mod:`.linear`)."""
    system = ExactSystem()
    for i, eq in enumerate(_equations(design)):
        if system.add(eq.coeffs, eq.rhs, i) is not None:
            raise ValueError(
                f"{eq.label} contradicts the rest of the train: its angles cannot "
                "all be met, so the train locks (see 'wheelgen check')"
            )
    return system.rows


def angle_model(design: Design) -> AngleModel:
    """Solve the train's angle relations exactly (see the module docstring).

    Raises ``ValueError`` when a coupling's offset is not below its radius, when its axes
    share no frame in which both stand still, or when couplings depend on each other in
    a loop.
    """
    rows = _solve(design)
    rates: dict[str, Fraction] = {}
    terms: dict[str, dict[str, Fraction]] = {}
    names = {p.name for p in design.pinslots}
    for a in design.arbors:
        row = rows.get(a.name)
        if row is None or len(row.coeffs) != 1:
            continue  # not driven: free to turn
        rates[a.name] = row.rhs.get(_DRIVE, Fraction(0))
        terms[a.name] = {k: v for k, v in row.rhs.items() if k in names}

    def linear(arbor: str | None) -> tuple[Fraction, dict[str, Fraction]] | None:
        if arbor is None:
            return Fraction(0), {}
        if arbor not in rates:
            return None
        return rates[arbor], terms[arbor]

    pending: list[CouplingPlan] = []
    for p in design.pinslots:
        check_offset(p.radius, p.offset)
        pa, sa = design.wheel(p.pin).arbor, design.wheel(p.slot).arbor
        ok, frame = mesh_frame(design, pa, sa)
        if not ok:
            raise ValueError(
                f'pin-and-slot "{p.name}": the axes of arbors "{pa}" and "{sa}" move '
                "against each other; the coupling needs both in one frame"
            )
        f, pin, slot = linear(frame), linear(pa), linear(sa)
        if f is None or pin is None or slot is None:
            continue  # an undriven part of the train: nothing to evaluate
        if f[1].get(p.name, 0) == 0 and pin[1].get(p.name, 0) == 0:
            driver, side = "pin", pin
        elif f[1].get(p.name, 0) == 0 and slot[1].get(p.name, 0) == 0:
            driver, side = "slot", slot
        else:
            raise ValueError(
                f'pin-and-slot "{p.name}": neither wheel is driven independently of '
                "the coupling itself; cannot follow its motion"
            )
        depends = minus(side[1], f[1], Fraction(1))
        pending.append(
            CouplingPlan(p, driver, frame, side[0] - f[0], tuple(depends.items()))
        )

    ordered: list[CouplingPlan] = []
    done: set[str] = set()
    while pending:
        ready = [c for c in pending if all(k in done for k, _ in c.depends)]
        if not ready:
            loop = ", ".join(f'"{c.pinslot.name}"' for c in pending)
            raise ValueError(
                f"pin-and-slot couplings {loop} drive each other in a loop"
            )
        for c in ready:
            ordered.append(c)
            done.add(c.pinslot.name)
            pending.remove(c)
    # Arbors whose angle involves a coupling we could not evaluate are not driven.
    for arbor_name in list(rates):
        if any(k not in done and v != 0 for k, v in terms[arbor_name].items()):
            del rates[arbor_name], terms[arbor_name]
    return AngleModel(rates, terms, tuple(ordered))


def drive_angle_deg(design: Design, times_s: ArrayLike) -> FloatArray:
    """The drive arbor's angle (degrees, counter-clockwise positive) at ``times_s``."""
    t = np.asarray(times_s, dtype=float)
    sign = 1.0 if design.drive.sense == "ccw" else -1.0
    return sign * 360.0 * t / float(design.drive.period_s)


def _evaluate(model: AngleModel, drive_deg: FloatArray) -> dict[str, FloatArray]:
    deltas: dict[str, FloatArray] = {}
    for c in model.couplings:
        arg = float(c.rate) * drive_deg
        for k, v in c.depends:
            arg = arg + float(v) * deltas[k]
        p = c.pinslot
        if c.driver == "pin":
            deltas[p.name] = deviation_from_pin_deg(arg, p.radius, p.offset)
        else:
            deltas[p.name] = deviation_from_slot_deg(arg, p.radius, p.offset)
    return deltas


def coupling_deviations(
    design: Design, times_s: ArrayLike, model: AngleModel | None = None
) -> dict[str, FloatArray]:
    """Each coupling's deviation ``theta_slot - theta_pin`` (degrees) at ``times_s``."""
    model = angle_model(design) if model is None else model
    return _evaluate(model, drive_angle_deg(design, times_s))


def arbor_deviations(
    design: Design,
    times_s: ArrayLike,
    model: AngleModel | None = None,
    arbors: Iterable[str] | None = None,
) -> dict[str, FloatArray]:
    """Each driven arbor's angle minus its uniform angle (degrees) at ``times_s``.

    Positive is counter-clockwise; an arbor turning clockwise leads when negative.
    ``arbors`` limits the result to those names (driven ones only); a train of
    thousands of arbors need not hold all of them at every time.
    """
    model = angle_model(design) if model is None else model
    drive = drive_angle_deg(design, times_s)
    deltas = _evaluate(model, drive)
    out: dict[str, FloatArray] = {}
    wanted = None if arbors is None else set(arbors)
    for a, t in model.terms.items():
        if wanted is not None and a not in wanted:
            continue
        dev = np.zeros_like(drive)
        for k, v in t.items():
            dev = dev + float(v) * deltas[k]
        out[a] = dev
    return out


def arbor_angles(
    design: Design,
    times_s: ArrayLike,
    model: AngleModel | None = None,
    arbors: Iterable[str] | None = None,
) -> dict[str, FloatArray]:
    """Angle of every driven arbor (or of ``arbors``) at ``times_s`` (seconds from rest).

    Returns degrees, cumulative, counter-clockwise seen from the front, in the fixed
    frame: the exact mean rate times the drive's angle plus the propagated deviations of
    the pin-and-slot couplings. Arbors that nothing drives are left out.
    """
    model = angle_model(design) if model is None else model
    drive = drive_angle_deg(design, times_s)
    devs = arbor_deviations(design, times_s, model, arbors)
    return {a: float(r) * drive + devs[a] for a, r in model.rates.items() if a in devs}
