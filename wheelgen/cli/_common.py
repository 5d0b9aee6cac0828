"""Helpers shared by the commands: loading a design with our exit codes, JSON output."""

from __future__ import annotations

import json
import sys
from pathlib import Path
from typing import Any, NoReturn

import click

from ..design import Design, DesignError, demo_path, load_design

__all__ = [
    "DEFAULT_DESIGN",
    "load_or_exit",
    "fail",
    "echo_json",
    "EXIT_OK",
    "EXIT_FINDINGS",
    "EXIT_INPUT",
]

EXIT_OK, EXIT_FINDINGS, EXIT_INPUT = 0, 1, 2

#: The bundled demo, used when a command is given no design.
DEFAULT_DESIGN = demo_path()


def fail(message: str, code: int = EXIT_INPUT) -> NoReturn:
    click.echo(f"wheelgen: {message}", err=True)
    sys.exit(code)


def load_or_exit(path: str | Path | None) -> Design:
    """Load a design and settle its ``least_play`` requests; on any problem print every
    message and exit 2 (no traceback)."""
    from ..checks.least_play import settle_play

    target = Path(path) if path is not None else DEFAULT_DESIGN
    try:
        design = load_design(target)
    except DesignError as exc:
        click.echo(str(exc), err=True)
        sys.exit(EXIT_INPUT)
    return settle_play(design)


def echo_json(data: Any) -> None:
    click.echo(json.dumps(data, indent=2, sort_keys=False))
