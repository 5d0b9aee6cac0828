"""``wheelgen motion``: uneven motion from pin-and-slot couplings, as numbers, CSV and plot."""

from __future__ import annotations

import csv
import sys
from fractions import Fraction
from pathlib import Path
from typing import Any

import click
import numpy as np

from ..design.bounds import BOUNDS
from ..design.model import Design
from ..design.periods import format_period
from ..kinematics.angles import (
    AngleModel,
    angle_model,
    arbor_angles,
    arbor_deviations,
    drive_angle_deg,
)
from ..kinematics.targets import arbor_sense
from ._common import EXIT_FINDINGS, EXIT_OK, echo_json, fail, load_or_exit
from ._options import Bounded

__all__ = ["motion_command"]

# Points per degree of the fastest coupling's motion when looking for the extremes; a
# smooth extreme sampled every 0.05 degree is found to about 1e-7 degree.
_PER_DEGREE = 20
_MAX_POINTS = 400_001
# Values (samples x arbors) held at once while looking for the extremes.
_CELLS = 4_000_000


def _span(
    design: Design, model: AngleModel, arbor: str | None, turns: float
) -> tuple[float, str]:
    """Time span (s) to follow, and how it was chosen (for the heading)."""
    period = design.drive.period_s
    if arbor is not None:
        rate = model.rates[arbor]
        if rate == 0:
            fail(
                f'arbor "{arbor}" stands still: there is no turn to follow',
                EXIT_FINDINGS,
            )
        return float(turns * period / abs(rate)), f"{turns:g} turn(s) of {arbor}"
    cycles = [
        (model.cycle_turns(c.pinslot.name), c.pinslot.name)
        for c in model.couplings
        if c.rate != 0
    ]
    if not cycles:
        return float(turns * period), f"{turns:g} turn(s) of the drive"
    longest, name = max(cycles, key=lambda x: x[0] or Fraction(0))
    assert longest is not None
    return float(turns * period * longest), f"{turns:g} cycle(s) of {name}"


def _extremes(
    design: Design, model: AngleModel, names: list[str], span_s: float
) -> list[dict[str, Any]]:
    fastest = max((abs(float(c.rate)) for c in model.couplings), default=0.0)
    sweep = fastest * 360.0 * span_s / float(design.drive.period_s)
    count = int(min(_MAX_POINTS, max(2001, _PER_DEGREE * sweep + 1)))
    t = np.linspace(0.0, span_s, count)
    # a slice of the times at a time, so that thousands of uneven arbors never need
    # all their samples at once (about _CELLS values per slice)
    step = max(1000, _CELLS // max(1, len(names) + len(model.couplings)))
    best: dict[str, list[float]] = {a: [-np.inf, 0.0, np.inf, 0.0] for a in names}
    # a lead is ahead in the arbor's own sense of turning, seen from the front
    sense = {
        a: -1.0 if arbor_sense(design, model.rates[a]) == "cw" else 1.0 for a in names
    }
    for start in range(0, count, step):
        part = t[start : start + step]
        devs = arbor_deviations(design, part, model, names)
        for a in names:
            lead = sense[a] * devs[a]
            i, j = int(np.argmax(lead)), int(np.argmin(lead))
            top = best[a]
            if lead[i] > top[0]:
                top[0], top[1] = float(lead[i]), float(part[i])
            if lead[j] < top[2]:
                top[2], top[3] = float(lead[j]), float(part[j])
    rows = []
    for a in names:
        rate = model.rates[a]
        lead_max, lead_t, lag_min, lag_t = best[a]
        at = _angles_at(design, model, a, np.array([lead_t, lag_t]))
        rows.append(
            {
                "arbor": a,
                "turns_per_drive_turn": str(rate),
                "max_lead_deg": max(lead_max, 0.0),
                "lead_at_s": lead_t,
                "lead_arbor_angle_deg": float(np.mod(at[0], 360.0)),
                "max_lag_deg": max(-lag_min, 0.0),
                "lag_at_s": lag_t,
                "lag_arbor_angle_deg": float(np.mod(at[1], 360.0)),
            }
        )
    return rows


def _angles_at(
    design: Design, model: AngleModel, arbor: str, times_s: np.ndarray
) -> np.ndarray:
    """One arbor's angle (degrees) at ``times_s``."""
    drive = drive_angle_deg(design, times_s)
    dev = arbor_deviations(design, times_s, model, [arbor])[arbor]
    return float(model.rates[arbor]) * drive + dev


def _write_csv(
    path: Path,
    t: np.ndarray,
    names: list[str],
    angles: dict[str, np.ndarray],
    devs: dict[str, np.ndarray],
) -> None:
    with path.open("w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(
            ["time_s"] + [f"{a}_deg" for a in names] + [f"{a}_dev_deg" for a in names]
        )
        for k in range(len(t)):
            w.writerow(
                [f"{t[k]:.6f}"]
                + [f"{angles[a][k]:.9f}" for a in names]
                + [f"{devs[a][k]:.9f}" for a in names]
            )


def _time_unit(span_s: float) -> tuple[float, str]:
    for size, name in (
        (365.25 * 86400, "years"),
        (86400, "days"),
        (3600, "hours"),
        (60, "minutes"),
    ):
        if span_s >= 2 * size:
            return size, name
    return 1.0, "seconds"


def _plot(
    path: Path,
    design: Design,
    t: np.ndarray,
    names: list[str],
    devs: dict[str, np.ndarray],
    rows: list[dict[str, Any]],
) -> None:
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    # Reproducible SVG: fixed ids, no creation date.
    matplotlib.rcParams["svg.hashsalt"] = "wheelgen"
    size, unit = _time_unit(float(t[-1]) if len(t) else 1.0)
    fig, ax = plt.subplots(figsize=(8, 4.5))
    for a in names:
        ax.plot(t / size, devs[a], label=a, linewidth=1.4)
    for r in rows:
        rate = Fraction(r["turns_per_drive_turn"])
        sense = -1.0 if arbor_sense(design, rate) == "cw" else 1.0
        for key, at in (("max_lead_deg", "lead_at_s"), ("max_lag_deg", "lag_at_s")):
            if r[key] > 0:
                y = sense * r[key] * (1 if key == "max_lead_deg" else -1)
                ax.plot([r[at] / size], [y], "o", color="black", markersize=4)
                word = "lead" if key == "max_lead_deg" else "lag"
                ax.annotate(
                    f"{word} {r[key]:.3f}°",
                    (r[at] / size, y),
                    textcoords="offset points",
                    xytext=(6, 6 if y >= 0 else -14),
                    fontsize=8,
                )
    ax.axhline(0.0, color="grey", linewidth=0.8)
    ax.margins(x=0.02, y=0.15)  # room for the labels of the extremes
    ax.set_xlabel(f"time from rest ({unit})")
    ax.set_ylabel("angle minus uniform motion (degrees, ccw +)")
    ax.set_title(f"{design.title}: uneven motion")
    ax.grid(True, linewidth=0.4, alpha=0.6)
    if names:
        ax.legend(loc="upper right", fontsize=8)
    fig.tight_layout()
    metadata = {"Date": None} if path.suffix.lower() == ".svg" else None
    fig.savefig(path, dpi=120, metadata=metadata)
    plt.close(fig)


def _rest_angles(design: Design) -> dict[str, float]:
    """Each wheel's angle at rest (degrees), as the assembly and the report place it."""
    from ..layout.phasing import rest_angles

    try:
        return dict(rest_angles(design).angles_deg)
    except ValueError:  # a layout that cannot be made: 'wheelgen check' says why
        return {}


@click.command("motion")
@click.argument("design", type=click.Path(dir_okay=False), required=False)
@click.option(
    "--arbor",
    "arbor",
    metavar="NAME",
    help="Only this arbor; --turns counts its turns.",
)
@click.option(
    "--turns",
    type=Bounded("option.motion.turns"),
    default=1.0,
    show_default=True,
    help="Span: turns of --arbor, else cycles of the slowest coupling.",
)
@click.option(
    "--samples",
    type=Bounded("option.motion.samples"),
    default=721,
    show_default=True,
    help="Rows in the CSV table and points in the plot.",
)
@click.option(
    "--csv", "csv_path", type=click.Path(dir_okay=False), help="Write angles over time."
)
@click.option(
    "--plot",
    "plot_path",
    type=click.Path(dir_okay=False),
    help="Write a plot (.png or .svg).",
)
@click.option(
    "--json", "as_json", is_flag=True, help="Print one JSON object instead of text."
)
def motion_command(
    design: str | None,
    arbor: str | None,
    turns: float,
    samples: int,
    csv_path: str | None,
    plot_path: str | None,
    as_json: bool,
) -> None:
    """Uneven motion of DESIGN: each arbor's largest lead and lag against uniform motion.

    Angles are degrees from rest, counter-clockwise seen from the front: the rest
    position is that of step/assembly.step and of the report's animated preview (every
    coupling's pin and slot on its offset line, every carrier at 0, each wheel at its
    angle in the assembly, listed in the output); a lead is ahead in the arbor's own
    sense of turning. Exit status: 0 done, 1 the motion cannot be followed (a coupling
    check fails, or the arbor is not driven), 2 unusable input.
    """
    if plot_path is not None and Path(plot_path).suffix.lower() not in (".png", ".svg"):
        fail(f"--plot: '{plot_path}' must end in .png or .svg")
    d = load_or_exit(design)
    if arbor is not None and arbor not in {a.name for a in d.arbors}:
        names_all = ", ".join(f'"{a.name}"' for a in d.arbors)
        fail(f'--arbor: arbor "{arbor}" does not exist; allowed: one of {names_all}')
    try:
        model = angle_model(d)
    except ValueError as exc:
        fail(str(exc), EXIT_FINDINGS)
    if arbor is not None and arbor not in model.rates:
        fail(
            f'arbor "{arbor}" is not driven: its motion is not determined',
            EXIT_FINDINGS,
        )
    rest = _rest_angles(d)
    span_s, how = _span(d, model, arbor, turns)
    uneven = [a for a in model.uneven() if arbor is None or a == arbor]
    rows = _extremes(d, model, uneven, span_s)

    t = np.linspace(0.0, span_s, samples)
    table_names = [arbor] if arbor is not None else list(model.rates)
    if csv_path is not None or plot_path is not None:
        cells = BOUNDS["option.motion.table"]
        shown = set(table_names if csv_path is not None else uneven)
        if not cells.holds(samples * len(shown)):
            fail(
                f"--samples {samples} for {len(shown)} arbors make "
                f"{samples * len(shown)} values; allowed: {cells.allowed()}. "
                f"Why: {cells.reason}. Use fewer --samples, or --arbor NAME."
            )
        angles = arbor_angles(d, t, model, shown)
        devs = arbor_deviations(d, t, model, shown)
        try:
            if csv_path is not None:
                _write_csv(Path(csv_path), t, table_names, angles, devs)
            if plot_path is not None:
                _plot(Path(plot_path), d, t, uneven, devs, rows)
        except OSError as exc:
            fail(f"cannot write output: {exc.strerror or exc}")

    if as_json:
        echo_json(
            {
                "design": d.title,
                "file": d.source,
                "span_s": span_s,
                "span": how,
                "arbors": rows,
                "csv": csv_path,
                "plot": plot_path,
                "rest_angles_deg": rest,
            }
        )
        sys.exit(EXIT_OK)
    click.echo(f"{d.title}  ({d.source})")
    click.echo(f"followed from rest for {format_period(Fraction(span_s))} ({how})")
    if rest:
        click.echo(
            "rest: every pin on its coupling's offset line, every carrier at 0 deg, "
            "each wheel at its angle in step/assembly.step: "
            + ", ".join(f"{w} {a:.4f}" for w, a in rest.items() if a != 0.0)
            + (
                " deg, the others at 0"
                if any(a != 0.0 for a in rest.values())
                else "all at 0 deg"
            )
        )
    if not rows:
        which = f'arbor "{arbor}"' if arbor is not None else "no arbor"
        click.echo(
            f"{which} moves unevenly" if arbor is None else f"{which} moves evenly"
        )
    else:
        w = max(5, max(len(r["arbor"]) for r in rows))
        click.echo("")
        click.echo(
            f"{'arbor':{w}}  {'largest lead':>13}  {'where':<36}  {'largest lag':>12}  where"
        )
        for r in rows:
            lead_at = (
                f"at {format_period(Fraction(r['lead_at_s']))}, "
                f"arbor at {r['lead_arbor_angle_deg']:.1f} deg"
            )
            lag_at = (
                f"at {format_period(Fraction(r['lag_at_s']))}, "
                f"arbor at {r['lag_arbor_angle_deg']:.1f} deg"
            )
            click.echo(
                f"{r['arbor']:{w}}  {r['max_lead_deg']:>9.4f} deg  {lead_at:<36}  "
                f"{r['max_lag_deg']:>8.4f} deg  {lag_at}"
            )
    for label, path in (("table", csv_path), ("plot", plot_path)):
        if path is not None:
            click.echo(f"{label}: {path}")
    sys.exit(EXIT_OK)
