"""Read DXF files back with two independent readers and measure them against a profile.

ezdxf evaluates each entity from what the file holds (a spline from its control
points and knots, an arc from centre, radius and angles); FreeCAD's DXF importer
(``freecadcmd``, when installed) is a second reader written by other people, run in
its own process. Both return, per layer, each entity's length and points along it,
which are then measured against the exact loops of the profile.
"""

from __future__ import annotations

import json
import math
import shutil
import subprocess
import textwrap
from pathlib import Path

import ezdxf
import numpy as np
from scipy.spatial import cKDTree

from wheelgen.export.dxf import HOLE_LAYERS

#: Step (mm) between the points taken along each read-back entity.
STEP = 0.02

Sampled = dict[str, list[tuple[float, np.ndarray]]]  # layer -> [(length, points)]


def _along(points: np.ndarray) -> float:
    return float(np.hypot(*np.diff(points, axis=0).T).sum())


def read_with_ezdxf(path: Path) -> Sampled:
    """Every entity's length and points (mm), per layer, as ezdxf evaluates them."""
    out: Sampled = {}
    for e in ezdxf.readfile(path).modelspace():
        kind = e.dxftype()
        if kind == "LINE":
            fine = np.array([e.dxf.start, e.dxf.end])[:, :2]
        elif kind in ("ARC", "CIRCLE"):
            fine = np.array([tuple(v)[:2] for v in e.flattening(1e-6)])
        elif kind == "SPLINE":
            # from the control points and knots alone (not the fit points)
            curve = e.construction_tool()
            u = np.linspace(0.0, curve.max_t, 401)
            fine = np.array([tuple(v)[:2] for v in curve.points(u)])
        else:
            raise AssertionError(f"unexpected {kind} in {path.name}")
        length = _along(fine)
        count = max(9, math.ceil(length / STEP) + 1)
        s = np.concatenate(([0.0], np.cumsum(np.hypot(*np.diff(fine, axis=0).T))))
        even = np.linspace(0.0, s[-1], count)
        pts = np.column_stack([np.interp(even, s, fine[:, k]) for k in (0, 1)])
        out.setdefault(e.dxf.layer, []).append((length, pts))
    return out


_FREECAD = textwrap.dedent(
    """
    import json
    import FreeCAD, Import
    FreeCAD.ParamGet("User parameter:BaseApp/Preferences/Mod/Draft").SetBool(
        "groupLayers", True)   # one object per layer, labelled with the layer name
    paths, out, step = {paths!r}, {out!r}, {step!r}
    result = {{}}
    for n, path in enumerate(paths):
        doc = FreeCAD.newDocument("r%d" % n)
        Import.readDXF(path, doc.Name, True)
        layers = {{}}
        for obj in doc.Objects:
            for edge in obj.Shape.Edges:
                count = max(9, int(edge.Length / step) + 2)
                pts = [(v.x, v.y) for v in edge.discretize(Number=count)]
                layers.setdefault(obj.Label, []).append((edge.Length, pts))
        result[path] = layers
        FreeCAD.closeDocument(doc.Name)
    with open(out, "w") as fh:
        json.dump(result, fh)
    """
)


def freecad_available() -> bool:
    return shutil.which("freecadcmd") is not None


def read_with_freecad(paths: list[Path], work: Path) -> dict[Path, Sampled]:
    """Every edge's length and points (mm), per layer, as FreeCAD imports each file."""
    out = work / "freecad.json"
    script = work / "read_dxf.py"
    script.write_text(
        _FREECAD.format(paths=[str(p) for p in paths], out=str(out), step=STEP)
    )
    done = subprocess.run(
        ["freecadcmd", str(script)], capture_output=True, text=True, timeout=900
    )
    # judge by the result file: the program's exit status after a script varies
    assert out.is_file(), done.stdout[-2000:] + done.stderr[-2000:]
    raw = json.loads(out.read_text())
    return {
        Path(p): {
            layer: [(float(length), np.array(pts)) for length, pts in edges]
            for layer, edges in layers.items()
        }
        for p, layers in raw.items()
    }


def exact_loops(profile, chord: float = 1e-5) -> dict[str, list[np.ndarray]]:
    """The profile's closed loops per DXF layer, as polylines within ``chord`` mm.

    Each loop's first point is not repeated at its end; the loops are closed.
    """
    loops: dict[str, list[np.ndarray]] = {"OUTLINE": [profile.outline.polyline(chord)]}
    for hole in profile.holes:
        layer = HOLE_LAYERS.get(hole.role, "HOLES")
        loops.setdefault(layer, []).append(hole.polyline(chord))
    return loops


def distance_to_loops(
    points: np.ndarray, loops: list[np.ndarray], closed: bool = True
) -> np.ndarray:
    """Distance (mm) of each point from the nearest of the polylines ``loops``.

    ``closed``: each polyline runs on from its last point back to its first.
    """
    poly = np.vstack(loops)
    # the vertex after and before each vertex (itself at an open end)
    after = np.arange(1, len(poly) + 1)
    before = np.arange(-1, len(poly) - 1)
    start = 0
    for loop in loops:
        end = start + len(loop) - 1
        after[end], before[start] = (start, end) if closed else (end, start)
        start += len(loop)
    # the segments at the three nearest vertices: a vertex shared by two polylines
    # (where one entity ends and the next begins) is there twice
    _, near = cKDTree(poly).query(points, k=min(3, len(poly)))
    near = near.reshape(len(points), -1)
    best = np.full(len(points), np.inf)
    for i in near.T:
        for j0, j1 in ((before[i], i), (i, after[i])):
            a, b = poly[j0], poly[j1]
            ab = b - a
            s = np.clip(
                ((points - a) * ab).sum(1) / np.maximum((ab**2).sum(1), 1e-300), 0, 1
            )
            best = np.minimum(best, np.hypot(*(a + s[:, None] * ab - points).T))
    return best


def loop_length(loops: list[np.ndarray]) -> float:
    """Length (mm) of the closed polylines ``loops``."""
    return sum(_along(np.vstack((p, p[:1]))) for p in loops)
