"""``wheelgen index``: dividing-head settings for a count of divisions or an angle."""

from __future__ import annotations

from fractions import Fraction

import click

from ..workshop.indexing import AngleSetting, IndexPlan, angle_setting, indexing_plan
from ..workshop.plates import DEFAULT_PLATES, PLATE_SETS, gear_set, plate_set
from ._common import EXIT_FINDINGS, EXIT_OK, echo_json, fail
from ._options import Bounded

__all__ = ["index_command"]


def _turns_text(value: Fraction) -> str:
    whole, rest = divmod(value, 1)
    if rest == 0:
        return f"{whole} turn{'s' if whole != 1 else ''}"
    if whole == 0:
        return f"{rest} turn"
    return f"{whole} {rest} turns"


def _setting_lines(
    turns: int, holes: int, circle: int | None, others: tuple[tuple[int, int], ...],
    crank: Fraction,
) -> list[str]:  # fmt: skip
    if circle is None:
        return [
            f"Per division: {_turns_text(crank)} of the crank, whole turns only "
            "(any circle; the sector arms are not needed)."
        ]
    whole = f"{turns} whole turn{'s' if turns != 1 else ''} + " if turns else ""
    lines = [
        f"Per division: {whole}{holes} hole spaces on the {circle}-hole circle "
        f"({_turns_text(crank)} of the crank).",
        f"Set the sector arms to take in {holes + 1} holes ({holes} spaces).",
    ]
    if others:
        listed = ", ".join(f"{h} on the {c}" for h, c in others)
        lines.append(f"Or, same motion: {listed} circle.")
    return lines


def _plan_lines(plan: IndexPlan) -> list[str]:
    head = f"{plan.teeth} divisions on a {plan.ratio}:1 head"
    if plan.method == "none":
        return [
            f"{head}: no indexing found with these plates and gears.",
            f"Would make it possible: {plan.suggestion}.",
        ]
    if plan.method == "simple":
        return [f"{head}: simple indexing, index plate locked."] + _setting_lines(
            plan.turns, plan.holes, plan.circle, plan.other_circles, plan.crank_turns
        )
    gears = plan.gears
    assert gears is not None and plan.approx_count is not None  # differential
    lines = [
        f"{head}: differential indexing ({plan.teeth} does not index simply "
        "on these plates).",
        f"Set the crank as for {plan.approx_count} divisions.",
    ]
    lines += _setting_lines(
        plan.turns, plan.holes, plan.circle, plan.other_circles, plan.crank_turns
    )
    lines.append(
        "Unlock the index plate (plate stop pin out): the change gears turn it "
        "from the spindle."
    )
    magnitude = abs(gears.ratio)
    if gears.compound:
        a, b, c, d = gears.order
        lines.append(
            f"Gears: spindle {a} drives {b} on the stud; {c} on the stud drives {d} "
            f"on the plate shaft (compound train, {magnitude} plate turns per "
            "spindle turn)."
        )
    else:
        a, d = gears.order
        lines.append(
            f"Gears: spindle {a} drives {d} on the plate shaft (simple train, "
            f"{magnitude} plate turns per spindle turn)."
        )
    train = "compound" if gears.compound else "simple"
    lines.append(
        f"Plate turns {gears.plate_words} the crank: {gears.idlers} "
        f"idler{'s' if gears.idlers != 1 else ''} in the {train} train on a typical "
        "head (from memory; if the plate turns the other way, add or remove one idler)."
    )
    # The exact proof a machinist can redo by hand: the crank moves x on the plate,
    # the plate g per spindle turn, so the work turns x / (ratio - g).
    lines.append(
        f"Check: ({plan.crank_turns}) / ({plan.ratio} - ({gears.ratio})) = "
        f"1/{plan.teeth} turn of the work per division, exactly."
    )
    lines.append("Turn the crank one way only and take up backlash before each cut.")
    return lines


def _degrees_text(angle: Fraction) -> str:
    # A decimal when it ends (35.5), otherwise the exact fraction (100/3).
    rest = angle.denominator
    for prime in (2, 5):
        while rest % prime == 0:
            rest //= prime
    return f"{float(angle):g}" if rest == 1 else str(angle)


def _angle_lines(setting: AngleSetting) -> list[str]:
    head = f"{_degrees_text(setting.angle_deg)} degrees on a {setting.ratio}:1 head"
    if not setting.found:
        return [
            f"{head}: no circle on these plates gives it.",
            f"Would make it possible: {setting.suggestion}.",
        ]
    lines = _setting_lines(
        setting.turns, setting.holes, setting.circle, setting.other_circles,
        setting.crank_turns,
    )  # fmt: skip
    lines[0] = lines[0].replace("Per division", "Per move", 1)
    return [f"{head}: index plate locked."] + lines


def _angle_dict(setting: AngleSetting) -> dict[str, object]:
    return {
        "angle_deg": str(setting.angle_deg),
        "ratio": setting.ratio,
        "method": "simple" if setting.found else "none",
        "turns": setting.turns,
        "holes": setting.holes,
        "circle": setting.circle,
        "crank_turns": str(setting.crank_turns),
        "other_circles": [list(pair) for pair in setting.other_circles],
        "suggestion": setting.suggestion or None,
        "suggested_circle": setting.suggested_circle,
    }


_PLATE_HELP = (
    "Hole circles: "
    + ", ".join(f"'{name}'" for name in PLATE_SETS)
    + " or a list like '15,16,17'."
)


@click.command("index")
@click.argument("teeth", type=Bounded("option.index.divisions"), required=False)
@click.option(
    "--ratio",
    type=Bounded("option.index.ratio"),
    default=40,
    show_default=True,
    help="Worm ratio of the head.",
)
@click.option("--plates", default=DEFAULT_PLATES, show_default=True, help=_PLATE_HELP)
@click.option(
    "--gears",
    default="standard",
    show_default=True,
    help="Change gears owned, e.g. '24,24,28,32' (a count twice = two gears); "
    "'none' for simple indexing only.",
)
@click.option(
    "--angle", "angle", default=None, help="Degrees to turn the work, instead of TEETH."
)
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object.")
@click.pass_context
def index_command(
    ctx: click.Context,
    teeth: int | None,
    ratio: int,
    plates: str,
    gears: str,
    angle: str | None,
    as_json: bool,
) -> None:
    """Dividing-head settings for TEETH equal divisions (or --angle degrees).

    Simple indexing where the plates allow it, otherwise differential indexing with
    the change gears. Exit 0 found, 1 nothing possible (a suggestion is printed),
    2 bad input.
    """
    try:
        if (teeth is None) == (angle is None):
            raise ValueError(
                "give either TEETH or --angle DEGREES, not both or neither"
            )
        circles = plate_set(plates)
        owned = gear_set(gears)
        if angle is not None:
            result: IndexPlan | AngleSetting = angle_setting(angle, ratio, circles)
        else:
            assert teeth is not None  # checked above
            result = indexing_plan(teeth, ratio, circles, owned)
    except ValueError as exc:
        fail(str(exc))
    if isinstance(result, IndexPlan):
        found = result.method != "none"
        data = result.as_dict()
        lines = _plan_lines(result)
    else:
        found = result.found
        data = _angle_dict(result)
        lines = _angle_lines(result)
    if as_json:
        data["plates"] = list(circles)
        echo_json(data)
    else:
        click.echo("\n".join(lines))
    ctx.exit(EXIT_OK if found else EXIT_FINDINGS)
