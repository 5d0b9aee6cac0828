"""Train checks: locked paths, undriven arbors, meshes that cannot stay in mesh, targets."""

from __future__ import annotations

from ..design.model import Design
from ..design.periods import format_period
from ..findings import Finding
from ..kinematics.rates import TrainSolution
from ..kinematics.targets import TargetResult

__all__ = ["train_findings"]


def train_findings(
    design: Design, solution: TrainSolution, targets: list[TargetResult]
) -> list[Finding]:
    out: list[Finding] = []
    for c in solution.conflicts:
        out.append(
            Finding(
                "error",
                "train.locked",
                f"arbor {c.arbor}",
                c.message(),
                measured=f"{c.rate_one} vs {c.rate_two} turns per drive turn",
                advice="remove one of the two paths, or change tooth counts so both give the same rate",
            )
        )
    for label in solution.bad_meshes:
        out.append(
            Finding(
                "error",
                "train.mesh_axes",
                label,
                f"{label}: the two axes move against each other (one rides on a carrier, "
                "the other is neither on that carrier nor on its axis), so the wheels cannot stay in mesh",
                advice="mesh a carried arbor only with arbors on the same carrier or on the carrier's own axis",
            )
        )
    driven_by_nothing = []
    for name in solution.undriven:
        driven_by_nothing.append(name)
        out.append(
            Finding(
                "error",
                "train.undriven",
                f"arbor {name}",
                f'arbor "{name}" is not driven: no chain of meshes, couplings or fixed arbors '
                f'links it to the drive arbor "{design.drive.arbor}", so its rate is not determined',
                advice="add a [[mesh]] or [[pinslot]] that connects it to the train, or mark it fixed",
            )
        )
    for r in targets:
        subject = f"arbor {r.arbor}"
        if r.got_s is None:
            if r.arbor not in driven_by_nothing:
                out.append(
                    Finding(
                        "error",
                        "target.missed",
                        subject,
                        f'arbor "{r.arbor}" does not turn, so it cannot have a period of {format_period(r.wanted_s or 0)}',
                    )
                )
            continue
        if not r.sense_ok:
            out.append(
                Finding(
                    "error",
                    "target.sense",
                    subject,
                    f'arbor "{r.arbor}" turns the wrong way: the target asks for {r.target.sense}',
                    advice="add an idler wheel in one mesh to reverse it, or change the target's sense",
                )
            )
        if not r.met and r.sense_ok:
            tol = (
                f"{format_period(r.target.tolerance_s)}"
                if r.target.tolerance_s is not None
                else f"{r.target.tolerance_ppm:g} ppm"
            )
            out.append(
                Finding(
                    "error",
                    "target.missed",
                    subject,
                    f'arbor "{r.arbor}" turns once in {format_period(r.got_s, 9)}, the target is '
                    f"{format_period(r.wanted_s or 0, 9)}: off by {r.error_ppm:+.3f} ppm, "
                    f"{r.drift_deg_per_year:+.4f} degrees a year",
                    measured=f"{r.error_ppm:+.3f} ppm",
                    limit=tol,
                    advice="choose other tooth counts (wheelgen ratio finds them) or widen the tolerance",
                )
            )
    return out
