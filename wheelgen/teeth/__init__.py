"""Tooth outlines and gear data, pure numbers (numpy arrays in mm, angles in degrees).

Never imports the CAD kernel: solids are built from these outlines elsewhere.
"""

from .drawing import outline_svg as outline_svg
from .forms import outline_for as outline_for
from .gear_data import GearData as GearData
from .gear_data import gear_data as gear_data
from .involute import inverse_involute_deg as inverse_involute_deg
from .involute import involute_function as involute_function
from .involute_tooth import involute_outline as involute_outline
from .measure import measure_span as measure_span
from .mesh_data import MeshData as MeshData
from .mesh_data import mesh_data as mesh_data
from .mesh_data import shift_for_centre_distance as shift_for_centre_distance
from .outline import Segment as Segment
from .outline import WheelOutline as WheelOutline
from .rack import ISO_53_A as ISO_53_A
from .rack import BasicRack as BasicRack
from .spec import ToothSpec as ToothSpec
from .triangular import min_root_radius_for_cutter as min_root_radius_for_cutter
from .triangular import triangular_outline as triangular_outline
from .triangular_data import TriangularData as TriangularData
from .triangular_data import triangular_data as triangular_data

__all__ = [
    "ISO_53_A",
    "BasicRack",
    "GearData",
    "MeshData",
    "Segment",
    "ToothSpec",
    "TriangularData",
    "WheelOutline",
    "gear_data",
    "inverse_involute_deg",
    "involute_function",
    "involute_outline",
    "measure_span",
    "mesh_data",
    "min_root_radius_for_cutter",
    "outline_for",
    "outline_svg",
    "shift_for_centre_distance",
    "triangular_outline",
    "triangular_data",
]
