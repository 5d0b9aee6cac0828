"""Read an assembly STEP back with the CAD kernel and measure what its solids share.

Used by every test that asks "do the parts of ``assembly.step`` keep out of each
other?". The file is read as a user's CAD program would read it (names, placements),
each solid is put where the assembly puts it, and the common volume of every pair whose
bounding boxes meet is computed with the kernel's boolean ``Common``.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

__all__ = ["PlacedSolid", "placed_solids", "shared_volumes"]


@dataclass(frozen=True)
class PlacedSolid:
    """One solid of the assembly, in assembly coordinates (mm)."""

    name: str
    shape: object  # OCP TopoDS_Shape
    box: tuple[float, float, float, float, float, float]  # x0 y0 z0 x1 y1 z1
    volume: float  # mm3


def _label_name(label) -> str:  # noqa: ANN001 - an OCP TDF_Label
    from OCP.TDataStd import TDataStd_Name

    attr = TDataStd_Name()
    if label.FindAttribute(TDataStd_Name.GetID_s(), attr):
        return attr.Get().ToExtString()
    return ""


def placed_solids(path: Path) -> list[PlacedSolid]:
    """Every solid of the STEP assembly at ``path``, named by its part, placed."""
    from OCP.Bnd import Bnd_Box
    from OCP.BRepBndLib import BRepBndLib
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps
    from OCP.STEPCAFControl import STEPCAFControl_Reader
    from OCP.TCollection import TCollection_ExtendedString
    from OCP.TDF import TDF_Label, TDF_LabelSequence
    from OCP.TDocStd import TDocStd_Document
    from OCP.TopAbs import TopAbs_SOLID
    from OCP.TopExp import TopExp_Explorer
    from OCP.XCAFDoc import XCAFDoc_DocumentTool

    doc = TDocStd_Document(TCollection_ExtendedString("assembly-under-test"))
    reader = STEPCAFControl_Reader()
    reader.SetNameMode(True)
    if reader.ReadFile(str(path)) != 1:  # IFSelect_RetDone
        raise OSError(f"{path}: the STEP reader refused the file")
    reader.Transfer(doc)
    shapes = XCAFDoc_DocumentTool.ShapeTool_s(doc.Main())

    found: list[tuple[str, object]] = []
    # The free shape is the top assembly; its components are references to parts,
    # and GetShape of a component returns the part already moved to its place.
    stack: list[object] = []
    free = TDF_LabelSequence()
    shapes.GetFreeShapes(free)
    stack.extend(free.Value(i) for i in range(1, free.Length() + 1))
    while stack:
        label = stack.pop()
        if shapes.IsAssembly_s(label):
            children = TDF_LabelSequence()
            shapes.GetComponents_s(label, children)
            stack.extend(children.Value(i) for i in range(1, children.Length() + 1))
            continue
        name = _label_name(label)
        if shapes.IsReference_s(label):
            target = TDF_Label()
            shapes.GetReferredShape_s(label, target)
            name = name or _label_name(target)
            if shapes.IsAssembly_s(target):
                stack.append(target)
                continue
        explorer = TopExp_Explorer(shapes.GetShape_s(label), TopAbs_SOLID)
        while explorer.More():
            found.append((name, explorer.Current()))
            explorer.Next()

    out = []
    for name, shape in sorted(found, key=lambda item: item[0]):
        box = Bnd_Box()
        BRepBndLib.Add_s(shape, box)
        props = GProp_GProps()
        BRepGProp.VolumeProperties_s(shape, props)
        out.append(PlacedSolid(name, shape, tuple(box.Get()), props.Mass()))
    return out


def _boxes_meet(a: PlacedSolid, b: PlacedSolid, gap: float = 1e-6) -> bool:
    return all(
        a.box[k] <= b.box[k + 3] + gap and b.box[k] <= a.box[k + 3] + gap
        for k in range(3)
    )


def shared_volumes(
    path: Path,
    threshold: float = 1e-3,
    only: Callable[[str, str], bool] | None = None,
) -> list[tuple[str, str, float]]:
    """Pairs of solids of the assembly at ``path`` that share more than ``threshold`` mm3.

    Returns ``(name_a, name_b, shared volume in mm3)`` sorted by name; a boolean the
    kernel cannot finish is reported with volume ``-1`` (a test must not pass it).
    ``only(name_a, name_b)``, when given, picks the pairs to measure (the rest are
    skipped, which is quicker).
    """
    from OCP.BRepAlgoAPI import BRepAlgoAPI_Common
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps

    solids = placed_solids(path)
    pairs = []
    for i, a in enumerate(solids):
        for b in solids[i + 1 :]:
            if not _boxes_meet(a, b) or (only is not None and not only(a.name, b.name)):
                continue
            common = BRepAlgoAPI_Common(a.shape, b.shape)
            if not common.IsDone():
                pairs.append((a.name, b.name, -1.0))
                continue
            props = GProp_GProps()
            BRepGProp.VolumeProperties_s(common.Shape(), props)
            if props.Mass() > threshold:
                pairs.append((a.name, b.name, props.Mass()))
    return pairs
