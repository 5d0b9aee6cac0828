"""The train definition: parse and check a TOML train file into frozen dataclasses."""

from .bundled import demo_path as demo_path
from .errors import DesignError as DesignError
from .errors import Problem as Problem
from .loader import load_design as load_design
from .loader import loads_design as loads_design
from .model import Arbor as Arbor
from .model import Design as Design
from .model import Dial as Dial
from .model import Display as Display
from .model import Drive as Drive
from .model import DriveInput as DriveInput
from .model import Frame as Frame
from .model import Hand as Hand
from .model import Mesh as Mesh
from .model import PinSlot as PinSlot
from .model import Process as Process
from .model import Stock as Stock
from .model import Target as Target
from .model import Wheel as Wheel
from .model import Where as Where
from .periods import format_period as format_period
from .periods import parse_period as parse_period

__all__ = [
    "demo_path",
    "DesignError",
    "Problem",
    "load_design",
    "loads_design",
    "Arbor",
    "Design",
    "Dial",
    "Display",
    "Drive",
    "DriveInput",
    "Frame",
    "Hand",
    "Mesh",
    "PinSlot",
    "Process",
    "Stock",
    "Target",
    "Wheel",
    "Where",
    "format_period",
    "parse_period",
]
