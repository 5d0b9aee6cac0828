"""Where a found train's arbors go, and whether it can be built as laid out (mm, deg).

The ratio search (:mod:`wheelgen.kinematics.ratio_search`) finds tooth counts; this
module gives each train a place on the plates and a verdict, so that the trains a
person is shown first are ones that can be built:

- Every arbor runs from the back plate to the front plate (the snippet has a
  ``[frame]``), stage ``i`` (from 0) works in the plane at height
  ``2 + i (face_width + 1)`` mm, an idler in the last stage's plane.
- An arbor placed by a mesh takes the bearing, in 15-degree steps, that leaves the
  most room between every tip circle and every other arbor's shaft and between the tip
  circles of wheels in one plane (greedy, from the input outwards; ties go to the
  smaller bearing).
- A coaxial train puts ``lay1`` at bearing 0 and ``output`` on a sleeve round
  ``input``; its second mesh has no bearing (its centre distance is checked). When
  the stages' centre distances differ, the shorter stage is opened to the longer one
  by a positive profile shift, split equally between its two wheels (common practice,
  no source), from ISO 21771's working centre distance
  (:func:`wheelgen.teeth.mesh_data.shift_for_centre_distance`).

The verdict is the layout check of ``wheelgen check`` itself, run on the design the
loader makes of the plan written as a train file (:func:`design_of`): every
error-level layout finding (a wheel that cuts another arbor, wheels of one plane that
collide, a tube too thin ...) is a reason the train does not fit.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, replace
from fractions import Fraction
from functools import lru_cache

import numpy as np

from ..design.diametral_pitch import module_of_dp
from ..design.loader import loads_design
from ..design.model import Design
from ..findings import Finding
from ..kinematics.ratio_search import Train
from ..kinematics.snippet import (
    PlannedArbor,
    PlannedMesh,
    PlannedWheel,
    TrainPlan,
    arbor_names,
    train_chain,
    train_snippet,
    train_wheels,
)
from ..layout.collisions import nominal_tip_radius
from ..layout.placement import working_centre_distance
from ..layout.train_layout import plan_layout
from ..teeth.mesh_data import shift_for_centre_distance, shifted_centre_distance
from ..teeth.spec import ToothSpec
from .layout_checks import layout_findings

__all__ = [
    "FACE_WIDTH",
    "BASE_HEIGHT",
    "SHAFT_DIAMETER",
    "PRESSURE_ANGLE_DEG",
    "design_of",
    "TrainFit",
    "plan_train",
    "fit_train",
    "shift_reach",
]

#: mm, face width of the snippet's wheels (the format's default).
FACE_WIDTH = 3.0
#: mm above the back plate's inner face of the first plane (as in the demo design).
BASE_HEIGHT = 2.0
#: Degrees, the train format's default pressure angle (the snippet sets no other).
PRESSURE_ANGLE_DEG = 20.0
#: mm, the format's default arbor diameter (used for the clearance of a bearing).
SHAFT_DIAMETER = 3.0
# mm, axial gap between the planes of two stages, and from the last wheel to the
# front plate's inner face
_PLANE_GAP = 1.0
_FRONT_GAP = 2.0
_BEARINGS = tuple(float(b) for b in range(0, 360, 15))
_DIRECTIONS = np.array(
    [(math.cos(math.radians(b)), math.sin(math.radians(b))) for b in _BEARINGS]
)
# decimals of a written profile shift: 1e-4 x moves a centre by about 1e-4 m, far
# below any centre tolerance of the format
_SHIFT_DECIMALS = 4


@dataclass(frozen=True, slots=True)
class TrainFit:
    """A train laid out: its ``plan``, the ``problems`` that stop it being built (the
    layout check's error findings; empty when it fits), the largest tip diameter and
    the width and height of the box round every tip circle (mm)."""

    train: Train
    plan: TrainPlan
    problems: tuple[Finding, ...]
    largest_diameter: float
    footprint: tuple[float, float]

    @property
    def fits(self) -> bool:
        return not self.problems

    @property
    def shifts(self) -> tuple[tuple[str, float], ...]:
        """``(wheel, profile shift x)`` of every shifted wheel."""
        return tuple((w.name, w.shift) for w in self.plan.wheels if w.shift)


def shift_reach(max_shift: float) -> Callable[[int, Fraction], float]:
    """``reach(tooth_sum, module)`` for a coaxial search (``Coaxial.reach``).

    The centre distance (mm) a stage of that tooth sum reaches with the profile-shift
    sum ``x1 + x2 = max_shift`` (ISO 21771: ``a = m (z1 + z2) / 2 cos a / cos a_w``).
    """
    # the train format allows a shift of up to 2 on each of the two wheels
    if not 0 <= max_shift <= 4:
        raise ValueError(f"'max_shift' must be 0 to 4, got {max_shift}")

    def reach(tooth_sum: int, module: Fraction) -> float:
        half = tooth_sum // 2
        return shifted_centre_distance(
            half, tooth_sum - half, float(module), max_shift, 0.0, PRESSURE_ANGLE_DEG
        )

    return reach


def _stage_shifts(train: Train, modules: tuple[float, ...]) -> dict[int, float]:
    """Stage index -> shift of each of its two wheels (coaxial trains that need it)."""
    if train.centre is None:
        return {}
    sums = [a + b for a, b in train.stages]
    centres = [Fraction(str(modules[i])) * sums[i] / 2 for i in range(2)]
    if max(centres) != train.centre or abs(centres[0] - centres[1]) != train.spread:
        raise ValueError(
            f"modules {modules} give centre distances of {float(centres[0]):g} and "
            f"{float(centres[1]):g} mm, not the train's {float(train.centre):g} mm"
        )
    if centres[0] == centres[1]:
        return {}
    opened = 0 if centres[0] < centres[1] else 1
    a, b = train.stages[opened]
    total = shift_for_centre_distance(
        a, b, modules[opened], float(train.centre), PRESSURE_ANGLE_DEG
    )
    return {opened: round(total / 2, _SHIFT_DECIMALS)}


def _spec(teeth: int, module: float, shift: float) -> ToothSpec:
    return ToothSpec(teeth=teeth, module=module, shift=shift)


def plan_train(
    train: Train,
    modules: tuple[float, ...] | float = 1.0,
    face_width: float = FACE_WIDTH,
    diametral_pitch: float | None = None,
) -> TrainPlan:
    """Heights, modules, profile shifts, arbors and mesh bearings of ``train``.

    ``modules`` in mm: one for every stage, or a tuple with one per stage (the idler
    takes the last stage's). A train cut to a ``diametral_pitch`` (teeth per inch)
    has the module 25.4 / it on every stage. See the module docstring for the rules.
    """
    if diametral_pitch is not None:
        modules = module_of_dp(diametral_pitch)
    k = len(train.stages)
    if isinstance(modules, (int, float)):
        modules = (float(modules),) * k
    if len(modules) != k or any(not (m > 0 and math.isfinite(m)) for m in modules):
        raise ValueError(f"need {k} positive modules, got {modules}")
    if not (face_width > 0 and math.isfinite(face_width)):
        raise ValueError(f"'face_width' must be positive, got {face_width}")
    pitch = face_width + _PLANE_GAP
    shifts = _stage_shifts(train, modules)
    wheels = tuple(
        PlannedWheel(
            name,
            arbor,
            teeth,
            BASE_HEIGHT + stage * pitch,
            float(modules[stage]),
            shifts.get(stage, 0.0) if name != "idler_wheel" else 0.0,
        )
        for name, arbor, teeth, stage in train_wheels(train)
    )
    front = BASE_HEIGHT + (k - 1) * pitch + face_width + _FRONT_GAP
    arbors: tuple[PlannedArbor, ...]
    meshes: tuple[PlannedMesh, ...]
    if train.coaxial:
        arbors = (
            PlannedArbor("input", at=(0.0, 0.0)),
            PlannedArbor("lay1"),
            PlannedArbor("output", around="input"),
        )
        meshes = (
            PlannedMesh(("driver1", "driven1"), 0.0),
            PlannedMesh(("driver2", "driven2"), None),
        )
    else:
        arbors = tuple(
            PlannedArbor(n, at=(0.0, 0.0) if n == "input" else None)
            for n in arbor_names(train)
        )
        meshes = _bearings(train, wheels)
    return TrainPlan(
        float(modules[0]),
        face_width,
        (0.0, front),
        arbors,
        wheels,
        meshes,
        diametral_pitch,
    )


def _bearings(
    train: Train, wheels: tuple[PlannedWheel, ...]
) -> tuple[PlannedMesh, ...]:
    """Greedy bearings: each new arbor where it leaves the most room (tip circles)."""
    by_name = {w.name: w for w in wheels}
    tip = {
        w.name: nominal_tip_radius(_spec(w.teeth, w.module, w.shift)) for w in wheels
    }
    shaft = SHAFT_DIAMETER / 2
    at: dict[str, tuple[float, float]] = {"input": (0.0, 0.0)}
    meshing = {frozenset(pair) for pair in train_chain(train)}
    out = []
    for first, second in train_chain(train):
        w1, w2 = by_name[first], by_name[second]
        centre = working_centre_distance(
            _spec(w1.teeth, w1.module, w1.shift), _spec(w2.teeth, w2.module, w2.shift)
        )
        placed = [w for w in wheels if w.arbor in at]
        new = [w for w in wheels if w.arbor == w2.arbor]
        points = np.array(at[w1.arbor]) + centre * _DIRECTIONS  # one row per bearing
        # every placed wheel against the new shaft; every new wheel against the placed
        # shafts; wheels in one plane that do not mesh against each other
        room = _room(
            points, [at[w.arbor] for w in placed], [tip[w.name] + shaft for w in placed]
        )
        for n in new:
            room = np.minimum(
                room, _room(points, list(at.values()), [tip[n.name] + shaft] * len(at))
            )
            same = [
                w
                for w in placed
                if w.height == n.height and frozenset((w.name, n.name)) not in meshing
            ]
            room = np.minimum(
                room,
                _room(
                    points,
                    [at[w.arbor] for w in same],
                    [tip[w.name] + tip[n.name] for w in same],
                ),
            )
        # the most room; ties (within 1e-9 mm) go to the smaller bearing
        pick = int(np.argmax(room >= room.max() - 1e-9))
        at[w2.arbor] = (float(points[pick, 0]), float(points[pick, 1]))
        out.append(PlannedMesh((first, second), _BEARINGS[pick]))
    return tuple(out)


def _room(
    points: np.ndarray, centres: list[tuple[float, float]], radii: list[float]
) -> np.ndarray:
    """Per candidate point: the least ``distance - radius`` to the circles (mm)."""
    if not centres:
        return np.full(len(points), np.inf)
    offsets = points[:, None, :] - np.array(centres)[None, :, :]
    gaps = np.hypot(offsets[..., 0], offsets[..., 1]) - np.array(radii)[None]
    return np.asarray(gaps.min(axis=1))


def _shape(plan: TrainPlan) -> TrainPlan:
    """The plan with every number set to one value: its shape, read once."""
    return replace(
        plan,
        module=1.0,
        plates=(0.0, 40.0),
        wheels=tuple(
            replace(w, teeth=20, height=0.0, module=1.0, shift=0.0) for w in plan.wheels
        ),
        meshes=tuple(
            m if m.bearing_deg is None else replace(m, bearing_deg=0.0)
            for m in plan.meshes
        ),
    )


@lru_cache(maxsize=32)
def _template(shape: TrainPlan) -> Design:
    # the title is all the snippet takes from the train itself
    any_train = Train(((20, 20),), Fraction(1), Fraction(0))
    return loads_design(train_snippet(any_train, shape), "<train>")


def design_of(plan: TrainPlan) -> Design:
    """The design ``wheelgen check`` reads from ``train_snippet(train, plan)``.

    The loader reads one train of each shape (names, arbors, which meshes carry a
    bearing); the numbers of every other train of that shape (teeth, heights, modules,
    shifts, bearings, plates) are put into that design, which is what the loader makes
    of them, at a fraction of the cost of writing and reading the text (the tests
    compare the two). Only the title differs.
    """
    template = _template(_shape(plan))
    planned = {w.name: w for w in plan.wheels}
    bearings = {m.pair: m.bearing_deg for m in plan.meshes}
    assert template.frame is not None
    wheels = []
    for w in template.wheels:
        p = planned[w.name]
        wheels.append(
            replace(w, teeth=p.teeth, height=p.height, module=p.module, shift=p.shift)
        )
    return replace(
        template,
        wheels=tuple(wheels),
        meshes=tuple(replace(m, bearing_deg=bearings[m.pair]) for m in template.meshes),
        frame=replace(template.frame, plates=plan.plates),
    )


def fit_train(
    train: Train,
    modules: tuple[float, ...] | float = 1.0,
    face_width: float = FACE_WIDTH,
    diametral_pitch: float | None = None,
) -> TrainFit:
    """Lay ``train`` out (:func:`plan_train`) and run the layout check on it."""
    plan = plan_train(train, modules, face_width, diametral_pitch)
    design = design_of(plan)
    problems = tuple(f for f in layout_findings(design, None) if f.level == "error")
    layout = plan_layout(design)
    # an arbor with a wheel across its way to a plate can only be held by the other
    # plate and a cock: the trains offered run every arbor from plate to plate
    problems += tuple(
        Finding(
            "error",
            "layout.cuts_arbor",
            f"arbor {arbor} / wheel {wheel}",
            f"wheel {wheel} covers arbor {arbor} by {depth:.3f} mm on the arbor's way"
            f" to the {plate} plate, so the arbor cannot run from plate to plate",
            f"{depth:.3f} mm",
            "0 mm",
        )
        for arbor, plate, wheel, depth in layout.stacking.barred
    )
    radii = []
    for w in plan.wheels:
        pos = layout.position(w.arbor)
        r = nominal_tip_radius(_spec(w.teeth, w.module, w.shift))
        if pos is not None:
            radii.append((pos, r))
    xs = [p[0] + s * r for p, r in radii for s in (-1, 1)]
    ys = [p[1] + s * r for p, r in radii for s in (-1, 1)]
    largest = 2 * max(r for _, r in radii)
    return TrainFit(
        train, plan, problems, largest, (max(xs) - min(xs), max(ys) - min(ys))
    )
