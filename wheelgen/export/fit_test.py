"""The fit test coupon of a printed design, as a solid and an STL.

Two plates side by side, made from :func:`wheelgen.workshop.print_plan.fit_test_plan`:
the hole plate with holes at the design's running clearance and at steps either side,
and the pin plate with pins at the same clearances; each with a plain hole or pin of
the nominal size to try the others against, and every hole and pin labelled with its
radial clearance in hundredths of a millimetre in raised digits.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any, Sequence

from ..workshop.fit_coupon import FitTestPlan, digit_bars, fit_test_plan

__all__ = ["fit_test_solid", "write_fit_test"]

_STROKE_PER_HEIGHT = 0.16  # bar width of the digits, a sixth of their height


def fit_test_solid(plan: FitTestPlan) -> Any:
    """Both plates of the coupon as one compound (two separate solids), mm."""
    import cadquery as cq

    t, w, d = plan.thickness, plan.plate, plan.plate_depth
    stroke = _STROKE_PER_HEIGHT * plan.digit_height
    texts = [("0", plan.ref_x)] + list(zip(plan.labels, plan.xs))

    def labels(y0: float) -> list[Any]:
        return [
            cq.Solid.makeBox(x1 - x0, y1 - yb, plan.relief, cq.Vector(x0, yb, t))
            for text, x in texts
            for x0, yb, x1, y1 in digit_bars(
                text, x, y0 + 2.0 + plan.digit_height, plan.digit_height, stroke
            )
        ]

    def cylinder(dia: float, x: float, y: float, z: float, h: float) -> Any:
        return cq.Solid.makeCylinder(dia / 2, h, cq.Vector(x, y, z))

    # one boolean for all the holes and one for all the pins and digits: the kernel
    # does them together far faster than one by one
    holes = cq.Solid.makeBox(w, d, t).cut(
        *[
            cylinder(dia, x, plan.hole_y, -1.0, t + 2.0)
            for x, dia in [
                (plan.ref_x, plan.nominal),
                *zip(plan.xs, plan.hole_diameters),
            ]
        ]
    )
    holes = holes.fuse(*labels(0.0)).clean()
    pin_plate = cq.Solid.makeBox(w, d, t, cq.Vector(0, plan.pin_plate_y, 0))
    pins = pin_plate.fuse(
        *[
            cylinder(dia, x, plan.pin_y, t, plan.pin_length)
            for x, dia in [
                (plan.ref_x, plan.nominal),
                *zip(plan.xs, plan.pin_diameters),
            ]
        ],
        *labels(plan.pin_plate_y),
    ).clean()
    return cq.Compound.makeCompound([holes, pins])


def write_fit_test(
    design: Any, parts: Sequence[Any], path: Path, tolerance: float
) -> Path:
    """Write the coupon of ``design`` as a binary STL (mm) at ``path``."""
    from .mesh import mesh_shape, write_stl

    solid = fit_test_solid(fit_test_plan(design, parts))
    return write_stl(mesh_shape(solid, tolerance, 30.0), path, "fit-test")
