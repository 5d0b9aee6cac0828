"""Each wheel's angle at rest, chosen so that every pair interleaves on its line of centres.

A wheel's outline has a tooth centred on +X of its own frame (see
:class:`~wheelgen.teeth.outline.WheelOutline`); turned by ``phi`` it has tooth centres at
``phi + k * 360 / z``. For two wheels in mesh, let ``u_i`` be the angle from a tooth
centre of wheel ``i`` to the direction of the other wheel's axis (``u_i = beta_i -
phi_i``). Rolling the pitch circles on each other turns ``u_1`` and ``u_2`` by amounts in
the ratio ``z_2 : z_1`` of opposite sense, and with ``u_1 = 0`` wheel 2 must show the
middle of a space (``u_2 = 180 / z_2``: the mirror image about the line of centres is the
same pair). Hence the pair interleaves, with its backlash shared equally on both
flanks, exactly when

    z_1 u_1 + z_2 u_2 = 180  (mod 360)                                  (derived)

This holds for involute and triangular teeth alike (both are symmetric about the
tooth's centre line) and, once met at rest, for all time: the train turns the wheels in
just that ratio. Each wheel is a part of its own, fitted to its arbor at any angle, so
the angles are chosen wheel by wheel, walking the meshes from one wheel of each group
(at angle 0) outwards; compound, coaxial and carried trains need nothing more, because
the positions are those of the layout at rest (every carrier at angle 0). Only a loop of
meshes among the wheels themselves can make the condition impossible; its misfit is
reported. Angles in degrees, counter-clockwise seen from the front.

A pin-and-slot coupling adds no condition: the pin and the slot are cut where the rest
position needs them in each wheel's own frame (see :mod:`wheelgen.layout.train_parts`).
"""

from __future__ import annotations

import math
from collections import deque
from dataclasses import dataclass
from functools import lru_cache

from ..design.model import Design, Mesh
from .train_layout import Layout, plan_layout

__all__ = [
    "PhaseMisfit",
    "Phasing",
    "mesh_misfit_deg",
    "phase_wheels",
    "rest_angles",
    "wrap_deg",
]


@dataclass(frozen=True, slots=True)
class PhaseMisfit:
    """A mesh closing a loop of wheels whose teeth cannot all interleave.

    ``misfit_deg`` is how far (degrees) the second wheel of the mesh would have to turn
    to interleave; ``arc`` the same on the pitch circle, mm.
    """

    mesh: Mesh
    misfit_deg: float
    arc: float


@dataclass(frozen=True, slots=True)
class Phasing:
    """Rest angle (degrees, ccw) of every placed wheel, and the loops that misfit."""

    angles_deg: dict[str, float]
    misfits: tuple[PhaseMisfit, ...]


def wrap_deg(angle: float, period: float = 360.0) -> float:
    """``angle`` moved by whole periods into ``(-period / 2, period / 2]``."""
    out = math.fmod(angle, period)
    if out > period / 2:
        out -= period
    elif out <= -period / 2:
        out += period
    # nanodegrees: float noise (1e-14) would otherwise reach the files as "-0.0"
    return round(out, 9) + 0.0


def _direction_deg(frm: tuple[float, float], to: tuple[float, float]) -> float:
    return math.degrees(math.atan2(to[1] - frm[1], to[0] - frm[0]))


def mesh_misfit_deg(
    z1: int, z2: int, beta1_deg: float, phi1_deg: float, phi2_deg: float
) -> float:
    """How far (degrees of wheel 2) a pair at these angles is from interleaving.

    ``beta1_deg`` is the direction from wheel 1's axis to wheel 2's; 0 means the teeth
    interleave with the backlash shared equally (see the module text).
    """
    u1 = beta1_deg - phi1_deg
    u2 = beta1_deg + 180.0 - phi2_deg
    return wrap_deg(z1 * u1 + z2 * u2 - 180.0) / z2


def _partner_angle(
    z_known: int, z_new: int, beta_known: float, phi_known: float
) -> float:
    """Rest angle of the new wheel (in ``(-p/2, p/2]`` of its pitch ``p``)."""
    # z_k u_k + z_n u_n = 180 with u_n = beta_k + 180 - phi_n
    u_known = beta_known - phi_known
    u_new = (180.0 - z_known * u_known) / z_new
    return wrap_deg(beta_known + 180.0 - u_new, 360.0 / z_new)


def phase_wheels(layout: Layout) -> Phasing:
    """Rest angles of the wheels of ``layout`` and the loops that cannot interleave."""
    design = layout.design
    centre = {
        w.name: layout.position(w.arbor)
        for w in design.wheels
        if layout.position(w.arbor) is not None
    }
    edges: dict[str, list[Mesh]] = {}
    for m in design.meshes:
        if all(n in centre for n in m.pair):
            for n in m.pair:
                edges.setdefault(n, []).append(m)
    angles: dict[str, float] = {}
    misfits: list[PhaseMisfit] = []
    checked: set[int] = set()
    for start in design.wheels:
        if start.name not in centre or start.name in angles:
            continue
        angles[start.name] = 0.0
        queue = deque([start.name])
        while queue:
            here = queue.popleft()
            for m in edges.get(here, []):
                if m.index in checked:
                    continue
                checked.add(m.index)
                there = m.pair[1] if m.pair[0] == here else m.pair[0]
                w_here, w_there = design.wheel(here), design.wheel(there)
                c_here, c_there = centre[here], centre[there]
                assert c_here is not None and c_there is not None
                beta = _direction_deg(c_here, c_there)
                if there not in angles:
                    angles[there] = _partner_angle(
                        w_here.teeth, w_there.teeth, beta, angles[here]
                    )
                    queue.append(there)
                    continue
                w1, w2 = (design.wheel(n) for n in m.pair)
                c1, c2 = centre[w1.name], centre[w2.name]
                assert c1 is not None and c2 is not None
                off = mesh_misfit_deg(
                    w1.teeth,
                    w2.teeth,
                    _direction_deg(c1, c2),
                    angles[w1.name],
                    angles[w2.name],
                )
                arc = abs(math.radians(off)) * w2.module * w2.teeth / 2.0
                if arc > 1e-9:
                    misfits.append(PhaseMisfit(m, off, arc))
    return Phasing(angles, tuple(misfits))


@lru_cache(maxsize=16)
def _phasing(design: Design) -> Phasing:
    return phase_wheels(plan_layout(design))


def rest_angles(design: Design) -> Phasing:
    """The phasing of ``design``'s own layout (cached per design, which is frozen).

    The one source of the rest angles: the parts (``Pose.angle_deg``), the
    animated preview and ``wheelgen motion`` all read them from here.
    """
    return _phasing(design)
