"""wheelgen: gear trains to checked, makeable parts.

The numeric layers (design, kinematics, teeth, layout, checks, workshop) never import
the CAD kernel; only ``wheelgen.solids`` and ``wheelgen.export`` do, so ``import
wheelgen`` stays light. The names below are the main entry points of the numeric
layers; see docs/library.md for building solids from a script.
"""

from .checks.engine import Analysis as Analysis
from .checks.engine import analyse as analyse
from .checks.engine import run_checks as run_checks
from .checks.least_play import settle_play as settle_play
from .design import Design as Design
from .design import DesignError as DesignError
from .design import load_design as load_design
from .design import loads_design as loads_design
from .findings import Finding as Finding
from .kinematics.rates import solve_rates as solve_rates
from .kinematics.targets import evaluate_targets as evaluate_targets
from .parts import plan_parts as plan_parts
from .teeth.forms import outline_for as outline_for
from .teeth.gear_data import gear_data as gear_data
from .teeth.mesh_data import mesh_data as mesh_data
from .teeth.spec import ToothSpec as ToothSpec
from .teeth.triangular_data import triangular_data as triangular_data
from .version import __version__ as __version__
from .workshop.indexing import indexing_plan as indexing_plan

__all__ = [
    "__version__",
    "Analysis",
    "analyse",
    "run_checks",
    "Finding",
    "settle_play",
    "Design",
    "DesignError",
    "load_design",
    "loads_design",
    "solve_rates",
    "evaluate_targets",
    "plan_parts",
    "gear_data",
    "mesh_data",
    "ToothSpec",
    "outline_for",
    "triangular_data",
    "indexing_plan",
]
