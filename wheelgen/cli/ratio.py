"""``wheelgen ratio``: tooth counts for a wanted ratio (exhaustive search)."""

from __future__ import annotations

import re
import sys
from fractions import Fraction
from pathlib import Path

import click

from ..kinematics.continued_fraction import prime_factors
from ..kinematics.ratio_search import (
    MAX_STAGES,
    Limits,
    Relaxation,
    Train,
    exact_trains,
    relaxations,
    search_trains,
    teeth_for_diameter,
)
from ..kinematics.ratio_target import RatioTarget, parse_target
from ..kinematics.snippet import train_snippet
from ._common import EXIT_FINDINGS, EXIT_OK, echo_json, fail

__all__ = ["ratio_command", "DEFAULT_TOLERANCE_PPM"]

#: Default tolerance for decimal and period targets, ppm (exact targets: 0).
DEFAULT_TOLERANCE_PPM = 100.0
#: Exact trains counted at most, so a rich target does not take long to count.
_EXACT_COUNT_CAP = 1000

_RANGE = re.compile(r"^\s*(\d+)\s*(?:-|\.\.)\s*(\d+)\s*$")
_TOLERANCE = re.compile(r"^\s*(\d+(?:\.\d*)?|\.\d+)(?:[eE]([+-]?\d+))?\s*(?:ppm)?\s*$")


def _tooth_range(text: str, what: str) -> tuple[int, int]:
    m = _RANGE.match(text)
    if m is None:
        raise click.BadParameter(
            f"{text!r} is not MIN-MAX (e.g. 12-120)", param_hint=what
        )
    lo, hi = int(m.group(1)), int(m.group(2))
    if lo < 1 or hi < lo:
        raise click.BadParameter(f"{text!r}: need 1 <= MIN <= MAX", param_hint=what)
    return lo, hi


def _tolerance_ppm(text: str) -> Fraction:
    m = _TOLERANCE.match(text)
    if m is None:
        raise click.BadParameter(
            f'{text!r} is not a tolerance; write e.g. 10ppm, "2.5 ppm" or 0',
            param_hint="--tolerance",
        )
    return Fraction(text.strip().lower().removesuffix("ppm").strip())


def _stages_text(train: Train) -> str:
    text = " x ".join(f"{a}/{b}" for a, b in train.stages)
    if train.idler is not None:
        text += f" + idler {train.idler}"
    return text


def _candidate(train: Train, target: RatioTarget, tol: Fraction) -> dict[str, object]:
    row: dict[str, object] = {
        "stages": [[a, b] for a, b in train.stages],
        "ratio": str(train.ratio),
        "error_ppm": train.error_ppm,
        "idler": train.idler,
        "wheels": train.wheels,
        "teeth_total": train.teeth_total,
        "reverses": train.reverses,
        "within_tolerance": abs(train.error) * 10**6 <= tol,
    }
    drift = target.drift_deg_per_yr(train.ratio)
    if drift is not None:
        row["drift_deg_per_yr"] = drift
    return row


def _advice(
    rel: list[Relaxation], limits: Limits, module: float, diameter_bound: bool
) -> list[str]:
    lines = []
    for r in rel:
        if r.limit == "simplest":
            f = r.value
            assert isinstance(f, Fraction)
            line = (
                f"the simplest ratio within tolerance is {f} = "
                f"{_factor_text(f.numerator)} / {_factor_text(f.denominator)}"
            )
            lines.append(line + (f"; {r.note}" if r.note else ""))
        elif r.limit == "stages":
            lines.append(f"allow {r.value} stages (--stages {r.value})")
        elif r.limit == "teeth_max":
            hint = (
                f"raise the largest tooth count to {r.value} "
                f"(--teeth {limits.teeth[0]}-{r.value})"
            )
            if diameter_bound and isinstance(r.value, int):
                need = module * (r.value + 2)
                hint += f"; at module {module:g} that needs --max-diameter {need:g} mm"
            lines.append(hint)
        elif r.limit == "max_teeth_total":
            lines.append(f"raise the tooth total to {r.value} (--max-total {r.value})")
        elif r.limit == "sense":
            lines.append("allow either sense of the output (--sense either)")
    if not any(r.limit != "simplest" for r in rel):
        lines.append(
            "no single limit tried (one more stage, a wider tooth range, "
            "no tooth total, either sense) reaches it alone; relax several "
            "together, or the tolerance"
        )
    return lines


def _factor_text(n: int) -> str:
    f = prime_factors(n)
    if not f:
        return "1"
    return "·".join(f"{p}^{e}" if e > 1 else str(p) for p, e in f.items())


@click.command("ratio")
@click.argument("target", nargs=-1, required=True)
@click.option(
    "--teeth",
    "teeth_text",
    default="10-120",
    show_default=True,
    help="Tooth counts allowed, MIN-MAX, for every wheel.",
)
@click.option(
    "--stage-teeth",
    "stage_texts",
    multiple=True,
    metavar="MIN-MAX",
    help="Range for stage 1, 2, ... (repeat in order); within --teeth.",
)
@click.option(
    "--stages",
    type=click.IntRange(1, MAX_STAGES),
    default=3,
    show_default=True,
    help="Largest number of stages (driver + driven each); 1 to N are tried.",
)
@click.option(
    "--module",
    type=float,
    default=1.0,
    show_default=True,
    help="Module in mm, for --max-diameter and --write.",
)
@click.option(
    "--max-diameter",
    type=float,
    default=None,
    help="Largest tip diameter m(z+2) in mm; limits the tooth counts.",
)
@click.option(
    "--max-total",
    type=click.IntRange(2),
    default=None,
    help="Largest sum of all tooth counts (idler included).",
)
@click.option(
    "--sense",
    type=click.Choice(["same", "opposite", "either"]),
    default="either",
    show_default=True,
    help="Output sense relative to the input; an idler is added if needed.",
)
@click.option(
    "--tolerance",
    "tolerance_text",
    default=None,
    help="Largest period error, e.g. 10ppm. Default: 0 (exact) for a "
    "fraction target, 100ppm otherwise.",
)
@click.option(
    "--top",
    type=click.IntRange(1),
    default=10,
    show_default=True,
    help="How many trains to show.",
)
@click.option(
    "--all-pairings",
    is_flag=True,
    help="Show every pairing of the same wheels, not only the most compact.",
)
@click.option(
    "--json", "as_json", is_flag=True, help="Print a JSON list of candidates."
)
@click.option(
    "--write",
    "write_path",
    type=click.Path(dir_okay=False),
    default=None,
    help="Write the best train as a train file for 'wheelgen check'.",
)
def ratio_command(
    target: tuple[str, ...],
    teeth_text: str,
    stage_texts: tuple[str, ...],
    stages: int,
    module: float,
    max_diameter: float | None,
    max_total: int | None,
    sense: str,
    tolerance_text: str | None,
    top: int,
    all_pairings: bool,
    as_json: bool,
    write_path: str | None,
) -> None:
    """Find tooth counts for TARGET: the best trains of 1 to --stages stages.

    \b
    TARGET is one of
      254/19                      an exact ratio (every exact train is listed first)
      13.36842                    a measured ratio: the closest trains
      "27.321661 d per 365.2422 d"
                                  output period per input period
                                  (units s, min, h, d, yr)

    The ratio is turns of the output per turn of the input = product of the driver
    teeth / product of the driven teeth. The error is that of the output's period
    (as 'wheelgen check' reports it), in ppm; period targets also show the drift in
    degrees per year (365.25 d). The search is exhaustive within the limits.

    Exit status: 0 a train is within the tolerance, 1 none is (the closest and the
    limit to relax are shown), 2 the input cannot be used.
    """
    try:
        goal = parse_target(" ".join(target))
    except ValueError as exc:
        fail(str(exc))
    if module <= 0:
        fail(f"--module must be positive, got {module:g}")
    teeth = _tooth_range(teeth_text, "--teeth")
    diameter_bound = False
    if max_diameter is not None:
        try:
            z_max = teeth_for_diameter(module, max_diameter)
        except ValueError as exc:
            fail(str(exc))
        if z_max < teeth[0]:
            fail(
                f"--max-diameter {max_diameter:g} mm at module {module:g} allows "
                "at most "
                f"{z_max} teeth, below the smallest count {teeth[0]}"
            )
        if z_max < teeth[1]:
            teeth, diameter_bound = (teeth[0], z_max), True
    stage_teeth = tuple(_tooth_range(t, "--stage-teeth") for t in stage_texts)
    if tolerance_text is None:
        tol_ppm = Fraction(0) if goal.exact else Fraction(DEFAULT_TOLERANCE_PPM)
    else:
        tol_ppm = _tolerance_ppm(tolerance_text)
    tol = tol_ppm / 10**6
    try:
        limits = Limits(teeth, stages, stage_teeth, max_total, sense)  # type: ignore[arg-type]  # click.Choice
        found = search_trains(goal.value, limits, top, one_pairing=not all_pairings)
        exact = (
            exact_trains(
                goal.value, limits, _EXACT_COUNT_CAP, one_pairing=not all_pairings
            )
            if goal.exact
            else []
        )
    except ValueError as exc:
        fail(str(exc))
    ok = bool(found) and abs(found[0].error) <= tol
    if as_json:
        echo_json([_candidate(t, goal, tol_ppm) for t in found])
    else:
        _print_table(goal, limits, found, exact, tol_ppm, diameter_bound)
    if not found:
        click.echo(
            "wheelgen: no train fits these limits at all (check --max-total and "
            "--stage-teeth)",
            err=True,
        )
        sys.exit(EXIT_FINDINGS)
    if not ok:
        best = found[0]
        click.echo(
            f"wheelgen: nothing within {float(tol_ppm):g} ppm; the closest is "
            f"{_stages_text(best)} = {best.ratio} ({best.error_ppm:+.4g} ppm). "
            "To get within the tolerance:",
            err=True,
        )
        try:
            rel = relaxations(goal.value, limits, tol)
        except ValueError as exc:
            fail(str(exc))
        for line in _advice(rel, limits, module, diameter_bound):
            click.echo(f"  - {line}", err=True)
        click.echo(
            f"  - or accept the closest: --tolerance {abs(best.error_ppm):.4g}ppm",
            err=True,
        )
        if write_path is not None:
            click.echo(
                f"wheelgen: {write_path} not written (nothing within tolerance)",
                err=True,
            )
        sys.exit(EXIT_FINDINGS)
    if write_path is not None:
        text = train_snippet(found[0], goal, float(tol_ppm), module=module, sense=sense)
        try:
            Path(write_path).write_text(text, encoding="utf-8")
        except OSError as exc:
            fail(f"cannot write {write_path}: {exc.strerror}")
        if not as_json:
            click.echo(
                f"wrote {write_path} (check it with: wheelgen check {write_path})"
            )
    sys.exit(EXIT_OK)


def _print_table(
    goal: RatioTarget,
    limits: Limits,
    found: list[Train],
    exact: list[Train],
    tol_ppm: Fraction,
    diameter_bound: bool,
) -> None:
    kind = "exact" if goal.exact else "measured"
    click.echo(
        f"target {goal.text} = {float(goal.value):.10g} ({kind}), "
        "ratio = output turns per input turn = driver teeth / driven teeth"
    )
    bound = " (from --max-diameter)" if diameter_bound else ""
    click.echo(
        f"teeth {limits.teeth[0]}-{limits.teeth[1]}{bound}, 1 to {limits.stages} "
        f"stages, sense {limits.sense}, tolerance {float(tol_ppm):g} ppm"
    )
    if goal.exact:
        if exact:
            more = "+" if len(exact) >= _EXACT_COUNT_CAP else ""
            click.echo(f"exact trains in range: {len(exact)}{more}")
        else:
            click.echo(
                "exact trains in range: none" + _why_not_exact(goal.value, limits)
            )
    click.echo("")
    drift = goal.is_period
    head = f"{'#':>3}  {'stages (driver/driven)':<36} {'ratio':>22} {'error ppm':>12}"
    if drift:
        head += f" {'deg/yr':>10}"
    click.echo(head + f" {'wheels':>6} {'teeth':>6}")
    for n, t in enumerate(found, 1):
        line = f"{n:>3}  {_stages_text(t):<36} {str(t.ratio):>22} {t.error_ppm:>+12.5g}"
        if drift:
            line += f" {goal.drift_deg_per_yr(t.ratio):>+10.4g}"
        click.echo(line + f" {t.wheels:>6} {t.teeth_total:>6}")


def _why_not_exact(value: Fraction, limits: Limits) -> str:
    primes = [*prime_factors(value.numerator), *prime_factors(value.denominator)]
    big = [p for p in primes if p > limits.teeth[1]]
    if big:
        return (
            f" ({value} has the prime factor {max(big)}, above the largest tooth "
            f"count {limits.teeth[1]})"
        )
    return ""
