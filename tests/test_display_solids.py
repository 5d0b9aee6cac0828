"""Hands, dials, knobs and cranks as parts: every format, measured, and in the assembly."""

from __future__ import annotations

import math
import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pytest

pytest.importorskip("cadquery")

import ezdxf  # noqa: E402
from _assembly import placed_solids  # noqa: E402

from tests._demo import DEMO
from wheelgen.design import load_design  # noqa: E402
from wheelgen.display.outlines import flat_profile  # noqa: E402
from wheelgen.export.build import BuildOptions, build_design  # noqa: E402
from wheelgen.layout import plan_layout  # noqa: E402
from wheelgen.parts import plan_parts  # noqa: E402

pytestmark = pytest.mark.cad

ROOT = Path(__file__).resolve().parents[1]
WEEK = ROOT / "tests" / "data" / "display" / "week_and_month.toml"
DISPLAY_KINDS = ("hand", "dial", "knob", "crank")


def _area(loop: np.ndarray) -> float:
    x, y = loop[:, 0], loop[:, 1]
    return abs(0.5 * float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1))))


def _shared_with_display(path: Path, display: set[str]) -> list[tuple[str, str, float]]:
    """Pairs of solids, one of them a display part, sharing more than 0.001 mm3."""
    from OCP.BRepAlgoAPI import BRepAlgoAPI_Common
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps

    solids = placed_solids(path)
    out = []
    for i, a in enumerate(solids):
        for b in solids[i + 1 :]:
            if a.name not in display and b.name not in display:
                continue
            if not all(
                a.box[k] <= b.box[k + 3] + 1e-6 and b.box[k] <= a.box[k + 3] + 1e-6
                for k in range(3)
            ):
                continue
            common = BRepAlgoAPI_Common(a.shape, b.shape)
            props = GProp_GProps()
            BRepGProp.VolumeProperties_s(common.Shape(), props)
            if not common.IsDone() or props.Mass() > 1e-3:
                out.append((a.name, b.name, props.Mass()))
    return out


def _without_wheels(design):
    """Every part but the wheels (frame and display included): every display part
    stands clear of the wheels' heights (the hands and dials in front of the front
    plate, their feet's screws just behind it, the knob behind the back plate), so the
    wheels, slow to build and to read back, can be left out here."""
    return [p for p in plan_parts(design) if p.kind != "wheel"]


def _display_names(parts) -> set[str]:
    """The display's parts."""
    return {p.name for p in parts if p.kind in DISPLAY_KINDS}


@pytest.fixture(scope="module")
def week(tmp_path_factory):
    design = load_design(WEEK)
    out = tmp_path_factory.mktemp("week") / "week"
    build_design(
        design, out, BuildOptions(use_cache=False), parts=_without_wheels(design)
    )
    return design, out


def test_display_parts_get_every_format(week):
    design, out = week
    parts = [p for p in plan_parts(design) if p.kind in DISPLAY_KINDS]
    assert {p.kind for p in parts} == {"hand", "dial", "crank"}
    for p in parts:
        for fmt in ("step", "stl", "3mf", "dxf", "svg"):
            assert (out / fmt / f"{p.name}.{fmt}").is_file(), (p.name, fmt)


def test_hand_solid_is_its_profile_extruded(week):
    import cadquery as cq

    design, out = week
    hand = next(p for p in plan_parts(design) if p.name == "hand_month")
    solid = cq.importers.importStep(str(out / "step" / "hand_month.step")).val()
    profile = flat_profile(hand)
    area = _area(profile.outline.polyline(0.001))
    area -= sum(_area(h.polyline(0.001)) for h in profile.holes)
    # derived: a prism of the holed profile, thickness 1.2 mm (printed default)
    assert solid.Volume() == pytest.approx(area * hand.thickness, rel=1e-3)
    box = solid.BoundingBox()
    assert box.xmax == pytest.approx(hand.length, abs=1e-3)
    assert box.zlen == pytest.approx(hand.thickness, abs=1e-6)


def test_dial_dxf_engraves_every_label_and_svg_is_true_size(week):
    design, out = week
    doc = ezdxf.readfile(out / "dxf" / "dial_week.dxf")
    layers = {e.dxf.layer for e in doc.modelspace()}
    assert {"OUTLINE", "BORE", "ENGRAVE", "CENTRE"} <= layers
    texts = {e.dxf.text for e in doc.modelspace() if e.dxftype() == "TEXT"}
    assert texts == {"Sun", "Mon", "Tue", "Wed", "Thu", "Fri", "Sat"}
    circle = next(
        e
        for e in doc.modelspace()
        if e.dxf.layer == "ENGRAVE" and e.dxftype() == "CIRCLE"
    )
    dial = next(p for p in plan_parts(design) if p.name == "dial_week")
    assert circle.dxf.radius == pytest.approx(dial.radius)
    root = ET.parse(out / "svg" / "dial_week.svg").getroot()
    width = float(root.get("width").removesuffix("mm"))
    view = [float(v) for v in root.get("viewBox").split()]
    assert width == pytest.approx(view[2])  # one user unit is one millimetre


def test_week_assembly_shows_the_display_in_front_and_shares_no_volume(week):
    design, out = week
    face = plan_layout(design).stacking.levels.front_face
    solids = {s.name: s for s in placed_solids(out / "step" / "assembly.step")}
    for name in ("hand_week", "hand_month", "crank_crank"):
        assert solids[name].box[2] > face - 1e-6, name  # zmin in front of the plate
    dials = [n for n in solids if n.startswith("dial_")]
    assert len(dials) == 2
    for n in dials:
        # the feet's pins pass through the front plate, to its inner face
        t = design.frame.thickness
        assert solids[n].box[2] == pytest.approx(face - t, abs=1e-6)
    display = _display_names(plan_parts(design))
    assert _shared_with_display(out / "step" / "assembly.step", display) == []


def test_demo_assembly_display_shares_no_volume(tmp_path):
    design = load_design(DEMO)
    out = tmp_path / "demo"
    parts = _without_wheels(design)
    build_design(
        design, out, BuildOptions(formats=("step",), use_cache=False), parts=parts
    )
    wheels = [w.name for w in design.wheels]
    top = max(w.height + w.face_width for w in design.wheels)
    assert wheels and top < plan_layout(design).stacking.levels.front_face
    display = _display_names(parts)
    assert display == {
        "dial_main", "dial_moon_dial", "hand_hours", "hand_tide", "hand_moon_dial",
        "knob_main",
    }  # fmt: skip
    assert _shared_with_display(out / "step" / "assembly.step", display) == []
    solids = {s.name: s for s in placed_solids(out / "step" / "assembly.step")}
    face = plan_layout(design).stacking.levels.front_face
    for t in design.targets:
        assert solids[f"hand_{t.arbor}"].box[2] > face
    # the knob behind the back plate: derived, back plate's outer face at -2 mm
    assert solids["knob_main"].box[5] < -2.0
    assert math.isclose(solids["main"].box[2], solids["knob_main"].box[2], abs_tol=1e-6)


@pytest.mark.slow
def test_the_whole_week_assembly_shares_no_volume(tmp_path):
    from _assembly import shared_volumes

    design = load_design(WEEK)
    out = tmp_path / "week"
    build_design(design, out, BuildOptions(formats=("step",), use_cache=False))
    assert shared_volumes(out / "step" / "assembly.step") == []
