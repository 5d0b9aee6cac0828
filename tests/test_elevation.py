"""The sectional elevation, read back from its SVG.

Truth, outside the code under test:

- heights: every part's frame has its back face at z = 0 along +Z (the parts'
  contract, ``wheelgen.layout.part_kinds``), so a wheel spans its placement's z to z
  plus its face width (and hub), a plate its thickness, a dial disc from its feet'
  length to that plus its thickness, a hand its thickness (derived: from the part's
  own fields, not from the drawing code);
- a wheel's width is its tip diameter ``d_a = m (z + 2 h_a* + 2 x)`` (ISO 21771:2007,
  tip diameter without tip shortening; triangular teeth have no shift);
- the section is developed: two axes next in order stand at their true distance
  apart (derived: Pythagoras on the placements).
"""

from __future__ import annotations

import math
import xml.etree.ElementTree as ET

import pytest

from tests._demo import DEMO_TEXT
from wheelgen.design import loads_design
from wheelgen.layout.part_kinds import (
    ArborPart,
    CollarPart,
    DialPart,
    HandPart,
    PlatePart,
    SleevePart,
    WheelPart,
)
from wheelgen.parts import plan_parts
from wheelgen.workshop.elevation import elevation_svg, elevation_writer

NS = "{http://www.w3.org/2000/svg}"
REQUIRED = (ArborPart, SleevePart, WheelPart, CollarPart, PlatePart, DialPart, HandPart)


@pytest.fixture(scope="module")
def demo():
    design = loads_design(DEMO_TEXT, "demo.toml")
    parts = plan_parts(design)
    root = ET.fromstring(elevation_svg(parts))
    groups: dict[str, list[tuple[float, float, float, float]]] = {}
    for g in root.iter(f"{NS}g"):
        name = g.get("data-part")
        if name is None:
            continue
        assert name not in groups, f"{name} drawn twice"
        groups[name] = [
            (
                float(r.get("x")),
                float(r.get("x")) + float(r.get("width")),
                # page y runs down: z = -y
                -float(r.get("y")) - float(r.get("height")),
                -float(r.get("y")),
            )
            for r in g.iter(f"{NS}rect")
        ]
    return design, parts, root, groups


def _heights(part) -> tuple[float, float]:
    """The z range (mm) a part occupies, from its own fields (see the docstring)."""
    z = part.placement.z
    if isinstance(part, WheelPart):
        return z, z + part.face_width + part.hub_length
    if isinstance(part, (ArborPart, SleevePart, CollarPart)):
        return z, z + part.length
    if isinstance(part, PlatePart):
        return z, z + part.thickness
    if isinstance(part, DialPart):
        return z + part.foot_length, z + part.foot_length + part.thickness
    if isinstance(part, HandPart):
        return z, z + part.thickness + part.collet_length
    raise AssertionError(part)


def test_every_part_is_drawn_at_its_true_heights(demo) -> None:
    _, parts, _, groups = demo
    required = [p for p in parts if isinstance(p, REQUIRED)]
    assert {type(p) for p in required} == set(REQUIRED)
    for part in required:
        assert part.name in groups, part.name
        rects = groups[part.name]
        z0 = min(r[2] for r in rects)
        z1 = max(r[3] for r in rects)
        assert (z0, z1) == pytest.approx(_heights(part), abs=1e-3), part.name


def test_each_arbor_length_is_drawn_at_its_diameter(demo) -> None:
    _, parts, _, groups = demo
    for part in parts:
        if not isinstance(part, (ArborPart, SleevePart)):
            continue
        rects = groups[part.name]
        z = part.placement.z
        for s in part.sections:
            assert any(
                abs((x1 - x0) - s.diameter) < 1e-3
                and abs(r0 - (z + s.z0)) < 1e-3
                and abs(r1 - (z + s.z1)) < 1e-3
                for x0, x1, r0, r1 in rects
            ), (part.name, s)


def test_wheels_are_drawn_to_their_tip_diameter(demo) -> None:
    _, parts, _, groups = demo
    for part in parts:
        if not isinstance(part, WheelPart):
            continue
        t = part.tooth
        shift = t.shift if t.form == "involute" else 0.0
        d_a = t.module * (t.teeth + 2 * t.addendum + 2 * shift)  # ISO 21771
        widest = max(x1 - x0 for x0, x1, _, _ in groups[part.name])
        assert widest == pytest.approx(d_a, abs=1e-3), part.name


def test_axes_stand_at_their_true_distance_apart(demo) -> None:
    _, parts, _, groups = demo
    members = [p for p in parts if isinstance(p, ArborPart)]
    centre = {}
    for p in members:
        x0, x1, _, _ = groups[p.name][0]
        centre[p.name] = (x0 + x1) / 2
    # next in order across the plates (by x, then y): their true distance apart
    ordered = sorted(members, key=lambda p: (p.placement.x, p.placement.y))
    for a, b in zip(ordered, ordered[1:]):
        true = math.hypot(b.placement.x - a.placement.x, b.placement.y - a.placement.y)
        assert centre[b.name] - centre[a.name] == pytest.approx(true, abs=1e-3)


def test_the_drawing_is_at_true_size_and_labelled(demo) -> None:
    _, parts, root, groups = demo
    width_mm = float(root.get("width").removesuffix("mm"))
    _, _, vw, _ = (float(v) for v in root.get("viewBox").split())
    assert width_mm == pytest.approx(vw)
    texts = [t.text or "" for t in root.iter(f"{NS}text")]
    for name in groups:
        assert sum(t.startswith(f"{name}  ") for t in texts) == 1, name


def test_labels_do_not_overlap(demo) -> None:
    _, _, root, _ = demo
    boxes = []
    for t in root.iter(f"{NS}text"):
        size = float(t.get("font-size"))
        x, y = float(t.get("x")), float(t.get("y"))
        w = 0.6 * size * len(t.text or "")
        x0 = {"start": x, "end": x - w, "middle": x - w / 2}[t.get("text-anchor")]
        boxes.append((x0, x0 + w, y - size * 0.8, y + size * 0.2))
    for i, a in enumerate(boxes):
        for b in boxes[i + 1 :]:
            assert not (a[0] < b[1] and b[0] < a[1] and a[2] < b[3] and b[2] < a[3])


def test_the_build_writes_it(demo, tmp_path) -> None:
    design, parts, _, _ = demo
    (path,) = elevation_writer(design, parts, [], tmp_path)
    assert path == tmp_path / "drawings" / "elevation.svg"
    root = ET.fromstring(path.read_text(encoding="utf-8"))
    drawn = {g.get("data-part") for g in root.iter(f"{NS}g")} - {None}
    assert {p.name for p in parts if isinstance(p, REQUIRED)} <= drawn
