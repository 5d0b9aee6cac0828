"""Checks before export: one findings model, one engine, many checks."""

from ..findings import Finding as Finding
from ..findings import findings_table as findings_table
from ..findings import has_errors as has_errors
from .engine import Analysis as Analysis
from .engine import analyse as analyse
from .engine import run_checks as run_checks

__all__ = [
    "Analysis",
    "analyse",
    "run_checks",
    "Finding",
    "findings_table",
    "has_errors",
]
