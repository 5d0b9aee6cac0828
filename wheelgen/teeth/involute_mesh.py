"""An involute pair at one centre distance: the numbers the mesh checks judge.

:func:`involute_mesh` takes the ISO 21771 numbers of the pair from
:func:`wheelgen.teeth.mesh_data.mesh_data` and adds what the generated teeth decide: the
tip-root clearance on each side and the contact ratio counted on the involutes only.
Lengths in mm, angles in degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .involute_tooth import generate_tooth
from .mesh_data import mesh_data, shifted_centre_distance, working_pressure_angle_deg
from .spec import ToothSpec

__all__ = ["InvoluteMesh", "involute_mesh"]


@dataclass(frozen=True, slots=True)
class InvoluteMesh:
    """Numbers of an involute pair at one centre distance (mm, degrees).

    ``start_radius_1`` is where contact begins on wheel 1 (the mate's tip reaching
    down), ``nan`` when the mate's tip passes the interference point
    (``reach_1 < 0``); likewise for wheel 2. ``contact_ratio_effective`` counts only the
    part of the path of contact where both flanks are involute (above both form
    circles): generated teeth are undercut where a mate's tip would interfere, so the
    flanks do not collide there, they lose contact.
    """

    centre_distance: float
    working_centre_distance: float
    working_pressure_angle_deg: float
    pressure_angle_at_centres_deg: float
    contact_ratio: float
    contact_ratio_effective: float  # counting only contact on the involutes
    backlash: float  # circumferential, on the working pitch circles at these centres
    clearance_1: float  # tip of wheel 1 to root of wheel 2
    clearance_2: float
    reach_1: float  # from the line of action's tangent point on base circle 1
    reach_2: float
    start_radius_1: float
    start_radius_2: float
    form_radius_1: float
    form_radius_2: float


def involute_mesh(
    spec1: ToothSpec, spec2: ToothSpec, centre_distance: float | None = None
) -> InvoluteMesh:
    """The gear data of an external involute pair with equal module and pressure angle.

    ``centre_distance`` (mm) defaults to the working centre distance of the shifted
    pair. The ISO 21771 numbers (working pressure angle and centre distance, contact
    ratio, backlash, start of contact) come from :func:`wheelgen.teeth.mesh_data`; this
    adds the clearance on each side and the contact ratio counted on the involutes only.

    Raises ``ValueError`` when the axes are closer than the base circles allow.
    """
    if spec1.form != "involute" or spec2.form != "involute":
        raise ValueError("'spec1' and 'spec2' must both be involute")
    data = mesh_data(spec1, spec2, centre_distance)
    assert data.working_pressure_angle_deg is not None  # involute pairs always have it
    assert data.contact_ratio is not None and data.backlash is not None
    assert data.interference_distance1 is not None
    assert data.interference_distance2 is not None
    g1, g2 = generate_tooth(spec1), generate_tooth(spec2)
    z1, z2, x1, x2 = spec1.teeth, spec2.teeth, spec1.shift, spec2.shift
    alpha_deg = spec1.pressure_angle_deg
    a_w = shifted_centre_distance(z1, z2, spec1.module, x1, x2, alpha_deg)
    a = data.centre_distance
    # Along the line of action from the tangent point on base circle 1, contact runs
    # from the mate's tip (reach1) to wheel 1's tip (path1); only the stretch where both
    # flanks are involute (above both form circles) carries the motion exactly.
    rb1, rb2 = g1.base_radius, g2.base_radius
    line = a * math.sin(math.radians(data.working_pressure_angle_deg))
    reach1, reach2 = data.interference_distance1, data.interference_distance2
    path1 = line - reach2
    form1 = math.sqrt(max(g1.form_radius**2 - rb1**2, 0.0))
    form2 = line - math.sqrt(max(g2.form_radius**2 - rb2**2, 0.0))
    start, end = max(reach1, form1), min(path1, form2)
    base_pitch = math.pi * spec1.module * math.cos(math.radians(alpha_deg))
    return InvoluteMesh(
        centre_distance=a,
        working_centre_distance=a_w,
        working_pressure_angle_deg=working_pressure_angle_deg(
            z1, z2, x1, x2, alpha_deg
        ),
        pressure_angle_at_centres_deg=data.working_pressure_angle_deg,
        contact_ratio=data.contact_ratio,
        contact_ratio_effective=max(end - start, 0.0) / base_pitch,
        backlash=data.backlash,
        clearance_1=a - g1.tip_radius - g2.root_radius,
        clearance_2=a - g2.tip_radius - g1.root_radius,
        reach_1=reach1,
        reach_2=reach2,
        start_radius_1=math.hypot(rb1, reach1) if reach1 >= 0 else math.nan,
        start_radius_2=math.hypot(rb2, reach2) if reach2 >= 0 else math.nan,
        form_radius_1=g1.form_radius,
        form_radius_2=g2.form_radius,
    )
