"""wheelgen: gear trains to checked, makeable parts.

The numeric layers (design, kinematics, teeth, layout, checks, workshop) never import
the CAD kernel; only ``wheelgen.solids`` and ``wheelgen.export`` do, so ``import
wheelgen`` stays light. The names below are the main entry points of the numeric
layers; see docs/library.md for building solids from a script.
"""

__version__ = "0.1.0"

from .checks.engine import Analysis as Analysis  # noqa: E402  (after __version__)
from .checks.engine import analyse as analyse  # noqa: E402
from .checks.engine import run_checks as run_checks  # noqa: E402
from .checks.least_play import settle_play as settle_play  # noqa: E402
from .design import Design as Design  # noqa: E402
from .design import DesignError as DesignError  # noqa: E402
from .design import load_design as load_design  # noqa: E402
from .design import loads_design as loads_design  # noqa: E402
from .findings import Finding as Finding  # noqa: E402
from .kinematics.rates import solve_rates as solve_rates  # noqa: E402
from .kinematics.targets import evaluate_targets as evaluate_targets  # noqa: E402
from .parts import plan_parts as plan_parts  # noqa: E402
from .teeth.forms import outline_for as outline_for  # noqa: E402
from .teeth.gear_data import gear_data as gear_data  # noqa: E402
from .teeth.mesh_data import mesh_data as mesh_data  # noqa: E402
from .teeth.spec import ToothSpec as ToothSpec  # noqa: E402
from .teeth.triangular_data import triangular_data as triangular_data  # noqa: E402
from .workshop.indexing import indexing_plan as indexing_plan  # noqa: E402

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
