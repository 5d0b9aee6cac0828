"""Meshes for printing: binary STL and 3MF (millimetres), the same bytes on each run.

The solid is meshed once with an absolute chord tolerance (mm) and the triangles are
read straight from OCC's per-face triangulations, welded on exactly equal vertices
(OCC writes the nodes of an edge shared by two faces identically), then written by
our own small writers: that keeps the STL header, the 3MF XML and the zip entries free
of dates and counters.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

import cadquery as cq
import numpy as np
from OCP.BRep import BRep_Builder, BRep_Tool
from OCP.BRepAdaptor import BRepAdaptor_Curve, BRepAdaptor_Surface
from OCP.BRepLProp import BRepLProp_SLProps
from OCP.BRepMesh import BRepMesh_IncrementalMesh
from OCP.BRepTools import BRepTools
from OCP.GeomAbs import (
    GeomAbs_Cylinder,
    GeomAbs_Line,
    GeomAbs_Plane,
    GeomAbs_SurfaceOfExtrusion,
)
from OCP.gp import gp_Dir
from OCP.IMeshTools import IMeshTools_Parameters
from OCP.TopAbs import TopAbs_EDGE, TopAbs_FACE, TopAbs_REVERSED
from OCP.TopExp import TopExp, TopExp_Explorer
from OCP.TopLoc import TopLoc_Location
from OCP.TopoDS import TopoDS, TopoDS_Compound, TopoDS_Edge, TopoDS_Face, TopoDS_Shape
from OCP.TopTools import TopTools_IndexedMapOfShape

from .formats import MESH_TOLERANCE
from .mesh_files import STL_DTYPE, read_stl, write_3mf_objects

__all__ = ["TriangleMesh", "mesh_shape", "read_stl", "write_3mf", "write_stl"]


@dataclass(frozen=True, slots=True, eq=False)
class TriangleMesh:
    """Welded mesh: ``vertices`` (n, 3) in mm, ``triangles`` (m, 3), counter-clockwise
    seen from outside."""

    vertices: np.ndarray
    triangles: np.ndarray


def _params(
    tolerance: float, angular_deg: float, interior: bool
) -> IMeshTools_Parameters:
    prm = IMeshTools_Parameters()
    prm.Deflection = tolerance
    prm.Angle = math.radians(angular_deg)
    prm.Relative = False
    prm.InParallel = True
    if not interior:
        # every face we make is a plane, a cylinder or a prism side: none needs nodes
        # inside, and the ones the mesher adds to prism sides are thrown away anyway
        prm.InternalVerticesMode = False
        prm.ControlSurfaceDeflection = False
        prm.DeflectionInterior = max(1.0, 100 * tolerance)
        prm.AngleInterior = 1.0
    return prm


def _face_triangles(face: TopoDS_Face) -> tuple[np.ndarray, np.ndarray]:
    loc = TopLoc_Location()
    tri = BRep_Tool.Triangulation_s(face, loc)
    if tri is None:
        raise _NotMeshed()
    trsf = loc.Transformation()
    n_nodes = tri.NbNodes()
    nodes = np.empty((n_nodes, 3))
    for i in range(1, n_nodes + 1):
        p = tri.Node(i).Transformed(trsf)
        nodes[i - 1] = (p.X(), p.Y(), p.Z())
    idx = np.array([tri.Triangle(i).Get() for i in range(1, tri.NbTriangles() + 1)])
    idx = idx.astype(np.int64).reshape(-1, 3) - 1
    if face.Orientation() == TopAbs_REVERSED:
        idx = idx[:, [0, 2, 1]]
    return nodes, idx


class _NotMeshed(Exception):
    """A face the fast route cannot handle: mesh the whole shape the ordinary way."""


def _edge_polyline(edge: TopoDS_Edge, owner: TopoDS_Face) -> np.ndarray:
    """Nodes (mm) of ``edge`` as meshed on the face ``owner``, in edge order."""
    loc = TopLoc_Location()
    tri = BRep_Tool.Triangulation_s(owner, loc)
    poly = None if tri is None else BRep_Tool.PolygonOnTriangulation_s(edge, tri, loc)
    if poly is None:
        raise _NotMeshed()
    trsf = loc.Transformation()
    pts = np.empty((poly.NbNodes(), 3))
    for k in range(1, poly.NbNodes() + 1):
        q = tri.Node(poly.Node(k)).Transformed(trsf)
        pts[k - 1] = (q.X(), q.Y(), q.Z())
    return pts


def _ruling_direction(face: TopoDS_Face) -> gp_Dir | None:
    """The straight direction of a prism side or a cylinder, else None."""
    adaptor = BRepAdaptor_Surface(face)
    kind = adaptor.GetType()
    if kind == GeomAbs_SurfaceOfExtrusion:
        return adaptor.Direction()
    if kind == GeomAbs_Cylinder:
        return adaptor.Cylinder().Axis().Direction()
    return None


def _is_ruling(edge: TopoDS_Edge, direction: gp_Dir) -> bool:
    curve = BRepAdaptor_Curve(edge)
    return bool(
        curve.GetType() == GeomAbs_Line
        and abs(abs(curve.Line().Direction().Dot(direction)) - 1) < 1e-9
    )


def _arc_fractions(p: np.ndarray) -> np.ndarray:
    d = np.concatenate(([0.0], np.cumsum(np.linalg.norm(np.diff(p, axis=0), axis=1))))
    return d / d[-1] if d[-1] > 0 else d


def _strip(
    face: TopoDS_Face, a: np.ndarray, b: np.ndarray, direction: gp_Dir
) -> tuple[np.ndarray, np.ndarray]:
    """Triangles of a ruled side (prism side, cylinder) between its two curved edges.

    The side is straight along ``direction``, so a strip between the two curves' nodes
    (those of the neighbouring faces) is exact along it and watertight with them.
    """
    d = np.array([direction.X(), direction.Y(), direction.Z()])
    # run both curves the same way: their first nodes lie on one ruling
    off = b[0] - a[0]
    if np.linalg.norm(off - (off @ d) * d) > 1e-6 * max(
        1.0, float(np.linalg.norm(off))
    ):
        b = b[::-1]
    fa, fb = _arc_fractions(a), _arc_fractions(b)
    n = len(a)
    tris = []
    i = j = 0
    while i < n - 1 or j < len(b) - 1:
        if j == len(b) - 1 or (i < n - 1 and fa[i + 1] <= fb[j + 1]):
            tris.append((i, i + 1, n + j))
            i += 1
        else:
            tris.append((i, n + j + 1, n + j))
            j += 1
    nodes = np.vstack((a, b))
    t = np.array(tris, dtype=np.int64)
    # orient outward: compare with the face normal, which knows the face's orientation
    adaptor = BRepAdaptor_Surface(face)
    u = (adaptor.FirstUParameter() + adaptor.LastUParameter()) / 2
    v = (adaptor.FirstVParameter() + adaptor.LastVParameter()) / 2
    props = BRepLProp_SLProps(adaptor, u, v, 1, 1e-9)
    if not props.IsNormalDefined():
        raise _NotMeshed()
    normal = props.Normal()
    if face.Orientation() == TopAbs_REVERSED:
        normal.Reverse()
    pnt = props.Value()
    centre = np.array([pnt.X(), pnt.Y(), pnt.Z()])
    cr = np.cross(nodes[t[:, 1]] - nodes[t[:, 0]], nodes[t[:, 2]] - nodes[t[:, 0]])
    area = np.linalg.norm(cr, axis=1)
    dist = np.linalg.norm(nodes[t].mean(axis=1) - centre, axis=1) - 1e3 * (area > 1e-12)
    k = int(np.argmin(dist))
    if float(cr[k] @ np.array([normal.X(), normal.Y(), normal.Z()])) < 0:
        t = t[:, [0, 2, 1]]
    return nodes, t


def _weld(points: list[np.ndarray], tris: list[np.ndarray]) -> TriangleMesh:
    offsets = np.cumsum([0] + [len(p) for p in points[:-1]])
    allv = np.vstack(points)
    allf = np.vstack([t + o for t, o in zip(tris, offsets)])
    unique, inverse = np.unique(allv, axis=0, return_inverse=True)
    faces = inverse.reshape(-1)[allf]
    # drop triangles that welding made degenerate (a seam node met its twin)
    keep = (
        (faces[:, 0] != faces[:, 1])
        & (faces[:, 1] != faces[:, 2])
        & (faces[:, 0] != faces[:, 2])
    )
    return TriangleMesh(unique, faces[keep])


def _faces(shape: TopoDS_Shape) -> list[TopoDS_Face]:
    out = []
    explorer = TopExp_Explorer(shape, TopAbs_FACE)
    while explorer.More():
        out.append(TopoDS.Face_s(explorer.Current()))
        explorer.Next()
    return out


def _fast_mesh(
    shape: TopoDS_Shape, tolerance: float, angular_deg: float
) -> TriangleMesh:
    faces = _faces(shape)
    edge_map = TopTools_IndexedMapOfShape()
    TopExp.MapShapes_s(shape, TopAbs_EDGE, edge_map)
    # per face: its ruling direction (None: not a ruled side) and its curved edges
    info: list[tuple[gp_Dir | None, list[tuple[int, TopoDS_Edge]]]] = []
    owners: dict[int, list[int]] = {}
    for fi, face in enumerate(faces):
        direction = _ruling_direction(face)
        curved = []
        explorer = TopExp_Explorer(face, TopAbs_EDGE)
        while explorer.More():
            edge = TopoDS.Edge_s(explorer.Current())
            explorer.Next()
            ei = edge_map.FindIndex(edge)
            owners.setdefault(ei, []).append(fi)
            if direction is None or not _is_ruling(edge, direction):
                curved.append((ei, edge))
        info.append((direction, curved))
    strip = [d is not None and len(c) == 2 for d, c in info]
    # a strip takes its curves' nodes from a neighbour meshed by OCC: demote strips
    # whose curve borders only other strips, until nothing changes
    changed = True
    while changed:
        changed = False
        for fi, (_direction, curved) in enumerate(info):
            if strip[fi] and not all(
                any(not strip[o] for o in owners[ei] if o != fi) for ei, _ in curved
            ):
                strip[fi] = False
                changed = True
    # planes need no inner nodes (and the mesher is slow adding them to big caps);
    # curved faces that are not strips (a cylinder with a cross hole) do
    builder = BRep_Builder()
    planes, others = TopoDS_Compound(), TopoDS_Compound()
    builder.MakeCompound(planes)
    builder.MakeCompound(others)
    for face, is_strip in zip(faces, strip):
        if not is_strip:
            plane = BRepAdaptor_Surface(face).GetType() == GeomAbs_Plane
            builder.Add(planes if plane else others, face)
    BRepMesh_IncrementalMesh(planes, _params(tolerance, angular_deg, False))
    BRepMesh_IncrementalMesh(others, _params(tolerance, angular_deg, True))
    points, tris = [], []
    for fi, face in enumerate(faces):
        if not strip[fi]:
            v, t = _face_triangles(face)
        else:
            direction, curved = info[fi]
            polylines = []
            for ei, edge in curved:
                owner = next(o for o in owners[ei] if o != fi and not strip[o])
                polylines.append(_edge_polyline(edge, faces[owner]))
            assert direction is not None
            v, t = _strip(face, polylines[0], polylines[1], direction)
        points.append(v)
        tris.append(t)
    return _weld(points, tris)


def mesh_shape(
    shape: cq.Shape, tolerance: float = MESH_TOLERANCE, angular_deg: float = 30.0
) -> TriangleMesh:
    """Mesh ``shape`` so that no chord strays more than ``tolerance`` mm from it.

    ``angular_deg`` bounds the turn between neighbouring facets (degrees). Prism sides
    (the tooth flanks) are meshed as strips between the caps' edge nodes: OCC would
    fill each spline side with a grid of about 100 triangles, 10x the mesh and time.
    """
    if tolerance <= 0:
        raise ValueError(f"'tolerance' must be > 0 mm, got {tolerance}")
    # the triangulation is cached inside the shape: drop any older, coarser one
    BRepTools.Clean_s(shape.wrapped)
    try:
        return _fast_mesh(shape.wrapped, tolerance, angular_deg)
    except _NotMeshed:
        BRepTools.Clean_s(shape.wrapped)
        BRepMesh_IncrementalMesh(shape.wrapped, _params(tolerance, angular_deg, True))
        pairs = [_face_triangles(f) for f in _faces(shape.wrapped)]
        return _weld([p for p, _ in pairs], [t for _, t in pairs])


def _normals(v: np.ndarray, f: np.ndarray) -> np.ndarray:
    n = np.cross(v[f[:, 1]] - v[f[:, 0]], v[f[:, 2]] - v[f[:, 0]])
    length = np.linalg.norm(n, axis=1, keepdims=True)
    unit: np.ndarray = np.divide(n, length, out=np.zeros_like(n), where=length > 0)
    return unit


def write_stl(mesh: TriangleMesh, path: Path, name: str) -> Path:
    """Binary STL in mm; the 80-byte header names the part and the unit."""
    header = f"wheelgen {name} mm".encode("ascii", "replace")[:80].ljust(80, b" ")
    rec = np.zeros(len(mesh.triangles), dtype=STL_DTYPE)
    rec["n"] = _normals(mesh.vertices, mesh.triangles)
    rec["v"] = mesh.vertices[mesh.triangles]
    with open(path, "wb") as fh:
        fh.write(header)
        fh.write(np.uint32(len(rec)).tobytes())
        fh.write(rec.tobytes())
    return path


def write_3mf(mesh: TriangleMesh, path: Path, name: str) -> Path:
    """A 3MF package in millimetres; fixed zip dates: equal meshes, equal bytes."""
    return write_3mf_objects(path, name, [(name, mesh.vertices, mesh.triangles)])
