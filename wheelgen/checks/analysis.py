"""What the checks work from and what they found: one design's :class:`Analysis`.

A leaf of the checks package: every check module may import it, and the engine imports
the check modules.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

from ..design.model import Design
from ..findings import Finding
from ..kinematics.rates import TrainSolution
from ..kinematics.targets import TargetResult

__all__ = ["Analysis", "DesignCheck"]


@dataclass(frozen=True)
class Analysis:
    """Everything the checks found: exact rates, target verdicts and findings."""

    design: Design
    solution: TrainSolution
    targets: list[TargetResult]
    findings: list[Finding] = field(default_factory=list)


#: A check: the design and its analysis (rates and targets) in, findings out.
DesignCheck = Callable[[Design, Analysis], list[Finding]]
