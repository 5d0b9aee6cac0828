"""``wheelgen ratio``: tooth counts for a wanted ratio (exhaustive search)."""

from __future__ import annotations

import math
import re
import sys
from dataclasses import replace
from fractions import Fraction
from pathlib import Path

import click

from ..checks import analyse
from ..checks.train_fit import TrainFit, fit_train, shift_reach
from ..design.diametral_pitch import module_of_dp
from ..design.loader import loads_design
from ..design.train_tables import MAX_TEETH, MIN_TEETH
from ..design.units import MM, UNITS, Lengths, Units
from ..kinematics.continued_fraction import prime_factors
from ..kinematics.ratio_search import (
    MAX_HEAD_RATIO,
    MAX_MODULE,
    MAX_SHIFT_SUM,
    MAX_STAGES,
    MAX_TOLERANCE_PPM,
    MAX_TOP,
    MIN_MODULE,
    SEARCH_TIME_BUDGET_S,
    Coaxial,
    Limits,
    Relaxation,
    SearchTooLarge,
    Sense,
    Teeth,
    Train,
    duration_text,
    exact_trains,
    relaxations,
    search_cost,
    search_trains,
    teeth_for_diameter,
)
from ..kinematics.ratio_target import RatioTarget, parse_target
from ..kinematics.snippet import train_snippet
from ..workshop.indexing import crank_settings
from ..workshop.plates import PLATE_SETS, plate_set
from ._common import EXIT_FINDINGS, EXIT_OK, echo_json, fail
from ._options import Bounded, Length

__all__ = ["ratio_command", "DEFAULT_TOLERANCE_PPM", "parse_teeth"]

#: Default tolerance for decimal and period targets, ppm (exact targets: 0).
DEFAULT_TOLERANCE_PPM = 100.0
#: Exact trains counted at most, so a rich target does not take long to count.
_EXACT_COUNT_CAP = 1000
#: Trains looked at beyond ``--top`` so that those that fit can come first.
_FIT_EXTRA = 50
#: Trains whose snippet is checked in full before one is written.
_WRITE_TRIES = 5

_ITEM = re.compile(r"^\s*(\d{1,6})\s*(?:(?:-|\.\.)\s*(\d{1,6})\s*)?$")
_TOLERANCE = re.compile(
    r"^\s*(\d{1,12}(?:\.\d{0,12})?|\.\d{1,12})(?:[eE]([+-]?\d{1,3}))?\s*(?:ppm)?\s*$"
)


def parse_teeth(text: str, what: str = "--teeth") -> Teeth:
    """Tooth counts from ``"12-20,24,30,36-40"``: a range ``(min, max)`` when the text
    is one range, else the set of counts. Each count is MIN_TEETH to MAX_TEETH."""
    counts: set[int] = set()
    ranges = []
    items = text.split(",")
    if not text.strip():
        raise click.BadParameter("no tooth counts given (e.g. 12-120)", param_hint=what)
    for item in items:
        m = _ITEM.match(item)
        if m is None:
            raise click.BadParameter(
                f"{item.strip()!r} in {text!r} is neither a count nor MIN-MAX; "
                "write e.g. 12-20,24,30,36-40",
                param_hint=what,
            )
        lo = int(m.group(1))
        hi = int(m.group(2)) if m.group(2) is not None else lo
        if hi < lo:
            raise click.BadParameter(
                f"{item.strip()!r}: need MIN <= MAX", param_hint=what
            )
        if lo < MIN_TEETH or hi > MAX_TEETH:
            raise click.BadParameter(
                f"{item.strip()!r}: a wheel has {MIN_TEETH} to {MAX_TEETH} teeth",
                param_hint=what,
            )
        ranges.append((lo, hi))
        counts.update(range(lo, hi + 1))
    if len(ranges) == 1:
        return ranges[0]
    return frozenset(counts)


def _counts_text(spec: Teeth) -> str:
    """``"12-20,24,30,36-40"``: runs of consecutive counts as ranges."""
    if not isinstance(spec, frozenset):
        return str(spec[0]) if spec[0] == spec[1] else f"{spec[0]}-{spec[1]}"
    values = sorted(spec)
    runs: list[list[int]] = []
    for v in values:
        if runs and v == runs[-1][1] + 1:
            runs[-1][1] = v
        else:
            runs.append([v, v])
    return ",".join(str(a) if a == b else f"{a}-{b}" for a, b in runs)


def _counts(spec: Teeth) -> set[int]:
    if isinstance(spec, frozenset):
        return set(spec)
    return set(range(spec[0], spec[1] + 1))


def _as_spec(counts: set[int]) -> Teeth:
    values = sorted(counts)
    if values[-1] - values[0] + 1 == len(values):
        return (values[0], values[-1])
    return frozenset(values)


def _tolerance_ppm(text: str) -> Fraction:
    m = _TOLERANCE.match(text)
    if m is None:
        raise click.BadParameter(
            f'{text!r} is not a tolerance; write e.g. 10ppm, "2.5 ppm" or 0',
            param_hint="--tolerance",
        )
    value = Fraction(text.strip().lower().removesuffix("ppm").strip())
    if value > MAX_TOLERANCE_PPM:
        raise click.BadParameter(
            f"{text!r}: allowed 0 to {MAX_TOLERANCE_PPM:g} ppm",
            param_hint="--tolerance",
        )
    return value


def _module(value: float, what: str) -> float:
    if not (math.isfinite(value) and MIN_MODULE <= value <= MAX_MODULE):
        raise click.BadParameter(
            f"{value:g}; allowed: {MIN_MODULE:g} to {MAX_MODULE:g} mm", param_hint=what
        )
    return value


def _stages_text(train: Train) -> str:
    text = " x ".join(f"{a}/{b}" for a, b in train.stages)
    if train.idler is not None:
        text += f" + idler {train.idler}"
    return text


def _problem_text(fit: TrainFit) -> str:
    if fit.fits:
        return "fits"
    f = fit.problems[0]
    more = f" (+{len(fit.problems) - 1})" if len(fit.problems) > 1 else ""
    return f"{f.check.split('.')[-1].replace('_', ' ')}: {f.subject}{more}"


def _candidate(
    train: Train, fit: TrainFit, target: RatioTarget, tol: Fraction
) -> dict[str, object]:
    row: dict[str, object] = {
        "stages": [[a, b] for a, b in train.stages],
        "ratio": str(train.ratio),
        "error_ppm": train.error_ppm,
        "idler": train.idler,
        "wheels": train.wheels,
        "teeth_total": train.teeth_total,
        "reverses": train.reverses,
        "within_tolerance": abs(train.error) * 10**6 <= tol,
        "coaxial": train.coaxial,
        "fits": fit.fits,
        "layout_problems": [f.message for f in fit.problems],
        "largest_tip_diameter_mm": round(fit.largest_diameter, 4),
        "footprint_mm": [round(fit.footprint[0], 4), round(fit.footprint[1], 4)],
    }
    if train.centre is not None:
        row["centre_distance_mm"] = float(train.centre)
        row["shifts"] = dict(fit.shifts)
    drift = target.drift_deg_per_yr(train.ratio)
    if drift is not None:
        row["drift_deg_per_yr"] = drift
    return row


def _advice(
    rel: list[Relaxation],
    limits: Limits,
    module: float,
    diameter_bound: bool,
    size: str = "",
    lengths: Lengths = MM,
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
                f"(--teeth {limits.teeth_low}-{r.value})"
            )
            if diameter_bound and isinstance(r.value, int):
                need = module * (r.value + 2)
                at = size or f"module {module:g}"
                bound = f"{lengths.short(need)}in" if lengths.inches else f"{need:g} mm"
                hint += f"; at {at} that needs --max-diameter {bound}"
            lines.append(hint)
        elif r.limit == "max_teeth_total":
            lines.append(f"raise the tooth total to {r.value} (--max-total {r.value})")
        elif r.limit == "sense":
            lines.append("allow either sense of the output (--sense either)")
        elif r.limit == "coaxial":
            lines.append("let the output leave the input's axis (without --coaxial)")
        elif r.limit == "shift":
            lines.append(
                f"open the shorter stage by profile shift (--max-shift {r.value})"
            )
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


def _indexable(head_ratio: int, circles: tuple[int, ...]) -> set[int]:
    """Counts a ``head_ratio``:1 head indexes simply on ``circles`` (plate locked)."""
    return {
        z
        for z in range(MIN_TEETH, MAX_TEETH + 1)
        if crank_settings(Fraction(head_ratio, z), circles) is not None
    }


def _too_large(exc: SearchTooLarge, limits: Limits) -> str:
    """The refusal and what to narrow, with the cost of each way out."""
    lines = [str(exc) + ". To search anyway:"]
    k = exc.cost.stages if exc.cost is not None else limits.stages
    for fewer_k in range(k - 1, 0, -1) if limits.coaxial is None else ():
        fewer = replace(
            limits, stages=fewer_k, stage_teeth=limits.stage_teeth[:fewer_k]
        )
        try:
            cost = search_cost(fewer)
        except SearchTooLarge:
            continue
        if cost.seconds <= SEARCH_TIME_BUDGET_S:
            lines.append(f"  - use --stages {fewer_k} ({duration_text(cost.seconds)})")
            break
    if not isinstance(limits.teeth, frozenset):
        lo, hi = limits.teeth
        for _ in range(12):
            hi = lo + int((hi - lo) * 0.8)
            if hi <= lo:
                break
            narrower = replace(limits, teeth=(lo, hi))
            try:
                cost = search_cost(narrower)
            except SearchTooLarge:
                continue
            if cost.seconds <= SEARCH_TIME_BUDGET_S:
                lines.append(
                    f"  - narrow --teeth to {lo}-{hi} ({duration_text(cost.seconds)})"
                )
                break
    else:
        lines.append("  - give fewer tooth counts (--teeth)")
    return "\n".join(lines)


@click.command("ratio")
@click.argument("target", nargs=-1, required=True)
@click.option(
    "--teeth",
    "teeth_text",
    default="10-120",
    show_default=True,
    help="Tooth counts allowed for every wheel: ranges and counts, e.g. "
    f"'12-20,24,30,36-40' ({MIN_TEETH} to {MAX_TEETH}).",
)
@click.option(
    "--stage-teeth",
    "stage_texts",
    multiple=True,
    metavar="COUNTS",
    help="Counts for stage 1, 2, ... (repeat in order), written as for --teeth; "
    "within --teeth.",
)
@click.option(
    "--plates",
    "plates_text",
    default=None,
    help="Keep only counts the dividing head indexes simply on these hole circles: "
    + ", ".join(f"'{name}'" for name in PLATE_SETS)
    + " (as 'wheelgen index' knows them) or a list like '15,16,17'.",
)
@click.option(
    "--head-ratio",
    type=click.IntRange(1, MAX_HEAD_RATIO),
    default=40,
    show_default=True,
    help="Worm ratio of the dividing head, for --plates.",
)
@click.option(
    "--stages",
    type=click.IntRange(1, MAX_STAGES),
    default=None,
    help="Largest number of stages (driver + driven each); 1 to N are tried. "
    "Default 3, or 2 with --coaxial.",
)
@click.option(
    "--coaxial",
    is_flag=True,
    help="Only two-stage trains whose output comes back to the input's axis "
    "(equal centre distances; the output rides on a tube round the input).",
)
@click.option(
    "--max-shift",
    type=float,
    default=0.0,
    show_default=True,
    help="With --coaxial: the largest profile-shift sum x1 + x2 that may open the "
    f"shorter stage to the longer one's centre distance (0 to {MAX_SHIFT_SUM:g}).",
)
@click.option(
    "--module",
    type=float,
    default=None,
    help=f"Module in mm ({MIN_MODULE:g} to {MAX_MODULE:g}), for --max-diameter, the "
    "layout and --write.  [default: 1]",
)
@click.option(
    "--dp",
    "dp",
    type=Bounded("diametral_pitch"),
    default=None,
    help="Diametral pitch (teeth per inch) instead of --module, for every stage: "
    "the module is 25.4/DP, the teeth take the inch proportions, --write writes "
    "'diametral_pitch' and a design in inches, and sizes are shown in inches.",
)
@click.option(
    "--units",
    type=click.Choice(UNITS),
    default=None,
    help="Units of the sizes shown.  [default: in with --dp, else mm]",
)
@click.option(
    "--stage-module",
    "stage_modules",
    type=float,
    multiple=True,
    metavar="MM",
    help="Module of stage 1, 2, ... (repeat in order); the others take --module.",
)
@click.option(
    "--max-diameter",
    type=Length("wheel_diameter"),
    default=None,
    help="Largest tip diameter m(z+2), mm or with a unit ('2.5in'); limits the tooth "
    "counts.",
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
    type=click.IntRange(1, MAX_TOP),
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
    help="Write the best train that fits as a train file for 'wheelgen check'.",
)
def ratio_command(
    target: tuple[str, ...],
    teeth_text: str,
    stage_texts: tuple[str, ...],
    plates_text: str | None,
    head_ratio: int,
    stages: int | None,
    coaxial: bool,
    max_shift: float,
    module: float | None,
    dp: float | None,
    units: Units | None,
    stage_modules: tuple[float, ...],
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
    degrees per year (365.25 d). The search is exhaustive within the limits; one that
    would take too long or too much memory is refused, with what to narrow. When
    some trains are within the tolerance, only those are shown.

    Each train is laid out (arbors from plate to plate, bearings chosen to leave
    room) and checked as 'wheelgen check' would: trains that fit are shown first,
    with the largest tip diameter; the others say what collides.

    Exit status: 0 a train is within the tolerance (and the file written, if any,
    passes 'wheelgen check'), 1 none is (the closest and the limit to relax are
    shown) or the written file would not pass, 2 the input cannot be used.
    """
    try:
        goal = parse_target(" ".join(target))
    except ValueError as exc:
        fail(str(exc))
    if dp is not None and (module is not None or stage_modules):
        fail(
            "give the tooth size as --module (and --stage-module) or as --dp, not both"
        )
    lengths = Lengths("in" if units is None and dp is not None else units or "mm")
    size = "" if dp is None else f"{dp:g} DP"
    module = module_of_dp(dp) if dp is not None else module
    try:
        module = _module(1.0 if module is None else module, "--module")
        modules_in = tuple(_module(m, "--stage-module") for m in stage_modules)
        if not (math.isfinite(max_shift) and 0 <= max_shift <= MAX_SHIFT_SUM):
            raise click.BadParameter(
                f"{max_shift:g}; allowed: 0 to {MAX_SHIFT_SUM:g}",
                param_hint="--max-shift",
            )
        if max_shift and not coaxial:
            raise click.BadParameter("only with --coaxial", param_hint="--max-shift")
        teeth = parse_teeth(teeth_text)
        stage_teeth = [parse_teeth(t, "--stage-teeth") for t in stage_texts]
    except click.BadParameter as exc:
        fail(exc.format_message())
    if stages is None:
        stages = 2 if coaxial else 3
    elif coaxial and stages != 2:
        fail(f"--coaxial searches two-stage trains; --stages is {stages}")
    if len(stage_teeth) > stages or len(modules_in) > stages:
        fail(
            f"{max(len(stage_teeth), len(modules_in))} per-stage values given for "
            f"at most {stages} stages"
        )
    modules = modules_in + (module,) * (stages - len(modules_in))
    filters = []
    counts = _counts(teeth)
    if plates_text is not None:
        try:
            circles = plate_set(plates_text)
        except ValueError as exc:
            fail(str(exc))
        counts &= _indexable(head_ratio, circles)
        filters.append(f"indexed simply on {plates_text} at {head_ratio}:1")
    if max_diameter is not None:
        before = (counts, list(stage_teeth))
        for i, m in enumerate(modules):
            try:
                z_max = teeth_for_diameter(m, max_diameter)
            except ValueError as exc:
                fail(str(exc).replace("'max_diameter'", "--max-diameter"))
            if len(set(modules)) == 1:
                counts = {z for z in counts if z <= z_max}
                break
            own = _counts(stage_teeth[i]) if i < len(stage_teeth) else set(counts)
            own = {z for z in own if z <= z_max}
            if not own:
                fail(
                    f"--max-diameter {max_diameter:g} mm leaves stage {i + 1} no count"
                )
            while len(stage_teeth) <= i:
                stage_teeth.append(teeth)
            stage_teeth[i] = _as_spec(own)
        if (counts, stage_teeth) != before:
            filters.append("(from --max-diameter)")
    if not counts:
        fail(
            f"no tooth count of --teeth {_counts_text(teeth)} is left "
            + ", ".join(filters)
        )
    if counts != _counts(teeth):
        teeth = _as_spec(counts)
    if tolerance_text is None:
        tol_ppm = Fraction(0) if goal.exact else Fraction(DEFAULT_TOLERANCE_PPM)
    else:
        try:
            tol_ppm = _tolerance_ppm(tolerance_text)
        except click.BadParameter as exc:
            fail(exc.format_message())
    tol = tol_ppm / 10**6
    co = None
    if coaxial:
        reach = shift_reach(max_shift) if max_shift else None
        co = Coaxial((Fraction(str(modules[0])), Fraction(str(modules[1]))), reach)
    pool = min(MAX_TOP, top + _FIT_EXTRA)
    try:
        chosen: Sense = sense  # type: ignore[assignment]  # click.Choice checked it
        limits = Limits(teeth, stages, tuple(stage_teeth), max_total, chosen, co)
    except ValueError as exc:
        fail(str(exc))
    try:
        found = search_trains(goal.value, limits, pool, one_pairing=not all_pairings)
        exact = (
            exact_trains(
                goal.value, limits, _EXACT_COUNT_CAP, one_pairing=not all_pairings
            )
            if goal.exact
            else []
        )
    except SearchTooLarge as exc:
        fail(_too_large(exc, limits))
    except ValueError as exc:
        fail(str(exc))

    def within(t: Train) -> bool:
        return abs(t.error) <= tol

    # only trains within the tolerance are offered when there are any, and of those
    # the ones that can be built as laid out come first
    found = [t for t in found if within(t)] or found
    fits = {
        id(t): fit_train(t, modules[: len(t.stages)], diametral_pitch=dp) for t in found
    }
    found.sort(key=lambda t: (not within(t), not fits[id(t)].fits))
    pool_sorted, found = found, found[:top]
    ok = bool(found) and within(found[0])
    if as_json:
        echo_json([_candidate(t, fits[id(t)], goal, tol_ppm) for t in found])
    else:
        _print_table(
            goal, limits, found, exact, fits, tol_ppm, filters, modules, size, lengths
        )
    if not found:
        click.echo(
            "wheelgen: no train fits these limits at all (check --max-total and "
            "--stage-teeth)",
            err=True,
        )
        sys.exit(EXIT_FINDINGS)
    if not ok:
        _report_miss(
            goal, limits, found[0], tol, tol_ppm, module, filters, max_shift,
            size, lengths, dp,
        )  # fmt: skip
        if write_path is not None:
            click.echo(
                f"wheelgen: {write_path} not written (nothing within tolerance)",
                err=True,
            )
        sys.exit(EXIT_FINDINGS)
    if write_path is not None:
        sys.exit(
            _write(write_path, pool_sorted, fits, goal, tol_ppm, sense, as_json, top)
        )
    sys.exit(EXIT_OK)


def _report_miss(
    goal: RatioTarget,
    limits: Limits,
    best: Train,
    tol: Fraction,
    tol_ppm: Fraction,
    module: float,
    filters: list[str],
    max_shift: float,
    size: str = "",
    lengths: Lengths = MM,
    dp: float | None = None,
) -> None:
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
    if limits.coaxial is not None and max_shift < MAX_SHIFT_SUM:
        wider = replace(
            limits, coaxial=replace(limits.coaxial, reach=shift_reach(MAX_SHIFT_SUM))
        )
        try:
            train = search_trains(goal.value, wider, 1)[0]
        except (ValueError, IndexError):
            train = None
        if train is not None and abs(train.error) <= tol and train.spread > 0:
            fit = fit_train(
                train,
                tuple(float(m) for m in limits.coaxial.modules),
                diametral_pitch=dp,
            )
            need = math.ceil(sum(x for _, x in fit.shifts) * 100) / 100
            rel.append(Relaxation("shift", f"{need:g}", train))
    diameter_bound = any("max-diameter" in f for f in filters)
    for line in _advice(rel, limits, module, diameter_bound, size, lengths):
        click.echo(f"  - {line}", err=True)
    click.echo(
        f"  - or accept the closest: --tolerance {abs(best.error_ppm):.4g}ppm",
        err=True,
    )


def _write(
    path: str,
    found: list[Train],
    fits: dict[int, TrainFit],
    goal: RatioTarget,
    tol_ppm: Fraction,
    sense: str,
    as_json: bool,
    shown: int,
) -> int:
    """Write the first train that fits and passes every check; say which one.

    ``found`` holds the trains offered (the first ``shown`` of them are in the table)
    and those that came next, all within the tolerance.
    """
    chosen, findings, chosen_text = None, [], ""
    tries = [t for t in found if fits[id(t)].fits][:_WRITE_TRIES] or found[:1]
    for train in tries:
        text = train_snippet(train, fits[id(train)].plan, goal, float(tol_ppm), sense)
        errors = [
            f for f in analyse(loads_design(text, path)).findings if f.level == "error"
        ]
        if chosen is None or not errors:
            chosen, findings, chosen_text = train, errors, text
        if not errors:
            break
    assert chosen is not None
    try:
        Path(path).write_text(chosen_text, encoding="utf-8")
    except OSError as exc:
        fail(f"cannot write {path}: {exc.strerror}")
    number = found.index(chosen) + 1
    which = ""
    if number > shown:
        which = f" with {_stages_text(chosen)}, the first that passes every check"
    elif number > 1:
        which = f" with train #{number}, the first that passes every check"
    if not as_json:
        click.echo(f"wrote {path}{which} (check it with: wheelgen check {path})")
    if findings:
        click.echo(
            f"wheelgen: none of the first trains that fit passes every check; {path} "
            f"holds {_stages_text(chosen)}, and 'wheelgen check' will report:",
            err=True,
        )
        for f in findings:
            click.echo(f"  - {f.check}: {f.message}", err=True)
        return EXIT_FINDINGS
    return EXIT_OK


def _print_table(
    goal: RatioTarget,
    limits: Limits,
    found: list[Train],
    exact: list[Train],
    fits: dict[int, TrainFit],
    tol_ppm: Fraction,
    filters: list[str],
    modules: tuple[float, ...],
    size: str = "",
    lengths: Lengths = MM,
) -> None:
    kind = "exact" if goal.exact else "measured"
    click.echo(
        f"target {goal.text} = {float(goal.value):.10g} ({kind}), "
        "ratio = output turns per input turn = driver teeth / driven teeth"
    )
    teeth = f"teeth {_counts_text(limits.teeth)}"
    if isinstance(limits.teeth, frozenset):
        teeth += f" ({len(limits.teeth)} counts)"
    if filters:
        teeth += " " + ", ".join(filters)
    if limits.coaxial is not None:
        shape = "2 stages, coaxial"
        if limits.coaxial.reach is not None:
            shape += " (profile shift allowed)"
    else:
        shape = f"1 to {limits.stages} stages"
    mods = " / ".join(f"{m:g}" for m in dict.fromkeys(modules))
    click.echo(
        f"{teeth}; {shape}, {size or f'module {mods} mm'}, sense {limits.sense}, "
        f"tolerance {float(tol_ppm):g} ppm"
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
    tip = f"tip {lengths.unit}" if lengths.inches else "tip dia"
    click.echo(head + f" {'wheels':>6} {'teeth':>6} {tip:>8}  layout")
    for n, t in enumerate(found, 1):
        fit = fits[id(t)]
        line = f"{n:>3}  {_stages_text(t):<36} {str(t.ratio):>22} {t.error_ppm:>+12.5g}"
        if drift:
            line += f" {goal.drift_deg_per_yr(t.ratio):>+10.4g}"
        tip = (
            lengths.num(fit.largest_diameter)
            if lengths.inches
            else f"{fit.largest_diameter:.4g}"
        )
        line += f" {t.wheels:>6} {t.teeth_total:>6} {tip:>8}"
        click.echo(line + f"  {_problem_text(fit)}")
        if fit.shifts:
            shifts = ", ".join(f"{w} {x:+g}" for w, x in fit.shifts)
            assert t.centre is not None
            click.echo(
                f"{'':5}profile shift {shifts}: both stages at "
                f"{lengths.text(float(t.centre)) if lengths.inches else f'{float(t.centre):g} mm'}"
            )


def _why_not_exact(value: Fraction, limits: Limits) -> str:
    primes = [*prime_factors(value.numerator), *prime_factors(value.denominator)]
    big = [p for p in primes if p > limits.teeth_high]
    if big:
        return (
            f" ({value} has the prime factor {max(big)}, above the largest tooth "
            f"count {limits.teeth_high})"
        )
    return ""
