"""The data of a pair of wheels in mesh: centre distance, contact, clearance, backlash.

Lengths in mm, angles in degrees. External spur pairs; formulas after ISO 21771:2007
and SDP/SI D785 (named beside each).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields

from .involute import _inv, _inverse_inv
from .involute_tooth import generate_tooth
from .spec import ToothSpec
from .triangular import triangular_tooth

__all__ = [
    "MeshData",
    "contact_ratio",
    "mesh_data",
    "shift_for_centre_distance",
    "shifted_centre_distance",
    "working_pressure_angle_deg",
]


@dataclass(frozen=True, slots=True)
class MeshData:
    """A pair's mesh data (mm, degrees); involute-only items are None otherwise.

    ``backlash`` is circumferential on the working pitch circles, ``normal_backlash``
    along the line of action. ``clearance`` is the smaller tip-to-root clearance.
    ``interference1`` says the tip of wheel 2 reaches below the start of the involute
    of wheel 1 (``active_start1`` is where contact begins on wheel 1, as a diameter;
    ``interference_distance1`` is how far along the line of action from wheel 1's
    interference point contact begins: negative means past it).
    ``shift_sum_to_fit`` is x1 + x2 that makes the pair mesh without backlash at
    ``centre_distance``; ``tip_shortening`` is the tip reduction (mm) that restores
    the standard clearance of a shifted pair.
    """

    standard_centre_distance: float
    centre_distance: float
    working_pressure_angle_deg: float | None
    centre_distance_factor: float
    contact_ratio: float | None
    clearance: float
    backlash: float | None
    normal_backlash: float | None
    undercut1: bool
    undercut2: bool
    interference1: bool
    interference2: bool
    active_start1: float | None
    active_start2: float | None
    interference_distance1: float | None
    interference_distance2: float | None
    shift_sum: float
    shift_sum_to_fit: float | None
    tip_shortening: float | None
    warnings: tuple[str, ...]

    def as_dict(self) -> dict[str, object]:
        """Plain dict (for JSON)."""
        return {f.name: getattr(self, f.name) for f in fields(self)}


def working_pressure_angle_deg(
    z1: int, z2: int, x1: float, x2: float, pressure_angle_deg: float = 20.0
) -> float:
    """alpha_w from inv a_w = inv a + 2 tan a (x1 + x2) / (z1 + z2) (ISO 21771)."""
    a = math.radians(pressure_angle_deg)
    value = _inv(a) + 2 * math.tan(a) * (x1 + x2) / (z1 + z2)
    if value <= 0:
        raise ValueError(f"shift sum {x1 + x2} is too negative for {z1} + {z2} teeth")
    return math.degrees(_inverse_inv(value))


def shifted_centre_distance(
    z1: int,
    z2: int,
    module: float,
    x1: float,
    x2: float,
    pressure_angle_deg: float = 20.0,
) -> float:
    """Centre distance (mm) of a shifted pair without backlash.

    a = m (z1 + z2) / 2 cos a / cos a_w (ISO 21771).
    """
    aw = math.radians(working_pressure_angle_deg(z1, z2, x1, x2, pressure_angle_deg))
    a = math.radians(pressure_angle_deg)
    return module * (z1 + z2) / 2 * math.cos(a) / math.cos(aw)


def shift_for_centre_distance(
    z1: int,
    z2: int,
    module: float,
    centre_distance: float,
    pressure_angle_deg: float = 20.0,
) -> float:
    """Shift sum x1 + x2 for a mesh without backlash at ``centre_distance`` (mm).

    cos a_w = a0 cos a / a; x1 + x2 = (z1 + z2)(inv a_w - inv a) / (2 tan a)
    (ISO 21771, the inverse of :func:`shifted_centre_distance`).
    """
    a = math.radians(pressure_angle_deg)
    a0 = module * (z1 + z2) / 2
    c = a0 * math.cos(a) / centre_distance
    if not 0 < c <= 1:
        raise ValueError(
            f"'centre_distance' must be more than {a0 * math.cos(a):.4f} mm for these "
            f"wheels, got {centre_distance}"
        )
    aw = math.acos(c)
    return (z1 + z2) * (_inv(aw) - _inv(a)) / (2 * math.tan(a))


def contact_ratio(
    tip_diameters: tuple[float, float],
    base_diameters: tuple[float, float],
    centre_distance: float,
    working_pressure_angle_deg: float,
    module: float,
    pressure_angle_deg: float = 20.0,
) -> float:
    """Transverse contact ratio of an external pair.

    e = [sqrt(ra1^2 - rb1^2) + sqrt(ra2^2 - rb2^2) - a sin a_w] / (pi m cos a)
    (ISO 21771; SDP/SI D785 section 11). Diameters and distance in mm.
    """
    (da1, da2), (db1, db2) = tip_diameters, base_diameters
    aw = math.radians(working_pressure_angle_deg)
    a = math.radians(pressure_angle_deg)
    path = (
        math.sqrt(max(da1 * da1 - db1 * db1, 0.0)) / 2
        + math.sqrt(max(da2 * da2 - db2 * db2, 0.0)) / 2
        - centre_distance * math.sin(aw)
    )
    return path / (math.pi * module * math.cos(a))


def mesh_data(
    spec1: ToothSpec, spec2: ToothSpec, centre_distance: float | None = None
) -> MeshData:
    """Mesh data of two external wheels; by default at the shifted centre distance."""
    if spec1.form != spec2.form:
        raise ValueError(
            f"wheels of one mesh must share their form, got {spec1.form!r} and "
            f"{spec2.form!r}"
        )
    if not math.isclose(spec1.module, spec2.module, rel_tol=1e-12):
        raise ValueError(
            f"wheels of one mesh must share their module, got {spec1.module} and "
            f"{spec2.module} mm"
        )
    if centre_distance is not None and centre_distance <= 0:
        raise ValueError(f"'centre_distance' must be > 0 mm, got {centre_distance}")
    if spec1.form == "triangular":
        return _triangular_mesh(spec1, spec2, centre_distance)
    if spec1.pressure_angle_deg != spec2.pressure_angle_deg:
        raise ValueError(
            "wheels of one mesh must share their pressure angle, got "
            f"{spec1.pressure_angle_deg} and {spec2.pressure_angle_deg} degrees"
        )
    g1, g2 = generate_tooth(spec1), generate_tooth(spec2)
    m, z1, z2 = spec1.module, spec1.teeth, spec2.teeth
    x1, x2 = spec1.shift, spec2.shift
    alpha = g1.alpha_rad
    a0 = m * (z1 + z2) / 2
    warnings: list[str] = []
    fit = None
    if centre_distance is None:
        aw_deg = working_pressure_angle_deg(z1, z2, x1, x2, spec1.pressure_angle_deg)
        a = a0 * math.cos(alpha) / math.cos(math.radians(aw_deg))
    else:
        a = centre_distance
        c = a0 * math.cos(alpha) / a
        if c > 1:
            raise ValueError(
                f"'centre_distance' must be more than {a0 * math.cos(alpha):.4f} mm "
                f"for these wheels, got {a}"
            )
        aw_deg = math.degrees(math.acos(c))
        fit = shift_for_centre_distance(z1, z2, m, a, spec1.pressure_angle_deg)
    aw = math.radians(aw_deg)
    y = (a - a0) / m
    # backlash on the working pitch circles: pitch minus both working thicknesses,
    # s_w = 2 r_w (psi + inv a - inv a_w) (ISO 21771 tooth thickness at any circle)
    rw1 = g1.ref_radius * math.cos(alpha) / math.cos(aw)
    rw2 = g2.ref_radius * math.cos(alpha) / math.cos(aw)
    sw1 = 2 * rw1 * (g1.half_angle_ref_rad + _inv(alpha) - _inv(aw))
    sw2 = 2 * rw2 * (g2.half_angle_ref_rad + _inv(alpha) - _inv(aw))
    backlash = 2 * math.pi * rw1 / z1 - sw1 - sw2
    if backlash < -1e-9:
        warnings.append(
            f"the wheels jam: backlash {backlash:.4f} mm at {a:.4f} mm; "
            "open the centre distance or reduce the shift"
        )
    eps = contact_ratio(
        (2 * g1.tip_radius, 2 * g2.tip_radius),
        (2 * g1.base_radius, 2 * g2.base_radius),
        a,
        aw_deg,
        m,
        spec1.pressure_angle_deg,
    )
    if eps < 1.0:
        warnings.append(f"contact ratio {eps:.3f} is under 1: the teeth lose contact")
    clearance = min(
        a - g1.tip_radius - g2.root_radius, a - g2.tip_radius - g1.root_radius
    )
    if clearance < 0:
        warnings.append(f"tip runs into root: clearance {clearance:.4f} mm")
    line = a * math.sin(aw)
    out = []
    for mine, other, name in ((g1, g2, "1"), (g2, g1, "2")):
        # contact begins where the other's tip circle crosses the line of action;
        # measured from this wheel's interference point (its base-circle tangency)
        dist = line - math.sqrt(max(other.tip_radius**2 - other.base_radius**2, 0.0))
        start = math.hypot(mine.base_radius, max(dist, 0.0))
        bad = dist < 0 or start < mine.form_radius - 1e-9 * m
        if bad:
            warnings.append(
                f"tip interference: the tip of wheel {'2' if name == '1' else '1'} "
                f"reaches below the involute of wheel {name} (contact from "
                f"{2 * start:.4f} mm, involute from {2 * mine.form_radius:.4f} mm)"
            )
        out.append((bad, 2 * start, dist))
    for g, name in ((g1, "1"), (g2, "2")):
        if g.undercut:
            warnings.append(f"wheel {name} is undercut")
    return MeshData(
        standard_centre_distance=a0,
        centre_distance=a,
        working_pressure_angle_deg=aw_deg,
        centre_distance_factor=y,
        contact_ratio=eps,
        clearance=clearance,
        backlash=backlash,
        normal_backlash=backlash * math.cos(aw),
        undercut1=g1.undercut,
        undercut2=g2.undercut,
        interference1=out[0][0],
        interference2=out[1][0],
        active_start1=out[0][1],
        active_start2=out[1][1],
        interference_distance1=out[0][2],
        interference_distance2=out[1][2],
        shift_sum=x1 + x2,
        shift_sum_to_fit=fit,
        tip_shortening=(x1 + x2 - y) * m,
        warnings=tuple(warnings),
    )


def _triangular_mesh(
    spec1: ToothSpec, spec2: ToothSpec, centre_distance: float | None
) -> MeshData:
    t1, t2 = triangular_tooth(spec1), triangular_tooth(spec2)
    m = spec1.module
    a0 = m * (spec1.teeth + spec2.teeth) / 2
    a = a0 if centre_distance is None else centre_distance
    clearance = min(
        a - t1.tip_radius - t2.root_radius, a - t2.tip_radius - t1.root_radius
    )
    warnings = []
    if clearance < 0:
        warnings.append(f"tip runs into root: clearance {clearance:.4f} mm")
    warnings.append("triangular teeth do not keep a constant ratio within one tooth")
    return MeshData(
        standard_centre_distance=a0,
        centre_distance=a,
        working_pressure_angle_deg=None,
        centre_distance_factor=(a - a0) / m,
        contact_ratio=None,
        clearance=clearance,
        backlash=None,
        normal_backlash=None,
        undercut1=False,
        undercut2=False,
        interference1=False,
        interference2=False,
        active_start1=None,
        active_start2=None,
        interference_distance1=None,
        interference_distance2=None,
        shift_sum=0.0,
        shift_sum_to_fit=None,
        tip_shortening=None,
        warnings=tuple(warnings),
    )
