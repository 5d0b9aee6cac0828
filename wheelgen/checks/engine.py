"""Run every check on a design and gather the findings in one list.

Each check is a function ``(design, analysis) -> list[Finding]`` registered in
:func:`design_checks`; :func:`analyse` runs them all, after the exact kinematics.
Adding a check: write the function in its own module under ``wheelgen/checks`` (or in
the layer whose numbers it checks, taking only what it needs) and add it to the tuple
:func:`design_checks` returns. Nothing here imports the CAD kernel.
"""

from __future__ import annotations

from dataclasses import replace

from ..design.model import Design
from ..display.checks import display_findings
from ..findings import Finding, sort_findings
from ..frame.checks import frame_findings
from ..kinematics.rates import solve_rates
from ..kinematics.targets import evaluate_targets
from .analysis import Analysis, DesignCheck
from .bed_check import bed_findings
from .changes import apply_changes
from .layout_checks import layout_findings
from .mesh_checks import design_mesh_checks
from .pinslot_checks import pinslot_findings
from .process_checks import design_process_checks
from .train import train_findings

__all__ = [
    "Analysis",
    "analyse",
    "run_checks",
    "design_checks",
    "DesignCheck",
    "gather_consequences",
]


def _train(design: Design, analysis: Analysis) -> list[Finding]:
    return train_findings(design, analysis.solution, analysis.targets)


def _meshes(design: Design, analysis: Analysis) -> list[Finding]:
    return design_mesh_checks(design)


def _process(design: Design, analysis: Analysis) -> list[Finding]:
    return design_process_checks(design)


def _frame(design: Design, analysis: Analysis) -> list[Finding]:
    return frame_findings(design)


def _display(design: Design, analysis: Analysis) -> list[Finding]:
    return display_findings(design)


def design_checks() -> tuple[DesignCheck, ...]:
    """Every registered check, in the order they run."""
    return (
        _train,
        _meshes,
        _process,
        layout_findings,
        pinslot_findings,
        _frame,
        _display,
        bed_findings,
    )


#: Most causes whose consequences are worked out (each costs one more run of the
#: checks on the design as the cause's change would leave it).
MAX_CAUSES = 8


def _run(design: Design) -> Analysis:
    solution = solve_rates(design)
    targets = evaluate_targets(design, solution)
    base = Analysis(design, solution, targets)
    findings: list[Finding] = []
    for check in design_checks():
        findings.extend(check(design, base))
    return Analysis(design, solution, targets, findings)


def _key(f: Finding) -> tuple[str, str]:
    return (f.check, f.subject)


def gather_consequences(design: Design, findings: list[Finding]) -> list[Finding]:
    """Put each finding under the error that brings it: one cause first.

    A cause is an error whose ``changes`` put it right (a misplaced arbor, plates in
    the wrong place). The checks are run again on the design as those changes leave
    it; every other finding that is gone then is a consequence of the cause, listed
    under it instead of beside it. A cause whose change does not clear it stays as it
    is.
    """
    causes = [f for f in findings if f.level == "error" and f.changes][:MAX_CAUSES]
    taken: set[int] = set()
    grouped: dict[int, Finding] = {}
    for cause in causes:
        if id(cause) in taken:
            continue
        try:
            fixed = apply_changes(design, cause.changes)
            after = {_key(f) for f in _run(fixed).findings}
        except ValueError:
            continue
        if _key(cause) in after:
            continue
        brought = [
            f
            for f in findings
            if f is not cause and id(f) not in taken and _key(f) not in after
        ]
        if not brought:
            continue
        taken.update(id(f) for f in brought)
        grouped[id(cause)] = replace(
            cause, consequences=cause.consequences + tuple(sort_findings(brought))
        )
    return [grouped.get(id(f), f) for f in findings if id(f) not in taken]


def analyse(design: Design) -> Analysis:
    """Solve the train and run every registered check, worst findings first, each
    consequence under its cause.

    ``least_play`` requests are settled first (:func:`wheelgen.checks.least_play.
    settle_play`); ``Analysis.design`` is the design as checked.
    """
    from .least_play import settle_play

    design = settle_play(design)
    run = _run(design)
    findings = gather_consequences(design, run.findings)
    return Analysis(design, run.solution, run.targets, sort_findings(findings))


def run_checks(design: Design) -> list[Finding]:
    """Every finding for the design (errors first)."""
    return analyse(design).findings
