"""The designs that ship inside the package: the demo, found with ``importlib.resources``.

The demo lives in ``wheelgen/designs/`` and is installed with the package, so a command
given no design file checks or builds it from an installed wheel as well as from a clone.
"""

from __future__ import annotations

import atexit
from contextlib import ExitStack
from functools import cache
from importlib.resources import as_file, files
from pathlib import Path

__all__ = ["DEMO_NAME", "demo_path"]

#: The bundled demo's file name (its design is named after it).
DEMO_NAME = "harbour_tide_clock.toml"

# Where a resource needs a real file (a package run from a zip archive), the file is
# kept until the interpreter ends.
_KEPT = ExitStack()
atexit.register(_KEPT.close)


@cache
def demo_path() -> Path:
    """The bundled demo's train file, as a file on disk."""
    resource = files("wheelgen").joinpath("designs", DEMO_NAME)
    return Path(_KEPT.enter_context(as_file(resource)))
