"""Exact kinematics: rates as fractions of the drive, targets, and tooth-count search."""

from .rates import TrainSolution as TrainSolution
from .rates import solve_rates as solve_rates
from .targets import TargetResult as TargetResult
from .targets import evaluate_targets as evaluate_targets

__all__ = ["TrainSolution", "solve_rates", "TargetResult", "evaluate_targets"]
