"""Hostile command lines for ``wheelgen ratio``: each ends with a clean message.

Every case runs in its own interpreter, under a memory limit (3 GiB of address space,
the search's 2 GiB budget plus the interpreter and numpy) and a timeout that only
stops a run gone wrong; nothing here measures time. A case passes when it exits with
2, says what is wrong on one ``wheelgen:`` line and prints no traceback.
"""

from __future__ import annotations

import subprocess
import sys

import pytest

try:
    import resource
except ImportError:  # not on every platform: then run without the memory limit
    resource = None  # type: ignore[assignment]

_MEMORY_LIMIT = 3 * 1024**3
_TIMEOUT_S = 60


def _limit_memory() -> None:
    if resource is not None:
        resource.setrlimit(resource.RLIMIT_AS, (_MEMORY_LIMIT, _MEMORY_LIMIT))


CASES = [
    # a search too large for its budget: refused before it starts
    (["12", "--teeth", "10-300", "--stages", "4"], "budget"),
    (["12", "--teeth", "3-2000", "--stages", "3"], "budget"),
    # numbers no train needs
    (["1e308"], "power of ten"),
    (["1e999999"], "power of ten"),
    (["inf"], "not a target"),
    (["nan"], "not a target"),
    (["9" * 60 + "/7"], "characters"),
    (["12", "--top", "100000000"], "--top"),
    (["12", "--module", "nan", "--write", "out.toml"], "--module"),
    (["12", "--module", "inf"], "--module"),
    (["12", "--max-diameter", "nan"], "--max-diameter"),
    (["12", "--tolerance", "1e999999ppm"], "--tolerance"),
    (["12", "--coaxial", "--max-shift", "nan"], "--max-shift"),
    (["12", "--teeth", ",".join(["12"] * 5000) + ",x"], "--teeth"),
    (["12", "--head-ratio", "10000000", "--plates", "three-plate"], "--head-ratio"),
]


@pytest.mark.parametrize(
    ("args", "says"), CASES, ids=[" ".join(c[0])[:40] for c in CASES]
)
def test_hostile_command_line_ends_with_a_clean_message(tmp_path, args, says):
    out = subprocess.run(
        [sys.executable, "-m", "wheelgen", "ratio", *args],
        capture_output=True,
        text=True,
        cwd=tmp_path,
        timeout=_TIMEOUT_S,
        preexec_fn=_limit_memory if resource is not None else None,
    )
    assert out.returncode == 2, out.stdout + out.stderr
    assert "Traceback" not in out.stderr + out.stdout
    assert says in out.stderr
    # nothing is written for a command that cannot be used (no "module = nan")
    assert list(tmp_path.iterdir()) == []
