"""A found train as a train definition (TOML text) that ``wheelgen check`` loads.

Names of the snippet: arbor ``input`` at the origin carries the first driver; each
stage's driven wheel sits on the next arbor (``lay1``, ``lay2``, ... then ``output``)
together with the next stage's driver; the wheels are ``driver1``, ``driven1``,
``driver2``, ... An idler, when the train needs one, sits on its own arbor ``idler``
between the last driver and the last driven wheel, in the last stage's plane. In a
coaxial train ``output`` is a sleeve round ``input``.

Where the arbors stand, the heights, the modules and any profile shift are a
:class:`TrainPlan`, made by :func:`wheelgen.checks.train_fit.plan_train`; this module
only names the parts and writes the text.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from fractions import Fraction

from .ratio_search import Train
from .ratio_target import RatioTarget

__all__ = [
    "PlannedArbor",
    "PlannedWheel",
    "PlannedMesh",
    "TrainPlan",
    "arbor_names",
    "train_wheels",
    "train_chain",
    "train_snippet",
]


@dataclass(frozen=True, slots=True)
class PlannedArbor:
    """An arbor of the snippet: at ``at`` (mm), or a sleeve ``around`` another, or
    placed by a mesh bearing (both ``None``)."""

    name: str
    at: tuple[float, float] | None = None
    around: str | None = None


@dataclass(frozen=True, slots=True)
class PlannedWheel:
    """A wheel of the snippet: teeth, back-face height (mm), module (mm), shift x."""

    name: str
    arbor: str
    teeth: int
    height: float
    module: float
    shift: float = 0.0


@dataclass(frozen=True, slots=True)
class PlannedMesh:
    """A mesh of the snippet; ``bearing_deg`` places the second arbor, or ``None``
    when both arbors are placed already (the centre distance is then checked)."""

    pair: tuple[str, str]
    bearing_deg: float | None


@dataclass(frozen=True, slots=True)
class TrainPlan:
    """Everything the snippet says about where the parts go (mm and degrees).

    ``module`` goes into ``[defaults]`` (wheels whose module differs carry their own);
    ``plates`` are the inner faces of the back and front plate. A train cut to a
    ``diametral_pitch`` (teeth per inch) has it in ``[defaults]`` instead of the
    module (which is then 25.4 / it for every wheel) and `units = "in"` in `[design]`;
    the lengths stay numbers of millimetres.
    """

    module: float
    face_width: float
    plates: tuple[float, float]
    arbors: tuple[PlannedArbor, ...]
    wheels: tuple[PlannedWheel, ...]
    meshes: tuple[PlannedMesh, ...]
    diametral_pitch: float | None = None


def arbor_names(train: Train) -> list[str]:
    """``input``, ``lay1`` ..., ``output`` and, if the train has one, ``idler``."""
    k = len(train.stages)
    names = ["input"] + [f"lay{i}" for i in range(1, k)] + ["output"]
    return names + (["idler"] if train.idler is not None else [])


def train_wheels(train: Train) -> list[tuple[str, str, int, int]]:
    """``(name, arbor, teeth, stage index from 0)`` of every wheel."""
    arbors = arbor_names(train)
    out = []
    for i, (driver, driven) in enumerate(train.stages):
        out.append((f"driver{i + 1}", arbors[i], driver, i))
        out.append((f"driven{i + 1}", arbors[i + 1], driven, i))
    if train.idler is not None:
        out.append(("idler_wheel", "idler", train.idler, len(train.stages) - 1))
    return out


def train_chain(train: Train) -> list[tuple[str, str]]:
    """The meshes in the order the motion passes: ``(first wheel, second wheel)``."""
    k = len(train.stages)
    pairs = [(f"driver{i}", f"driven{i}") for i in range(1, k + 1)]
    if train.idler is not None:
        pairs[-1] = (f"driver{k}", "idler_wheel")
        pairs.append(("idler_wheel", f"driven{k}"))
    return pairs


def _toml_string(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def _number(value: float) -> str:
    """A length or angle as the snippet writes it: shortest exact float text."""
    return repr(float(round(value, 9)) + 0.0)


def train_snippet(
    train: Train,
    plan: TrainPlan,
    target: RatioTarget | None = None,
    tolerance_ppm: float = 0.0,
    sense: str = "either",
    title: str | None = None,
) -> str:
    """The train as TOML text in the train format, ready for ``wheelgen check``.

    ``plan`` says where every part goes. ``target`` (with ``tolerance_ppm``, 0 for an
    exact ratio) becomes the output's ``[[target]]``; without it the snippet has none.
    ``sense`` is the output's sense relative to the input, ``"same"``, ``"opposite"``
    or ``"either"`` (the drive turns ccw, so "same" becomes target sense "ccw").
    """
    if tolerance_ppm < 0:
        raise ValueError(f"'tolerance_ppm' must be at least 0, got {tolerance_ppm}")
    target_sense = {"same": "ccw", "opposite": "cw", "either": "either"}.get(sense)
    if target_sense is None:
        raise ValueError(
            f"'sense' must be one of 'same', 'opposite', 'either', got {sense!r}"
        )
    stages = " x ".join(f"{a}/{b}" for a, b in train.stages)
    what = target.text if target is not None else str(train.ratio)
    title = title or f"Train for {what}: {stages} = {train.ratio}"
    lines = [
        "# Written by wheelgen ratio. Ratio = turns of the output per turn of the",
        "# input = product of driver teeth / product of driven teeth.",
        "",
        "[design]",
        f"title = {_toml_string(title)}",
        *(['units = "in"'] if plan.diametral_pitch is not None else []),
        "",
        "[defaults]",
        (
            f"module = {_number(plan.module)}"
            if plan.diametral_pitch is None
            else f"diametral_pitch = {_number(plan.diametral_pitch)}"
        ),
        f"face_width = {_number(plan.face_width)}",
        "",
        "[frame]",
        f"plates = [{_number(plan.plates[0])}, {_number(plan.plates[1])}]",
        "",
        "[drive]",
        'arbor = "input"',
    ]
    if target is not None and target.is_period:
        lines.append(f"period = {_toml_string(_period_text(target, 'input'))}")
    else:
        lines.append('period = "1 d"')
    lines.append('sense = "ccw"')
    for arbor in plan.arbors:
        lines += ["", "[[arbor]]", f"name = {_toml_string(arbor.name)}"]
        if arbor.at is not None:
            lines.append(f"at = [{_number(arbor.at[0])}, {_number(arbor.at[1])}]")
        if arbor.around is not None:
            lines.append(f"around = {_toml_string(arbor.around)}")
    for w in plan.wheels:
        lines += [
            "",
            "[[wheel]]",
            f"name = {_toml_string(w.name)}",
            f"arbor = {_toml_string(w.arbor)}",
            f"teeth = {w.teeth}",
            f"height = {_number(w.height)}",
        ]
        if w.module != plan.module:
            lines.append(f"module = {_number(w.module)}")
        if w.shift:
            lines.append(f"shift = {_number(w.shift)}")
    for mesh in plan.meshes:
        first, second = mesh.pair
        lines += [
            "",
            "[[mesh]]",
            f"pair = [{_toml_string(first)}, {_toml_string(second)}]",
        ]
        if mesh.bearing_deg is not None:
            lines.append(f"bearing = {_number(mesh.bearing_deg)}")
        else:
            lines.append("# both arbors are placed already: the distance is checked")
    if target is not None:
        lines += ["", "[[target]]", 'arbor = "output"']
        if target.is_period:
            lines.append(f"period = {_toml_string(_period_text(target, 'output'))}")
        else:
            lines.append(f'turns = "{target.value}"')
        lines.append(f'tolerance = "{float(tolerance_ppm)!r} ppm"')
        lines.append(f'sense = "{target_sense}"')
    return "\n".join(lines) + "\n"


def _period_text(target: RatioTarget, which: str) -> str:
    """The period as the user wrote it (``"27.321661 d per 365.2422 d"`` halves)."""
    halves = [h.strip() for h in re.split(r"\s+per\s+", target.text, flags=re.I)]
    if len(halves) == 2:
        return halves[0] if which == "output" else halves[1]
    seconds = target.output_period_s if which == "output" else target.input_period_s
    assert seconds is not None
    return f"{Fraction(seconds)} s"
