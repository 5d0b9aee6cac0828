"""STL and 3MF files measured with numpy: closed, manifold, close to the exact outline."""

from __future__ import annotations

import math
import sys
import xml.etree.ElementTree as ET
import zipfile
from pathlib import Path

import numpy as np
import pytest

cq = pytest.importorskip("cadquery")

sys.path.insert(0, str(Path(__file__).parent))
from _solids_helpers import involute_half_angle, involute_outline  # noqa: E402

from wheelgen.export.mesh import mesh_shape, read_stl, write_3mf, write_stl  # noqa: E402
from wheelgen.layout.part_kinds import (  # noqa: E402
    ArborPart,
    PinBoss,
    SleevePart,
    WheelPart,
)
from wheelgen.solids.part import make_part  # noqa: E402
from wheelgen.solids.wheel import make_wheel  # noqa: E402
from wheelgen.teeth.spec import ToothSpec  # noqa: E402

pytestmark = pytest.mark.cad

FACE = 3.0
BORE = 4.0


def edge_manifold_closed(tris: np.ndarray) -> bool:
    """Every directed edge used once and its reverse present: closed, oriented 2-manifold."""
    e = np.concatenate([tris[:, [0, 1]], tris[:, [1, 2]], tris[:, [2, 0]]])
    n = int(tris.max()) + 1
    fwd, rev = e[:, 0] * n + e[:, 1], e[:, 1] * n + e[:, 0]
    uniq, counts = np.unique(fwd, return_counts=True)
    return bool((counts == 1).all() and np.isin(rev, uniq).all())


def mesh_volume(v: np.ndarray, t: np.ndarray) -> float:
    return float(
        np.einsum("ij,ij->i", v[t[:, 0]], np.cross(v[t[:, 1]], v[t[:, 2]])).sum() / 6
    )


@pytest.fixture(scope="module")
def wheel20(tmp_path_factory):
    """A z = 20, m = 1 wheel from the test's own exact outline, written at two tolerances."""
    out = tmp_path_factory.mktemp("mesh")
    outline = involute_outline(20, 1.0)
    solid = make_wheel(WheelPart("w20", ToothSpec(20, 1.0), FACE, BORE), outline)
    files = {}
    for tol in (0.01, 0.002):
        path = write_stl(mesh_shape(solid, tol), out / f"w20_{tol}.stl", "w20")
        files[tol] = path
    return outline, files


@pytest.mark.parametrize("tol", [0.01, 0.002])
def test_stl_is_watertight_and_edge_manifold(wheel20, tol):
    v, t = read_stl(wheel20[1][tol])
    assert edge_manifold_closed(t)
    assert not edge_manifold_closed(t[1:])  # the check can fail
    # derived: Euler characteristic of a closed surface with one through hole is 0
    edges = np.unique(
        np.sort(np.concatenate([t[:, [0, 1]], t[:, [1, 2]], t[:, [2, 0]]]), axis=1),
        axis=0,
    )
    assert len(v) - len(edges) + len(t) == 0


def _distance_to_outline(p: np.ndarray, z: int) -> np.ndarray:
    """Distance (mm) of points in the plane to the exact outline of the test's wheel."""
    m, alpha = 1.0, math.radians(20.0)
    r_pitch = m * z / 2
    rb, ra, rf = r_pitch * math.cos(alpha), r_pitch + m, r_pitch - 1.25 * m
    r = np.hypot(p[:, 0], p[:, 1])
    phi = np.arctan2(p[:, 1], p[:, 0])
    phi = np.abs(phi - np.round(phi / (2 * math.pi / z)) * (2 * math.pi / z))
    psi = np.array([involute_half_angle(z, m, max(q, rb)) for q in r])
    flank = np.where(r >= rb, rb * np.abs(phi - psi), np.inf)
    r0 = max(rb, rf)
    # the tip arc spans |phi| <= psi(ra); the root arc the rest of the space
    # margins of 1e-5 (mm, rad) cover the float32 coordinates of an STL
    tip = np.where(phi <= involute_half_angle(z, m, ra) + 1e-5, np.abs(r - ra), np.inf)
    root = np.where(phi >= involute_half_angle(z, m, r0) - 1e-5, np.abs(r - rf), np.inf)
    radial = np.where(
        (r <= r0 + 1e-5) & (r >= rf - 1e-5),
        np.abs(r * np.sin(phi - involute_half_angle(z, m, r0))),
        np.inf,
    )
    bore = np.abs(r - BORE / 2)
    return np.minimum.reduce([flank, tip, root, radial, bore])


@pytest.mark.parametrize("tol", [0.01, 0.002])
def test_stl_chords_stay_within_the_tolerance(wheel20, tol):
    v, t = read_stl(wheel20[1][tol])
    # the caps' boundary edges are the chords of the outline and the bore
    top = t[np.all(np.abs(v[t][:, :, 2] - FACE) < 1e-6, axis=1)]
    e = np.sort(
        np.concatenate([top[:, [0, 1]], top[:, [1, 2]], top[:, [2, 0]]]), axis=1
    )
    uniq, counts = np.unique(e, axis=0, return_counts=True)
    boundary = uniq[counts == 1]
    assert len(boundary) > 20 * 10
    worst = 0.0
    for s in (0.0, 0.25, 0.5, 0.75):
        pts = v[boundary[:, 0], :2] * (1 - s) + v[boundary[:, 1], :2] * s
        worst = max(worst, float(_distance_to_outline(pts, 20).max()))
    # float32 STL coordinates (~1e-6 mm here) and the 24-point spline (~1e-7) on top
    assert worst <= tol + 1e-5
    assert worst > tol / 20  # the mesh is not needlessly fine


@pytest.mark.parametrize(("z", "tol"), [(20, 0.002), (60, 0.01)])
def test_stl_volume_matches_area_times_face_width(z, tol, tmp_path):
    # chords cut off up to 2/3 * tol * (outline length) of area: a small wheel needs
    # the finer tolerance to stay within 0.1 %
    outline = involute_outline(z, 1.0)
    solid = make_wheel(WheelPart("w", ToothSpec(z, 1.0), FACE, BORE), outline)
    v, t = read_stl(write_stl(mesh_shape(solid, tol), tmp_path / "w.stl", "w"))
    # derived: prism volume = (outline area - bore area) x face width
    exact = (outline.area(0.0001) - math.pi * (BORE / 2) ** 2) * FACE
    assert mesh_volume(v, t) == pytest.approx(exact, rel=1e-3)


@pytest.mark.parametrize(
    "part",
    [
        WheelPart(
            "hubbed",
            ToothSpec(40, 1.0),
            3.0,
            4.0,
            spokes=5,
            rim=2.5,
            round_radius=0.5,
            hub_diameter=10.0,
            hub_length=4.0,
            seat="pinned",
        ),
        WheelPart(
            "pinned",
            ToothSpec(30, 0.8),
            2.0,
            3.0,
            seat="hex",
            pin=PinBoss(8.0, 1.5, 4.0),
        ),
        ArborPart("arbor", 3.0, 40.0),
        SleevePart(
            "sleeve",
            3.1,
            5.0,
            20.0,
            seats=((2.0, 6.0, "square"),),
            collars=((0.0, 1.0, 8.0),),
        ),
    ],
    ids=lambda p: p.name,
)
def test_every_kind_of_part_meshes_closed(part, tmp_path):
    solid = make_part(part)
    path = write_stl(mesh_shape(solid, 0.01), tmp_path / "p.stl", part.name)
    v, t = read_stl(path)
    assert edge_manifold_closed(t)
    # chords inside a 3 mm bar at 0.01 mm cut off ~0.5 % of it (derived: polygon of
    # 13 deg sides in a circle of r 1.5 mm); the exact volume test is the one above
    assert mesh_volume(v, t) == pytest.approx(solid.Volume(), rel=1e-2)
    assert mesh_volume(v, t) < solid.Volume()
    assert v[:, 2].min() == pytest.approx(0.0, abs=1e-9)  # lying on the bed


def test_3mf_is_in_millimetres_and_matches_the_mesh(wheel20, tmp_path):
    outline = wheel20[0]
    solid = make_wheel(WheelPart("w20", ToothSpec(20, 1.0), FACE, BORE), outline)
    mesh = mesh_shape(solid, 0.01)
    a = write_3mf(mesh, tmp_path / "a.3mf", "w20")
    b = write_3mf(mesh, tmp_path / "b.3mf", "w20")
    assert a.read_bytes() == b.read_bytes()
    with zipfile.ZipFile(a) as zf:
        assert {"[Content_Types].xml", "_rels/.rels", "3D/3dmodel.model"} <= set(
            zf.namelist()
        )
        assert all(i.date_time == (2000, 1, 1, 0, 0, 0) for i in zf.infolist())
        root = ET.fromstring(zf.read("3D/3dmodel.model"))
    assert root.get("unit") == "millimeter"
    ns = {"m": "http://schemas.microsoft.com/3dmanufacturing/core/2015/02"}
    verts = root.findall(".//m:vertex", ns)
    tris = root.findall(".//m:triangle", ns)
    assert len(verts) == len(mesh.vertices) and len(tris) == len(mesh.triangles)
    xs = np.array([float(x.get("x")) for x in verts])
    # derived: tip radius m z / 2 + m; the nodes sit on it within the chord tolerance
    assert xs.max() == pytest.approx(11.0, abs=0.01)
