"""Read back with the CAD kernel, no two solids of ``assembly.step`` share volume.

The assembly is built as ``wheelgen build`` builds it, the frame (plates, pillars,
cocks, screws) included, and read with the kernel's STEP reader
(``tests/_assembly.py``); every pair of solids whose boxes meet is intersected and must
share no more than 0.001 mm3. Two designs: the bundled demo, and an epicyclic
train with a fixed sun, a carrier tube, a carried planet arbor, nested output tubes and
even tooth counts (tests/data/layout/epicyclic_nested.toml). These take tens of
seconds each, so there are only these two.
"""

from __future__ import annotations

from pathlib import Path

import pytest

pytest.importorskip("cadquery")

from tests._assembly import shared_volumes  # noqa: E402
from tests._demo import DEMO_TEXT  # noqa: E402
from wheelgen.design import load_design, loads_design  # noqa: E402
from wheelgen.export.build import ASSEMBLY_FILE, BuildOptions, build_design  # noqa: E402

pytestmark = [pytest.mark.cad]

EPICYCLIC = Path(__file__).parent / "data" / "layout" / "epicyclic_nested.toml"


def _assembly(design, tmp_path: Path) -> Path:
    out = tmp_path / "out"
    build_design(design, out, BuildOptions(formats=("step",), use_cache=False))
    return out / ASSEMBLY_FILE


@pytest.mark.slow
def test_the_demo_assembly_has_no_shared_volume(tmp_path: Path) -> None:
    design = loads_design(DEMO_TEXT, "harbour_tide_clock.toml")
    path = _assembly(design, tmp_path)
    # the frame is in it: both plates, the pillars, the two cocks and their screws
    text = path.read_text(encoding="latin-1")
    for name in ("back_plate", "front_plate", "pillar_1", "pillar_2", "pillar_3",
                 "cock_moon", "cock_moon_dial", "cock_moon_screw_1"):  # fmt: skip
        assert f"PRODUCT('{name}'" in text, name
    assert shared_volumes(path) == []


@pytest.mark.slow
def test_a_carried_planet_and_nested_tubes_share_no_volume(tmp_path: Path) -> None:
    assert shared_volumes(_assembly(load_design(EPICYCLIC), tmp_path)) == []


def test_the_carrier_wheel_solid_has_the_planet_bore():
    from OCP.BRepClass3d import BRepClass3d_SolidClassifier
    from OCP.gp import gp_Pnt
    from OCP.TopAbs import TopAbs_IN, TopAbs_OUT

    from wheelgen.parts import plan_parts
    from wheelgen.solids.wheel import make_wheel

    design = loads_design(DEMO_TEXT, "demo.toml")
    (part,) = [p for p in plan_parts(design) if p.name == "hour_wheel"]
    solid = make_wheel(part)
    ((x, y, d),) = part.holes
    z = part.face_width / 2

    def where(px: float, py: float) -> object:
        c = BRepClass3d_SolidClassifier(solid.wrapped, gp_Pnt(px, py, z), 1e-7)
        return c.State()

    # the bore's centre is open, a point one bore diameter further in is wheel
    assert where(x, y) == TopAbs_OUT
    k = 1 - d / (x * x + y * y) ** 0.5
    assert where(x * k, y * k) == TopAbs_IN
