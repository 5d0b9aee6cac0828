"""The assembly order, replayed from assembly.csv alone.

Truth, outside the code under test: the replay below is its own model, written from
the parts' fields (derived: a part's frame has its back face at z = 0 along +Z, the
contract of ``wheelgen.layout.part_kinds``). Each step moves the part named, with every
part fitted onto it before (a made-up arbor), along its axis from the side its action
names, onto what its ``onto`` column names. On one axis, a moving length may pass a
fixed one only over it (the fixed length no larger across than the moving one's bore;
a square or hex bore over a seat of its shape at its size across flats) or through it
(the moving length no larger than the fixed one's bore: a plate's, a cock's or a
carrying wheel's hole). A plate stands on every axis, with a hole or without.
A wheel's outside is its tip diameter ``d_a = m (z + 2 h_a* + 2 x)`` (ISO 21771:2007).
"""

from __future__ import annotations

import csv
import io
import math
from dataclasses import dataclass
from pathlib import Path

import pytest

from tests._demo import DEMO_TEXT
from wheelgen.design import load_design, loads_design
from wheelgen.layout.part_kinds import (
    ArborPart,
    CockPart,
    CollarPart,
    DialPart,
    HandPart,
    KnobPart,
    PillarPart,
    PlatePart,
    ScrewPart,
    SleevePart,
    WheelPart,
)
from wheelgen.parts import plan_parts
from wheelgen.workshop.assembly import ASSEMBLY_COLUMNS, assembly_csv, assembly_writer

TOL = 1e-3
DATA = Path(__file__).parent / "data"
TWO_STAGE = DATA / "two_stage.toml"
CHECKS = DATA / "checks"


@dataclass(frozen=True)
class Length:
    """A length of a part on one axis: heights, outside and bore (mm)."""

    z0: float
    z1: float
    outside: float
    bore: float = 0.0
    bore_shape: str = "round"
    shape: str = "round"
    across: float = 0.0


def _tip(w: WheelPart) -> float:
    t = w.tooth
    shift = t.shift if t.form == "involute" else 0.0
    return t.module * (t.teeth + 2 * t.addendum + 2 * shift)  # ISO 21771


def _hole(holes, part, at) -> float | None:
    a = math.radians(part.placement.angle_deg)
    for x, y, d in holes:
        hx = part.placement.x + x * math.cos(a) - y * math.sin(a)
        hy = part.placement.y + x * math.sin(a) + y * math.cos(a)
        if math.hypot(hx - at[0], hy - at[1]) < 0.01:
            return d
    return None


def lengths(part, at: tuple[float, float]) -> list[Length]:
    """The part's lengths on the axis at ``at`` (none when it is not on it)."""
    z = part.placement.z
    on = math.hypot(part.placement.x - at[0], part.placement.y - at[1]) < 0.01
    if isinstance(part, PlatePart):
        d = next(
            (h.diameter for h in part.holes
             if math.hypot(h.x - at[0], h.y - at[1]) < 0.01), 0.0
        )  # fmt: skip
        return [Length(z, z + part.thickness, math.inf, d)]
    if isinstance(part, WheelPart):
        top = z + part.face_width + part.hub_length
        if on:
            return [Length(z, top, _tip(part), part.bore, part.seat)]
        d = _hole(part.holes, part, at)
        return [] if d is None else [Length(z, top, math.inf, d)]
    if isinstance(part, DialPart):
        disc = z + part.foot_length
        d = _hole(part.holes, part, at)
        if d is None and not on:
            return []
        return [Length(disc, disc + part.thickness, 2 * part.radius, d or 0.0)]
    if isinstance(part, CockPart):
        if not on:
            return []
        z0 = z + (0.0 if part.hanging else part.foot_height)
        return [Length(z0, z0 + part.thickness, part.width, part.pivot_hole)]
    if not on:
        return []
    if isinstance(part, (ArborPart, SleevePart)):
        bore = part.inside if isinstance(part, SleevePart) else 0.0
        return [
            Length(z + s.z0, z + s.z1, s.diameter, bore, shape=s.shape,
                   across=s.across)
            for s in part.sections
        ]  # fmt: skip
    if isinstance(part, CollarPart):
        return [Length(z, z + part.length, part.outside, part.inside)]
    if isinstance(part, HandPart):
        bore = part.across + 2 * part.clearance
        seat = part.seat if part.seat != "collet" else "round"
        reach = 2 * max(part.length, part.tail)
        out = [Length(z, z + part.thickness, reach, bore, seat)]
        if part.collet:
            top = z + part.thickness
            out.append(Length(top, top + part.collet_length, part.collet, bore))
        return out
    if isinstance(part, KnobPart):
        bore = part.across + 2 * part.clearance
        seat = part.seat if part.seat != "collet" else "round"
        return [Length(z, z + part.length, part.diameter, bore, seat)]
    if isinstance(part, PillarPart):
        # spigot, body, spigot; the tapped holes at the ends
        spans = []
        if part.spigot:
            spans.append((z, z + part.back_spigot, part.spigot))
        base = z + (part.back_spigot if part.spigot else 0.0)
        spans.append((base, base + part.length, part.diameter))
        if part.spigot:
            top = base + part.length
            spans.append((top, top + part.front_spigot, part.spigot))
        top = spans[-1][1]
        cuts = sorted({z, top, z + part.back_depth, top - part.front_depth}
                      | {a for a, _, _ in spans})  # fmt: skip
        out = []
        for a, b in zip(cuts, cuts[1:]):
            if b <= a or a < z or b > top:
                continue
            d = next(d for s0, s1, d in spans if s0 <= a < s1)
            bore = part.front_hole if a >= top - part.front_depth - TOL else 0.0
            if b <= z + part.back_depth + TOL:
                bore = part.back_hole
            out.append(Length(a, b, d, bore))
        return out
    if isinstance(part, ScrewPart):
        return [Length(z, z + part.length + part.head_height, part.core)]
    return []


def _passes(s: Length, t: Length) -> bool:
    """Whether moving length ``s`` may go past fixed length ``t`` on one axis."""
    over = t.across if t.shape == s.bore_shape and t.across else t.outside
    return over <= s.bore + TOL or s.outside <= t.bore + TOL


def _axis(part) -> tuple[float, float]:
    return (part.placement.x, part.placement.y)


def replay(design, parts, text: str) -> list[str]:
    """Every fault of the order in ``text``: a part passed over a larger one, a part
    named twice or never."""
    by = {p.name: p for p in parts}
    rows = list(csv.DictReader(io.StringIO(text)))
    faults = []
    seen = [r["part"] for r in rows]
    for name in by:
        if seen.count(name) != 1:
            faults.append(f"{name} in {seen.count(name)} steps")
    group: dict[str, set[str]] = {}  # each part -> the parts it is together with

    def together(name: str) -> set[str]:
        return group.setdefault(name, {name})

    for r in rows:
        name, onto, action = r["part"], r["onto"], r["action"]
        moving = together(name)
        if not onto:
            continue
        fixed = together(onto)
        if "from the front" in action:
            side = "front"
        elif "from the back" in action:
            side = "back"
        else:
            faults.append(f"step {r['step']}: no side in {action!r}")
            continue
        for m in moving:
            pm = by[m]
            if isinstance(pm, PlatePart):  # a plate moves over every axis it meets
                axes = {_axis(by[f]) for f in fixed if not isinstance(by[f], PlatePart)}
            else:
                axes = {_axis(pm)}
            for at in axes:
                for s in lengths(pm, at):
                    for f in fixed:
                        for t in lengths(by[f], at):
                            met = (
                                t.z1 > s.z0 + TOL if side == "front"
                                else t.z0 < s.z1 - TOL
                            )  # fmt: skip
                            if met and not _passes(s, t):
                                faults.append(
                                    f"step {r['step']}: {m} passes {f} at z "
                                    f"{t.z0:g}-{t.z1:g}"
                                )
        merged = moving | fixed
        for n in merged:
            group[n] = merged
    return faults


@pytest.fixture(scope="module")
def demo():
    design = loads_design(DEMO_TEXT, "demo.toml")
    parts = plan_parts(design)
    return design, parts, assembly_csv(design, parts)


def test_the_file_has_its_columns(demo) -> None:
    _, _, text = demo
    assert text.splitlines()[0] == ",".join(ASSEMBLY_COLUMNS)
    rows = list(csv.DictReader(io.StringIO(text)))
    assert [int(r["step"]) for r in rows] == list(range(1, len(rows) + 1))


@pytest.mark.parametrize(
    "which",
    [
        "demo",
        "two_stage.toml",
        # tubes nested three deep on a fixed stud whose wheel is at the front: the
        # tubes go on before that wheel
        "layout/epicyclic_nested.toml",
    ],
)
def test_every_part_once_and_never_over_a_larger_one(demo, which: str) -> None:
    if which == "demo":
        design, parts, text = demo
    else:
        design = load_design(DATA / which)
        parts = plan_parts(design)
        text = assembly_csv(design, parts)
    assert replay(design, parts, text) == []
    assert "no clear way" not in text


def test_the_replay_finds_a_wrong_order(demo) -> None:
    """The check can fail: a wheel fixed from the back after the collar behind it,
    or the hands before the dial, is caught."""
    design, parts, text = demo
    rows = text.splitlines()
    head, body = rows[0], rows[1:]
    dial = next(i for i, r in enumerate(body) if ",dial_main," in r)
    hand = next(i for i, r in enumerate(body) if ",hand_tide," in r)
    swapped = body[:]
    swapped[dial], swapped[hand] = body[hand], body[dial]
    faults = replay(design, parts, "\n".join([head, *swapped]) + "\n")
    assert any("dial_main passes hand_tide" in f for f in faults), faults
    # fixing the day wheel after the collar behind it
    wheel = next(i for i, r in enumerate(body) if ",day_wheel," in r)
    collar = next(i for i, r in enumerate(body) if ",collar_main," in r)
    swapped = body[:]
    swapped[wheel], swapped[collar] = body[collar], body[wheel]
    faults = replay(design, parts, "\n".join([head, *swapped]) + "\n")
    assert any("day_wheel passes collar_main" in f for f in faults), faults


def test_the_order_follows_the_stacking(demo) -> None:
    _, _, text = demo
    order = [r["part"] for r in csv.DictReader(io.StringIO(text))]
    step = {n: i for i, n in enumerate(order)}
    # the back plate first, the front plate after every arbor, the hands last but
    # the knob; a tube after the member it slides on
    assert order[0] == "back_plate"
    assert all(step["front_plate"] > step[a] for a in ("main", "lay", "moon_lay"))
    assert step["main"] < step["hours"] < step["tide"] < step["stud"]
    assert min(step[h] for h in ("hand_tide", "hand_hours")) > step["dial_main"]


def test_a_design_that_cannot_go_together_says_so() -> None:
    """Two wheels at one height on one axis (a design for the checks): no order."""
    design = load_design(CHECKS / "planet_good.toml")
    parts = plan_parts(design)
    text = assembly_csv(design, parts)
    assert "no clear way found" in text
    assert replay(design, parts, text) != [] or "no clear way found" in text


def test_the_build_writes_it(demo, tmp_path) -> None:
    design, parts, text = demo
    (path,) = assembly_writer(design, parts, [], tmp_path)
    assert path.name == "assembly.csv"
    assert path.read_text(encoding="utf-8") == text
