"""Solids of the display: hands, dial discs on feet, knobs and cranks (mm).

Each is its flat profile (:mod:`wheelgen.display.outlines`) extruded once; the few
features that are not prisms of the profile (a hand's collet, a dial's feet, a crank's
handle) are fused on, each boolean checked. The frame of each part has +Z towards the
front; a dial's frame starts at the face its feet stand on.
"""

from __future__ import annotations

import cadquery as cq

from ..display.outlines import FlatProfile, flat_profile
from ..layout.part_kinds import CrankPart, DialPart, HandPart, KnobPart
from .profile import CadBuildError, chain_wire, hole_wire, holed_face, prism
from .wheel import _boolean

__all__ = ["make_crank", "make_dial", "make_hand", "make_knob", "profile_prism"]


def profile_prism(profile: FlatProfile, height: float, z: float, what: str) -> cq.Solid:
    """The profile with its holes, extruded ``height`` mm from height ``z``."""
    if height <= 0:
        raise ValueError(f"{what}: the thickness must be > 0 mm, got {height}")
    outer = chain_wire(profile.outline.segments(), z, f"{what} outline")
    holes = [hole_wire(h, z, f"{what} {h.role}") for h in profile.holes]
    return prism(holed_face(outer, holes, z), height)


def make_hand(part: HandPart) -> cq.Solid:
    """A hand: its profile ``thickness`` thick, and its collet on the front face."""
    profile = flat_profile(part)
    solid = profile_prism(profile, part.thickness, 0.0, part.name)
    if part.collet > 0 and part.collet_length > 0:
        z = part.thickness
        outer = cq.Wire.makeCircle(
            part.collet / 2, cq.Vector(0, 0, z), cq.Vector(0, 0, 1)
        )
        bore = [hole_wire(h, z, f"{part.name} collet") for h in profile.holes]
        boss = prism(holed_face(outer, bore, z), part.collet_length)
        solid = _boolean("fuse", solid, boss, f"{part.name} collet")
    return solid


def make_dial(part: DialPart) -> cq.Solid:
    """A dial disc on its feet; the feet stand on z = 0, the disc above them, and
    each foot's pin reaches down through the plate below z = 0."""
    profile = flat_profile(part)
    solid = profile_prism(profile, part.thickness, part.foot_length, part.name)
    for k, (x, y) in enumerate(part.feet):
        foot = cq.Solid.makeCylinder(
            part.foot_diameter / 2, part.foot_length, cq.Vector(x, y, 0)
        )
        if part.pin_length > 0:
            pin = cq.Solid.makeCylinder(
                part.foot_pin / 2, part.pin_length, cq.Vector(x, y, -part.pin_length)
            )
            foot = _boolean("fuse", foot, pin, f"{part.name} foot pin {k + 1}")
        solid = _boolean("fuse", solid, foot, f"{part.name} foot {k + 1}")
    return solid


def make_knob(part: KnobPart) -> cq.Solid:
    """A knob: a round block ``length`` long with its seat hole through it."""
    if part.length <= 0:
        raise CadBuildError(f"{part.name}: the knob has no length")
    return profile_prism(flat_profile(part), part.length, 0.0, part.name)


def make_crank(part: CrankPart) -> cq.Solid:
    """A crank: the arm's profile, and its handle on the front (or back) face."""
    solid = profile_prism(flat_profile(part), part.thickness, 0.0, part.name)
    z = -part.handle_length if part.handle_back else part.thickness
    handle = cq.Solid.makeCylinder(
        part.handle_diameter / 2, part.handle_length, cq.Vector(part.throw, 0, z)
    )
    return _boolean("fuse", solid, handle, f"{part.name} handle")
