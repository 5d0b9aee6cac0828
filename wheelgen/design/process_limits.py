"""What each workshop process can make, and the defaults that follow from it (mm).

One home for every process-dependent number: the loader takes its defaults from here,
and the checks, the layout and the parts take their limits from here. Each function
takes the ``[process]`` table (:class:`~wheelgen.design.model.Process`) and returns the
value that applies: the one the file sets, else the process's default.

The bases:

- **walls** (sleeve walls, webs, rims, the metal round a hole): a printed wall needs
  at least two nozzle lines side by side, one each way round the perimeter (common
  practice, no source: slicers lay a wall as perimeters of one nozzle width); milled
  and filed walls 0.3 mm unless set (common practice, no source). A ``min_wall`` below
  two nozzle lines cannot be printed at all: :func:`wall_floor` is that hard floor.
- **backlash**: the least play a mesh holds without binding, and the default play
  asked of every wheel (common practice, no source): printed teeth swell by about
  half a line width and need 0.1 mm or more; milled teeth 0.02 mm; filed teeth
  0.05 mm. Each default is at least the minimum, so a design that leaves backlash
  out passes its own process's check.
- **centre tolerance**: how far two placed axes may stand from the working centre
  distance (common practice, no source): what each process holds when it places a
  hole (a printer about a quarter of a line, 0.1 mm; a mill with a readout 0.02 mm;
  drilling to a marked-out plate 0.05 mm).
"""

from __future__ import annotations

from .model import Process

__all__ = [
    "CENTRE_TOLERANCE",
    "DEFAULT_BACKLASH",
    "MIN_BACKLASH",
    "WALL_DEFAULT",
    "centre_tolerance",
    "default_backlash",
    "min_backlash",
    "wall_floor",
    "wall_minimum",
]

#: mm of backlash each process holds in a mesh without binding (see the module text).
MIN_BACKLASH = {"print": 0.1, "mill": 0.02, "hand": 0.05}
#: mm of backlash asked of each wheel when neither the wheel nor ``[defaults]`` sets it.
DEFAULT_BACKLASH = {"print": 0.15, "mill": 0.05, "hand": 0.1}
#: mm two placed axes may stand off the working centre distance (see the module text).
CENTRE_TOLERANCE = {"print": 0.1, "mill": 0.02, "hand": 0.05}
#: mm, thinnest wall of a milled or filed part unless ``min_wall`` is set.
WALL_DEFAULT = 0.3
#: Nozzle lines side by side in the thinnest printed wall.
PRINT_WALL_LINES = 2


def min_backlash(process: Process) -> float:
    """Least backlash (mm) a mesh may have: ``min_backlash`` or the process's own."""
    if process.min_backlash is not None:
        return float(process.min_backlash)
    return MIN_BACKLASH[process.kind]


def default_backlash(process: Process) -> float:
    """Backlash (mm) asked of a wheel that does not set it: never below the minimum."""
    return max(DEFAULT_BACKLASH[process.kind], min_backlash(process))


def centre_tolerance(process: Process) -> float:
    """How far (mm) placed axes may stand off the working centre distance."""
    if process.centre_tolerance is not None:
        return float(process.centre_tolerance)
    return CENTRE_TOLERANCE[process.kind]


def wall_floor(process: Process) -> float:
    """The thinnest wall (mm) the process can make at all: two nozzle lines in print.

    Milled and filed walls have no floor below the one the file sets (0: any).
    """
    return PRINT_WALL_LINES * process.nozzle if process.kind == "print" else 0.0


def wall_minimum(process: Process) -> float:
    """Thinnest wall (mm) every part is sized to and checked against.

    ``min_wall`` when set, else two nozzle lines (print) or :data:`WALL_DEFAULT`; never
    below :func:`wall_floor` (a ``min_wall`` under it is reported by the process check
    ``process.min_wall`` and the parts keep to the floor).
    """
    if process.min_wall is not None:
        return max(float(process.min_wall), wall_floor(process))
    return wall_floor(process) if process.kind == "print" else WALL_DEFAULT
