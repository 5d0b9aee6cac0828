"""``wheelgen check``: exact rates, targets and every check, without the CAD kernel."""

from __future__ import annotations

import math
import sys
from fractions import Fraction
from typing import Any

import click

from ..checks import analyse, findings_table, has_errors
from ..design.periods import as_float, format_period
from ..kinematics.rates import rate_text
from ..kinematics.targets import arbor_period, arbor_sense
from ._common import EXIT_FINDINGS, EXIT_OK, echo_json, load_or_exit

__all__ = ["check_command"]


def _seconds(value: Fraction | None) -> float | None:
    """A period in seconds for JSON; null where no float holds it (JSON has no inf)."""
    return None if value is None else _finite(as_float(value))


def _finite(value: float | None) -> float | None:
    return value if value is not None and math.isfinite(value) else None


@click.command("check")
@click.argument("design", type=click.Path(dir_okay=False), required=False)
@click.option(
    "--json", "as_json", is_flag=True, help="Print one JSON object instead of tables."
)
def check_command(design: str | None, as_json: bool) -> None:
    """Check DESIGN: every arbor's exact rate, each target's verdict, and all findings.

    DESIGN is a train file (TOML); without it the bundled demo is checked. Exit status:
    0 no error-level finding, 1 the design loads but has errors, 2 it cannot be loaded.
    """
    d = load_or_exit(design)
    result = analyse(d)
    rows: list[dict[str, Any]] = []
    for a in d.arbors:
        rate = result.solution.rate(a.name)
        period = arbor_period(d, rate)
        rows.append(
            {
                "name": a.name,
                "turns_per_drive_turn": None if rate is None else str(rate),
                "period_s": _seconds(period),
                "period": "still"
                if rate == 0
                else ("-" if period is None else format_period(period)),
                "sense": arbor_sense(d, rate),
            }
        )
    targets = [
        {
            "arbor": t.arbor,
            "wanted_s": _seconds(t.wanted_s),
            "got_s": _seconds(t.got_s),
            "error_ppm": _finite(t.error_ppm),
            "drift_deg_per_year": _finite(t.drift_deg_per_year),
            "sense_ok": t.sense_ok,
            "met": t.met,
        }
        for t in result.targets
    ]
    code = EXIT_FINDINGS if has_errors(result.findings) else EXIT_OK
    if as_json:
        echo_json(
            {
                "design": d.title,
                "file": d.source,
                "drive": {
                    "arbor": d.drive.arbor,
                    "period_s": float(d.drive.period_s),
                    "sense": d.drive.sense,
                },
                "arbors": rows,
                "targets": targets,
                "findings": [f.as_dict() for f in result.findings],
                "ok": code == EXIT_OK,
            }
        )
        sys.exit(code)

    click.echo(f"{d.title}  ({d.source})")
    click.echo(
        f"drive: arbor {d.drive.arbor}, one turn in {format_period(d.drive.period_s)}, {d.drive.sense}"
    )
    click.echo("")
    width = max(len(r["name"]) for r in rows)
    click.echo(
        f"{'arbor':{width}}  {'turns per drive turn':>22}  {'period':>16}  sense"
    )
    for r in rows:
        exact = result.solution.rate(r["name"])
        shown = "-" if exact is None else rate_text(exact)  # JSON keeps every digit
        click.echo(f"{r['name']:{width}}  {shown:>22}  {r['period']:>16}  {r['sense']}")
    if result.targets:
        click.echo("")
        click.echo("targets:")
        for t in result.targets:
            verdict = "met" if t.met else "MISSED"
            got = format_period(t.got_s, 9) if t.got_s is not None else "does not turn"
            line = f"  {t.arbor}: wanted {format_period(t.wanted_s or 0, 9)}, got {got}"
            if t.error_ppm is not None:
                line += f", {t.error_ppm:+.3f} ppm ({t.drift_deg_per_year:+.4f} deg/yr)"
            click.echo(f"{line}  {verdict}")
    click.echo("")
    click.echo(findings_table(result.findings))
    sys.exit(code)
