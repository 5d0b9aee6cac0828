"""A found train as a train definition (TOML text) that ``wheelgen check`` loads.

Layout of the snippet: arbor ``input`` at the origin carries the first driver; each
stage's driven wheel sits on the next arbor (``lay1``, ``lay2``, ... then ``output``)
together with the next stage's driver. Stage ``i`` (from 1) works in the plane at
height ``2 + (i - 1) * (face_width + 1)`` mm, so on a compound arbor the driven wheel is
at ``h`` and the driver in front of it at ``h + face_width + 1``. Each mesh gets a
bearing (degrees) that places the next arbor; the bearing is picked from 15-degree
steps to keep every arbor shaft clear of the other arbors' wheels (tip circles).
An idler, when the train needs one, sits on its own arbor between the last driver and
the last driven wheel, in the last stage's plane.
"""

from __future__ import annotations

import math
import re
from fractions import Fraction

from .ratio_search import Train
from .ratio_target import RatioTarget

__all__ = ["train_snippet", "snippet_layout"]

_BASE_HEIGHT = 2.0  # mm above the back plate's inner face, as in our demo design
_SHAFT_DIAMETER = 3.0  # the format's default arbor diameter, mm
_BEARINGS = tuple(float(b) for b in range(0, 360, 15))


def _tip_radius(teeth: int, module: float) -> float:
    # standard unshifted wheel: d_a = m (z + 2) (ISO 21771 with the ISO 53 rack)
    return module * (teeth + 2) / 2


def snippet_layout(
    train: Train, module: float = 1.0
) -> list[tuple[str, str, tuple[float, float], float]]:
    """Meshes of the snippet in order: ``(first wheel, second wheel, xy of the second
    wheel's arbor in mm, bearing in degrees)``; wheels are named as in the snippet."""
    if module <= 0:
        raise ValueError(f"'module' must be positive, got {module}")
    chain = _chain(train)
    arbor_at: dict[str, tuple[float, float]] = {"input": (0.0, 0.0)}
    wheel_arbor = {w: a for w, a, _, _ in _wheels(train)}
    teeth = {w: z for w, _, z, _ in _wheels(train)}
    plane = {w: p for w, _, _, p in _wheels(train)}
    placed_wheels: list[str] = []
    out = []
    for first, second in chain:
        a_first, a_second = wheel_arbor[first], wheel_arbor[second]
        centre = module * (teeth[first] + teeth[second]) / 2
        x0, y0 = arbor_at[a_first]
        new_wheels = [w for w, a in wheel_arbor.items() if a == a_second]
        best: tuple[float, float, tuple[float, float]] | None = None
        for bearing in _BEARINGS:
            rad = math.radians(bearing)
            p = (x0 + centre * math.cos(rad), y0 + centre * math.sin(rad))
            clear = math.inf
            for w in placed_wheels + [first]:
                if w in (first,) or wheel_arbor[w] == a_second:
                    continue
                q = arbor_at[wheel_arbor[w]]
                gap = (
                    math.dist(p, q)
                    - _tip_radius(teeth[w], module)
                    - _SHAFT_DIAMETER / 2
                )
                clear = min(clear, gap)
            for a, q in arbor_at.items():
                if a == a_first:
                    continue
                for w in new_wheels:
                    gap = math.dist(p, q) - _tip_radius(teeth[w], module)
                    clear = min(clear, gap - _SHAFT_DIAMETER / 2)
            # wheels of other arbors in the same plane must not overlap the new ones
            for w in placed_wheels:
                if wheel_arbor[w] == a_first:
                    continue
                for n in new_wheels:
                    if plane[w] == plane[n]:
                        gap = (
                            math.dist(p, arbor_at[wheel_arbor[w]])
                            - _tip_radius(teeth[w], module)
                            - _tip_radius(teeth[n], module)
                        )
                        clear = min(clear, gap)
            if best is None or clear > best[0] + 1e-9:
                best = (clear, bearing, p)
        assert best is not None
        _, bearing, p = best
        arbor_at[a_second] = p
        placed_wheels += [w for w in (first, second) if w not in placed_wheels]
        placed_wheels += [w for w in new_wheels if w not in placed_wheels]
        out.append((first, second, p, bearing))
    return out


def _arbor_names(k: int) -> list[str]:
    return ["input"] + [f"lay{i}" for i in range(1, k)] + ["output"]


def _wheels(train: Train) -> list[tuple[str, str, int, int]]:
    """``(name, arbor, teeth, plane index)`` of every wheel."""
    arbors = _arbor_names(len(train.stages))
    out = []
    for i, (driver, driven) in enumerate(train.stages):
        out.append((f"driver{i + 1}", arbors[i], driver, i))
        out.append((f"driven{i + 1}", arbors[i + 1], driven, i))
    if train.idler is not None:
        out.append(("idler_wheel", "idler", train.idler, len(train.stages) - 1))
    return out


def _chain(train: Train) -> list[tuple[str, str]]:
    k = len(train.stages)
    pairs = [(f"driver{i}", f"driven{i}") for i in range(1, k + 1)]
    if train.idler is not None:
        pairs[-1] = (f"driver{k}", "idler_wheel")
        pairs.append(("idler_wheel", f"driven{k}"))
    return pairs


def _toml_string(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def train_snippet(
    train: Train,
    target: RatioTarget,
    tolerance_ppm: float,
    module: float = 1.0,
    face_width: float = 3.0,
    sense: str = "either",
    title: str | None = None,
) -> str:
    """The train as TOML text in the train format, ready for ``wheelgen check``.

    ``tolerance_ppm`` goes into the target (0 for an exact ratio); ``sense`` is the
    output's sense relative to the input, ``"same"``, ``"opposite"`` or ``"either"``
    (the drive turns ccw, so "same" becomes target sense "ccw"). Module and face width
    in mm.
    """
    if tolerance_ppm < 0:
        raise ValueError(f"'tolerance_ppm' must be at least 0, got {tolerance_ppm}")
    if face_width <= 0:
        raise ValueError(f"'face_width' must be positive, got {face_width}")
    target_sense = {"same": "ccw", "opposite": "cw", "either": "either"}.get(sense)
    if target_sense is None:
        raise ValueError(
            f"'sense' must be one of 'same', 'opposite', 'either', got {sense!r}"
        )
    stages = " x ".join(f"{a}/{b}" for a, b in train.stages)
    title = title or f"Train for {target.text}: {stages} = {train.ratio}"
    lines = [
        "# Written by wheelgen ratio. Ratio = turns of the output per turn of the",
        "# input = product of driver teeth / product of driven teeth.",
        "",
        "[design]",
        f"title = {_toml_string(title)}",
        "",
        "[defaults]",
        f"module = {module!r}",
        f"face_width = {face_width!r}",
        "",
        "[drive]",
        'arbor = "input"',
    ]
    if target.is_period:
        lines.append(f"period = {_toml_string(_period_text(target, 'input'))}")
    else:
        lines.append('period = "1 d"')
    lines.append('sense = "ccw"')
    layout = snippet_layout(train, module)
    arbors = _arbor_names(len(train.stages)) + (["idler"] if train.idler else [])
    for name in arbors:
        lines += ["", "[[arbor]]", f'name = "{name}"']
        if name == "input":
            lines.append("at = [0.0, 0.0]")
    pitch = face_width + 1.0
    for name, arbor, teeth, plane in _wheels(train):
        lines += [
            "",
            "[[wheel]]",
            f'name = "{name}"',
            f'arbor = "{arbor}"',
            f"teeth = {teeth}",
            f"height = {_BASE_HEIGHT + plane * pitch!r}",
        ]
    for first, second, _, bearing in layout:
        lines += [
            "",
            "[[mesh]]",
            f'pair = ["{first}", "{second}"]',
            f"bearing = {bearing!r}",
        ]
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
